"""The job log under a killed writer and under concurrent writers.

Each test runs real processes against one file: what a process printed is what
its save returned, and every such save must be in the file afterwards, with
SQLite's own ``PRAGMA integrity_check`` passing.
"""

from __future__ import annotations

import json
import os
import signal
import sqlite3
import subprocess
import sys
import threading
from pathlib import Path

import pytest

from tui.joblog import open_log

ROOT = Path(__file__).resolve().parent.parent
WRITER = Path(__file__).resolve().parent / "joblog_writer.py"


def _env() -> dict:
    env = dict(os.environ)
    env["PYTHONPATH"] = str(ROOT) + os.pathsep + env.get("PYTHONPATH", "")
    return env


def _writer(db: Path, job: int, count: int, name: str) -> subprocess.Popen:
    return subprocess.Popen([sys.executable, str(WRITER), str(db), str(job), str(count), name],
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True,
                            cwd=ROOT, env=_env())


def _integrity(db: Path) -> list[str]:
    con = sqlite3.connect(db)  # SQLite itself, not our code, judges the file
    try:
        return [row[0] for row in con.execute("PRAGMA integrity_check")]
    finally:
        con.close()


def _stored(db: Path) -> dict[int, tuple[str, int]]:
    """entry id -> (writer name, index) for every entry in the file."""
    con = sqlite3.connect(db)
    try:
        return {i: (json.loads(inputs)["writer"], json.loads(inputs)["i"])
                for i, inputs in con.execute("SELECT id, inputs FROM entries")}
    finally:
        con.close()


@pytest.fixture
def db(tmp_path) -> tuple[Path, int]:
    path = tmp_path / "jobs.sqlite3"
    with open_log(path) as log:
        job = log.new_job("Harbour Road substation").id
    return path, job


@pytest.mark.parametrize("kill_after", [1, 7, 23, 40])
def test_sigkill_in_a_burst_loses_no_save_that_returned(db, kill_after):
    path, job = db
    returned: dict[int, tuple[str, int]] = {}
    for round_ in range(3):  # three killed bursts into the same file
        name = f"burst{round_}"
        proc = _writer(path, job, 100_000, name)
        for i in range(kill_after):
            line = proc.stdout.readline()
            assert line, proc.stderr.read()
            returned[int(line)] = (name, i)
        os.kill(proc.pid, signal.SIGKILL)  # the writer is in the middle of its next save
        proc.wait()
        assert proc.returncode == -signal.SIGKILL
        for i, line in enumerate(proc.stdout.read().split(), start=kill_after):
            returned[int(line)] = (name, i)  # printed before the kill: those returned too
        proc.stdout.close()
        proc.stderr.close()
        assert _integrity(path) == ["ok"]
    stored = _stored(path)
    for entry_id, origin in returned.items():
        assert stored.get(entry_id) == origin
    # At most the one save in flight at each kill may have committed without being printed.
    assert 0 <= len(stored) - len(returned) <= 3
    con = sqlite3.connect(path)
    tags = dict(con.execute("SELECT entry_id, count(*) FROM entry_tags GROUP BY entry_id"))
    con.close()
    assert all(tags.get(i) == 2 for i in stored)  # an entry and its tags: all or nothing
    with open_log(path) as log:  # and halftrip opens it as usual
        assert len(log.entries(job)) == len(stored)


def test_two_writers_at_once_both_save_or_one_is_told_busy(db):
    path, job = db
    count = 120
    procs = {name: _writer(path, job, count, name) for name in ("tui", "cli")}
    printed = {}
    for name, proc in procs.items():
        out, err = proc.communicate(timeout=120)
        ids = [int(x) for x in out.split()]
        printed[name] = ids
        if proc.returncode == 0:
            assert len(ids) == count
        else:  # allowed: a clear busy message, and nothing half-saved
            assert proc.returncode == 2 and "busy, retried" in err, err
    stored = _stored(path)
    assert _integrity(path) == ["ok"]
    all_ids = printed["tui"] + printed["cli"]
    assert len(set(all_ids)) == len(all_ids)
    assert sorted(stored) == sorted(all_ids)  # every save that returned, nothing else
    for name, ids in printed.items():
        assert [stored[i] for i in ids] == [(name, i) for i in range(len(ids))]


def test_open_interface_and_cli_call_at_once(db):
    """A long-lived connection (as the terminal interface holds) saving continuously while
    command-line saves run in other processes."""
    path, job = db
    stop = threading.Event()
    saved_here = []
    with open_log(path) as log:
        def keep_saving():
            i = 0
            while not stop.is_set():
                saved_here.append(log.add_entry(job, "note", {"i": i}, {"i": i}).id)
                i += 1

        thread = threading.Thread(target=keep_saving)
        thread.start()
        try:
            calls = [subprocess.run(
                [sys.executable, "-m", "tui.cli", "log", "add", "--db", str(path), "--job",
                 str(job), "--kind", "locate", "--label", f"feeder {n}", "--input",
                 '{"delay": "245 ns"}', "--result", '{"distance_m": 24.238}', "--json"],
                capture_output=True, text=True, cwd=ROOT, env=_env(), timeout=60)
                for n in range(3)]
        finally:
            stop.set()
            thread.join()
        for call in calls:
            assert call.returncode == 0, call.stderr
        cli_ids = [json.loads(c.stdout)["entry"]["id"] for c in calls]
        stored = {e.id: e for e in log.entries(job)}
    assert saved_here and set(saved_here) | set(cli_ids) == set(stored)
    assert [stored[i].label for i in cli_ids] == ["feeder 0", "feeder 1", "feeder 2"]
    assert _integrity(path) == ["ok"]


def test_cli_told_busy_when_the_file_stays_locked(db):
    path, job = db
    holder = sqlite3.connect(path, isolation_level=None)
    holder.execute("BEGIN IMMEDIATE")  # another program keeps the write lock throughout
    try:
        call = subprocess.run(
            [sys.executable, "-m", "tui.cli", "log", "add", "--db", str(path), "--job", str(job),
             "--kind", "note", "--label", "vault 3"],
            capture_output=True, text=True, cwd=ROOT, env=_env(), timeout=60)
    finally:
        holder.execute("ROLLBACK")
        holder.close()
    assert call.returncode == 2
    assert call.stderr.count("\n") == 1
    assert "busy, retried 2 times" in call.stderr and "nothing was saved" in call.stderr
    assert _stored(path) == {}
