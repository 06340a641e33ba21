"""Damaged user files (issue 10): a corrupt, truncated, empty, unreadable or
newer-version user catalog, preferences file or job database is reported
with its path, left byte for byte as it was, and the program still runs. Writes of both
files are atomic: a temporary file in the same directory, then a rename, so a
crash at any point leaves the old file or the new one, never half of one.

The terminal interface's side of the same faults is in tests/ui/test_file_faults_ui.py.
"""

from __future__ import annotations

import io
import json
import os
import signal
import subprocess
import sys
import textwrap
from contextlib import redirect_stderr, redirect_stdout
from pathlib import Path

import pytest
from filefaults import FAULTS, FILES, GOOD, GOOD_CATALOG, GOOD_PREFS, UNREADABLE, damage
from hypothesis import given, settings
from hypothesis import strategies as st

from cable_catalog.loader import CatalogWriteError, append_user_cable, load_catalog
from tui.cli import main
from tui.paths import job_db_path, preferences_path, user_catalog_path
from tui.prefs import changed, load_preferences, save_preferences

ROOT = Path(__file__).resolve().parents[1]
NEW_CABLE = {"id": "basement-jumper", "description": "jumper measured in the basement",
             "category": "coax", "z0_ohm": 50.0, "vf": 0.78, "vf_tolerance": 0.01,
             "source": "measured on site"}


def _path(which: str) -> Path:
    return {"catalog": user_catalog_path, "prefs": preferences_path, "db": job_db_path}[which]()


def _problems(which: str) -> tuple[str, ...]:
    if which == "catalog":
        return load_catalog(user_catalog_path()).problems
    if which == "prefs":
        return load_preferences().problems
    from tui.joblog.db import JobLogError, open_log

    try:
        open_log(job_db_path(), create=False).close()
    except JobLogError as exc:
        return (str(exc),)
    return ()


def _cli(*argv: str) -> tuple[int, str, str]:
    from tui.commands import common

    common.catalog.cache_clear()
    out, err = io.StringIO(), io.StringIO()
    with redirect_stdout(out), redirect_stderr(err):
        code = main(list(argv))
    return code, out.getvalue(), err.getvalue()


@pytest.mark.parametrize("fault", FAULTS)
@pytest.mark.parametrize("which", FILES)
def test_fault_is_reported_with_its_path_and_left_alone(which, fault, monkeypatch):
    snap = damage(which, fault, _path(which), monkeypatch)
    problems = _problems(which)
    assert problems, f"{fault} {which} not reported"
    assert all(str(snap.path) in p for p in problems), problems
    assert snap.unchanged()


@pytest.mark.parametrize("fault", FAULTS)
def test_cli_runs_on_the_built_in_catalog_and_names_the_file(fault, monkeypatch):
    snap = damage("catalog", fault, user_catalog_path(), monkeypatch)
    code, out, err = _cli("cables", "list", "--json")
    assert code == 0, err
    assert "rg58" in {c["id"] for c in json.loads(out)["cables"]}
    assert f"halftrip: catalog: {snap.path}" in err
    code, out, err = _cli("locate", "245 ns", "--cable", "rg213", "--json")
    assert code == 0, err
    # SI c0 and the catalog's nominal VF 0.66 for RG-213 (solid PE): 0.66 c0 245 ns / 2
    assert json.loads(out)["distance_m"] == pytest.approx(0.66 * 299_792_458 * 245e-9 / 2)
    assert snap.unchanged()


@pytest.mark.parametrize("fault", FAULTS)
def test_cli_runs_on_default_preferences_and_names_the_file(fault, monkeypatch):
    snap = damage("prefs", fault, preferences_path(), monkeypatch)
    code, out, err = _cli("locate", "100 ns", "--vf", "0.66")
    assert code == 0, err
    assert out.strip()
    assert f"halftrip: preferences: {snap.path}" in err
    if fault == "newer":  # what this version knows of a newer file is still used
        assert " ft " in out
    assert snap.unchanged()


@pytest.mark.parametrize("fault", FAULTS)
def test_cli_runs_beside_a_broken_job_log_and_names_it(fault, monkeypatch):
    snap = damage("db", fault, job_db_path(), monkeypatch)
    code, out, err = _cli("log", "list")
    assert code == 2 and out == "" and str(snap.path) in err, err
    assert len(err.strip().splitlines()) == 1, err
    code, out, err = _cli("locate", "245 ns", "--vf", "0.66", "--json")  # needs no log
    assert code == 0 and json.loads(out)["distance_m"] > 0, err
    code, out, err = _cli("locate", "245 ns", "--vf", "0.66", "--save", "--json")
    # the result is shown, the save refused in one line that names the file
    assert code == 2 and json.loads(out)["distance_m"] > 0
    assert len(err.strip().splitlines()) == 1 and str(snap.path) in err, err
    code, out, err = _cli("log", "new", "Marsh Lane relay")
    assert code == 2 and str(snap.path) in err, err
    assert snap.unchanged()


@pytest.mark.parametrize("fault", UNREADABLE)
def test_unreadable_files_are_never_written_over(fault, monkeypatch):
    cat = damage("catalog", fault, user_catalog_path(), monkeypatch)
    with pytest.raises(CatalogWriteError) as refused:
        append_user_cable(user_catalog_path(), NEW_CABLE)
    assert str(cat.path) in str(refused.value)
    assert cat.unchanged()
    prefs_snap = damage("prefs", fault, preferences_path(), monkeypatch)
    prefs = load_preferences()
    assert not prefs.writable
    assert save_preferences(changed(prefs, units="imperial")) is not None
    assert prefs_snap.unchanged()
    code, _, err = _cli("calibrate", "--length", "10 m", "--delay", "101 ns", "--save-as",
                        "site-cable")
    assert code == 2 and str(cat.path) in err and len(err.strip().splitlines()) == 1, err
    assert cat.unchanged()


def test_newer_files_keep_what_this_version_does_not_know(monkeypatch):
    cat = damage("catalog", "newer", user_catalog_path(), monkeypatch)
    append_user_cable(user_catalog_path(), NEW_CABLE)
    assert user_catalog_path().read_bytes().startswith(cat.content)  # old bytes, then ours
    assert "basement-jumper" in load_catalog(user_catalog_path()).cables
    damage("prefs", "newer", preferences_path(), monkeypatch)
    prefs = load_preferences()
    assert (prefs.units, prefs.fraction) == ("imperial", 32)
    assert save_preferences(changed(prefs, fraction=8)) is None
    import tomllib

    again = tomllib.loads(preferences_path().read_text(encoding="utf-8"))
    assert again["screen_reader"] is True and again["plots"] == {"style": "dots"}
    assert again["safety"] == {"note": "kept"} and again["fraction"] == 8


def test_empty_files_are_written_only_when_the_user_saves(monkeypatch):
    damage("catalog", "empty", user_catalog_path(), monkeypatch)
    append_user_cable(user_catalog_path(), NEW_CABLE)
    assert load_catalog(user_catalog_path()).problems == ()
    damage("prefs", "empty", preferences_path(), monkeypatch)
    assert save_preferences(changed(load_preferences(), units="imperial")) is None
    assert load_preferences().units == "imperial"


# ---------------------------------------------------------------- atomic writes
def _write(which: str) -> None:
    """The program's own write of ``which`` (a new cable; a changed preference)."""
    if which == "catalog":
        append_user_cable(user_catalog_path(), NEW_CABLE)
    else:
        problem = save_preferences(changed(load_preferences(), units="metric"))
        if problem:
            raise OSError(problem)


def _start_with_good(which: str) -> Path:
    path = _path(which)
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_bytes(GOOD[which])
    return path


@pytest.mark.parametrize("which", ["catalog", "prefs"])
def test_writes_go_through_a_temporary_file_and_a_rename(which, monkeypatch):
    path = _start_with_good(which)
    seen = []
    real_replace = os.replace

    def spy(src, dst):
        src, dst = Path(src), Path(dst)
        # at the moment of the rename the old file is still whole and the new one complete
        seen.append((src.parent == dst.parent, src.name.startswith(f".{dst.name}."),
                     dst.read_bytes() == GOOD[which], len(src.read_bytes()) > len(GOOD[which])
                     if which == "catalog" else b"metric" in src.read_bytes()))
        return real_replace(src, dst)

    monkeypatch.setattr(os, "replace", spy)
    _write(which)
    assert seen == [(True, True, True, True)]
    assert sorted(p.name for p in path.parent.iterdir()) == [path.name]


@pytest.mark.parametrize("crash", [OSError(28, "No space left on device"), KeyboardInterrupt()])
@pytest.mark.parametrize("at", ["fsync", "replace"])
@pytest.mark.parametrize("which", ["catalog", "prefs"])
def test_a_crash_mid_write_leaves_the_old_file(which, at, crash, monkeypatch):
    path = _start_with_good(which)

    def fail(*args, **kwargs):
        raise crash

    monkeypatch.setattr(os, at, fail)
    expected = (KeyboardInterrupt,) if isinstance(crash, KeyboardInterrupt) else (
        CatalogWriteError, OSError)
    with pytest.raises(expected):
        _write(which)
    assert path.read_bytes() == GOOD[which]
    assert sorted(p.name for p in path.parent.iterdir()) == [path.name]  # no temp file left


def test_a_full_disk_is_a_catalog_write_error(monkeypatch):
    # the cable editor and calibrate --save-as report CatalogWriteError as one line
    def full(*args, **kwargs):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(os, "replace", full)
    with pytest.raises(CatalogWriteError, match="No space left"):
        append_user_cable(user_catalog_path(), NEW_CABLE)


@pytest.mark.parametrize("which", ["catalog", "prefs"])
def test_a_process_killed_at_the_rename_leaves_the_old_file(which, tmp_path):
    # a real crash: the writing process is killed with SIGKILL between writing the
    # temporary file and renaming it
    path = _start_with_good(which)
    write = ("from cable_catalog.loader import append_user_cable\n"
             f"append_user_cable(user_catalog_path(), {NEW_CABLE!r})" if which == "catalog" else
             "from tui.prefs import changed, load_preferences, save_preferences\n"
             "save_preferences(changed(load_preferences(), units='metric'))")
    code = textwrap.dedent("""
        import os, signal
        from tui.paths import user_catalog_path
        os.replace = lambda src, dst: os.kill(os.getpid(), signal.SIGKILL)
    """) + write + "\n"
    proc = subprocess.run([sys.executable, "-c", code], cwd=ROOT, capture_output=True,
                          timeout=120)
    assert proc.returncode == -signal.SIGKILL, proc.stderr
    assert path.read_bytes() == GOOD[which]
    leftovers = [p for p in path.parent.iterdir() if p != path]
    assert len(leftovers) == 1 and leftovers[0].name.startswith(f".{path.name}.")
    # the stray temporary file is never read as the user's file
    assert _problems(which) == ()
    if which == "catalog":
        assert "basement-jumper" not in load_catalog(user_catalog_path()).cables
    else:
        assert load_preferences().units == "imperial"  # GOOD_PREFS, not the half-done write


def test_good_samples_are_good():
    # the fault table starts from files that read cleanly
    assert GOOD_CATALOG and GOOD_PREFS
    for which in ("catalog", "prefs"):
        _start_with_good(which)
        assert _problems(which) == ()


# ------------------------------------------------------- what is written reads back
@settings(max_examples=200, deadline=None)
@given(st.text(max_size=40), st.text(max_size=40))
def test_any_text_saved_in_a_cable_reads_back(description, notes):
    # a description pasted with control characters once made the whole file unreadable
    from hypothesis import assume

    assume(description.strip())
    path = user_catalog_path()
    path.unlink(missing_ok=True)
    append_user_cable(path, dict(NEW_CABLE, description=description, notes=notes))
    cat = load_catalog(path)
    assert cat.problems == ()
    saved = cat.cables["basement-jumper"]
    assert saved.description == description.strip() and saved.notes == notes


@settings(max_examples=200, deadline=None)
@given(st.dictionaries(st.text(max_size=10), st.text(max_size=20) | st.integers(), max_size=4),
       st.text(min_size=1, max_size=10).filter(lambda n: n not in ("units", "fraction",
                                                                     "last_cable", "theme")))
def test_any_preference_table_reads_back(table, name):
    # module tables belong to the program's own modules; their keys and values may be any text
    from tui.prefs import with_section

    prefs = with_section(load_preferences(), name, **table) if table else load_preferences()
    assert save_preferences(prefs) is None
    again = load_preferences()
    assert again.problems == ()
    if table:
        assert again.section(name) == table
    preferences_path().unlink(missing_ok=True)
