"""Find, size and name the events on a reflection trace.

Input: a trace's time axis (seconds, increasing) and level (volts with the
instrument's incident edge in it, or a reflection coefficient rho with the
reference plane at t = 0). Output: the incident edge, the noise the trace
carries, and every reflection above that noise, each with its round-trip
delay, size, the impedance it implies and what it probably is.

How (all of it vectorised numpy; a million samples take a few tenths of a
second):

1. **Incident edge** (when the trace holds one): the baseline is the median
   of the first samples; the edge is the first place the level leaves the
   baseline by a quarter of the trace's largest excursion (with a matched
   source nothing after the edge moves more than twice its height, so this is
   always on the edge itself); its top is where the level settles after it.
   The level is then expressed as rho = (v - top) / (top - baseline), and
   time is counted from the edge's 50 % point. The 10-90 % time of this edge
   is the trace's rise time.
2. **Step filter.** D[i] = mean(rho after i) - mean(rho before i), two
   windows of ``w`` samples separated by a gap of ``2a`` samples, a and w
   about one rise time: a running sum makes it O(N).
3. **Noise from the data.** sigma = 1.4826 MAD(D) over the analysed span:
   the median absolute deviation, which the few samples near events cannot
   move; it holds for white and for band-limited noise alike. The threshold
   is k sigma with k = sqrt(2 ln(N / w)) + 1.5 (Gaussian noise would cross it
   by chance less than once per trace), and never below
   :data:`MIN_EVENT_SIZE`.
4. **Events.** Runs of |D| above the threshold, grouped when closer than the
   filter's own span (a brief bump gives two opposite lobes). Each group's
   levels before, just after and where it settles are medians over clean
   windows; the 50 % crossing of the edge gives the delay (the peak for a
   brief bump or dip). The level after the event gives the impedance,
   Z = Z0 (1 + rho)/(1 - rho), the trace's impedance profile, which ignores
   the loss and re-reflections in front of the event.
5. **Kind.** From the shape (step, brief bump or dip, or a step that relaxes
   to another level) and the level reached: see :func:`classify`. The
   confidence is a score from 0 to 1 (signal to noise, distance from the
   class's limits, and how many things could look the same), not a
   probability.

A brief bump or dip is placed at its peak: for a small series inductance or
shunt capacitance the reflection is the derivative of the incident edge,
which peaks at the edge's midpoint. Its area gives the lumped value
(step excitation, ideal lines; high-speed digital design texts' TDR
relations, e.g. Hall, Hall and McCall, the TDR section):

.. math::

    \\int\\rho\\,dt = \\frac{L}{2 Z_0} \\text{ (series L)},\\qquad
    \\int\\rho\\,dt = -\\frac{Z_0 C}{2} \\text{ (shunt C)}
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from calc.errors import InputError

#: The smallest step reported even on a noiseless trace, in rho: below what
#: reflectometers resolve (common practice: a few thousandths).
MIN_EVENT_SIZE = 1e-3
#: Most events reported; a trace with more is summarised by the largest.
MAX_EVENTS = 200
#: Relative change of sample interval above which the trace is resampled.
UNIFORM_TOLERANCE = 0.01
#: A step's level must reach this fraction of a full reflection to be called
#: an open or a short (Z above 9 Z0 or below Z0 / 9).
OPEN_SHORT_LEVEL = 0.8

KINDS = ("open", "short", "higher_impedance", "lower_impedance", "capacitive_dip",
         "inductive_bump", "capacitive_load", "inductive_load", "end_of_run", "re_reflection")


@dataclass(frozen=True)
class IncidentEdge:
    """The instrument's own edge, found in the trace."""

    time_s: float  # 50 % point, on the trace's own time axis
    baseline: float  # level before it (as recorded)
    top: float  # level it settles to (as recorded)
    rise_time_s: float  # 10-90 %

    @property
    def height(self) -> float:
        return self.top - self.baseline


@dataclass(frozen=True)
class Event:
    """One reflection event. Levels are rho (fractions of the incident step).

    ``size`` is the step in rho (after minus before); for a brief bump or dip
    it is the peak excursion (signed). ``impedance_ohm`` is what the level
    after the event implies (at the peak for a bump, the settled level for a
    relaxing step); ``inf`` for a level at or above +1.
    """

    round_trip_delay_s: float
    size: float
    level_before: float
    level_after: float
    level_settled: float
    peak_level: float
    impedance_ohm: float
    shape: str  # "step", "bump", "dip" or "relaxing"
    timing: str  # "edge" (50 % of the leading edge) or "peak" (a brief bump's or dip's)
    kind: str
    confidence: float
    snr: float
    time_constant_s: float | None = None
    capacitance_f: float | None = None
    inductance_h: float | None = None
    alternatives: tuple[str, ...] = ()
    level_reached: float = 0.0  # level after, allowing for the loss in front (for naming)
    bounce_of: tuple[int, int] | None = None  # a second trip between these two events
    # where it is (filled by :func:`place`)
    distance_m: float | None = None
    distance_low_m: float | None = None
    distance_high_m: float | None = None
    segment_index: int | None = None
    cable_id: str | None = None
    offset_in_segment_m: float | None = None
    beyond_end: bool = False
    at_far_end: bool = False
    joint_index: int | None = None  # at the joint after this segment (0-based), if any
    loss_delay_s: float = 0.0  # taken off the delay for the loss's lag before placing
    loss_scale: float = 1.0  # fraction of a full reflection the loss in front lets back


@dataclass(frozen=True)
class Analysis:
    """What :func:`analyse` found."""

    z0_ohm: float
    incident: IncidentEdge | None
    time_zero_s: float  # trace time of the reference (edge midpoint or 0)
    sample_interval_s: float
    rise_time_s: float
    noise_rms: float  # per sample, rho
    threshold: float  # smallest step reported, rho
    start_delay_s: float  # earliest round-trip delay the analysis sees
    end_delay_s: float  # latest
    events: tuple[Event, ...]
    resampled: bool = False
    notes: tuple[str, ...] = ()


# ----------------------------------------------------------------- small tools


def implied_impedance(level: float, z0_ohm: float) -> float:
    """.. math:: Z = Z_0 (1+\\rho)/(1-\\rho)   (``inf`` for rho >= 1, 0 for rho <= -1)"""
    if level >= 1.0:
        return math.inf
    if level <= -1.0:
        return 0.0
    return z0_ohm * (1.0 + level) / (1.0 - level)


def _mad_sigma(x: np.ndarray, most: int = 250_000) -> float:
    """Robust standard deviation: 1.4826 x median absolute deviation.

    Long arrays are thinned to about ``most`` evenly spaced samples first (the
    median of a quarter of a million samples is within a fraction of a
    percent of the whole array's).
    """
    if x.size == 0:
        return 0.0
    if x.size > most:
        x = x[::x.size // most]
    med = np.median(x)
    return float(1.4826 * np.median(np.abs(x - med)))


def _box(x: np.ndarray, width: int) -> np.ndarray:
    """Centred moving average of ``width`` samples (edges: as is)."""
    if width <= 1:
        return x
    c = np.concatenate(([0.0], np.cumsum(x)))
    out = x.copy()
    h = width // 2
    out[h:x.size - (width - h) + 1] = (c[width:] - c[:-width]) / width
    return out


def _step_filter(r: np.ndarray, a: int, w: int) -> np.ndarray:
    """D[i] = mean(r[i+a : i+a+w]) - mean(r[i-a-w : i-a]); 0 where undefined."""
    n = r.size
    d = np.zeros(n)
    lo, hi = a + w, n - a - w
    if hi <= lo:
        return d
    c = np.concatenate(([0.0], np.cumsum(r)))
    # slices, not fancy indexing: after window [i+a, i+a+w), before [i-a-w, i-a)
    after = c[lo + a + w:hi + a + w] - c[lo + a:hi + a]
    before = c[lo - a:hi - a] - c[lo - a - w:hi - a - w]
    d[lo:hi] = (after - before) / w
    return d


def _crossing(t: np.ndarray, y: np.ndarray, level: float, near: int, lo: int, hi: int) -> float:
    """Time where ``y`` crosses ``level`` within [lo, hi], the crossing nearest ``near``."""
    seg = y[lo:hi + 1] - level
    s = np.signbit(seg)
    idx = np.flatnonzero(s[1:] != s[:-1])
    if idx.size == 0:
        return float(t[min(max(near, 0), t.size - 1)])
    k = idx[np.argmin(np.abs(idx + lo - near))]
    i = lo + int(k)
    y0, y1 = y[i] - level, y[i + 1] - level
    frac = y0 / (y0 - y1) if y1 != y0 else 0.0
    return float(t[i] + frac * (t[i + 1] - t[i]))


def _uniform(time_s: np.ndarray, level: np.ndarray, steps: np.ndarray
             ) -> tuple[np.ndarray, np.ndarray, bool]:
    """The trace on a uniform time grid (resampled linearly if the steps vary)."""
    dt = float(time_s[-1] - time_s[0]) / (time_s.size - 1)
    if np.max(np.abs(steps - dt)) <= UNIFORM_TOLERANCE * dt:
        return time_s, level, False
    dt = float(np.median(steps))
    n = int(math.floor((time_s[-1] - time_s[0]) / dt)) + 1
    t = time_s[0] + dt * np.arange(n)
    return t, np.interp(t, time_s, level), True


# --------------------------------------------------------------- incident edge


def find_incident_edge(time_s: np.ndarray, level: np.ndarray) -> tuple[IncidentEdge, int]:
    """The instrument's edge and the first sample after it (see module doc, step 1)."""
    n = level.size
    n0 = max(4, min(16, n // 8))
    baseline = float(np.median(level[:n0]))
    excursion = level - baseline
    biggest = float(np.max(np.abs(excursion)))
    first = int(np.argmax(np.abs(excursion) > 0.25 * biggest))
    if first >= 8:  # refine the baseline over the first half of the quiet lead-in
        baseline = float(np.median(level[:first // 2]))
        excursion = level - baseline
        biggest = float(np.max(np.abs(excursion)))
    quiet = level[:max(first // 2, 4)]
    spread = _mad_sigma(np.diff(quiet)) if quiet.size > 4 else 0.0
    if biggest <= 0 or biggest < 20 * spread:
        raise InputError("trace", "no incident edge stands out of the noise; if the trace "
                         "holds reflections only (in rho), say so (--incident at-zero)")
    first = int(np.argmax(np.abs(excursion) > 0.25 * biggest))
    sign = 1.0 if excursion[first] > 0 else -1.0
    e = excursion * sign
    # Where the level settles after the edge: medians over growing windows until stable.
    top, k = float(e[first]), 1
    previous = None
    while first + 2 * k < n:
        top = float(np.median(e[first + k:first + 2 * k]))
        if previous is not None and abs(top - previous) < 0.02 * abs(top):
            break
        previous = top
        k *= 2
    if top <= 0.25 * biggest * 0.5:
        raise InputError("trace", "the incident edge does not settle; is this a step trace?")
    hi = min(n - 1, first + 2 * k)
    lo = max(0, first - 2 * k)
    smooth = e
    t10 = _crossing(time_s, smooth, 0.1 * top, first, lo, hi)
    t50 = _crossing(time_s, smooth, 0.5 * top, first, lo, hi)
    t90 = _crossing(time_s, smooth, 0.9 * top, first, lo, hi)
    dt = float(time_s[1] - time_s[0])
    rise = max(t90 - t10, dt)
    edge = IncidentEdge(t50, baseline, baseline + sign * top, rise)
    after = int(np.searchsorted(time_s, t90 + rise)) + 1
    return edge, min(after, n - 1)


# ---------------------------------------------------------------------- analyse


def analyse(time_s: np.ndarray, level: np.ndarray, *, z0_ohm: float = 50.0,
            incident_edge: bool = True, rise_time_s: float | None = None,
            ringing: float = 0.0, min_size: float = MIN_EVENT_SIZE,
            max_events: int = MAX_EVENTS) -> Analysis:
    """Find the events on a trace (module doc). ``incident_edge`` False means
    ``level`` is already rho with the reference plane at t = 0.

    ``rise_time_s`` is the trace's edge (found from the incident edge when
    there is one; estimated from the largest edge otherwise). ``ringing`` is
    the fraction of a step that a transform's window leaves as ripple near it
    (0 for a recorded trace); ripple within that fraction of a nearby larger
    event is not reported. ``min_size`` is the smallest step reported
    whatever the noise (rho).
    """
    t = np.asarray(time_s, dtype=float)
    v = np.asarray(level, dtype=float)
    if t.ndim != 1 or t.shape != v.shape or t.size < 8:
        raise InputError("trace", "a trace needs at least 8 samples of time and level")
    if not (np.isfinite(t).all() and np.isfinite(v).all()):
        raise InputError("trace", "the trace holds values that are not finite")
    steps = np.diff(t)
    if (steps <= 0).any():
        raise InputError("trace", "time must increase from sample to sample")
    if not (math.isfinite(z0_ohm) and z0_ohm > 0):
        raise InputError("--z0", "Z0 must be a positive number of ohms", "50 ohm")
    t, v, resampled = _uniform(t, v, steps)
    dt = float(t[1] - t[0])
    notes: list[str] = []
    if resampled:
        notes.append("the samples were not evenly spaced; the trace was resampled evenly")
    edge = None
    if incident_edge:
        edge, start = find_incident_edge(t, v)
        rho = (v - edge.top) / edge.height
        t_zero = edge.time_s
        rise = edge.rise_time_s if rise_time_s is None else rise_time_s
    else:
        rho = v
        t_zero = 0.0
        start = 0
        rise = rise_time_s if rise_time_s else _estimate_rise(t, rho)
    n_rise = min(max(rise / dt, 1.0), float(t.size))  # a stated rise longer than the trace
    a = max(1, int(math.ceil(0.75 * n_rise)))
    w = max(2, int(math.ceil(n_rise)))
    d = _step_filter(rho, a, w)
    lo = min(start + a + w, rho.size)
    hi = max(rho.size - a - w, lo)
    span = d[lo:hi]
    if span.size < 4:
        raise InputError("trace", "too little of the trace follows the incident edge (or the "
                         "reference plane) to analyse at its rise time")
    sigma_d = _mad_sigma(span)
    k_thin = max(1, (hi - lo) // 250_000)  # pairs of neighbours, thinned like _mad_sigma
    noise_rms = _mad_sigma(rho[lo + 1:hi:k_thin] - rho[lo:hi - 1:k_thin]) / math.sqrt(2.0)
    k = math.sqrt(2.0 * math.log(max(span.size / w, 2.0))) + 1.5
    threshold = max(k * sigma_d, min_size)
    mask = np.zeros(rho.size, dtype=bool)
    mask[lo:hi] = np.abs(span) > threshold
    groups = _groups(_cores(mask, np.abs(d), threshold), d, 2 * a + w, threshold)
    smooth_width = max(1, int(n_rise // 3))
    events: list[Event] = []
    window = max(w, 4)
    for gi, (s, e) in enumerate(groups):
        prev_end = groups[gi - 1][1] if gi else lo - (a + w)
        next_start = groups[gi + 1][0] if gi + 1 < len(groups) else rho.size
        ev = _measure(t, rho, smooth_width, d, s, e, prev_end, next_start, window, t_zero,
                      sigma_d, threshold, z0_ohm, dt, n_rise)
        if ev is None:
            continue
        faint = float(np.max(np.abs(d[s:e + 1]))) < 3.0 * threshold
        if faint and events and _still_moving(events[-1], ev, threshold):
            # the previous event's level is still creeping this way (cable loss, a
            # reactance settling): this is its tail, not an event of its own
            events[-1] = replace(events[-1], level_settled=ev.level_settled)
            continue
        events.append(ev)
    if ringing > 0:
        events = _drop_ringing(events, ringing, 20 * rise)
    if len(events) > max_events:
        keep = sorted(sorted(events, key=lambda ev: -abs(ev.size))[:max_events],
                      key=lambda ev: ev.round_trip_delay_s)
        notes.append(f"{len(events)} events found; the {max_events} largest are listed")
        events = keep
    events = _name_all(events, rise, threshold)
    return Analysis(
        z0_ohm=z0_ohm, incident=edge, time_zero_s=t_zero, sample_interval_s=dt,
        rise_time_s=rise, noise_rms=noise_rms, threshold=threshold,
        start_delay_s=float(t[lo] - t_zero), end_delay_s=float(t[hi - 1] - t_zero),
        events=tuple(events), resampled=resampled, notes=tuple(notes))


def _estimate_rise(t: np.ndarray, r: np.ndarray) -> float:
    """10-90 % time of the first clear edge of a reflection-only trace.

    The first edge is the least spread by cable loss. Its width is where the
    slope stays above 10 % of its peak; a Gaussian-filtered step is 4.29
    sigma wide there and rises 10-90 % in 2.56 sigma, hence the factor 0.6.
    """
    dt = float(t[1] - t[0])
    slope = np.abs(np.diff(_box(r, 3)))
    big = float(slope.max())
    if big == 0:
        return dt
    noise = _mad_sigma(slope)
    i = int(np.argmax(slope > max(0.3 * big, 8 * noise)))
    reach = min(slope.size, i + 64)
    i += int(np.argmax(slope[i:reach]))  # the local peak of that edge
    thresh = 0.1 * slope[i]
    left = i
    while left > 0 and slope[left - 1] > thresh:
        left -= 1
    right = i
    while right < slope.size - 1 and slope[right + 1] > thresh:
        right += 1
    return max(0.6 * (right - left + 1) * dt, dt)


def _runs(mask: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Start and end (inclusive) indices of the runs of True in ``mask``."""
    edges = np.diff(np.concatenate(([0], mask.astype(np.int8), [0])))
    return np.flatnonzero(edges == 1), np.flatnonzero(edges == -1) - 1


#: A bump or dip wider than this many rise times at half its height is a
#: slow reactance, placed by its leading edge rather than its peak.
BROAD_RISE_TIMES = 2.0
#: Rise times after an edge at which the level after it is read.
SETTLE_RISE_TIMES = 8.0
#: Within a run above the threshold, only samples above this fraction of the
#: run's peak belong to the edge; the rest is the slow creep around it.
CORE_FRACTION = 0.3


def _cores(mask: np.ndarray, mag: np.ndarray, threshold: float) -> list[tuple[int, int]]:
    """The edges inside the runs of ``mask``: samples above CORE_FRACTION of the run's peak.

    A slow creep (cable loss, a long section's own slope) keeps the filter a
    little above a low threshold for a long time; trimming each run to its
    cores stops that creep from gluing separate edges into one event. Cores
    of one run are joined again where the filter between them stays above
    CORE_FRACTION of the smaller one's peak (noise around the cut, not a
    valley).
    """
    starts, ends = _runs(mask)
    out: list[tuple[int, int]] = []
    for s, e in zip(starts, ends, strict=True):
        seg = mag[s:e + 1]
        peak = float(seg.max())
        cs, ce = _runs(seg >= max(CORE_FRACTION * peak, threshold))
        cores = [(int(a), int(b), float(seg[a:b + 1].max())) for a, b in zip(cs, ce, strict=True)]
        merged = [cores[0]]
        for a, b, p in cores[1:]:
            pa, pb, pp = merged[-1]
            valley = float(seg[pb + 1:a].min()) if a > pb + 1 else p
            if valley >= CORE_FRACTION * min(p, pp):
                merged[-1] = (pa, b, max(p, pp))
            else:
                merged.append((a, b, p))
        out += [(int(s) + a, int(s) + b) for a, b, _p in merged]
    return out


def _groups(edges: list[tuple[int, int]], d: np.ndarray, gap: int, threshold: float
            ) -> list[tuple[int, int]]:
    """Edges (inclusive sample bounds) joined into events.

    Two runs join when the gap between them is at most ``gap`` (the filter's
    own span: a brief bump shows as two opposite lobes), or when the later
    run is faint (its peak below 3 thresholds), has the same sign, and the
    gap is at most half the length of the event so far (a step dispersed by
    cable loss keeps creeping the same way for a while).
    """
    if not edges:
        return []
    starts = np.array([a for a, _b in edges])
    ends = np.array([b for _a, b in edges])
    signs = np.sign(d[starts])
    faint = np.maximum.reduceat(np.abs(d), starts) < 3.0 * threshold
    out = []
    s, e, sign = int(starts[0]), int(ends[0]), signs[0]
    for k in range(1, starts.size):
        space = int(starts[k]) - e
        if space <= gap or (faint[k] and signs[k] == sign and space <= (e - s) // 2):
            e = int(ends[k])
            continue
        out.append((s, e))
        s, e, sign = int(starts[k]), int(ends[k]), signs[k]
    out.append((s, e))
    return out


def _measure(t, rho, smooth_width, d, s, e, prev_end, next_start, window, t_zero, sigma_d,
             threshold, z0_ohm, dt, n_rise) -> Event | None:
    """Levels, delay and shape of one group of samples [s, e].

    The level after is the median around SETTLE_RISE_TIMES rise times past the
    edge (where the predictor's arrival sizes are taken too), or just after
    the edge when the next event comes sooner. Crossings and peaks are read on
    a lightly smoothed copy of the stretch up to the next event.
    """
    n = rho.size
    k0 = max(s - smooth_width, 0)
    k1 = min(max(next_start, e + 1) + smooth_width, n)
    tt = t[k0:k1]
    sm = _box(rho[k0:k1], smooth_width)  # index i of the trace is sm[i - k0]
    b0 = max(prev_end + 1, s - window, 0)
    before = float(np.median(rho[b0:s])) if s > b0 else float(rho[max(s - 1, 0)])
    i_d = s + int(np.argmax(np.abs(d[s:e + 1])))

    def level_after(i_edge: int) -> float:
        centre = i_edge + int(SETTLE_RISE_TIMES * n_rise)
        half = max(2, int(n_rise))
        a0, a1 = max(centre - half, i_edge + 1), min(centre + half, next_start, n)
        if a1 <= a0:
            a0, a1 = e + 1, min(e + 1 + window, next_start, n)
        return float(np.median(rho[a0:a1])) if a1 > a0 else float(rho[min(e, n - 1)])

    after = level_after(i_d)
    s0 = max(next_start - window, e + 1)
    s1 = min(next_start, rho.size)
    settled = float(np.median(rho[s0:s1])) if s1 > s0 else after
    seg = sm[s - k0:e + 1 - k0] - before
    k_peak = int(np.argmax(np.abs(seg)))
    excursion = float(seg[k_peak])
    net = after - before
    if abs(excursion) < threshold:
        return None
    # the swing against the final direction (a capacitor dips before it rises)
    final = settled - before if abs(settled - before) > abs(net) else net
    k_against = int(np.argmin(seg)) if final > 0 else int(np.argmax(seg))
    against = float(seg[k_against]) if final * float(seg[k_against]) < 0 else 0.0
    area = 0.0
    if abs(net) < 0.35 * abs(excursion) and abs(settled - before) < 0.35 * abs(excursion):
        shape = "bump" if excursion > 0 else "dip"
    elif abs(against) > max(4 * threshold, 0.15 * abs(final)):
        shape, excursion, k_peak = "relaxing", against, k_against
    elif min(abs(excursion) - abs(net), abs(excursion) - abs(settled - before)) > \
            max(0.3 * abs(net), 4 * threshold):
        shape = "relaxing"  # overshoots, then comes back part way (an L into a load)
    elif (settled - after) * net < 0 and abs(settled - after) > max(0.25 * abs(net),
                                                                     4 * threshold):
        shape = "relaxing"  # steps, then drifts back (a slow reactance)
    else:
        shape = "step"
    i_peak = s + k_peak
    peak = before + excursion
    timing = "edge"
    if shape in ("bump", "dip"):
        # A brief one is placed at its peak (the derivative of the edge peaks at
        # the edge's midpoint); a broad one (a slow reactance) by its leading edge.
        above = np.abs(seg) >= 0.5 * abs(excursion)
        if int(np.count_nonzero(above)) <= BROAD_RISE_TIMES * n_rise:
            time, timing = _peak_time(tt, sm, i_peak - k0), "peak"
        else:
            time = _crossing(tt, sm, before + 0.5 * excursion, i_peak - k0, s - k0, i_peak - k0)
        size = excursion
        tail = min(e + 1 + 2 * (e - s + 1), next_start, rho.size)  # slow tails of reactances
        area = float(np.sum(rho[s:tail] - before) * dt)
        level_for_z = peak
    elif shape == "relaxing":
        time = _crossing(tt, sm, before + 0.5 * excursion, i_peak - k0, s - k0, i_peak - k0)
        size = excursion
        level_for_z = settled
    else:
        # The 50 % point, and the level after read from it (not from the filter's
        # peak, which wanders along a slow, loss-spread edge): twice, to settle.
        i_mid = i_d
        for _ in range(2):
            time = _crossing(tt, sm, 0.5 * (before + after), i_mid - k0, s - k0, e - k0)
            i_mid = min(max(int(np.searchsorted(t, time)), s), e)
            after = level_after(i_mid)
        time = _crossing(tt, sm, 0.5 * (before + after), i_mid - k0, s - k0, e - k0)
        size = after - before
        level_for_z = after
    if abs(size) < threshold:  # swings that come back to nothing within the noise
        return None
    snr = abs(size) / sigma_d if sigma_d > 0 else math.inf
    tau = None
    if shape == "relaxing":
        tau = _time_constant(tt, sm, i_peak - k0, min(next_start, n) - 1 - k0, peak, settled)
    cap = ind = None
    if shape == "dip":
        cap = -2.0 * area / z0_ohm
    elif shape == "bump":
        ind = 2.0 * z0_ohm * area
    return Event(
        round_trip_delay_s=time - t_zero, size=size, level_before=before, level_after=after,
        level_settled=settled, peak_level=peak,
        impedance_ohm=implied_impedance(level_for_z, z0_ohm), shape=shape, kind="",
        confidence=0.0, snr=snr, timing=timing, time_constant_s=tau, capacitance_f=cap,
        inductance_h=ind)


def _still_moving(prev: Event, ev: Event, threshold: float) -> bool:
    """True when ``prev``'s level was still moving the way ``ev`` goes."""
    creep = prev.level_settled - prev.level_after
    return abs(creep) > 2.0 * threshold and np.sign(creep) == np.sign(ev.size)


def _peak_time(t: np.ndarray, y: np.ndarray, i: int) -> float:
    """Time of the extremum at sample i, refined by a parabola through three samples."""
    if i <= 0 or i >= y.size - 1:
        return float(t[i])
    y0, y1, y2 = y[i - 1], y[i], y[i + 1]
    den = y0 - 2 * y1 + y2
    shift = 0.5 * (y0 - y2) / den if den != 0 else 0.0
    shift = max(-1.0, min(1.0, shift))
    return float(t[i] + shift * (t[1] - t[0]))


def _time_constant(t, y, i_start, i_end, start_level, final_level) -> float | None:
    """Time from ``i_start`` until y has gone 63 % of the way to ``final_level``."""
    if i_end <= i_start:
        return None
    target = start_level + (1.0 - math.exp(-1.0)) * (final_level - start_level)
    seg = y[i_start:i_end + 1]
    crossed = (seg - target) * np.sign(final_level - start_level) >= 0
    if not crossed.any():
        return None
    j = int(np.argmax(crossed))
    return float(t[i_start + j] - t[i_start])


def _drop_ringing(events: list[Event], ringing: float, reach_s: float) -> list[Event]:
    """Drop events no bigger than ``ringing`` x a larger event within ``reach_s``."""
    out = []
    for ev in events:
        near = [o for o in events if o is not ev
                and abs(o.round_trip_delay_s - ev.round_trip_delay_s) <= reach_s]
        if near and abs(ev.size) <= ringing * max(abs(o.size) for o in near):
            continue
        out.append(ev)
    return out


# --------------------------------------------------------------------- naming


@dataclass(frozen=True)
class Verdict:
    """What an event probably is: its kind, a confidence score, what else it could be."""

    kind: str
    confidence: float
    alternatives: tuple[str, ...] = ()
    reached: float = 0.0  # the level after, allowing for the loss in front


#: Multiple reflections: an event this close (in rise times) to t_j + (t_j - t_i)
#: for two earlier events i < j, and no bigger than BOUNCE_SIZE x their sizes'
#: product (plus the noise), is the wave's second trip between them.
BOUNCE_RISE_TIMES = 1.5
BOUNCE_SIZE = 2.0


def classify(ev: Event, *, loss_scale: float = 1.0, is_last: bool = False,
             at_far_end: bool = False, after_end: bool = False,
             bounce: bool = False) -> Verdict:
    """Name an event from its shape and level.

    ``loss_scale`` (0..1] is the fraction of a full reflection that survives
    the cable in front of the event at the trace's edge speed (1 when
    unknown or lossless): a step is divided by it before being compared
    with the open/short limits. ``at_far_end`` says the event sits at the far
    end of the described run; ``is_last`` that nothing follows it;
    ``after_end`` that it comes after an open or a short, or past the far
    end of the described run, where nothing further down the cable can show;
    ``bounce`` that its delay and size fit a second trip between two earlier
    events.

    Rules (common practice of trace reading):

    * after an open, a short or the run's far end, or timed and sized as a
      second trip between two earlier mismatches: a re-reflection;
    * level reaching at least +0.8 (Z >= 9 Z0) after a rise: an open, or a
      very high impedance; at most -0.8 after a fall: a short;
    * any other lasting rise: a higher-impedance section (or, at the end, a
      load above Z0); a fall: a lower-impedance section (wet or crushed
      cable, a different cable, or a load below Z0);
    * a brief bump: series inductance (or a short higher-impedance piece);
      a brief dip: shunt capacitance (or a short lower-impedance piece); at
      the far end, a load with inductance in series or capacitance across;
    * a fall that relaxes upward: a capacitive load; a rise that relaxes
      downward: an inductive load.

    The confidence is a score, not a probability: the signal-to-noise part
    ``1 - exp(-snr/20)`` times a factor for how many things look the same
    (0.95 for a clear open or short on a lossless cable, 0.85 at the end of
    a described run, 0.75 for a section or a reactance, 0.6 for the last
    event when the run's end is unknown) times, for an open or a short, how
    far past the +/-0.8 limit the level goes.
    """
    scale = min(max(loss_scale, 0.05), 1.0)
    snr_score = 1.0 - math.exp(-ev.snr / 20.0) if math.isfinite(ev.snr) else 1.0
    reached = ev.level_before + ev.size / scale

    def verdict(kind, factor, alternatives=()):
        return Verdict(kind, round(min(max(factor * snr_score, 0.0), 1.0), 2),
                       tuple(alternatives), reached)

    if after_end or bounce:
        return verdict("re_reflection", 0.7)
    if ev.shape in ("bump", "dip") and at_far_end:
        if ev.shape == "bump":
            return verdict("inductive_load", 0.7, ("inductive_bump",))
        return verdict("capacitive_load", 0.7, ("capacitive_dip",))
    if ev.shape == "bump":
        return verdict("inductive_bump", 0.75, ("higher_impedance",))
    if ev.shape == "dip":
        return verdict("capacitive_dip", 0.75, ("lower_impedance",))
    if ev.shape == "relaxing":
        if ev.size < 0:
            return verdict("capacitive_load", 0.7, ("lower_impedance",))
        return verdict("inductive_load", 0.7, ("higher_impedance",))
    clear = 0.95 if scale >= 0.98 else 0.8
    if ev.size > 0 and reached >= OPEN_SHORT_LEVEL:
        margin = min(1.0, (reached - OPEN_SHORT_LEVEL) / (1.0 - OPEN_SHORT_LEVEL) + 0.5)
        return verdict("open", clear * margin, ("higher_impedance",))
    if ev.size < 0 and reached <= -OPEN_SHORT_LEVEL:
        margin = min(1.0, (-OPEN_SHORT_LEVEL - reached) / (1.0 - OPEN_SHORT_LEVEL) + 0.5)
        return verdict("short", clear * margin, ("lower_impedance",))
    if at_far_end:
        return verdict("end_of_run", 0.85,
                       ("higher_impedance" if ev.size > 0 else "lower_impedance",))
    kind = "higher_impedance" if ev.size > 0 else "lower_impedance"
    return verdict(kind, 0.6 if is_last else 0.75, ("end_of_run",) if is_last else ())


def _bounces(events: list[Event], rise_s: float, threshold: float
             ) -> list[tuple[int, int] | None]:
    """For each event, (i, j) when it is timed and sized as a second trip
    between earlier events i < j, else None (all pairs at once, with numpy)."""
    n = len(events)
    out: list[tuple[int, int] | None] = [None] * n
    if n < 3:
        return out
    t = np.array([e.round_trip_delay_s for e in events])
    size = np.abs(np.array([e.size for e in events]))
    i, j = np.triu_indices(n, k=1)
    when = 2.0 * t[j] - t[i]
    most = BOUNCE_SIZE * size[i] * size[j] + 3.0 * threshold
    for k in range(2, n):
        fits = (j < k) & (np.abs(t[k] - when) <= BOUNCE_RISE_TIMES * rise_s) & (size[k] <= most)
        if fits.any():
            m = int(np.flatnonzero(fits)[0])
            out[k] = (int(i[m]), int(j[m]))
    return out


def _name_all(events: list[Event], rise_s: float, threshold: float, loss_scales=None,
              far_end=None) -> list[Event]:
    """Name every event in order; what follows an open, a short or the far end
    of the run, or what is timed as a second trip between two earlier
    events, is a re-reflection."""
    out: list[Event] = []
    ended = False
    bounces = _bounces(events, rise_s, threshold)
    for k, ev in enumerate(events):
        at_end = bool(far_end and far_end[k])
        bounce = bounces[k]
        verdict = classify(ev, loss_scale=1.0 if loss_scales is None else loss_scales[k],
                           is_last=k == len(events) - 1, at_far_end=at_end,
                           after_end=ended or (ev.beyond_end and not at_end),
                           bounce=bounce is not None)
        out.append(replace(ev, kind=verdict.kind, confidence=verdict.confidence,
                           alternatives=verdict.alternatives, level_reached=verdict.reached,
                           bounce_of=bounce))
        ended = ended or verdict.kind in ("open", "short") or at_end
    return out


# ---------------------------------------------------------------------- place


@dataclass(frozen=True)
class LossEffect:
    """What the cable's loss does to a full reflection from a given distance,
    as :func:`analyse` measures it: the step's size (a fraction of 1) and how
    late its 50 % point comes after the lossless round trip."""

    scale: float = 1.0
    delay_s: float = 0.0  # lag of a step's 50 % point
    peak_delay_s: float = 0.0  # lag of the steepest point: where a brief bump or dip peaks


def loss_effect(distance_m: float, rise_time_s: float, segments=None, cable=None,
                threshold: float = MIN_EVENT_SIZE) -> LossEffect:
    """The loss of the cable between the instrument and ``distance_m``.

    The echo predictor (:func:`calc.simulate.simulate`) is run on that stretch
    (the run's pieces, or ``cable`` for one cable), all at the first cable's
    Z0 so that only loss counts, ended in an open, at the trace's rise time;
    :func:`analyse` then reads its step exactly as it reads the recorded
    trace (with that trace's ``threshold``). Skin-effect loss spreads the
    edge, so its 50 % point comes late: the lag is taken off the event's
    delay before placing it.
    """
    from calc.loads import parse_load
    from calc.simulate import Segment, simulate

    cables = [s.cable for s in segments] if segments is not None else [cable]
    if distance_m <= 0 or not any(c is not None and c.has_loss_model for c in cables):
        return LossEffect()
    z0 = cables[0].z0_ohm
    if segments is None:
        front = [Segment(distance_m, z0, cable.vf, cable.atten_k1, cable.atten_k2, cable.id)]
    else:
        front, start = [], 0.0
        for k, seg in enumerate(segments):
            last = k == len(segments) - 1
            part = distance_m - start if last else min(seg.length_m, distance_m - start)
            if part > 0:
                c = seg.cable
                front.append(Segment(part, z0, c.vf, c.atten_k1, c.atten_k2, c.id))
            start += seg.length_m
    pred = simulate(front, parse_load("open", "load"), rise_time_s=rise_time_s)
    seen = analyse(pred.time_s, pred.level, incident_edge=False, rise_time_s=rise_time_s,
                   min_size=threshold).events
    if not seen:
        return LossEffect(0.05, 0.0)
    lossless = 2.0 * sum(p.delay_s for p in front)
    step = seen[0]
    # A small series L or shunt C reflects the derivative of the edge, so a
    # brief bump peaks where this lossy step is steepest.
    slope = np.diff(pred.level)
    steepest = _peak_time(pred.time_s[:-1], slope, int(np.argmax(slope)))
    steepest += 0.5 * float(pred.time_s[1] - pred.time_s[0])
    return LossEffect(float(min(max(step.size, 0.05), 1.0)),
                      max(step.round_trip_delay_s - lossless, 0.0),
                      max(steepest - lossless, 0.0))


def _placed(ev: Event, t: float, rise: float, vf, vf_tolerance, segments) -> Event:
    """``ev`` put at round-trip delay ``t`` on one cable or in a run."""
    from calc import locate as loc
    from calc.errors import OutOfRunError

    if segments is None:
        if t <= 0:
            return replace(ev, distance_m=0.0, distance_low_m=0.0, distance_high_m=0.0)
        where = loc.locate(t, vf, vf_tolerance)
        return replace(ev, distance_m=where.distance_m, distance_low_m=where.distance_low_m,
                       distance_high_m=where.distance_high_m)
    end = loc.run_junctions(segments)[-1]
    at_end = end.round_trip_delay_low_s - rise <= t <= end.round_trip_delay_high_s + rise
    if t <= 0:
        return replace(ev, distance_m=0.0, distance_low_m=0.0, distance_high_m=0.0,
                       segment_index=0, cable_id=segments[0].cable.id, offset_in_segment_m=0.0)
    try:
        where = loc.locate_in_run(t, segments)
    except OutOfRunError:
        past = loc.distance_from_delay_m(t - end.round_trip_delay_s, segments[-1].cable.vf)
        return replace(ev, distance_m=end.distance_m + past, distance_low_m=None,
                       distance_high_m=None, segment_index=None, cable_id=None,
                       offset_in_segment_m=None, beyond_end=True, at_far_end=at_end)
    joint = None
    for j in loc.run_junctions(segments)[:-1]:
        if j.round_trip_delay_low_s - rise <= t <= j.round_trip_delay_high_s + rise:
            joint = j.after_segment_index
    return replace(ev, distance_m=where.distance_m, distance_low_m=where.distance_low_m,
                   distance_high_m=where.distance_high_m, segment_index=where.segment_index,
                   cable_id=where.cable_id, offset_in_segment_m=where.offset_in_segment_m,
                   beyond_end=False, at_far_end=at_end, joint_index=joint)


def place(analysis: Analysis, *, vf: float | None = None, vf_tolerance: float = 0.0,
          segments=None, cable=None, with_loss: bool = True) -> Analysis:
    """Put every event at a distance with the locate core: on one cable of
    velocity factor ``vf``, or in a run of ``segments`` (calc.run.RunSegment).

    An event at or before the reference plane is put at 0 m. In a run, an
    event later than the far end (even with every cable at its slowest) is
    marked ``beyond_end`` and placed past the end on the last cable's
    velocity; one whose delay range covers the far end's is ``at_far_end``.
    When ``with_loss`` and the cables (``segments``, or the one ``cable``)
    carry a loss model, a step's delay is first corrected for the lag that
    loss gives its 50 % point (a brief bump's or dip's for the lag of its
    peak; a slow reactance's first swing, faster than a full step, for half
    the step's lag, which the tests find good to a centimetre or two), and
    every event's size is weighed against the loss in front of it (:func:`loss_effect`); ``loss_delay_s`` and
    ``loss_scale`` say by how much. Past the far end the last cable is taken
    to go on. The events are then named again with that knowledge.
    """
    if (vf is None) == (segments is None):
        raise ValueError("give a velocity factor or a run of segments")
    rise = analysis.rise_time_s
    placed, scales = [], []
    for ev in analysis.events:
        first = _placed(ev, ev.round_trip_delay_s, rise, vf, vf_tolerance, segments)
        effect = LossEffect()
        if with_loss and first.distance_m:
            effect = loss_effect(first.distance_m, rise, segments, cable, analysis.threshold)
        if ev.timing == "peak":
            lag = effect.peak_delay_s
        elif ev.shape == "step":
            lag = effect.delay_s
        else:  # a reactance's first swing is faster than a full step: half its lag
            lag = 0.5 * effect.delay_s
        if lag > 0:
            first = _placed(ev, ev.round_trip_delay_s - lag, rise, vf, vf_tolerance, segments)
        placed.append(replace(first, loss_delay_s=lag, loss_scale=effect.scale))
        scales.append(effect.scale)
    far_end = [ev.at_far_end for ev in placed]
    return replace(analysis, events=tuple(_name_all(placed, rise, analysis.threshold, scales,
                                                    far_end)))


def run_segments(segments):
    """calc.run.RunSegment list -> calc.simulate.Segment list (the echo predictor's)."""
    from calc.simulate import Segment

    return [Segment.from_run_segment(s) for s in segments]


# -------------------------------------------------------------------- compare


@dataclass(frozen=True)
class Expected:
    """An event the prediction shows, as the same finder sees it."""

    round_trip_delay_s: float
    distance_m: float
    size: float
    kind: str
    path: str  # the bounce path of the largest arrival that makes it
    tolerance_s: float
    tolerance_m: float


@dataclass(frozen=True)
class Pairing:
    """A predicted event and the found event taken for it."""

    expected: Expected
    found: Event
    offset_s: float  # found minus expected
    offset_m: float
    size_differs: bool
    kind_differs: bool


@dataclass(frozen=True)
class Comparison:
    """The trace against the prediction for the expected run and load.

    ``matched`` are found within tolerance of where they were predicted;
    ``misplaced`` found with the right sign but outside tolerance (within the
    search reach); ``missing`` predicted but not found; ``unexpected`` found
    but not predicted; ``outside`` predicted beyond the recorded window.
    """

    matched: tuple[Pairing, ...]
    misplaced: tuple[Pairing, ...]
    missing: tuple[Expected, ...]
    unexpected: tuple[Event, ...]
    outside: tuple[Expected, ...]
    rise_time_s: float
    vf_tolerance: float


#: Tolerance of a match: TOLERANCE_RISE_TIMES rise times plus the cables'
#: VF tolerance times the predicted delay.
TOLERANCE_RISE_TIMES = 1.5
#: A found event further from its prediction than this many tolerances, or
#: than MISPLACED_REACH of the predicted delay (MISPLACED_REACH_SAME for an
#: event of the same kind), whichever is more, is not taken for it at all.
MISPLACED_TOLERANCES = 4.0
MISPLACED_REACH = 0.15
MISPLACED_REACH_SAME = 0.5
#: Pairing prefers events of the same kind: a different kind costs this many
#: tolerances. A re-reflection is never paired with a first reflection.
KIND_PENALTY = 2.0


def expected_events(prediction, analysis: Analysis, segments,
                    vf_tolerance: float) -> list[Expected]:
    """The events :func:`analyse` finds on a noiseless prediction, at the
    recorded trace's rise time and threshold, placed and named on the
    expected run (``segments``, calc.run.RunSegment) as the trace's are."""
    pa = analyse(prediction.time_s, prediction.level, z0_ohm=analysis.z0_ohm,
                 incident_edge=False, rise_time_s=analysis.rise_time_s,
                 min_size=analysis.threshold)
    pa = place(pa, segments=segments)
    out = []
    for ev in pa.events:
        t = ev.round_trip_delay_s
        arrival_t = t - ev.loss_delay_s
        near = [a for a in prediction.arrivals
                if abs(a.time_s - arrival_t) <= 2.0 * analysis.rise_time_s]
        path = max(near, key=lambda a: abs(a.size)).path if near else ""
        tol_s = TOLERANCE_RISE_TIMES * analysis.rise_time_s + vf_tolerance * max(t, 0.0)
        d = float(np.interp(t, prediction.time_s, prediction.distance_m))
        d_hi = float(np.interp(t + tol_s, prediction.time_s, prediction.distance_m))
        out.append(Expected(t, ev.distance_m if ev.distance_m is not None else d, ev.size,
                            ev.kind, path, tol_s, abs(d_hi - d)))
    return out


def compare(analysis: Analysis, prediction, segments, *, vf_tolerance: float = 0.0
            ) -> Comparison:
    """Match the found events with those predicted for the expected run
    ``segments`` (the run ``prediction`` was made for; see :class:`Comparison`).

    Matching: same sign of size, re-reflections only with re-reflections;
    pairs are taken closest first (in units of their tolerance, plus
    :data:`KIND_PENALTY` when the kinds differ), each event at most once.
    Offsets are the found event's distance as placed on the user's cable or
    run, minus the predicted one's on the expected run (each with the loss's
    lag taken off); a found event past the end of the user's run is placed
    on the expected run instead.
    """
    expected = expected_events(prediction, analysis, segments, vf_tolerance)
    lo, hi = analysis.start_delay_s, analysis.end_delay_s
    inside = [x for x in expected if lo <= x.round_trip_delay_s <= hi]
    outside = tuple(x for x in expected if not lo <= x.round_trip_delay_s <= hi)
    found = list(analysis.events)
    pairs = []
    for i, x in enumerate(inside):
        for j, ev in enumerate(found):
            if np.sign(ev.size) != np.sign(x.size):
                continue
            if (ev.kind == "re_reflection") != (x.kind == "re_reflection"):
                continue  # a bounce is never taken for a first reflection
            same = ev.kind == x.kind
            reach = max(MISPLACED_TOLERANCES * x.tolerance_s,
                        (MISPLACED_REACH_SAME if same else MISPLACED_REACH)
                        * x.round_trip_delay_s)
            dt = ev.round_trip_delay_s - x.round_trip_delay_s
            if abs(dt) <= reach:
                pairs.append((abs(dt) / x.tolerance_s + (0.0 if same else KIND_PENALTY),
                              i, j, dt))
    pairs.sort()
    used_x, used_f = set(), set()
    matched, misplaced = [], []
    for _score, i, j, dt in pairs:
        if i in used_x or j in used_f:
            continue
        used_x.add(i)
        used_f.add(j)
        x, ev = inside[i], found[j]
        where = ev
        if ev.distance_m is None or ev.beyond_end:  # not placed on the user's run: use ours
            where = _placed(ev, ev.round_trip_delay_s - ev.loss_delay_s,
                            analysis.rise_time_s, None, 0.0, segments)
        offset_m = where.distance_m - x.distance_m
        size_differs = abs(ev.size - x.size) > max(0.3 * abs(x.size), 3 * analysis.threshold)
        pairing = Pairing(x, ev, dt, offset_m, size_differs, ev.kind != x.kind)
        (matched if abs(dt) <= x.tolerance_s else misplaced).append(pairing)
    missing = tuple(x for i, x in enumerate(inside) if i not in used_x)
    unexpected = tuple(ev for j, ev in enumerate(found) if j not in used_f)
    return Comparison(tuple(matched), tuple(misplaced), missing, unexpected, outside,
                      analysis.rise_time_s, vf_tolerance)
