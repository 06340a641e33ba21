"""The From a step mode: backwards from an observed reflection to the load
(``halftrip echo --observed-step``)."""

from __future__ import annotations

from textual.app import ComposeResult

from tui.widgets.command_form import CommandForm
from tui.widgets.field import Field
from tui.widgets.result_view import ResultView


def read_level(text: str, label: str) -> str:
    """A step as typed, ``-0.33`` (rho) or ``0.67 V`` (the level the trace steps to),
    checked as the echo command reads it."""
    from calc.parse import parse_level

    parse_level(text, label)
    return text.strip()


class StepForm(CommandForm):
    """Z0 and the observed step (rho, or volts with the incident step)."""

    COMMAND = "echo"
    PREFIX = "echo-step"
    LOG_KIND = "echo"

    def compose(self) -> ComposeResult:
        yield Field("echo-step-z0", "line Z0", kind="impedance", value="50 ohm")
        yield Field("echo-step-observed-step", "step seen", reader=read_level, value="-0.33",
                    placeholder="-0.33 (rho), or 0.67 V with the incident step")
        yield Field("echo-step-incident", "incident step", kind="voltage", optional=True,
                    placeholder="when the step is in volts, e.g. 1 V")
        yield Field("echo-step-settles-to", "settles to", reader=read_level, optional=True,
                    placeholder="optional: where the trace ends up")
        yield ResultView()
