"""The caution line a calculation panel shows when a cable in use may be energized."""

from __future__ import annotations

from textual.widgets import Static


class WarningLine(Static):
    """One line naming the hazards of the cables in use; hidden when there are none.

    Panels call :meth:`set_hazards` with catalog hazard tags. The wording comes
    from ``tui.commands.common.caution_line`` (which defers to the safety
    module when it is present), the same line the CLI prints.
    """

    def __init__(self) -> None:
        super().__init__("", id="warning-line", markup=False)
        self.tags: tuple[str, ...] = ()

    def on_mount(self) -> None:
        self.display = False

    def set_hazards(self, tags) -> None:
        from tui.commands.common import caution_line

        self.tags = tuple(sorted(set(tags)))
        line = caution_line(self.tags)
        self.display = bool(line)
        self.update(line or "")
