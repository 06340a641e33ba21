"""The From a step tab: backwards from an observed reflection to the load."""

from __future__ import annotations

from textual.app import ComposeResult

from tui.widgets.field import Field
from tui.widgets.form import LiveForm
from tui.widgets.result_view import ResultView


def read_level(text: str, label: str) -> str:
    """A step as typed: ``-0.33`` (rho) or ``0.67 V`` (the level the trace steps to);
    checked here, read by ``halftrip echo``'s own code."""
    from calc.parse import parse
    from tui.commands.echo import _VOLTS

    parse(text, label, "voltage" if _VOLTS.search(text.strip()) else "ratio")
    return text.strip()


class StepForm(LiveForm):
    """Z0 and the observed step (rho, or volts with the incident step) in;
    ``halftrip echo --observed-step`` out."""

    ERROR_FIELDS = {"--z0": "echo-step-z0", "--observed-step": "echo-step-level",
                    "--settles-to": "echo-step-settles", "--incident": "echo-step-incident"}

    def compose(self) -> ComposeResult:
        yield Field("echo-step-z0", "line Z0", kind="impedance", value="50 ohm")
        yield Field("echo-step-level", "step seen", reader=read_level, value="-0.33",
                    placeholder="-0.33 (rho), or 0.67 V with the incident step")
        yield Field("echo-step-incident", "incident step", kind="voltage", optional=True,
                    placeholder="when the step is in volts, e.g. 1 V")
        yield Field("echo-step-settles", "settles to", reader=read_level, optional=True,
                    placeholder="optional: where the trace ends up")
        yield ResultView(id="echo-step-result")

    def compute(self, values):
        from tui.commands import echo
        from tui.panels._cli import cli_options

        incident = self.field("echo-step-incident").text.strip() or None
        ns = cli_options(echo, z0=self.field("echo-step-z0").text,
                         observed_step=values["echo-step-level"], incident=incident,
                         settles_to=values["echo-step-settles"])
        _data, lines = echo.report(ns)
        return lines

    def describe(self, result) -> str:
        return "\n".join(result)
