"""The terminal interface with damaged user files (issue 10): it starts, says
which file is wrong (its path, in a notification, or for the job log on the
Log panel), works on the built-in catalog and default preferences, and
leaves the file exactly as it was.
The CLI side and the atomic-write checks are in tests/test_file_faults.py."""

from __future__ import annotations

import os

import pytest
from filefaults import FAULTS, FILES, UNREADABLE, damage
from textual.widgets import DataTable, Static
from uihelp import started, wait_for

from tui.app import create_app
from tui.paths import job_db_path, preferences_path, user_catalog_path


def _recording(app) -> list[str]:
    """Every notification the app shows, as plain text (title and message)."""
    shown: list[str] = []
    notify = app.notify

    def record(message, *, title="", **kwargs):
        shown.append(f"{title}: {message}")
        return notify(message, title=title, **kwargs)

    app.notify = record
    return shown


async def _cables_listed(pilot) -> int:
    await pilot.app.action_open_panel("cables")
    table = pilot.app.query_one("#cables-table", DataTable)
    await wait_for(pilot, lambda: table.row_count > 0)
    return table.row_count


def _on_screen(app) -> str:
    return "\n".join(str(w.render()) for w in app.screen.query(Static) if w.display)


@pytest.mark.parametrize("fault", FAULTS)
@pytest.mark.parametrize("which", FILES)
async def test_app_starts_names_the_file_and_leaves_it(which, fault, monkeypatch):
    path = {"catalog": user_catalog_path, "prefs": preferences_path, "db": job_db_path}[which]()
    snap = damage(which, fault, path, monkeypatch)
    app = create_app()
    shown = _recording(app)
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        if which == "db":  # the Log panel says what is wrong with the job log
            await app.action_open_panel("log")
            await wait_for(pilot, lambda: str(path) in _on_screen(app))
        else:
            await wait_for(pilot, lambda: any(str(path) in s for s in shown))
        assert await _cables_listed(pilot) >= 10  # the built-in catalog is all there
        assert app.return_code is None
    assert snap.unchanged()


@pytest.mark.parametrize("fault", UNREADABLE)
async def test_a_preference_changed_in_the_app_never_overwrites_a_broken_file(fault,
                                                                              monkeypatch):
    snap = damage("prefs", fault, preferences_path(), monkeypatch)
    app = create_app()
    shown = _recording(app)
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await pilot.press("f9")  # switch units: the app tries to remember it
        await wait_for(pilot, lambda: any("not saved" in s for s in shown))
        assert app.unit_system[0] == "imperial"  # the change holds for this session
    assert snap.unchanged()


@pytest.mark.parametrize("fault", UNREADABLE)
async def test_the_cable_editor_refuses_to_add_to_a_broken_file(fault, monkeypatch):
    snap = damage("catalog", fault, user_catalog_path(), monkeypatch)
    app = create_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await _cables_listed(pilot)
        await _save_new_cable(pilot)
        problem = str(app.screen.query_one("#editor-problem").render())
        assert problem.startswith("Not saved") and str(snap.path) in problem
        assert app.return_code is None
    assert snap.unchanged()


async def test_the_cable_editor_survives_a_full_disk(monkeypatch):
    path = user_catalog_path()
    path.parent.mkdir(parents=True)
    path.write_text("# my cables\n", encoding="utf-8")

    def full(*args, **kwargs):
        raise OSError(28, "No space left on device")

    app = create_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await _cables_listed(pilot)
        monkeypatch.setattr(os, "replace", full)
        await _save_new_cable(pilot)
        problem = str(app.screen.query_one("#editor-problem").render())
        assert "No space left" in problem and app.return_code is None
    assert path.read_text(encoding="utf-8") == "# my cables\n"


async def _save_new_cable(pilot) -> None:
    from textual.widgets import Input

    from tui.panels.cables.editor import CableEditor

    pilot.app.query_one("#cables-table").focus()  # out of the filter field
    await pilot.press("a")  # "new cable"
    await wait_for(pilot, lambda: isinstance(pilot.app.screen, CableEditor))
    screen = pilot.app.screen
    for input_id, text in {"new-id": "basement-jumper", "new-description": "jumper",
                           "new-z0": "50 ohm", "new-vf": "0.78"}.items():
        screen.query_one(f"#{input_id}", Input).value = text
    await pilot.press("ctrl+s")
    await pilot.pause()
    assert isinstance(pilot.app.screen, CableEditor)  # still open: nothing was saved


async def test_a_path_with_brackets_is_shown_as_it_is(tmp_path, monkeypatch):
    # notifications carry paths, site names and typed text: read as markup, a directory
    # "[B-wing]" vanished from the path shown ("/tmp//data")
    data = tmp_path / "site [B-wing]" / "data"
    monkeypatch.setenv("HALFTRIP_DATA_DIR", str(data))
    snap = damage("catalog", "corrupt", user_catalog_path(), monkeypatch)
    app = create_app()
    async with app.run_test(size=(80, 24), notifications=True) as pilot:
        await started(pilot)
        await wait_for(pilot, lambda: any(str(snap.path) in str(t.render())
                                          for t in app.screen.query("Toast")))
    assert snap.unchanged()
