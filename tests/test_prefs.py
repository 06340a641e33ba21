"""Preferences file: typed fields, kept unknown keys, broken file left alone."""

from __future__ import annotations

import tomllib

from tui.paths import preferences_path
from tui.prefs import Preferences, changed, load_preferences, save_preferences, with_section


def test_missing_file_gives_defaults():
    prefs = load_preferences()
    assert prefs == Preferences()
    assert prefs.problems == ()
    assert not preferences_path().exists()  # reading never creates anything


def test_round_trip_keeps_unknown_keys_and_module_tables():
    path = preferences_path()
    path.parent.mkdir(parents=True)
    path.write_text('units = "imperial"\nfraction = 32\nfuture_key = [1, 2]\n'
                    '[safety]\nnotice_seen = true\n', encoding="utf-8")
    prefs = load_preferences()
    assert (prefs.units, prefs.fraction) == ("imperial", 32)
    assert prefs.section("safety") == {"notice_seen": True}
    assert any("future_key" in p for p in prefs.problems)
    prefs = with_section(changed(prefs, last_cable="rg8"), "log", last_job=3)
    assert save_preferences(prefs) is None
    data = tomllib.loads(path.read_text(encoding="utf-8"))
    assert data["future_key"] == [1, 2]
    assert data["safety"] == {"notice_seen": True}
    assert data["log"] == {"last_job": 3}
    assert data["last_cable"] == "rg8"
    assert data["units"] == "imperial"


def test_broken_file_is_reported_and_never_overwritten():
    path = preferences_path()
    path.parent.mkdir(parents=True)
    path.write_text("units = imperial\n[[[", encoding="utf-8")  # not TOML
    before = path.read_bytes()
    prefs = load_preferences()
    assert prefs.units == "metric"
    assert not prefs.writable
    assert len(prefs.problems) == 1 and str(path) in prefs.problems[0]
    assert save_preferences(changed(prefs, units="imperial")) is not None
    assert path.read_bytes() == before


def test_bad_value_uses_default_and_keeps_text_until_changed():
    path = preferences_path()
    path.parent.mkdir(parents=True)
    path.write_text('fraction = 10\nunitz = "metric"\n', encoding="utf-8")
    prefs = load_preferences()
    assert prefs.fraction == 16
    assert any("fraction" in p for p in prefs.problems)
    assert any("did you mean 'units'" in p for p in prefs.problems)
    save_preferences(prefs)
    assert tomllib.loads(path.read_text(encoding="utf-8"))["fraction"] == 10
    save_preferences(changed(prefs, fraction=8))
    assert tomllib.loads(path.read_text(encoding="utf-8"))["fraction"] == 8


def test_changed_refuses_values_the_file_would_refuse():
    import pytest

    with pytest.raises(ValueError):
        changed(Preferences(), units="cubits")
    with pytest.raises(KeyError):
        changed(Preferences(), colour="red")


def test_update_keeps_tables_written_meanwhile_by_another_module():
    from tui import safety
    from tui.prefs import update_preferences

    update_preferences(units="imperial")
    # the safety notice writes its own [safety] table
    update_preferences(sections={safety.PREFS_TABLE: safety.acknowledgement()})
    prefs, problem = update_preferences(fraction=32)
    assert problem is None
    data = tomllib.loads(preferences_path().read_text(encoding="utf-8"))
    assert data["units"] == "imperial" and data["fraction"] == 32
    assert data["safety"]["acknowledged_text_version"] == safety.text_version()
    assert not safety.notice_needed()
