"""The trace form: file, placement and expectation in; events, plot and comparison out.

The file is read and analysed by :func:`tui.commands.trace.analyse_file`,
the same call ``halftrip trace`` makes, with the options the fields stand
for; the form runs it in a worker thread (``THREADED``) so a large file
never holds up typing.
"""

from __future__ import annotations

from dataclasses import dataclass

from textual.app import ComposeResult

from calc.errors import InputError
from tui.panels._readers import LOAD_PLACEHOLDER, load_reader, run_reader
from tui.widgets.field import Field
from tui.widgets.form import LiveForm
from tui.widgets.trace_view import TraceShown, TraceView

COLUMNS = ("#", "delay", "distance", "size", "Z ohm", "kind", "expected")
FILE_LABEL = "file"
ON_LABEL = "placed on"
ON_EXAMPLE = "rg58, 0.66 or 2 m:rg58, 45 m:hardline-50-half"


@dataclass(frozen=True, eq=False)
class Expectation:
    """The expected run, its prediction and the trace compared with it."""

    run: tuple
    prediction: object  # calc.simulate.Prediction
    comparison: object  # calc.events.Comparison


@dataclass(frozen=True, eq=False)
class TraceResult:
    """One analysed trace: what ``analyse_file`` returned, and the comparison."""

    setup: object  # the CLI's options, with the samples read (time_s, level)
    info: dict
    notes: tuple[str, ...]
    analysis: object  # calc.events.Analysis, placed
    expected: Expectation | None
    cable_ids: tuple[str, ...]  # a single catalog cable placed on


def read_text(text: str, label: str) -> str:
    if not text.strip():
        raise InputError(label, "give the trace file's path (Ctrl+O picks one)",
                         "kestrel-ridge-feeder.csv")
    return text.strip()


def read_placement(text: str, label: str) -> tuple[str, str]:
    """``("run", text)`` for a run (it has ``LENGTH:CABLE``), ``("vf", text)`` for a
    number, else ``("cable", id)``; the CLI's own parsing checks the rest."""
    t = text.strip()
    if not t:
        raise InputError(label, "give the cable, a velocity factor or the run", ON_EXAMPLE)
    if ":" in t:
        return "run", t
    if t[0] in "0123456789.":
        return "vf", t
    return "cable", t


def read_vf_text(text: str, label: str) -> str:
    from calc.parse import parse

    parse(text, label, "vf")  # checked here, so the error shows beside this field
    return text.strip()


def trace_namespace(path: str, placement: tuple[str, str], axis_vf: str | None):
    """The options ``halftrip trace`` would get for these fields (its own parser's
    defaults for everything else)."""
    import argparse

    from tui.commands import trace as command

    parser = argparse.ArgumentParser(add_help=False)
    command.add_arguments(parser)
    ns = parser.parse_args(["--", path])
    kind, text = placement
    setattr(ns, kind, text)
    ns.axis_vf = axis_vf
    return ns


def rho_trace(setup, analysis):
    """The recorded samples as the analysis reads them: time from the reference
    (the incident edge's midpoint, or 0) and level in rho (calc.events, step 1),
    from the earliest delay the analysis sees (the instrument's own edge and
    dead zone before it are left out)."""
    t = setup.time_s - analysis.time_zero_s
    edge = analysis.incident
    level = setup.level if edge is None else (setup.level - edge.top) / edge.height
    keep = t >= analysis.start_delay_s
    return t[keep], level[keep]


def distance_axis(time_s, setup):
    """Distance of every sample on the placement the analysis used."""
    from calc.locate import distance_from_delay_m

    if setup.segments is None:
        return distance_from_delay_m(time_s, setup.vf)
    from calc.events import run_segments
    from calc.simulate import distance_from_round_trip

    return distance_from_round_trip(time_s, run_segments(setup.segments))


class TraceForm(LiveForm):
    """File, placement (cable, VF or run), expected load and run, distance-axis VF."""

    THREADED = True
    ERROR_FIELDS = {"--cable/--vf/--run": "trace-on", "--run": "trace-on", "--cable": "trace-on",
                    "--vf": "trace-on", "--tolerance": "trace-on", "--axis-vf": "trace-axis-vf",
                    "--expect-run": "trace-expect-run", "--expect-load": "trace-expect-load",
                    "trace": "trace-file", "--z0": "trace-on"}

    def compose(self) -> ComposeResult:
        yield Field("trace-file", FILE_LABEL, reader=read_text,
                    placeholder="path of a .csv or .s1p (Ctrl+O picks)")
        yield Field("trace-on", ON_LABEL, reader=read_placement, placeholder=ON_EXAMPLE)
        yield Field("trace-expect-load", "expected load", reader=load_reader(self.app),
                    optional=True, placeholder=f"to compare: {LOAD_PLACEHOLDER}")
        yield Field("trace-expect-run", "expected run", reader=run_reader(self.app),
                    optional=True, placeholder="the run above, unless given")
        axis = Field("trace-axis-vf", "axis VF", reader=read_vf_text, optional=True,
                     placeholder="VF the instrument drew its distance axis with")
        axis.display = False
        yield axis
        yield TraceView(COLUMNS, empty_text="no trace yet", id="trace-view")

    def result_view(self) -> TraceView:
        return self.query_one(TraceView)

    def compute(self, values):
        from tui.commands.trace import analyse_file

        path = values["trace-file"]
        ns = trace_namespace(path, values["trace-on"], values["trace-axis-vf"])
        try:
            setup, info, notes, analysis = analyse_file(ns)
        except InputError as exc:
            raise self._as_file_error(exc, path) from None
        placement = values["trace-on"]
        cable_ids = (placement[1],) if placement[0] == "cable" else ()
        return TraceResult(setup, info, tuple(notes), analysis,
                           self._expectation(values, setup, analysis), cable_ids)

    @staticmethod
    def _as_file_error(exc: InputError, path: str) -> InputError:
        """Errors that name the file (``path line 12``) belong to the file field."""
        if exc.field == path or exc.field.startswith(path + " line"):
            where = exc.field[len(path):].strip()
            problem = f"{where}: {exc.problem}" if where else exc.problem
            return InputError(FILE_LABEL, problem, exc.example)
        return exc

    def _expectation(self, values, setup, analysis):
        """(prediction, comparison) for the expected run and load, or None."""
        load = values["trace-expect-load"]
        if load is None:
            return None
        from calc import events as ev
        from calc.simulate import simulate

        run = values["trace-expect-run"] or setup.segments
        if run is None:
            raise InputError("expected run", "needed to compare: the trace is placed on one "
                             "cable, not a run", "2 m:rg58, 45 m:hardline-50-half")
        from calc.locate import run_junctions

        far_end = run_junctions(run)[-1].round_trip_delay_s
        span = analysis.end_delay_s if analysis.end_delay_s > far_end else None
        prediction = simulate(ev.run_segments(run), load, rise_time_s=analysis.rise_time_s,
                              span_s=span)
        tolerance = max(s.cable.vf_tolerance for s in run)
        return Expectation(run, prediction,
                           ev.compare(analysis, prediction, vf_tolerance=tolerance))

    def hazards(self, result) -> tuple[str, ...]:
        cables = [s.cable for s in result.setup.segments or ()]
        cables += [self.catalog.cables[i] for i in result.cable_ids if i in self.catalog.cables]
        if result.expected is not None:
            cables += [s.cable for s in result.expected.run]
        return tuple(tag for c in cables for tag in c.hazards)

    def describe(self, result) -> TraceShown:
        from tui.panels.trace.wording import trace_shown

        return trace_shown(result, self.units, self.fraction)

    def finish(self, result=None, error=None) -> None:
        super().finish(result, error)
        axis = self.field("trace-axis-vf")
        if (error is not None and self._owner(self.fields(), error) is axis) or (
                result is not None and result.info.get("axis") == "distance"):
            axis.display = True  # shown once a file drawn against distance needs it
        view = self.result_view()
        if error is not None and view.is_stale:
            view.status.update(f"out of date (last good result shown): {error}")
