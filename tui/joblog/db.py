"""The job log: jobs and their entries in one SQLite file (stdlib ``sqlite3``).

Guarantees, and how they are kept:

* Every change is one transaction (``BEGIN IMMEDIATE`` ... ``COMMIT``) in
  write-ahead-log mode with ``synchronous=FULL``: a save that has returned
  survives the process being killed, and a killed save leaves no trace.
* Another halftrip writing at the same moment is waited for (SQLite's busy
  timeout), then retried a bounded number of times; a save that still cannot
  get the file fails with :class:`JobLogBusy`, whose message says "busy" and
  how often it retried, and nothing is written. A save that succeeded only on
  a retry reports that through ``notice``.
* A file that is not a job log, is damaged (fails ``PRAGMA integrity_check``)
  or was written by a newer halftrip is refused with its path and left exactly
  as it was: it is checked from its header bytes and through a read-only
  connection before anything opens it for writing.
* A new file is built complete in a temporary file and linked into place, so
  no one ever sees a half-made job log. An older schema is migrated forward
  in one transaction after a copy of the old file is kept beside it.
* Deleting an entry only marks it; :meth:`JobLog.undo_delete` brings the most
  recently deleted entry back.

Times: ``created_at``/``modified_at`` are local time with UTC offset, to the
second (what the technician saw on site); ``deleted_at`` is UTC to the
microsecond, used to find the latest deletion.
"""

from __future__ import annotations

import json
import os
import re
import sqlite3
import tempfile
import threading
import time
from collections.abc import Callable, Iterable, Iterator
from contextlib import contextmanager
from dataclasses import dataclass
from datetime import UTC, date, datetime
from pathlib import Path

from calc.errors import InputError
from tui.joblog import schema

# Kinds of entry: one per calculation that can be saved (the Locate panel saves its run and
# both-ends modes as kinds of their own), plus a plain note.
KINDS = ("locate", "locate-run", "locate-two-ended", "calibrate", "cut", "match", "harness",
         "trim", "stub", "echo", "simulate", "trace", "note")
# Status tags exclude each other: an entry passes, fails or needs a recheck.
STATUS_TAGS = ("pass", "fail", "recheck")
_TAG = re.compile(r"^[a-z0-9][a-z0-9._/+-]{0,31}$")


class JobLogError(InputError):
    """The job log cannot do what was asked; the message names the file or the item."""

    def __init__(self, problem: str, example: str | None = None) -> None:
        super().__init__("job log", problem, example)

    def __reduce__(self):
        return (type(self), (self.problem, self.example))


class NoJobLog(JobLogError):
    """There is no job log file yet (only ``halftrip log new`` creates one)."""

    def __init__(self, path: str) -> None:
        self.path = path
        super().__init__(f"no file at {path} yet; start a job with 'halftrip log new SITE'")

    def __reduce__(self):
        return (type(self), (self.path,))


class JobLogBusy(JobLogError):
    """Another process kept the job log locked through every retry; nothing was written."""


@dataclass(frozen=True)
class Job:
    id: int
    site: str
    date: str  # YYYY-MM-DD
    notes: str
    created_at: str
    entry_count: int = 0

    def as_dict(self) -> dict:
        return {"id": self.id, "site": self.site, "date": self.date, "notes": self.notes,
                "created_at": self.created_at, "entry_count": self.entry_count}


@dataclass(frozen=True)
class Entry:
    id: int
    job_id: int
    kind: str
    inputs: dict  # as typed: option name -> text
    result: dict  # what the command emitted (JSON-ready)
    cable: str | None
    label: str
    note: str
    tags: tuple[str, ...]
    created_at: str
    modified_at: str
    deleted_at: str | None = None

    def as_dict(self) -> dict:
        return {"id": self.id, "job_id": self.job_id, "kind": self.kind, "label": self.label,
                "cable": self.cable, "note": self.note, "tags": list(self.tags),
                "created_at": self.created_at, "modified_at": self.modified_at,
                "deleted_at": self.deleted_at, "inputs": self.inputs, "result": self.result}


def _local_now() -> str:
    return datetime.now().astimezone().isoformat(timespec="seconds")


def _utc_now() -> str:
    return datetime.now(UTC).strftime("%Y-%m-%dT%H:%M:%S.%fZ")


def _json(value: dict, field: str) -> str:
    if not isinstance(value, dict):
        raise InputError(field, "must be a JSON object", '{"delay": "245 ns"}')
    try:
        return json.dumps(value, allow_nan=False, ensure_ascii=False)
    except (TypeError, ValueError) as exc:
        raise InputError(field, f"cannot be stored as JSON ({exc})", '{"delay": "245 ns"}') from None


def _text(value: str | None, field: str, *, required: bool = False, example: str = "") -> str:
    text = (value or "").strip()
    if required and not text:
        raise InputError(field, "must not be empty", example or None)
    if "\x00" in text:
        raise InputError(field, "contains a NUL character", example or None)
    return text


def normalise_tag(tag: str) -> str:
    """A tag as stored: lower case, trimmed; refused if it is not one short word."""
    t = (tag or "").strip().lower()
    if not _TAG.match(t):
        raise InputError("tag", f"{tag!r} is not a tag: one word of letters, digits and . _ / + -, "
                         "up to 32 characters", "recheck")
    return t


def parse_date(text: str | None) -> str:
    """``YYYY-MM-DD`` (today when empty)."""
    if not text:
        return date.today().isoformat()
    try:
        return date.fromisoformat(text.strip()).isoformat()
    except ValueError:
        raise InputError("--date", f"{text!r} is not a date as YYYY-MM-DD", "2026-12-01") from None


def open_log(path: Path | str | None = None, *, create: bool = True, busy_timeout_s: float = 1.0,
             retries: int = 2, notice: Callable[[str], None] | None = None) -> JobLog:
    """Open the job log at ``path`` (default :func:`tui.paths.job_db_path`).

    A missing file is created when ``create`` is true, else :class:`NoJobLog`.
    """
    if path is None:
        from tui.paths import job_db_path

        path = job_db_path()
    return JobLog(Path(path).expanduser(), create=create, busy_timeout_s=busy_timeout_s,
                  retries=retries, notice=notice)


class JobLog:
    """One open job log. Thread-safe (one lock); use as a context manager or call close()."""

    def __init__(self, path: Path, *, create: bool = True, busy_timeout_s: float = 1.0,
                 retries: int = 2, notice: Callable[[str], None] | None = None) -> None:
        self.path = path
        self.busy_timeout_s = busy_timeout_s
        self.retries = retries
        self._notice = notice or (lambda _text: None)
        self._lock = threading.RLock()
        if not self._exists():
            if not create:
                raise NoJobLog(str(path))
            self._create()
        self._check_readonly()
        self._con = self._connect()
        self._upgrade()

    # -- opening ---------------------------------------------------------------------------

    def _refuse(self, problem: str) -> JobLogError:
        return JobLogError(f"{self.path} {problem}; the file was left untouched "
                           "(move it aside or choose another file with --db)")

    def _exists(self) -> bool:
        try:
            self.path.stat()
        except FileNotFoundError:
            return False
        except OSError as exc:
            raise JobLogError(f"cannot reach {self.path} ({exc.strerror})") from None
        return True

    def _create(self) -> None:
        """Build a complete new job log in a temporary file, then link it into place."""
        try:
            self.path.parent.mkdir(parents=True, exist_ok=True)
            fd, tmp = tempfile.mkstemp(prefix=f".{self.path.name}.", suffix=".new",
                                       dir=self.path.parent)
        except OSError as exc:
            raise JobLogError(f"cannot create {self.path} ({exc.strerror})") from None
        os.close(fd)
        try:
            con = sqlite3.connect(tmp, isolation_level=None)
            try:
                con.execute("PRAGMA journal_mode = WAL")
                con.execute("BEGIN IMMEDIATE")
                schema.migrate(con, 0)
                con.execute("COMMIT")
            finally:
                con.close()
            with open(tmp, "rb+") as fh:
                os.fsync(fh.fileno())
            try:
                os.link(tmp, self.path)  # fails if another process made the file first
            except FileExistsError:
                pass
            except OSError:  # no hard links on this file system
                if not self.path.exists():
                    os.replace(tmp, self.path)
            _fsync_dir(self.path.parent)
        except (OSError, sqlite3.Error) as exc:
            raise JobLogError(f"cannot create {self.path} ({exc}); nothing was written") from None
        finally:
            for leftover in (tmp, tmp + "-wal", tmp + "-shm"):
                try:
                    os.unlink(leftover)
                except FileNotFoundError:
                    pass

    def _check_readonly(self) -> None:
        """Refuse a file that is not a job log, is damaged or is newer, touching nothing."""
        try:
            schema.check_header(self.path)
        except schema.HeaderProblem as exc:
            raise self._refuse(str(exc)) from None
        except OSError as exc:
            raise JobLogError(f"cannot read {self.path} ({exc.strerror})") from None
        # With no write-ahead log (or rollback journal) beside it the file is the whole
        # truth: open it as immutable so not even a shared-memory side file is made.
        side = any(Path(f"{self.path}{s}").exists() for s in ("-wal", "-journal"))
        uri = self.path.resolve().as_uri() + ("?mode=ro" if side else "?immutable=1")
        try:
            con = sqlite3.connect(uri, uri=True, timeout=self.busy_timeout_s)
        except sqlite3.Error as exc:
            raise JobLogError(f"cannot open {self.path} ({exc})") from None
        try:
            version = con.execute("PRAGMA user_version").fetchone()[0]
            app_id = con.execute("PRAGMA application_id").fetchone()[0]
            schema.check_identity(version, app_id)
            rows = con.execute("PRAGMA integrity_check").fetchall()
            if rows != [("ok",)]:
                raise self._refuse("is damaged (integrity check: "
                                   + "; ".join(r[0] for r in rows[:3]) + ")")
            tables = {r[0] for r in con.execute(
                "SELECT name FROM sqlite_schema WHERE type = 'table'")}
        except schema.HeaderProblem as exc:
            raise self._refuse(str(exc)) from None
        except sqlite3.DatabaseError as exc:
            raise self._refuse(f"is damaged ({exc})") from None
        finally:
            con.close()
        expected = schema.TABLES_BY_VERSION.get(version, set())
        if version == 0 and tables:
            raise self._refuse("is a database of another program (not a job log)")
        if not expected <= tables:
            raise self._refuse(f"is damaged (schema version {version} but tables "
                               f"{', '.join(sorted(expected - tables))} are missing)")

    def _connect(self) -> sqlite3.Connection:
        try:
            con = sqlite3.connect(self.path, timeout=self.busy_timeout_s, isolation_level=None,
                                  check_same_thread=False)
            mode = con.execute("PRAGMA journal_mode = WAL").fetchone()[0]
            con.execute("PRAGMA synchronous = FULL")
            con.execute("PRAGMA foreign_keys = ON")
        except sqlite3.OperationalError as exc:
            if _is_busy(exc):
                raise JobLogBusy(f"busy: {self.path} is locked by another program; "
                                 "nothing was written, try again") from None
            raise JobLogError(f"cannot open {self.path} for writing ({exc})") from None
        if mode.lower() != "wal":
            self._notice(f"job log {self.path}: write-ahead logging is not available here "
                         f"(journal mode {mode}); saves are still one transaction each")
        return con

    def _upgrade(self) -> None:
        """Migrate an older schema forward, keeping a copy of the old file first."""
        version = self._con.execute("PRAGMA user_version").fetchone()[0]
        if version >= schema.CURRENT_VERSION:
            return
        backup = Path(f"{self.path}.schema{version}.bak")
        if version > 0 and not backup.exists():
            dst = sqlite3.connect(backup)
            try:
                self._con.backup(dst)
            finally:
                dst.close()
        with self._transaction() as con:
            now = con.execute("PRAGMA user_version").fetchone()[0]  # another process may have
            if now < schema.CURRENT_VERSION:                      # migrated meanwhile
                schema.migrate(con, now)
        if version > 0:
            self._notice(f"job log {self.path}: updated from schema version {version} to "
                         f"{schema.CURRENT_VERSION}; the old file was kept as {backup}")

    def close(self) -> None:
        with self._lock:
            self._con.close()

    def __enter__(self) -> JobLog:
        return self

    def __exit__(self, *exc) -> None:
        self.close()

    # -- transactions ----------------------------------------------------------------------

    @contextmanager
    def _transaction(self) -> Iterator[sqlite3.Connection]:
        """One write transaction, retried a bounded number of times while the file is busy."""
        with self._lock:
            started = time.monotonic()
            attempt = 0
            while True:
                try:
                    self._con.execute("BEGIN IMMEDIATE")
                    break
                except sqlite3.OperationalError as exc:
                    if not _is_busy(exc):
                        raise JobLogError(f"cannot write {self.path} ({exc})") from None
                    if attempt >= self.retries:
                        waited = time.monotonic() - started
                        raise JobLogBusy(
                            f"busy, retried {attempt} times over {waited:.1f} s: another "
                            f"halftrip is writing {self.path}; nothing was saved, try again"
                        ) from None
                    attempt += 1
                    time.sleep(0.1 * attempt)
            try:
                yield self._con
                self._con.execute("COMMIT")
            except BaseException:
                self._con.execute("ROLLBACK")
                raise
            if attempt:
                self._notice(f"job log was busy (another halftrip was writing); "
                             f"retried {attempt} time{'s' if attempt > 1 else ''}, saved")

    def _read(self, sql: str, params: Iterable = ()) -> list[sqlite3.Row]:
        with self._lock:
            cur = self._con.execute(sql, tuple(params))
            cur.row_factory = sqlite3.Row
            return cur.fetchall()

    # -- jobs ------------------------------------------------------------------------------

    _JOBS = ("SELECT j.*, (SELECT count(*) FROM entries e WHERE e.job_id = j.id "
             "AND e.deleted_at IS NULL) AS entry_count FROM jobs j")

    def new_job(self, site: str, notes: str = "", date_text: str | None = None) -> Job:
        site = _text(site, "SITE", required=True, example="Harbour Road substation")
        notes = _text(notes, "--note")
        day = parse_date(date_text)
        with self._transaction() as con:
            job_id = con.execute("INSERT INTO jobs (site, date, notes, created_at) "
                                 "VALUES (?, ?, ?, ?)", (site, day, notes, _local_now())).lastrowid
        return self.job(job_id)

    def edit_job(self, job_id: int, *, site: str | None = None, notes: str | None = None,
                 date_text: str | None = None) -> Job:
        self.job(job_id)
        changes = {}
        if site is not None:
            changes["site"] = _text(site, "--site", required=True, example="Harbour Road substation")
        if notes is not None:
            changes["notes"] = _text(notes, "--note")
        if date_text is not None:
            changes["date"] = parse_date(date_text)
        if changes:
            with self._transaction() as con:
                sets = ", ".join(f"{k} = ?" for k in changes)
                con.execute(f"UPDATE jobs SET {sets} WHERE id = ?", (*changes.values(), job_id))
        return self.job(job_id)

    def jobs(self) -> list[Job]:
        return [_job(r) for r in self._read(self._JOBS + " ORDER BY j.id DESC")]

    def job(self, job_id: int) -> Job:
        rows = self._read(self._JOBS + " WHERE j.id = ?", (job_id,))
        if not rows:
            raise JobLogError(f"there is no job {job_id} (see 'halftrip log list')")
        return _job(rows[0])

    def newest_job(self) -> Job | None:
        rows = self._read(self._JOBS + " ORDER BY j.id DESC LIMIT 1")
        return _job(rows[0]) if rows else None

    # -- entries ---------------------------------------------------------------------------

    def add_entry(self, job_id: int, kind: str, inputs: dict, result: dict, *, label: str = "",
                  note: str = "", cable: str | None = None, tags: Iterable[str] = ()) -> Entry:
        """Save one entry (and its tags) in one transaction; returns it as stored."""
        kind = _text(kind, "--kind", required=True, example="locate").lower()
        inputs_text = _json(inputs, "--input")
        result_text = _json(result, "--result")
        label = _text(label, "--label")
        note = _text(note, "--note")
        cable = _text(cable, "--cable") or None
        tag_list = _exclusive_status([normalise_tag(t) for t in tags])
        self.job(job_id)
        now = _local_now()
        with self._transaction() as con:
            entry_id = con.execute(
                "INSERT INTO entries (job_id, kind, inputs, result, cable, label, note, "
                "created_at, modified_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)",
                (job_id, kind, inputs_text, result_text, cable, label, note, now, now)).lastrowid
            con.executemany("INSERT INTO entry_tags (entry_id, tag) VALUES (?, ?)",
                            [(entry_id, t) for t in tag_list])
        return self.entry(entry_id)

    _ENTRIES = ("SELECT e.*, (SELECT group_concat(tag, ' ') FROM entry_tags t "
                "WHERE t.entry_id = e.id) AS tag_text FROM entries e")

    def entry(self, entry_id: int, *, include_deleted: bool = False) -> Entry:
        rows = self._read(self._ENTRIES + " WHERE e.id = ?", (entry_id,))
        if not rows or (rows[0]["deleted_at"] and not include_deleted):
            gone = " (it was deleted; 'halftrip log undo' brings back the last one)" if rows else ""
            raise JobLogError(f"there is no entry {entry_id}{gone}")
        return _entry(rows[0])

    def entries(self, job_id: int | None = None, *, tag: str | None = None,
                label: str | None = None, kind: str | None = None,
                deleted: bool = False) -> list[Entry]:
        """Entries, oldest first; ``label`` matches any part of the label, ignoring case."""
        where, params = ["e.deleted_at IS NOT NULL" if deleted else "e.deleted_at IS NULL"], []
        if job_id is not None:
            self.job(job_id)
            where.append("e.job_id = ?")
            params.append(job_id)
        if tag:
            where.append("EXISTS (SELECT 1 FROM entry_tags t WHERE t.entry_id = e.id "
                         "AND t.tag = ?)")
            params.append(normalise_tag(tag))
        if label:
            where.append("instr(lower(e.label), lower(?)) > 0")
            params.append(label.strip())
        if kind:
            where.append("e.kind = ?")
            params.append(kind.strip().lower())
        sql = self._ENTRIES + " WHERE " + " AND ".join(where) + " ORDER BY e.id"
        return [_entry(r) for r in self._read(sql, params)]

    def edit_entry(self, entry_id: int, *, label: str | None = None, note: str | None = None,
                   cable: str | None = None) -> Entry:
        self.entry(entry_id)
        changes = {}
        if label is not None:
            changes["label"] = _text(label, "--label")
        if note is not None:
            changes["note"] = _text(note, "--note")
        if cable is not None:
            changes["cable"] = _text(cable, "--cable") or None
        if changes:
            changes["modified_at"] = _local_now()
            with self._transaction() as con:
                sets = ", ".join(f"{k} = ?" for k in changes)
                con.execute(f"UPDATE entries SET {sets} WHERE id = ?",
                            (*changes.values(), entry_id))
        return self.entry(entry_id)

    def tag(self, entry_id: int, tags: Iterable[str], *, remove: bool = False) -> Entry:
        """Add (or remove) tags; a status tag (pass/fail/recheck) replaces the other two."""
        wanted = [normalise_tag(t) for t in tags]
        current = set(self.entry(entry_id).tags)
        if remove:
            return self.set_tags(entry_id, sorted(current - set(wanted)))
        if any(t in STATUS_TAGS for t in wanted):
            current -= set(STATUS_TAGS)
        return self.set_tags(entry_id, sorted(current) + wanted)

    def set_tags(self, entry_id: int, tags: Iterable[str]) -> Entry:
        """Make the entry's tags exactly ``tags`` (of several status tags the last one wins)."""
        new = _exclusive_status([normalise_tag(t) for t in tags])
        self.entry(entry_id)
        with self._transaction() as con:
            con.execute("DELETE FROM entry_tags WHERE entry_id = ?", (entry_id,))
            con.executemany("INSERT INTO entry_tags (entry_id, tag) VALUES (?, ?)",
                            [(entry_id, t) for t in sorted(new)])
            con.execute("UPDATE entries SET modified_at = ? WHERE id = ?", (_local_now(), entry_id))
        return self.entry(entry_id)

    def delete(self, entry_id: int) -> Entry:
        """Mark an entry deleted (:meth:`undo_delete` brings it back)."""
        self.entry(entry_id)
        with self._transaction() as con:
            con.execute("UPDATE entries SET deleted_at = ? WHERE id = ?", (_utc_now(), entry_id))
        return self.entry(entry_id, include_deleted=True)

    def undo_delete(self) -> Entry | None:
        """Bring back the most recently deleted entry; None if nothing is deleted."""
        with self._transaction() as con:
            row = con.execute("SELECT id FROM entries WHERE deleted_at IS NOT NULL "
                              "ORDER BY deleted_at DESC, id DESC LIMIT 1").fetchone()
            if row is None:
                return None
            con.execute("UPDATE entries SET deleted_at = NULL WHERE id = ?", (row[0],))
        return self.entry(row[0])

    def check(self) -> dict:
        """The file's path, schema version, integrity and counts (for ``halftrip log check``)."""
        with self._lock:
            integrity = [r[0] for r in self._con.execute("PRAGMA integrity_check")]
            counts = self._con.execute(
                "SELECT (SELECT count(*) FROM jobs), "
                "(SELECT count(*) FROM entries WHERE deleted_at IS NULL), "
                "(SELECT count(*) FROM entries WHERE deleted_at IS NOT NULL)").fetchone()
            mode = self._con.execute("PRAGMA journal_mode").fetchone()[0]
        return {"path": str(self.path), "schema_version": schema.CURRENT_VERSION,
                "journal_mode": mode, "integrity": "; ".join(integrity),
                "jobs": counts[0], "entries": counts[1], "deleted_entries": counts[2]}


def _fsync_dir(directory: Path) -> None:
    """Make a new directory entry durable (POSIX; a no-op where directories cannot be opened)."""
    try:
        fd = os.open(directory, os.O_RDONLY)
    except OSError:
        return
    try:
        os.fsync(fd)
    except OSError:
        pass
    finally:
        os.close(fd)


def _is_busy(exc: sqlite3.OperationalError) -> bool:
    text = str(exc).lower()
    return "locked" in text or "busy" in text


def _exclusive_status(tags: list[str]) -> list[str]:
    """Keep only the last status tag given; free tags stay. Order kept, repeats dropped."""
    status = [t for t in tags if t in STATUS_TAGS]
    keep = [t for t in tags if t not in STATUS_TAGS or t == status[-1]]
    return list(dict.fromkeys(keep))


def _job(row: sqlite3.Row) -> Job:
    return Job(row["id"], row["site"], row["date"], row["notes"], row["created_at"],
               row["entry_count"])


def _entry(row: sqlite3.Row) -> Entry:
    return Entry(
        id=row["id"], job_id=row["job_id"], kind=row["kind"], inputs=json.loads(row["inputs"]),
        result=json.loads(row["result"]), cable=row["cable"], label=row["label"],
        note=row["note"], tags=tuple(sorted((row["tag_text"] or "").split())),
        created_at=row["created_at"], modified_at=row["modified_at"] or row["created_at"],
        deleted_at=row["deleted_at"])
