"""SVG snapshots of each panel at 80x24 on the demo job (pytest-textual-snapshot).

They catch accidental layout changes. Review the SVGs before accepting an
update (``pytest tests/ui/test_snapshots.py --snapshot-update``)."""

from __future__ import annotations

import pytest
from uihelp import started, tables_measured, wait_for

from tui.app import create_app
from tui.widgets.form import LiveForm

TRACE_FILE = "tui/demo/kestrel-ridge-feeder.csv"  # relative: the same on every machine


def _state(app) -> str:
    from tui.widgets.modes import Modes

    forms = [f for f in app.query(LiveForm) if f.is_on_screen]
    return (f"focused={app.focused} modal={app.screen.is_modal} core={app.core_ready} "
            f"modes={[(len(m.query_one('ContentSwitcher').children), len(m.modes)) for m in app.query(Modes)]} "
            f"forms={[(type(f).__name__, f.last_result is not None, f.last_error) for f in forms]}")


def _settled(app) -> bool:
    """Every form shown has its result, every mode is mounted, the cursor is placed."""
    from tui.widgets.modes import Modes

    forms = [f for f in app.query(LiveForm) if f.is_on_screen]
    modes_mounted = all(len(m.query_one("ContentSwitcher").children) == len(m.modes)
                        for m in app.query(Modes))
    details = [str(d.render()) for d in app.query("#cables-detail")]
    return (modes_mounted and (app.focused is not None or app.screen.is_modal)
            and all(details)
            and all(f.last_result is not None or f.last_error is not None for f in forms)
            and all(f.result_view().border_subtitle != "working..." for f in forms))


def before(*keys: str, trace_file: bool = False):
    async def run_before(pilot) -> None:
        await started(pilot)
        if trace_file:
            from textual.widgets import Input

            pilot.app.query_one("#trace-file", Input).value = TRACE_FILE
        for key in keys:
            await pilot.press(key)
        try:
            await wait_for(pilot, lambda: _settled(pilot.app), timeout=60)
        except AssertionError:
            raise AssertionError(_state(pilot.app)) from None
        await pilot.app.workers.wait_for_complete()
        await pilot.pause(0.3)
        await wait_for(pilot, lambda: _settled(pilot.app) and tables_measured(pilot.app),
                       timeout=60)

    return run_before


@pytest.fixture(autouse=True)
def _run_from_the_worktree(monkeypatch):
    from pathlib import Path

    monkeypatch.chdir(Path(__file__).resolve().parents[2])


@pytest.mark.parametrize("panel, keys", [
    ("locate", ()),
    ("locate", ("escape", "2")),
    ("cut", ()),
    ("cut", ("escape", "3")),
    ("echo", ("escape", "3")),
    ("cables", ()),
])
def test_panel(snap_compare, panel, keys):
    assert snap_compare(create_app(demo=True, start_panel=panel), terminal_size=(80, 24),
                        run_before=before(*keys))


def test_trace_panel(snap_compare):
    assert snap_compare(create_app(demo=True, start_panel="trace"), terminal_size=(80, 24),
                        run_before=before(trace_file=True))


def test_light_theme(snap_compare):
    assert snap_compare(create_app(demo=True, start_panel="locate"), terminal_size=(80, 24),
                        run_before=before("escape", "d"))


def test_no_color(snap_compare, monkeypatch):
    monkeypatch.setenv("NO_COLOR", "1")
    assert snap_compare(create_app(demo=True, start_panel="locate"), terminal_size=(80, 24),
                        run_before=before())


def test_help_screen(snap_compare):
    assert snap_compare(create_app(start_panel="locate"), terminal_size=(80, 24),
                        run_before=before("f1"))
