"""The app shell: panels by key, help, Escape, units switch remembered, palette."""

from __future__ import annotations

import tomllib

from textual.widgets import ContentSwitcher
from uihelp import started, wait_for

from tui.app import create_app
from tui.panels import discover
from tui.paths import preferences_path
from tui.widgets.panel_bar import PanelBar


async def test_every_panel_opens_by_function_key_and_letter():
    app = create_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        for spec in app.PANELS:
            await pilot.press(spec.function_key)
            await pilot.pause()
            assert app.query_one("#panels", ContentSwitcher).current == spec.name
            assert app.query_one(PanelBar).current == spec.name
        first = app.PANELS[0]
        await pilot.press("escape")  # out of any field: letters now open panels
        await pilot.press(first.key)
        await pilot.pause()
        assert app.current_panel == first.name


async def test_help_lists_every_app_and_panel_key_and_escape_closes_it():
    from tui.widgets.help_screen import HelpScreen

    app = create_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await pilot.press("f1")
        await pilot.pause()
        assert isinstance(app.screen, HelpScreen)
        text = "\n".join(str(w.render()) for w in app.screen.query(".help-rows"))
        for spec in app.PANELS:
            assert spec.function_key.upper() in text and spec.title in text
        assert "Units" in text and "Quit" in text
        await pilot.press("escape")
        await pilot.pause()
        assert not isinstance(app.screen, HelpScreen)


async def test_units_switch_is_remembered_between_sessions():
    app = create_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await pilot.press("f9")
        await pilot.pause()
        assert app.unit_system == ("imperial", 16)
        assert "ft-in" in str(app.query_one("#panel-bar-units").render())
    saved = tomllib.loads(preferences_path().read_text(encoding="utf-8"))
    assert saved["units"] == "imperial"
    again = create_app()
    async with again.run_test(size=(80, 24)) as pilot:
        assert again.unit_system == ("imperial", 16)


async def test_palette_offers_every_panel():
    from tui.palette import HalftripCommands

    app = create_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        provider = HalftripCommands(app.screen)
        commands = {t: cb for t, cb, _help in provider._commands()}
        for spec in app.PANELS:
            assert f"Panel: {spec.title}" in commands
        await commands["Panel: Cables"]()  # what the palette runs when it is chosen
        await wait_for(pilot, lambda: app.current_panel == "cables")


async def test_broken_preferences_file_is_reported_and_left_alone():
    path = preferences_path()
    path.parent.mkdir(parents=True)
    path.write_text("units = [[[", encoding="utf-8")
    app = create_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await pilot.press("f9")  # a change that would normally be saved
        await pilot.pause()
        assert app.unit_system[0] == "imperial"
    assert path.read_text(encoding="utf-8") == "units = [[["


async def test_runs_with_no_color(monkeypatch):
    monkeypatch.setenv("NO_COLOR", "1")
    app = create_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        assert app.no_color
        for spec in app.PANELS:
            await pilot.press(spec.function_key)
            await pilot.pause()
        app.save_screenshot("nocolor.svg", path=str(preferences_path().parent.parent))


async def test_light_theme_is_remembered():
    app = create_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await pilot.press("escape", "d")
        await pilot.pause()
        assert not app.current_theme.dark
    assert tomllib.loads(preferences_path().read_text(encoding="utf-8"))["theme"] == "textual-light"


def test_discovery_follows_the_contract():
    specs = discover()
    assert specs, "no panels found"
    assert len({s.key for s in specs}) == len(specs)
    assert [s.order for s in specs] == sorted(s.order for s in specs)


async def test_escape_steps_out_field_then_modes_then_bar_and_tab_goes_back_in():
    from textual.widgets import Input

    from tui.widgets.key_bar import KeyBar

    app = create_app(start_panel="locate")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        assert isinstance(app.focused, Input)
        await pilot.press("escape")
        assert isinstance(app.focused, KeyBar) and app.focused.id == "locate-mode-bar"
        await pilot.press("escape")
        assert isinstance(app.focused, PanelBar)
        await pilot.press("escape")  # nothing further out: stays on the bar, nothing closes
        assert isinstance(app.focused, PanelBar) and app.is_running
        await pilot.press("enter")
        await wait_for(pilot, lambda: isinstance(app.focused, Input))


async def test_a_mouse_click_on_the_panel_bar_opens_the_panel():
    app = create_app(start_panel="locate")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        bar = app.query_one(PanelBar)
        text = str(bar.render())
        await pilot.click(PanelBar, offset=(text.index("Cables") + 1, 0))
        await wait_for(pilot, lambda: app.current_panel == "cables")
