"""The trace plot widget shared by the Echo and Trace panels: thinning, cursor
keys and the readout, marks, units, stale marking, at 80x24."""

from __future__ import annotations

import numpy as np
from textual.app import App, ComposeResult
from textual.reactive import reactive

from tui.widgets.trace_plot import Mark, PlotData, TracePlot, envelope

C0 = 299_792_458.0  # m/s, exact (SI definition of the metre)
VF = 0.66


def open_line(length_m: float = 20.0, n: int = 3001) -> PlotData:
    """A 50 ohm line of VF 0.66 ending in an open: rho 0, then +1 after the
    round trip 2 L / (VF c0) (open: full reflection, same sign; common practice)."""
    t = np.linspace(0.0, 1.5 * 2 * length_m / (VF * C0), n)
    d = VF * C0 * t / 2
    level = np.where(d >= length_m, 1.0, 0.0)
    t_end = 2 * length_m / (VF * C0)
    half = Mark("1", t_end / 2, length_m / 2, "nothing here")
    end = Mark("2", t_end, length_m, "open")
    return PlotData(t, d, level, (half, end), z0_ohm=50.0)


class PlotApp(App[None]):
    unit_system: reactive[tuple[str, int]] = reactive(("metric", 16))

    def compose(self) -> ComposeResult:
        yield TracePlot(id="plot")

    def on_mount(self) -> None:
        self.moves = []
        self.query_one(TracePlot).focus()

    def on_trace_plot_cursor_moved(self, message: TracePlot.CursorMoved) -> None:
        self.moves.append(message)


def test_envelope_keeps_a_one_sample_spike_and_bounds_the_points():
    x = np.arange(100_000, dtype=float)
    y = np.zeros_like(x)
    y[56_789] = 0.5
    y[12_345] = -0.25
    bx, by = envelope(x, y, 0.0, x[-1], 100)
    assert bx.size <= 200
    assert by.max() == 0.5 and by.min() == -0.25
    assert np.all(np.diff(bx) >= 0)


def test_envelope_of_a_short_view_is_the_samples_themselves():
    x = np.linspace(0, 10, 11)
    bx, by = envelope(x, x * 2, 3.0, 5.0, 100)
    assert list(bx) == [2.0, 3.0, 4.0, 5.0, 6.0]  # one sample beyond each side
    assert list(by) == [4.0, 6.0, 8.0, 10.0, 12.0]


async def test_cursor_keys_move_the_readout_and_jump_to_marks():
    app = PlotApp()
    async with app.run_test(size=(80, 24)) as pilot:
        plot = app.query_one(TracePlot)
        plot.show(open_line())
        await pilot.pause()
        assert "[1] nothing here" in plot.readout  # starts on the first mark
        start = plot.cursor
        await pilot.press("right")
        assert plot.cursor > start
        small = plot.cursor - start
        await pilot.press("shift+right")
        assert plot.cursor - start > 5 * small  # ten columns, not one
        before = plot.readout
        await pilot.press("shift+left", "left")
        assert plot.cursor == start and plot.readout != before
        await pilot.press("right_square_bracket")
        await pilot.pause()
        text = plot.readout
        assert "[2] open" in text
        assert "20.0" in text  # cursor 20.0xx m: on the open end
        assert "ohm" in text or "open" in text
        assert app.moves and app.moves[-1].mark is not None and app.moves[-1].mark.label == "2"
        await pilot.press("end")
        assert plot.cursor == plot.data.size - 1
        await pilot.press("home")
        assert plot.cursor == 0


async def test_readout_impedance_follows_the_level():
    # rho = 1/3 on a 50 ohm line is 100 ohm: Z = Z0 (1 + rho) / (1 - rho)
    # (Pozar, Microwave Engineering, ch. 2, the reflection coefficient relation)
    t = np.linspace(0, 1e-7, 101)
    data = PlotData(t, VF * C0 * t / 2, np.full(t.size, 1 / 3), z0_ohm=50.0)
    app = PlotApp()
    async with app.run_test(size=(80, 24)) as pilot:
        plot = app.query_one(TracePlot)
        plot.show(data)
        await pilot.pause()
        assert "rho +0.333" in plot.readout
        assert "Z 100 ohm" in plot.readout


async def test_zoom_keeps_the_cursor_in_view_and_0_shows_all():
    app = PlotApp()
    async with app.run_test(size=(80, 24)) as pilot:
        plot = app.query_one(TracePlot)
        plot.show(open_line())
        await pilot.pause()
        await pilot.press("right_square_bracket")  # to the open at 20 m
        at = plot.cursor
        await pilot.press("right")
        wide_step = plot.cursor - at
        await pilot.press("left", "plus", "plus")  # two zooms of 2x around the cursor
        lo, hi = plot._visible()
        assert abs((hi - lo) - 30.0 / 4) < 0.1
        assert lo <= 20.0 <= hi
        await pilot.press("right")
        assert abs((plot.cursor - at) * 4 - wide_step) <= 4  # a column is now a quarter as far
        await pilot.press("0")
        lo, hi = plot._visible()
        assert hi - lo > 29.9


async def test_units_switch_changes_readout_and_axis_unit():
    app = PlotApp()
    async with app.run_test(size=(80, 24)) as pilot:
        plot = app.query_one(TracePlot)
        plot.show(open_line())
        await pilot.pause()
        await pilot.press("right_square_bracket")
        assert " m " in plot.readout
        app.unit_system = ("imperial", 16)
        await pilot.pause()
        assert "65 ft 7-3/8 in" in plot.readout  # 20 m = 65 ft 7.40 in (0.3048 m/ft, exact)


async def test_stale_marking_changes_the_words_not_only_the_colour():
    app = PlotApp()
    async with app.run_test(size=(80, 24)) as pilot:
        plot = app.query_one(TracePlot)
        plot.show(open_line())
        await pilot.pause()
        plot.stale = True
        await pilot.pause()
        assert plot.readout.startswith("out of date")
        assert plot.has_class("-stale")
        plot.stale = False
        assert not plot.readout.startswith("out of date")


async def test_new_data_keeps_the_cursor_at_the_same_distance():
    app = PlotApp()
    async with app.run_test(size=(80, 24)) as pilot:
        plot = app.query_one(TracePlot)
        plot.show(open_line(20.0))
        await pilot.pause()
        await pilot.press("right_square_bracket")
        where = plot.data.distance_m[plot.cursor]
        plot.show(open_line(25.0))
        await pilot.pause()
        assert abs(plot.data.distance_m[plot.cursor] - where) < 0.05


async def test_empty_plot_says_so():
    app = PlotApp()
    async with app.run_test(size=(80, 24)) as pilot:
        plot = app.query_one(TracePlot)
        plot.show(None)
        await pilot.press("right", "left_square_bracket", "plus")
        assert plot.readout == "no trace yet"


def test_labels_that_would_touch_are_folded_into_a_plus():
    from tui.widgets.trace_plot import label_cells

    # 10 columns over 0..10 m: marks at 1, 1.5 (same cell), 5 and 9.9 (last cell)
    cells = label_cells([(5.0, "3"), (1.0, "1"), (1.5, "2"), (9.9, "m1")], 0.0, 10.0, 10)
    assert cells == [(1, "1"), (2, "+"), (5, "3"), (8, "m"), (9, "1")]
