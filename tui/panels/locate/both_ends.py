"""Locate from both ends of one cable of known length (needs no velocity)."""

from __future__ import annotations

from textual.app import ComposeResult

from tui.widgets.field import Field
from tui.widgets.form import LiveForm
from tui.widgets.readers import velocity_reader
from tui.widgets.result_view import ResultView


class BothEndsForm(LiveForm):
    """Delays seen from end A and end B, the length; a cable to check against."""

    LOG_KIND = "locate-two-ended"

    def compose(self) -> ComposeResult:
        yield Field("locate-ends-from-a", "delay from end A", kind="time")
        yield Field("locate-ends-from-b", "delay from end B", kind="time")
        yield Field("locate-ends-length", "cable length A-B", kind="length")
        yield Field("locate-ends-cable", "check against", reader=velocity_reader(lambda: self.catalog),
                    optional=True, placeholder="optional: rg58, 0.66...")
        yield Field("locate-ends-tolerance", "VF tolerance", kind="tolerance", optional=True,
                    placeholder="the cable's, or e.g. 3 %")
        yield ResultView()

    def compute(self, values):
        from calc import locate as core

        velocity = values["locate-ends-cable"]
        tolerance = values["locate-ends-tolerance"]
        if velocity is not None and tolerance is None:
            tolerance = velocity.tolerance
        found = core.locate_two_ended(values["locate-ends-from-a"], values["locate-ends-from-b"],
                                      values["locate-ends-length"],
                                      velocity.velocity.vf if velocity else None, tolerance or 0.0)
        return velocity, found

    def describe(self, result):
        from tui.commands.locate import describe_two_ended

        velocity, found = result
        cable_id = velocity.cable.id if velocity and velocity.cable else None
        return "\n".join(describe_two_ended(found, cable_id, self.units, self.fraction))

    def hazards(self, result):
        velocity = result[0]
        return velocity.cable.hazards if velocity and velocity.cable else ()

    def log_result(self, result) -> dict:
        from tui.fmt import json_ready

        velocity, found = result
        return {"mode": "two-ended", **json_ready(found),
                "cable_id": velocity.cable.id if velocity and velocity.cable else None}
