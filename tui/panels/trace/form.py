"""The trace form (``halftrip trace FILE``): the command's text, and a plot."""

from __future__ import annotations

from textual.app import ComposeResult

from tui.widgets.command_form import CommandForm
from tui.widgets.field import Field
from tui.widgets.readers import text, velocity_reader
from tui.widgets.result_view import ResultView
from tui.widgets.trace_plot import Marker, TracePlot


def _placement(form):
    """A reader for "cable or run": a run has ``LENGTH:CABLE`` parts."""

    def read(value: str, label: str):
        from calc.run import parse_run

        if ":" in value:
            return parse_run(value, form.catalog.get, label)
        return velocity_reader(lambda: form.catalog)(value, label)

    return read


def sample_distances(delay_s, setup):
    """Distance of every sample from its round-trip delay: on the one cable, or
    through the run's junctions (each segment at its own velocity; past the far
    end the last cable is taken to go on, as the command places events)."""
    import numpy as np

    from calc.locate import distance_from_delay_m, run_junctions

    delay = np.asarray(delay_s, dtype=float)
    if setup.segments is None:
        return distance_from_delay_m(delay, setup.vf)
    junctions = run_junctions(setup.segments)
    t = np.array([0.0] + [j.round_trip_delay_s for j in junctions])
    d = np.array([0.0] + [j.distance_m for j in junctions])
    out = np.interp(delay, t, d)
    past = delay > t[-1]
    out[past] = d[-1] + distance_from_delay_m(delay[past] - t[-1], setup.segments[-1].cable.vf)
    return out


class TraceForm(CommandForm):
    """File, placement, reference impedance, the expected run and load."""

    COMMAND = "trace"
    PREFIX = "trace"
    LOG_KIND = "trace"
    SLOW = True  # reading and analysing a long trace takes a moment: off the UI thread

    def compose(self) -> ComposeResult:
        yield Field("trace-file", "trace file", reader=text,
                    placeholder="a .csv/.txt trace or a .s1p sweep")
        yield Field("trace-cable", "cable or run", reader=_placement(self),
                    value=self.app.prefs.last_cable,
                    placeholder="rg58, 0.66, or 2 m:rg58, 45 m:hardline-50-half")
        yield Field("trace-z0", "reference Z0", kind="impedance", optional=True,
                    placeholder="default: the first cable's")
        yield Field("trace-expect-run", "expected run", reader=text, optional=True,
                    placeholder="to compare: the run as it should be")
        yield Field("trace-expect-load", "expected load", reader=text, optional=True,
                    placeholder="to compare: open, short, match, 75 ohm...")
        yield TracePlot(id="trace-plot")
        yield ResultView()

    def option_args(self, option: str, text: str) -> list[str]:
        if option == "file":
            return [text]
        if option == "cable":
            if ":" in text:
                return [f"--run={text}"]
            read = velocity_reader(lambda: self.catalog)(text, "cable")
            return [f"--cable={read.cable.id}"] if read.cable else [f"--vf={read.velocity.vf!r}"]
        return super().option_args(option, text)

    def hazards(self, result):
        setup = result[4][3]
        cables = [s.cable for s in setup.segments] if setup.segments else [setup.cable]
        return tuple(t for c in cables if c is not None for t in c.hazards)

    def shown(self, result) -> None:
        time_s, level, analysis, setup = result[4]
        delay = time_s - analysis.time_zero_s
        markers = [Marker(e.distance_m, e.round_trip_delay_s, e.kind.replace("_", " "))
                   for e in analysis.events if e.distance_m is not None]
        self.query_one(TracePlot).show(delay, sample_distances(delay, setup), level, markers)

    def _units_changed(self, units) -> None:
        super()._units_changed(units)
        if self.last_result is not None:
            self.shown(self.last_result)
