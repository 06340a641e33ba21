"""Echo and Trace panels: the same lines as ``halftrip echo`` / ``simulate`` /
``trace`` for the same inputs, the plot's cursor read-out, and textbook values."""

from __future__ import annotations

from pathlib import Path

from uihelp import cli_text, started, type_into, wait_for

from tui.app import create_app
from tui.widgets.result_view import ResultView
from tui.widgets.trace_plot import TracePlot

DEMO = Path(__file__).resolve().parents[2] / "tui" / "demo"



async def test_a_load_is_the_cli_output(capsys):
    expected = cli_text(capsys, "echo", "--z0", "50 ohm", "--load", "75 ohm")
    app = create_app(start_panel="echo")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await type_into(pilot, "echo-load-z0", "50 ohm")
        await type_into(pilot, "echo-load-load", "75 ohm")
        shown = str(app.query_one("LoadForm ResultView", ResultView).render())
    assert shown == expected
    # Gamma = (75 - 50) / (75 + 50) = 0.2; VSWR = 1.2 / 0.8 = 1.5 (reflection relations)
    assert "0.2" in shown and "1.5" in shown


async def test_from_a_step_is_the_cli_output(capsys):
    expected = cli_text(capsys, "echo", "--z0", "50 ohm", "--observed-step", "-0.33")
    app = create_app(start_panel="echo")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await pilot.press("escape", "2")
        await type_into(pilot, "echo-step-z0", "50 ohm")
        await type_into(pilot, "echo-step-observed-step", "-0.33")
        shown = str(app.query_one("StepForm ResultView", ResultView).render())
    assert shown == expected
    # Z = Z0 (1 + rho) / (1 - rho) = 50 x 0.67 / 1.33 = 25.19 ohm (inverse reflection relation)
    assert "25.19 ohm" in shown


async def test_whole_run_plots_the_prediction_and_lists_its_echoes(capsys):
    run = "10 m:rg58, 20 m:rg213"
    expected = cli_text(capsys, "simulate", "--run", run, "--load", "short")
    app = create_app(start_panel="echo")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await pilot.press("escape", "3")
        await type_into(pilot, "echo-run-run", run)
        await type_into(pilot, "echo-run-load", "short")
        plot = app.query_one("#echo-run-plot", TracePlot)
        await wait_for(pilot, lambda: plot.has_data)
        shown = str(app.query_one("WholeRunForm ResultView", ResultView).render())
        # the command's own lines, less its character plot (the panel draws a real one)
        assert shown.splitlines()[:4] == expected.splitlines()[:4]
        assert shown.splitlines()[-3:] == expected.splitlines()[-3:]
        # the cursor starts on the first echo: the far end's short at 30 m
        assert abs(plot.cursor_distance_m - 30.0) < 0.5
        readout = str(app.query_one("#echo-run-plot #plot-readout").render())
        assert "at event 1" in readout
        before = plot.cursor
        plot.query_one("PlotWidget").focus()
        await pilot.press("comma", "comma")
        assert plot.cursor < before


async def test_trace_events_match_the_cli_and_sit_on_the_plot(capsys):
    path = str(DEMO / "millpond-lane-drop.csv")  # a distance axis drawn with the cable's VF
    expected = cli_text(capsys, "trace", path, "--cable", "rg6")
    app = create_app(start_panel="trace")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await type_into(pilot, "trace-file", path)
        await type_into(pilot, "trace-cable", "rg6")
        plot = app.query_one("#trace-plot", TracePlot)
        await wait_for(pilot, lambda: plot.has_data)
        assert str(app.query_one("TraceForm ResultView", ResultView).render()) == expected
    # a time-axis trace placed on a run
    path = str(DEMO / "kestrel-ridge-feeder.csv")
    run = "2 m:rg58, 45 m:hardline-50-half, 1.5 m:rg58"
    expected = cli_text(capsys, "trace", path, "--run", run)
    app = create_app(start_panel="trace")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await type_into(pilot, "trace-file", path)
        await type_into(pilot, "trace-cable", run)
        plot = app.query_one("#trace-plot", TracePlot)
        await wait_for(pilot, lambda: plot.has_data)
        shown = str(app.query_one("TraceForm ResultView", ResultView).render())
        assert shown == expected
        events = str(app.query_one("#trace-plot #plot-events").render())
        assert events.startswith("events: 1 ")
        await pilot.press("escape")  # out of the field, then to the plot
        plot.query_one("PlotWidget").focus()
        await pilot.press("right_square_bracket")
        assert "at event 2" in str(app.query_one("#trace-plot #plot-readout").render())
