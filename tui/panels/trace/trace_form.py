"""The trace form: file, placement and expectation in; events, plot and comparison out.

The fields are ``halftrip trace``'s options, and the file is read, analysed
and compared by the same calls the command makes
(:func:`tui.commands.trace.analyse_file`, then
:func:`~tui.commands.trace.compare_with_expected`), so the panel and the CLI
show the same events. It runs in a worker thread (``THREADED``), and the
analysis of an unchanged file is kept while only the expectation changes.
"""

from __future__ import annotations

import copy
import re
from dataclasses import dataclass

from textual.app import ComposeResult

from calc.errors import InputError
from tui.widgets.field import Field
from tui.widgets.option_pages import PagedCommandForm, page_bindings
from tui.widgets.readers import as_text, axis_unit, choice, load_reader, run_reader, text
from tui.widgets.trace_view import TraceShown, TraceView

FILE_LABEL = "file"
ON_EXAMPLE = "rg58, 0.66 or 2 m:rg58, 45 m:hardline-50-half"
WINDOW_EXAMPLE = "kaiser 6, hann or none"
#: A Touchstone file by its name, as the reader tells it (``.s1p``, ``.s2p``...).
_SWEEP_NAME = re.compile(r"\.s\d+p$", re.IGNORECASE)
#: Reading options that apply to one kind of file only (the rest apply to both).
TEXT_ONLY = ("trace-axis-unit", "trace-level-unit", "trace-incident")
SWEEP_ONLY = ("trace-window", "trace-band", "trace-dc")
#: The options given to the command as typed (the command reads them).
AS_TYPED = ("tolerance", "z0", "rise-time", "level-unit", "band", "dc")


@dataclass(frozen=True, eq=False)
class TraceResult:
    """One analysed trace: what the CLI's calls returned."""

    setup: object  # the CLI's reading of the options, with the samples read (time_s, level)
    info: dict
    notes: tuple[str, ...]
    analysis: object  # calc.events.Analysis, placed
    comparison: object | None  # calc.events.Comparison
    prediction: object | None  # calc.simulate.Prediction of the expected run


def read_path(text: str, label: str) -> str:
    if not text.strip():
        raise InputError(label, "give the trace file's path (Ctrl+O picks one)",
                         "kestrel-ridge-feeder.csv")
    return text.strip()


def placement_option(text: str) -> str:
    """The trace option a placement stands for: ``run`` for ``LENGTH:CABLE, ...``,
    ``vf`` for a number, ``cable`` for a catalog id."""
    t = text.strip()
    if ":" in t:
        return "run"
    return "vf" if t[:1] in tuple("0123456789.") else "cable"


def read_placement(text: str, label: str) -> str:
    if not text.strip():
        raise InputError(label, "give the cable, a velocity factor or the run", ON_EXAMPLE)
    return text.strip()


def read_vf_text(text: str, label: str) -> str:
    from calc.parse import parse

    parse(text, label, "vf")
    return text.strip()


def read_window(text: str, label: str) -> tuple[str, str | None]:
    """The sweep's window: ``("kaiser", "8")`` for ``kaiser 8`` (the beta; the
    command checks its range), ``("hann", None)``, ``("none", None)``."""
    word, _, rest = text.strip().partition(" ")
    name = choice("kaiser", "hann", "none")(word, label)
    beta = rest.strip().removeprefix("beta").strip() or None
    if beta is not None:
        try:
            float(beta)
        except ValueError:
            raise InputError(label, f"{beta!r} is not a number for the Kaiser beta",
                             WINDOW_EXAMPLE) from None
        if name != "kaiser":
            raise InputError(label, "only the Kaiser window takes a beta", WINDOW_EXAMPLE)
    return name, beta


def _file_key(path: str) -> tuple:
    """The file as it is now (a changed or rewritten file is read again)."""
    from pathlib import Path

    try:
        st = Path(path).expanduser().stat()
    except (OSError, ValueError):  # ValueError: a NUL in the name (the read refuses it)
        return (path, None)
    return (path, st.st_mtime_ns, st.st_size)


class TraceForm(PagedCommandForm):
    """File, placement (cable, VF or run), expected load and run; the distance-axis
    VF field shows when a file drawn against distance needs it. The reading
    options wait on the second page (Ctrl+R), those for a sweep or for a text
    trace as the file is one or the other."""

    COMMAND = "trace"
    PREFIX = "trace"
    LOG_KIND = "trace"
    THREADED = True
    HELP_TITLE = "Trace: the file and its reading"
    BINDINGS = page_bindings("trace", "Back")
    ERROR_FIELDS = {"--cable/--vf/--run": "trace-on", "--run": "trace-on", "--cable": "trace-on",
                    "--vf": "trace-on", "--expect-run/--expect-load": "trace-expect-run",
                    "trace": "trace-file", "--time-unit": "trace-axis-unit",
                    "--distance-unit": "trace-axis-unit", "--kaiser-beta": "trace-window"}
    #: (file, every option but the expectation) -> what analyse_file returned.
    _analysed: tuple | None = None

    def compose(self) -> ComposeResult:
        catalog = (lambda: self.app.catalog)  # noqa: E731
        axis = Field("trace-axis-vf", "axis VF", reader=read_vf_text, optional=True,
                     placeholder="VF the instrument drew its distance axis with")
        axis.display = False
        yield from self.pages([
            Field("trace-file", FILE_LABEL, reader=read_path,
                  placeholder="a .csv or .s1p file (Ctrl+O picks one)"),
            Field("trace-on", "placed on", reader=read_placement, placeholder=ON_EXAMPLE),
            Field("trace-expect-load", "expected load", reader=as_text(load_reader(catalog)),
                  optional=True, placeholder="to compare: open, 50 ohm..."),
            Field("trace-expect-run", "expected run", reader=as_text(run_reader(catalog)),
                  optional=True, placeholder="the run placed on, unless given"),
            axis,
        ], [
            Field("trace-tolerance", "VF tolerance", kind="tolerance", optional=True,
                  placeholder="the cable's, e.g. 3 %"),
            Field("trace-z0", "reference Z0", kind="impedance", optional=True,
                  placeholder="the first cable's, or 50 ohm"),
            Field("trace-rise-time", "rise time", kind="time", optional=True,
                  placeholder="measured from the trace, e.g. 0.5 ns"),
            Field("trace-axis-unit", "time/distance unit", reader=axis_unit, optional=True,
                  placeholder="when the file does not say: ns, m, ft"),
            Field("trace-level-unit", "level unit", reader=text, optional=True,
                  placeholder="when the file does not say: V, mV, rho, %"),
            Field("trace-incident", "incident edge", optional=True,
                  reader=choice("auto", "in-trace", "at-zero"),
                  placeholder="auto; in-trace, or at-zero (reflections only)"),
            Field("trace-window", "window", reader=read_window, optional=True,
                  placeholder=f"{WINDOW_EXAMPLE} (default kaiser 6)"),
            Field("trace-band", "band", reader=text, optional=True,
                  placeholder="the whole sweep, or e.g. 1 MHz..2 GHz"),
            Field("trace-dc", "state at DC", reader=text, optional=True,
                  placeholder="extrapolated; or open, short, 50 ohm"),
        ])
        yield TraceView(("#",), empty_text="no trace yet", id="trace-view")

    # -- which reading options apply ----------------------------------------
    def is_sweep(self, path: str) -> bool:
        """A Touchstone sweep by its name, or as the last analysis read it."""
        last = self.last_result
        if last is not None and last[0].info.get("file") == path:
            return last[0].info.get("format") == "touchstone"
        return bool(_SWEEP_NAME.search(path))

    def read_fields(self):
        path = self.field("trace-file").text.strip()
        sweep = self.is_sweep(path)
        for f in self.more_fields():
            f.display = f.field_name not in (TEXT_ONLY if sweep else SWEEP_ONLY)
        kind = "a Touchstone sweep" if sweep else "a text trace"
        self.query_one(".options-heading").update(
            f"reading options for {kind} (^r back to the file):")
        return super().read_fields()

    def result_view(self) -> TraceView:
        return self.query_one(TraceView)

    # -- the command line the fields stand for ----------------------------------
    def argv(self) -> list[str]:
        texts = {f.field_name.removeprefix("trace-"): f.text.strip() for f in self.fields()}
        on = texts["on"]
        argv = [f"--{placement_option(on)}={on}"] if on else []
        if texts["axis-vf"]:
            argv.append(f"--axis-vf={texts['axis-vf']}")
        argv += [f"--{name}={texts[name]}" for name in AS_TYPED if texts[name]]
        if texts["axis-unit"]:
            axis, unit = axis_unit(texts["axis-unit"], "time/distance unit")
            argv.append(f"--{axis}-unit={unit}")
        if texts["incident"]:
            argv.append(f"--incident={choice('auto', 'in-trace', 'at-zero')(texts['incident'], '')}")
        if texts["window"]:
            window, beta = read_window(texts["window"], "window")
            argv += [f"--window={window}"] + ([f"--kaiser-beta={beta}"] if beta else [])
        if texts["expect-load"]:
            argv.append(f"--expect-load={texts['expect-load']}")
            run = texts["expect-run"] or (on if placement_option(on) == "run" else "")
            argv += [f"--expect-run={run}"] if run else []
        elif texts["expect-run"]:
            argv.append(f"--expect-run={texts['expect-run']}")
        return argv + ["--", texts["file"]]

    def _run(self, argv: list[str]):
        from tui.commands.trace import analyse_file, compare_with_expected

        ns = self.options(argv)
        key = (_file_key(ns.file), repr(sorted((k, v) for k, v in vars(ns).items()
                                               if k not in ("expect_run", "expect_load"))))
        cached = self._analysed
        if cached is not None and cached[0] == key:
            setup, info, notes, analysis = cached[1]
        else:
            try:
                setup, info, notes, analysis = analyse_file(ns)
            except InputError as exc:
                raise self._as_file_error(exc, ns.file) from None
            self._analysed = (key, (setup, info, notes, analysis))
        setup = copy.copy(setup)  # the comparison notes its prediction on it
        comparison = compare_with_expected(ns, setup, analysis)
        result = TraceResult(setup, info, tuple(notes), analysis, comparison,
                             getattr(setup, "prediction", None))
        cables = [s.cable for s in setup.segments or ()] + [setup.cable]
        if comparison is not None and ns.expect_run != ns.run:
            from calc.run import parse_run

            cables += [s.cable for s in parse_run(ns.expect_run, self.catalog.get, "run")]
        return result, [], tuple(c for c in cables if c is not None), argv

    @staticmethod
    def _as_file_error(exc: InputError, path: str) -> InputError:
        """Errors that name the file (``path line 12``) belong to the file field."""
        if exc.field == path or exc.field.startswith(path + " line"):
            where = exc.field[len(path):].strip()
            problem = f"{where}: {exc.problem}" if where else exc.problem
            return InputError(FILE_LABEL, problem, exc.example)
        return exc

    def describe(self, result) -> TraceShown:
        from tui.panels.trace.wording import trace_shown

        return trace_shown(result[0], self.units, self.fraction)

    def log_result(self, result) -> dict:
        """What ``halftrip trace FILE --save`` stores: the events, the comparison and the
        trace's samples, decimated (:func:`tui.commands.trace.logged_data`)."""
        from tui.commands.trace import logged_data

        r, ns = result[0], self.options(result[3])
        return logged_data(r.setup, r.info, r.notes, r.analysis, r.comparison,
                           ns.expect_run, ns.expect_load)

    def finish(self, result=None, error=None) -> None:
        super().finish(result, error)
        axis = self.field("trace-axis-vf")
        if (error is not None and self._owner(self.fields(), error) is axis) or (
                result is not None and result[0].info.get("axis") == "distance"):
            axis.display = True  # shown once a file drawn against distance needs it
        view = self.result_view()
        if error is not None and view.is_stale:
            view.status.update(f"out of date (last good result shown): {error}")
