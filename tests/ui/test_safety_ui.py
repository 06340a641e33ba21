"""The Safety panel, the first-start notice and the warning line, at 80x24."""

from __future__ import annotations

import tomllib

import pytest
from textual.widgets import Button, OptionList
from uihelp import started, type_into, wait_for

from tui import safety
from tui.app import create_app
from tui.panels.safety.notice import SafetyNotice
from tui.paths import preferences_path
from tui.widgets.warning_line import WarningLine

SIZE = (80, 24)


def _prefs_file(text: str):
    path = preferences_path()
    path.parent.mkdir(parents=True)
    path.write_text(text, encoding="utf-8")
    return path


async def _notice_up(pilot) -> SafetyNotice:
    await wait_for(pilot, lambda: isinstance(pilot.app.screen, SafetyNotice))
    return pilot.app.screen


async def _notice_gone(pilot) -> None:
    await wait_for(pilot, lambda: not isinstance(pilot.app.screen, SafetyNotice))


def _on_screen(widget) -> bool:
    """The widget is shown and lies wholly inside the 80x24 screen."""
    r = widget.region
    return (widget.display and r.width > 0 and r.height > 0 and r.x >= 0 and r.y >= 0
            and r.right <= SIZE[0] and r.bottom <= SIZE[1])


@pytest.mark.first_start
async def test_notice_appears_on_first_start_and_is_remembered():
    path = _prefs_file('units = "imperial"\n\n[log]\nlast_job = 4\n')
    app = create_app()
    async with app.run_test(size=SIZE) as pilot:
        notice = await _notice_up(pilot)
        assert "lethal" in str(notice.query_one("#notice-title").render())
        assert _on_screen(notice.query_one("#notice-ack", Button))  # reachable at 80x24
        assert not notice.query("#notice-changed")
        await pilot.press("escape", "f8", "s")  # neither closes it nor gets past it
        await pilot.pause()
        assert app.screen is notice and safety.notice_needed()
        await pilot.press("enter")  # the acknowledge button has the focus
        await _notice_gone(pilot)
    data = tomllib.loads(path.read_text(encoding="utf-8"))
    assert data["safety"]["acknowledged_text_version"] == safety.text_version()
    assert data["units"] == "imperial" and data["log"] == {"last_job": 4}  # kept
    again = create_app()
    async with again.run_test(size=SIZE) as pilot:
        await started(pilot)
        await pilot.pause()
        assert not isinstance(again.screen, SafetyNotice)


@pytest.mark.first_start
async def test_notice_returns_when_the_caution_text_changes():
    _prefs_file('[safety]\nacknowledged_text_version = "an-older-text"\n')
    async with create_app().run_test(size=SIZE) as pilot:
        notice = await _notice_up(pilot)
        assert "changed" in str(notice.query_one("#notice-changed").render())
        await pilot.click("#notice-ack")
        await _notice_gone(pilot)
    assert not safety.notice_needed()


@pytest.mark.first_start
async def test_unwritable_preferences_keep_showing_the_notice_and_are_left_alone():
    path = _prefs_file("units = [[[")
    async with create_app().run_test(size=SIZE) as pilot:
        await _notice_up(pilot)
        await pilot.press("enter")
        await _notice_gone(pilot)
    assert path.read_text(encoding="utf-8") == "units = [[["
    assert safety.notice_needed()


async def test_safety_panel_opens_by_one_key_and_shows_each_topic():
    app = create_app()
    async with app.run_test(size=SIZE) as pilot:
        await started(pilot)
        await pilot.press("f8")
        await pilot.pause()
        assert app.current_panel == "safety"
        topics = app.query_one("#safety-topics", OptionList)
        labels = [str(topics.get_option_at_index(i).prompt) for i in range(topics.option_count)]
        assert labels == [s.label for s in safety.load_text().sections.values()]
        panel = app.query_one("#safety")
        panel.show_section("power")
        await pilot.pause()
        text = str(app.query_one("#safety-text").render())
        assert "Power cables" in text and "IEEE Std 1234" in text and "take precedence" in text
        body = app.query_one("#safety-body")
        widest = max(len(line) for line in str(app.query_one("#safety-text").render()).split("\n"))
        assert widest <= body.scrollable_content_region.width
        assert _on_screen(topics) and _on_screen(body)


async def test_safety_panel_key_works_from_a_text_field():
    app = create_app(start_panel="cables")
    async with app.run_test(size=SIZE) as pilot:
        await started(pilot)
        await type_into(pilot, "cables-filter", "rg")
        await pilot.press("f8")
        await pilot.pause()
        assert app.current_panel == "safety"


async def test_choosing_a_hazard_tagged_cable_shows_the_warning_line():
    app = create_app(start_panel="cables")
    async with app.run_test(size=SIZE) as pilot:
        await started(pilot)
        warning = app.query_one("#cables").query_one(WarningLine)
        await type_into(pilot, "cables-filter", "rg174")  # no hazard tags
        await wait_for(pilot, lambda: app.query_one("#cables").selected() is not None)
        assert not warning.display
        await type_into(pilot, "cables-filter", "mv-xlpe")  # power, stored-charge
        await wait_for(pilot, lambda: warning.display)
        text = str(warning.render())
        assert text.startswith("CAUTION") and "power, stored-charge" in text
        assert _on_screen(warning)


async def test_marking_a_line_possibly_live_shows_the_warning_line():
    app = create_app(start_panel="cables")
    async with app.run_test(size=SIZE) as pilot:
        await started(pilot)
        warning = app.query_one("#cables").query_one(WarningLine)
        await type_into(pilot, "cables-filter", "rg174")
        await wait_for(pilot, lambda: app.query_one("#cables").selected() is not None)
        assert not warning.display
        await pilot.press("escape", "exclamation_mark")
        await wait_for(pilot, lambda: warning.display)
        assert "possibly live" in str(warning.render())
        await pilot.press("exclamation_mark")
        await wait_for(pilot, lambda: not warning.display)


async def test_the_palette_marks_a_line_possibly_live_too():
    # the same as "!" (common practice: every key's action is also in the palette)
    from tui.palette import HalftripCommands

    app = create_app(start_panel="cables")
    async with app.run_test(size=SIZE) as pilot:
        await started(pilot)
        warning = app.query_one("#cables").query_one(WarningLine)
        commands = {t: cb for t, cb, _help in HalftripCommands(app.screen)._commands()}
        mark = next(cb for t, cb in commands.items() if "possibly live" in t)
        await type_into(pilot, "cables-filter", "rg174")  # a cable with no hazard tag
        await wait_for(pilot, lambda: app.query_one("#cables").selected() is not None)
        assert not warning.display
        mark()
        await wait_for(pilot, lambda: warning.display)
        assert "possibly live" in str(warning.render())
