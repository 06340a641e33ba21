"""The Whole run tab: the predicted trace of a run of catalog cables and a load,
from the same call ``halftrip simulate`` makes (:func:`tui.commands.simulate.predict`)."""

from __future__ import annotations

from textual.app import ComposeResult

from tui.widgets.field import Field
from tui.widgets.form import LiveForm
from tui.widgets.readers import as_text, load_reader, run_reader
from tui.widgets.trace_view import TraceShown, TraceView

COLUMNS = ("#", "delay", "distance", "size", "path")
EDGE_EXAMPLE = "rise 1 ns, or pulse 10 ns"


def read_edge(text: str, label: str) -> tuple[str, str] | None:
    """The instrument's edge as the simulate options: ``("rise_time", "1 ns")`` for
    ``1 ns`` or ``rise 1 ns``, ``("pulse_width", "10 ns")`` for ``pulse 10 ns``;
    None (empty or ``step``) for the sharpest step the grid shows."""
    from calc.errors import InputError
    from calc.parse import parse

    t = " ".join(text.split())
    low = t.lower()
    if low in ("", "step"):
        return None
    option = "pulse_width" if low.startswith("pulse") else "rise_time"
    for word in ("pulse width", "pulse", "step", "rise time", "rise"):
        if low.startswith(word):
            t, low = t[len(word):].strip(), low[len(word):].strip()
    if not t:
        what = "a pulse needs its width" if option == "pulse_width" else "give the rise time"
        raise InputError(label, what, EDGE_EXAMPLE)
    parse(t, label, "time")
    return option, t


class RunForm(LiveForm):
    """Run, load, source impedance and edge in; the predicted trace and its arrivals out.

    The prediction runs in a worker thread (``THREADED``), so typing never waits.
    """

    THREADED = True
    ERROR_FIELDS = {"--run": "echo-run", "--load": "echo-run-load",
                    "--source-z": "echo-run-source", "--rise-time": "echo-run-edge",
                    "--pulse-width": "echo-run-edge", "--span": "echo-run-edge"}

    def compose(self) -> ComposeResult:
        catalog = (lambda: self.app.catalog)  # noqa: E731
        yield Field("echo-run", "run", reader=as_text(run_reader(catalog)),
                    placeholder="10 m:rg58, 20 m:rg213")
        yield Field("echo-run-load", "load", reader=as_text(load_reader(catalog)), value="open",
                    placeholder="open, short, 75 ohm, 10 pF, 75 ohm || 10 pF")
        yield Field("echo-run-source", "source Z", kind="impedance", optional=True,
                    placeholder="matched to the first cable")
        yield Field("echo-run-edge", "edge", reader=read_edge, optional=True,
                    placeholder=EDGE_EXAMPLE)
        yield TraceView(COLUMNS, empty_text="no prediction yet", id="echo-run-view")

    def result_view(self) -> TraceView:
        return self.query_one(TraceView)

    def read_fields(self):
        values, error = super().read_fields()
        values["echo-run-source-text"] = self.field("echo-run-source").text.strip() or None
        return values, error

    def compute(self, values):
        from tui.commands import simulate
        from tui.panels._cli import cli_options

        edge = dict([values["echo-run-edge"]]) if values["echo-run-edge"] else {}
        ns = cli_options(simulate, run=values["echo-run"], load=values["echo-run-load"],
                         source_z=values["echo-run-source-text"], **edge)
        return simulate.predict(ns)

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
            key = str(i)
            marks.append(Mark(key, a.time_s, a.distance_m, f"{a.size:+.3f} {a.path}"))
            rows.append((key, fmt.time(a.time_s), fmt.length(a.distance_m, units, fraction),
                         f"{a.size:+.3f}", a.path))
            details[key] = f"{key}: {a.path}"
        data = PlotData(p.time_s, p.distance_m, p.level, tuple(marks),
                        z0_ohm=run[0].cable.z0_ohm)
        return TraceShown(prediction_line(p), data, rows, details)

    def finish(self, result=None, error=None) -> None:
        super().finish(result, error)
        view = self.result_view()
        if error is not None and view.is_stale:
            view.status.update(f"out of date (last good prediction shown): {error}")
