"""Field readers for what the panels' fields hold beyond one plain quantity.

A reader is ``reader(text, field_label) -> value`` and raises
:class:`calc.errors.InputError`; every quantity inside goes through
``calc.parse.parse`` as everywhere else. These exist because one screen
field can take what the CLI spreads over several options (``--cable`` or
``--vf`` or ``--nvp``...), telling them apart by the dimension of what was
typed.
"""

from __future__ import annotations

import re
from collections.abc import Callable

from calc.errors import InputError

VELOCITY_EXAMPLE = "rg58, 0.66, 66 %, 1.54 ns/ft or 198 m/us"
_DIMENSION = re.compile(r"is not an? (?!finite)")  # calc.parse's wording for a wrong dimension


def _first_fitting(text: str, label: str, kinds: tuple[str, ...], example: str):
    """(kind, value) for the first of ``kinds`` whose dimension fits ``text``.

    A value of the right dimension but out of range is refused with that
    kind's own message (``VF 1.2 must be at most 1``), not a vague one.
    """
    from calc.parse import parse

    unitless = True
    for kind in kinds:
        try:
            return kind, parse(text, label, kind)
        except InputError as exc:
            bare = "needs a unit" in exc.problem
            if not (bare or _DIMENSION.search(exc.problem)):
                raise
            unitless = unitless and bare
    problem = "needs a unit" if unitless else "is not one of these"
    raise InputError(label, f"{text.strip()!r} {problem}", example)


def velocity_reader(catalog: Callable[[], object]) -> Callable[[str, str], object]:
    """A reader for a catalog id or a velocity in any convention the trade uses.

    ``catalog()`` returns the loaded catalog. Accepted: an id (``rg58``), a VF
    (``0.66``), an NVP (``66 %``), a delay per length (``1.54 ns/ft``), a
    velocity (``198 m/us``) or a half velocity (``V/2 99 m/us``).
    """

    def read(text: str, label: str):
        """A :class:`tui.commands.common.ResolvedVelocity`, as the CLI's options give."""
        from calc import velocity as vel
        from tui.commands.common import ResolvedVelocity, find_cable

        t = text.strip()
        if not t:
            raise InputError(label, "a cable or a velocity is required", VELOCITY_EXAMPLE)
        if not re.match(r"[\d.+-]", t) and not t.lower().startswith("v/2"):
            c = find_cable(catalog(), t, label)
            return ResolvedVelocity(vel.from_vf(c.vf), c, c.vf_tolerance,
                                    f"catalog cable {c.id} (VF {c.vf:g})")
        half = t.lower().startswith("v/2")
        body = t[3:].strip() if half else t
        kind, value = _first_fitting(body, label, ("vf", "delay_per_length", "velocity"),
                                     VELOCITY_EXAMPLE)
        convention = {"vf": "vf", "delay_per_length": "delay_per_length_s_per_m",
                      "velocity": "half_velocity_m_per_s" if half else "velocity_m_per_s"}[kind]
        v = vel.from_vf(vel.vf_from(convention, value), label)
        return ResolvedVelocity(v, None, 0.0, t)

    return read


def delay_or_distance(text: str, label: str) -> tuple[str, float]:
    """``("delay", seconds)`` for a time, ``("distance", metres)`` for a length."""
    kind, value = _first_fitting(text, label, ("time", "length"), "245 ns (or 24 m)")
    return ("delay" if kind == "time" else "distance"), value


def delay_or_resonance(text: str, label: str) -> tuple[str, float]:
    """``("delay", seconds)`` or ``("resonance", hertz)`` for a velocity measurement."""
    kind, value = _first_fitting(text, label, ("time", "frequency"), "101 ns (or 24.7 MHz)")
    return ("delay" if kind == "time" else "resonance"), value


def angle_or_length(text: str, label: str) -> tuple[str, float]:
    """``("angle", degrees)`` for an electrical length (``90``, ``0.25 wl``), or
    ``("length", metres)`` for a piece's physical length (``339 mm``)."""
    return _first_fitting(text, label, ("angle", "length"), "90 deg, 0.25 wl (or 339 mm)")


def axis_unit(text: str, label: str) -> tuple[str, str]:
    """The unit of a trace file's first column: ``("time", "ns")`` or
    ``("distance", "ft")``, told apart by its dimension."""
    t = text.strip()
    try:
        kind, _one = _first_fitting(f"1 {t}", label, ("time", "length"), "ns (or m)")
    except InputError:
        raise InputError(label, f"{t!r}: not a time or length unit", "ns") from None
    return ("time" if kind == "time" else "distance"), t


def text(text: str, label: str) -> str:
    """The text as typed (for a field the core parses itself)."""
    return text.strip()


def choice(*words: str) -> Callable[[str, str], str]:
    """A reader for one of ``words`` (a unique start is enough: ``s`` for ``short``)."""

    def read(text: str, label: str) -> str:
        t = text.strip().lower()
        hits = [w for w in words if w.startswith(t)] if t else []
        if len(hits) != 1:
            raise InputError(label, f"use {' or '.join(words)}", words[0])
        return hits[0]

    return read


def whole_number(low: int, high: int, example: str) -> Callable[[str, str], int]:
    """A reader for a whole number from ``low`` to ``high``."""

    def read(text: str, label: str) -> int:
        t = text.strip()
        if not re.fullmatch(r"\d+", t) or not low <= int(t) <= high:
            raise InputError(label, f"use a whole number from {low} to {high}", example)
        return int(t)

    return read


def run_reader(catalog: Callable[[], object]) -> Callable[[str, str], tuple]:
    """A reader for a run of cables, ``"2 m:rg58, 45 m:hardline-50-half"``."""

    def read(text: str, label: str):
        from calc.run import parse_run

        return parse_run(text, catalog().get, label)

    return read


def load_reader(catalog: Callable[[], object]) -> Callable[[str, str], object]:
    """A reader for a load, ``open``, ``75 ohm``, ``75 ohm || 10 pF``, ``cable:rg59``
    (:func:`calc.loads.parse_load`)."""

    def read(text: str, label: str):
        from calc.loads import parse_load

        return parse_load(text, label, lookup=catalog().get)

    return read


def as_text(reader: Callable[[str, str], object]) -> Callable[[str, str], str]:
    """``reader`` as a check only: the value is the stripped text itself (for a
    panel that hands the text to the CLI command's own code, checked as typed)."""

    def read(text: str, label: str) -> str:
        reader(text, label)
        return text.strip()

    return read
