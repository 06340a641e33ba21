"""A panel's modes (the several ways it does its job): a mode bar and one
form per mode, only the first built before the first frame."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.containers import Vertical, VerticalScroll
from textual.widget import Widget
from textual.widgets import ContentSwitcher

from tui.widgets.key_bar import KeyBar

#: (name, title, widget): the widget class, or ``"module:Class"`` to import
#: it only when the mode is built (start-up imports as little as it can).
Mode = tuple[str, str, "type[Widget] | str"]


def build(widget: type[Widget] | str) -> Widget:
    """An instance of a mode's widget class (importing ``"module:Class"``)."""
    if isinstance(widget, str):
        import importlib

        module, _, name = widget.partition(":")
        widget = getattr(importlib.import_module(module), name)
    return widget()


class Modes(Vertical):
    """Mode bar (keys 1-9 when the cursor is not in a field) over the modes.

    The first mode is composed with the panel; the others are mounted right
    after the first frame, so start-up pays for one form only. Each mode
    scrolls on its own when it is taller than the screen.
    """

    DEFAULT_CSS = """
    Modes { height: 1fr; }
    Modes > ContentSwitcher { height: 1fr; }
    Modes > ContentSwitcher > VerticalScroll { height: 1fr; }
    """

    def __init__(self, modes: list[Mode], prefix: str) -> None:
        super().__init__(id=f"{prefix}-modes")
        self.modes = list(modes)
        self.prefix = prefix

    def compose(self) -> ComposeResult:
        items = [(name, str(i + 1), title) for i, (name, title, _f) in enumerate(self.modes)]
        yield KeyBar(items, id=f"{self.prefix}-mode-bar", classes="mode-bar")
        first = self.modes[0]
        with ContentSwitcher(initial=self._mode_id(first[0])):
            yield VerticalScroll(build(first[2]), id=self._mode_id(first[0]))

    def _mode_id(self, name: str) -> str:
        return f"{self.prefix}-mode-{name}"

    def on_mount(self) -> None:
        self.call_after_refresh(self.mount_modes)

    async def mount_modes(self) -> None:
        """Mount every mode not mounted yet (they are, shortly after start-up)."""
        switcher = self.query_one(ContentSwitcher)
        for name, _title, widget in self.modes[1:]:
            if not switcher.query_children(f"#{self._mode_id(name)}"):
                scroll = VerticalScroll(build(widget), id=self._mode_id(name))
                scroll.display = False  # ContentSwitcher hides only what it started with
                await switcher.mount(scroll)

    @property
    def current(self) -> str:
        return self.query_one(KeyBar).current

    @property
    def bar(self) -> KeyBar:
        return self.query_one(KeyBar)

    async def show(self, name: str) -> None:
        """Show mode ``name`` (mounting it if the start-up mount has not yet)."""
        await self.mount_modes()
        self.query_one(ContentSwitcher).current = self._mode_id(name)
        self.query_one(KeyBar).current = name

    async def show_containing(self, widget: Widget) -> None:
        """Show the mode that holds ``widget``."""
        for name, _title, _w in self.modes:
            scroll = self.query_one(ContentSwitcher).query_children(f"#{self._mode_id(name)}")
            if scroll and (widget is scroll.first() or scroll.first() in widget.ancestors):
                await self.show(name)
                return

    def shown_widget(self) -> Widget | None:
        return self.query_one(ContentSwitcher).visible_content

    async def on_key_bar_selected(self, message: KeyBar.Selected) -> None:
        if message.bar is self.query_one(KeyBar):
            message.stop()
            await self.show(message.name)
            self.app.focus_first_field(self.shown_widget())

    async def action_mode(self, index: int) -> None:
        if 0 <= index < len(self.modes):
            await self.show(self.modes[index][0])
            self.app.focus_first_field(self.shown_widget())


def modes_panel(panel_name: str, modes: list[tuple[str, str, object]], doc: str
                ) -> type[Vertical]:
    """A panel that is a caution line over :class:`Modes` (Locate, Cut, Echo): the
    digit keys pick its modes. ``panel_name`` prefixes the bindings' ids."""
    from textual.binding import Binding

    from tui.widgets.warning_line import WarningLine

    class Panel(Vertical):
        BINDINGS = [Binding(str(i + 1), f"mode({i})", f"Mode: {title}",
                            id=f"{panel_name}.mode.{name}", show=False)
                    for i, (name, title, _form) in enumerate(modes)]

        def __init__(self, id: str | None = None) -> None:
            super().__init__(id=id, classes="panel")

        def compose(self) -> ComposeResult:
            yield WarningLine()
            yield Modes(modes, panel_name)

        async def action_mode(self, index: int) -> None:
            await self.query_one(Modes).action_mode(index)

    Panel.__doc__ = doc
    Panel.__qualname__ = f"{panel_name}.Panel"
    return Panel
