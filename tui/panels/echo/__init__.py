"""Echo panel: what a load sends back, the load an observed step implies, and
the whole run's predicted trace with its arrivals.

Three tabs, each a live form over the echo core (``calc.loads``,
``calc.simulate``), computing as the user types:

* Load: the load summary on a line of Z0 (optionally at a frequency);
* From a step: backwards from an observed reflection to the load;
* Whole run: the predicted trace of a run of catalog cables with a load,
  plotted against distance, and the list of arrivals (bounce paths).
"""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.widgets import Input, TabbedContent, TabPane

from tui.widgets.warning_line import WarningLine

KEY = "e"
ORDER = 3
TITLE = "Echo"
DESCRIPTION = "what a load returns, the load a step implies, and a whole run's predicted trace"
#: The invented demo job (see tui/demo/traces.py): the Kestrel Ridge relay hut feeder.
DEMO = {
    "echo-load-spec": "75 ohm || 10 pF",
    "echo-load-frequency": "100 MHz",
    "echo-step-level": "-0.33",
    "echo-run": "2 m:rg58, 45 m:hardline-50-half, 1.5 m:rg58",
    "echo-run-load": "open",
    "echo-run-edge": "rise 0.5 ns",
}


def _tabs():
    from tui.panels.echo.load_form import LoadForm
    from tui.panels.echo.run_form import RunForm
    from tui.panels.echo.step_form import StepForm

    return (("echo-tab-run", "Whole run", RunForm), ("echo-tab-load", "Load", LoadForm),
            ("echo-tab-step", "From a step", StepForm))


class Panel(Vertical):
    """The three echo forms in tabs, with the caution line above them."""

    BINDINGS = [
        Binding("ctrl+t", "next_tab", "Next tab", id="echo.next_tab"),
    ]

    def __init__(self, id: str | None = None) -> None:
        super().__init__(id=id, classes="panel")

    def compose(self) -> ComposeResult:
        yield WarningLine()
        with TabbedContent(id="echo-tabs", classes="compact-tabs"):
            for tab_id, title, form in _tabs():
                with TabPane(title, id=tab_id):
                    yield form()

    def on_tabbed_content_tab_activated(self, event: TabbedContent.TabActivated) -> None:
        """The caution line follows the cables of the tab in view."""
        from tui.widgets.form import LiveForm

        forms = event.pane.query(LiveForm)
        form = forms.first() if forms else None
        tags = form.hazards(form.last_result) if form and form.last_result is not None else ()
        self.query_one(WarningLine).set_hazards(tags)

    def action_next_tab(self) -> None:
        """Ctrl+T: the next tab, with the cursor in its first field."""
        tabs = self.query_one(TabbedContent)
        order = [tab_id for tab_id, _title, _form in _tabs()]
        tabs.active = order[(order.index(tabs.active) + 1) % len(order)]
        self.call_after_refresh(self._focus_first_field)

    def _focus_first_field(self) -> None:
        pane = self.query_one(TabbedContent).active_pane
        fields = pane.query(Input) if pane is not None else []
        if fields:
            fields.first().focus()
