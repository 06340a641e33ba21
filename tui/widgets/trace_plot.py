"""A trace drawn against distance, its events marked, and a keyboard cursor.

Drawn with textual-plot's PlotWidget (a maintained plotting widget for
Textual). The level (reflected / incident, rho) is on the y axis and the
distance from the instrument, in the user's unit system, on the x axis. Each
event is a vertical line, numbered in the line under the plot with where it
is and what it is (a legend inside the plot would hide the trace at 80x24);
the cursor is another line, moved with ``,`` and ``.`` (fine) or ``<`` and
``>`` (coarse); ``[`` / ``]`` jump to the previous / next event. The last
line reads out the cursor's round-trip delay, distance, level and the event
under it.

The widget computes nothing: the samples, their distances and the events
come from the core (the panel that owns the plot hands them over).
"""

from __future__ import annotations

from dataclasses import dataclass

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.reactive import reactive
from textual.widgets import Static

FOOT_M = 0.3048


def _styled_blanks(canvas) -> None:
    """Give the canvas's blank lines an (empty) style.

    textual-hires-canvas returns a blank line with no style before the plot
    is sized, and Textual's NO_COLOR filter fails on a segment with no style
    (AttributeError in its monochrome filter); an empty style is the same on
    screen. Only this canvas instance is changed.
    """
    from rich.segment import Segment
    from rich.style import Style
    from textual.strip import Strip

    render_line = canvas.render_line
    empty = Style()

    def styled(y: int) -> Strip:
        strip = render_line(y)
        if all(seg.style is not None for seg in strip):
            return strip
        return Strip([Segment(seg.text, seg.style or empty, seg.control) for seg in strip],
                     strip.cell_length)

    canvas.render_line = styled


@dataclass(frozen=True)
class Marker:
    """An event to mark: where (metres, round-trip seconds) and a short name."""

    distance_m: float
    delay_s: float
    label: str


class TracePlot(Vertical):
    """The plot and its cursor read-out (see the module docstring)."""

    DEFAULT_CSS = """
    TracePlot { height: auto; }
    TracePlot > PlotWidget { height: 12; }
    TracePlot > #plot-readout { height: 1; }
    TracePlot > #plot-events { height: auto; max-height: 2; color: $text-muted; }
    TracePlot:focus-within > #plot-readout { text-style: bold; }
    """

    BINDINGS = [
        Binding("full_stop", "move(1)", "Cursor right", id="plot.right"),
        Binding("comma", "move(-1)", "Cursor left", id="plot.left"),
        Binding("greater_than_sign", "move(20)", "Cursor far right", id="plot.far_right",
                show=False),
        Binding("less_than_sign", "move(-20)", "Cursor far left", id="plot.far_left",
                show=False),
        Binding("right_square_bracket", "jump(1)", "Next event", id="plot.next_event"),
        Binding("left_square_bracket", "jump(-1)", "Previous event", id="plot.previous_event",
                show=False),
    ]

    cursor: reactive[int] = reactive(0, init=False)

    def __init__(self, id: str | None = None) -> None:
        super().__init__(id=id)
        self._delay = None  # round-trip seconds per sample
        self._distance = None  # metres per sample
        self._level = None
        self._markers: list[Marker] = []

    def compose(self) -> ComposeResult:
        from textual_plot import PlotWidget  # ~50 ms with numpy: only when a plot is shown

        yield PlotWidget(allow_pan_and_zoom=True)
        yield Static("", id="plot-events", markup=False)
        yield Static("", id="plot-readout", markup=False)

    def on_mount(self) -> None:
        from textual_hires_canvas import Canvas

        for canvas in self.query(Canvas):
            _styled_blanks(canvas)
        self.watch(self.app, "unit_system", lambda _u: self._draw(), init=False)
        self.watch(self.app, "theme", lambda _t: self._draw(), init=False)

    def show(self, delay_s, distance_m, level, markers: list[Marker]) -> None:
        """Draw samples (round-trip delay, distance, level arrays) and their events."""
        import numpy as np

        self._delay = np.asarray(delay_s, dtype=float)
        self._distance = np.asarray(distance_m, dtype=float)
        self._level = np.asarray(level, dtype=float)
        self._markers = list(markers)
        n = self._distance.size
        if markers and n:  # start on the first event
            self.set_reactive(TracePlot.cursor, self._index_of(markers[0].distance_m))
        elif not 0 <= self.cursor < n:
            self.set_reactive(TracePlot.cursor, 0)
        self._draw()

    def _index_of(self, distance_m: float) -> int:
        import numpy as np

        return int(np.argmin(np.abs(self._distance - distance_m)))

    @property
    def has_data(self) -> bool:
        return self._distance is not None and self._distance.size > 0

    def _scale(self) -> tuple[float, str]:
        imperial = self.app.unit_system[0] == "imperial"
        return (1.0 / FOOT_M, "ft") if imperial else (1.0, "m")

    def _colour(self, name: str, fallback: str) -> str:
        return self.app.theme_variables.get(name, fallback)

    def _draw(self) -> None:
        from textual_plot import HiResMode, PlotWidget

        if not self.is_mounted or not self.has_data:
            return
        plot = self.query_one(PlotWidget)
        scale, unit = self._scale()
        x = self._distance * scale
        plot.clear()
        plot.plot(x, self._level, line_style=self._colour("foreground", "white"),
                  hires_mode=HiResMode.BRAILLE)
        for m in self._markers:
            plot.add_v_line(m.distance_m * scale, line_style=self._colour("warning", "yellow"))
        plot.add_v_line(x[self.cursor], line_style=self._colour("accent", "cyan"))
        plot.set_xlabel(f"distance from the instrument ({unit})")
        plot.set_ylabel("level (rho)")
        plot.show_legend(is_visible=False)
        self._list_events()
        self._readout()

    def _list_events(self) -> None:
        from tui import fmt

        units, fraction = self.app.unit_system
        text = "  ".join(f"{i} {fmt.length(m.distance_m, units, fraction)} {m.label}"
                         for i, m in enumerate(self._markers, start=1))
        self.query_one("#plot-events", Static).update(
            f"events: {text}" if text else "no events marked")

    def _readout(self) -> None:
        from tui import fmt

        i = self.cursor
        units, fraction = self.app.unit_system
        near = [n for n, m in enumerate(self._markers, start=1) if self._index_of(m.distance_m) == i]
        at = f"  at event {near[0]}" if near else ""
        self.query_one("#plot-readout", Static).update(
            f"cursor {fmt.time(float(self._delay[i]))} round trip, "
            f"{fmt.length(float(self._distance[i]), units, fraction)}, "
            f"level {float(self._level[i]):+.3f}{at}  (, . [ ])")

    def watch_cursor(self) -> None:
        self._draw()

    def action_move(self, samples: int) -> None:
        """Move the cursor by ``samples`` hundredths of the trace."""
        if self.has_data:
            n = self._distance.size
            step = max(1, n // 100) * samples
            self.cursor = min(max(self.cursor + step, 0), n - 1)

    def action_jump(self, direction: int) -> None:
        """Put the cursor on the next (1) or previous (-1) event."""
        if not (self.has_data and self._markers):
            return
        here = self._distance[self.cursor]
        places = sorted(m.distance_m for m in self._markers)
        ahead = [d for d in places if (d - here) * direction > 1e-9]
        if ahead:
            self.cursor = self._index_of(ahead[0] if direction > 0 else ahead[-1])

    @property
    def cursor_delay_s(self) -> float:
        return float(self._delay[self.cursor])

    @property
    def cursor_distance_m(self) -> float:
        return float(self._distance[self.cursor])
