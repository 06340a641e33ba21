"""Saving one result into a job: the single path every front end uses."""

from __future__ import annotations

from tui.joblog.db import Entry, JobLog, JobLogError


def save_result(log: JobLog, kind: str, inputs: dict, result: dict, *, job_id: int | None = None,
                label: str | None = None, note: str | None = None, cable: str | None = None,
                tags: tuple[str, ...] | list[str] = (), allow_empty: bool = False) -> Entry:
    """Store ``result`` (with the ``inputs`` as typed) as an entry of ``job_id``.

    Without ``job_id`` the newest job is used; with no job at all this is refused
    (a :class:`JobLogError` that says how to create one). The cable defaults to
    the ``cable`` input or the result's ``cable_id``. An empty result is refused
    unless ``allow_empty`` (a note typed by hand has none).
    """
    if not result and not allow_empty:
        raise JobLogError("nothing to save: the calculation produced no result")
    if job_id is None:
        job = log.newest_job()
        if job is None:
            raise JobLogError("there is no job to save into yet; create one with "
                              "'halftrip log new SITE' (nothing was saved)")
        job_id = job.id
    if cable is None:
        found = inputs.get("cable") or result.get("cable_id")
        cable = found if isinstance(found, str) else None
    return log.add_entry(job_id, kind, inputs, result, label=label or "", note=note or "",
                         cable=cable, tags=tags)
