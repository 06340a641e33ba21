"""A run of several cables in series, as the user lists it.

Text form (CLI ``--run`` and the TUI's run fields)::

    "2 m:rg58, 45 m:hardline-50-half, 1.5 m:rg58"

segments separated by commas or semicolons, each ``LENGTH:CABLE_ID``. The
first segment is the one at the instrument.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from calc.cable import Cable
from calc.errors import InputError
from calc.parse import parse

MAX_SEGMENTS = 500
EXAMPLE = "2 m:rg58, 45 m:hardline-50-half, 1.5 m:rg58"


@dataclass(frozen=True)
class RunSegment:
    """One piece of a run: a length of one catalog cable."""

    length_m: float
    cable: Cable


def parse_run(text: str, lookup: Callable[[str], Cable], field: str = "--run") -> tuple[RunSegment, ...]:
    """Parse a run description; ``lookup(id)`` returns a Cable or raises KeyError."""
    if not isinstance(text, str) or not text.strip():
        raise InputError(field, "a run needs at least one segment", EXAMPLE)
    count = text.count(",") + text.count(";") + 1  # before splitting: a pasted megabyte
    if count > MAX_SEGMENTS:                         # would make a million strings
        raise InputError(field, f"{count} segments; at most {MAX_SEGMENTS}", EXAMPLE)
    parts = [p.strip() for p in text.replace(";", ",").split(",")]
    segments = []
    for i, part in enumerate(parts, start=1):
        if not part:
            raise InputError(field, f"segment {i} is empty", EXAMPLE)
        if ":" not in part:
            raise InputError(field, f"segment {i} {part!r} is not LENGTH:CABLE_ID", EXAMPLE)
        length_text, cable_id = (s.strip() for s in part.rsplit(":", 1))
        length_m = parse(length_text, f"{field} segment {i} length", "length")
        try:
            cable = lookup(cable_id)
        except KeyError as exc:
            msg = exc.args[0] if exc.args else f"no cable {cable_id!r}"
            raise InputError(f"{field} segment {i}", msg, EXAMPLE) from None
        segments.append(RunSegment(length_m, cable))
    return tuple(segments)


def format_run(segments: tuple[RunSegment, ...]) -> str:
    """The text form of a run (metres), which :func:`parse_run` reads back."""
    return ", ".join(f"{s.length_m:g} m:{s.cable.id}" for s in segments)
