"""Trace panel: open a recorded trace (delimited text or a Touchstone .s1p
sweep), see its events in a table and on a plot against distance, and compare
it with the run as it should be."""

from __future__ import annotations

from pathlib import Path

from textual.app import ComposeResult
from textual.containers import Vertical, VerticalScroll

from tui.widgets.warning_line import WarningLine

KEY = "t"
ORDER = 4
TITLE = "Trace"
DESCRIPTION = "read a recorded trace or sweep: events named and placed, plotted, compared"
LOG_KINDS = ("trace",)
_DEMO_DIR = Path(__file__).resolve().parents[2] / "demo"
#: The invented Kestrel Ridge relay hut feeder (see tui/demo/traces.py).
DEMO = {
    "trace-file": str(_DEMO_DIR / "kestrel-ridge-feeder.csv"),
    "trace-cable": "2 m:rg58, 45 m:hardline-50-half, 1.5 m:rg58",
    "trace-expect-run": "2 m:rg58, 45 m:hardline-50-half, 1.5 m:rg58",
    "trace-expect-load": "open",
}


class Panel(Vertical):
    """One form: the file, how to place it, what it should look like."""

    def __init__(self, id: str | None = None) -> None:
        super().__init__(id=id, classes="panel")

    def compose(self) -> ComposeResult:
        from tui.panels.trace.form import TraceForm

        yield WarningLine()
        yield VerticalScroll(TraceForm())
