"""The trace form: file, placement and expectation in; events, plot and comparison out.

The file is read, analysed and compared by the same calls ``halftrip trace``
makes (:func:`tui.commands.trace.analyse_file` and
:func:`~tui.commands.trace.compare_with_expected`), given the options the
fields stand for, so the panel and the CLI show the same events. The form
runs them in a worker thread (``THREADED``), so a large file never holds up
typing.
"""

from __future__ import annotations

import copy
from dataclasses import dataclass

from textual.app import ComposeResult

from calc.errors import InputError
from tui.widgets.field import Field
from tui.widgets.form import LiveForm
from tui.widgets.readers import load_reader, run_reader
from tui.widgets.trace_view import TraceShown, TraceView

FILE_LABEL = "file"
ON_EXAMPLE = "rg58, 0.66 or 2 m:rg58, 45 m:hardline-50-half"


@dataclass(frozen=True, eq=False)
class TraceResult:
    """One analysed trace: what the CLI's calls returned."""

    setup: object  # the CLI's reading of the options, with the samples read (time_s, level)
    info: dict
    notes: tuple[str, ...]
    analysis: object  # calc.events.Analysis, placed
    comparison: object | None  # calc.events.Comparison
    prediction: object | None  # calc.simulate.Prediction of the expected run
    expected_run: tuple = ()  # calc.run.RunSegment, for the cautions


def _file_key(path: str) -> tuple:
    """The file as it is now (a changed or rewritten file is read again)."""
    from pathlib import Path

    try:
        st = Path(path).expanduser().stat()
    except OSError:
        return (path, None)
    return (path, st.st_mtime_ns, st.st_size)


def read_path(text: str, label: str) -> str:
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


def checked_text(reader):
    """A reader that checks the text with ``reader`` and keeps ``(text, value)``."""

    def read(text: str, label: str):
        return text.strip(), reader(text, label)

    return read


def read_vf_text(text: str, label: str) -> str:
    from calc.parse import parse

    parse(text, label, "vf")
    return text.strip()


def trace_options(path: str, placement: tuple[str, str], expect_load: str | None,
                  expect_run: str | None, axis_vf: str | None):
    """The options ``halftrip trace`` gets for these fields (its own parser's
    defaults for the rest). The expected run defaults to the run placed on."""
    import argparse

    from tui.commands import trace as command

    parser = argparse.ArgumentParser(add_help=False)
    command.add_arguments(parser)
    ns = parser.parse_args(["--", path])
    kind, text = placement
    setattr(ns, kind, text)
    ns.axis_vf = axis_vf
    ns.expect_load = expect_load
    ns.expect_run = expect_run or (text if expect_load and kind == "run" else None)
    return ns


def rho_trace(setup, analysis):
    """The recorded samples as the analysis reads them: time from the reference
    (the incident edge's midpoint, or 0) and level in rho (calc.events, step 1),
    from the earliest delay the analysis sees (the instrument's own edge and
    the dead zone are left out)."""
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
    """File, placement (cable, VF or run), expected load and run; distance-axis VF
    (shown when a file drawn against distance needs it)."""

    THREADED = True
    #: (file, placement, axis VF) -> what analyse_file returned: typing in the
    #: expectation fields compares again without reading the file again.
    _analysed: tuple | None = None
    ERROR_FIELDS = {"--cable/--vf/--run": "trace-on", "--run": "trace-on", "--cable": "trace-on",
                    "--vf": "trace-on", "--z0": "trace-on", "--axis-vf": "trace-axis-vf",
                    "--expect-run/--expect-load": "trace-expect-run",
                    "--expect-run": "trace-expect-run", "--expect-load": "trace-expect-load",
                    "trace": "trace-file", "--incident": "trace-file"}

    def compose(self) -> ComposeResult:
        catalog = (lambda: self.app.catalog)  # noqa: E731
        yield Field("trace-file", FILE_LABEL, reader=read_path,
                    placeholder="a .csv or .s1p file (Ctrl+O picks one)")
        yield Field("trace-on", "placed on", reader=read_placement, placeholder=ON_EXAMPLE)
        yield Field("trace-expect-load", "expected load", reader=checked_text(load_reader(catalog)),
                    optional=True, placeholder="to compare: open, 50 ohm...")
        yield Field("trace-expect-run", "expected run", reader=checked_text(run_reader(catalog)),
                    optional=True, placeholder="the run placed on, unless given")
        axis = Field("trace-axis-vf", "axis VF", reader=read_vf_text, optional=True,
                     placeholder="VF the instrument drew its distance axis with")
        axis.display = False
        yield axis
        yield TraceView(("#",), empty_text="no trace yet", id="trace-view")

    def result_view(self) -> TraceView:
        return self.query_one(TraceView)

    def compute(self, values):
        from tui.commands.trace import analyse_file, compare_with_expected

        path = values["trace-file"]
        load = values["trace-expect-load"]
        run = values["trace-expect-run"]
        ns = trace_options(path, values["trace-on"], load and load[0], run and run[0],
                           values["trace-axis-vf"])
        key = (_file_key(path), values["trace-on"], values["trace-axis-vf"])
        cached = self._analysed
        if cached is not None and cached[0] == key:
            setup, info, notes, analysis = cached[1]
        else:
            try:
                setup, info, notes, analysis = analyse_file(ns)
            except InputError as exc:
                raise self._as_file_error(exc, path) from None
            self._analysed = (key, (setup, info, notes, analysis))
        setup = copy.copy(setup)  # the comparison notes its prediction on it
        comparison = compare_with_expected(ns, setup, analysis)
        expected = run[1] if run else (setup.segments or ()) if comparison else ()
        return TraceResult(setup, info, tuple(notes), analysis, comparison,
                           getattr(setup, "prediction", None), tuple(expected))

    @staticmethod
    def _as_file_error(exc: InputError, path: str) -> InputError:
        """Errors that name the file (``path line 12``) belong to the file field."""
        if exc.field == path or exc.field.startswith(path + " line"):
            where = exc.field[len(path):].strip()
            problem = f"{where}: {exc.problem}" if where else exc.problem
            return InputError(FILE_LABEL, problem, exc.example)
        return exc

    def hazards(self, result) -> tuple[str, ...]:
        cables = [s.cable for s in (result.setup.segments or ())]
        cables += [result.setup.cable] if result.setup.cable is not None else []
        cables += [s.cable for s in result.expected_run]
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
