"""The trace panel's widget (its constants are in :mod:`tui.panels.trace`)."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.widgets import Input

from tui.panels.trace import DEMO_DIR
from tui.widgets.warning_line import WarningLine


class Panel(Vertical):
    """The trace form (file, placement, expectation) over the plot and events."""

    BINDINGS = [
        Binding("ctrl+o", "pick_file", "Open file", id="trace.open"),
    ]

    def __init__(self, id: str | None = None) -> None:
        super().__init__(id=id, classes="panel")

    def compose(self) -> ComposeResult:
        from tui.panels.trace.trace_form import TraceForm

        yield WarningLine()
        yield TraceForm(id="trace-form")

    def action_pick_file(self) -> None:
        """Ctrl+O: choose a file from the demo traces or the folders."""
        from tui.panels.trace.file_picker import FilePicker

        field = self.query_one("#trace-file", Input)

        def picked(path: str | None) -> None:
            if path:
                field.value = path
                field.focus()

        self.app.push_screen(FilePicker(DEMO_DIR, field.value), picked)
