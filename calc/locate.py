"""Where is the reflection? Round-trip delay to distance, and back.

Three ways to place an event, all on plain SI floats:

* :func:`locate`: one cable of known velocity factor;
* :func:`locate_in_run`: a run of several cables in series
  (:class:`calc.run.RunSegment`), with the expected delay of every junction
  (:func:`run_junctions`);
* :func:`locate_two_ended`: one cable of known length, read from both ends,
  which needs no velocity at all.

Conventions used throughout (all delays are *round-trip*, as an instrument
shows them):

.. math::

    d = \\frac{v\\,t}{2}, \\qquad v = VF\\,c_0, \\qquad t = \\frac{2 d}{v}

* **Range.** ``vf_tolerance`` is relative: the cable's velocity factor lies in
  ``[VF (1 - tol), VF (1 + tol)]``, capped at 1 (nothing travels faster than
  light). Distance is proportional to VF for a fixed delay, so the range is
  ``[d (1 - tol), min(d (1 + tol), c0 t / 2)]``. In a run every segment is put
  at its low (then its high) VF together: the worst case, which is what a
  field user digging a hole wants to know.
* **Resolution.** Two events whose round-trip delays differ by less than the
  instrument's rise time ``t_r`` (10-90 %) merge into one edge on the trace,
  so the smallest spacing along the cable that still shows two events is
  ``v t_r / 2`` (the factor 1/2 because the delay is round-trip). This is the
  plain rule of thumb of reflectometry (common practice); a sharper trace or
  a careful reader may do a little better, never much.
* **Dead zone.** While the pulse of width ``t_pw`` is still being launched,
  the instrument cannot see its own echo, so anything nearer than
  ``v t_pw / 2`` is hidden (common practice). Real instruments add some
  recovery time; take the figure as the least dead zone, not the most.

Resolution and dead zone use the nominal velocity factor.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

from calc.constants import C0_M_PER_S
from calc.errors import InputError, OutOfRunError
from calc.run import RunSegment
from calc.velocity import VF_MIN

# How close to the far end (relative to the run's total delay) still counts
# as "at the far end" when a reading is converted back and forth in floats.
_END_SLACK = 1e-9
# Relative slack for a velocity factor of exactly 1 computed in floats.
_ROUNDING = 1e-9


# ---------------------------------------------------------------- checks


def check_positive(value: float, field: str, example: str) -> float:
    """``value`` if it is a finite number above zero, else :class:`InputError`."""
    if isinstance(value, bool) or not isinstance(value, int | float) or not math.isfinite(value):
        raise InputError(field, f"{value!r} is not a finite number", example)
    if value <= 0.0:
        raise InputError(field, f"{value:g} must be greater than zero", example)
    return float(value)


def check_vf(vf: float, field: str = "velocity factor") -> float:
    """``vf`` if it lies in (0, 1], else :class:`InputError`."""
    if isinstance(vf, bool) or not isinstance(vf, int | float) or not math.isfinite(vf):
        raise InputError(field, f"{vf!r} is not a finite number", "0.66")
    if not 0.0 < vf <= 1.0:
        raise InputError(field, f"velocity factor {vf:g} is outside (0, 1]", "0.66")
    if vf < VF_MIN:
        raise InputError(field, f"velocity factor {vf:g} is below {VF_MIN:g}", "0.66")
    return float(vf)


def check_tolerance(tolerance: float, field: str = "tolerance") -> float:
    """A relative VF tolerance in [0, 0.5], else :class:`InputError`."""
    if isinstance(tolerance, bool) or not isinstance(tolerance, int | float) \
            or not math.isfinite(tolerance) or not 0.0 <= tolerance <= 0.5:
        raise InputError(field, f"{tolerance!r} must be between 0 and 50 %", "3 %")
    return float(tolerance)


def faster_than_light(vf: float) -> bool:
    """True for a VF above 1 by more than float rounding (a computed VF of exactly 1 passes)."""
    return vf > 1.0 + _ROUNDING


def _optional_positive(value: float | None, field: str) -> float | None:
    return None if value is None else check_positive(value, field, "1 ns")


# ---------------------------------------------------------------- one cable


def vf_bounds(vf: float, vf_tolerance: float) -> tuple[float, float]:
    """.. math:: [VF(1-tol),\\ \\min(VF(1+tol), 1)]"""
    return vf * (1.0 - vf_tolerance), min(vf * (1.0 + vf_tolerance), 1.0)


def distance_from_delay_m(delay_s: float, vf: float) -> float:
    """.. math:: d = VF\\,c_0\\,t / 2   (``delay_s`` round-trip, result in metres)"""
    return vf * C0_M_PER_S * delay_s / 2.0


def delay_from_distance_s(distance_m: float, vf: float) -> float:
    """.. math:: t = 2 d / (VF\\,c_0)   (round-trip delay in seconds)"""
    return 2.0 * distance_m / (vf * C0_M_PER_S)


@dataclass(frozen=True)
class InstrumentLimits:
    """What the instrument's edge and pulse allow, at the event's cable.

    ``resolution_m`` (from the rise time) and ``dead_zone_m`` (from the pulse
    width) are None when that figure was not given; ``in_dead_zone`` says the
    event is nearer than the dead zone, so the reading is doubtful.
    """

    rise_time_s: float | None = None
    pulse_width_s: float | None = None
    resolution_m: float | None = None
    dead_zone_m: float | None = None
    in_dead_zone: bool = False


def _limits(rise_time_s: float | None, pulse_width_s: float | None,
            resolution_m: float | None, dead_zone_m: float | None,
            distance_m: float) -> InstrumentLimits:
    return InstrumentLimits(rise_time_s, pulse_width_s, resolution_m, dead_zone_m,
                            dead_zone_m is not None and distance_m < dead_zone_m)


@dataclass(frozen=True)
class Location:
    """An event on one cable, as :func:`locate` places it."""

    round_trip_delay_s: float
    vf: float
    vf_tolerance: float
    distance_m: float
    distance_low_m: float
    distance_high_m: float
    instrument: InstrumentLimits = InstrumentLimits()


def locate(delay_s: float, vf: float, vf_tolerance: float = 0.0,
           rise_time_s: float | None = None, pulse_width_s: float | None = None) -> Location:
    """Place an event seen at round-trip ``delay_s`` on a cable of velocity factor ``vf``.

    .. math::

        d = \\frac{VF\\,c_0\\,t}{2}, \\quad
        d_{lo,hi} = \\frac{VF_{lo,hi}\\,c_0\\,t}{2}, \\quad
        \\Delta d = \\frac{VF\\,c_0\\,t_r}{2}, \\quad
        d_{dead} = \\frac{VF\\,c_0\\,t_{pw}}{2}

    See the module docstring for the conventions. Raises
    :class:`~calc.errors.InputError` for a delay that is not positive and
    finite, a VF outside (0, 1] or a tolerance outside [0, 50 %].
    """
    delay_s = check_positive(delay_s, "delay", "245 ns")
    vf = check_vf(vf)
    vf_tolerance = check_tolerance(vf_tolerance)
    rise_time_s = _optional_positive(rise_time_s, "--rise-time")
    pulse_width_s = _optional_positive(pulse_width_s, "--pulse-width")
    vf_lo, vf_hi = vf_bounds(vf, vf_tolerance)
    distance_m = distance_from_delay_m(delay_s, vf)
    return Location(
        round_trip_delay_s=delay_s,
        vf=vf,
        vf_tolerance=vf_tolerance,
        distance_m=distance_m,
        distance_low_m=distance_from_delay_m(delay_s, vf_lo),
        distance_high_m=distance_from_delay_m(delay_s, vf_hi),
        instrument=_limits(
            rise_time_s, pulse_width_s,
            None if rise_time_s is None else distance_from_delay_m(rise_time_s, vf),
            None if pulse_width_s is None else distance_from_delay_m(pulse_width_s, vf),
            distance_m),
    )


@dataclass(frozen=True)
class DelayPrediction:
    """When a reflection from a given distance will show (round-trip)."""

    distance_m: float
    vf: float
    vf_tolerance: float
    round_trip_delay_s: float
    round_trip_delay_low_s: float  # at the fastest the cable may be
    round_trip_delay_high_s: float  # at the slowest


def expected_delay(distance_m: float, vf: float, vf_tolerance: float = 0.0) -> DelayPrediction:
    """The reverse of :func:`locate`: the round-trip delay of an event at ``distance_m``.

    .. math:: t = \\frac{2 d}{VF\\,c_0}, \\quad t_{lo} = \\frac{2 d}{VF_{hi}\\,c_0},
        \\quad t_{hi} = \\frac{2 d}{VF_{lo}\\,c_0}
    """
    distance_m = check_positive(distance_m, "distance", "24 m")
    vf = check_vf(vf)
    vf_tolerance = check_tolerance(vf_tolerance)
    vf_lo, vf_hi = vf_bounds(vf, vf_tolerance)
    return DelayPrediction(
        distance_m=distance_m,
        vf=vf,
        vf_tolerance=vf_tolerance,
        round_trip_delay_s=delay_from_distance_s(distance_m, vf),
        round_trip_delay_low_s=delay_from_distance_s(distance_m, vf_hi),
        round_trip_delay_high_s=delay_from_distance_s(distance_m, vf_lo),
    )


# ---------------------------------------------------------------- a run


@dataclass(frozen=True)
class Junction:
    """The boundary at the far end of segment ``after_segment_index`` (0-based).

    The last junction of a run is its far end (``is_far_end``). Delays are
    round-trip from the instrument; low/high put every segment at its fastest
    and slowest VF.
    """

    after_segment_index: int
    cable_id: str
    distance_m: float
    round_trip_delay_s: float
    round_trip_delay_low_s: float
    round_trip_delay_high_s: float
    is_far_end: bool


@dataclass(frozen=True)
class RunLocation:
    """An event in a run, as :func:`locate_in_run` places it.

    ``segment_index`` is 0-based (the segment at the instrument is 0);
    ``possible_segment_indices`` lists every segment the distance range
    touches (more than one when the event is near a junction).
    ``beyond_nominal_end`` means the delay is later than the far end's
    nominal delay but within the cables' VF tolerance of it: the event is
    placed at the far end, which is most likely what it is.
    """

    round_trip_delay_s: float
    segment_index: int
    cable_id: str
    offset_in_segment_m: float
    distance_m: float
    distance_low_m: float
    distance_high_m: float
    possible_segment_indices: tuple[int, ...]
    beyond_nominal_end: bool
    total_length_m: float
    junctions: tuple[Junction, ...]
    instrument: InstrumentLimits = InstrumentLimits()


def _segment_vfs(segments: Sequence[RunSegment], which: str) -> list[float]:
    """Each segment's nominal, lowest ("low") or highest ("high") VF."""
    if which == "nominal":
        return [s.cable.vf for s in segments]
    pick = 0 if which == "low" else 1
    return [vf_bounds(s.cable.vf, s.cable.vf_tolerance)[pick] for s in segments]


def _place(delay_s: float, segments: Sequence[RunSegment], vfs: Sequence[float]
           ) -> tuple[int, float, float] | None:
    """(segment index, offset into it, distance) of ``delay_s``; None beyond the end.

    Walks the segments subtracting each one's round-trip delay
    ``2 L_j / (VF_j c0)``; an event exactly at a junction belongs to the
    segment that ends there. A delay within a rounding slack past the far end
    is put at the far end.
    """
    total_delay = sum(delay_from_distance_s(s.length_m, vf) for s, vf in zip(segments, vfs, strict=True))
    remaining = delay_s
    start_m = 0.0
    last = len(segments) - 1
    for i, (seg, vf) in enumerate(zip(segments, vfs, strict=True)):
        seg_delay = delay_from_distance_s(seg.length_m, vf)
        slack = _END_SLACK * total_delay if i == last else 0.0
        if remaining <= seg_delay + slack:
            offset = min(distance_from_delay_m(remaining, vf), seg.length_m)
            return i, offset, start_m + offset
        remaining -= seg_delay
        start_m += seg.length_m
    return None


def _check_run(segments: Sequence[RunSegment]) -> tuple[RunSegment, ...]:
    segments = tuple(segments)
    if not segments:
        raise InputError("--run", "a run needs at least one segment", "2 m:rg58, 45 m:rg213")
    for i, s in enumerate(segments, start=1):
        check_positive(s.length_m, f"--run segment {i} length", "45 m")
        check_vf(s.cable.vf, f"--run segment {i} velocity factor")
    return segments


def run_junctions(segments: Sequence[RunSegment]) -> tuple[Junction, ...]:
    """The expected round-trip delay of every junction, the far end last.

    .. math:: T_k = \\sum_{j \\le k} \\frac{2 L_j}{VF_j\\,c_0}

    with the low (high) delay from every segment at its highest (lowest) VF.
    """
    segments = _check_run(segments)
    out = []
    length_m = t_nom = t_lo = t_hi = 0.0
    for i, seg in enumerate(segments):
        vf_lo, vf_hi = vf_bounds(seg.cable.vf, seg.cable.vf_tolerance)
        length_m += seg.length_m
        t_nom += delay_from_distance_s(seg.length_m, seg.cable.vf)
        t_lo += delay_from_distance_s(seg.length_m, vf_hi)
        t_hi += delay_from_distance_s(seg.length_m, vf_lo)
        out.append(Junction(i, seg.cable.id, length_m, t_nom, t_lo, t_hi,
                            is_far_end=i == len(segments) - 1))
    return tuple(out)


def _segment_at(distance_m: float, segments: Sequence[RunSegment]) -> int:
    """Index of the segment holding ``distance_m`` (a junction belongs to the nearer one)."""
    start = 0.0
    for i, seg in enumerate(segments):
        if distance_m <= start + seg.length_m:
            return i
        start += seg.length_m
    return len(segments) - 1


def locate_in_run(delay_s: float, segments: Sequence[RunSegment],
                  rise_time_s: float | None = None,
                  pulse_width_s: float | None = None) -> RunLocation:
    """Place an event seen at round-trip ``delay_s`` in a run of cables in series.

    Segment ``k`` holds the event when :math:`T_{k-1} < t \\le T_k` (see
    :func:`run_junctions`); the offset into it is
    :math:`VF_k c_0 (t - T_{k-1}) / 2`. The distance range repeats this with
    every segment at its lowest, then its highest VF (clamped to the far end).
    The resolution is :math:`VF_k c_0 t_r / 2` in the event's segment; the
    dead zone is where the round-trip delay ``t_pw`` falls in the run.

    Raises :class:`~calc.errors.OutOfRunError` when the event cannot be in
    the run: later than the far end even with every cable at its slowest.
    """
    delay_s = check_positive(delay_s, "delay", "245 ns")
    segments = _check_run(segments)
    rise_time_s = _optional_positive(rise_time_s, "--rise-time")
    pulse_width_s = _optional_positive(pulse_width_s, "--pulse-width")
    junctions = run_junctions(segments)
    end = junctions[-1]
    nearest = _place(delay_s, segments, _segment_vfs(segments, "low"))
    if nearest is None:
        raise OutOfRunError(
            "delay",
            f"{delay_s * 1e9:.4g} ns is beyond the far end of the run: the far end "
            f"({end.distance_m:.4g} m) shows at {end.round_trip_delay_s * 1e9:.4g} ns, "
            f"at the latest {end.round_trip_delay_high_s * 1e9:.4g} ns with the cables' VF "
            "tolerance; check the run's lengths, or the event is past it")
    nominal = _place(delay_s, segments, _segment_vfs(segments, "nominal"))
    beyond = nominal is None
    if beyond:
        nominal = (len(segments) - 1, segments[-1].length_m, end.distance_m)
    farthest = _place(delay_s, segments, _segment_vfs(segments, "high"))
    high_m = end.distance_m if farthest is None else farthest[2]
    index, offset_m, distance_m = nominal
    possible = tuple(range(nearest[0], _segment_at(high_m, segments) + 1))
    seg_vf = segments[index].cable.vf
    dead_zone_m = None
    if pulse_width_s is not None:
        placed = _place(pulse_width_s, segments, _segment_vfs(segments, "nominal"))
        dead_zone_m = end.distance_m if placed is None else placed[2]
    return RunLocation(
        round_trip_delay_s=delay_s,
        segment_index=index,
        cable_id=segments[index].cable.id,
        offset_in_segment_m=offset_m,
        distance_m=distance_m,
        distance_low_m=nearest[2],
        distance_high_m=high_m,
        possible_segment_indices=possible,
        beyond_nominal_end=beyond,
        total_length_m=end.distance_m,
        junctions=junctions,
        instrument=_limits(
            rise_time_s, pulse_width_s,
            None if rise_time_s is None else distance_from_delay_m(rise_time_s, seg_vf),
            dead_zone_m, distance_m),
    )


def run_delay_for_distance(distance_m: float, segments: Sequence[RunSegment]) -> DelayPrediction:
    """The reverse of :func:`locate_in_run`: round-trip delay of an event at ``distance_m``.

    .. math:: t = \\sum_j \\frac{2\\,\\ell_j}{VF_j\\,c_0}

    where :math:`\\ell_j` is the part of segment ``j`` between the instrument
    and the event. ``vf`` in the result is the run's average
    :math:`2 d / (c_0 t)`; ``vf_tolerance`` is 0 (each segment carries its own).
    Raises :class:`~calc.errors.OutOfRunError` past the far end.
    """
    distance_m = check_positive(distance_m, "distance", "24 m")
    segments = _check_run(segments)
    total_m = sum(s.length_m for s in segments)
    if distance_m > total_m * (1.0 + _END_SLACK):
        raise OutOfRunError("distance", f"{distance_m:.4g} m is beyond the far end of the run "
                                        f"({total_m:.4g} m long)")
    t_nom = t_lo = t_hi = 0.0
    start = slowness = 0.0
    for seg in segments:
        part = min(max(distance_m - start, 0.0), seg.length_m)
        vf_lo, vf_hi = vf_bounds(seg.cable.vf, seg.cable.vf_tolerance)
        t_nom += delay_from_distance_s(part, seg.cable.vf)
        t_lo += delay_from_distance_s(part, vf_hi)
        t_hi += delay_from_distance_s(part, vf_lo)
        slowness += part / seg.cable.vf
        start += seg.length_m
    # the average VF 2 d / (c0 t) as d / sum(l_j / VF_j): the same, and no 0/0 when a
    # tiny distance's delay underflows to zero
    return DelayPrediction(distance_m, distance_m / slowness, 0.0, t_nom, t_lo, t_hi)


# ---------------------------------------------------------------- both ends


@dataclass(frozen=True)
class TwoEndedLocation:
    """An event on one cable of known length, read from both ends.

    ``catalog_vf`` and ``vf_tolerance`` are None unless a velocity to check
    against was given; ``vf_disagreement`` is ``implied_vf / catalog_vf - 1``;
    ``disagrees`` says the implied VF lies outside the catalog VF's tolerance
    band, which means the two readings are not the same event, or the length
    is wrong, or the catalog value does not fit this cable.
    """

    length_m: float
    delay_from_a_s: float
    delay_from_b_s: float
    distance_from_a_m: float
    distance_from_b_m: float
    implied_vf: float
    catalog_vf: float | None = None
    vf_tolerance: float | None = None
    vf_disagreement: float | None = None
    disagrees: bool = False


def locate_two_ended(delay_from_a_s: float, delay_from_b_s: float, length_m: float,
                     catalog_vf: float | None = None,
                     vf_tolerance: float = 0.0) -> TwoEndedLocation:
    """Place an event from its round-trip delays seen from end A and end B.

    .. math::

        x_A = L\\,\\frac{t_A}{t_A + t_B}, \\quad x_B = L - x_A, \\quad
        VF_{implied} = \\frac{2 L}{c_0 (t_A + t_B)}

    The position needs no velocity: both echoes travel the same uniform cable,
    so the delays split in the same ratio as the distances (the two-ended
    method of power-cable fault location; common practice). The implied VF is
    a check: readings whose sum is shorter than light needs for ``2 L``
    (implied VF > 1) cannot be one event on this cable and are refused with
    :class:`~calc.errors.InputError`.
    """
    t_a = check_positive(delay_from_a_s, "--from-a", "1.2 us")
    t_b = check_positive(delay_from_b_s, "--from-b", "0.8 us")
    length_m = check_positive(length_m, "--length", "250 m")
    implied = 2.0 * length_m / (C0_M_PER_S * (t_a + t_b))
    if faster_than_light(implied):
        raise InputError(
            "--from-a/--from-b",
            f"the delays add up to {(t_a + t_b) * 1e9:.4g} ns, less than light needs to go "
            f"{length_m:.4g} m and back ({delay_from_distance_s(length_m, 1.0) * 1e9:.4g} ns): "
            "they cannot be one event on this cable; check the length and that both readings "
            "are the same event")
    implied = min(implied, 1.0)
    x_a = length_m * t_a / (t_a + t_b)
    disagreement = None
    disagrees = False
    if catalog_vf is not None:
        catalog_vf = check_vf(catalog_vf)
        vf_tolerance = check_tolerance(vf_tolerance)
        vf_lo, vf_hi = vf_bounds(catalog_vf, vf_tolerance)
        disagreement = implied / catalog_vf - 1.0
        disagrees = not vf_lo <= implied <= vf_hi
    return TwoEndedLocation(
        length_m=length_m,
        delay_from_a_s=t_a,
        delay_from_b_s=t_b,
        distance_from_a_m=x_a,
        distance_from_b_m=length_m - x_a,
        implied_vf=implied,
        catalog_vf=catalog_vf,
        vf_tolerance=vf_tolerance if catalog_vf is not None else None,
        vf_disagreement=disagreement,
        disagrees=disagrees,
    )
