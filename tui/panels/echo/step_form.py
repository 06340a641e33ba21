"""The From a step tab: backwards from an observed reflection to the load."""

from __future__ import annotations

import re

from textual.app import ComposeResult

from calc.errors import InputError
from tui.widgets.field import Field
from tui.widgets.form import LiveForm
from tui.widgets.result_view import ResultView

_VOLTS = re.compile(r"v(olts?)?\s*$", re.IGNORECASE)


def read_level(text: str, label: str) -> tuple[str, float]:
    """``("rho", fraction)`` for ``-0.33`` or ``33 %``; ``("volts", V)`` for ``0.2 V``."""
    from calc.parse import parse

    if _VOLTS.search(text.strip()):
        return "volts", parse(text, label, "voltage")
    return "rho", parse(text, label, "ratio")


class StepForm(LiveForm):
    """Z0 and the observed step (as rho, or in volts with the incident step) in;
    the load it implies and what else could give the same step out."""

    ERROR_FIELDS = {"--z0": "echo-step-z0", "--observed-step": "echo-step-level",
                    "--settles-to": "echo-step-settles", "--incident": "echo-step-incident"}

    def compose(self) -> ComposeResult:
        yield Field("echo-step-z0", "line Z0", kind="impedance", value="50 ohm")
        yield Field("echo-step-level", "step seen", reader=read_level, value="-0.33",
                    placeholder="-0.33 (rho), or 0.2 V")
        yield Field("echo-step-incident", "incident step", kind="voltage", optional=True,
                    placeholder="when the step is in volts: 1 V")
        yield Field("echo-step-settles", "settles to", reader=read_level, optional=True,
                    placeholder="optional: where it ends up")
        yield ResultView(id="echo-step-result")

    def _rho(self, reading, incident: float | None, field: str) -> float | None:
        if reading is None:
            return None
        unit, value = reading
        if unit == "rho":
            return value
        if incident is None or incident == 0:
            raise InputError(self.field("echo-step-incident").label,
                             f"needed to read the {field} in volts", "1 V")
        return value / incident

    def compute(self, values):
        from calc.loads import from_observed_step

        incident = values["echo-step-incident"]
        level = self._rho(values["echo-step-level"], incident, "step")
        settles = self._rho(values["echo-step-settles"], incident, "settled level")
        return from_observed_step(level, values["echo-step-z0"], settles)

    def describe(self, result) -> str:
        from tui.panels.echo.wording import observed_lines

        return "\n".join(observed_lines(result, self.units, self.fraction))
