"""The load an observed step implies (``halftrip echo --observed-step``)."""

from __future__ import annotations

from textual.app import ComposeResult

from tui.widgets.command_form import CommandForm
from tui.widgets.field import Field
from tui.widgets.readers import text
from tui.widgets.result_view import ResultView


class StepForm(CommandForm):
    """The step seen on the trace, as rho or in volts with the incident level."""

    COMMAND = "echo"
    PREFIX = "echo-step"
    LOG_KIND = "echo"

    def compose(self) -> ComposeResult:
        yield Field("echo-step-z0", "line Z0", kind="impedance")
        yield Field("echo-step-observed-step", "step seen", reader=text,
                    placeholder="rho, e.g. -0.33; or volts, 0.67 V")
        yield Field("echo-step-incident", "incident step", kind="voltage", optional=True,
                    placeholder="with a level in volts, e.g. 1 V")
        yield Field("echo-step-settles-to", "then settles to", reader=text, optional=True,
                    placeholder="optional, e.g. 0.2")
        yield ResultView()
