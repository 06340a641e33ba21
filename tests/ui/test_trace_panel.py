"""Trace panel driven by keystrokes: the events and the comparison are those of
``halftrip trace`` for the same options, bad files and fields show their error
beside the field without a crash, the file picker works by keyboard, and the
demo scenarios' true events are found where they were put."""

from __future__ import annotations

from uihelp import cli_json, paste_into, settled, started, type_into

from tui import fmt
from tui.app import create_app
from tui.demo import traces as demo
from tui.panels.trace import DEMO_DIR

KESTREL = str(DEMO_DIR / "kestrel-ridge-feeder.csv")
SWEEP = str(DEMO_DIR / "kestrel-ridge-feeder.s1p")
MILLPOND = str(DEMO_DIR / "millpond-lane-drop.csv")


def view(app):
    return app.query_one("#trace-view")


def error_beside(app, input_id: str) -> str:
    return str(app.query_one(f"#{input_id}").parent.query_one(".field-error").render())


async def fill(pilot, path: str, on: str, load: str | None = None) -> None:
    await paste_into(pilot, "trace-file", path)
    await type_into(pilot, "trace-on", on)
    if load is not None:
        await type_into(pilot, "trace-expect-load", load)
    await settled(pilot)


def assert_rows_are_the_cli_events(app, events) -> None:
    rows = [view(app).table.get_row_at(i) for i in range(view(app).table.row_count)]
    found = [r for r in rows if not r[0].startswith("m")]
    assert len(found) == len(events)
    for row, e in zip(found, events, strict=True):
        assert row[1] == fmt.time(e["round_trip_delay_s"])
        assert row[2] == fmt.uncertain_length(e["distance_m"], e["distance_low_m"],
                                              e["distance_high_m"]).value
        assert row[3] == f"{e['size']:+.3f}"
        assert row[5] == e["kind"].replace("_", " ")


async def test_events_and_comparison_are_the_trace_commands(capsys):
    data = cli_json(capsys, "trace", KESTREL, "--run", demo.KESTREL_RUN,
                    "--expect-run", demo.KESTREL_RUN, "--expect-load", "open")
    app = create_app(start_panel="trace")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await fill(pilot, KESTREL, demo.KESTREL_RUN, "open")
        assert_rows_are_the_cli_events(app, data["events"])
        status = str(view(app).status.render())
        assert (f"{len(data['matched'])} as expected, {len(data['misplaced'])} misplaced, "
                f"{len(data['missing'])} missing, {len(data['unexpected'])} unexpected") in status
        checks = {r[0]: r[6] for r in (view(app).table.get_row_at(i)
                                       for i in range(view(app).table.row_count))}
        for u in data["unexpected"]:
            assert checks[str(u["event_number"])] == "unexpected"
        for m in data["matched"]:
            assert checks[str(m["event_number"])].startswith("as expected")
        # the recorded trace is plotted with the expected run's prediction under it
        assert view(app).plot.data.other_level is not None


async def test_demo_scenario_events_are_found_where_they_were_put():
    # The Kestrel Ridge scenario (tui/demo/traces.py) put a loose joint at 2 m, a wet
    # stretch from 29 m to 30.5 m and an open at 48.5 m; the trace's events must sit
    # there within the placement's own range (the cables' VF tolerance).
    app = create_app(start_panel="trace")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await fill(pilot, KESTREL, demo.KESTREL_RUN)
        events = view(app).parent.last_result[0].analysis.events
        for truth in demo.KESTREL_EVENTS:
            near = [e for e in events if e.distance_low_m - 0.3 <= truth.distance_m
                    <= e.distance_high_m + 0.3]
            assert near, f"nothing found near {truth.distance_m} m"
            assert near[0].kind == truth.kind
        marks = {m.label for m in view(app).plot.data.marks}
        assert {"1", "2", "3", "4"} <= marks


async def test_sweep_file_is_read_like_the_cli(capsys):
    data = cli_json(capsys, "trace", SWEEP, "--run", demo.KESTREL_RUN)
    app = create_app(start_panel="trace")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await fill(pilot, SWEEP, demo.KESTREL_RUN)
        assert_rows_are_the_cli_events(app, data["events"])
        assert "2000-point sweep" in str(view(app).status.render())


async def test_distance_axis_file_asks_for_the_axis_vf(capsys):
    data = cli_json(capsys, "trace", MILLPOND, "--run", demo.MILLPOND_RUN, "--axis-vf", "0.84")
    app = create_app(start_panel="trace")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        axis = app.query_one("#trace-axis-vf").parent
        assert not axis.display
        await fill(pilot, MILLPOND, demo.MILLPOND_RUN)
        assert axis.display  # shown once the file turns out to need it
        assert "velocity factor" in error_beside(app, "trace-axis-vf")
        await type_into(pilot, "trace-axis-vf", "0.84")
        await settled(pilot)
        assert_rows_are_the_cli_events(app, data["events"])


async def test_bad_file_and_bad_placement_show_beside_their_field():
    app = create_app(start_panel="trace")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await fill(pilot, KESTREL, demo.KESTREL_RUN)
        good = view(app).plot.data
        await paste_into(pilot, "trace-file", str(DEMO_DIR / "no-such-trace.csv"))
        await settled(pilot)
        assert "no such file" in error_beside(app, "trace-file")
        assert view(app).is_stale and view(app).plot.data is good
        await paste_into(pilot, "trace-file", str(DEMO_DIR / "traces.py"))  # not a trace
        await settled(pilot)
        assert error_beside(app, "trace-file")
        await paste_into(pilot, "trace-file", KESTREL)
        await paste_into(pilot, "trace-on", "2 m:rg58, 45 m:nosuchcable")
        await settled(pilot)
        assert "nosuchcable" in error_beside(app, "trace-on")
        await paste_into(pilot, "trace-on", demo.KESTREL_RUN)
        await settled(pilot)
        assert not view(app).is_stale


async def test_file_picker_opens_a_demo_trace_by_keyboard():
    from tui.panels.trace.file_picker import FilePicker

    app = create_app(start_panel="trace")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await pilot.press("ctrl+o")
        await pilot.pause()
        assert isinstance(app.screen, FilePicker)
        await pilot.press("down", "enter")  # the second demo trace
        await pilot.pause()
        assert not isinstance(app.screen, FilePicker)
        chosen = app.query_one("#trace-file").value
        assert chosen == str(sorted(p for p in DEMO_DIR.iterdir()
                                    if p.suffix in (".csv", ".s1p"))[1])
        await pilot.press("ctrl+o")
        await pilot.pause()
        await pilot.press("escape")
        await pilot.pause()
        assert not isinstance(app.screen, FilePicker)
        assert app.query_one("#trace-file").value == chosen
