"""The caution line a panel shows when its line may be energized."""

from __future__ import annotations

from textual.reactive import reactive
from textual.widgets import Static


class WarningLine(Static):
    """One line of caution; hidden when there is nothing to warn of.

    It shows when the cables in use carry hazard tags (panels call
    :meth:`set_hazards` with catalog tags) or when the user marks the line as
    possibly live (the app's ``!`` key toggles :attr:`possibly_live` on the
    current panel's warning line). The wording is :func:`tui.safety.warning_line`.
    """

    #: Hazard tags of the cables in use, in a stable order.
    tags: reactive[tuple[str, ...]] = reactive((), init=False)
    #: The user has marked this panel's line as possibly live.
    possibly_live: reactive[bool] = reactive(False, init=False)

    def __init__(self) -> None:
        super().__init__("", id="warning-line", markup=False)

    def on_mount(self) -> None:
        self._show()

    def set_hazards(self, tags, possibly_live: bool | None = None) -> None:
        self.tags = tuple(sorted(set(tags)))
        if possibly_live is not None:
            self.possibly_live = possibly_live

    def watch_tags(self) -> None:
        self._show()

    def watch_possibly_live(self) -> None:
        self._show()

    def _show(self) -> None:
        if not self.tags and not self.possibly_live:
            self.display = False  # no need to read the caution text (start-up)
            return
        from tui.safety import warning_line

        line = warning_line(self.tags, self.possibly_live)
        self.display = bool(line)
        self.update(line)
