"""The job-log store: the file it writes, entries, tags, undoable deletes, migrations,
and files it must refuse and leave exactly as they were."""

from __future__ import annotations

import hashlib
import shutil
import sqlite3
import struct
import threading
import time
from pathlib import Path

import pytest

from calc.errors import InputError
from tui.joblog import JobLogBusy, JobLogError, NoJobLog, open_log, schema

DATA = Path(__file__).parent / "data"


def _digest(path: Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


def _make_v1(path: Path) -> None:
    con = sqlite3.connect(path)
    con.executescript((DATA / "joblog_v1.sql").read_text(encoding="utf-8"))
    con.close()


# -- the file -------------------------------------------------------------------------------


def test_new_file_header_says_what_it_is(tmp_path):
    path = tmp_path / "jobs.sqlite3"
    open_log(path).close()
    header = path.read_bytes()[:100]
    # SQLite file format document, "The Database Header": magic string at offset 0, file
    # format write/read version at 18/19 (2 = write-ahead log), user_version at 60 and
    # application_id at 68, both 4-byte big-endian.
    assert header[:16] == b"SQLite format 3\x00"
    assert header[18] == 2 and header[19] == 2
    assert struct.unpack(">I", header[60:64])[0] == schema.CURRENT_VERSION
    assert header[68:72] == b"half"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["jobs.sqlite3"]  # no temp left


def test_missing_file_is_created_only_when_asked(tmp_path):
    path = tmp_path / "sub" / "jobs.sqlite3"
    with pytest.raises(NoJobLog, match="log new"):
        open_log(path, create=False)
    assert not path.parent.exists()
    with open_log(path) as log:
        assert log.jobs() == []
    assert path.exists()


# -- jobs and entries -----------------------------------------------------------------------


def test_entry_is_stored_as_given(tmp_path):
    with open_log(tmp_path / "j.db") as log:
        job = log.new_job("  Harbour Road substation ", "gate code at the office", "2026-12-01")
        assert (job.site, job.date, job.notes) == ("Harbour Road substation", "2026-12-01",
                                                   "gate code at the office")
        inputs = {"delay": "245 ns", "cable": "rg58"}
        result = {"distance_m": 24.238, "junctions": [{"distance_m": 2.0}], "note": "ünïcode"}
        entry = log.add_entry(job.id, "locate", inputs, result, label="feeder 2",
                              note="line 1\nline 2", cable="rg58", tags=["Pass", "roof"])
        again = log.entry(entry.id)
        assert again == entry
        assert (again.inputs, again.result) == (inputs, result)
        assert again.tags == ("pass", "roof")
        assert log.job(job.id).entry_count == 1


def test_status_tags_exclude_each_other(tmp_path):
    with open_log(tmp_path / "j.db") as log:
        job = log.new_job("Old mill data room")
        e = log.add_entry(job.id, "echo", {}, {"vswr": 1.5}, tags=["pass", "patch-panel"])
        assert log.tag(e.id, ["fail"]).tags == ("fail", "patch-panel")
        assert log.tag(e.id, ["recheck", "wet"]).tags == ("patch-panel", "recheck", "wet")
        assert log.tag(e.id, ["wet"], remove=True).tags == ("patch-panel", "recheck")
        with pytest.raises(InputError, match="tag"):
            log.tag(e.id, ["two words"])


def test_edit_changes_only_what_is_given(tmp_path):
    with open_log(tmp_path / "j.db") as log:
        job = log.new_job("Old mill data room")
        e = log.add_entry(job.id, "cut", {"frequency": "146 MHz"}, {"cut_length_m": 0.35},
                          label="arm 1", note="first try")
        changed = log.edit_entry(e.id, note="cut again after trim")
        assert (changed.label, changed.note) == ("arm 1", "cut again after trim")
        assert changed.result == e.result
        edited_job = log.edit_job(job.id, notes="key from the caretaker")
        assert (edited_job.site, edited_job.notes) == ("Old mill data room", "key from the caretaker")


def test_delete_hides_and_undo_restores_in_reverse_order(tmp_path):
    with open_log(tmp_path / "j.db") as log:
        job = log.new_job("Quarry Lane repeater hut")
        a, b, c = (log.add_entry(job.id, "locate", {}, {"distance_m": d}) for d in (1.0, 2.0, 3.0))
        log.delete(c.id)
        log.delete(a.id)
        assert [e.id for e in log.entries(job.id)] == [b.id]
        assert [e.id for e in log.entries(job.id, deleted=True)] == [a.id, c.id]
        with pytest.raises(JobLogError, match="deleted"):
            log.entry(a.id)
        assert log.undo_delete().id == a.id  # the last deleted comes back first
        assert log.undo_delete().id == c.id
        assert log.undo_delete() is None
        assert [e.id for e in log.entries(job.id)] == [a.id, b.id, c.id]


def test_filters_by_tag_label_and_kind(tmp_path):
    with open_log(tmp_path / "j.db") as log:
        job = log.new_job("Harbour Road substation")
        log.add_entry(job.id, "locate", {}, {"distance_m": 1.0}, label="Feeder 2", tags=["fail"])
        log.add_entry(job.id, "locate", {}, {"distance_m": 2.0}, label="feeder 3", tags=["pass"])
        log.add_entry(job.id, "cut", {}, {"cut_length_m": 0.3}, label="jumper")
        assert [e.label for e in log.entries(job.id, label="FEEDER")] == ["Feeder 2", "feeder 3"]
        assert [e.label for e in log.entries(job.id, tag="fail")] == ["Feeder 2"]
        assert [e.label for e in log.entries(job.id, kind="cut")] == ["jumper"]
        assert log.entries(job.id, tag="recheck") == []


def test_bad_input_is_refused_with_the_field_named(tmp_path):
    with open_log(tmp_path / "j.db") as log:
        with pytest.raises(ValueError, match="SITE: must not be empty"):
            log.new_job("   ")
        with pytest.raises(ValueError, match="--date"):
            log.new_job("x", date_text="14/03/2026")
        job = log.new_job("x")
        with pytest.raises(ValueError, match="--result"):
            log.add_entry(job.id, "locate", {}, {"distance_m": float("nan")})
        with pytest.raises(JobLogError, match="no job 99"):
            log.add_entry(99, "locate", {}, {"distance_m": 1.0})
        assert log.entries(job.id) == []


# -- migrations -----------------------------------------------------------------------------


def test_first_schema_migrates_forward_and_keeps_a_copy(tmp_path):
    path = tmp_path / "jobs.sqlite3"
    _make_v1(path)
    before = _digest(path)
    notices = []
    with open_log(path, notice=notices.append) as log:
        assert [j.site for j in log.jobs()] == ["Old mill data room", "Quarry Lane repeater hut"]
        entries = log.entries(1)
        assert [e.label for e in entries] == ["feeder 2", "phasing line"]
        first = entries[0]
        assert first.inputs == {"delay": "245 ns", "cable": "rg58"}
        assert first.result == {"distance_m": 24.238, "vf": 0.66}
        assert first.modified_at == first.created_at == "2026-03-14T08:15:40+00:00"
        assert first.tags == ()
        assert log.tag(first.id, ["recheck"]).tags == ("recheck",)  # the new table works
        log.delete(first.id)
        assert log.undo_delete().id == first.id  # and so does soft deletion
    assert any("schema version 1 to 2" in n for n in notices)
    backup = tmp_path / "jobs.sqlite3.schema1.bak"
    con = sqlite3.connect(backup)
    assert con.execute("PRAGMA user_version").fetchone()[0] == 1
    assert con.execute("SELECT count(*) FROM entries").fetchone()[0] == 3
    con.close()
    assert struct.unpack(">I", path.read_bytes()[60:64])[0] == 2
    assert before != _digest(path)
    with open_log(path, notice=notices.append):  # a second open migrates nothing
        pass
    assert len([n for n in notices if "updated" in n]) == 1


def test_frozen_first_schema_matches_the_first_migration(tmp_path):
    """Step 1 of the migrations must never change once files exist that it wrote."""
    frozen = tmp_path / "frozen.db"
    _make_v1(frozen)
    fresh = sqlite3.connect(tmp_path / "fresh.db", isolation_level=None)
    schema.MIGRATIONS[0](fresh)

    def tables(con):
        return sorted(" ".join(sql.split()) for (sql,) in
                      con.execute("SELECT sql FROM sqlite_schema WHERE type = 'table'"))

    assert tables(sqlite3.connect(frozen)) == tables(fresh)


# -- files left untouched -------------------------------------------------------------------


def _real_log(path: Path) -> None:
    with open_log(path) as log:
        job = log.new_job("Quarry Lane repeater hut")
        for i in range(400):
            log.add_entry(job.id, "locate", {"delay": f"{i} ns"}, {"distance_m": i * 0.1,
                                                                   "pad": "x" * 200})


def _not_a_database(path):
    path.write_bytes(b"site,distance\nfeeder 2,24.2\n" * 10)


def _empty(path):
    path.write_bytes(b"")


def _truncated(path):
    _real_log(path)
    data = path.read_bytes()
    path.write_bytes(data[: len(data) // 2])


def _damaged_page(path):
    _real_log(path)
    data = bytearray(path.read_bytes())
    page = struct.unpack(">H", data[16:18])[0]
    for offset in range(3 * page, 3 * page + 64):  # scribble over an interior page's header
        data[offset] = 0xA5
    path.write_bytes(bytes(data))


def _newer(path):
    _real_log(path)
    con = sqlite3.connect(path)
    con.execute(f"PRAGMA user_version = {schema.CURRENT_VERSION + 1}")
    con.close()


def _newer_in_header_only(path):
    _real_log(path)
    data = bytearray(path.read_bytes())
    data[60:64] = struct.pack(">I", 99)
    path.write_bytes(bytes(data))


def _other_program(path):
    con = sqlite3.connect(path)
    con.execute("CREATE TABLE photos (id INTEGER PRIMARY KEY, name TEXT)")
    con.execute("INSERT INTO photos (name) VALUES ('roof.jpg')")
    con.commit()
    con.close()


def _other_application_id(path):
    con = sqlite3.connect(path)
    con.execute("PRAGMA application_id = 12345")
    con.execute("CREATE TABLE t (x)")
    con.commit()
    con.close()


def _version_without_tables(path):
    con = sqlite3.connect(path)
    con.execute(f"PRAGMA application_id = {schema.APPLICATION_ID}")
    con.execute(f"PRAGMA user_version = {schema.CURRENT_VERSION}")
    con.execute("CREATE TABLE jobs (id INTEGER PRIMARY KEY)")
    con.commit()
    con.close()


@pytest.mark.parametrize("make, says", [
    (_not_a_database, "not a SQLite database"),
    (_empty, "empty file"),
    (_truncated, "damaged"),
    (_damaged_page, "damaged"),
    (_newer, "newer halftrip"),
    (_newer_in_header_only, "newer halftrip"),
    (_other_program, "another program"),
    (_other_application_id, "another program"),
    (_version_without_tables, "are missing"),
])
def test_unusable_file_is_reported_and_left_byte_for_byte(tmp_path, make, says):
    path = tmp_path / "jobs.sqlite3"
    make(path)
    listing = sorted(p.name for p in tmp_path.iterdir())
    before = _digest(path)
    for create in (True, False):
        with pytest.raises(JobLogError) as caught:
            open_log(path, create=create)
        message = str(caught.value)
        assert str(path) in message and says in message and "left untouched" in message
        assert "\n" not in message
    assert _digest(path) == before
    assert sorted(p.name for p in tmp_path.iterdir()) == listing  # no side files made


def test_cli_reports_a_broken_file_in_one_line(tmp_path, capsys):
    from tui.cli import main

    path = tmp_path / "jobs.sqlite3"
    _not_a_database(path)
    before = _digest(path)
    assert main(["log", "list", "--db", str(path)]) == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and str(path) in err and "left untouched" in err
    assert _digest(path) == before


# -- busy -----------------------------------------------------------------------------------


def _hold_write_lock(path: Path) -> sqlite3.Connection:
    holder = sqlite3.connect(path, isolation_level=None, check_same_thread=False)
    holder.execute("BEGIN IMMEDIATE")
    return holder


def test_busy_file_gives_a_clear_message_and_writes_nothing(tmp_path):
    path = tmp_path / "j.db"
    with open_log(path) as log:
        job = log.new_job("Harbour Road substation")
    holder = _hold_write_lock(path)
    try:
        with open_log(path, busy_timeout_s=0.05, retries=2) as log:
            with pytest.raises(JobLogBusy) as caught:
                log.add_entry(job.id, "locate", {}, {"distance_m": 1.0})
            assert "busy, retried 2 times" in str(caught.value)
            assert "nothing was saved" in str(caught.value)
    finally:
        holder.execute("ROLLBACK")
        holder.close()
    with open_log(path) as log:
        assert log.entries(job.id) == []


def test_busy_file_is_retried_and_the_save_goes_through(tmp_path):
    path = tmp_path / "j.db"
    with open_log(path) as log:
        job = log.new_job("Harbour Road substation")
    holder = _hold_write_lock(path)
    release = threading.Timer(0.3, lambda: holder.execute("COMMIT"))
    release.start()
    notices = []
    try:
        with open_log(path, busy_timeout_s=0.05, retries=10, notice=notices.append) as log:
            started = time.monotonic()
            entry = log.add_entry(job.id, "locate", {}, {"distance_m": 1.0})
            assert time.monotonic() - started >= 0.25
            assert log.entry(entry.id).result == {"distance_m": 1.0}
    finally:
        release.join()
        holder.close()
    assert any("busy" in n and "retried" in n and "saved" in n for n in notices)


def test_copy_of_a_live_log_opens(tmp_path):
    """A file copied while it had no open writer is a complete job log on its own."""
    path = tmp_path / "a.db"
    with open_log(path) as log:
        log.add_entry(log.new_job("x").id, "note", {}, {}, note="checked the gland")
    shutil.copy(path, tmp_path / "b.db")
    with open_log(tmp_path / "b.db") as log:
        assert [e.note for e in log.entries()] == ["checked the gland"]
