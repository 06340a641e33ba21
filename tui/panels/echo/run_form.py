"""The Whole run mode: the predicted trace of a run of catalog cables and a load
(``halftrip simulate``), plotted against distance with its arrivals listed."""

from __future__ import annotations

import re

from textual.app import ComposeResult

from tui.widgets.field import Field
from tui.widgets.option_pages import PagedCommandForm, page_bindings
from tui.widgets.readers import as_text, load_reader, run_reader, text
from tui.widgets.trace_view import TraceShown, TraceView

COLUMNS = ("#", "delay", "distance", "size", "path")
EDGE_EXAMPLE = "rise 1 ns, or pulse 10 ns"
LUMPS_EXAMPLE = "1: 5 nH, 2: 4 pF"


def read_edge(text: str, label: str) -> tuple[str, str] | None:
    """The instrument's edge as the simulate option: ``("rise-time", "1 ns")`` for
    ``1 ns`` or ``rise 1 ns``, ``("pulse-width", "10 ns")`` for ``pulse 10 ns``;
    None (empty or ``step``) for the sharpest step the prediction's grid shows."""
    from calc.errors import InputError
    from calc.parse import parse

    t = " ".join(text.split())
    low = t.lower()
    if low in ("", "step"):
        return None
    option = "pulse-width" if low.startswith("pulse") else "rise-time"
    for word in ("pulse width", "pulse", "step", "rise time", "rise"):
        if low.startswith(word):
            t, low = t[len(word):].strip(), low[len(word):].strip()
    if not t:
        what = "a pulse needs its width" if option == "pulse-width" else "give the rise time"
        raise InputError(label, what, EDGE_EXAMPLE)
    parse(t, label, "time")
    return option, t


def split_lumps(text: str, label: str) -> list[str]:
    """The lumps typed in one field, ``"1: 5 nH, 2: 4 pF"`` (commas or semicolons
    between them), as the ``--lump`` texts ``["1: 5 nH", "2: 4 pF"]``; each is
    read by the command (:func:`calc.simulate.parse_lump`) against the run."""
    from calc.errors import InputError

    pieces = [p.strip() for p in re.split(r"[;,]\s*(?=\d+\s*:)|;", text) if p.strip()]
    for p in pieces:
        if ":" not in p:
            raise InputError(label, f"cannot read {p!r}: give AFTER_SEGMENT: VALUE",
                             LUMPS_EXAMPLE)
    return pieces


class RunForm(PagedCommandForm):
    """Run, load, source impedance and edge; lumps, points and span on the second
    page (Ctrl+R). The prediction runs in a worker thread (``THREADED``), so typing
    never waits for it."""

    COMMAND = "simulate"
    PREFIX = "echo-run"
    LOG_KIND = "simulate"
    THREADED = True
    HELP_TITLE = "Echo: whole run"
    BINDINGS = page_bindings("echo.run", "Back")
    MORE_HEADING = "more options for the prediction (^r back to the run):"
    ERROR_FIELDS = {"--rise-time": "echo-run-edge", "--pulse-width": "echo-run-edge"}

    def compose(self) -> ComposeResult:
        catalog = (lambda: self.app.catalog)  # noqa: E731
        yield from self.pages([
            Field("echo-run-run", "run", reader=as_text(run_reader(catalog)),
                  placeholder="10 m:rg58, 20 m:rg213"),
            Field("echo-run-load", "load", reader=as_text(load_reader(catalog)), value="open",
                  placeholder="open, short, 75 ohm, 10 pF, 75 ohm || 10 pF"),
            Field("echo-run-source-z", "source Z", kind="impedance", optional=True,
                  placeholder="matched to the first cable"),
            Field("echo-run-edge", "edge", reader=read_edge, optional=True,
                  placeholder=EDGE_EXAMPLE),
        ], [
            Field("echo-run-lump", "lumps", reader=split_lumps, optional=True,
                  placeholder=f"after segment N: {LUMPS_EXAMPLE}"),
            Field("echo-run-points", "points", reader=text, optional=True,
                  placeholder="4096, more for a short edge"),
            Field("echo-run-span", "span", kind="time", optional=True,
                  placeholder="the round trip and a quarter more"),
        ])
        yield TraceView(COLUMNS, empty_text="no prediction yet", id="echo-run-view")

    def option_args(self, option: str, text: str) -> list[str]:
        if option == "edge":
            edge = read_edge(text, "edge")
            return [f"--{edge[0]}={edge[1]}"] if edge else []
        if option == "lump":
            return [f"--lump={piece}" for piece in split_lumps(text, "lumps")]
        return super().option_args(option, text)

    def result_view(self) -> TraceView:
        return self.query_one(TraceView)

    def describe(self, result) -> TraceShown:
        from tui import fmt
        from tui.panels.echo.wording import prediction_line
        from tui.widgets.trace_plot import Mark, PlotData

        data, _lines, cables, _argv = result
        units, fraction = self.units, self.fraction
        marks, rows, details = [], [], {}
        for i, a in enumerate(data["arrivals"], start=1):
            key = str(i)
            marks.append(Mark(key, a["time_s"], a["distance_m"], f"{a['size']:+.3f} {a['path']}"))
            rows.append((key, fmt.time(a["time_s"]), fmt.length(a["distance_m"], units, fraction),
                         f"{a['size']:+.3f}", a["path"]))
            details[key] = f"{key}: {a['path']}"
        plot = PlotData(data["time_s"], data["distance_m"], data["level"], tuple(marks),
                        z0_ohm=cables[0].z0_ohm if cables else None)
        return TraceShown(prediction_line(data), plot, rows, details)

    def log_result(self, result) -> dict:
        """What ``halftrip simulate --save`` stores (arrays decimated for the picture)."""
        from tui.commands.simulate import logged_data

        return logged_data(result[0])

    def finish(self, result=None, error=None) -> None:
        super().finish(result, error)
        view = self.result_view()
        if error is not None and view.is_stale:
            view.status.update(f"out of date (last good prediction shown): {error}")
