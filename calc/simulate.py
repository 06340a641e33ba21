"""Whole-run prediction: what a reflectometer at the near end of a run shows.

The run is a list of :class:`Segment` (length, Z0, VF, loss k1 sqrt(f) + k2 f
as in the catalog), optional :class:`Lump` discontinuities between segments
(series R or L, shunt C: a connector, a crushed spot), a load
(:class:`calc.loads.Load`) and the instrument (source impedance, and a step
with a rise time or a pulse of a width).

How the waveform is made (:func:`simulate`):

1. The run is cascaded in the complex frequency s, from the load back to
   the instrument, vectorised with numpy (one reflection recursion per
   junction; consecutive segments of one impedance share one exponential).
   The result is the reflection coefficient seen by the instrument,
   referenced to its own source impedance, which includes every
   re-reflection between the junctions and the source. The lines are causal
   (:func:`calc.cable.causal_line_coefficients`); on the frequency axis the
   same cascade is :func:`reflection_spectrum`, what an analyser reads.
2. The instrument's edge (a step through a Gaussian of the 10-90 % rise
   time, or a pulse: that step minus itself delayed by the width) and a short
   pre-trigger delay multiply it, and 1/s makes it a step response.
3. Nothing wraps: the transform is taken along Re s = c rather than on the
   frequency axis (the numerical Laplace transform, or "exponential window"),
   with c T = ln 1e6 for the FFT period T. What lies beyond one period --
   a long train of re-reflections, a slow capacitor, the skin effect's
   creep toward its final level, which no finite window holds -- folds back
   into it at most a millionth of its size, and the inverse FFT's result is
   multiplied by exp(c t). The period is 1.25 times the window shown. The
   grid's first point, s = c, carries the network's exact value there (no
   0 Hz value is guessed or extrapolated), so final levels are exact: an open
   settles at +1, a short at -1. The edge is kept to at least 6 samples so
   that its spectrum at the Nyquist frequency (2e-12) stays negligible after
   the damping's gain.
4. The distance axis maps each time through the run's cumulative round-trip
   delays, segment by segment (beyond the end, at the last segment's speed).

The individual arrivals (:class:`Arrival`) come from a bounded bounce
(lattice) expansion: every path a wave can take through the junctions,
largest first, until paths fall below a size cut-off.
"""

from __future__ import annotations

import heapq
import math
from collections.abc import Sequence
from dataclasses import dataclass, field

import numpy as np

from calc.cable import causal_basis, causal_line_coefficients
from calc.constants import C0_M_PER_S
from calc.errors import InputError
from calc.loads import Load, check_component, component_kind, reflection_polynomials
from calc.parse import parse
from calc.tdr import fft_size

#: Largest number of output samples (time, distance and level arrays).
MAX_POINTS = 1 << 20
#: Smallest number of output samples.
MIN_POINTS = 256
#: Output samples when none are asked for (more when a short rise time needs them).
DEFAULT_POINTS = 4096
#: Most samples chosen automatically to honour a requested rise time.
MAX_AUTO_POINTS = 1 << 18
#: Largest FFT: 2**21 samples keep each complex spectrum array at 16 MB, so a
#: prediction stays within a few hundred MB at the very most.
MAX_FFT = 1 << 21
#: Complex numbers in one block of the cascade's line factors (32 MB): memory stays
#: bounded however many segments a run has.
CASCADE_BLOCK = 1 << 21
#: Arrivals smaller than this (fraction of the incident step) are not listed.
ARRIVAL_CUTOFF = 1e-3
MAX_ARRIVALS = 64
#: Bounce branches followed at most when listing arrivals (largest first).
MAX_EXPANSIONS = 250
#: Damping of the transform: exp(-c T) = 1e-6, so whatever lies beyond one
#: period (re-reflections, a skin-effect creep, a slow capacitor) folds back
#: into it at most a millionth of its size.
DAMPING = math.log(1e6)
#: The FFT period is at least this many times the window shown.
PERIOD_PER_WINDOW = 1.25
#: Gaussian step: the 10-90 % rise time is 2 sqrt(2) erfinv(0.8) sigma.
RISE_PER_SIGMA = 2.0 * math.sqrt(2.0) * 0.9061938024368232
#: The edge is never sharper than this many samples: its spectrum is then below
#: 2e-12 at the Nyquist frequency, which the damping's gain (at most e^11) leaves
#: far below anything shown.
MIN_RISE_SAMPLES = 6.0
LUMP_KINDS = ("series_r", "series_l", "shunt_c")
#: Source impedances an instrument can have (ohm); beyond them it is a short or an open.
SOURCE_Z_RANGE = (0.1, 1e4)
RUN_EXAMPLE = "10 m:rg58, 20 m:rg213"


@dataclass(frozen=True)
class Segment:
    """One length of line: Z0, VF and the catalog's loss model (dB/100 m)."""

    length_m: float
    z0_ohm: float
    vf: float
    atten_k1: float | None = None  # dB / 100 m / sqrt(MHz)
    atten_k2: float | None = None  # dB / 100 m / MHz
    label: str = ""

    @classmethod
    def from_run_segment(cls, run_segment) -> Segment:
        """From a :class:`calc.run.RunSegment` (a length of a catalog cable)."""
        c = run_segment.cable
        return cls(run_segment.length_m, c.z0_ohm, c.vf, c.atten_k1, c.atten_k2, label=c.id)

    @property
    def delay_s(self) -> float:
        """One-way delay."""
        return self.length_m / (self.vf * C0_M_PER_S)

    @property
    def lossless(self) -> bool:
        return not (self.atten_k1 or self.atten_k2)


@dataclass(frozen=True)
class Lump:
    """A lumped discontinuity after segment ``after_segment`` (0-based).

    ``kind``: ``"series_r"`` (ohm), ``"series_l"`` (H) or ``"shunt_c"`` (F).
    After the last segment it sits between the run and the load.
    """

    kind: str
    value: float
    after_segment: int


@dataclass(frozen=True)
class Arrival:
    """One bounce path back to the instrument.

    ``time_s`` is the round-trip time of the path and ``distance_m`` where the
    trace's distance axis puts it (a re-reflection shows beyond the place
    that made it). ``size`` is the level the path adds once its edge has
    passed (reactive parts settled; line loss as the lossy step stands 8
    rise times after the arrival, or at the end of a pulse). ``start`` is the
    dip or bump the trace shows first, beyond that settled level (each
    reactive part's own excursion for the instrument's edge, multiplied along
    the path), or ``size`` when there is none (``None`` means the same).
    Both are estimates for reading the trace; the waveform itself is exact.
    ``path`` names the reflections and the transmissions through junctions
    (joints between cables of one impedance and no lump are not named).
    """

    time_s: float
    distance_m: float
    size: float
    path: str
    start: float | None = None


@dataclass(frozen=True, eq=False)
class Prediction:
    """The predicted trace: level (reflected voltage / incident step) against time and distance.

    ``warnings`` holds codes for the front end: ``"rise-time-limited"`` (the
    grid could not show the rise time asked for; ``rise_time_s`` is what was
    used), ``"arrivals-truncated"`` (the bounce list was cut at its cap).
    """

    time_s: np.ndarray
    distance_m: np.ndarray
    level: np.ndarray
    arrivals: tuple[Arrival, ...]  # those that arrive within the span, in time order
    rise_time_s: float = math.nan
    pulse_width_s: float | None = None
    source_z_ohm: float = math.nan
    round_trip_s: float = math.nan
    span_s: float = math.nan
    frequency_step_hz: float = math.nan
    n_fft: int = 0
    warnings: tuple[str, ...] = field(default=())


LUMP_EXAMPLE = "2: 3 pF"
_LUMP_KIND = {"resistance": "series_r", "inductance": "series_l", "capacitance": "shunt_c"}


def parse_lump(text: str, n_segments: int, field: str = "--lump") -> Lump:
    """``"AFTER: VALUE"``: a lump after segment AFTER (1-based, as people count).

    The unit says what it is: ohm a series resistance, H a series inductance,
    F a capacitance across the line (``"2: 3 pF"``, ``"1: 5 nH"``, ``"3: 0.2 ohm"``).
    """
    if not isinstance(text, str) or ":" not in text:
        raise InputError(field, f"cannot read {text!r}; give AFTER_SEGMENT: VALUE", LUMP_EXAMPLE)
    where, value = (p.strip() for p in text.split(":", 1))
    if not where.isdigit() or not 1 <= int(where) <= n_segments:
        raise InputError(field, f"{where!r} is not a segment of this run (1 to {n_segments})",
                         LUMP_EXAMPLE)
    kind = component_kind(value)
    return Lump(_LUMP_KIND[kind], check_component(kind, parse(value, field, kind), field),
                int(where) - 1)


# -- rational two-port pieces ---------------------------------------------
def _pm(a, b) -> np.ndarray:
    """Product of two polynomials (coefficients, highest power first)."""
    return np.convolve(np.atleast_1d(a), np.atleast_1d(b))


def _pa(*ps) -> np.ndarray:
    """Sum of polynomials (coefficients, highest power first)."""
    ps = [np.atleast_1d(np.asarray(p, dtype=float)) for p in ps]
    out = np.zeros(max(len(p) for p in ps))
    for p in ps:
        out[len(out) - len(p):] += p
    return out


def _lump_abcd(lump: Lump) -> tuple:
    one, zero = np.array([1.0]), np.array([0.0])
    if lump.kind == "series_r":
        return one, np.array([lump.value]), zero, one
    if lump.kind == "series_l":
        return one, np.array([lump.value, 0.0]), zero, one
    return one, zero, np.array([lump.value, 0.0]), one  # shunt_c


def _abcd_chain(lumps: Sequence[Lump]) -> tuple:
    a, b, c, d = np.array([1.0]), np.array([0.0]), np.array([0.0]), np.array([1.0])
    for lump in lumps:
        a2, b2, c2, d2 = _lump_abcd(lump)
        a, b, c, d = (_pa(_pm(a, a2), _pm(b, c2)), _pa(_pm(a, b2), _pm(b, d2)),
                      _pa(_pm(c, a2), _pm(d, c2)), _pa(_pm(c, b2), _pm(d, d2)))
    return a, b, c, d


def _lead_trimmed(p) -> np.ndarray:
    """Polynomial coefficients (highest first) without leading zeros."""
    p = np.atleast_1d(np.asarray(p, dtype=float))
    nonzero = np.flatnonzero(p)
    return p[nonzero[0]:] if nonzero.size else p[:0]


def _roots(monic: np.ndarray) -> np.ndarray:
    """Roots of a monic polynomial: closed form to degree 2, numpy beyond."""
    if len(monic) == 2:
        return np.array([-monic[1] + 0j])
    if len(monic) == 3:
        b, c = monic[1], monic[2]
        d = np.sqrt(complex(b * b - 4.0 * c))
        q = -0.5 * (b + (d if b.real >= 0 else -d))  # the stable form of the quadratic formula
        return np.array([q, c / q]) if q != 0 else np.array([0j, -b + 0j])
    return np.roots(monic).astype(complex)


class _Rational:
    """F(s) = P(s)/Q(s) with its DC value, poles and step-response estimates."""

    @classmethod
    def of(cls, value: float) -> _Rational:
        """A constant (frequency-independent) factor."""
        f = cls.__new__(cls)
        f.num, f.den = np.array([float(value)]), np.array([1.0])
        f.constant, f.zero = True, value == 0.0
        f.dc = f.high = float(value)
        f.poles, f.residues = np.array([]), np.array([])
        return f

    def __init__(self, num, den):
        num, den = _lead_trimmed(num), _lead_trimmed(den)
        self.num = num if num.size else np.array([0.0])
        self.den = den
        scale = self.den[0]
        self.num, self.den = self.num / scale, self.den / scale
        self.constant = len(self.den) == 1 and len(self.num) == 1
        self.dc = float(self.num[-1] / self.den[-1]) if self.den[-1] != 0 else math.inf
        self.zero = len(self.num) == 1 and self.num[0] == 0.0
        if self.constant or self.zero:
            self.high, self.poles, self.residues = float(self.num[0]), np.array([]), np.array([])
            return
        if len(self.num) == len(self.den):
            self.high = float(self.num[0])
            rem = _pa(self.num, -self.high * self.den)
        else:
            self.high, rem = 0.0, self.num
        poles = _roots(self.den)
        # nudge repeated poles apart so simple-pole residues stay finite
        for i in range(len(poles)):
            for j in range(i):
                if abs(poles[i] - poles[j]) <= 1e-7 * abs(poles[i]):
                    poles[i] *= 1.0 + 1e-6
        self.poles = poles
        self.residues = np.array([
            np.polyval(rem, p) / np.prod([p - q for k, q in enumerate(poles) if k != i])
            for i, p in enumerate(poles)])

    @property
    def time_constants_s(self) -> list[float]:
        return [float(-1.0 / p.real) for p in self.poles if p.real < 0]

    def __call__(self, s: np.ndarray) -> np.ndarray | float:
        if self.constant or self.zero:
            return self.high
        return np.polyval(self.num, s) / np.polyval(self.den, s)

    def step_at(self, t: float) -> float:
        """Step response at ``t`` (``inf``: the DC value)."""
        if self.constant or self.zero or math.isinf(t):
            return self.dc if not (self.constant or self.zero) else self.high
        r, p = self.residues, self.poles
        return float((self.high + np.sum(r / p * (np.exp(p * t) - 1.0))).real)

    def ramp_response(self, times_s: np.ndarray, rise_s: float) -> np.ndarray:
        """Response to a linear ramp from 0 to 1 over ``rise_s`` starting at t = 0."""
        t = np.asarray(times_s, dtype=float)[:, None]
        if self.constant or self.zero:
            return self.high * np.clip(t[:, 0] / rise_s, 0.0, 1.0)
        p, c = self.poles[None, :], (self.residues / self.poles)[None, :]
        inside = t <= rise_s
        tt = np.clip(t, 0.0, rise_s)
        during = (self.high * tt + np.sum(c * (np.expm1(p * tt) / p - tt), axis=1,
                                           keepdims=True)) / rise_s
        after = self.high + np.sum(c * ((np.exp(p * t) - np.exp(p * (t - rise_s))) / (p * rise_s)
                                        - 1.0), axis=1, keepdims=True)
        return np.where(inside, during, after).real[:, 0]

    def edge_response(self, times_s: np.ndarray, rise_s: float) -> np.ndarray:
        """Response to the instrument's edge: a step through a Gaussian of the rise time.

        For each real pole p the step's exponential meets the Gaussian (sigma)
        in closed form, :math:`e^{pt + p^2\\sigma^2/2}\\,\\Phi((t + p\\sigma^2)/\\sigma)`;
        a factor that rings (complex poles) is taken with a linear ramp instead.
        """
        t = np.asarray(times_s, dtype=float)
        sigma = rise_s / RISE_PER_SIGMA
        gauss = np.exp(-0.5 * (t / sigma) ** 2)
        phi = _normal_cdf(t / sigma)
        if self.constant or self.zero:
            return self.high * phi
        if np.any(np.abs(self.poles.imag) > 1e-9 * np.abs(self.poles)):
            return self.ramp_response(t + 0.5 * rise_s, rise_s)
        y = self.high * phi
        for p, r in zip(self.poles.real, self.residues.real, strict=True):
            # exp(p t + p^2 s^2 / 2) Phi(-z sqrt 2), z = -(t + p s^2)/(s sqrt 2): for z >= 0 the
            # product is exp(-t^2 / 2 s^2) erfcx(z) / 2, for z < 0 use erfc(z) = 2 - erfc(-z)
            z = -(t + p * sigma ** 2) / (sigma * math.sqrt(2.0))
            half = 0.5 * gauss * _erfcx(np.abs(z))
            e = np.where(z >= 0.0, half,
                         np.exp(np.minimum(p * t + 0.5 * (p * sigma) ** 2, 0.0)) - half)
            y = y + (r / p) * (e - phi)
        return y

    def _edge_samples(self, rise_s: float, settle_s: float) -> np.ndarray:
        """The edge response at times that catch its extremes (kept: asked for twice)."""
        key = (rise_s, settle_s)
        if getattr(self, "_edge_key", None) != key:
            sigma = rise_s / RISE_PER_SIGMA
            taus = self.time_constants_s or [rise_s]
            t = np.concatenate([sigma * np.linspace(-3.0, 4.0, 36),
                                np.geomspace(0.01 * min(taus), 10.0 * max(taus), 48)])
            if math.isfinite(settle_s):
                t = t[t <= settle_s]
            self._edge_key, self._edge_y = key, self.edge_response(t, rise_s)
        return self._edge_y

    def excursion(self, rise_s: float, settle_s: float) -> float:
        """The dip or bump beyond the settled level that the instrument's edge shows.

        The extreme of the edge response that lies outside the range from 0
        to the settled level; the settled level itself when there is none.
        """
        final = self.step_at(settle_s)
        y = self._edge_samples(rise_s, settle_s)
        lo, hi = min(0.0, final), max(0.0, final)
        outside = np.maximum(y - hi, 0.0) + np.maximum(lo - y, 0.0)
        i = int(np.argmax(outside))
        return float(y[i]) if outside[i] > 1e-12 else final

    def edge_peak(self, rise_s: float) -> float:
        """The largest magnitude of its response to the instrument's edge."""
        if self.constant or self.zero:
            return abs(self.high)
        return float(max(np.max(np.abs(self._edge_samples(rise_s, math.inf))), abs(self.dc)))


#: Numerical Recipes (Press, Teukolsky, Vetterling, Flannery), erfcc: a Chebyshev
#: fit whose fractional error is below 1.2e-7 everywhere.
_ERFC_COEFFS = (-1.26551223, 1.00002368, 0.37409196, 0.09678418, -0.18628806, 0.27886807,
                -1.13520398, 1.48851587, -0.82215223, 0.17087277)


def _erfcx(z: np.ndarray) -> np.ndarray:
    """exp(z^2) erfc(z) for z >= 0 (the erfcc fit, written without the exp(-z^2))."""
    t = 1.0 / (1.0 + 0.5 * np.asarray(z, dtype=float))
    poly = np.zeros_like(t)
    for coeff in reversed(_ERFC_COEFFS):
        poly = poly * t + coeff
    return t * np.exp(poly)


def _normal_cdf(x: np.ndarray) -> np.ndarray:
    """Phi(x) from the erfcc fit."""
    x = np.asarray(x, dtype=float)
    z = np.abs(x) / math.sqrt(2.0)
    tail = 0.5 * np.exp(-z * z) * _erfcx(z)
    return np.where(x >= 0.0, 1.0 - tail, tail)


@dataclass
class _Junction:
    """Between segment ``index - 1`` (impedance z1) and ``index`` (z2), with lumps."""

    index: int
    z1: float
    z2: float
    lumps: tuple
    name: str
    s11: _Rational = None  # from the left, back to the left
    s22: _Rational = None  # from the right, back to the right
    t21: _Rational = None  # voltage transmission left -> right
    t12: _Rational = None
    terms: tuple | None = None

    def __post_init__(self):
        z1, z2 = self.z1, self.z2
        if not self.lumps:
            total = z1 + z2
            self.s11, self.s22 = _Rational.of((z2 - z1) / total), _Rational.of((z1 - z2) / total)
            self.t21, self.t12 = _Rational.of(2.0 * z2 / total), _Rational.of(2.0 * z1 / total)
            self.terms = None
            return
        a, b, c, d = _abcd_chain(self.lumps)
        # A Z2, B, C Z1 Z2, D Z1: every S-parameter of the junction is built from these four
        self.terms = (a * z2, b, c * (z1 * z2), d * z1)
        p, q, r, u = self.terms
        den = _pa(p, q, r, u)
        self.s11 = _Rational(_pa(p, q, -r, -u), den)
        self.s22 = _Rational(_pa(-p, q, -r, u), den)
        self.t21 = _Rational([2.0 * z2], den)
        self.t12 = _Rational([2.0 * z1], den)

    def reflect(self, gamma: np.ndarray, s: np.ndarray) -> np.ndarray:
        """Gamma looking into the junction from the left, given Gamma beyond it on the right.

        .. math:: \\Gamma_{in} = S_{11} + \\frac{T_{21}T_{12}\\Gamma}{1 - S_{22}\\Gamma}
        """
        if self.terms is None:
            s11, s22 = self.s11.high, self.s22.high
            d = self.t21.high * self.t12.high - s11 * s22
            return (s11 + d * gamma) / (1.0 - s22 * gamma)
        p, q, r, u = (np.polyval(t, s) if len(t) > 1 else t[0] for t in self.terms)
        den, n11, n22 = p + q + r + u, p + q - r - u, q - p - r + u
        x = den - n22 * gamma
        return (n11 * x + (4.0 * self.z1 * self.z2) * gamma) / (den * x)

    @property
    def transparent(self) -> bool:
        return not self.lumps and self.z1 == self.z2


def _junctions(segments: Sequence[Segment], lumps: Sequence[Lump]) -> list[_Junction]:
    """Junctions 1 .. N-1 between segments (index k sits after segment k-1)."""
    out = []
    for k in range(1, len(segments)):
        here = tuple(lp for lp in lumps if lp.after_segment == k - 1)
        left, right = segments[k - 1], segments[k]
        name = f"joint {k}"
        if left.label or right.label:
            name += f" ({left.label or '?'}|{right.label or '?'})"
        out.append(_Junction(k, left.z0_ohm, right.z0_ohm, here, name))
    return out


def _load_factor(load: Load, segments: Sequence[Segment], lumps: Sequence[Lump]) -> _Rational:
    """Gamma at the end of the last segment: lumps after it, then the load."""
    z0 = segments[-1].z0_ohm
    n, d = load.polynomials(z0)
    end_lumps = [lp for lp in lumps if lp.after_segment == len(segments) - 1]
    if end_lumps:
        a, b, c, dd = _abcd_chain(end_lumps)
        n, d = _pa(_pm(a, n), _pm(b, d)), _pa(_pm(c, n), _pm(dd, d))
    return _Rational(*reflection_polynomials(n, d, z0))


# -- input checks ------------------------------------------------------------
def _check(segments, load, lumps, source_z_ohm, rise_time_s, pulse_width_s, n_points, span_s):
    if not segments:
        raise InputError("--run", "a run needs at least one segment", RUN_EXAMPLE)
    for i, s in enumerate(segments, start=1):
        if not (math.isfinite(s.length_m) and s.length_m > 0):
            raise InputError("--run", f"segment {i} has no length; every segment needs a length "
                             "above zero", RUN_EXAMPLE)
        if not (math.isfinite(s.z0_ohm) and s.z0_ohm > 0):
            raise InputError("--run", f"segment {i}: Z0 must be above zero", RUN_EXAMPLE)
        if not (0 < s.vf <= 1):
            raise InputError("--run", f"segment {i}: the velocity factor must be in (0, 1]",
                             RUN_EXAMPLE)
        for k in (s.atten_k1, s.atten_k2):
            if k is not None and not (math.isfinite(k) and k >= 0):
                raise InputError("--run", f"segment {i}: loss terms must be zero or more",
                                 RUN_EXAMPLE)
    for lp in lumps:
        if lp.kind not in LUMP_KINDS:
            raise InputError("--lump", f"unknown kind {lp.kind!r} (series_r, series_l, shunt_c)",
                             "1:2 nH")
        if not (0 <= lp.after_segment < len(segments)):
            raise InputError("--lump", f"there is no segment {lp.after_segment + 1} to follow",
                             "1:2 nH")
        if not math.isfinite(lp.value) or lp.value < 0 or (lp.value == 0 and lp.kind != "series_r"):
            raise InputError("--lump", "a lumped value must be positive", "1:2 nH")
        check_component({"series_r": "resistance", "series_l": "inductance",
                         "shunt_c": "capacitance"}[lp.kind], lp.value, "--lump")
    if not isinstance(load, Load):
        raise InputError("--load", "not a load", "75 ohm")
    for kind, value in (("resistance", load.resistance_ohm), ("inductance", load.inductance_h),
                        ("capacitance", load.capacitance_f)):
        if value is not None:
            check_component(kind, value, "--load")
    if not load.has_step_response:
        raise InputError("--load", "an impedance known at one frequency has no trace; give it "
                         "as R + L or R || C", "50 ohm + 20 nH")
    if source_z_ohm is not None and math.isfinite(source_z_ohm) and not (
            SOURCE_Z_RANGE[0] <= source_z_ohm <= SOURCE_Z_RANGE[1]):
        raise InputError("--source-z", "an instrument's source impedance from 0.1 ohm to "
                         "10 kohm", "50 ohm")
    for name, v in (("--source-z", source_z_ohm), ("--rise-time", rise_time_s),
                    ("--pulse-width", pulse_width_s), ("--span", span_s)):
        if v is not None and not (math.isfinite(v) and v > 0):
            raise InputError(name, "must be a positive, finite value",
                             {"--source-z": "50 ohm"}.get(name, "1 ns"))
    if n_points is not None:
        if not isinstance(n_points, int | np.integer) or not (MIN_POINTS <= n_points <= MAX_POINTS):
            raise InputError("--points", f"the number of points must be a whole number from "
                             f"{MIN_POINTS} to {MAX_POINTS} (more would exhaust memory)", "16384")


# -- the frequency-domain cascade ---------------------------------------------
class _Grid:
    """Points ``s`` of the complex frequency and the basis every line exponent is built on."""

    def __init__(self, s: np.ndarray):
        self.s = np.asarray(s, dtype=complex)
        self.basis = causal_basis(self.s)


def _line_terms(seg: Segment) -> np.ndarray:
    """Round trip through ``seg``: 2 gamma(s) l = terms . basis(s), three real terms."""
    return 2.0 * seg.length_m * np.array(causal_line_coefficients(seg.vf, seg.atten_k1,
                                                                   seg.atten_k2))


def _groups(segments, junctions) -> list[tuple[np.ndarray, object]]:
    """Runs of segments between junctions that reflect: (summed round-trip terms, junction).

    Listed from the load back; the junction is the one at the group's near
    end (None for the group that starts at the instrument).
    """
    out, acc = [], np.zeros(3)
    for k in range(len(segments) - 1, -1, -1):
        acc = acc + _line_terms(segments[k])
        j = junctions[k - 1] if k > 0 else None
        if j is not None and j.transparent:
            continue
        out.append((acc, j))
        acc = np.zeros(3)
    return out


def _cascade(grid: _Grid, segments, junctions, load_factor: _Rational, source_z: float):
    """Gamma seen by the instrument, referenced to its source impedance."""
    groups = _groups(segments, junctions)
    gamma = load_factor(grid.s)
    # exp(-2 gamma l) for a block of groups at a time: all of them at once is groups x
    # points complex numbers (500 segments at 2**21 points: 16 GB)
    block = max(1, CASCADE_BLOCK // max(grid.s.size, 1))
    for first in range(0, len(groups), block):
        chunk = groups[first:first + block]
        terms = np.array([g[0] for g in chunk])
        # Two real products, not one complex one: numpy's complex matmul (BLAS zgemm) can
        # leave the CPU slow at every complex exp after it
        exponent = np.empty((len(chunk), grid.s.size), dtype=complex)
        exponent.real = -(terms @ grid.basis.real)
        exponent.imag = -(terms @ grid.basis.imag)
        for (_, j), factor in zip(chunk, np.exp(exponent), strict=True):
            gamma = factor * gamma
            if j is not None:
                gamma = j.reflect(gamma, grid.s)
    z0 = segments[0].z0_ohm
    r = (z0 - source_z) / (z0 + source_z)
    if r == 0.0:
        return gamma
    return r + (1.0 - r * r) * gamma / (1.0 + r * gamma)


def reflection_spectrum(segments: Sequence[Segment], load: Load, frequency_hz: np.ndarray,
                        lumps: Sequence[Lump] = (), source_z_ohm: float | None = None
                        ) -> np.ndarray:
    """The run's reflection coefficient at the instrument, at ``frequency_hz`` (>= 0).

    Referenced to ``source_z_ohm`` (default: the first segment's Z0). This is
    what an analyser with that reference impedance reads at the near end.
    """
    _check(segments, load, lumps, source_z_ohm, None, None, None, None)
    zs = segments[0].z0_ohm if source_z_ohm is None else source_z_ohm
    grid = _Grid(2j * math.pi * np.asarray(frequency_hz, dtype=float))
    return _cascade(grid, segments, _junctions(segments, lumps), _load_factor(load, segments, lumps),
                    zs)


def distance_from_round_trip(time_s: np.ndarray | float, segments: Sequence[Segment]) -> np.ndarray:
    """The one-way distance a round-trip time maps to, segment by segment.

    Before 0 and beyond the run's end the first and last segments' speeds carry on.
    """
    t = np.asarray(time_s, dtype=float)
    rt = np.concatenate([[0.0], np.cumsum([2.0 * s.delay_s for s in segments])])
    dist = np.concatenate([[0.0], np.cumsum([s.length_m for s in segments])])
    v0 = segments[0].vf * C0_M_PER_S
    v1 = segments[-1].vf * C0_M_PER_S
    d = np.interp(t, rt, dist)
    d = np.where(t < 0, t * v0 / 2.0, d)
    return np.where(t > rt[-1], dist[-1] + (t - rt[-1]) * v1 / 2.0, d)


# -- the bounce expansion -------------------------------------------------------
@dataclass
class _Path:
    """A bounce path back at the instrument."""

    time_s: float
    bound: float  # its rating: power-wave magnitudes, reactive parts by their edge response
    const: float  # product of its frequency-independent factors
    reactive: tuple  # its frequency-dependent factors (_Rational)
    loss: tuple  # (skin a1 l, dielectric a2 l) summed over its passes
    events: tuple | None  # linked list (("R" | "T" | "S", junction index), rest)

    def dc(self, settle_s: float = math.inf) -> float:
        """Its level once reactive parts have settled (or at ``settle_s``), without loss."""
        return self.const * math.prod(f.step_at(settle_s) for f in self.reactive)


@dataclass
class _Bounces:
    paths: list  # _Path, in the order found
    truncated: bool
    last_time_s: float  # latest arrival found


def _power_scale(z_from: float, z_to: float) -> float:
    """Voltage-wave transmission -> power-wave magnitude factor."""
    return math.sqrt(z_from / z_to)


def _one_way_loss(seg: Segment) -> tuple[float, float]:
    """(skin, dielectric) loss terms of one pass: a1 l and a2 l."""
    a1, _, a2 = causal_line_coefficients(seg.vf, seg.atten_k1, seg.atten_k2)
    return (a1 * seg.length_m, a2 * seg.length_m)


def _hops(segments, junctions):
    """Where a wave in each segment next meets something, skipping transparent joints.

    ``right[i]``: (index of the junction it meets, 0-based segment it arrives
    in, delay, loss) for a wave going away from the instrument in segment i;
    ``left[i]`` the same toward the instrument (junction 0 is the instrument).
    """
    n = len(segments)
    one = [(s.delay_s, _one_way_loss(s)) for s in segments]

    def add(acc, k):
        delay, loss = one[k]
        return acc[0] + delay, tuple(x + y for x, y in zip(acc[1], loss, strict=True))

    right, left = [], []
    for i in range(n):
        acc, k = (0.0, (0.0, 0.0)), i
        while True:
            acc = add(acc, k)
            if k == n - 1 or not junctions[k].transparent:
                break
            k += 1
        right.append((k + 1, k, acc[0], acc[1]))
        acc, k = (0.0, (0.0, 0.0)), i
        while True:
            acc = add(acc, k)
            if k == 0 or not junctions[k - 1].transparent:
                break
            k -= 1
        left.append((k, k, acc[0], acc[1]))
    return right, left


def _expand(segments, junctions, load_factor: _Rational, source_z: float, rise_s: float,
            horizon_s: float) -> _Bounces:
    """Bounce paths above :data:`ARRIVAL_CUTOFF`, largest first, within ``horizon_s``.


    Best-first over the tree of reflections and transmissions at every
    junction (transparent joints are crossed in one hop). A branch is rated
    by the product of its factors' power-wave magnitudes: each at most 1 for
    a passive junction, and a reactive part rated by its largest response to
    the instrument's edge (exact for one reactive part, an estimate for
    several). At most :data:`MAX_EXPANSIONS` branches are followed.
    """
    n = len(segments)
    z0 = segments[0].z0_ohm
    r_in = (z0 - source_z) / (z0 + source_z)  # from the instrument, at its port
    r_src = -r_in  # from the line, back into the line
    t_in, t_out = 1.0 + r_in, 1.0 + r_src
    right, left = _hops(segments, junctions)

    def move(factor, scale, seg, direction, event):
        """(rating, constant factor, reactive factor or None, next segment, direction, event)."""
        if not isinstance(factor, _Rational):
            return (abs(factor) * scale, float(factor), None, seg, direction, event)
        if factor.constant or factor.zero:
            return (abs(factor.high) * scale, float(factor.high), None, seg, direction, event)
        return (factor.edge_peak(rise_s) * scale, 1.0, factor, seg, direction, event)

    # what a wave in each segment, going each way, meets next: delay, loss, moves, arrival
    table = {+1: [], -1: []}
    for i in range(n):
        junction, arrive, delay, loss = right[i]
        if junction == n:
            moves = [move(load_factor, 1.0, arrive, -1, ("R", n))]
        else:
            j = junctions[junction - 1]
            moves = [move(j.s11, 1.0, arrive, -1, ("R", junction)),
                     move(j.t21, _power_scale(j.z1, j.z2), arrive + 1, +1, ("T", junction))]
        table[+1].append((delay, loss, [m for m in moves if m[0] > 0], False))
        junction, arrive, delay, loss = left[i]
        if junction == 0:
            moves = [move(r_src, 1.0, 0, +1, ("S", 0))] if r_src != 0.0 else []
        else:
            j = junctions[junction - 1]
            moves = [move(j.t12, _power_scale(j.z2, j.z1), arrive - 1, -1, ("T", junction)),
                     move(j.s22, 1.0, arrive, +1, ("R", junction))]
        table[-1].append((delay, loss, [m for m in moves if m[0] > 0], junction == 0))
    out_scale = abs(t_out) * _power_scale(z0, source_z)
    paths: list[_Path] = []
    if r_in != 0.0:
        paths.append(_Path(0.0, abs(r_in), r_in, (), (0.0, 0.0), (("R", 0), None)))
    launch = abs(t_in) * _power_scale(source_z, z0)
    heap = [(-launch, 0, 0, +1, 0.0, t_in, (), 0.0, 0.0, None)]
    counter = 0
    last = 0.0
    cutoff = ARRIVAL_CUTOFF
    push, pop = heapq.heappush, heapq.heappop
    expansions = 0
    while heap and expansions < MAX_EXPANSIONS:
        expansions += 1
        nb, _, seg, direction, time, const, reactive, k, a, events = pop(heap)
        delay, loss, moves, arrives = table[direction][seg]
        time += delay
        k, a = k + loss[0], a + loss[1]
        if arrives:
            bound = -nb * out_scale
            if bound >= cutoff:
                paths.append(_Path(time, bound, const * t_out, reactive, (k, a), events))
            last = max(last, time)
        if time > horizon_s:
            continue
        for rating, c, factor, nseg, ndir, event in moves:
            bound = -nb * rating
            if bound < cutoff:
                continue
            counter += 1
            push(heap, (-bound, counter, nseg, ndir, time, const * c,
                        reactive if factor is None else reactive + (factor,), k, a,
                        (event, events)))
    return _Bounces(paths, bool(heap) and -heap[0][0] >= ARRIVAL_CUTOFF, last)


def _path_text(events, names: dict, n_segments: int) -> str:
    """Words for a path; ``events`` is a linked list ``(event, rest)``, newest first.

    ``names`` maps junction index to its name."""
    chain = []
    while events is not None:
        event, events = events
        chain.append(event)
    events = chain[::-1]
    words: list[str] = []
    run: list[int] = []

    def flush():
        if not run:
            return
        if len(run) == 1:
            words.append(f"through joint {run[0]}")
        elif all(abs(b - a) == 1 for a, b in zip(run, run[1:], strict=False)):
            words.append(f"through joints {run[0]}-{run[-1]}")
        else:
            words.append("through joints " + ", ".join(str(x) for x in run))
        run.clear()

    for code, idx in events:
        if code == "T":
            run.append(idx)
            continue
        flush()
        if code == "S":
            words.append("re-reflect at the instrument")
        elif idx == 0:
            words.append("reflect at the instrument port")
        elif idx == n_segments:
            words.append("reflect at the load")
        else:
            words.append(f"reflect at {names[idx]}")
    flush()
    return " > ".join(words)


def _lossy_steps(loss_terms: list, times_s: Sequence[float], rise_s: float) -> np.ndarray:
    """Step response of each path's line loss (delay removed), at each of ``times_s``.

    ``loss_terms``: (skin a1 l, dielectric a2 l) per path; the path's loss is
    the causal line's (:func:`calc.cable.causal_line_coefficients`) without
    its delay, seen through the instrument's Gaussian edge. The response is
    causal, so

    .. math:: s(t) = \\frac{2}{\\pi}\\int_0^\\infty \\mathrm{Re}\\,H(\\omega)
              \\frac{\\sin\\omega t}{\\omega}\\,d\\omega
              = \\frac{4}{\\pi}\\int_0^\\infty \\mathrm{Re}\\,H(u^2)\\,
              \\frac{\\sin 2\\pi u^2 t}{u}\\,du

    taken with the trapezoid rule in ``u = sqrt(f)``, which resolves both the
    sqrt(f) loss near 0 Hz and the oscillation at the top of the band.
    Shape (paths, times).
    """
    sigma = rise_s / RISE_PER_SIGMA
    f_max = 1.5 / sigma
    times = np.asarray(times_s, dtype=float)
    nq = int(min(8192, max(128, 4.0 * math.pi * f_max * times.max())))  # good to ~1e-4
    u = np.linspace(0.0, math.sqrt(f_max), nq + 1)
    f = u * u
    basis = causal_basis(2j * math.pi * f)
    skin, dielectric = (np.array(col, dtype=float)[:, None]
                        for col in zip(*loss_terms, strict=True))
    h = (np.exp(-(skin * basis[0] + dielectric * basis[2])).real
         * np.exp(-2.0 * (math.pi * sigma * f) ** 2))
    kernel = np.empty((nq + 1, times.size))
    kernel[0] = 0.0  # sin(2 pi u^2 t)/u -> 0 at u = 0
    kernel[1:] = np.sin(2.0 * math.pi * np.outer(f[1:], times)) / u[1:, None]
    weights = np.full(nq + 1, u[1] - u[0])
    weights[[0, -1]] *= 0.5
    return (4.0 / math.pi) * (h * weights) @ kernel


def _finish_arrivals(bounces: _Bounces, segments, junctions, settle_s: float, rise_s: float,
                     pulse: bool) -> tuple[Arrival, ...]:
    rows = sorted((p for p in bounces.paths if p.bound >= ARRIVAL_CUTOFF),
                  key=lambda p: -p.bound)[:MAX_ARRIVALS]
    # line loss: the lossy step 'settle_s' after the arrival, one evaluation per distinct
    # loss (to 4 significant digits: an estimate, not worth more)
    keys = [tuple(float(f"{x:.4g}") for x in p.loss) for p in rows]
    unique = sorted({k for k in keys if any(k)})
    loss_at = {(0.0, 0.0): 1.0}
    if unique:
        loss_at.update(zip(unique, _lossy_steps(unique, [settle_s], rise_s)[:, 0], strict=True))
    level_time = settle_s if pulse else math.inf
    shapes: dict = {}  # (settled, excursion) per reactive factor
    out = []
    for p, key in zip(rows, keys, strict=True):
        loss = loss_at[key]
        size = start = p.const * loss
        for f in p.reactive:
            if id(f) not in shapes:
                shapes[id(f)] = (f.step_at(level_time), f.excursion(rise_s, level_time))
            size *= shapes[id(f)][0]
            start *= shapes[id(f)][1]
        if max(abs(size), abs(start)) < ARRIVAL_CUTOFF:
            continue
        out.append((p, float(size), float(start)))
    out.sort(key=lambda r: (r[0].time_s, -abs(r[1])))
    where = distance_from_round_trip([r[0].time_s for r in out], segments)
    names = {j.index: j.name for j in junctions}
    return tuple(Arrival(float(p.time_s), float(d), size,
                         _path_text(p.events, names, len(segments)), start)
                 for (p, size, start), d in zip(out, where, strict=True))


def simulate(
    segments: Sequence[Segment],
    load: Load,
    *,
    lumps: Sequence[Lump] = (),
    source_z_ohm: float | None = None,
    rise_time_s: float | None = None,
    pulse_width_s: float | None = None,
    n_points: int | None = None,
    span_s: float | None = None,
    arrivals: bool = True,
) -> Prediction:
    """Predict the trace of a reflectometer at the near end of ``segments``.

    ``source_z_ohm`` defaults to the first segment's Z0 (a matched
    instrument). ``rise_time_s`` is the 10-90 % rise of the instrument's step
    (default: as sharp as the grid shows cleanly, 6 samples). With
    ``pulse_width_s`` the instrument sends a pulse of that width instead of a
    step. ``span_s`` is the time shown after the instrument's own edge
    (default: the whole run's round trip and a quarter more, plus time for
    reactive parts to settle); ``n_points`` the number of samples (default
    4096, more when a short rise time needs them; at most :data:`MAX_POINTS`).

    ``level`` is the reflected voltage as a fraction of the incident step
    (rho): 0 before any reflection, +1 after an open's, -1 after a short's.
    Time 0 is the instrument's port; a short pre-trigger stretch comes first.
    With ``arrivals=False`` the list of bounce paths is left empty (a caller
    that redraws the trace on every keystroke can list them less often).
    """
    segments = tuple(segments)
    lumps = tuple(lumps)
    _check(segments, load, lumps, source_z_ohm, rise_time_s, pulse_width_s, n_points, span_s)
    zs = float(segments[0].z0_ohm if source_z_ohm is None else source_z_ohm)
    warnings: list[str] = []
    round_trip = 2.0 * sum(s.delay_s for s in segments)
    junctions = _junctions(segments, lumps)
    load_factor = _load_factor(load, segments, lumps)
    taus = load_factor.time_constants_s + [t for j in junctions for t in j.s11.time_constants_s]
    tau_max = max(taus, default=0.0)
    pulse = pulse_width_s or 0.0

    if span_s is not None and span_s < round_trip:
        raise InputError("--span", f"{span_s:.4g} s is shorter than the run's round trip "
                         f"({round_trip:.4g} s); the load's echo would not show",
                         f"{1.3 * round_trip:.3g} s")
    base = 1.25 * round_trip + 5.0 * min(tau_max, 2.0 * round_trip) + pulse
    m = MIN_RISE_SAMPLES
    n = n_points or DEFAULT_POINTS
    if n_points is None and rise_time_s is not None:
        # enough samples for the rise time asked for (window = span + 3 tr, tr = m dt)
        span_guess = span_s if span_s is not None else base + 10.0 * rise_time_s
        need = m * (span_guess + 3.0 * rise_time_s) / rise_time_s
        n = int(min(MAX_AUTO_POINTS, max(n, 1 << int(math.ceil(math.log2(need))))))
    # the sharpest edge this grid shows: tr = m dt, with window = span + 3 tr = n dt
    if span_s is not None:
        tr_grid = m * span_s / (n - 3.0 * m)
    else:  # span = base + 10 tr
        tr_grid = m * base / (n - 13.0 * m)
    tr = tr_grid if rise_time_s is None else rise_time_s
    if tr < tr_grid * (1.0 - 1e-9):
        warnings.append("rise-time-limited")
        tr = tr_grid
    span = span_s if span_s is not None else base + 10.0 * tr
    t_pre = 3.0 * tr
    window = span + t_pre
    dt = window / n
    sigma = tr / RISE_PER_SIGMA

    settle = pulse if pulse else 8.0 * tr

    # the damped transform: s = c + j w on a grid whose period holds the window and a
    # quarter more; the step is Gamma(s) H(s) / s, and x(t) = exp(c t) irfft(...) / dt
    n_fft = fft_size(int(math.ceil(PERIOD_PER_WINDOW * n)), odd=False)
    if n_fft > MAX_FFT:
        raise InputError("--points", f"{n} points need a transform of {n_fft}; at most "
                         f"{int(MAX_FFT / PERIOD_PER_WINDOW)} points", "16384")
    period = n_fft * dt
    c = DAMPING / period
    s = c + 2j * math.pi * np.fft.rfftfreq(n_fft, dt)
    spec = _cascade(_Grid(s), segments, junctions, load_factor, zs)
    edge = np.exp(0.5 * (sigma * s) ** 2 - s * t_pre) / s  # Gaussian edge, delay, step
    if pulse:
        edge *= 1.0 - np.exp(-s * pulse)
    level = np.fft.irfft(spec * edge, n_fft)[:n] * (np.exp(c * dt * np.arange(n)) / dt)
    if not pulse:
        # what has settled folds back from every later period as exp(-m c T) times the
        # settled level: the network's true value at 0 Hz gives that level exactly
        dc = float(_cascade(_Grid(np.zeros(1)), segments, junctions, load_factor, zs)[0].real)
        fold = math.exp(-DAMPING)
        level -= dc * fold / (1.0 - fold)
    time = np.arange(n) * dt - t_pre

    listed: tuple[Arrival, ...] = ()
    if arrivals:
        bounces = _expand(segments, junctions, load_factor, zs, tr, horizon_s=span)
        if bounces.truncated:
            warnings.append("arrivals-truncated")
        listed = tuple(a for a in _finish_arrivals(bounces, segments, junctions, settle, tr,
                                                    bool(pulse)) if a.time_s <= span)
    return Prediction(
        time_s=time, distance_m=distance_from_round_trip(time, segments), level=level,
        arrivals=listed, rise_time_s=tr, pulse_width_s=pulse_width_s, source_z_ohm=zs,
        round_trip_s=round_trip, span_s=span, frequency_step_hz=1.0 / period, n_fft=n_fft,
        warnings=tuple(dict.fromkeys(warnings)))
