"""The caution line a calculation panel shows when a cable in use may be energized."""

from __future__ import annotations

from textual.widgets import Static


class WarningLine(Static):
    """One line naming the hazards of the cables in use; hidden when there are none.

    Panels call :meth:`set_hazards` with catalog hazard tags (and
    ``possibly_live`` when the user has marked the line so). The wording is
    :func:`tui.safety.warning_line`, kept with the other cautions.
    """

    def __init__(self) -> None:
        super().__init__("", id="warning-line", markup=False)
        self.tags: tuple[str, ...] = ()

    def on_mount(self) -> None:
        self.display = False

    def set_hazards(self, tags, possibly_live: bool = False) -> None:
        self.tags = tuple(dict.fromkeys(tags))
        if not self.tags and not possibly_live:
            self.display = False
            return
        from tui.safety import warning_line  # reads the caution text (once)

        line = warning_line(self.tags, possibly_live)
        self.display = bool(line)
        self.update(line)
