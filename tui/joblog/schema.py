"""The job log's file format: SQLite schema, its version and forward migrations.

The schema version lives in ``PRAGMA user_version``; ``PRAGMA application_id``
marks the file as a halftrip job log. A new file is built by running every
migration from version 0, so a fresh file and a migrated old file take the same
path. Migrations only ever go forward, each in the caller's one transaction.

Version history (never edit a released step; add a new one):

1. jobs (site, date, notes) and entries (kind, inputs as typed, result, cable,
   label, note, created time).
2. tags (``entry_tags``), an entry's modified time, soft deletion
   (``deleted_at``) so a delete can be undone, and an index for a job's
   entries. Existing entries get ``modified_at = created_at``.

Before anything opens a file for writing, :func:`check_header` reads its first
100 bytes with plain file I/O (the SQLite header: magic string, user_version at
offset 60, application_id at offset 68, both big-endian), so a file that is not
a database or was written by a newer halftrip is refused without SQLite ever
touching it.
"""

from __future__ import annotations

import sqlite3
import struct
from collections.abc import Callable
from pathlib import Path

APPLICATION_ID = 0x68616C66  # b"half"
SQLITE_MAGIC = b"SQLite format 3\x00"
HEADER_SIZE = 100

_V1 = """
CREATE TABLE jobs (
    id          INTEGER PRIMARY KEY,
    site        TEXT NOT NULL,
    date        TEXT NOT NULL,
    notes       TEXT NOT NULL DEFAULT '',
    created_at  TEXT NOT NULL
);
CREATE TABLE entries (
    id          INTEGER PRIMARY KEY,
    job_id      INTEGER NOT NULL REFERENCES jobs(id),
    kind        TEXT NOT NULL,
    inputs      TEXT NOT NULL,
    result      TEXT NOT NULL,
    cable       TEXT,
    label       TEXT NOT NULL DEFAULT '',
    note        TEXT NOT NULL DEFAULT '',
    created_at  TEXT NOT NULL
);
"""

_V2 = """
ALTER TABLE entries ADD COLUMN modified_at TEXT;
ALTER TABLE entries ADD COLUMN deleted_at TEXT;
UPDATE entries SET modified_at = created_at;
CREATE TABLE entry_tags (
    entry_id    INTEGER NOT NULL REFERENCES entries(id) ON DELETE CASCADE,
    tag         TEXT NOT NULL,
    PRIMARY KEY (entry_id, tag)
) WITHOUT ROWID;
CREATE INDEX entries_by_job ON entries(job_id, deleted_at);
CREATE INDEX entries_by_deletion ON entries(deleted_at);
"""


def _script(sql: str) -> Callable[[sqlite3.Connection], None]:
    def step(con: sqlite3.Connection) -> None:
        # executescript() would COMMIT first; run statement by statement so the
        # step stays inside the caller's transaction.
        for statement in sql.split(";"):
            if statement.strip():
                con.execute(statement)

    return step


def _to_v1(con: sqlite3.Connection) -> None:
    con.execute(f"PRAGMA application_id = {APPLICATION_ID}")
    _script(_V1)(con)


# MIGRATIONS[n] takes a file from version n to version n + 1.
MIGRATIONS: tuple[Callable[[sqlite3.Connection], None], ...] = (_to_v1, _script(_V2))
CURRENT_VERSION = len(MIGRATIONS)
TABLES_BY_VERSION = {1: {"jobs", "entries"}, 2: {"jobs", "entries", "entry_tags"}}


def migrate(con: sqlite3.Connection, from_version: int) -> None:
    """Run every step from ``from_version`` to :data:`CURRENT_VERSION` (caller's transaction)."""
    for version in range(from_version, CURRENT_VERSION):
        MIGRATIONS[version](con)
    con.execute(f"PRAGMA user_version = {CURRENT_VERSION}")


class HeaderProblem(Exception):
    """The file's first bytes say it is not a job log this program can open."""


def check_header(path: Path) -> int:
    """The file's schema version from its header, or :class:`HeaderProblem`.

    Reads only; never creates side files. A file whose latest changes are still
    in its write-ahead log may show an older version here; the caller checks
    again through SQLite.
    """
    with Path(path).open("rb") as fh:
        header = fh.read(HEADER_SIZE)
    if not header:
        raise HeaderProblem("is an empty file, not a job log")
    if len(header) < HEADER_SIZE or not header.startswith(SQLITE_MAGIC):
        raise HeaderProblem("is not a SQLite database (not a job log)")
    user_version, = struct.unpack(">I", header[60:64])
    application_id, = struct.unpack(">I", header[68:72])
    check_identity(user_version, application_id)
    return user_version


def check_identity(user_version: int, application_id: int) -> None:
    """Refuse another program's database and a newer halftrip's job log."""
    if application_id not in (0, APPLICATION_ID):
        raise HeaderProblem(f"is another program's database (application id {application_id:#x})")
    if user_version > CURRENT_VERSION:
        raise HeaderProblem(
            f"was written by a newer halftrip (job log schema version {user_version}; this "
            f"program reads up to version {CURRENT_VERSION}); update halftrip to open it")
