"""Locate panel driven by keystrokes: same numbers as ``halftrip locate`` /
``halftrip calibrate``, errors beside the field, stale marking, units switch."""

from __future__ import annotations

from textual.widgets import Static
from uihelp import cli_json, started, type_into

from calc.constants import C0_M_PER_S
from tui import fmt
from tui.app import create_app
from tui.widgets.result_view import ResultView


def shown(app, form_id: str) -> str:
    return str(app.query_one(f"{form_id} ResultView", ResultView).render())


async def test_one_cable_matches_cli_and_hand_value(capsys):
    data = cli_json(capsys, "locate", "245 ns", "--cable", "rg58")
    # d = VF c0 t / 2 with c0 exact (SI definition) and rg58's catalog VF 0.66
    assert abs(data["distance_m"] - 0.66 * C0_M_PER_S * 245e-9 / 2) < 1e-9
    app = create_app(start_panel="locate")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await type_into(pilot, "locate-one-cable", "rg58")
        await type_into(pilot, "locate-one-delay", "245 ns")
        text = shown(app, "OneCableForm")
        shown_d = fmt.uncertain_length(data["distance_m"], data["distance_low_m"],
                                       data["distance_high_m"])
        assert str(shown_d) in text and shown_d.span in text
        # 24.238 m with rg58's catalog tolerance of 3 %: +/- 0.727 m, a tenth of it 0.073 m,
        # so shown to the 0.1 m step with the +/- rounded up: 24.2 m +/- 0.8 m
        assert "24.2 m +/- 0.8 m" in text and "23.5 m to 25.0 m" in text


async def test_reverse_distance_to_delay(capsys):
    data = cli_json(capsys, "locate", "--distance", "24 m", "--cable", "rg213")
    app = create_app(start_panel="locate")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await type_into(pilot, "locate-one-cable", "rg213")
        await type_into(pilot, "locate-one-delay", "24 m")
        text = shown(app, "OneCableForm")
        assert fmt.time(data["round_trip_delay_s"]) in text
        # t = 2 d / (VF c0) = 242.6 ns for VF 0.66 (c0 exact)
        assert "242.6 ns" in text


async def test_bad_input_shows_error_beside_field_and_keeps_stale_result():
    app = create_app(start_panel="locate")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await type_into(pilot, "locate-one-cable", "rg58")
        await type_into(pilot, "locate-one-delay", "245 ns")
        view = app.query_one("OneCableForm ResultView", ResultView)
        assert not view.is_stale
        await pilot.press("x")  # "245 nsx": not a time
        await pilot.pause()
        field = app.query_one("#locate-one-delay").parent
        error = str(field.query_one(".field-error", Static).render())
        assert error and "245 nsx" in error
        assert view.is_stale
        assert "24.2 m +/- 0.8 m" in str(view.render())  # the last good result, kept
        assert "Out of date" in view.border_title
        await pilot.press("backspace")
        await pilot.pause()
        assert not view.is_stale and not str(field.query_one(".field-error", Static).render())


async def test_unknown_cable_names_near_matches():
    app = create_app(start_panel="locate")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await type_into(pilot, "locate-one-delay", "245 ns")
        await type_into(pilot, "locate-one-cable", "rg5")
        field = app.query_one("#locate-one-cable").parent
        assert "did you mean" in str(field.query_one(".field-error", Static).render())


async def test_units_switch_changes_every_shown_length():
    app = create_app(start_panel="locate")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await type_into(pilot, "locate-one-cable", "rg58")
        await type_into(pilot, "locate-one-delay", "245 ns")
        await type_into(pilot, "locate-one-rise-time", "2 ns")
        metric = shown(app, "OneCableForm")
        assert " m" in metric and "ft" not in metric
        await pilot.press("f9")
        await pilot.pause()
        imperial = shown(app, "OneCableForm")
        assert " m\n" not in imperial + "\n" and " mm" not in imperial
        d = 0.66 * C0_M_PER_S * 245e-9 / 2
        assert str(fmt.uncertain_length(d, 0.97 * d, 1.03 * d, "imperial", 16)) in imperial
        # 24.238 m / 0.3048 = 79 ft 6.28 in (exact foot); +/- 3 % is 28.6 in, a tenth of it
        # 2.9 in, so the 3 in step: 79 ft 6 in, +/- 30 in
        assert "79 ft 6 in +/- 2 ft 6 in" in imperial


async def test_run_matches_cli(capsys):
    run = "2 m:rg58, 45 m:hardline-50-half, 1.5 m:rg58"
    data = cli_json(capsys, "locate", "200 ns", "--run", run)
    app = create_app(start_panel="locate")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await pilot.press("escape", "2")
        await type_into(pilot, "locate-run-run", run)
        await type_into(pilot, "locate-run-delay", "200 ns")
        text = shown(app, "RunForm")
        assert f"{data['segment_index'] + 1} of 3 ({data['cable_id']})" in text
        d, low, high = data["distance_m"], data["distance_low_m"], data["distance_high_m"]
        offset = data["offset_in_segment_m"]
        assert f"{fmt.uncertain_length(offset, offset - (d - low), offset + (high - d)).value} " \
               "into it" in text
        assert f"{fmt.uncertain_length(d, low, high)} from the instrument" in text


async def test_run_beyond_the_end_is_an_inline_error_not_a_crash():
    app = create_app(start_panel="locate")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await pilot.press("escape", "2")
        await type_into(pilot, "locate-run-run", "10 m:rg58")
        await type_into(pilot, "locate-run-delay", "5 us")
        field = app.query_one("#locate-run-delay").parent
        assert "beyond the far end" in str(field.query_one(".field-error", Static).render())


async def test_both_ends_hand_value(capsys):
    # x_A = L t_A / (t_A + t_B): 250 m x 1.10 / 1.875 = 146.667 m (two-ended method)
    data = cli_json(capsys, "locate", "--from-a", "1.10 us", "--from-b", "0.775 us",
                    "--length", "250 m")
    assert abs(data["distance_from_a_m"] - 250 * 1.10 / 1.875) < 1e-9
    app = create_app(start_panel="locate")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await pilot.press("escape", "3")
        await type_into(pilot, "locate-ends-from-a", "1.10 us")
        await type_into(pilot, "locate-ends-from-b", "0.775 us")
        await type_into(pilot, "locate-ends-length", "250 m")
        text = shown(app, "BothEndsForm")
        assert "146.667 m" in text and "103.333 m" in text


async def test_measure_vf_matches_calibrate(capsys):
    # VF = 2 L / (c0 t) = 20 / (299792458 x 101.5e-9) = 0.6573
    data = cli_json(capsys, "calibrate", "--length", "10 m", "--delay", "101.5 ns")
    assert abs(data["vf"] - 20 / (C0_M_PER_S * 101.5e-9)) < 1e-12
    app = create_app(start_panel="locate")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await pilot.press("escape", "4")
        await type_into(pilot, "locate-vf-length", "10 m")
        await type_into(pilot, "locate-vf-reading", "101.5 ns")
        text = shown(app, "MeasureForm")
        assert f"{data['vf']:.4f}" in text and "0.6573" in text
        # a stub resonance instead: VF = 4 L f / c0 for an open quarter-wave stub
        await type_into(pilot, "locate-vf-reading", "4.95 MHz")
        text = shown(app, "MeasureForm")
        assert f"{4 * 10 * 4.95e6 / C0_M_PER_S:.4f}" in text  # 0.6605


async def test_hazard_tagged_cable_shows_the_warning_line():
    app = create_app(start_panel="locate")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await type_into(pilot, "locate-one-cable", "cat6")  # tagged poe
        await type_into(pilot, "locate-one-delay", "245 ns")
        line = app.query_one("#warning-line")
        assert line.display and "poe" in str(line.render())
