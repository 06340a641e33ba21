"""A one-line bar of choices, each with its key: the panel bar across the top
and the mode bar of a panel with several ways to do its job."""

from __future__ import annotations

from textual.binding import Binding
from textual.content import Content
from textual.message import Message
from textual.reactive import reactive
from textual.widgets import Static


class KeyBar(Static, can_focus=True):
    """``(name, key, title)`` items in a row; the current one reversed and bold
    (so it shows with NO_COLOR too). Focused, left and right move; a click or
    Enter picks. Posts :class:`KeyBar.Selected`."""

    BINDINGS = [
        Binding("left", "step(-1)", "Previous", show=False),
        Binding("right", "step(1)", "Next", show=False),
    ]

    current: reactive[str | None] = reactive(None)

    class Selected(Message):
        """Item ``name`` of ``bar`` was picked."""

        def __init__(self, bar: KeyBar, name: str) -> None:
            super().__init__()
            self.bar = bar
            self.name = name

        @property
        def control(self) -> KeyBar:
            return self.bar

    def __init__(self, items: list[tuple[str, str, str]], current: str | None = None,
                 id: str | None = None, classes: str | None = None) -> None:
        super().__init__(id=id, classes=classes, markup=False)
        self.items = list(items)
        self.set_reactive(KeyBar.current, current or (self.items[0][0] if self.items else None))

    def on_mount(self) -> None:
        self.update(self._content())

    def _content(self) -> Content:
        parts = []
        for name, key, title in self.items:
            part = Content.assemble((key, "dim"), " " if key else "", title)
            part = part.stylize(f"@click=pick('{name}')")
            parts.append(part.stylize("reverse bold") if name == self.current else part)
        return Content("  ").join(parts)

    def watch_current(self) -> None:
        if self.is_mounted:
            self.update(self._content())

    def action_pick(self, name: str) -> None:
        self.post_message(self.Selected(self, name))

    def action_step(self, step: int) -> None:
        names = [n for n, _k, _t in self.items]
        if names:
            i = names.index(self.current) if self.current in names else 0
            self.action_pick(names[(i + step) % len(names)])
