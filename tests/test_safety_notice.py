"""The first-start notice is acknowledged per caution-text version, in the
``[safety]`` table of the preferences file (the app side is in tests/ui)."""

from __future__ import annotations

from tui import safety
from tui.prefs import Preferences, load_preferences, save_preferences, with_section


def test_notice_is_needed_until_this_text_is_acknowledged():
    assert safety.notice_needed(Preferences())
    acked = with_section(Preferences(), safety.PREFS_TABLE, **safety.acknowledgement())
    assert not safety.notice_needed(acked)


def test_an_older_acknowledgement_shows_the_notice_again():
    old = with_section(Preferences(), safety.PREFS_TABLE,
                       **safety.acknowledgement(version="an-older-text"))
    assert safety.acknowledged_version(old) == "an-older-text"
    assert safety.notice_needed(old)


def test_acknowledgement_survives_the_preferences_file():
    prefs = with_section(Preferences(units="imperial"), safety.PREFS_TABLE,
                         **safety.acknowledgement())
    assert save_preferences(prefs) is None
    again = load_preferences()
    assert not safety.notice_needed(again) and not safety.notice_needed()
    assert again.units == "imperial"
    assert again.section("safety")["acknowledged_at"].endswith("Z")


def test_a_value_of_the_wrong_type_counts_as_not_acknowledged():
    prefs = with_section(Preferences(), safety.PREFS_TABLE, acknowledged_text_version=3)
    assert safety.acknowledged_version(prefs) is None and safety.notice_needed(prefs)
