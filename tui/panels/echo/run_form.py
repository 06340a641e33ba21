"""The Whole run tab: the predicted trace of a run of catalog cables and a load."""

from __future__ import annotations

from textual.app import ComposeResult

from tui.panels._readers import LOAD_PLACEHOLDER, RUN_PLACEHOLDER, load_reader, run_reader
from tui.widgets.field import Field
from tui.widgets.form import LiveForm
from tui.widgets.trace_view import TraceShown, TraceView

COLUMNS = ("#", "delay", "distance", "size", "path")

EDGE_EXAMPLE = "rise 1 ns, or pulse 10 ns"


def read_edge(text: str, label: str) -> tuple[float | None, float | None]:
    """The instrument's edge: ``(rise_time_s, pulse_width_s)``.

    Empty or ``step``: a step as sharp as the grid shows; ``1 ns`` or
    ``rise 1 ns``: a step with that 10-90 % rise time; ``pulse 10 ns``: a
    pulse of that width.
    """
    from calc.errors import InputError
    from calc.parse import parse

    t = " ".join(text.lower().split())
    if t in ("", "step"):
        return None, None
    if t.startswith("pulse"):
        width = t[5:].strip()
        if not width:
            raise InputError(label, "a pulse needs its width", "pulse 10 ns")
        return None, parse(width, label, "time")
    for word in ("step", "rise time", "rise"):
        t = t.removeprefix(word).strip()
    return parse(t, label, "time"), None


class RunForm(LiveForm):
    """Run, load, source impedance and edge in; the predicted trace and its arrivals out.

    The prediction is computed in a worker thread (``THREADED``), so typing
    never waits for it.
    """

    THREADED = True
    ERROR_FIELDS = {"--run": "echo-run", "--load": "echo-run-load",
                    "--source-z": "echo-run-source", "--rise-time": "echo-run-edge",
                    "--pulse-width": "echo-run-edge"}

    def compose(self) -> ComposeResult:
        yield Field("echo-run", "run", reader=run_reader(self.app),
                    placeholder=RUN_PLACEHOLDER)
        yield Field("echo-run-load", "load", reader=load_reader(self.app), value="open",
                    placeholder=LOAD_PLACEHOLDER)
        yield Field("echo-run-source", "source Z", kind="impedance", optional=True,
                    placeholder="matched to the first cable")
        yield Field("echo-run-edge", "edge", reader=read_edge, optional=True,
                    placeholder=EDGE_EXAMPLE)
        yield TraceView(COLUMNS, empty_text="no prediction yet", id="echo-run-view")

    def result_view(self) -> TraceView:
        return self.query_one(TraceView)

    def compute(self, values):
        from calc.simulate import Segment, simulate

        run = values["echo-run"]
        rise, pulse = values["echo-run-edge"] or (None, None)
        prediction = simulate([Segment.from_run_segment(s) for s in run],
                              values["echo-run-load"], source_z_ohm=values["echo-run-source"],
                              rise_time_s=rise, pulse_width_s=pulse)
        return run, prediction

    def hazards(self, result) -> tuple[str, ...]:
        run, _prediction = result
        return tuple(tag for s in run for tag in s.cable.hazards)

    def describe(self, result) -> TraceShown:
        from tui import fmt
        from tui.panels.echo.wording import prediction_line
        from tui.widgets.trace_plot import Mark, PlotData

        run, p = result
        units, fraction = self.units, self.fraction
        marks, rows, details = [], [], {}
        for i, a in enumerate(p.arrivals, start=1):
            marks.append(Mark(str(i), a.time_s, a.distance_m, f"{a.size:+.3f} {a.path}"))
            rows.append((str(i), fmt.time(a.time_s), fmt.length(a.distance_m, units, fraction),
                         f"{a.size:+.3f}", a.path))
            details[str(i)] = f"{i}: {a.path}"
        data = PlotData(p.time_s, p.distance_m, p.level, tuple(marks),
                        z0_ohm=run[0].cable.z0_ohm)
        return TraceShown(prediction_line(p, units, fraction), data, rows, details)

    def finish(self, result=None, error=None) -> None:
        super().finish(result, error)
        view = self.result_view()
        if error is not None and view.is_stale:
            view.status.update(f"out of date (last good prediction shown): {error}")
