"""Echo panel: what a load sends back, the load a step on a trace implies, and
the whole run's predicted trace, plotted against distance with its echoes."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical

from tui.widgets.modes import Modes
from tui.widgets.warning_line import WarningLine

KEY = "e"
ORDER = 3
TITLE = "Echo"
DESCRIPTION = "reflections: a load's echo, the load a step implies, a whole run's predicted trace"
LOG_KINDS = ("echo", "simulate")
#: An invented job: the feeder of the (invented) Kestrel Ridge repeater.
DEMO = {
    "echo-load-z0": "50 ohm",
    "echo-load-load": "75 ohm",
    "echo-step-z0": "50 ohm",
    "echo-step-observed-step": "-0.33",
    "echo-run-run": "1.5 m:rg58, 28 m:hardline-50-half, 2 m:rg58",
    "echo-run-load": "open",
    "echo-run-lump": "1: 4 nH",
    "echo-run-rise-time": "1 ns",
}

MODES = [
    ("load", "A load", "tui.panels.echo.load:LoadForm"),
    ("step", "From a step", "tui.panels.echo.step:StepForm"),
    ("run", "Whole run", "tui.panels.echo.whole_run:WholeRunForm"),
]


class Panel(Vertical):
    """Three ways to read reflections, one mode each."""

    BINDINGS = [Binding(str(i + 1), f"mode({i})", f"Mode: {title}", id=f"echo.mode.{name}",
                        show=False) for i, (name, title, _w) in enumerate(MODES)]

    def __init__(self, id: str | None = None) -> None:
        super().__init__(id=id, classes="panel")

    def compose(self) -> ComposeResult:
        yield WarningLine()
        yield Modes(MODES, "echo")

    async def action_mode(self, index: int) -> None:
        await self.query_one(Modes).action_mode(index)
