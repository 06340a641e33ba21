"""A whole run's predicted trace (``halftrip simulate``), plotted with its echoes."""

from __future__ import annotations

from textual.app import ComposeResult

from tui.widgets.command_form import CommandForm
from tui.widgets.field import Field
from tui.widgets.readers import run_reader, text
from tui.widgets.result_view import ResultView
from tui.widgets.trace_plot import Marker, TracePlot

#: Echoes marked on the plot (the largest; all are listed below it).
MARKED = 6
PLOT_TITLE = "level (reflected / incident) against distance from the instrument:"


def without_text_plot(lines: list[str]) -> list[str]:
    """The command's lines without its character plot (the panel draws a real one)."""
    if PLOT_TITLE not in lines:
        return lines
    start = lines.index(PLOT_TITLE)
    end = next((i for i in range(start + 1, len(lines)) if not lines[i].strip()), len(lines))
    return lines[:start] + lines[end + 1:]


def short_path(path: str) -> str:
    """``"reflect at joint 1 (rg58|hardline)"`` -> ``"joint 1"``; a bounce keeps its start."""
    head = path.split(" (")[0]
    if head.startswith("reflect at "):
        return head.removeprefix("reflect at ")
    return head if len(head) <= 24 else head[:23] + "~"


class WholeRunForm(CommandForm):
    """Run, load, lumps, instrument; the predicted trace and every echo."""

    COMMAND = "simulate"
    PREFIX = "echo-run"
    LOG_KIND = "simulate"
    SLOW = True  # a long run with re-reflections takes a moment: off the UI thread

    def compose(self) -> ComposeResult:
        yield Field("echo-run-run", "run (length:cable)", reader=run_reader(lambda: self.catalog),
                    placeholder="2 m:rg58, 45 m:hardline-50-half")
        yield Field("echo-run-load", "load at the end", reader=text,
                    placeholder="open, short, match, 75 ohm, 10 pF...")
        yield Field("echo-run-lump", "lumps", reader=text, optional=True,
                    placeholder="after segment: value; e.g. 1: 5 nH; 2: 3 pF")
        yield Field("echo-run-source-z", "instrument Z", kind="impedance", optional=True,
                    placeholder="default 50 ohm")
        yield Field("echo-run-rise-time", "rise time", kind="time", optional=True,
                    placeholder="step edge, e.g. 1 ns")
        yield Field("echo-run-pulse-width", "or pulse width", kind="time", optional=True,
                    placeholder="a pulse instead of a step, e.g. 5 ns")
        yield TracePlot(id="echo-run-plot")
        yield ResultView()

    def option_args(self, option: str, text: str) -> list[str]:
        if option == "lump":
            return [f"--lump={part.strip()}" for part in text.split(";") if part.strip()]
        return super().option_args(option, text)

    def describe(self, result):
        return "\n".join(without_text_plot(result[1]))

    def shown(self, result) -> None:
        prediction = result[4]
        arrivals = sorted(prediction.arrivals, key=lambda a: -abs(a.size))[:MARKED]
        markers = [Marker(a.distance_m, a.time_s, short_path(a.path))
                   for a in sorted(arrivals, key=lambda a: a.time_s)]
        self.query_one(TracePlot).show(prediction.time_s, prediction.distance_m,
                                       prediction.level, markers)

    def _units_changed(self, units) -> None:
        super()._units_changed(units)
        if self.last_result is not None:
            self.shown(self.last_result)
