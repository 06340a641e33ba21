"""Trace panel: open a recorded trace (delimited text or a Touchstone .s1p
sweep), see its events found, placed and named on the plot and in a table,
and compare them with the run and load the line should have.

The numbers come from the same core calls as ``halftrip trace``
(:func:`tui.commands.trace.analyse_file`).
"""

from __future__ import annotations

from pathlib import Path

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.widgets import Input

from tui.widgets.warning_line import WarningLine

KEY = "t"
ORDER = 4
TITLE = "Trace"
DESCRIPTION = "open a recorded trace or .s1p sweep: its events placed, named and compared"
#: The demo traces (invented sites, made by halftrip's own predictor plus noise;
#: see tui/demo/traces.py) ship in this folder.
DEMO_DIR = Path(__file__).resolve().parent.parent.parent / "demo"
DEMO = {
    "trace-file": str(DEMO_DIR / "kestrel-ridge-feeder.csv"),
    "trace-on": "2 m:rg58, 45 m:hardline-50-half, 1.5 m:rg58",
    "trace-expect-load": "50 ohm",
}


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
