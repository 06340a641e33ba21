"""The trace plot shared by the Echo and Trace panels.

Level (rho, the reflected voltage as a fraction of the incident step)
against distance from the instrument, drawn with textual-plot's
:class:`~textual_plot.PlotWidget` in Braille dots. Events or arrivals are
marked on the trace by their number (the same number as in the panel's
list), a second trace (the prediction beside a recording) can be drawn
under the first, and a cursor moved by keyboard reads out the round-trip
delay, the distance, the level and the impedance that level implies.

Data down, messages up: a panel gives the plot a :class:`PlotData` with
:meth:`TracePlot.show` and hears :class:`TracePlot.CursorMoved`. The plot
computes nothing of the job: the distance axis, the marks and the levels
come from the core; it only thins the samples to what the screen can show
(:func:`envelope`) and calls :func:`calc.tline.impedance_from_gamma` for
the readout.

Keys (when the plot has the focus): left / right move the cursor one
column, shift+left / shift+right ten columns, home / end to the ends,
``[`` / ``]`` to the previous / next mark, ``+`` / ``-`` zoom in and out
around the cursor, ``0`` shows the whole trace. The mouse wheel and
dragging still zoom and pan.

Colours come from the component classes below, styled with theme
variables, so dark and light themes and NO_COLOR all work; nothing relies on
colour alone (marks are digits, the cursor is a line, the out-of-date state
changes the title and the border).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
from textual.binding import Binding
from textual.message import Message
from textual.reactive import reactive
from textual.strip import Strip
from textual_hires_canvas import Canvas
from textual_plot import HiResMode, PlotWidget
from textual_plot.axis_formatter import NumericAxisFormatter

FOOT_M = 0.3048  # exact (international yard and pound agreement, 1959)
#: Samples drawn per screen column at most (Braille has two dots per column).
DOTS_PER_COLUMN = 2
#: Columns a big cursor step moves.
BIG_STEP = 10
#: Zoom factor per key press.
ZOOM_STEP = 2.0
#: Room above and below the trace, as a fraction of its level range.
LEVEL_MARGIN = 0.12


@dataclass(frozen=True)
class Mark:
    """One numbered place on the trace: an event found or an arrival predicted.

    ``label`` is shown above the trace at that distance (one or two
    characters, the number in the panel's list); ``text`` in the readout when
    the cursor is on the mark. ``other`` marks belong to the second trace
    (drawn in its style, below the trace).
    """

    label: str
    time_s: float
    distance_m: float
    text: str = ""
    other: bool = False


@dataclass(frozen=True, eq=False)
class PlotData:
    """What the plot shows. Arrays are the same length, time increasing;
    ``distance_m`` never decreases (the core's distance axis)."""

    time_s: np.ndarray
    distance_m: np.ndarray
    level: np.ndarray
    marks: tuple[Mark, ...] = ()
    z0_ohm: float | None = None  # for the impedance in the readout
    other_distance_m: np.ndarray | None = None  # a second trace, drawn under the first
    other_level: np.ndarray | None = None
    title: str = ""
    notes: tuple[str, ...] = field(default=())

    @property
    def size(self) -> int:
        return int(self.time_s.size)


def envelope(x: np.ndarray, y: np.ndarray, lo: float, hi: float, bins: int
             ) -> tuple[np.ndarray, np.ndarray]:
    """The samples with ``lo <= x <= hi``, thinned to at most ``2 bins`` points that
    keep every bin's lowest and highest level (a one-sample spike stays visible).

    ``x`` must not decrease. Within a bin the two points come in the order the
    trace visits them, so a rising edge is drawn rising.
    """
    i0 = int(np.searchsorted(x, lo, side="left"))
    i1 = int(np.searchsorted(x, hi, side="right"))
    i0, i1 = max(i0 - 1, 0), min(i1 + 1, x.size)  # one sample beyond each side
    xs, ys = x[i0:i1], y[i0:i1]
    if xs.size <= 2 * bins or bins < 1:
        return xs, ys
    starts = np.linspace(0, xs.size, bins + 1).astype(int)[:-1]
    low = np.minimum.reduceat(ys, starts)
    high = np.maximum.reduceat(ys, starts)
    ends = np.append(starts[1:], xs.size) - 1
    rising = ys[ends] >= ys[starts]
    first = np.where(rising, low, high)
    second = np.where(rising, high, low)
    bx = np.repeat(0.5 * (xs[starts] + xs[ends]), 2)
    by = np.column_stack((first, second)).ravel()
    return bx, by


def label_cells(positions: list[tuple[float, str]], lo: float, hi: float, columns: int
                ) -> list[tuple[int, str]]:
    """Where the marks' labels go on one row of ``columns`` cells: ``(cell, character)``.

    ``positions`` are ``(distance, label)`` in any order. Each label starts at
    its mark's cell; a label that would touch the one before it is left out
    and the one before gets a ``+`` (more marks here: the list has them all).
    """
    cells: list[tuple[int, str]] = []
    last_end, crowded = -2, False
    for d, label in sorted(positions):
        col = min(max(int((d - lo) / (hi - lo) * columns), 0), columns - 1)
        start = min(col, columns - len(label))
        if start <= last_end + 1:
            if not crowded and last_end + 1 < columns:
                cells.append((last_end + 1, "+"))
                last_end += 1
                crowded = True
            continue
        cells += [(start + k, ch) for k, ch in enumerate(label)]
        last_end, crowded = start + len(label) - 1, False
    return cells


class _UnitTicks(NumericAxisFormatter):
    """Round-number ticks with the unit after the last label (``... 40  50 m``)."""

    def __init__(self, unit: str) -> None:
        super().__init__()
        self.unit = unit

    def get_ticks_and_labels(self, min_, max_, max_ticks=8):
        ticks = [t for t in self.get_ticks(min_, max_, max_ticks) if min_ <= t <= max_]
        labels = list(self.get_labels_for_ticks(ticks))
        if labels:
            labels[-1] = f"{labels[-1]} {self.unit}"
        return ticks, labels


class _LevelTicks(NumericAxisFormatter):
    """Round-number level ticks, no more than one every other row."""

    def __init__(self, rows: int) -> None:
        super().__init__()
        self.most = max(rows // 2, 2)

    def get_ticks_and_labels(self, min_, max_, max_ticks=8):
        return super().get_ticks_and_labels(min_, max_, min(max_ticks, self.most))


def _styled_lines(canvas: Canvas):
    """``canvas.render_line`` that never returns a style-less empty strip.

    textual-hires-canvas 0.14 answers a line its buffer does not cover yet (the
    first frame, before the plot sizes its canvases) with an empty segment of
    no style, which Textual's monochrome filter (NO_COLOR) cannot take.
    """
    render_line = canvas.render_line

    def line(y: int) -> Strip:
        strip = render_line(y)
        if strip.cell_length == 0:
            return Strip.blank(canvas.size.width, canvas.rich_style)
        return strip

    return line


class TracePlot(PlotWidget, inherit_bindings=False):
    """Level against distance with numbered marks and a keyboard cursor.

    Set the data with :meth:`show`; mark what is shown out of date with
    :attr:`stale`. The readout (top border) follows the cursor.
    """

    HELP_TITLE = "Trace plot (when it has the cursor)"

    BINDINGS = [
        Binding("left", "step(-1)", "Cursor left", id="plot.left", show=False),
        Binding("right", "step(1)", "Cursor right", id="plot.right", show=False),
        Binding("shift+left", f"step(-{BIG_STEP})", "Cursor far left", id="plot.far_left",
                show=False),
        Binding("shift+right", f"step({BIG_STEP})", "Cursor far right", id="plot.far_right",
                show=False),
        Binding("home", "to_end(0)", "Cursor to start", id="plot.home", show=False),
        Binding("end", "to_end(1)", "Cursor to end", id="plot.end", show=False),
        Binding("left_square_bracket", "to_mark(-1)", "Previous mark", id="plot.previous_mark",
                key_display="["),
        Binding("right_square_bracket", "to_mark(1)", "Next mark", id="plot.next_mark",
                key_display="]"),
        Binding("plus,equals_sign", "zoom(1)", "Zoom in", id="plot.zoom_in", key_display="+"),
        Binding("minus", "zoom(-1)", "Zoom out", id="plot.zoom_out", key_display="-"),
        Binding("0", "whole", "Whole trace", id="plot.whole", show=False),
    ]

    COMPONENT_CLASSES = PlotWidget.COMPONENT_CLASSES | {
        "trace-plot--line", "trace-plot--other-line", "trace-plot--mark",
        "trace-plot--other-mark", "trace-plot--cursor",
    }

    DEFAULT_CSS = """
    TracePlot {
        height: 1fr;
        min-height: 7;
        border-top: solid $panel-lighten-2;
        border-title-align: left;
        border-title-color: $text;
        & > .trace-plot--line { color: $text; }
        & > .trace-plot--other-line { color: $text-muted; }
        & > .trace-plot--mark { color: $text-primary; text-style: bold; }
        & > .trace-plot--other-mark { color: $text-muted; text-style: bold; }
        & > .trace-plot--cursor { color: $text-secondary; }
        & > .plot--axis { color: $text-muted; }
        & > .plot--tick { color: $text-muted; text-style: none; }
        &:focus { border-top: heavy $primary; }
        &:focus > .plot--axis { color: $text-muted; }
        &.-stale { border-top: dashed $warning; }
        &.-stale > .trace-plot--line { color: $text-muted; }
    }
    """

    #: True while what is shown is the last good result, not the current input.
    stale: reactive[bool] = reactive(False)

    class CursorMoved(Message):
        """The cursor moved: to sample ``index``, on ``mark`` (or None)."""

        def __init__(self, plot: TracePlot, index: int, time_s: float, distance_m: float,
                     level: float, mark: Mark | None) -> None:
            super().__init__()
            self.plot = plot
            self.index = index
            self.time_s = time_s
            self.distance_m = distance_m
            self.level = level
            self.mark = mark

        @property
        def control(self) -> TracePlot:
            return self.plot

    def __init__(self, *, empty_text: str = "no trace yet", id: str | None = None,
                 classes: str | None = None) -> None:
        super().__init__(id=id, classes=classes)
        self.data: PlotData | None = None
        self.cursor = 0
        self.empty_text = empty_text
        self._view: tuple[float, float] | None = None  # visible distance (m) when zoomed
        self._units = ("metric", 16)

    # ------------------------------------------------------------- set-up
    def on_mount(self) -> None:
        super().on_mount()
        for canvas in self.query(Canvas):
            canvas.render_line = _styled_lines(canvas)
        self.margin_top = 0
        self.margin_bottom = 1
        self.margin_left = 6
        if "unit_system" in type(self.app).__dict__ or hasattr(type(self.app), "unit_system"):
            self.watch(self.app, "unit_system", self._units_changed)
        self.border_title = self.empty_text

    def _units_changed(self, units: tuple[str, int]) -> None:
        self._units = tuple(units)
        self._draw()

    @property
    def _scale(self) -> float:
        """Metres per unit of the x axis."""
        return FOOT_M if self._units[0] == "imperial" else 1.0

    # ---------------------------------------------------------------- data
    def show(self, data: PlotData | None) -> None:
        """Show ``data`` (None: nothing). The cursor stays at the same distance
        and the zoom is kept while it still falls on the trace."""
        old = self.data
        self.data = data
        if data is None or data.size == 0:
            self.data = None
            self.cursor = 0
            self._draw()
            return
        d = data.distance_m
        if old is not None and old.size:
            where = float(old.distance_m[min(self.cursor, old.size - 1)])
            self.cursor = int(np.clip(np.searchsorted(d, where), 0, data.size - 1))
        else:
            first = next((m for m in data.marks if not m.other), None)
            self.cursor = self._index_of(first) if first is not None else 0
        if self._view is not None:
            lo, hi = self._view
            if hi <= d[0] or lo >= d[-1]:
                self._view = None
        self._draw()
        self._announce()

    def watch_stale(self, stale: bool) -> None:
        self.set_class(stale, "-stale")
        self._update_readout()

    # -------------------------------------------------------------- drawing
    def _style(self, name: str) -> str:
        return str(self.get_component_rich_style(name))

    def _columns(self) -> int:
        return max(self.content_size.width - self.margin_left - 2, 8)

    def _rows(self) -> int:
        """Rows inside the plot's frame (the marks' rows are the first and last)."""
        return max(self.content_size.height - self.margin_top - self.margin_bottom - 2, 3)

    def _visible(self) -> tuple[float, float]:
        d = self.data.distance_m
        lo, hi = self._view if self._view is not None else (float(d[0]), float(d[-1]))
        if hi <= lo:
            hi = lo + 1e-3
        return lo, hi

    def _draw(self) -> None:
        self.clear()
        if self.data is None:
            self.set_xlimits(0.0, 1.0)
            self.set_ylimits(-1.0, 1.0)
            self._update_readout()
            return
        data, s = self.data, self._scale
        self.set_x_formatter(_UnitTicks("ft" if s != 1.0 else "m"))
        self.set_y_formatter(_LevelTicks(self._rows()))
        lo, hi = self._visible()
        bins = self._columns() * DOTS_PER_COLUMN
        if data.other_distance_m is not None and data.other_level is not None:
            ox, oy = envelope(data.other_distance_m, data.other_level, lo, hi, bins)
            self.plot(ox / s, oy, line_style=self._style("trace-plot--other-line"),
                      hires_mode=HiResMode.BRAILLE)
        x, y = envelope(data.distance_m, data.level, lo, hi, bins)
        self.plot(x / s, y, line_style=self._style("trace-plot--line"),
                  hires_mode=HiResMode.BRAILLE)
        y_lo, y_hi = self._level_limits()
        half_row = 0.5 * (y_hi - y_lo) / self._rows()
        here = float(data.distance_m[self.cursor]) / s  # the cursor stops short of the marks
        self.plot([here, here], [y_lo + 2 * half_row, y_hi - 2 * half_row],
                  line_style=self._style("trace-plot--cursor"), hires_mode=HiResMode.BRAILLE)
        columns = self._columns()
        for other, y in ((False, y_hi - half_row), (True, y_lo + half_row)):
            # found marks along the top, the other trace's along the bottom
            style = self._style("trace-plot--other-mark" if other else "trace-plot--mark")
            placed = [(m.distance_m, m.label) for m in data.marks
                      if m.other == other and lo <= m.distance_m <= hi]
            for cell, char in label_cells(placed, lo, hi, columns):
                x = lo + (cell + 0.5) / columns * (hi - lo)
                self.scatter([x / s], [y], marker=char, marker_style=style)
        self.set_xlimits(lo / s, hi / s)
        self.set_ylimits(y_lo, y_hi)
        self._update_readout()

    def _level_limits(self) -> tuple[float, float]:
        """Level range shown: the data (and zero), a margin, and one free row for
        the marks above (and below, when the other trace has marks)."""
        data = self.data
        levels = [data.level] + ([data.other_level] if data.other_level is not None else [])
        y_lo = min(float(np.nanmin(v)) for v in levels)
        y_hi = max(float(np.nanmax(v)) for v in levels)
        y_lo, y_hi = min(y_lo, -0.1), max(y_hi, 0.1)  # zero always in view
        span, rows = y_hi - y_lo, max(self._rows(), 3)
        margin = LEVEL_MARGIN * span
        if any(m.other for m in data.marks):
            pad = max(margin, span / (rows - 2))  # a row of height (span + 2 pad) / rows
            return y_lo - pad, y_hi + pad
        pad = max(margin, (span + margin) / (rows - 1))
        return y_lo - margin, y_hi + pad

    def notify_style_update(self) -> None:
        """Theme changed: styles are read again (they are baked into the datasets)."""
        super().notify_style_update()
        if self.is_mounted:  # after the refresh, when the component styles are the new ones
            self.call_after_refresh(self._draw)

    def on_resize(self) -> None:
        self._draw()

    def on_plot_widget_scale_changed(self, event: PlotWidget.ScaleChanged) -> None:
        """The mouse zoomed or panned: thin the samples for the new view."""
        event.stop()
        if self.data is None:
            return
        s = self._scale
        self._view = (event.x_min * s, event.x_max * s)
        lo, hi = self._view
        d = self.data.distance_m
        if not lo <= float(d[self.cursor]) <= hi:
            self.cursor = int(np.clip(np.searchsorted(d, 0.5 * (lo + hi)), 0, self.data.size - 1))
            self._announce()
        self.call_after_refresh(self._draw)

    # -------------------------------------------------------------- readout
    def mark_at_cursor(self) -> Mark | None:
        """The mark the cursor is on (within one screen column), if any."""
        if self.data is None:
            return None
        lo, hi = self._visible()
        column = (hi - lo) / self._columns()
        here = float(self.data.distance_m[self.cursor])
        near = [m for m in self.data.marks if abs(m.distance_m - here) <= 0.5 * column]
        return min(near, key=lambda m: abs(m.distance_m - here)) if near else None

    @property
    def readout(self) -> str:
        """The line above the plot: what is under the cursor."""
        from tui import fmt

        data = self.data
        if data is None:
            return self.empty_text
        i = self.cursor
        units, fraction = self._units
        parts = [f"cursor {fmt.length(float(data.distance_m[i]), units, fraction)}",
                 f"delay {fmt.time(float(data.time_s[i]))}",
                 f"rho {float(data.level[i]):+.3f}"]
        if data.z0_ohm:
            from calc.tline import impedance_from_gamma

            z = float(np.real(impedance_from_gamma(float(data.level[i]), data.z0_ohm)))
            parts.append(f"Z {fmt.impedance(z if math.isfinite(z) and z >= 0 else math.inf, 3)}")
        mark = self.mark_at_cursor()
        if mark is not None:
            parts.append(f"[{mark.label}] {mark.text}".rstrip())
        text = "  ".join(parts)
        return ("out of date: " + text) if self.stale else text

    def _update_readout(self) -> None:
        if self.is_mounted:
            self.border_title = self.readout

    def _announce(self) -> None:
        data = self.data
        if data is None:
            return
        i = self.cursor
        self.post_message(self.CursorMoved(self, i, float(data.time_s[i]),
                                           float(data.distance_m[i]), float(data.level[i]),
                                           self.mark_at_cursor()))

    # ---------------------------------------------------------------- keys
    def move_cursor(self, index: int) -> None:
        """Put the cursor on sample ``index`` (clipped), scrolling the view to it."""
        if self.data is None:
            return
        self.cursor = int(np.clip(index, 0, self.data.size - 1))
        here = float(self.data.distance_m[self.cursor])
        if self._view is not None:
            lo, hi = self._view
            if not lo <= here <= hi:
                half = 0.5 * (hi - lo)
                self._view = (here - half, here + half)
        self._draw()
        self._announce()

    def cursor_to_time(self, time_s: float) -> None:
        """Put the cursor on the sample nearest round-trip delay ``time_s``."""
        if self.data is not None:
            self.move_cursor(self._nearest_time(time_s))

    def _nearest_time(self, time_s: float) -> int:
        t = self.data.time_s
        i = int(np.clip(np.searchsorted(t, time_s), 1, t.size - 1))
        return i - 1 if abs(t[i - 1] - time_s) <= abs(t[i] - time_s) else i

    def _index_of(self, mark: Mark) -> int:
        return self._nearest_time(mark.time_s)

    def _samples_per_column(self) -> float:
        lo, hi = self._visible()
        d = self.data.distance_m
        count = np.searchsorted(d, hi, side="right") - np.searchsorted(d, lo)
        return max(count / self._columns(), 1.0)

    def action_step(self, columns: int) -> None:
        if self.data is None:
            return
        step = int(round(columns * self._samples_per_column()))
        self.move_cursor(self.cursor + (step or int(math.copysign(1, columns))))

    def action_to_end(self, which: int) -> None:
        if self.data is not None:
            self.move_cursor(self.data.size - 1 if which else 0)

    def action_to_mark(self, direction: int) -> None:
        if self.data is None or not self.data.marks:
            return
        indices = sorted({self._index_of(m) for m in self.data.marks})
        if direction > 0:
            ahead = [i for i in indices if i > self.cursor]
        else:
            ahead = [i for i in indices if i < self.cursor][::-1]
        if ahead:
            self.move_cursor(ahead[0])

    def action_zoom(self, direction: int) -> None:
        if self.data is None:
            return
        d = self.data.distance_m
        full = (float(d[0]), float(d[-1]))
        lo, hi = self._visible()
        span = (hi - lo) / ZOOM_STEP if direction > 0 else (hi - lo) * ZOOM_STEP
        here = float(d[self.cursor])
        if span >= full[1] - full[0]:
            self._view = None
        else:
            lo = min(max(here - 0.5 * span, full[0]), full[1] - span)
            self._view = (lo, lo + span)
        self._draw()

    def action_whole(self) -> None:
        self._view = None
        self._draw()
