"""The cut panel's widget (its constants are in :mod:`tui.panels.cut`)."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical

from tui.panels.cut import MODES
from tui.widgets.modes import Modes
from tui.widgets.warning_line import WarningLine


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
