"""The one-line bar across the top: every panel with its function key, and the
unit system lengths are shown in."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal
from textual.content import Content
from textual.message import Message
from textual.reactive import reactive
from textual.widgets import Static


def units_label(units: tuple[str, int]) -> str:
    """``"m"`` or ``"ft-in 1/16"``: the unit system in a few characters."""
    system, fraction = units
    return "lengths: m" if system == "metric" else f"lengths: ft-in 1/{fraction}"


class PanelBar(Horizontal, can_focus=True):
    """Panel names with their keys; the current one stands out. Focusable: left
    and right move between panels, Enter goes into the panel."""

    BINDINGS = [
        Binding("left", "step(-1)", "Previous panel", id="bar.previous", show=False),
        Binding("right", "step(1)", "Next panel", id="bar.next", show=False),
        Binding("enter,down", "enter", "Into panel", id="bar.enter", show=False),
        *[Binding(str(n), f"mode({n - 1})", "", show=False) for n in range(1, 10)],
    ]

    current: reactive[str | None] = reactive(None)
    units: reactive[tuple[str, int]] = reactive(("metric", 16))

    class Selected(Message):
        """The user picked panel ``name`` in the bar (click or Enter)."""

        def __init__(self, name: str) -> None:
            super().__init__()
            self.name = name

    def __init__(self, specs, units: tuple[str, int]) -> None:
        super().__init__(id="panel-bar")
        self.specs = list(specs)
        self.set_reactive(PanelBar.current, self.specs[0].name if self.specs else None)
        self.set_reactive(PanelBar.units, units)

    def compose(self) -> ComposeResult:
        yield Static(self._names(), id="panel-bar-names")
        yield Static(units_label(self.units), id="panel-bar-units")

    def _names(self) -> Content:
        parts = []
        for s in self.specs:
            style = "reverse bold" if s.name == self.current else ""
            part = Content.assemble(" ", (s.function_key.upper(), "dim"), " ", s.title, " ")
            part = part.stylize(f"@click=app.open_panel('{s.name}')")
            parts.append(part.stylize(style) if style else part)
        return Content(" ").join(parts)

    def watch_current(self) -> None:
        if self.is_mounted:
            self.query_one("#panel-bar-names", Static).update(self._names())

    def watch_units(self, units: tuple[str, int]) -> None:
        if self.is_mounted:
            self.query_one("#panel-bar-units", Static).update(units_label(units))

    def action_step(self, step: int) -> None:
        names = [s.name for s in self.specs]
        if not names:
            return
        i = names.index(self.current) if self.current in names else 0
        self.post_message(self.Selected(names[(i + step) % len(names)]))
        self.call_after_refresh(self.focus)

    def action_mode(self, index: int) -> None:
        """Digits on the bar pick a tab of the shown panel (panels with tabs
        have ``action_mode(index)``)."""
        panel = self.app.query_one("#panels").visible_content
        if panel is not None and hasattr(panel, "action_mode"):
            panel.action_mode(index)

    def action_enter(self) -> None:
        if self.current:
            self.post_message(self.Selected(self.current))
