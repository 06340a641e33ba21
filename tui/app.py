"""The terminal interface: one Textual app, built by :func:`create_app`.

``halftrip`` (no arguments), ``halftrip demo`` and the tests all build the
app with :func:`create_app`; :func:`run_app` runs it.

Start-up is kept short: the first frame needs only Textual and the panel
modules (which keep their top level light, see :mod:`tui.panels`). After it
is on screen a worker thread loads what the calculations need: pint's unit
registry (``calc.parse.warm_up``, several hundred ms), numpy (~100 ms) and the
cable catalog. Until then results read "starting"; when the worker is done the
app sets :attr:`HalftripApp.core_ready` and every panel computes.
"""

from __future__ import annotations

from pathlib import Path
from typing import ClassVar

from textual import work
from textual.app import App, ComposeResult, SystemCommand
from textual.binding import Binding
from textual.reactive import reactive
from textual.widgets import ContentSwitcher, Footer

from tui.panels import PanelSpec, discover
from tui.prefs import Preferences, changed, load_preferences, update_preferences, with_section
from tui.widgets.key_bar import KeyBar
from tui.widgets.panel_bar import PanelBar, TopBar

#: Keys of the app itself (panel keys are added from the panel modules).
APP_BINDINGS = [
    Binding("f1,question_mark", "help", "Help", id="help", key_display="F1"),
    Binding("u,f9", "switch_units", "Units", id="units", key_display="u"),
    Binding("ctrl+s", "save_to_log", "Save to log", id="save_to_log", key_display="^s"),
    Binding("d", "switch_theme", "Dark/light", id="theme", show=False),
    Binding("exclamation_mark", "mark_possibly_live", "Mark line possibly live",
            id="possibly-live", key_display="!", show=False),
    Binding("escape", "back_out", "Back", id="back", show=False),
    Binding("ctrl+q", "quit", "Quit", id="quit", priority=True),
]


def panel_bindings(specs: list[PanelSpec]) -> list[Binding]:
    """One binding per panel: its letter (outside fields) and its function key."""
    return [
        Binding(f"{s.key},{s.function_key}", f"open_panel('{s.name}')", s.title,
                id=f"panel.{s.name}", show=False, key_display=s.function_key.upper())
        for s in specs
    ]


class HalftripApp(App[int]):
    """The halftrip terminal interface. Build it with :func:`create_app`."""

    CSS_PATH = "halftrip.tcss"
    TITLE = "halftrip"
    ENABLE_COMMAND_PALETTE = True
    #: No automatic focus: the cursor goes to the first panel's first field once
    #: the panel is mounted (after the first frame), not to the panel bar first.
    AUTO_FOCUS = None
    BINDINGS = APP_BINDINGS
    PANELS: ClassVar[list[PanelSpec]] = []

    #: (units, fraction): lengths everywhere follow this; panels watch it.
    unit_system: reactive[tuple[str, int]] = reactive(("metric", 16), init=False)
    #: True once pint, numpy and the catalog are loaded (see the module docstring).
    core_ready: reactive[bool] = reactive(False, init=False)

    def __init__(self, demo: bool = False, prefs_path: Path | None = None,
                 start_panel: str | None = None) -> None:
        super().__init__()
        from tui.palette import HalftripCommands

        self.COMMANDS = self.COMMANDS | {HalftripCommands}
        self.demo = demo
        self.prefs_path = prefs_path
        self.prefs: Preferences = load_preferences(prefs_path)
        self.catalog = None  # cable_catalog.loader.Catalog, set by the start-up worker
        self._start_panel = start_panel or (self.PANELS[0].name if self.PANELS else None)
        self.set_reactive(HalftripApp.unit_system, (self.prefs.units, self.prefs.fraction))
        if self.prefs.theme in self.available_themes:
            self.theme = self.prefs.theme

    # ----------------------------------------------------------------- layout
    def compose(self) -> ComposeResult:
        yield TopBar(self.PANELS, self.unit_system)
        # Panels are mounted when first opened, the first one right after the
        # first frame (see on_ready), and so is the footer (~15 ms): the first
        # frame is only this shell.
        yield ContentSwitcher(id="panels")

    async def on_ready(self) -> None:
        """The first frame is on screen (Textual's Ready event): open the first
        panel, then load the core and run the panels' start hooks."""
        await self.mount(Footer())
        if self._start_panel:
            await self.action_open_panel(self._start_panel)
        self.call_after_refresh(self._after_first_frame)

    def _after_first_frame(self) -> None:
        for problem in self.prefs.problems:
            self.notify(problem, title="Preferences", severity="warning", timeout=10)
        self._load_core()
        for spec in self.PANELS:
            hook = getattr(spec.module, "on_app_start", None)
            if hook is not None:
                hook(self)

    @work(thread=True, exclusive=True, group="start-up")
    def _load_core(self) -> None:
        """Load pint, numpy and the catalog off the UI thread (see module docstring)."""
        from calc.parse import warm_up

        warm_up()
        from cable_catalog.loader import load_catalog
        from tui.paths import user_catalog_path

        catalog = load_catalog(user_catalog_path())
        self.call_from_thread(self._core_loaded, catalog)

    def _core_loaded(self, catalog) -> None:
        self.catalog = catalog
        for problem in catalog.problems:
            self.notify(problem, title="Your cable file", severity="warning", timeout=15)
        self.core_ready = True

    def reload_catalog(self) -> None:
        """Read the catalog again (after the user's cable file changed)."""
        from cable_catalog.loader import load_catalog
        from tui.commands.common import catalog as cli_catalog
        from tui.paths import user_catalog_path

        self.catalog = load_catalog(user_catalog_path())
        cli_catalog.cache_clear()  # the panels that run CLI commands read this one
        self.mutate_reactive(HalftripApp.core_ready)

    # ----------------------------------------------------------------- panels
    async def panel(self, name: str):
        """The panel widget ``name``, mounted on first use (only the first panel is
        composed before the first frame)."""
        switcher = self.query_one("#panels", ContentSwitcher)
        found = switcher.query_children(f"#{name}")
        if found:
            return found.first()
        spec = next(s for s in self.PANELS if s.name == name)
        widget = spec.panel_class()(id=name)
        await switcher.mount(widget)
        return widget

    @property
    def current_panel(self) -> str | None:
        return self.query_one("#panels", ContentSwitcher).current

    async def action_open_panel(self, name: str) -> None:
        """Show panel ``name`` and put the cursor in its first field."""
        if name not in {s.name for s in self.PANELS}:
            return
        widget = await self.panel(name)
        if not self.is_running:  # closed while the panel was being mounted
            return
        self.query_one("#panels", ContentSwitcher).current = name
        self.query_one(PanelBar).current = name
        self.call_after_refresh(self.focus_first_field, widget)

    def focus_first_field(self, widget) -> None:
        """The cursor into the panel's first shown text field (else its first stop)."""
        from textual.widgets import Input

        def shown(w) -> bool:  # not in a hidden mode (laid out or not yet)
            node = w
            while node is not None and node is not widget:
                if not node.display:
                    return False
                node = node.parent
            return True

        stops = [w for w in widget.query("*") if w.focusable and shown(w)]
        first = next((w for w in stops if isinstance(w, Input)), stops[0] if stops else None)
        if first is not None:
            first.focus()

    def initial_text(self, field_name: str, default: str) -> str:
        """What a field starts with: in the demo, the panel's ``DEMO`` text for it."""
        if not self.demo:
            return default
        for spec in self.PANELS:
            demo = getattr(spec.module, "DEMO", {})
            if field_name in demo:
                return demo[field_name]
        return default

    async def on_key_bar_selected(self, message: KeyBar.Selected) -> None:
        if isinstance(message.bar, PanelBar):
            await self.action_open_panel(message.name)

    def action_mark_possibly_live(self) -> None:
        """``!``: mark (or unmark) the current panel's line as possibly live."""
        from tui.widgets.warning_line import WarningLine

        name = self.current_panel
        lines = self.query_one(f"#{name}").query(WarningLine) if name else []
        if not lines:
            self.notify("This panel has no line to mark; see the Safety panel", timeout=3)
            return
        line = lines.first()
        line.possibly_live = not line.possibly_live
        self.notify("Line marked possibly live" if line.possibly_live
                    else "Mark removed; the cable's own cautions still apply", timeout=3)

    def notify(self, message: str, *, title: str = "", severity: str = "information",
               timeout: float | None = None, markup: bool = False) -> None:
        """Textual's notification, with markup off by default: messages carry file paths,
        site names and typed text, and "[B-wing]" in a path must not be read as a style."""
        super().notify(message, title=title, severity=severity, timeout=timeout, markup=markup)

    # ------------------------------------------------------------ preferences
    def change_prefs(self, sections: dict[str, dict] | None = None, **typed) -> None:
        """Change preferences and write just those to the file (see
        :func:`tui.prefs.update_preferences`); a failure is shown, never raised."""
        prefs, problem = update_preferences(self.prefs_path, sections, **typed)
        if problem:  # keep the change for this session anyway
            prefs = changed(self.prefs, **typed)
            for name, values in (sections or {}).items():
                prefs = with_section(prefs, name, **values)
            self.notify(f"Preferences not saved: {problem}", severity="warning")
        self.prefs = prefs

    def update_section(self, name: str, **values) -> None:
        """Set keys in module ``name``'s table of the preferences and save."""
        self.change_prefs({name: values})

    def remember_cable(self, cable_id: str) -> None:
        """The cable last chosen anywhere (new fields start with it)."""
        if cable_id and cable_id != self.prefs.last_cable:
            self.change_prefs(last_cable=cable_id)

    def set_units(self, units: str, fraction: int | None = None) -> None:
        """Switch every shown length to ``units`` at once, and remember it."""
        fraction = fraction or self.prefs.fraction
        self.change_prefs(units=units, fraction=fraction)
        self.unit_system = (units, fraction)

    def action_switch_units(self) -> None:
        self.set_units("imperial" if self.prefs.units == "metric" else "metric")
        label = "feet and inches" if self.prefs.units == "imperial" else "metres"
        self.notify(f"Lengths now in {label}", timeout=2)

    def watch_unit_system(self, value: tuple[str, int]) -> None:
        self.query_one(TopBar).units = value

    def action_switch_theme(self) -> None:
        self.theme = "textual-light" if self.current_theme.dark else "textual-dark"

    def watch_theme(self, theme: str) -> None:
        if self.is_mounted and theme != self.prefs.theme:
            self.change_prefs(theme=theme)

    # ---------------------------------------------------------------- job log
    def action_save_to_log(self) -> None:
        """Ctrl+S: save the shown panel's result to the open job (tui.panels.log.saving)."""
        from tui.panels.log.saving import save_current

        save_current(self)

    # ------------------------------------------------------------- help, keys
    def action_help(self) -> None:
        from tui.widgets.help_screen import HelpScreen, key_table

        if not isinstance(self.screen, HelpScreen):
            self.push_screen(HelpScreen(key_table(self)))

    def action_back_out(self) -> None:
        """Escape, one step out each time: from a field to the panel's mode bar (if
        it has modes), from there to the panel bar. Dialogs close themselves."""
        bar = self.query_one(PanelBar)
        focused = self.focused
        panel = self.query_one("#panels", ContentSwitcher).visible_content
        if focused is None or focused is bar or panel is None:
            bar.focus()
            return
        modes = next(iter(panel.query(KeyBar)), None)
        if modes is not None and focused is not modes and panel in focused.ancestors:
            modes.focus()
        else:
            bar.focus()

    def get_system_commands(self, screen):
        yield from super().get_system_commands(screen)
        yield SystemCommand("Keys", "Every key of halftrip", self.action_help)


def create_app(demo: bool = False, prefs_path: Path | None = None,
               start_panel: str | None = None, panels: tuple[str, ...] | None = None
               ) -> HalftripApp:
    """The one factory: the app for ``halftrip``, ``halftrip demo`` and the tests.

    ``panels`` limits the panels to those module names (tests); ``start_panel``
    picks the one shown first (default: the first in the bar).
    """
    specs = discover(panels)
    cls = type("HalftripApp", (HalftripApp,), {
        "__module__": __name__,
        "PANELS": specs,
        "BINDINGS": panel_bindings(specs),
    })
    return cls(demo=demo, prefs_path=prefs_path, start_panel=start_panel)


def run_app(demo: bool = False) -> int:
    """Run the terminal interface; returns the exit status."""
    create_app(demo=demo).run()
    return 0
