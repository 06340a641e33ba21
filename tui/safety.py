"""The safety cautions: loaded from ``tui/safety_text.toml`` (format in its header).

* :func:`load_text` reads and checks the text once (cached) and gives a
  :class:`SafetyText` with its :attr:`SafetyText.version`, a hash of the parsed
  content.
* :func:`cautions_for` picks the sections for some hazard tags (the general
  cautions first, then each tag's section and the sections it points to);
  :func:`one_line_caution` is the single line a CLI command prints on stderr;
  :func:`warning_line` is the line a TUI panel shows; :func:`text_lines`
  lays sections out for a terminal or a panel.
* The first-start notice is acknowledged per text version: the version is
  kept in the ``[safety]`` table of the preferences file (:mod:`tui.prefs`);
  :func:`notice_needed` compares it with the current text, and
  :func:`acknowledgement` gives the keys to store.
"""

from __future__ import annotations

import hashlib
import json
import textwrap
import tomllib
from dataclasses import dataclass
from datetime import UTC, datetime
from functools import lru_cache
from pathlib import Path

TEXT_PATH = Path(__file__).resolve().parent / "safety_text.toml"
KINDS = ("general", "tag", "topic")
PREFS_TABLE = "safety"  # the preferences table this module owns


@dataclass(frozen=True)
class Rule:
    id: str
    name: str  # the designation, e.g. "NFPA 70E"
    covers: str


@dataclass(frozen=True)
class Voltage:
    what: str
    value: str
    source: str  # a named standard, or "common practice"


@dataclass(frozen=True)
class Section:
    id: str  # a hazard tag (kind "tag") or a topic id
    kind: str
    title: str
    label: str  # its name in the Safety panel's list
    points: tuple[str, ...]
    rules: tuple[Rule, ...]
    voltages: tuple[Voltage, ...] = ()
    also: tuple[str, ...] = ()
    short: str = ""  # tags only: a few words naming the hazard


@dataclass(frozen=True)
class SafetyText:
    notice_title: str
    notice_text: str
    precedence: str
    one_line: str
    warning_tagged: str
    warning_marked: str
    rules: dict[str, Rule]
    sections: dict[str, Section]  # in file order
    version: str  # hash of the parsed content

    @property
    def tags(self) -> tuple[str, ...]:
        return tuple(s.id for s in self.sections.values() if s.kind == "tag")


class SafetyTextError(ValueError):
    """The caution text file is malformed (a fault in the program's own data)."""


def _text(table: dict, key: str, where: str) -> str:
    value = table.get(key)
    if not isinstance(value, str) or not value.strip():
        raise SafetyTextError(f"{where}: {key!r} must be non-empty text")
    return value.strip()


def _section(sid: str, raw: dict, rules: dict[str, Rule]) -> Section:
    where = f"section {sid!r}"
    kind = _text(raw, "kind", where)
    if kind not in KINDS:
        raise SafetyTextError(f"{where}: kind {kind!r}; use one of {KINDS}")
    points = raw.get("points", [])
    if not points or not all(isinstance(p, str) and p.strip() for p in points):
        raise SafetyTextError(f"{where}: 'points' must be a non-empty list of text")
    rule_ids = raw.get("rules", [])
    missing = [r for r in rule_ids if r not in rules]
    if not rule_ids or missing:
        raise SafetyTextError(f"{where}: 'rules' must name [rules] tables (unknown: {missing})")
    voltages = tuple(Voltage(_text(v, "what", where), _text(v, "value", where),
                             _text(v, "source", where)) for v in raw.get("voltages", []))
    return Section(
        id=sid, kind=kind, title=_text(raw, "title", where), label=_text(raw, "label", where),
        points=tuple(p.strip() for p in points),
        rules=tuple(rules[r] for r in rule_ids),
        voltages=voltages, also=tuple(raw.get("also", [])),
        short=_text(raw, "short", where) if kind == "tag" else "",
    )


def parse_text(data: dict) -> SafetyText:
    """Check parsed TOML and build a :class:`SafetyText` (raises :class:`SafetyTextError`)."""
    rules = {rid: Rule(rid, _text(r, "name", f"rule {rid!r}"), _text(r, "covers", f"rule {rid!r}"))
             for rid, r in data.get("rules", {}).items()}
    sections = {sid: _section(sid, raw, rules) for sid, raw in data.get("section", {}).items()}
    for s in sections.values():
        unknown = [a for a in s.also if a not in sections]
        if unknown:
            raise SafetyTextError(f"section {s.id!r}: 'also' names unknown sections {unknown}")
    if [s.kind for s in sections.values()].count("general") != 1:
        raise SafetyTextError("exactly one section must be of kind 'general'")
    canonical = json.dumps(data, sort_keys=True, ensure_ascii=True, separators=(",", ":"))
    return SafetyText(
        notice_title=_text(data.get("notice", {}), "title", "[notice]"),
        notice_text=_text(data.get("notice", {}), "text", "[notice]"),
        precedence=_text(data.get("precedence", {}), "text", "[precedence]"),
        one_line=_text(data.get("one_line", {}), "text", "[one_line]"),
        warning_tagged=_text(data.get("warning_line", {}), "tagged", "[warning_line]"),
        warning_marked=_text(data.get("warning_line", {}), "marked", "[warning_line]"),
        rules=rules,
        sections=sections,
        version=hashlib.sha256(canonical.encode()).hexdigest()[:16],
    )


@lru_cache(maxsize=4)
def load_text(path: Path = TEXT_PATH) -> SafetyText:
    """The caution text from ``path`` (default: the shipped file), read once."""
    with Path(path).open("rb") as fh:
        return parse_text(tomllib.load(fh))


def text_version() -> str:
    """The version of the shipped caution text (changes whenever any text does)."""
    return load_text().version


def general() -> Section:
    return next(s for s in load_text().sections.values() if s.kind == "general")


def cautions_for(tags=()) -> list[Section]:
    """The general cautions, each tag's section, then the sections they point to.

    Tags with no section of their own are skipped (the test suite makes sure
    every catalog tag has one). With no tags: the general cautions and the
    sections they point to.
    """
    sections = load_text().sections
    order = list(dict.fromkeys([general().id] + [t for t in tags if t in sections]))
    for sid in order:  # grows while it is walked: breadth first through 'also'
        order.extend(a for a in sections[sid].also if a not in order)
    return [sections[sid] for sid in order]


def _hazard_phrases(tags) -> str:
    sections = load_text().sections
    return "; ".join(sections[t].short if t in sections else f"tagged {t}" for t in tags)


def one_line_caution(tags) -> str:
    """One line for stderr when a command uses a cable with these hazard tags."""
    tags = list(dict.fromkeys(tags))
    tag_options = " ".join(f"--tag {t}" for t in tags)
    return load_text().one_line.format(hazards=_hazard_phrases(tags), tags=tag_options)


def warning_line(tags=(), possibly_live: bool = False) -> str:
    """The warning line a panel shows, or "" when there is nothing to warn of."""
    tags = list(dict.fromkeys(tags))
    text = load_text()
    if tags:
        return text.warning_tagged.format(tags=", ".join(tags))
    return text.warning_marked if possibly_live else ""


# ------------------------------------------------------------ layout

def text_lines(sections, width: int = 78) -> list[tuple[str, str]]:
    """Sections laid out as ``(kind, line)`` pairs, lines at most ``width`` wide.

    ``kind`` is "heading", "point", "voltage", "rule", "label" or "blank", so a
    panel can style what the terminal prints plainly. The precedence
    statement closes every layout.
    """
    width = max(width, 30)
    out: list[tuple[str, str]] = []

    def wrap(kind: str, text: str, first: str, rest: str) -> None:
        for line in textwrap.wrap(text, width, initial_indent=first, subsequent_indent=rest,
                                  break_on_hyphens=False):
            out.append((kind, line))

    for section in sections:
        out.append(("heading", section.title))
        for point in section.points:
            wrap("point", point, "  - ", "    ")
        if section.voltages:
            out.append(("label", "  Voltages met on such lines:"))
            for v in section.voltages:
                wrap("voltage", f"{v.what}: {v.value} [{v.source}]", "    ", "      ")
        out.append(("label", "  Consult:"))
        for rule in section.rules:
            wrap("rule", f"{rule.name}: {rule.covers}", "    ", "      ")
        out.append(("blank", ""))
    wrap("heading", load_text().precedence, "", "")
    return out


def section_record(section: Section) -> dict:
    """A section as a JSON record (``halftrip safety --json``)."""
    return {
        "id": section.id,
        "kind": section.kind,
        "title": section.title,
        "hazard": section.short or None,
        "points": list(section.points),
        "voltages": [{"what": v.what, "value": v.value, "source": v.source}
                     for v in section.voltages],
        "rules": [{"id": r.id, "name": r.name, "covers": r.covers} for r in section.rules],
        "also": list(section.also),
    }


# ------------------------------------------------------------ first-start notice

ACK_KEY = "acknowledged_text_version"


def acknowledged_version(prefs=None) -> str | None:
    """The caution-text version last acknowledged (None: never, or unreadable file).

    ``prefs`` is a :class:`tui.prefs.Preferences` (default: read the file).
    """
    if prefs is None:
        from tui.prefs import load_preferences

        prefs = load_preferences()
    value = prefs.section(PREFS_TABLE).get(ACK_KEY)
    return value if isinstance(value, str) else None


def notice_needed(prefs=None) -> bool:
    """True when the first-start notice must be shown (never acknowledged, or text changed)."""
    return acknowledged_version(prefs) != text_version()


def acknowledgement(version: str | None = None) -> dict[str, str]:
    """The keys of the ``[safety]`` preferences table that record an acknowledgement.

    The app stores them with ``app.update_section(PREFS_TABLE, **acknowledgement())``
    (:mod:`tui.prefs` keeps every other key and writes atomically).
    """
    return {ACK_KEY: version or text_version(),
            "acknowledged_at": datetime.now(UTC).strftime("%Y-%m-%dT%H:%M:%SZ")}
