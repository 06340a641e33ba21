"""Echo panel: the whole run's predicted trace with its arrivals, what one load
sends back, and the load an observed step implies.

Three tabs, each a live form over the same code as the CLI commands
(``halftrip simulate``, ``halftrip echo --load``, ``halftrip echo
--observed-step``), computing as the user types.
"""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical, VerticalScroll
from textual.widgets import TabbedContent, TabPane

from tui.widgets.warning_line import WarningLine

KEY = "e"
ORDER = 3
TITLE = "Echo"
DESCRIPTION = "a whole run's predicted trace, what a load returns, the load a step implies"
#: An invented job (see tui/demo/traces.py): the Kestrel Ridge relay hut feeder.
DEMO = {
    "echo-run": "2 m:rg58, 45 m:hardline-50-half, 1.5 m:rg58",
    "echo-run-load": "open",
    "echo-run-edge": "rise 0.5 ns",
    "echo-load-spec": "75 ohm || 10 pF",
    "echo-load-frequency": "100 MHz",
    "echo-step-level": "-0.33",
}

TABS = (
    ("run", "Whole run", "tui.panels.echo.run_form", "RunForm"),
    ("load", "Load", "tui.panels.echo.load_form", "LoadForm"),
    ("step", "From a step", "tui.panels.echo.step_form", "StepForm"),
)


class Panel(Vertical):
    """The three echo forms in tabs, with the caution line above them."""

    BINDINGS = [Binding(str(i + 1), f"tab({i})", f"Tab: {title}", id=f"echo.tab.{name}",
                        show=False) for i, (name, title, _m, _c) in enumerate(TABS)]

    def __init__(self, id: str | None = None) -> None:
        super().__init__(id=id, classes="panel")

    def compose(self) -> ComposeResult:
        import importlib

        yield WarningLine()
        with TabbedContent(id="echo-tabs", classes="compact-tabs"):
            for name, title, module, cls in TABS:
                form = getattr(importlib.import_module(module), cls)(id=f"echo-{name}-form")
                with TabPane(title, id=f"echo-tab-{name}"):
                    if name == "run":  # the plot takes the height left
                        yield form
                    else:
                        with VerticalScroll():
                            yield form

    def action_tab(self, index: int) -> None:
        """Show tab ``index`` (0-based) and put the cursor in its first field."""
        if 0 <= index < len(TABS):
            self.query_one(TabbedContent).active = f"echo-tab-{TABS[index][0]}"
            self.call_after_refresh(self.app.focus_first_field, self)
