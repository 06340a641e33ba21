"""The log panel's widget (its constants are in :mod:`tui.panels.log`)."""

from __future__ import annotations

from pathlib import Path

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.message import Message
from textual.widgets import DataTable, Input, Label, Select, Static

from tui.panels.log.entry_table import EntryTable
from tui.widgets import readers
from tui.widgets.field import Field

INTRO = "Ctrl+S on a panel saves here · p f r pass fail recheck · a tags · i note"



class Panel(Vertical):
    """Job chooser, filter, the job's entries, and the highlighted entry's summary."""

    BINDINGS = [
        Binding("o", "reopen", "Reopen", id="log.reopen"),
        Binding("x", "export", "Export", id="log.export"),
        Binding("n", "new_job", "New job", id="log.new_job"),
        Binding("delete", "delete", "Delete", id="log.delete", key_display="Del"),
        Binding("z", "undo", "Undo delete", id="log.undo"),
        Binding("p", "status('pass')", "Pass", id="log.pass", show=False),
        Binding("f", "status('fail')", "Fail", id="log.fail", show=False),
        Binding("r", "status('recheck')", "Recheck", id="log.recheck", show=False),
        Binding("a", "tags", "Tags", id="log.tags", show=False),
        Binding("i", "edit", "Label and note", id="log.edit", show=False),
        Binding("slash", "filter", "Filter", id="log.filter", show=False),
    ]

    class Changed(Message):
        """The job log changed (posted from any thread by the session's listener)."""

    def __init__(self, id: str | None = None) -> None:
        super().__init__(id=id, classes="panel")
        self._entries: list = []
        self._shown_job: int | None = None

    # -- layout ---------------------------------------------------------------------------

    def compose(self) -> ComposeResult:
        # The table comes first so the cursor lands in it; the job chooser and the filter
        # are docked above it (see halftrip.tcss).
        yield EntryTable(id="log-entries")
        yield Static("", id="log-detail", markup=False)
        with Vertical(id="log-top"):
            yield Static(INTRO, classes="panel-intro", markup=False)
            with Horizontal(id="log-jobbar"):
                yield Label("Job", classes="field-label")
                yield Select([], id="log-job", prompt="no job yet: n starts one",
                             allow_blank=True, compact=True)
            yield Field("log-filter", "Filter", reader=readers.text,
                        placeholder="e.g. fail feeder",
                        tooltip="A word that is a tag shows entries with that tag; other "
                                "words must appear in the label")
            yield Static("", id="log-problem", markup=False)

    @property
    def session(self):
        from tui.joblog.session import session_for

        return session_for(self.app)

    def on_mount(self) -> None:
        self.session.listen(lambda: self.post_message(self.Changed()))
        self.watch(self.app, "unit_system", lambda _u: self.refill(), init=False)
        # The file is first read once the start-up worker is done: no disk work before the
        # first frame (and the demo's job is built with the loaded core).
        self.watch(self.app, "core_ready", lambda ready: ready and self.refill())

    def on_show(self) -> None:
        if self.app.core_ready:
            self.refill()  # the CLI may have saved meanwhile

    def on_panel_changed(self, _message: Changed) -> None:
        self.refill()

    # -- filling --------------------------------------------------------------------------

    def refill(self) -> None:
        """Read jobs and the open job's entries again and show them."""
        if not self.app.core_ready:
            return
        from tui.joblog.db import JobLogError

        problem = self.query_one("#log-problem", Static)
        table = self.query_one(EntryTable)
        try:
            jobs = self.session.log.jobs()
            job = self.session.open_job()
            self._entries = self.session.log.entries(job.id) if job else []
        except JobLogError as exc:
            problem.update(f"Job log unavailable: {exc}")
            problem.display = True
            table.display = False
            return
        problem.display = False
        table.display = True
        self._fill_jobs(jobs, job)
        units, fraction = self.app.unit_system
        text = self.query_one("#log-filter", Input).value
        table.fill(self._entries, text, units, fraction)
        if job is None:
            table.border_title = "no job yet: press n to start one"
        self._show_detail()

    def _fill_jobs(self, jobs, job) -> None:
        select = self.query_one("#log-job", Select)
        options = [(f"{j.id}  {j.date}  {j.site}  ({j.entry_count})", j.id) for j in jobs]
        self._shown_job = job.id if job else None
        select.set_options(options)
        if job is not None:
            select.value = job.id

    def on_select_changed(self, event: Select.Changed) -> None:
        """The user chose another job (our own setting of the value is ignored)."""
        event.stop()
        if isinstance(event.value, int) and event.value != self._shown_job:
            self.session.choose_job(event.value)

    def on_input_changed(self, event: Input.Changed) -> None:
        event.stop()
        units, fraction = self.app.unit_system
        self.query_one(EntryTable).fill(self._entries, event.value, units, fraction)
        self._show_detail()

    def on_data_table_row_highlighted(self, event: DataTable.RowHighlighted) -> None:
        event.stop()
        self._show_detail()

    def on_data_table_row_selected(self, event: DataTable.RowSelected) -> None:
        event.stop()
        self.action_show()

    def selected(self):
        entry_id = self.query_one(EntryTable).selected_id()
        return next((e for e in self._entries if e.id == entry_id), None)

    def _show_detail(self) -> None:
        from tui import fmt
        from tui.joblog.export import summary

        detail = self.query_one("#log-detail", Static)
        entry = self.selected()
        if entry is None:
            detail.update("")
            return
        units, fraction = self.app.unit_system
        typed = ", ".join(f"{fmt.key_label(k)} {v}" for k, v in entry.inputs.items()) or "-"
        lines = [f"Entry {entry.id}: {entry.kind}" + (f" - {entry.label}" if entry.label else "")
                 + (f" · cable {entry.cable}" if entry.cable else "")
                 + (f" · {' '.join(entry.tags)}" if entry.tags else ""),
                 f"Inputs: {typed}",
                 f"Result: {summary(entry, units, fraction)}"]
        if entry.note:
            lines.append(f"Note: {entry.note}")
        detail.update("\n".join(lines))

    # -- changes (in a worker; the session's listener refills the panel) -------------------

    def _change(self, work, done: str | None = None) -> None:
        """Run ``work(log)`` off the UI thread; show ``done`` or the refusal."""
        from tui.joblog.db import JobLogError

        def run() -> None:
            try:
                outcome = work(self.session.log)
            except (JobLogError, ValueError) as exc:
                self.app.notify(str(exc), title="Job log", severity="error", timeout=10)
                return
            self.session.changed()
            text = done(outcome) if callable(done) else done
            if text:
                self.app.notify(text, title="Job log")

        self.run_worker(run, thread=True, group="log-change", exit_on_error=False)

    def _need_entry(self):
        entry = self.selected()
        if entry is None:
            self.app.notify("Choose an entry first.", title="Job log", severity="warning")
        return entry

    def _ask(self, title: str, intro: str, asks, then, ok: str = "OK") -> None:
        """Show a :class:`FieldsDialog`; ``then(values)`` runs if it is accepted."""
        from tui.panels.log.fields_dialog import FieldsDialog

        self.app.push_screen(FieldsDialog(title, intro, asks, ok=ok),
                             lambda values: values is not None and then(values))

    @staticmethod
    def _tags_now(entry) -> str:
        return f"Entry {entry.id}: {' '.join(entry.tags) or 'no tags'}"

    def action_status(self, tag: str) -> None:
        entry = self._need_entry()
        if entry is None:
            return
        remove = tag in entry.tags  # pressing it again takes it off
        self._change(lambda log: log.tag(entry.id, [tag], remove=remove), self._tags_now)

    def action_tags(self) -> None:
        from tui.panels.log.fields_dialog import Ask

        entry = self._need_entry()
        if entry is not None:
            self._ask(f"Tags of entry {entry.id}",
                      "Words, a space between: pass, fail or recheck, and any of your own.",
                      [Ask("tags-words", "Tags", " ".join(entry.tags), "e.g. fail wet-connector")],
                      lambda v: self._change(lambda log: log.set_tags(entry.id, v["tags-words"]
                                                                      .split()), self._tags_now))

    def action_edit(self) -> None:
        from tui.panels.log.fields_dialog import Ask

        entry = self._need_entry()
        if entry is not None:
            self._ask(f"Entry {entry.id}: {entry.kind}", "The inputs and the result stay as saved.",
                      [Ask("edit-label", "Label", entry.label, "e.g. feeder 2"),
                       Ask("edit-note", "Note", entry.note)],
                      lambda v: self._change(lambda log: log.edit_entry(
                          entry.id, label=v["edit-label"], note=v["edit-note"]),
                          f"Entry {entry.id} changed."))

    def action_new_job(self) -> None:
        from tui.panels.log.fields_dialog import Ask, required_text

        self._ask("New job", "Today's date is used; results saved with Ctrl+S go to the new job.",
                  [Ask("job-site", "Site", "", "e.g. Harbour Road substation", required_text),
                   Ask("job-notes", "Notes", "", "access, contacts, weather")],
                  lambda v: self._change(
                      lambda _log: self.session.new_job(v["job-site"], v["job-notes"]),
                      lambda j: f"Job {j.id} started: {j.site}. Saves now go to it."),
                  ok="Start")

    def action_delete(self) -> None:
        from tui.panels.log.confirm import ConfirmDialog

        entry = self._need_entry()
        if entry is None:
            return
        what = f"{entry.kind}" + (f" '{entry.label}'" if entry.label else "")

        def answered(yes: bool | None) -> None:
            if yes:
                self._change(lambda log: log.delete(entry.id),
                             f"Deleted entry {entry.id} ({what}). Press z to bring it back.")

        self.app.push_screen(ConfirmDialog(
            "Delete an entry", f"Delete entry {entry.id} ({what}) from the job? "
            "z (undo) brings it back.", "Delete"), answered)

    def action_undo(self) -> None:
        def undo(log):
            entry = log.undo_delete()
            if entry is not None:
                self.session.job_id = entry.job_id  # show it in the job it came back to
            return entry

        def restored(entry) -> str:
            if entry is None:
                return "Nothing to undo: no entry is deleted."
            return f"Restored entry {entry.id} ({entry.kind}) to job {entry.job_id}."

        self._change(undo, restored)

    def action_filter(self) -> None:
        self.query_one("#log-filter", Input).focus()

    def action_show(self) -> None:
        from tui.joblog.export import entry_markdown
        from tui.panels.log.entry_screen import EntryScreen

        entry = self._need_entry()
        if entry is None:
            return
        units, fraction = self.app.unit_system
        job = self.session.open_job()
        text = entry_markdown(entry, units, fraction, job.date if job else None, level=1)

        def closed(answer) -> None:
            if answer == "reopen":
                self.action_reopen()

        self.app.push_screen(EntryScreen(text), closed)

    async def action_reopen(self) -> None:
        from tui.panels.log.saving import reopen

        entry = self._need_entry()
        if entry is None:
            return
        self.app.notify(await reopen(self.app, entry), title="Job log")

    def action_export(self) -> None:
        from tui.joblog.export import FORMATS
        from tui.panels.log.fields_dialog import Ask

        job = self.session.open_job()
        if job is None:
            self.app.notify("No job to export yet.", title="Job log", severity="warning")
            return

        def form(text: str, label: str) -> str:
            from calc.errors import InputError

            t = text.strip().lower().lstrip(".")
            if t not in FORMATS:
                raise InputError(label, "use md, csv or json", "md")
            return t

        self._ask(f"Export job {job.id}: {job.site}",
                  "md: a report to hand in · csv: for a spreadsheet · json: for programs. The "
                  "file is written whole or not at all.",
                  [Ask("export-format", "Format", "md", "md, csv or json", form),
                   Ask("export-file", "File", str(default_report_path(job)), "")],
                  lambda v: self._export(job, v["export-format"], v["export-file"]),
                  ok="Export")

    def _export(self, job, form: str, file_text: str) -> None:
        units, fraction = self.app.unit_system

        def work(log) -> Path:
            from cable_catalog.loader import atomic_write_text
            from tui.joblog.export import export_job

            path = report_path(file_text or str(default_report_path(job)), form)
            text = export_job(log.job(job.id), log.entries(job.id), form, units, fraction)
            try:
                path.parent.mkdir(parents=True, exist_ok=True)
                atomic_write_text(path, ("\ufeff" if form == "csv" else "") + text)
            except OSError as exc:
                raise ValueError(f"Report not written: cannot write {path} "
                                 f"({exc.strerror or exc})") from None
            return path

        self._change(work, lambda path: f"Wrote the {form} report of job {job.id} to {path}")


def default_report_path(job) -> Path:
    """``~/halftrip-job-3-harbour-road-substation`` (the format's suffix is added)."""
    import re

    slug = re.sub(r"[^a-z0-9]+", "-", job.site.lower()).strip("-")[:40] or "site"
    return Path.home() / f"halftrip-job-{job.id}-{slug}"


def report_path(text: str, form: str) -> Path:
    path = Path(text.strip()).expanduser()
    return path if path.suffix else path.with_name(f"{path.name}.{form}")
