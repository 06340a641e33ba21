"""Cut panel: lines of a given electrical length as a tape measure shows them:
cut length, quarter-wave transformer, phasing harness, trimming a piece cut
long, and stubs. Each mode is the matching CLI command's options as fields
(see :mod:`tui.widgets.command_form`), so it shows what the command prints."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical

from tui.widgets.modes import Modes
from tui.widgets.warning_line import WarningLine

KEY = "x"
ORDER = 2
TITLE = "Cut"
DESCRIPTION = "cut lists: electrical length to tape length, transformer, harness, trim, stubs"
LOG_KINDS = ("cut", "match", "harness", "trim", "stub")
#: An invented job: a two-antenna 2 m band array at the (invented) Marsh Lane relay site.
DEMO = {
    "cut-len-frequency": "146 MHz",
    "cut-len-degrees": "90",
    "cut-len-cable": "rg213",
    "cut-len-allowance": "15 mm",
    "cut-match-from": "50 ohm",
    "cut-match-to": "100 ohm",
    "cut-match-frequency": "146 MHz",
    "cut-match-band": "144-148 MHz",
    "cut-harness-antennas": "2",
    "cut-harness-antenna-z": "50 ohm",
    "cut-harness-feed-z": "50 ohm",
    "cut-harness-frequency": "146 MHz",
    "cut-harness-span": "2.1 m",
    "cut-trim-frequency": "146 MHz",
    "cut-trim-degrees": "90",
    "cut-trim-length": "360 mm",
    "cut-trim-measured": "3.62 ns",
    "cut-stub-frequency": "146 MHz",
    "cut-stub-cable": "rg213",
    "cut-stub-end": "short",
    "cut-stub-present": "open",
}

MODES = [
    ("len", "Cut length", "tui.panels.cut.length:CutLengthForm"),
    ("match", "Transformer", "tui.panels.cut.transformer:TransformerForm"),
    ("harness", "Harness", "tui.panels.cut.harness:HarnessForm"),
    ("trim", "Trim", "tui.panels.cut.trim:TrimForm"),
    ("stub", "Stub", "tui.panels.cut.stub:StubForm"),
]


class Panel(Vertical):
    """Five ways to get a length to cut, one mode each."""

    BINDINGS = [Binding(str(i + 1), f"mode({i})", f"Mode: {title}", id=f"cut.mode.{name}",
                        show=False) for i, (name, title, _w) in enumerate(MODES)]

    def __init__(self, id: str | None = None) -> None:
        super().__init__(id=id, classes="panel")

    def compose(self) -> ComposeResult:
        yield WarningLine()
        yield Modes(MODES, "cut")

    async def action_mode(self, index: int) -> None:
        await self.query_one(Modes).action_mode(index)
