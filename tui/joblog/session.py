"""The job log as the terminal interface uses it: one open file and one open job per app.

Textual-free on purpose (the tests drive it directly). The app's panels reach
it through :func:`session_for`; the Log panel chooses the open job and
listens for changes, the other panels save into it.
"""

from __future__ import annotations

import weakref
from collections.abc import Callable
from pathlib import Path

from tui.joblog.db import Entry, Job, JobLog, JobLogError, open_log
from tui.joblog.save import save_result

_SESSIONS: weakref.WeakKeyDictionary = weakref.WeakKeyDictionary()


class LogSession:
    """The open job log (opened on first use) and the open job.

    ``problem`` holds the one-line reason when the file cannot be used (a broken
    or newer file); every call then raises :class:`JobLogError` with it, and the
    rest of the program carries on.
    """

    def __init__(self, path: Path | None = None,
                 notice: Callable[[str], None] | None = None,
                 make: Callable[[Path], None] | None = None) -> None:
        self.path = path
        self._notice = notice or (lambda _text: None)
        self._make = make  # builds the file when it does not exist yet (the demo)
        self._log: JobLog | None = None
        self.problem: str | None = None
        self.job_id: int | None = None
        self._listeners: list[Callable[[], None]] = []

    @property
    def log(self) -> JobLog:
        if self._log is None:
            try:
                if self._make is not None and self.path is not None and not self.path.exists():
                    self._make(self.path)
                self._log = open_log(self.path, notice=self._notice)
            except JobLogError as exc:
                self.problem = str(exc)
                raise
            self.problem = None
        return self._log

    def close(self) -> None:
        if self._log is not None:
            self._log.close()
            self._log = None

    # -- the open job ------------------------------------------------------------------------

    def open_job(self) -> Job | None:
        """The job saves go to: the one chosen in the Log panel, else the newest."""
        if self.job_id is not None:
            try:
                return self.log.job(self.job_id)
            except JobLogError:
                self.job_id = None
        return self.log.newest_job()

    def choose_job(self, job_id: int | None) -> None:
        self.job_id = job_id
        self.changed()

    def new_job(self, site: str, notes: str = "") -> Job:
        job = self.log.new_job(site, notes)
        self.job_id = job.id
        self.changed()
        return job

    # -- saving ------------------------------------------------------------------------------

    def save(self, kind: str, inputs: dict, result: dict, *, label: str = "", note: str = "",
             cable: str | None = None) -> Entry:
        """Save into the open job (refused, with how to start one, when there is none)."""
        job = self.open_job()
        entry = save_result(self.log, kind, inputs, result, job_id=job.id if job else None,
                            label=label, note=note, cable=cable)
        self.changed()
        return entry

    # -- listeners ---------------------------------------------------------------------------

    def listen(self, callback: Callable[[], None]) -> None:
        """Call ``callback`` (on the caller's thread) after anything changes the log."""
        self._listeners.append(callback)

    def changed(self) -> None:
        for callback in list(self._listeners):
            callback()


def session_for(app) -> LogSession:
    """The app's session (made on first use; ``app.notify`` shows its notices).

    The file is the usual one (:func:`tui.paths.job_db_path`), except for the
    demo (``app.demo``): an invented job in a temporary file, removed when
    the program ends, so the demo never writes into the user's own log.
    """
    session = _SESSIONS.get(app)
    if session is None:
        def notice(text: str) -> None:
            notify = getattr(app, "notify", None)
            if notify is not None:
                notify(text, title="Job log", timeout=6)

        if getattr(app, "demo", False):
            import tempfile

            from tui.joblog.demo import build_demo_log

            folder = tempfile.TemporaryDirectory(prefix="halftrip-demo-")
            session = LogSession(Path(folder.name) / "demo-jobs.sqlite3", notice,
                                 make=build_demo_log)
            session.demo_folder = folder  # kept alive with the session, removed at exit
        else:
            session = LogSession(None, notice)
        _SESSIONS[app] = session
    return session
