"""Saving any panel's current result to the open job, and reopening an entry in its panel.

This is the job log's side of the contract with the other panels (see
DEVELOPERS.md, "The job log"):

* The app binds Ctrl+S (everywhere) to :func:`save_current`. It asks the
  shown panel for a :class:`LogRecord`: the panel's own ``log_record()`` if it
  has one, else one built from the :class:`~tui.widgets.form.LiveForm` that
  holds the cursor (or the first one shown): its kind (the form's
  ``LOG_KIND``, else the panel's name), its fields as typed and its last
  result (the form's ``log_result(result)`` if it has one, else the result
  object made JSON-ready). A result marked out of date is not saved.
* The Log panel's "reopen" calls :func:`reopen`: it opens the panel whose
  module lists the entry's kind in ``LOG_KINDS`` (or is named after it) and
  calls its ``fill_from_log(entry)`` if it has one, else types the saved
  inputs into the matching fields of the form for that kind.

Input names: a form's field names with their shared prefix dropped and
dashes as underscores (``locate-measured-delay`` -> ``measured_delay``), the
same names the CLI's options give, so an entry saved from either front end
reopens in the panel.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import partial

from tui.panels.log.fields_dialog import Ask, FieldsDialog, required_text


@dataclass(frozen=True)
class LogRecord:
    """What a panel hands the job log: the kind, the inputs as typed, the result."""

    kind: str
    inputs: dict
    result: dict
    cable: str | None = None


class NothingToSave(Exception):
    """The panel has no current result to save (the message says why)."""


# -- from a panel to a record -------------------------------------------------------------


def _forms(panel) -> list:
    from tui.widgets.form import LiveForm

    return list(panel.query(LiveForm))


def active_form(panel):
    """The form that holds the cursor, else the first one on screen."""
    forms = _forms(panel)
    focused = panel.app.focused
    for form in forms:
        if focused is not None and (focused is form or form in focused.ancestors):
            return form
    return next((f for f in forms if f.display and f.is_on_screen), forms[0] if forms else None)


def _prefix(names: list[str]) -> str:
    """The dash-ended prefix every name shares (``locate-``), or ``""``."""
    if len(names) < 2:
        head = names[0].rsplit("-", 1)[0] + "-" if names and "-" in names[0] else ""
        return head
    first = names[0]
    cut = 0
    for i in range(len(first)):
        if any(len(n) <= i or n[i] != first[i] for n in names):
            break
        if first[i] == "-":
            cut = i + 1
    return first[:cut]


def input_key(field_name: str, prefix: str) -> str:
    return field_name.removeprefix(prefix).replace("-", "_")


def inputs_of(form) -> dict:
    """The form's fields as typed (empty ones left out), keyed like the CLI's options."""
    fields = form.fields()
    prefix = _prefix([f.field_name for f in fields])
    return {input_key(f.field_name, prefix): f.text.strip() for f in fields if f.text.strip()}


def record_of(panel) -> LogRecord:
    """The shown panel's current result as a record, or :class:`NothingToSave`."""
    from tui.fmt import json_ready

    hook = getattr(panel, "log_record", None)
    if hook is not None:
        record = hook()
        if record is None:
            raise NothingToSave("nothing to save on this panel yet")
        return record
    form = active_form(panel)
    if form is None:
        raise NothingToSave("this panel has no result to save")
    if form.last_result is None:
        raise NothingToSave("no result yet: fill in the fields first")
    if form.last_error is not None:
        raise NothingToSave("the result shown is out of date: fix the field marked with an "
                            "error first")
    kind = getattr(form, "LOG_KIND", None) or panel.id
    convert = getattr(form, "log_result", None)
    result = convert(form.last_result) if convert else json_ready(form.last_result)
    inputs = inputs_of(form)
    cable = inputs.get("cable")
    return LogRecord(kind, inputs, result if isinstance(result, dict) else {"value": result},
                     cable)


# -- saving ---------------------------------------------------------------------------------


def save_current(app) -> None:
    """Ctrl+S: ask for a label and note, then save the shown panel's result to the open job."""
    from textual.screen import ModalScreen

    from tui.joblog.db import JobLogError
    from tui.joblog.session import session_for

    if isinstance(app.screen, ModalScreen):  # a dialog is open: it has the keys
        return
    panel = app.query_one(f"#{app.current_panel}") if app.current_panel else None
    try:
        if panel is None:
            raise NothingToSave("nothing to save")
        record = record_of(panel)
        session = session_for(app)
        job = session.open_job()
    except NothingToSave as exc:
        app.notify(f"Not saved: {exc}.", title="Job log", severity="warning")
        return
    except JobLogError as exc:
        app.notify(f"Not saved: {exc}", title="Job log", severity="error", timeout=10)
        return
    asks = [Ask("save-label", "Label", placeholder="run or circuit, e.g. feeder 2"),
            Ask("save-note", "Note", placeholder="what you saw, what to do next")]
    if job is None:
        intro = f"No job yet: name the site to start one, then this {record.kind} is saved in it."
        asks.insert(0, Ask("save-site", "Site", placeholder="e.g. Harbour Road substation",
                           reader=required_text))
    else:
        intro = f"Save this {record.kind} result to job {job.id}: {job.site} ({job.date})."
    app.push_screen(FieldsDialog("Save to the job log", intro, asks, ok="Save"),
                    partial(_save_answered, app, record))


def _save_answered(app, record: LogRecord, values: dict | None) -> None:
    if values is None:
        return
    app.run_worker(partial(_save, app, record, values), thread=True, group="log-save",
                   exit_on_error=False)


def _save(app, record: LogRecord, values: dict) -> None:
    from tui.joblog.db import JobLogError
    from tui.joblog.session import session_for

    session = session_for(app)
    try:
        if values.get("save-site"):
            session.new_job(values["save-site"])
        entry = session.save(record.kind, record.inputs, record.result,
                             label=values.get("save-label", ""), note=values.get("save-note", ""),
                             cable=record.cable)
    except (JobLogError, ValueError) as exc:
        app.notify(f"Not saved: {exc}", title="Job log", severity="error", timeout=10)
        return
    job = session.log.job(entry.job_id)
    label = f" '{entry.label}'" if entry.label else ""
    app.notify(f"Saved {entry.kind}{label} as entry {entry.id} in job {job.id} ({job.site}).",
               title="Job log")


# -- reopening ------------------------------------------------------------------------------


def panel_for_kind(specs, kind: str):
    """The panel spec that reopens entries of ``kind``, or None."""
    for spec in specs:
        if kind in getattr(spec.module, "LOG_KINDS", ()) or spec.name == kind:
            return spec
    return None


def _field_keys(form) -> set[str]:
    fields = form.fields()
    prefix = _prefix([f.field_name for f in fields])
    return {input_key(f.field_name, prefix) for f in fields}


def form_for(panel, kind: str, inputs: dict):
    """The panel's form for an entry: the one with the entry's ``LOG_KIND`` if it has a
    field for every input, else the form with fields for the most inputs (an entry saved
    from the CLI under the command's kind may belong to another of the panel's forms)."""
    forms = _forms(panel)
    wanted = {k.replace("-", "_") for k in inputs}

    def score(form) -> tuple[int, bool]:
        return len(wanted & _field_keys(form)), getattr(form, "LOG_KIND", None) == kind

    exact = [f for f in forms if getattr(f, "LOG_KIND", None) == kind
             and wanted <= _field_keys(f)]
    if exact:
        return exact[0]
    best = max(forms, key=score, default=None)
    return best if best is not None and (score(best)[0] or len(forms) == 1) else None


def fill_form(form, inputs: dict) -> list[str]:
    """Type ``inputs`` into the form's matching fields; returns the inputs with no field."""
    fields = form.fields()
    prefix = _prefix([f.field_name for f in fields])
    by_key = {input_key(f.field_name, prefix): f for f in fields}
    missing = []
    for f in fields:  # a field not in the entry starts empty, as it was when saved
        f.input.value = ""
    for key, value in inputs.items():
        f = by_key.get(key.replace("-", "_"))
        if f is None:
            missing.append(key)
        else:
            f.input.value = value if isinstance(value, str) else str(value)
    return missing


async def _show_pane(widget) -> None:
    """Show the panel mode (:class:`tui.widgets.modes.Modes`) that holds ``widget``."""
    from tui.widgets.modes import Modes

    for node in widget.ancestors:
        if isinstance(node, Modes):
            await node.show_containing(widget)
            return


async def reopen(app, entry) -> str:
    """Open ``entry``'s panel with its inputs filled in; returns what happened, for people."""
    spec = panel_for_kind(app.PANELS, entry.kind)
    if spec is None:
        return f"No panel reopens {entry.kind} entries."
    await app.action_open_panel(spec.name)
    panel = await app.panel(spec.name)
    hook = getattr(panel, "fill_from_log", None)
    if hook is not None:
        hook(entry)
        return f"Entry {entry.id} reopened in {spec.title}."
    from tui.widgets.modes import Modes

    for modes in panel.query(Modes):  # every mode's form, to choose from
        await modes.mount_modes()
    form = form_for(panel, entry.kind, entry.inputs)
    if form is None:
        return f"{spec.title} has no form for {entry.kind} entries."
    await _show_pane(form)
    missing = fill_form(form, entry.inputs)
    text = f"Entry {entry.id} reopened in {spec.title}."
    if missing:
        text += f" Not filled (no such field here): {', '.join(missing)}."
    return text
