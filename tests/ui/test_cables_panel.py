"""Cables panel: the same catalog as ``halftrip cables``, filtered as typed;
a cable of your own added through the dialog and a measured VF kept as one,
both read back by the CLI."""

from __future__ import annotations

from textual.widgets import DataTable, Static
from uihelp import cli_json, started, type_into, wait_for

from calc.constants import C0_M_PER_S
from tui.app import create_app
from tui.paths import user_catalog_path


async def test_filter_shows_the_catalog_as_the_cli_lists_it(capsys):
    listed = cli_json(capsys, "cables", "list")["cables"]
    seventy_five = sorted(c["id"] for c in listed if c["z0_ohm"] == 75)
    app = create_app(start_panel="cables")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        table = app.query_one("#cables-table", DataTable)
        await wait_for(pilot, lambda: table.row_count == len(listed))
        await type_into(pilot, "cables-filter", "75 ohm")
        shown = sorted(table.get_row_at(i)[0] for i in range(table.row_count))
        assert shown == seventy_five
        await pilot.press("tab")  # into the table: the highlighted cable in full below
        cable_id = table.get_row_at(table.cursor_row)[0]
        detail = str(app.query_one("#cables-detail", Static).render())
        warned = app.query_one("#warning-line").display
    record = cli_json(capsys, "cables", "show", cable_id)  # (outside the app: its own stdout)
    assert f"source: {record['source']}" in detail
    assert warned == bool(record["hazards"])


async def test_a_new_cable_is_saved_and_the_cli_reads_it(capsys):
    app = create_app(start_panel="cables")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await pilot.press("ctrl+n")
        await wait_for(pilot, lambda: type(app.screen).__name__ == "CableEditor")
        for field_id, text in {"new-id": "roof-feeder", "new-description": "roof run feeder",
                               "new-z0": "50 ohm", "new-vf": "0.82", "new-tolerance": "2 %",
                               "new-source": "measured on site"}.items():
            await type_into(pilot, field_id, text)
        await pilot.press("ctrl+s")
        await wait_for(pilot, lambda: "roof-feeder" in app.catalog.cables)
    assert "roof-feeder" in user_catalog_path().read_text(encoding="utf-8")
    record = cli_json(capsys, "cables", "show", "roof-feeder")
    assert (record["vf"], record["vf_tolerance"], record["origin"]) == (0.82, 0.02, "user")


async def test_a_refused_cable_says_why_and_writes_nothing():
    app = create_app(start_panel="cables")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await pilot.press("ctrl+n")
        await wait_for(pilot, lambda: type(app.screen).__name__ == "CableEditor")
        await type_into(pilot, "new-id", "rg58")  # already in the catalog
        for field_id, text in {"new-description": "x", "new-z0": "50 ohm", "new-vf": "0.66",
                               "new-source": "from memory"}.items():
            await type_into(pilot, field_id, text)
        await pilot.press("ctrl+s")
        await pilot.pause()
        assert "already in the catalog" in str(app.screen.query_one("#editor-problem").render())
        await type_into(pilot, "new-vf", "1.3")  # not a velocity factor
        await pilot.press("ctrl+s")
        await pilot.pause()
        vf_row = app.screen.query_one("#new-vf").parent
        assert "at most 1" in str(vf_row.query_one(".field-error", Static).render())
        await pilot.press("escape")
    assert not user_catalog_path().exists()


async def test_a_measured_vf_is_kept_as_a_cable(capsys):
    app = create_app(start_panel="locate")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await pilot.press("escape", "4")
        await type_into(pilot, "locate-vf-length", "10 m")
        await type_into(pilot, "locate-vf-reading", "101.5 ns")
        await pilot.press("ctrl+n")
        await wait_for(pilot, lambda: type(app.screen).__name__ == "CableEditor")
        await type_into(pilot, "new-id", "spool-7")
        await pilot.press("ctrl+s")
        await wait_for(pilot, lambda: app.catalog is not None and "spool-7" in app.catalog.cables)
    record = cli_json(capsys, "cables", "show", "spool-7")
    # VF = 2 L / (c0 t) = 20 / (299792458 x 101.5e-9) = 0.6573, kept to 4 places
    assert record["vf"] == round(20 / (C0_M_PER_S * 101.5e-9), 4)
    assert "measured" in record["source"]
