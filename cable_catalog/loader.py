"""Load the shipped catalog and the user's own cables into one validated catalog.

The shipped files sit beside this module (``*.toml``; the format is
documented at the top of ``coax.toml``). The user's file, usually
``cables.toml`` in the user data directory, has the same format. A broken
user file never stops the program: its problems are reported (file, entry,
field) and the built-in catalog stays usable. The user's file is never
rewritten; :func:`append_user_cable` adds a table to it atomically.
"""

from __future__ import annotations

import math
import os
import re
import tempfile
import tomllib
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING

if TYPE_CHECKING:  # at run time imported where cables are built: it brings numpy
    from calc.cable import Cable

CATALOG_DIR = Path(__file__).resolve().parent
CATEGORIES = ("coax", "twisted-pair", "twin-lead", "power")
HAZARD_TAGS = ("power", "telephone", "plant-power", "poe", "rf-transmitter", "stored-charge")
_ID = re.compile(r"^[a-z0-9][a-z0-9._/-]{0,47}$")
_REQUIRED = ("id", "description", "category", "z0_ohm", "vf", "vf_tolerance", "source")
_OPTIONAL = ("dielectric", "atten_k1", "atten_k2", "hazards", "notes")


@dataclass(frozen=True)
class Dielectric:
    id: str
    name: str
    eps_r: float
    eps_r_low: float
    eps_r_high: float
    source: str

    @property
    def vf(self) -> float:
        return 1.0 / math.sqrt(self.eps_r)


@dataclass(frozen=True)
class Catalog:
    """The merged catalog: built-in cables, the user's, and what went wrong."""

    cables: dict[str, Cable]
    dielectrics: dict[str, Dielectric]
    problems: tuple[str, ...] = ()
    user_file: Path | None = None

    def get(self, cable_id: str) -> Cable:
        """The cable with ``cable_id``; KeyError names near matches."""
        key = cable_id.strip().lower()
        if key in self.cables:
            return self.cables[key]
        import difflib

        near = difflib.get_close_matches(key, list(self.cables), n=3)
        hint = f"; did you mean {', '.join(near)}?" if near else ""
        raise KeyError(f"no cable {cable_id!r} in the catalog{hint}")

    def by_category(self, category: str | None = None) -> list[Cable]:
        cables = sorted(self.cables.values(), key=lambda c: (c.category, c.z0_ohm, c.id))
        if category:
            cables = [c for c in cables if c.category == category]
        return cables


@dataclass
class _Report:
    problems: list[str] = field(default_factory=list)

    def add(self, where: str, text: str) -> None:
        self.problems.append(f"{where}: {text}")


def _number(entry: dict, key: str, where: str, report: _Report, lo: float, hi: float,
            lo_open: bool = False) -> float | None:
    value = entry.get(key)
    if isinstance(value, bool) or not isinstance(value, int | float):
        report.add(where, f"field {key!r} must be a number, got {value!r}")
        return None
    value = float(value)
    bad = not math.isfinite(value) or value > hi or value < lo or (lo_open and value == lo)
    if bad:
        bracket = "(" if lo_open else "["
        report.add(where, f"field {key!r} = {value!r} is outside {bracket}{lo:g}, {hi:g}]")
        return None
    return value


def _cable(entry: object, where: str, origin: str, report: _Report) -> Cable | None:
    from calc.cable import Cable  # numpy: not needed to build the CLI's parser

    if not isinstance(entry, dict):
        report.add(where, "a [[cable]] entry must be a table")
        return None
    start = len(report.problems)
    for key in _REQUIRED:
        if key not in entry:
            report.add(where, f"missing field {key!r}")
    unknown = set(entry) - set(_REQUIRED) - set(_OPTIONAL)
    for key in sorted(unknown):
        import difflib

        near = difflib.get_close_matches(key, _REQUIRED + _OPTIONAL, n=1)
        hint = f" (did you mean {near[0]!r}?)" if near else ""
        report.add(where, f"unknown field {key!r}{hint}")
    if len(report.problems) > start:
        return None
    cid = entry["id"]
    if not isinstance(cid, str) or not _ID.match(cid):
        report.add(where, f"field 'id' = {cid!r}: use lower case letters, digits and - . / _")
        return None
    for key in ("description", "source"):
        if not isinstance(entry[key], str) or not entry[key].strip():
            report.add(where, f"field {key!r} must be non-empty text")
    if entry["category"] not in CATEGORIES:
        report.add(where, f"field 'category' = {entry['category']!r}; use one of {CATEGORIES}")
    z0 = _number(entry, "z0_ohm", where, report, 0.0, 10_000.0, lo_open=True)
    vf = _number(entry, "vf", where, report, 0.0, 1.0, lo_open=True)
    tol = _number(entry, "vf_tolerance", where, report, 0.0, 0.5)
    k1 = k2 = None
    if "atten_k1" in entry:
        k1 = _number(entry, "atten_k1", where, report, 0.0, 1000.0)
    if "atten_k2" in entry:
        k2 = _number(entry, "atten_k2", where, report, 0.0, 1000.0)
    hazards = entry.get("hazards", [])
    if not isinstance(hazards, list) or any(h not in HAZARD_TAGS for h in hazards):
        report.add(where, f"field 'hazards' = {hazards!r}; tags are {HAZARD_TAGS}")
    for key in ("dielectric", "notes"):
        if key in entry and not isinstance(entry[key], str):
            report.add(where, f"field {key!r} must be text")
    if len(report.problems) > start:
        return None
    return Cable(
        id=cid,
        description=entry["description"].strip(),
        category=entry["category"],
        z0_ohm=z0,
        vf=vf,
        vf_tolerance=tol,
        source=entry["source"].strip(),
        dielectric=entry.get("dielectric", ""),
        atten_k1=k1,
        atten_k2=k2,
        hazards=tuple(hazards),
        notes=entry.get("notes", ""),
        origin=origin,
    )


def _read_toml(path: Path, report: _Report) -> dict | None:
    try:
        with path.open("rb") as fh:
            raw = fh.read()
        if not raw.strip():  # a file cut to nothing (a crashed editor, a full disk)
            report.add(str(path), "the file is empty, so no cables were read from it; "
                                  "file left as it is")
            return None
        return tomllib.loads(raw.decode("utf-8"))
    except FileNotFoundError:
        return None
    except tomllib.TOMLDecodeError as exc:
        report.add(str(path), f"not valid TOML ({exc}); file left as it is")
    except (OSError, UnicodeDecodeError) as exc:
        report.add(str(path), f"cannot read ({exc.__class__.__name__}: {exc}); file left as it is")
    return None


def _cables_from(data: dict, path: Path, origin: str, report: _Report,
                 into: dict[str, Cable]) -> None:
    for key in sorted(set(data) - {"cable"}):  # a newer halftrip's addition, or a typo
        report.add(str(path), f"unknown top-level key {key!r} (only [[cable]] tables are "
                              "read); ignored and kept in the file")
    entries = data.get("cable", [])
    if not isinstance(entries, list):
        report.add(str(path), "'cable' must be an array of tables ([[cable]])")
        return
    for i, entry in enumerate(entries, start=1):
        label = entry.get("id", "?") if isinstance(entry, dict) else "?"
        where = f"{path} entry {i} ({label})"
        cable = _cable(entry, where, origin, report)
        if cable is None:
            continue
        if cable.id in into:
            report.add(where, f"id {cable.id!r} is already in the catalog; entry skipped")
            continue
        into[cable.id] = cable


def _dielectrics(report: _Report) -> dict[str, Dielectric]:
    path = CATALOG_DIR / "dielectrics.toml"
    data = _read_toml(path, report) or {}
    out = {}
    for d in data.get("dielectric", []):
        out[d["id"]] = Dielectric(d["id"], d["name"], float(d["eps_r"]), float(d["eps_r_low"]),
                                  float(d["eps_r_high"]), d["source"])
    return out


def load_catalog(user_file: Path | None = None) -> Catalog:
    """The built-in catalog merged with ``user_file`` (if given and present)."""
    report = _Report()
    cables: dict[str, Cable] = {}
    for path in sorted(CATALOG_DIR.glob("*.toml")):
        if path.name == "dielectrics.toml":
            continue
        data = _read_toml(path, report)
        if data is not None:
            _cables_from(data, path, "built-in", report, cables)
    if user_file is not None:
        data = _read_toml(Path(user_file), report)
        if data is not None:
            _cables_from(data, Path(user_file), "user", report, cables)
    return Catalog(cables, _dielectrics(report), tuple(report.problems),
                   Path(user_file) if user_file else None)


#: TOML basic-string escapes; other control characters are written as \uXXXX.
_ESCAPES = {"\\": "\\\\", '"': '\\"', "\b": "\\b", "\t": "\\t", "\n": "\\n", "\f": "\\f",
            "\r": "\\r"}


def _toml_string(text: str) -> str:
    """``text`` as a TOML basic string. Control characters (a pasted description
    can hold them) are escaped: written raw, they make the whole file unreadable."""
    out = []
    for ch in text:
        if ch in _ESCAPES:
            out.append(_ESCAPES[ch])
        elif ord(ch) < 0x20 or ord(ch) == 0x7F:
            out.append(f"\\u{ord(ch):04x}")
        else:
            out.append(ch)
    return '"' + "".join(out) + '"'


def _toml_value(value: object) -> str:
    if isinstance(value, str):
        return _toml_string(value)
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, float):
        return repr(value)
    if isinstance(value, int):
        return str(value)
    if isinstance(value, list | tuple):
        return "[" + ", ".join(_toml_value(v) for v in value) + "]"
    raise TypeError(f"cannot write {value!r} to TOML")


def cable_table(entry: dict) -> str:
    """One ``[[cable]]`` table as TOML text, fields in the documented order."""
    lines = ["[[cable]]"]
    for key in _REQUIRED + _OPTIONAL:
        if key in entry and entry[key] not in (None, "", (), []):
            lines.append(f"{key} = {_toml_value(entry[key])}")
    return "\n".join(lines) + "\n"


class CatalogWriteError(ValueError):
    """The user catalog could not be added to; nothing was written."""


def append_user_cable(user_file: Path, entry: dict) -> Cable:
    """Validate ``entry`` and append it to ``user_file`` atomically.

    The existing text (comments included) is kept byte for byte; the new
    table is added at the end; the result is written to a temporary file in
    the same directory and renamed over the original, so a crash leaves
    either the old file or the new one. A user file that does not parse, or
    an id already in the catalog, is refused and nothing is written.
    """
    user_file = Path(user_file)
    report = _Report()
    new = _cable(entry, f"new cable {entry.get('id', '?')!r}", "user", report)
    if new is None:
        raise CatalogWriteError(report.problems[0])
    existing = ""
    if user_file.exists():
        try:
            existing = user_file.read_text(encoding="utf-8")
            tomllib.loads(existing)
        except (OSError, UnicodeDecodeError, tomllib.TOMLDecodeError) as exc:
            raise CatalogWriteError(
                f"{user_file}: the file does not read cleanly ({exc}); fix it by hand first, "
                "nothing was written") from None
    catalog = load_catalog(user_file)
    if new.id in catalog.cables:
        raise CatalogWriteError(f"id {new.id!r} is already in the catalog; choose another id")
    if not existing:
        existing = ("# halftrip: your own cables. Same format as the shipped catalog "
                    "(see cable_catalog/coax.toml in the program).\n")
    text = existing.rstrip("\n") + "\n\n" + cable_table(entry)
    try:  # never write what would not read back (an unpaired surrogate from a bad terminal)
        tomllib.loads(text.encode("utf-8").decode("utf-8"))
    except (UnicodeError, tomllib.TOMLDecodeError) as exc:
        raise CatalogWriteError(f"this entry cannot be stored ({exc}); nothing was written"
                                ) from None
    try:
        user_file.parent.mkdir(parents=True, exist_ok=True)
        atomic_write_text(user_file, text)
    except OSError as exc:  # read-only or full disk: the old file is still there, whole
        raise CatalogWriteError(f"cannot write {user_file} ({exc.strerror or exc}); "
                                "nothing was written") from None
    return new


def atomic_write_text(path: Path, text: str) -> None:
    """Write ``text`` to ``path`` via a temporary file and rename (fsync'd)."""
    path = Path(path)
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    try:
        with os.fdopen(fd, "w", encoding="utf-8") as fh:
            fh.write(text)
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, path)
    except BaseException:
        try:
            os.unlink(tmp)
        except FileNotFoundError:
            pass
        raise
