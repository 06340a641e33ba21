"""The one-line bar across the top: every panel with its function key, and the
unit system lengths are shown in."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal
from textual.reactive import reactive
from textual.widgets import Static

from tui.widgets.key_bar import KeyBar


def units_label(units: tuple[str, int]) -> str:
    """``"m"`` or ``"ft-in 1/16"``: the unit lengths are shown in (kept short so
    every panel name fits an 80-column bar)."""
    system, fraction = units
    return "m" if system == "metric" else f"ft-in 1/{fraction}"


class PanelBar(KeyBar):
    """Panel names with their function keys. Focused: left/right move between
    panels, Enter or Down goes into the panel, digits pick the panel's mode."""

    BINDINGS = [
        Binding("enter,down", "enter", "Into panel", id="bar.enter", show=False),
        *[Binding(str(n), f"mode({n - 1})", "", show=False) for n in range(1, 10)],
    ]

    def __init__(self, specs) -> None:
        super().__init__([(s.name, s.function_key.upper(), s.title) for s in specs],
                         id="panel-bar-names")

    def action_mode(self, index: int) -> None:
        """Digits on the bar pick a mode of the shown panel (panels with modes
        have ``action_mode(index)``)."""
        panel = self.app.query_one("#panels").visible_content
        if panel is not None and hasattr(panel, "action_mode"):
            panel.action_mode(index)

    def action_enter(self) -> None:
        if self.current:
            self.action_pick(self.current)


class TopBar(Horizontal):
    """The panel bar and, at its right, the unit system."""

    units: reactive[tuple[str, int]] = reactive(("metric", 16))

    def __init__(self, specs, units: tuple[str, int]) -> None:
        super().__init__(id="panel-bar")
        self.specs = specs
        self.set_reactive(TopBar.units, units)

    def compose(self) -> ComposeResult:
        yield PanelBar(self.specs)
        yield Static(units_label(self.units), id="panel-bar-units")

    def watch_units(self, units: tuple[str, int]) -> None:
        if self.is_mounted:
            self.query_one("#panel-bar-units", Static).update(units_label(units))
