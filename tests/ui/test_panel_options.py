"""The Echo and Trace panels' second page of options (Ctrl+R): every option of
``halftrip simulate`` and ``halftrip trace`` can be typed on screen, gives
the numbers the command's ``--json`` gives for the same input, and a bad
value shows its one-line error beside its own field without a crash."""

from __future__ import annotations

import numpy as np
import pytest
from test_trace_panel import KESTREL, SWEEP, assert_rows_are_the_cli_events, error_beside
from uihelp import cli_json, paste_into, settled, started, type_into

from tui.app import create_app
from tui.demo import traces as demo

RUN = "10 m:rg58, 20 m:rg59"


def echo_view(app):
    return app.query_one("#echo-run-view")


def trace_view(app):
    return app.query_one("#trace-view")


def assert_error_beside(app, input_id: str) -> str:
    """The field's own error line: one line, with an accepted example, the label
    marked; the result kept and marked out of date; the app still running."""
    text = error_beside(app, input_id)
    assert text and "\n" not in text, (input_id, text)
    assert "e.g." in text, (input_id, text)
    assert app.query_one(f"#{input_id}").parent.query_one(".field-label").has_class("-invalid")
    assert app.return_code is None
    return text


async def refused_then_cleared(pilot, view, field: str, bad: str) -> None:
    """Type ``bad`` into ``field``: its error shows beside it and the last good
    result stays, out of date; clearing the field brings a fresh result."""
    good = view.plot.data
    await paste_into(pilot, field, bad)
    await settled(pilot)
    assert_error_beside(pilot.app, field)
    assert view.is_stale and view.plot.data is good, (field, bad)
    await paste_into(pilot, field, "")
    await settled(pilot)
    assert not view.is_stale, field


async def open_more(pilot, page_id: str) -> None:
    """Ctrl+R, as a user opens the options page; it must be the one shown then."""
    await pilot.press("ctrl+r")
    await pilot.pause()
    assert pilot.app.query_one(f"#{page_id}").display


# ------------------------------------------------------------------ Echo
async def test_lumps_points_and_span_give_the_simulate_commands_prediction(capsys):
    data = cli_json(capsys, "simulate", "--run", RUN, "--load", "75 ohm", "--rise-time", "1 ns",
                    "--lump", "1: 5 nH", "--lump", "1: 4 pF", "--points", "8192",
                    "--span", "400 ns")
    app = create_app(start_panel="echo")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await type_into(pilot, "echo-run-run", RUN)
        await type_into(pilot, "echo-run-load", "75 ohm")
        await type_into(pilot, "echo-run-edge", "1 ns")
        await open_more(pilot, "echo-run-more")
        await type_into(pilot, "echo-run-lump", "1: 5 nH, 1: 4 pF")
        await type_into(pilot, "echo-run-points", "8192")
        await type_into(pilot, "echo-run-span", "400 ns")
        await settled(pilot)
        plot = echo_view(app).plot.data
        np.testing.assert_allclose(plot.time_s, data["time_s"], rtol=1e-12, atol=0)
        np.testing.assert_allclose(plot.level, data["level"], rtol=1e-12, atol=1e-15)
        assert len(plot.time_s) == 8192
        table = echo_view(app).table
        assert table.row_count == len(data["arrivals"])
        assert [table.get_row_at(i)[4] for i in range(table.row_count)] == \
            [a["path"] for a in data["arrivals"]]
        logged = app.query_one("#echo-run-view").parent.log_result(
            app.query_one("#echo-run-view").parent.last_result)
        assert logged["lumps"] == ["1: 5 nH", "1: 4 pF"] == data["lumps"]
        # Back on the run's page the options still count, and one line says so.
        await pilot.press("ctrl+r")
        await pilot.pause()
        summary = str(app.query_one("#echo-run-job .options-summary").render())
        assert "lumps 1: 5 nH, 1: 4 pF" in summary and "points 8192" in summary


async def test_a_series_inductance_shows_as_a_bump_and_a_capacitance_as_a_dip(capsys):
    # On a matched line a series L's impedance sL is high at the edge, a shunt C's
    # 1/sC low: Gamma = (Z - Z0)/(Z + Z0) gives a brief rise for the L and a brief
    # dip for the C (Pozar, Microwave Engineering, ch. 2; common practice on traces).
    for lump, sign in (("1: 10 nH", +1), ("1: 4 pF", -1)):
        data = cli_json(capsys, "simulate", "--run", "10 m:rg58, 10 m:rg58", "--load", "match",
                        "--rise-time", "0.5 ns", "--lump", lump)
        app = create_app(start_panel="echo")
        async with app.run_test(size=(80, 24)) as pilot:
            await started(pilot)
            await type_into(pilot, "echo-run-run", "10 m:rg58, 10 m:rg58")
            await type_into(pilot, "echo-run-load", "match")
            await type_into(pilot, "echo-run-edge", "0.5 ns")
            await open_more(pilot, "echo-run-more")
            await type_into(pilot, "echo-run-lump", lump)
            await settled(pilot)
            level = echo_view(app).plot.data.level
            np.testing.assert_allclose(level, data["level"], rtol=1e-12, atol=1e-15)
            peak = level[np.argmax(np.abs(level))]
            assert np.sign(peak) == sign and abs(peak) > 0.02


async def test_a_bad_lump_points_or_span_shows_beside_its_field():
    app = create_app(start_panel="echo")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await type_into(pilot, "echo-run-run", RUN)
        await settled(pilot)
        await open_more(pilot, "echo-run-more")
        for field, bad in (("echo-run-lump", "1 5 nH"),   # no AFTER: part
                           ("echo-run-lump", "7: 5 nH"),  # the run has 2 segments
                           ("echo-run-lump", "1: 5 furlongs"),
                           ("echo-run-points", "lots"),
                           ("echo-run-points", "12"),     # below the fewest points
                           ("echo-run-span", "12 parsecs")):
            await refused_then_cleared(pilot, echo_view(app), field, bad)


# ----------------------------------------------------------------- Trace
TEXT_OPTIONS = (("trace-tolerance", "3 %", "--tolerance"), ("trace-rise-time", "0.6 ns",
                                                          "--rise-time"),
                ("trace-axis-unit", "ns", "--time-unit"), ("trace-level-unit", "V",
                                                           "--level-unit"),
                ("trace-incident", "in-trace", "--incident"))


async def test_reading_options_for_a_text_trace_are_the_trace_commands(capsys):
    argv = [a for _f, value, flag in TEXT_OPTIONS for a in (flag, value)]
    data = cli_json(capsys, "trace", KESTREL, "--run", demo.KESTREL_RUN, *argv, "--z0", "75 ohm",
                    "--expect-run", demo.KESTREL_RUN, "--expect-load", "open")
    at_50 = cli_json(capsys, "trace", KESTREL, "--run", demo.KESTREL_RUN, *argv)
    app = create_app(start_panel="trace")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await paste_into(pilot, "trace-file", KESTREL)
        await paste_into(pilot, "trace-on", demo.KESTREL_RUN)
        await paste_into(pilot, "trace-expect-load", "open")
        await open_more(pilot, "trace-more")
        assert not app.query_one("#trace-window").parent.display  # a sweep's, not shown
        for field, value, _flag in TEXT_OPTIONS:
            await type_into(pilot, field, value)
        await type_into(pilot, "trace-z0", "75 ohm")
        await settled(pilot)
        assert_rows_are_the_cli_events(app, data["events"])
        status = str(trace_view(app).status.render())
        assert (f"{len(data['matched'])} as expected, {len(data['misplaced'])} misplaced, "
                f"{len(data['missing'])} missing, {len(data['unexpected'])} unexpected") in status
        analysis = app.query_one("#trace-form").last_result[0].analysis
        assert analysis.rise_time_s == pytest.approx(data["rise_time_s"], rel=1e-12)
        assert analysis.rise_time_s == pytest.approx(0.6e-9, rel=1e-12)
        # Z = Z0 (1 + rho) / (1 - rho) (Pozar, Microwave Engineering, ch. 2): the same
        # rho read against 75 ohm instead of rg58's 50 ohm implies 1.5 times the impedance.
        table = trace_view(app).table
        for i, e in enumerate(at_50["events"]):
            shown = table.get_row_at(i)[4]
            if shown not in ("open", "-") and np.isfinite(e["impedance_ohm"]):
                assert float(shown) == pytest.approx(1.5 * e["impedance_ohm"], rel=2e-3)


async def test_reading_options_for_a_sweep_are_the_trace_commands(capsys):
    data = cli_json(capsys, "trace", SWEEP, "--run", demo.KESTREL_RUN, "--window", "kaiser",
                    "--kaiser-beta", "8", "--band", "1 MHz..2 GHz", "--dc", "open")
    hann = cli_json(capsys, "trace", SWEEP, "--run", demo.KESTREL_RUN, "--window", "hann")
    app = create_app(start_panel="trace")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await paste_into(pilot, "trace-file", SWEEP)
        await paste_into(pilot, "trace-on", demo.KESTREL_RUN)
        await settled(pilot)
        await open_more(pilot, "trace-more")
        assert not app.query_one("#trace-incident").parent.display  # a text trace's
        assert "Touchstone sweep" in str(app.query_one("#trace-more .options-heading").render())
        await type_into(pilot, "trace-window", "kaiser 8")
        await type_into(pilot, "trace-band", "1 MHz..2 GHz")
        await type_into(pilot, "trace-dc", "open")
        await settled(pilot)
        assert_rows_are_the_cli_events(app, data["events"])
        td = app.query_one("#trace-form").last_result[0].info["time_domain"]
        assert td == data["time_domain"]
        # an open reflects everything with the same sign: Gamma = +1 at DC (Pozar, ch. 2)
        assert td["dc_value"] == 1.0 and td["kaiser_beta"] == 8.0
        assert 1e6 <= td["band_low_hz"] and td["band_high_hz"] <= 2e9
        await paste_into(pilot, "trace-window", "hann")
        await paste_into(pilot, "trace-band", "")
        await paste_into(pilot, "trace-dc", "")
        await settled(pilot)
        assert_rows_are_the_cli_events(app, hann["events"])


async def test_a_bad_reading_option_shows_beside_its_field():
    app = create_app(start_panel="trace")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        for path, cases in (
            (KESTREL, (("trace-tolerance", "3 parsecs"), ("trace-z0", "-5 ohm"),
                       ("trace-rise-time", "fast"), ("trace-axis-unit", "kg"),
                       ("trace-level-unit", "furlongs"), ("trace-incident", "sideways"))),
            (SWEEP, (("trace-window", "blackman"), ("trace-window", "kaiser x"),
                     ("trace-window", "kaiser 99"), ("trace-window", "hann 3"),
                     ("trace-band", "2 GHz..1 MHz"), ("trace-dc", "purple")))):
            await paste_into(pilot, "trace-file", path)
            await paste_into(pilot, "trace-on", demo.KESTREL_RUN)
            await settled(pilot)
            if not app.query_one("#trace-more").display:
                await open_more(pilot, "trace-more")
            for field, bad in cases:
                await refused_then_cleared(pilot, trace_view(app), field, bad)


async def test_ctrl_r_moves_between_the_pages_and_the_key_bar_says_so():
    app = create_app(start_panel="trace")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        app.query_one("#trace-file").focus()
        await pilot.pause()
        assert app.active_bindings["ctrl+r"].binding.description == "Options"
        await pilot.press("ctrl+r")
        await pilot.pause()
        assert app.focused.id == "trace-tolerance"
        assert not app.query_one("#trace-job").display
        assert app.active_bindings["ctrl+r"].binding.description == "Back"
        await pilot.press("ctrl+r")
        await pilot.pause()
        assert app.focused.id == "trace-file"
