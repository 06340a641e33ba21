"""The Load tab: what one load sends back on a line of Z0."""

from __future__ import annotations

from textual.app import ComposeResult

from tui.panels._readers import LOAD_PLACEHOLDER, load_reader
from tui.widgets.field import Field
from tui.widgets.form import LiveForm
from tui.widgets.result_view import ResultView


class LoadForm(LiveForm):
    """Z0, the load and an optional frequency in; the load summary out."""

    ERROR_FIELDS = {"--z0": "echo-load-z0", "--load": "echo-load-spec",
                    "--frequency": "echo-load-frequency"}

    def compose(self) -> ComposeResult:
        yield Field("echo-load-z0", "line Z0", kind="impedance", value="50 ohm")
        yield Field("echo-load-spec", "load", reader=load_reader(self.app), value="open",
                    placeholder=LOAD_PLACEHOLDER)
        yield Field("echo-load-frequency", "frequency", kind="frequency", optional=True,
                    placeholder="optional, e.g. 100 MHz")
        yield ResultView(id="echo-load-result")

    def compute(self, values):
        from calc.loads import summarize

        return summarize(values["echo-load-spec"], values["echo-load-z0"],
                         values["echo-load-frequency"])

    def describe(self, result) -> str:
        from tui.panels.echo.wording import summary_lines

        return "\n".join(summary_lines(result))
