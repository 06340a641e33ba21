"""Locate in a run of several cables: which segment, how far into it."""

from __future__ import annotations

from textual.app import ComposeResult

from tui.widgets.field import Field
from tui.widgets.form import LiveForm
from tui.widgets.readers import delay_or_distance, run_reader
from tui.widgets.result_view import ResultView


class RunForm(LiveForm):
    """The run from the instrument out, and the delay (or distance)."""

    LOG_KIND = "locate-run"

    def compose(self) -> ComposeResult:
        yield Field("locate-run-run", "run (length:cable)", reader=run_reader(lambda: self.catalog),
                    placeholder="2 m:rg58, 45 m:hardline-50-half, 1.5 m:rg58")
        yield Field("locate-run-delay", "delay (or distance)", reader=delay_or_distance,
                    placeholder="e.g. 245 ns, or 24 m for the reverse")
        yield Field("locate-run-tolerance", "VF tolerance", kind="tolerance", optional=True,
                    placeholder="each cable's, or e.g. 3 %")
        yield Field("locate-run-rise-time", "rise time", kind="time", optional=True,
                    placeholder="optional, e.g. 2 ns")
        yield Field("locate-run-pulse-width", "pulse width", kind="time", optional=True,
                    placeholder="optional, e.g. 10 ns")
        yield ResultView()

    def compute(self, values):
        import dataclasses

        from calc import locate as core
        from calc.run import RunSegment

        segments = values["locate-run-run"]
        tolerance = values["locate-run-tolerance"]
        if tolerance is not None:
            segments = tuple(RunSegment(s.length_m, dataclasses.replace(s.cable,
                                                                        vf_tolerance=tolerance))
                             for s in segments)
        kind, reading = values["locate-run-delay"]
        if kind == "distance":
            return kind, segments, core.run_delay_for_distance(reading, segments)
        return kind, segments, core.locate_in_run(reading, segments,
                                                  values["locate-run-rise-time"],
                                                  values["locate-run-pulse-width"])

    def describe(self, result):
        from tui.commands.locate import describe_expected, describe_run, describe_run_location

        kind, segments, found = result
        if kind == "distance":
            lines = describe_expected(found, "the run's cables", self.units, self.fraction)
            lines += describe_run(segments, self.units, self.fraction)
        else:
            lines = describe_run_location(found, segments, self.units, self.fraction)
        return "\n".join(lines)

    def hazards(self, result):
        return tuple(t for s in result[1] for t in s.cable.hazards)

    def log_result(self, result) -> dict:
        from tui.fmt import json_ready

        kind, segments, found = result
        return {"mode": "run-expected-delay" if kind == "distance" else "run",
                "segments": [{"length_m": s.length_m, "cable_id": s.cable.id} for s in segments],
                **json_ready(found)}
