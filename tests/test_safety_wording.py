"""No user-facing text states or implies that a line is safe.

Rule (DEVELOPERS.md, "Safety wording"): halftrip describes what to do and
never gives a verdict on a line. The scan covers every user-facing string of
the project: the caution text, the catalog, README and DEVELOPERS, data files
under tui/, and every string literal in tui/, calc/ and cable_catalog/ code
except docstrings. A match is allowed only when its clause (the text after
the previous , ; : . ! or ?, line breaks included) holds a negation before it, as in "halftrip
never tells you a line is safe" or "do not assume a cable is de-energized".
"""

from __future__ import annotations

import ast
import re
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]

VERDICTS = [
    # "safe"/"safely" as words; "safety", "unsafe" and "thread-safe" pass.
    r"(?<![\w-])safe(?:ly)?(?![\w-])",
    r"\b(?:is|are|was|were|now|confirmed|verified|proven|shown|tested|reads?)\s+"
    r"(?:to be\s+|as\s+)?(?:de-?energi[sz]ed|dead|isolated|clear|harmless)\b",
    r"\bde-?energi[sz]ed\s*(?:[.!]|$)",
    r"\bno (?:voltage|power|charge)(?: is)? (?:present|detected|found|there)\b",
    r"\b(?:ok|okay|clear|cleared|fine|good) to (?:connect|touch|work|cut|open|proceed|climb|go)\b",
    r"\bvoltage[- ]free\b",
    r"\bharmless\b",
    r"\bnot (?:live|energi[sz]ed)\b",
]
_VERDICT = re.compile("|".join(f"(?:{v})" for v in VERDICTS), re.IGNORECASE)
_NEGATION = re.compile(
    r"\b(?:never|not|no|nothing|cannot|can't|don't|doesn't|isn't|nor|neither|without)\b",
    re.IGNORECASE)
_CLAUSE_BREAK = re.compile(r"[,;:.!?]")


def verdicts(text: str) -> list[str]:
    """The phrases in ``text`` that state or imply a line is safe (negated ones pass)."""
    found = []
    for m in _VERDICT.finditer(text):
        breaks = [b.end() for b in _CLAUSE_BREAK.finditer(text, 0, m.start())]
        clause = text[breaks[-1] if breaks else 0:m.start()]
        if not _NEGATION.search(clause):
            found.append(text[max(0, m.start() - 40):m.end() + 20].replace("\n", " "))
    return found


@pytest.mark.parametrize("bad", [
    "The line is safe.",
    "Safe to connect the analyser.",
    "Cable is de-energized",
    "Line verified de-energised, go ahead",
    "No voltage present on the pair",
    "OK to connect",
    "the feeder is dead",
    "voltage-free conductors",
    "work safely",
    "Do not panic, the line is safe",  # the negation is in another clause
    "PoE is harmless",
    "This pair is not live",
    "Status: de-energized.",
])
def test_detector_flags_verdicts(bad):
    assert verdicts(bad), bad


@pytest.mark.parametrize("fine", [
    "halftrip never tells you a line is safe.",
    "Do not assume the cable is de-energized.",
    "Nothing here may state or imply that a line is safe",
    "connect only to de-energized conductors that have been earthed",
    "the safety cautions; an unsafe practice; a thread-safe cache",
    "Test for absence of voltage with a rated tester.",
])
def test_detector_allows_negations_and_other_words(fine):
    assert verdicts(fine) == [], fine


def _docstring_nodes(tree: ast.AST) -> set[int]:
    ids = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.Module | ast.ClassDef | ast.FunctionDef | ast.AsyncFunctionDef):
            body = node.body
            if body and isinstance(body[0], ast.Expr) and isinstance(body[0].value, ast.Constant):
                ids.add(id(body[0].value))
    return ids


def python_strings(path: Path) -> list[str]:
    """Every string literal in ``path`` except docstrings (f-string parts included)."""
    tree = ast.parse(path.read_text(encoding="utf-8"), filename=str(path))
    skip = _docstring_nodes(tree)
    return [n.value for n in ast.walk(tree)
            if isinstance(n, ast.Constant) and isinstance(n.value, str) and id(n) not in skip]


def user_facing_texts() -> list[tuple[str, str]]:
    """(where, text) for every user-facing string of the project."""
    out = []
    docs = [ROOT / "README.md", ROOT / "DEVELOPERS.md"]
    for base in ("tui", "cable_catalog"):
        for ext in ("toml", "md", "txt", "csv"):
            docs.extend(sorted((ROOT / base).rglob(f"*.{ext}")))
    for path in docs:
        if path.exists():
            out.append((str(path.relative_to(ROOT)), path.read_text(encoding="utf-8")))
    for base in ("tui", "calc", "cable_catalog"):
        for path in sorted((ROOT / base).rglob("*.py")):
            where = str(path.relative_to(ROOT))
            out.extend((where, s) for s in python_strings(path))
    return out


def test_scan_covers_the_places_people_read():
    places = {where for where, _text in user_facing_texts()}
    for expected in ("README.md", "tui/safety_text.toml", "cable_catalog/coax.toml",
                     "cable_catalog/other.toml", "tui/commands/safety.py",
                     "tui/commands/common.py"):
        assert expected in places


def test_no_user_facing_text_calls_a_line_safe():
    hits = [f"{where}: ...{phrase}..." for where, text in user_facing_texts()
            for phrase in verdicts(text)]
    assert not hits, "wording that states or implies a line is safe:\n" + "\n".join(hits)
