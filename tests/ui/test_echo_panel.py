"""Echo panel driven by keystrokes: the same numbers and words as ``halftrip
simulate`` and ``halftrip echo``, errors beside the field, the last good
result kept and marked out of date, the plot cursor, units, 80x24."""

from __future__ import annotations

import numpy as np
from uihelp import cli_json, cli_output, paste_into, settled, started, type_into

from calc.constants import C0_M_PER_S
from tui import fmt
from tui.app import create_app
from tui.widgets.result_view import ResultView
from tui.widgets.trace_plot import TracePlot

RUN = "10 m:rg58, 20 m:rg59"


def run_view(app):
    return app.query_one("#echo-run-view")


def result_text(app, form: str) -> str:
    return str(app.query_one(f"{form} ResultView", ResultView).render())


async def open_echo(pilot, tab: str) -> None:
    await started(pilot)
    await pilot.press("escape", {"run": "1", "load": "2", "step": "3"}[tab])
    await pilot.pause()


async def test_whole_run_is_the_simulate_commands_prediction(capsys):
    data = cli_json(capsys, "simulate", "--run", RUN, "--load", "75 ohm", "--rise-time", "1 ns")
    app = create_app(start_panel="echo")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_echo(pilot, "run")
        await type_into(pilot, "echo-run-run", RUN)
        await type_into(pilot, "echo-run-load", "75 ohm")
        await type_into(pilot, "echo-run-edge", "1 ns")
        await settled(pilot)
        view = run_view(app)
        plot = view.plot.data
        np.testing.assert_allclose(plot.time_s, data["time_s"], rtol=1e-12, atol=0)
        np.testing.assert_allclose(plot.distance_m, data["distance_m"], rtol=1e-12, atol=1e-12)
        np.testing.assert_allclose(plot.level, data["level"], rtol=1e-12, atol=1e-15)
        table = view.table
        assert table.row_count == len(data["arrivals"])
        for i, a in enumerate(data["arrivals"]):
            row = table.get_row_at(i)
            assert row[1] == fmt.time(a["time_s"])
            assert row[2] == fmt.length(a["distance_m"])
            assert row[3] == f"{a['size']:+.3f}"
            assert row[4] == a["path"]
        first = data["arrivals"][0]
        # The rg58 (50 ohm) to rg59 (75 ohm) joint: round trip 2 L / (VF c0) with the
        # SI c0 and rg58's catalog VF 0.66; Gamma = (75 - 50) / (75 + 50) = +0.2
        # (Pozar, Microwave Engineering, ch. 2); the cable's loss only makes it smaller.
        assert abs(first["time_s"] - 2 * 10 / (0.66 * C0_M_PER_S)) < 0.5e-9
        assert 0.15 < first["size"] <= 0.2
        assert "rise 1 ns" in str(view.status.render())


async def test_open_and_short_loads_keep_and_invert_the_step():
    # An open returns the voltage with its sign, a short inverted (common practice).
    app = create_app(start_panel="echo")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_echo(pilot, "run")
        await type_into(pilot, "echo-run-run", "20 m:rg213")
        await type_into(pilot, "echo-run-load", "open")
        await settled(pilot)
        assert run_view(app).plot.data.level[-1] > 0.8
        await type_into(pilot, "echo-run-load", "short")
        await settled(pilot)
        assert run_view(app).plot.data.level[-1] < -0.8


async def test_bad_run_shows_the_error_beside_the_field_and_keeps_the_last_prediction():
    app = create_app(start_panel="echo")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_echo(pilot, "run")
        await type_into(pilot, "echo-run-run", RUN)
        await settled(pilot)
        view = run_view(app)
        good = view.plot.data
        assert not view.is_stale and not view.plot.stale
        await paste_into(pilot, "echo-run-run", "10 m:rg58, 20 m:rg5x")
        await settled(pilot)
        error = str(app.query_one("#echo-run-run").parent.query_one(".field-error").render())
        assert "rg5x" in error
        assert view.is_stale and view.plot.stale
        assert view.plot.data is good  # the last good prediction stays on screen
        assert "out of date" in str(view.status.render())
        assert view.plot.readout.startswith("out of date")
        await type_into(pilot, "echo-run-edge", "pulse")  # a second bad field
        await settled(pilot)
        assert "width" in str(app.query_one("#echo-run-edge").parent.query_one(".field-error")
                              .render())
        await type_into(pilot, "echo-run-run", RUN)
        await type_into(pilot, "echo-run-edge", "")
        await settled(pilot)
        assert not view.is_stale and not view.plot.stale


async def test_cursor_keys_change_the_readout_and_follow_the_arrivals():
    app = create_app(start_panel="echo")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_echo(pilot, "run")
        await type_into(pilot, "echo-run-run", RUN)
        await type_into(pilot, "echo-run-load", "100 ohm")
        await settled(pilot)
        plot = app.query_one("#echo-run-view TracePlot", TracePlot)
        plot.focus()
        await pilot.press("home")
        before = plot.readout
        await pilot.press("right")
        assert plot.readout != before
        await pilot.press("right_square_bracket")
        await pilot.pause()
        assert "[1]" in plot.readout
        table = run_view(app).table
        assert table.highlighted_key() == "1"
        await pilot.press("right_square_bracket")
        await pilot.pause()
        assert "[2]" in plot.readout and table.highlighted_key() == "2"


async def test_units_switch_changes_every_length_shown():
    app = create_app(start_panel="echo")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_echo(pilot, "run")
        await type_into(pilot, "echo-run-run", RUN)
        await settled(pilot)
        table = run_view(app).table
        assert table.get_row_at(0)[2] == "10.000 m"
        await pilot.press("escape", "u")
        await pilot.pause()
        assert table.get_row_at(0)[2] == "32 ft 9-11/16 in"  # 10 m / 0.3048 m/ft (exact)
        assert " ft " in run_view(app).plot.readout


async def test_load_summary_is_the_echo_commands(capsys):
    status, out, _err = cli_output(capsys, "echo", "--z0", "50 ohm", "--load", "75 ohm")
    assert status == 0
    app = create_app(start_panel="echo")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_echo(pilot, "load")
        await type_into(pilot, "echo-load-load", "75 ohm")
        text = result_text(app, "LoadForm")
        assert text == out.rstrip("\n")
        # 75 ohm on 50 ohm: Gamma 0.2, return loss 13.98 dB, VSWR 1.5 (the reflection,
        # return loss and VSWR relations of Pozar, Microwave Engineering, ch. 2)
        assert "Gamma +0.2000" in text and "13.98 dB" in text and "1.5" in text


async def test_load_through_a_run_at_a_frequency_is_the_echo_commands(capsys):
    status, out, _err = cli_output(capsys, "echo", "--z0", "50 ohm", "--load", "75 ohm || 10 pF",
                                   "--frequency", "100 MHz", "--through", "3 m:rg58")
    assert status == 0
    app = create_app(start_panel="echo")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_echo(pilot, "load")
        await type_into(pilot, "echo-load-load", "75 ohm || 10 pF")
        await type_into(pilot, "echo-load-frequency", "100 MHz")
        await type_into(pilot, "echo-load-through", "3 m:rg58")
        assert result_text(app, "LoadForm") == out.rstrip("\n")


async def test_bad_load_marks_the_summary_out_of_date():
    app = create_app(start_panel="echo")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_echo(pilot, "load")
        await type_into(pilot, "echo-load-load", "75 ohm")
        view = app.query_one("LoadForm ResultView", ResultView)
        good = str(view.render())
        await paste_into(pilot, "echo-load-load", "75 ohm + 10 pF || 3 nH")
        assert view.is_stale
        assert str(view.render()) == good
        error = str(app.query_one("#echo-load-load").parent.query_one(".field-error").render())
        assert "series" in error and "parallel" in error
        await type_into(pilot, "echo-load-frequency", "fast")
        assert str(app.query_one("#echo-load-frequency").parent.query_one(".field-error")
                   .render())


async def test_backwards_from_a_step_is_the_echo_commands(capsys):
    _s, rho_out, _e = cli_output(capsys, "echo", "--z0", "50 ohm", "--observed-step=-0.33")
    _s, volt_out, _e = cli_output(capsys, "echo", "--z0", "50 ohm", "--observed-step", "0.67 V",
                                  "--incident", "1 V")
    app = create_app(start_panel="echo")
    async with app.run_test(size=(80, 24)) as pilot:
        await open_echo(pilot, "step")
        await type_into(pilot, "echo-step-observed-step", "-0.33")
        text = result_text(app, "StepForm")
        assert text == rho_out.rstrip("\n")
        # Z = Z0 (1 + rho) / (1 - rho) = 50 x 0.67 / 1.33 = 25.19 ohm (Pozar, ch. 2)
        assert "25.19 ohm" in text
        await type_into(pilot, "echo-step-observed-step", "0.67 V")
        view = app.query_one("StepForm ResultView", ResultView)
        assert view.is_stale  # volts without the incident step
        await type_into(pilot, "echo-step-incident", "1 V")
        assert result_text(app, "StepForm") == volt_out.rstrip("\n")
