"""Electrical length to a cut list: lengths, connector allowances, reach, stubs, trimming.

Everything here is pure: SI floats in (metres, hertz, seconds, ohms; angles in
degrees of electrical length), frozen dataclasses out. Bad values raise
:class:`calc.errors.InputError` naming the quantity in plain words.

The relations (c0 exact, SI definition of the metre):

.. math::

    \\lambda_{line} = VF\\,c_0/f, \\qquad
    l = \\frac{\\theta}{360^\\circ}\\,\\lambda_{line}, \\qquad
    \\theta = 360^\\circ\\,\\frac{l}{\\lambda_{line}}

Lengths are between the connector reference planes; the *cut* length is what
is left of that after each end's connector allowance (the length a fitted
connector adds between the cable's cut end and its reference plane).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from calc.constants import C0_M_PER_S
from calc.errors import InputError
from calc.locate import check_positive, check_tolerance, check_vf, faster_than_light
from calc.tape import FeetInches, round_mm, to_feet_inches

#: What a line is for, which fixes the lengths it may have (see :func:`reach`).
LINE_KINDS = ("transformer", "repeater", "delay")

#: The electrical length one unit of each kind adds, degrees (a delay has none).
KIND_UNIT_DEG: dict[str, float | None] = {"transformer": 90.0, "repeater": 180.0, "delay": None}

STUB_ENDS = ("open", "short")

#: Every stub repeats what it presents each half wave (lossless line).
STUB_PERIOD_DEG = 180.0

#: Relative slack for float round-off when testing "is a whole multiple".
_EPS = 1e-9

#: Longest electrical length handled: 10 000 wavelengths (far beyond any cut list).
MAX_ELECTRICAL_DEG = 3.6e6


def _electrical(deg: float, name: str = "electrical length", example: str = "90 deg") -> float:
    check_positive(deg, name, example)
    if deg > MAX_ELECTRICAL_DEG:
        raise InputError(name, f"{deg / 360.0:.4g} wavelengths is more than the "
                         f"{MAX_ELECTRICAL_DEG / 360.0:.0f} this tool handles", example)
    return deg


def wavelength_in_line_m(frequency_hz: float, vf: float) -> float:
    """One wavelength in the line: :math:`\\lambda = VF\\,c_0/f` (metres)."""
    check_positive(frequency_hz, "frequency", "146.52 MHz")
    return check_vf(vf) * C0_M_PER_S / frequency_hz


def physical_length_m(electrical_deg: float, frequency_hz: float, vf: float) -> float:
    """Physical length of ``electrical_deg`` at ``frequency_hz``:
    :math:`l = (\\theta/360)\\,VF\\,c_0/f`."""
    _electrical(electrical_deg)
    return electrical_deg / 360.0 * wavelength_in_line_m(frequency_hz, vf)


def electrical_length_deg(length_m: float, frequency_hz: float, vf: float) -> float:
    """Electrical length in degrees of ``length_m`` at ``frequency_hz``:
    :math:`\\theta = 360\\,l\\,f/(VF\\,c_0)` (the reverse of :func:`physical_length_m`)."""
    check_positive(length_m, "length", "1.2 m")
    return 360.0 * length_m / wavelength_in_line_m(frequency_hz, vf)


def vf_from_electrical(length_m: float, electrical_deg: float, frequency_hz: float) -> float:
    """The velocity factor that makes ``length_m`` measure ``electrical_deg`` at
    ``frequency_hz``: :math:`VF = 360\\,l\\,f/(\\theta\\,c_0)` (not range-checked)."""
    return 360.0 * length_m * frequency_hz / (electrical_deg * C0_M_PER_S)


# --- connector allowances and the tape ------------------------------------------------


@dataclass(frozen=True)
class CutLength:
    """A length between reference planes, the cable to cut for it, and how a tape shows it."""

    physical_length_m: float  # between the connector reference planes
    allowance_per_end_m: float  # each connector's share of that length
    ends: int  # how many ends carry a connector (2 for a line, 1 for a stub)
    cut_length_m: float  # physical length minus ends x allowance
    cut_rounded_mm_m: float  # cut length to the nearest millimetre (metres)
    cut_tape: FeetInches  # cut length to the nearest 1/denominator inch


def cut_length(physical_length_m: float, allowance_per_end_m: float = 0.0, ends: int = 2,
               denominator: int = 16) -> CutLength:
    """The cable to cut: ``physical_length_m - ends * allowance_per_end_m``.

    Refuses an allowance that leaves no cable (the connectors alone would be
    longer than the line). ``denominator`` is the tape's fraction of an inch
    (8, 16, 32...).
    """
    check_positive(physical_length_m, "length", "339 mm")
    if not (math.isfinite(allowance_per_end_m) and allowance_per_end_m >= 0.0):
        raise InputError("allowance", f"{allowance_per_end_m:g} m must be zero or more", "15 mm")
    if ends not in (1, 2):
        raise ValueError("ends must be 1 or 2")
    cut = physical_length_m - ends * allowance_per_end_m
    if cut <= 0.0:
        each = "" if ends == 1 else f"{ends} x "
        raise InputError(
            "allowance",
            f"{each}{allowance_per_end_m * 1000:.1f} mm of connector allowance is as long as "
            f"or longer than the {physical_length_m * 1000:.1f} mm line: no cable would be left",
            "15 mm")
    return CutLength(physical_length_m, allowance_per_end_m, ends, cut, round_mm(cut),
                     to_feet_inches(cut, denominator))


# --- reaching a span -------------------------------------------------------------------


@dataclass(frozen=True)
class Reach:
    """The shortest allowed line of a kind that spans a distance.

    ``unit_deg`` is 90 for a transformer (odd quarter waves), 180 for a
    repeater (whole half waves), None for a delay (any length); ``multiple``
    counts those units (None for a delay).
    """

    kind: str
    span_m: float
    slack_m: float
    unit_deg: float | None
    multiple: int | None
    electrical_deg: float
    physical_length_m: float
    spare_m: float  # physical length beyond the span (at least the slack)


def is_allowed(kind: str, electrical_deg: float) -> bool:
    """Whether ``electrical_deg`` is a length a line of ``kind`` may have."""
    unit = KIND_UNIT_DEG[_kind(kind)]
    if unit is None:
        return electrical_deg > 0.0
    n = electrical_deg / unit
    whole = round(n)
    if whole < 1 or abs(n - whole) > _EPS * max(1.0, n):
        return False
    return kind != "transformer" or whole % 2 == 1


def _kind(kind: str) -> str:
    if kind not in LINE_KINDS:
        raise InputError("kind", f"{kind!r} is not one of {', '.join(LINE_KINDS)}", "transformer")
    return kind


def reach(span_m: float, frequency_hz: float, vf: float, kind: str, slack_m: float = 0.0,
          minimum_deg: float = 0.0) -> Reach:
    """The shortest line of ``kind`` at least ``span_m + slack_m`` long (and at
    least ``minimum_deg``).

    * transformer: an odd number of quarter waves, (2k+1) x 90 deg;
    * repeater: a whole number of half waves, k x 180 deg, k >= 1;
    * delay: any length, so exactly the longer of the span plus slack and
      ``minimum_deg``.
    """
    unit = KIND_UNIT_DEG[_kind(kind)]
    check_positive(span_m, "span", "2.5 m")
    if not (math.isfinite(slack_m) and slack_m >= 0.0):
        raise InputError("slack", f"{slack_m:g} m must be zero or more", "100 mm")
    wavelength = wavelength_in_line_m(frequency_hz, vf)
    need_deg = _electrical(max(360.0 * (span_m + slack_m) / wavelength, minimum_deg), "span",
                           "2.5 m")
    if unit is None:
        multiple, deg = None, need_deg
    else:
        n = max(1, math.ceil(need_deg / unit - _EPS))
        if kind == "transformer" and n % 2 == 0:
            n += 1
        multiple, deg = n, n * unit
    length = deg / 360.0 * wavelength
    return Reach(kind, span_m, slack_m, unit, multiple, deg, length, length - span_m)


# --- a whole cut --------------------------------------------------------------------


@dataclass(frozen=True)
class CutPlan:
    """One line cut for an electrical length at a frequency.

    ``electrical_deg`` is what is built: the requested length, or the
    multiple chosen to reach a span (``reach``). ``tolerance_m`` is how far
    the VF tolerance moves the physical length (plus or minus).
    """

    frequency_hz: float
    vf: float
    requested_deg: float
    electrical_deg: float
    wavelength_in_line_m: float
    physical_length_m: float
    tolerance_m: float
    cut: CutLength
    reach: Reach | None


def plan_cut(frequency_hz: float, electrical_deg: float, vf: float, *,
             allowance_per_end_m: float = 0.0, vf_tolerance: float = 0.0,
             span_m: float | None = None, kind: str | None = None, slack_m: float = 0.0,
             denominator: int = 16) -> CutPlan:
    """Cut list entry for ``electrical_deg`` at ``frequency_hz`` in a line of ``vf``.

    With ``kind`` the requested length must be one the kind allows (a
    transformer is an odd number of quarter waves, a repeater whole half
    waves); with ``span_m`` the length becomes the shortest allowed one that
    reaches the span plus ``slack_m`` (:func:`reach`). Connector allowances
    are then taken off each of the two ends (:func:`cut_length`).
    """
    wavelength = wavelength_in_line_m(frequency_hz, vf)
    _electrical(electrical_deg)
    if kind is not None and not is_allowed(kind, electrical_deg):
        unit = KIND_UNIT_DEG[kind]
        what = ("an odd number of quarter waves (90, 270, 450 deg ...)" if kind == "transformer"
                else "a whole number of half waves (180, 360, 540 deg ...)")
        raise InputError("electrical length",
                         f"a {kind} is {what}; {electrical_deg:g} deg is not", f"{unit:g} deg")
    got = None
    deg = electrical_deg
    if span_m is not None:
        got = reach(span_m, frequency_hz, vf, kind or "delay", slack_m, electrical_deg)
        deg = got.electrical_deg
    physical = deg / 360.0 * wavelength
    tol = physical * check_tolerance(vf_tolerance, "VF tolerance")
    return CutPlan(frequency_hz, vf, electrical_deg, deg, wavelength, physical, tol,
                   cut_length(physical, allowance_per_end_m, 2, denominator), got)


# --- stubs ---------------------------------------------------------------------------


@dataclass(frozen=True)
class Stub:
    """The shortest open or shorted stub presenting a reactance, lossless.

    ``reactance_ohm`` is what the stub's input presents: 0 for a short,
    ``inf`` for an open, otherwise X of jX. The same input impedance comes
    back every ``period_deg`` (a half wave) of added line.
    """

    end: str  # "open" or "short": how the far end is terminated
    reactance_ohm: float
    z0_ohm: float | None
    frequency_hz: float
    vf: float
    electrical_deg: float  # shortest length > 0 that presents the reactance
    physical_length_m: float
    period_deg: float
    period_m: float


def stub_length(frequency_hz: float, vf: float, end: str, reactance_ohm: float,
                z0_ohm: float | None = None) -> Stub:
    """Shortest lossless stub (``end`` open or short) whose input is ``j reactance_ohm``.

    .. math::

        Z_{short} = jZ_0\\tan\\beta l, \\qquad Z_{open} = -jZ_0\\cot\\beta l

    so a shorted stub needs :math:`\\beta l = \\arctan(X/Z_0)` and an open one
    :math:`\\beta l = 90^\\circ + \\arctan(X/Z_0)`, each taken in (0, 180] deg.
    A short (X = 0) or an open (X = inf) needs no Z0. A stub that presents
    what its own end is (a shorted stub presenting a short) has the trivial
    length 0; the shortest piece of line that does it is a half wave, which
    is what is returned.
    """
    if end not in STUB_ENDS:
        raise InputError("end", f"{end!r} is not one of {', '.join(STUB_ENDS)}", "open")
    if math.isnan(reactance_ohm):
        raise InputError("reactance", "is not a number", "j25 ohm")
    if reactance_ohm == 0.0:
        ratio = 0.0
    elif math.isinf(reactance_ohm):
        ratio = math.copysign(math.inf, reactance_ohm)
    else:
        if z0_ohm is None:
            raise InputError("Z0", "a reactance needs the stub line's Z0", "50 ohm")
        ratio = reactance_ohm / check_positive(z0_ohm, "Z0", "50 ohm")
    deg = math.degrees(math.atan(ratio))  # in [-90, 90]
    if end == "open":
        deg += 90.0
    if deg <= 0.0:
        deg += STUB_PERIOD_DEG
    wavelength = wavelength_in_line_m(frequency_hz, vf)
    return Stub(end, reactance_ohm, z0_ohm, frequency_hz, vf, deg, deg / 360.0 * wavelength,
                STUB_PERIOD_DEG, STUB_PERIOD_DEG / 360.0 * wavelength)


# --- trimming a piece cut long ------------------------------------------------------


@dataclass(frozen=True)
class Trim:
    """How much of a measured piece to keep so that it becomes ``target_deg``.

    ``keep_fraction`` = target / measured electrical length needs no velocity
    factor. The lengths and the implied VF are given when the piece's current
    length is known (None otherwise).
    """

    method: str  # "delay" or "resonance"
    target_deg: float
    frequency_hz: float
    measured_deg: float  # the piece's electrical length at frequency_hz now
    keep_fraction: float
    current_length_m: float | None
    keep_length_m: float | None
    cut_off_m: float | None
    implied_vf: float | None


def trim_from_delay(target_deg: float, frequency_hz: float, round_trip_s: float,
                    current_length_m: float | None = None) -> Trim:
    """Trim from a reflectometer's round-trip delay ``round_trip_s`` of the piece.

    The piece is :math:`\\theta_m = 360^\\circ f\\,t_{rt}/2` long now, so keep
    :math:`\\theta_t/\\theta_m` of it. With its length, :math:`VF = 2l/(c_0 t_{rt})`.
    """
    check_positive(round_trip_s, "measured delay", "3.7 ns")
    check_positive(frequency_hz, "frequency", "146.52 MHz")
    measured = 360.0 * frequency_hz * round_trip_s / 2.0
    return _trim("delay", target_deg, frequency_hz, measured, current_length_m)


def trim_from_resonance(target_deg: float, frequency_hz: float, resonance_hz: float,
                        current_length_m: float | None = None,
                        resonance_deg: float = 90.0) -> Trim:
    """Trim from the frequency ``resonance_hz`` of the piece's first resonance.

    At its first resonance a piece is a quarter wave (``resonance_deg`` = 90:
    an open piece's first low impedance, a shorted piece's first high); a
    shorted piece's first *low* impedance is a half wave (180). The piece is
    :math:`\\theta_m = \\theta_r f/f_r` long at ``frequency_hz``; keep
    :math:`\\theta_t/\\theta_m` of it. With its length, for the quarter wave,
    :math:`VF = 4 l f_r / c_0`.
    """
    check_positive(resonance_hz, "measured resonance", "160 MHz")
    check_positive(frequency_hz, "frequency", "146.52 MHz")
    check_positive(resonance_deg, "resonance length", "90 deg")
    measured = resonance_deg * frequency_hz / resonance_hz
    return _trim("resonance", target_deg, frequency_hz, measured, current_length_m)


def _trim(method: str, target_deg: float, frequency_hz: float, measured_deg: float,
          current_length_m: float | None) -> Trim:
    _electrical(target_deg)
    vf = None
    if current_length_m is not None:
        check_positive(current_length_m, "length", "400 mm")
        vf = vf_from_electrical(current_length_m, measured_deg, frequency_hz)
        if faster_than_light(vf):
            raise InputError(
                f"measured {method}",
                f"with a piece {current_length_m:g} m long the measurement implies VF "
                f"{vf:.3f}, faster than light: check the length and the measurement")
    keep = target_deg / measured_deg
    if keep > 1.0 + _EPS:
        raise InputError(
            f"measured {method}",
            f"the piece is already too short: it measures {measured_deg:.2f} deg at "
            f"{frequency_hz / 1e6:g} MHz and the target is {target_deg:g} deg; "
            "a piece cannot be lengthened, cut a new one")
    keep = min(keep, 1.0)
    if current_length_m is None:
        return Trim(method, target_deg, frequency_hz, measured_deg, keep, None, None, None, None)
    kept = keep * current_length_m
    return Trim(method, target_deg, frequency_hz, measured_deg, keep, current_length_m, kept,
                current_length_m - kept, vf)
