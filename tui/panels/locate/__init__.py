"""Locate panel: where is the reflection? One cable, a run of cables, a cable
read from both ends, and measuring a cable's velocity factor."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical

from tui.widgets.modes import Modes
from tui.widgets.warning_line import WarningLine

KEY = "l"
ORDER = 1
TITLE = "Locate"
DESCRIPTION = "round-trip delay to distance: one cable, a run, both ends; measure a VF"
LOG_KINDS = ("locate", "locate-run", "locate-two-ended", "calibrate")
#: An invented job: a roof feeder of the (invented) Marsh Lane relay site.
DEMO = {
    "locate-one-delay": "312 ns",
    "locate-one-cable": "rg213",
    "locate-one-rise-time": "2 ns",
    "locate-run-run": "1.5 m:rg58, 28 m:hardline-50-half, 2 m:rg58",
    "locate-run-delay": "131 ns",
    "locate-ends-from-a": "1.10 us",
    "locate-ends-from-b": "0.775 us",
    "locate-ends-length": "250 m",
    "locate-ends-cable": "hardline-50-7-8",
    "locate-vf-length": "10 m",
    "locate-vf-reading": "101.5 ns",
}



MODES = [
    ("one", "One cable", "tui.panels.locate.one_cable:OneCableForm"),
    ("run", "Run of cables", "tui.panels.locate.run:RunForm"),
    ("ends", "Both ends", "tui.panels.locate.both_ends:BothEndsForm"),
    ("vf", "Measure VF", "tui.panels.locate.measure:MeasureForm"),
]


class Panel(Vertical):
    """Four ways to place an event, one mode each."""

    BINDINGS = [Binding(str(i + 1), f"mode({i})", f"Mode: {title}", id=f"locate.mode.{name}",
                        show=False) for i, (name, title, _f) in enumerate(MODES)]

    def __init__(self, id: str | None = None) -> None:
        super().__init__(id=id, classes="panel")

    def compose(self) -> ComposeResult:
        yield WarningLine()
        yield Modes(MODES, "locate")

    async def action_mode(self, index: int) -> None:
        await self.query_one(Modes).action_mode(index)
