"""Damaged user files for the file-fault tests (imported as a plain module).

Each fault turns a good file (the user catalog, the preferences, the job
database) into what a person might find after a crash, a full disk, a bad
copy or a newer halftrip: :func:`damage` applies one and returns a
:class:`Snapshot` to check later that nothing touched it.
"""

from __future__ import annotations

import pathlib
import struct
import tempfile
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

#: A good user catalog (ends with a string value, so cutting 5 bytes breaks it).
GOOD_CATALOG = (
    b"# my cables\n\n[[cable]]\nid = \"roof-feeder\"\ndescription = \"measured feeder\"\n"
    b"category = \"coax\"\nz0_ohm = 50.0\nvf = 0.83\nvf_tolerance = 0.01\n"
    b"source = \"measured on the roof\"\n")
#: Good preferences (ends with a string value too).
GOOD_PREFS = b"units = \"imperial\"\nfraction = 32\n\n[safety]\nnote = \"kept\"\n"

#: What a newer halftrip might write: keys and fields this version does not know.
NEWER = {
    "catalog": b"format = 2\n\n" + GOOD_CATALOG + b"temperature_coefficient = 0.0004\n",
    "prefs": b"screen_reader = true\n" + GOOD_PREFS + b"\n[plots]\nstyle = \"dots\"\n",
}
GOOD = {"catalog": GOOD_CATALOG, "prefs": GOOD_PREFS}
FILES = ("catalog", "prefs", "db")

#: Faults after which the file cannot be read at all (so it must never be written over).
UNREADABLE = ("corrupt", "truncated", "binary", "directory", "no-permission")
FAULTS = (*UNREADABLE, "empty", "newer")


@lru_cache(maxsize=1)
def good_db() -> bytes:
    """A job log with one job and one entry, made by the program itself."""
    from tui.joblog.db import open_log

    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "jobs.sqlite3"
        with open_log(path) as log:
            job = log.new_job("Marsh Lane relay", date_text="2026-05-04")
            log.add_entry(job.id, "locate", {"delay": "245 ns"}, {"distance_m": 24.24},
                          label="feeder 1")
        return path.read_bytes()


def good(which: str) -> bytes:
    return good_db() if which == "db" else GOOD[which]


def newer(which: str) -> bytes:
    """What a newer halftrip might leave: keys this version does not know, or (the job
    log) a schema version above this program's (SQLite header bytes 60-63)."""
    if which != "db":
        return NEWER[which]
    from tui.joblog.schema import CURRENT_VERSION

    data = bytearray(good_db())
    data[60:64] = struct.pack(">I", CURRENT_VERSION + 1)
    return bytes(data)


@dataclass(frozen=True)
class Snapshot:
    path: Path
    content: bytes | None  # None: a directory stands where the file should be

    def unchanged(self) -> bool:
        if self.content is None:
            return self.path.is_dir() and not any(self.path.iterdir())
        if not self.path.is_file():
            return False
        with open(self.path, "rb") as fh:  # builtin open: refuse_opening patches Path.open
            return fh.read() == self.content


def damage(which: str, fault: str, path: Path, monkeypatch) -> Snapshot:
    """Put ``which`` (one of :data:`FILES`) at ``path`` with ``fault`` applied."""
    path.parent.mkdir(parents=True, exist_ok=True)
    whole = good(which)
    if fault == "directory":  # unreadable: tests run as root, so chmod 000 would not stop us
        path.mkdir()
        return Snapshot(path, None)
    content = {
        "corrupt": b"this line is not = = TOML\n" + whole,
        # the TOML files end in a string value, so 5 bytes off leaves it open; half a
        # database loses pages
        "truncated": whole[:len(whole) // 2] if which == "db" else whole[:-5],
        "binary": b"\xff\xfe\x00\x81 not text at all",
        "empty": b"",
        "newer": newer(which),
        "no-permission": whole,
    }[fault]
    path.write_bytes(content)
    if fault == "no-permission":
        refuse_opening(path, monkeypatch)
    return Snapshot(path, content)


def refuse_opening(path: Path, monkeypatch) -> None:
    """Opening ``path`` fails as a file without read permission would (as root,
    chmod 000 does not stop a read)."""
    original = pathlib.Path.open
    target = Path(path).resolve()

    def guarded(self, *args, **kwargs):
        if Path(self).resolve() == target:
            raise PermissionError(13, "Permission denied", str(self))
        return original(self, *args, **kwargs)

    monkeypatch.setattr(pathlib.Path, "open", guarded)
