"""The first-start notice: acknowledged per caution-text version, stored in the
``[safety]`` table of the preferences file without touching anything else."""

from __future__ import annotations

import os
import tomllib

import pytest

from tui import safety
from tui.paths import preferences_path

OTHER = """\
# my preferences, written by hand
units = "imperial"   # feet and inches
fraction = 32

[last]
cable = "rg213"
"""


def test_notice_is_needed_until_acknowledged_then_remembered():
    path = preferences_path()  # the test's own config directory (tests/conftest.py)
    assert not path.exists()
    assert safety.notice_needed()
    safety.acknowledge()
    assert path.exists() and not safety.notice_needed()
    stored = tomllib.loads(path.read_text(encoding="utf-8"))["safety"]
    assert stored["acknowledged_text_version"] == safety.text_version()


def test_changed_text_shows_the_notice_again():
    safety.acknowledge(version="an-older-text")
    assert safety.acknowledged_version() == "an-older-text"
    assert safety.notice_needed()
    safety.acknowledge()
    assert not safety.notice_needed()


def test_other_preferences_are_kept_byte_for_byte():
    path = preferences_path()
    path.parent.mkdir(parents=True)
    path.write_text(OTHER, encoding="utf-8")
    safety.acknowledge(version="first")
    safety.acknowledge()  # the second time the [safety] table is replaced, not added
    text = path.read_text(encoding="utf-8")
    assert text.startswith(OTHER)
    assert text.count("[safety]") == 1
    data = tomllib.loads(text)
    assert data["units"] == "imperial" and data["last"] == {"cable": "rg213"}
    assert not safety.notice_needed()


def test_a_safety_table_in_the_middle_is_replaced_in_place():
    path = preferences_path()
    path.parent.mkdir(parents=True)
    path.write_text('units = "metric"\n\n[safety]\nacknowledged_text_version = "x"\n\n'
                    '[last]\ncable = "rg58"\n', encoding="utf-8")
    safety.acknowledge()
    data = tomllib.loads(path.read_text(encoding="utf-8"))
    assert data["last"] == {"cable": "rg58"} and data["units"] == "metric"
    assert data["safety"]["acknowledged_text_version"] == safety.text_version()


@pytest.mark.parametrize("broken", ["units = \n", "[safety\n", "\x00\xff"])
def test_unreadable_preferences_show_the_notice_and_are_left_alone(broken):
    path = preferences_path()
    path.parent.mkdir(parents=True)
    path.write_text(broken, encoding="utf-8", errors="surrogateescape")
    before = path.read_bytes()
    assert safety.notice_needed()
    with pytest.raises(safety.PreferencesWriteError, match=str(path)):
        safety.acknowledge()
    assert path.read_bytes() == before


def test_dotted_safety_keys_elsewhere_are_not_clobbered():
    # A hand-written dotted key puts the table where a text edit cannot see
    # it; refusing is better than writing a file that no longer parses.
    path = preferences_path()
    path.parent.mkdir(parents=True)
    path.write_text('safety.acknowledged_text_version = "x"\n', encoding="utf-8")
    with pytest.raises(safety.PreferencesWriteError):
        safety.acknowledge()
    assert path.read_text(encoding="utf-8") == 'safety.acknowledged_text_version = "x"\n'


def test_a_failed_write_leaves_the_old_file(monkeypatch):
    path = preferences_path()
    path.parent.mkdir(parents=True)
    path.write_text(OTHER, encoding="utf-8")

    def fail(*_args):
        raise OSError("disk full")

    monkeypatch.setattr(os, "replace", fail)
    with pytest.raises(safety.PreferencesWriteError, match="disk full"):
        safety.acknowledge()
    assert path.read_text(encoding="utf-8") == OTHER
    assert [p.name for p in path.parent.iterdir()] == [path.name]  # no temporary left
