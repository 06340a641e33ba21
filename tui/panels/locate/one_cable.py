"""Locate on one cable: delay to distance with its range, or the reverse."""

from __future__ import annotations

from textual.app import ComposeResult

from tui.widgets.field import Field
from tui.widgets.form import LiveForm
from tui.widgets.readers import delay_or_distance, velocity_reader
from tui.widgets.result_view import ResultView


class OneCableForm(LiveForm):
    """Round-trip delay (or distance) and the cable; the distance with its range."""

    LOG_KIND = "locate"

    def compose(self) -> ComposeResult:
        yield Field("locate-one-delay", "delay (or distance)", reader=delay_or_distance,
                    placeholder="e.g. 245 ns, or 24 m for the reverse")
        yield Field("locate-one-cable", "cable or velocity", value=self.app.prefs.last_cable,
                    reader=velocity_reader(lambda: self.catalog),
                    placeholder="rg58, 0.66, 66 %, 1.54 ns/ft")
        yield Field("locate-one-tolerance", "VF tolerance", kind="tolerance", optional=True,
                    placeholder="the cable's, or e.g. 3 %")
        yield Field("locate-one-rise-time", "rise time", kind="time", optional=True,
                    placeholder="optional, e.g. 2 ns")
        yield Field("locate-one-pulse-width", "pulse width", kind="time", optional=True,
                    placeholder="optional, e.g. 10 ns")
        yield ResultView()

    def compute(self, values):
        from calc import locate as core

        kind, reading = values["locate-one-delay"]
        velocity = values["locate-one-cable"]
        tolerance = values["locate-one-tolerance"]
        if tolerance is None:
            tolerance = velocity.tolerance
        if velocity.cable is not None:
            self.app.remember_cable(velocity.cable.id)
        if kind == "distance":
            return kind, velocity, core.expected_delay(reading, velocity.velocity.vf, tolerance)
        return kind, velocity, core.locate(reading, velocity.velocity.vf, tolerance,
                                           values["locate-one-rise-time"],
                                           values["locate-one-pulse-width"])

    def describe(self, result):
        from tui.commands.locate import describe_expected, describe_location

        kind, velocity, found = result
        how = describe_expected if kind == "distance" else describe_location
        return "\n".join(how(found, velocity.source, self.units, self.fraction))

    def hazards(self, result):
        cable = result[1].cable
        return cable.hazards if cable is not None else ()

    def log_result(self, result) -> dict:
        from tui.fmt import json_ready

        kind, velocity, found = result
        return {"mode": "expected-delay" if kind == "distance" else "one-cable",
                "velocity_source": velocity.source,
                "cable_id": velocity.cable.id if velocity.cable else None, **json_ready(found)}
