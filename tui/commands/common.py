"""Pieces every CLI command shares: output options, velocity options, the
catalog, hazard cautions and JSON output.

Conventions (see DEVELOPERS.md):

* ``add_output_options(parser)`` gives ``--json``, ``--units`` and
  ``--fraction``; ``emit(args, data, lines)`` prints either one JSON object
  (keys snake_case with an SI suffix) or the human lines.
* ``add_velocity_options(parser)`` gives the mutually exclusive velocity
  inputs; ``resolve_velocity(args)`` turns them into a ``Velocity``, the
  cable (if one was named) and the relative tolerance.
* Bad input is raised as :class:`calc.errors.InputError`; :mod:`tui.cli`
  prints it as one line and exits 2.
"""

from __future__ import annotations

import argparse
import json
import sys
from dataclasses import dataclass
from functools import lru_cache

from calc.errors import InputError


def add_output_options(parser: argparse.ArgumentParser, lengths: bool = True) -> None:
    """``--json``, and with ``lengths`` (a command that shows lengths) ``--units`` and
    ``--fraction``."""
    out = parser.add_argument_group("output")
    out.add_argument("--json", action="store_true", help="print one JSON object on stdout")
    if not lengths:
        return
    out.add_argument("--units", choices=("metric", "imperial"), default=None,
                     help="lengths in metres or feet and inches (default: your preference)")
    out.add_argument("--fraction", type=int, choices=(8, 16, 32), default=None,
                     help="feet-and-inches to this fraction of an inch (default 16)")


def units_of(args) -> tuple[str, int]:
    """The unit system and tape fraction: the option, else the saved preference."""
    units = getattr(args, "units", None)
    fraction = getattr(args, "fraction", None)
    if units is None or fraction is None:
        prefs = _preferences()
        units = units or prefs.get("units", "metric")
        fraction = fraction or int(prefs.get("fraction", 16))
    return units, fraction


def _preferences() -> dict:
    try:
        from tui.prefs import load_preferences
    except ImportError:  # preferences arrive with the terminal interface
        return {}
    prefs = load_preferences()
    for problem in prefs.problems:
        print(f"halftrip: preferences: {problem}", file=sys.stderr)
    return {"units": prefs.units, "fraction": prefs.fraction}


def option(args, flag: str, kind: str, default=None):
    """The option ``flag`` (``"--rise-time"``, read from ``args.rise_time``) parsed as
    ``kind`` by :func:`calc.parse.parse`, or ``default`` when it was not given."""
    text = getattr(args, flag.lstrip("-").replace("-", "_"))
    if text is None:
        return default
    from calc.parse import parse

    return parse(text, flag, kind)


_last: dict = {}


def last_emitted() -> dict:
    """The data of the last :func:`emit` (what ``--save`` stores in the job log)."""
    return _last


def emit(args, data: dict, lines: list[str] | str) -> int:
    """Print ``data`` as one JSON object with ``--json``, else the human ``lines``."""
    from tui.fmt import json_ready

    _last.clear()
    _last.update(json_ready(data))
    if getattr(args, "json", False):
        sys.stdout.write(json.dumps(json_ready(data), allow_nan=False) + "\n")
    else:
        text = lines if isinstance(lines, str) else "\n".join(lines)
        sys.stdout.write(text.rstrip("\n") + "\n")
    return 0


def emit_computed(args, computed) -> int:
    """Print what a command's ``compute(args)`` gave, ``(data, lines, cables used)``:
    the hazard caution for those cables on stderr (only now that every input has
    been accepted), then :func:`emit`."""
    data, lines, cables = computed
    warn_hazards(cables)
    return emit(args, data, lines)


@lru_cache(maxsize=1)
def catalog():
    """The merged catalog (built-in plus the user's file); problems go to stderr once."""
    from cable_catalog.loader import load_catalog
    from tui.paths import user_catalog_path

    cat = load_catalog(user_catalog_path())
    for problem in cat.problems:
        print(f"halftrip: catalog: {problem}", file=sys.stderr)
    return cat


def cable(cable_id: str, field: str = "--cable", warn: bool = True):
    """A catalog cable by id, or an InputError naming near matches.

    ``warn=False`` leaves the hazard caution to the caller (``warn_hazards``),
    for commands that print it only once their input has all been accepted.
    """
    found = find_cable(catalog(), cable_id, field)
    if warn:
        warn_hazards([found])
    return found


def find_cable(cat, cable_id: str, field: str):
    """``cat.get(cable_id)`` as an InputError naming ``field`` (CLI and TUI)."""
    try:
        return cat.get(cable_id)
    except KeyError as exc:
        raise InputError(field, exc.args[0], "rg58") from None


def caution_line(tags) -> str | None:
    """The one-line caution for hazard ``tags`` (None when there are none)."""
    tags = sorted(set(tags))
    if not tags:
        return None
    try:
        from tui.safety import one_line_caution
    except ImportError:
        return ("caution: this cable type may be energized ("
                + ", ".join(tags) + "); treat it as live until a qualified person has "
                "proven otherwise, and follow local codes and site procedures.")
    return one_line_caution(tags)


def warn_hazards(cables) -> None:
    """One caution line on stderr for any hazard-tagged cable used by a command."""
    line = caution_line(t for c in cables if c is not None for t in c.hazards)
    if line:
        print(f"halftrip: {line}", file=sys.stderr)


VELOCITY_OPTIONS = (
    # (flag, dest, parse kind, velocity convention, help)
    ("--cable", "cable", None, None, "catalog cable id (see 'halftrip cables list')"),
    ("--vf", "vf", "vf", "vf", "velocity factor, e.g. 0.66"),
    ("--nvp", "nvp", "nvp", "vf", "nominal velocity of propagation, e.g. '66 %%'"),
    ("--eps-r", "eps_r", "eps_r", "eps_r", "relative permittivity, e.g. 2.25"),
    ("--delay-per-length", "delay_per_length", "delay_per_length", "delay_per_length_s_per_m",
     "delay per length, e.g. '1.54 ns/ft'"),
    ("--velocity", "velocity", "velocity", "velocity_m_per_s", "velocity, e.g. '198 m/us'"),
    ("--half-velocity", "half_velocity", "velocity", "half_velocity_m_per_s",
     "half velocity V/2, e.g. '99 m/us'"),
)


def add_velocity_options(parser: argparse.ArgumentParser, required: bool = True,
                         with_cable: bool = True) -> None:
    group = parser.add_mutually_exclusive_group(required=required)
    for flag, dest, _kind, _conv, help_text in VELOCITY_OPTIONS:
        if flag == "--cable" and not with_cable:
            continue
        group.add_argument(flag, dest=dest, metavar="VALUE" if flag != "--cable" else "ID",
                           help=help_text)


@dataclass(frozen=True)
class ResolvedVelocity:
    velocity: object  # calc.velocity.Velocity
    cable: object | None  # calc.cable.Cable or None
    tolerance: float  # relative VF tolerance (0 when unknown)
    source: str  # what the velocity came from, for people


def resolve_velocity(args, tolerance_text: str | None = None,
                     warn: bool = True) -> ResolvedVelocity | None:
    """The velocity the user asked for, or None if no velocity option was given.

    ``warn`` is passed to :func:`cable`.
    """
    from calc import velocity as vel
    from calc.parse import parse

    tolerance = None
    if tolerance_text:
        tolerance = parse(tolerance_text, "--tolerance", "tolerance")
    for flag, dest, kind, conv, _help in VELOCITY_OPTIONS:
        text = getattr(args, dest, None)
        if text is None:
            continue
        if flag == "--cable":
            c = cable(text, warn=warn)
            return ResolvedVelocity(vel.from_vf(c.vf), c,
                                    c.vf_tolerance if tolerance is None else tolerance,
                                    f"catalog cable {c.id} (VF {c.vf:g})")
        value = parse(text, flag, kind)
        v = vel.from_vf(vel.vf_from(conv, value), flag)
        return ResolvedVelocity(v, None, tolerance or 0.0, f"{flag} {text}")
    return None


def add_electrical_length_options(parser: argparse.ArgumentParser):
    """``--degrees D | --wavelengths W`` (one required); returns the group so a
    command can add another way to give the length."""
    group = parser.add_mutually_exclusive_group(required=True)
    group.add_argument("--degrees", metavar="D", help="electrical length in degrees, e.g. 90")
    group.add_argument("--wavelengths", metavar="W",
                       help="electrical length in wavelengths, e.g. 0.25")
    return group


def electrical_length_deg(args) -> float | None:
    """The electrical length from ``--degrees``/``--wavelengths`` in degrees, or None."""
    from calc.parse import parse

    if getattr(args, "degrees", None) is not None:
        return parse(args.degrees, "--degrees", "angle")
    text = getattr(args, "wavelengths", None)
    if text is None:
        return None
    try:
        float(text)
    except ValueError:  # has a unit of its own ("0.25 wl", "90 deg")
        pass
    else:
        text = f"{text} wl"
    try:
        return parse(text, "--wavelengths", "angle")
    except InputError as exc:
        raise InputError("--wavelengths", exc.problem, "0.25") from None
