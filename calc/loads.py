"""Terminations and what they send back: the load at the end of a line.

A :class:`Load` is an open, a short, a matched load, a resistance, a
capacitor, an inductor, a series or parallel R-L-C combination, a change to
another line impedance, or a complex impedance known at one frequency. Every
form except the last is a rational impedance ``Z(s) = N(s)/D(s)`` in the
complex frequency ``s``, which gives its impedance at any frequency (exactly at
0 Hz, ``inf`` for an open), its reflection, and its step response (start
level, final level and time constants) from one description.

Relations (any microwave engineering text, e.g. Pozar, *Microwave
Engineering*, ch. 2; step signatures: high-speed digital design texts, e.g.
Hall, Hall and McCall, *High-Speed Digital System Design*, TDR section):

.. math::

    \\Gamma = \\frac{Z_L - Z_0}{Z_L + Z_0},\\qquad
    Z_L = Z_0\\frac{1+\\Gamma}{1-\\Gamma}

The reflected voltage is ``Gamma`` times the incident voltage and the
reflected current ``-Gamma`` times the incident current, so an open returns
the voltage with its sign and the current reversed, and a short the reverse.
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np

from calc import tline
from calc.cable import propagation_constant
from calc.errors import InputError
from calc.parse import parse, parse_complex_impedance

LOAD_EXAMPLE = "75 ohm || 10 pF"
KINDS = ("open", "short", "match", "resistor", "capacitor", "inductor", "series",
         "parallel", "line", "complex")

#: Levels (fractions of the incident step) within this of +1/-1/0 read as an
#: open, a short or a match when describing a trace.
LEVEL_TOLERANCE = 0.02


@dataclass(frozen=True)
class Load:
    """One termination. Build it with the class methods or :func:`parse_load`.

    ``kind`` is one of :data:`KINDS`. Components are in SI units; a
    component that is absent is ``None``. ``impedance_ohm`` holds the
    impedance of a ``"line"`` (the other line's Z0, real) or of a
    ``"complex"`` load (valid at the one frequency it was measured at).
    ``label`` names the other cable of a ``"line"`` load.
    """

    kind: str
    resistance_ohm: float | None = None
    inductance_h: float | None = None
    capacitance_f: float | None = None
    impedance_ohm: complex | None = None
    label: str = ""

    # -- constructors ---------------------------------------------------
    @classmethod
    def open(cls) -> Load:
        return cls("open")

    @classmethod
    def short(cls) -> Load:
        return cls("short")

    @classmethod
    def match(cls) -> Load:
        return cls("match")

    @classmethod
    def resistor(cls, r_ohm: float) -> Load:
        return cls.series(r_ohm=r_ohm)

    @classmethod
    def capacitor(cls, c_f: float) -> Load:
        return cls.series(c_f=c_f)

    @classmethod
    def inductor(cls, l_h: float) -> Load:
        return cls.series(l_h=l_h)

    @classmethod
    def series(cls, r_ohm: float | None = None, l_h: float | None = None,
               c_f: float | None = None) -> Load:
        """R, L and C in series (any of them); one component gives its own kind."""
        return cls._combination("series", r_ohm, l_h, c_f)

    @classmethod
    def parallel(cls, r_ohm: float | None = None, l_h: float | None = None,
                 c_f: float | None = None) -> Load:
        """R, L and C in parallel (any of them); one component gives its own kind."""
        return cls._combination("parallel", r_ohm, l_h, c_f)

    @classmethod
    def line(cls, z0_ohm: float, label: str = "") -> Load:
        """The run continues into a (long) line of another impedance."""
        return cls("line", impedance_ohm=complex(z0_ohm, 0.0), label=label)

    @classmethod
    def complex_at_frequency(cls, z_ohm: complex) -> Load:
        """An impedance measured at one frequency (no step response)."""
        return cls("complex", impedance_ohm=complex(z_ohm))

    @classmethod
    def _combination(cls, topology, r_ohm, l_h, c_f) -> Load:
        parts = {"resistor": r_ohm, "inductor": l_h, "capacitor": c_f}
        present = [k for k, v in parts.items() if v is not None]
        for k in present:
            v = parts[k]
            if not math.isfinite(v) or v < 0 or (v == 0 and k != "resistor"):
                raise ValueError(f"{k} value must be finite and positive, got {v!r}")
        if not present:
            raise ValueError("a combination needs at least one component")
        kind = present[0] if len(present) == 1 else topology
        return cls(kind, resistance_ohm=r_ohm, inductance_h=l_h, capacitance_f=c_f)

    # -- properties -----------------------------------------------------
    @property
    def is_reactive(self) -> bool:
        return self.kind not in ("open", "short", "match", "resistor", "line")

    @property
    def has_step_response(self) -> bool:
        return self.kind != "complex"

    def spec(self) -> str:
        """The text form :func:`parse_load` reads back (SI values, ``repr`` precision)."""
        if self.kind in ("open", "short", "match"):
            return self.kind
        if self.kind == "line":
            return f"line {self.impedance_ohm.real!r} ohm"
        if self.kind == "complex":
            z = self.impedance_ohm
            return f"{z.real!r}{z.imag:+}j ohm"
        terms = []
        if self.resistance_ohm is not None:
            terms.append(f"{self.resistance_ohm!r} ohm")
        if self.inductance_h is not None:
            terms.append(f"{self.inductance_h!r} H")
        if self.capacitance_f is not None:
            terms.append(f"{self.capacitance_f!r} F")
        return (" || " if self.kind == "parallel" else " + ").join(terms)

    def polynomials(self, z0_ohm: float | None = None) -> tuple[np.ndarray, np.ndarray]:
        """``(N, D)``: numerator and denominator coefficients of ``Z(s) = N(s)/D(s)``.

        Highest power first (``numpy.polyval`` order). ``"match"`` needs the
        line's ``z0_ohm``. A ``"complex"`` load has none (ValueError).
        """
        k = self.kind
        if k == "open":
            return np.array([1.0]), np.array([0.0])
        if k == "short":
            return np.array([0.0]), np.array([1.0])
        if k == "match":
            if z0_ohm is None:
                raise ValueError("a matched load needs the line's z0_ohm")
            return np.array([float(z0_ohm)]), np.array([1.0])
        if k == "line":
            return np.array([self.impedance_ohm.real]), np.array([1.0])
        if k == "complex":
            raise ValueError("an impedance known at one frequency has no Z(s)")
        r, ind, c = self.resistance_ohm, self.inductance_h, self.capacitance_f
        if k == "parallel":
            # Y = 1/R + 1/(sL) + sC as one fraction, then Z = 1/Y.
            num, den = np.array([0.0]), np.array([1.0])
            admittances = [([1.0], [r]) if r is not None else None,
                           ([1.0], [ind, 0.0]) if ind is not None else None,
                           ([c, 0.0], [1.0]) if c is not None else None]
            for yn, yd in (y for y in admittances if y is not None):
                num = np.polyadd(np.polymul(num, yd), np.polymul(yn, den))
                den = np.polymul(den, yd)
            return _trim(den), _trim(num)
        # series (and single components): Z = R + sL + 1/(sC)
        num = np.polyadd([r or 0.0], [ind, 0.0] if ind is not None else [0.0])
        if c is None:
            return _trim(num), np.array([1.0])
        return _trim(np.polyadd(np.polymul(num, [c, 0.0]), [1.0])), np.array([c, 0.0])


def _trim(p) -> np.ndarray:
    p = np.trim_zeros(np.asarray(p, dtype=float), "f")
    return p if p.size else np.array([0.0])


def reflection_polynomials(n: np.ndarray, d: np.ndarray, z0_ohm: float
                           ) -> tuple[np.ndarray, np.ndarray]:
    """Numerator and denominator of Gamma(s) = (N - Z0 D)/(N + Z0 D)."""
    zd = z0_ohm * np.asarray(d, dtype=float)
    return np.polysub(n, zd), np.polyadd(n, zd)


# -- parsing --------------------------------------------------------------
_WORDS = {"open": "open", "open circuit": "open", "short": "short",
          "short circuit": "short", "match": "match", "matched": "match",
          "matched load": "match"}
_CAPACITANCE = re.compile(r"(?:[fpnuµμm]?F|farads?)\s*$")
_INDUCTANCE = re.compile(r"(?:[pnuµμm]?H|henr(?:y|ies))\s*$")
_COMPLEX = re.compile(r"\dj|j\d|\dj\b", re.IGNORECASE)


def parse_load(text: str, field: str = "--load",
               lookup: Callable[[str], object] | None = None) -> Load:
    """A load as people type it.

    ``open``, ``short``, ``match``; one component (``75 ohm``, ``10 pF``,
    ``100 nH``); components in series (``75 ohm + 100 nH``) or in parallel
    (``75 ohm || 10 pF``); a complex impedance at one frequency
    (``60+40j ohm``); the run continuing into another impedance
    (``line 75 ohm``, or ``cable:rg59`` when ``lookup(id)`` returns a cable
    with ``z0_ohm``). Raises :class:`~calc.errors.InputError` otherwise.
    """
    if not isinstance(text, str) or not text.strip():
        raise InputError(field, "a load is required (open, short, match, 75 ohm, 10 pF ...)",
                         LOAD_EXAMPLE)
    t = " ".join(text.strip().split())
    low = t.lower()
    if low in _WORDS:
        return Load(_WORDS[low])
    if low.startswith("line "):
        z = parse(t[5:], field, "impedance")
        return Load.line(z)
    if low.startswith("cable:") or low.startswith("cable "):
        if lookup is None:
            raise InputError(field, "a cable load needs the catalog", "cable:rg59")
        cable_id = t[6:].strip()
        try:
            c = lookup(cable_id)
        except KeyError as exc:
            raise InputError(field, exc.args[0] if exc.args else f"no cable {cable_id!r}",
                             "cable:rg59") from None
        return Load.line(c.z0_ohm, label=c.id)
    if _COMPLEX.search(t):
        return Load.complex_at_frequency(parse_complex_impedance(t, field))
    if "||" in t and "+" in t:
        raise InputError(field, "mix of series (+) and parallel (||) is not supported; "
                         "give one kind", LOAD_EXAMPLE)
    topology = "parallel" if "||" in t else "series"
    terms = [p.strip() for p in re.split(r"\|\||\+", t)]
    values: dict[str, float] = {}
    for term in terms:
        if not term:
            raise InputError(field, f"cannot read {text.strip()!r}: an empty term", LOAD_EXAMPLE)
        kind = component_kind(term)
        v = check_component(kind, parse(term, field, kind), field)
        values[kind] = _combine(topology, kind, values.get(kind), v)
    return Load._combination(topology, values.get("resistance"), values.get("inductance"),
                             values.get("capacitance"))


#: What a component can be and still describe a cable fault or termination (SI units);
#: beyond these the step signatures would sit far outside any trace.
COMPONENT_RANGE = {"resistance": (0.0, 1e9, "0 ohm", "1 Gohm"),
                   "capacitance": (1e-18, 1.0, "1 aF", "1 F"),
                   "inductance": (1e-15, 1e3, "1 fH", "1 kH")}


def check_component(kind: str, value: float, field: str) -> float:
    """``value`` if it is a sensible resistance, capacitance or inductance, else InputError."""
    lo, hi, lo_text, hi_text = COMPONENT_RANGE[kind]
    if not (math.isfinite(value) and lo <= value <= hi):
        raise InputError(field, f"the {kind} must be from {lo_text} to {hi_text}",
                         {"resistance": "75 ohm", "capacitance": "10 pF",
                          "inductance": "100 nH"}[kind])
    return value


def component_kind(term: str) -> str:
    """The parse kind a component term names by its unit: capacitance, inductance or resistance."""
    if _CAPACITANCE.search(term):
        return "capacitance"
    if _INDUCTANCE.search(term):
        return "inductance"
    return "resistance"  # "75 ohm", "75", and anything parse() will refuse with its own words


def _combine(topology: str, kind: str, old: float | None, new: float) -> float:
    """Two like components in one spec: series R and L add, C adds in parallel."""
    if old is None:
        return new
    adds = (topology == "series") != (kind == "capacitance")
    if adds:
        return old + new
    return 0.0 if old == 0.0 or new == 0.0 else old * new / (old + new)


# -- impedance and reflection ----------------------------------------------
def load_impedance(load: Load, frequency_hz: np.ndarray | float,
                   z0_ohm: float | None = None) -> np.ndarray:
    """``Z_L(f)`` in ohms, complex; ``inf`` for an open (or a capacitor at 0 Hz).

    Exact at 0 Hz (an inductor is 0, a capacitor ``inf``). ``z0_ohm`` is
    needed only for ``"match"``. A ``"complex"`` load returns its one value at
    every frequency.
    """
    f = np.asarray(frequency_hz, dtype=float)
    if load.kind == "complex":
        return np.full(f.shape, load.impedance_ohm, dtype=complex)
    n, d = load.polynomials(z0_ohm)
    s = 2j * math.pi * f
    num, den = np.polyval(n, s), np.polyval(d, s)
    with np.errstate(divide="ignore", invalid="ignore"):
        z = num / den
    return np.where(den == 0, complex(math.inf, 0.0), z)


def load_reflection(load: Load, frequency_hz: np.ndarray | float, z0_ohm: float) -> np.ndarray:
    """Gamma of the load on a line of ``z0_ohm``, complex (exact at 0 Hz)."""
    f = np.asarray(frequency_hz, dtype=float)
    if load.kind == "complex":
        return np.broadcast_to(tline.reflection_coefficient(load.impedance_ohm, z0_ohm),
                               f.shape).astype(complex)
    n, d = reflection_polynomials(*load.polynomials(z0_ohm), z0_ohm)
    s = 2j * math.pi * f
    return np.polyval(n, s) / np.polyval(d, s)


@dataclass(frozen=True)
class StepLevels:
    """The load's reflected step (ideal edge, matched line): where it starts, ends, how fast."""

    start: float  # Gamma(s -> inf): the level just after the edge arrives
    final: float  # Gamma(0): the level it settles at
    time_constants_s: tuple[float, ...]  # one per pole, slowest first; () for a resistive load
    rings: bool  # complex poles: the level rings as it settles

    @property
    def time_constant_s(self) -> float | None:
        return self.time_constants_s[0] if self.time_constants_s else None


def step_levels(load: Load, z0_ohm: float) -> StepLevels | None:
    """Start and final level and time constants of the load's reflected step.

    The poles of Gamma(s) are the roots of N(s) + Z0 D(s); each gives a time
    constant -1/Re(p) (for example Z0 C for a capacitor across the end, L/(R + Z0)
    for an inductor in series with a resistance). None for a ``"complex"`` load.
    """
    if not load.has_step_response:
        return None
    num, den = reflection_polynomials(*load.polynomials(z0_ohm), z0_ohm)
    return _step_of(num, den)


def _step_of(num: np.ndarray, den: np.ndarray) -> StepLevels:
    num, den = _trim(num), _trim(den)
    final = float(num[-1] / den[-1]) if den[-1] != 0 else math.copysign(1.0, num[-1])
    # s -> inf: compare the coefficients of den's leading power
    pad = max(len(num), len(den))
    nn = np.concatenate([np.zeros(pad - len(num)), num])
    dd = np.concatenate([np.zeros(pad - len(den)), den])
    lead = int(np.flatnonzero(dd)[0])
    start = float(nn[lead] / dd[lead])
    poles = np.roots(den) if len(den) > 1 else np.array([])
    taus = sorted((float(-1.0 / p.real) for p in poles if p.real < 0), reverse=True)
    rings = bool(np.any(np.abs(poles.imag) > 1e-9 * np.abs(poles))) if poles.size else False
    return StepLevels(start, final, tuple(taus), rings)


# -- the summary ------------------------------------------------------------
@dataclass(frozen=True)
class LoadSummary:
    """What a load sends back, on a line of ``z0_ohm`` (at ``frequency_hz`` if given).

    ``gamma`` (and return loss, VSWR, mismatch loss) is None for a reactive
    load when no frequency was given. ``reflected_voltage`` and
    ``reflected_current`` are fractions of the incident wave: Gamma at the
    frequency if one was given, otherwise the settled step (Gamma at 0 Hz).
    """

    load: Load
    z0_ohm: float
    frequency_hz: float | None
    impedance_ohm: complex | None
    gamma: complex | None
    return_loss_db: float | None
    vswr: float | None
    mismatch_loss_db: float | None
    reflected_voltage: complex
    reflected_current: complex
    voltage_sign: str  # "same", "inverted", "none" (relative to the incident)
    current_sign: str
    step_start: float | None
    step_final: float | None
    time_constant_s: float | None
    time_constants_s: tuple[float, ...]
    rings: bool
    sentence: str


def summarize(load: Load, z0_ohm: float, frequency_hz: float | None = None) -> LoadSummary:
    """The load summary: reflection, return loss, VSWR, signs, step levels, one sentence."""
    if not (math.isfinite(z0_ohm) and z0_ohm > 0):
        raise InputError("--z0", "the line impedance must be a positive number", "50 ohm")
    steps = step_levels(load, z0_ohm)
    gamma: complex | None = None
    z: complex | None = None
    if frequency_hz is not None or not load.is_reactive or load.kind == "complex":
        f = 0.0 if frequency_hz is None else frequency_hz
        z = complex(load_impedance(load, f, z0_ohm))
        gamma = complex(load_reflection(load, f, z0_ohm))
    figures = _figures(gamma)
    reflected = gamma if gamma is not None else complex(steps.final)
    return LoadSummary(
        load=load, z0_ohm=z0_ohm, frequency_hz=frequency_hz, impedance_ohm=z, gamma=gamma,
        **figures,
        reflected_voltage=reflected, reflected_current=-reflected,
        voltage_sign=_sign_word(reflected.real, "same", "inverted"),
        current_sign=_sign_word(-reflected.real, "same", "reversed"),
        step_start=steps.start if steps else None,
        step_final=steps.final if steps else None,
        time_constant_s=steps.time_constant_s if steps else None,
        time_constants_s=steps.time_constants_s if steps else (),
        rings=steps.rings if steps else False,
        sentence=describe_trace(load, steps),
    )


def _figures(gamma: complex | None) -> dict:
    if gamma is None:
        return {"return_loss_db": None, "vswr": None, "mismatch_loss_db": None}
    return {"return_loss_db": max(0.0, float(tline.return_loss_db(gamma))),
            "vswr": float(tline.vswr(gamma)),
            "mismatch_loss_db": float(tline.mismatch_loss_db(gamma))}


def _sign_word(x: float, positive: str, negative: str) -> str:
    if abs(x) < 1e-12:
        return "none"
    return positive if x > 0 else negative


def level_word(level: float) -> str:
    """A level in the trade's words: like an open, a short, a match, higher or lower."""
    if level >= 1.0 - LEVEL_TOLERANCE:
        return "an open"
    if level <= -1.0 + LEVEL_TOLERANCE:
        return "a short"
    if abs(level) <= LEVEL_TOLERANCE:
        return "a match"
    return "a higher impedance" if level > 0 else "a lower impedance"


def describe_trace(load: Load, steps: StepLevels | None) -> str:
    """One plain sentence of what a step reflectometer's trace shows for this load."""
    k = load.kind
    if k == "open":
        return ("An open returns the step with the same sign: the trace rises to +1 and stays "
                "there, and the reflected current is reversed (none flows at the end).")
    if k == "short":
        return ("A short returns the step inverted: the trace falls to -1 and stays there, and "
                "the reflected current keeps its sign (no voltage at the end).")
    if k == "match":
        return "A matched load returns nothing: the trace stays flat where the line ends."
    if k == "complex":
        return ("An impedance known at one frequency has no step response; give it as R + L "
                "or R || C to predict a trace.")
    if k in ("resistor", "line"):
        what = "a line of another impedance" if k == "line" else "a resistance"
        if level_word(steps.final) in ("an open", "a short"):
            return (f"{what.capitalize()} this far from Z0 behaves like {level_word(steps.final)}: "
                    f"the trace {'rises to nearly +1' if steps.final > 0 else 'falls to nearly -1'}"
                    " and stays there.")
        if abs(steps.final) <= LEVEL_TOLERANCE:
            return f"{what.capitalize()} this close to Z0 returns almost nothing: the trace stays nearly flat."
        direction = "up" if steps.final > 0 else "down"
        keeps = "keeps" if steps.final > 0 else "inverts"
        tail = (" until that line's own end reflects" if k == "line" else "")
        return (f"{what.capitalize()} {'above' if steps.final > 0 else 'below'} Z0 {keeps} the "
                f"voltage's sign with a smaller step: the trace steps {direction} and stays{tail}.")
    start, final = level_word(steps.start), level_word(steps.final)
    part = {"capacitor": "A capacitor across the end", "inductor": "An inductor at the end"}.get(
        k, f"This {k} combination")
    ring = ", ringing as it settles" if steps.rings else ""
    if start == final:
        return (f"{part} looks like {start} both at first and once settled, with a transient "
                f"between{ring}.")
    moves = "rises" if steps.start < steps.final else "falls"
    return (f"{part} first looks like {start} and then like {final}: the trace starts at the "
            f"level of {start} and {moves} toward that of {final}{ring}.")


# -- seen through a line ------------------------------------------------------
@dataclass(frozen=True)
class SeenThrough:
    """The load as an analyser at the near end of a line or run reads it."""

    frequency_hz: np.ndarray | float
    reference_z_ohm: float
    input_impedance_ohm: np.ndarray | complex
    gamma: np.ndarray | complex
    return_loss_db: np.ndarray | float
    vswr: np.ndarray | float
    mismatch_loss_db: np.ndarray | float
    load_gamma: np.ndarray | complex  # at the far end, on the last segment's Z0


def _scalar(a, kind=complex):
    """A 0-d array as a Python number; arrays unchanged."""
    return kind(a) if np.ndim(a) == 0 else a


def seen_through(load: Load, frequency_hz: np.ndarray | float, segments: Sequence,
                 reference_z_ohm: float | None = None) -> SeenThrough:
    """Move the load to the near end of ``segments`` (far end last).

    Each segment needs ``length_m``, ``z0_ohm``, ``vf``, ``atten_k1`` and
    ``atten_k2`` (a :class:`calc.simulate.Segment`; give k1 = k2 = None for a
    lossless line). Applies the terminated-line relation segment by segment
    from the load back (Pozar, ch. 2):

    .. math:: Z_{in} = Z_0 \\frac{Z_L + Z_0\\tanh(\\gamma l)}{Z_0 + Z_L\\tanh(\\gamma l)}

    ``reference_z_ohm`` (default: the first segment's Z0) is the analyser's
    reference for the reflection at the near end.
    """
    if not segments:
        raise InputError("--through", "a line needs at least one segment", "3 m")
    f = np.asarray(frequency_hz, dtype=float)
    last = segments[-1]
    z = load_impedance(load, f, last.z0_ohm)
    load_gamma = load_reflection(load, f, last.z0_ohm)
    for seg in reversed(segments):
        gamma_prop = propagation_constant(f, seg.vf, seg.atten_k1, seg.atten_k2)
        z = tline.input_impedance(z, seg.z0_ohm, gamma_prop, seg.length_m)
    ref = float(segments[0].z0_ohm if reference_z_ohm is None else reference_z_ohm)
    g = tline.reflection_coefficient(z, ref)
    return SeenThrough(
        frequency_hz=frequency_hz, reference_z_ohm=ref, input_impedance_ohm=_scalar(z),
        gamma=_scalar(g), return_loss_db=_scalar(np.maximum(tline.return_loss_db(g), 0.0), float),
        vswr=_scalar(tline.vswr(g), float),
        mismatch_loss_db=_scalar(tline.mismatch_loss_db(g), float),
        load_gamma=_scalar(load_gamma))


# -- backwards: from an observed step ------------------------------------------
OBSERVED_KINDS = ("open", "short", "matched", "higher-impedance", "lower-impedance",
                  "capacitive", "inductive")


@dataclass(frozen=True)
class ObservedStep:
    """What an observed reflection implies, with the readings it cannot tell apart.

    ``level`` is the reflected step as a fraction of the incident one (rho);
    ``settles_to`` the level it later settles at, when the trace changes.
    ``impedance_ohm`` is the resistive load at the end that gives the settled
    level (``inf`` for an open). ``series_resistance_ohm`` /
    ``shunt_resistance_ohm`` are the other readings of the same step: a
    resistance in series in a joint, or across the line (leakage), with the
    same cable continuing beyond it.
    """

    level: float
    settles_to: float | None
    z0_ohm: float
    impedance_ohm: float
    kind: str
    sentence: str
    alternatives: tuple[str, ...]
    series_resistance_ohm: float | None
    shunt_resistance_ohm: float | None


def from_observed_step(level: float, z0_ohm: float, settles_to: float | None = None
                       ) -> ObservedStep:
    """Work backwards from a reflection's size to the load that could cause it.

    A level alone cannot tell a resistive end from the start of a section of
    other cable, or a resistance in a joint; the alternatives say so. A level
    that changes (``settles_to``) shows reactance: rising (starting low) is
    capacitive, falling (starting high) inductive.
    """
    for name, value in (("--observed-step", level), ("--settles-to", settles_to)):
        if value is None:
            continue
        if not math.isfinite(value) or abs(value) > 1.0 + 1e-9:
            raise InputError(name, "a passive load reflects between -1 and +1 of the incident "
                             "step", "-0.33")
    if not (math.isfinite(z0_ohm) and z0_ohm > 0):
        raise InputError("--z0", "the line impedance must be a positive number", "50 ohm")
    level = max(-1.0, min(1.0, level))
    final = level if settles_to is None else max(-1.0, min(1.0, settles_to))
    z = float(tline.impedance_from_gamma(final, z0_ohm).real)
    changes = settles_to is not None and abs(final - level) > LEVEL_TOLERANCE
    series_r = 2.0 * z0_ohm * final / (1.0 - final) if 0 < final < 1 else None
    shunt_r = -z0_ohm * (1.0 + final) / (2.0 * final) if -1 < final < 0 else None
    if changes:
        kind = "capacitive" if level < final else "inductive"
        alternatives = _reactive_readings(kind, final)
        sentence = (f"The trace starts {'low' if level < final else 'high'} and moves toward "
                    f"{level_word(final)}: a {kind} fault or load.")
    else:
        kind, sentence, alternatives = _steady_reading(final)
    return ObservedStep(level, settles_to, z0_ohm, z, kind, sentence, alternatives,
                        series_r, shunt_r)


def _steady_reading(level: float) -> tuple[str, str, tuple[str, ...]]:
    if level >= 1.0 - LEVEL_TOLERANCE:
        return ("open", "The step doubles the voltage: an open (a break, an unterminated end).",
                ("a very high resistance at the end (a near-open)",
                 "a capacitor or inductor that has not changed yet, if the trace is short"))
    if level <= -1.0 + LEVEL_TOLERANCE:
        return ("short", "The step cancels the voltage: a short (crushed, shorted or water-filled).",
                ("a very low resistance across the line",))
    if abs(level) <= LEVEL_TOLERANCE:
        return ("matched", "No reflection to speak of: the line continues matched or is terminated "
                "in its own impedance.",
                ("a small change that the instrument's rise time hides",))
    if level > 0:
        return ("higher-impedance", "The trace steps up: the line meets a higher impedance.",
                ("a resistive load above Z0 at the end",
                 "the start of a section of higher-impedance cable (it steps back where it ends)",
                 "a resistance in series in a joint (corroded or loose)"))
    return ("lower-impedance", "The trace steps down: the line meets a lower impedance.",
            ("a resistive load below Z0 at the end",
             "the start of a section of lower-impedance cable (it steps back where it ends)",
             "a resistance across the line (leakage, water)"))


def _reactive_readings(kind: str, final: float) -> tuple[str, ...]:
    back_to_flat = abs(final) <= LEVEL_TOLERANCE
    if kind == "capacitive":
        if back_to_flat:
            return ("a shunt capacitance along the line: a crushed or wet spot, a tap, a connector",)
        return ("a capacitor across the end, or a resistance with capacitance across it",)
    if back_to_flat:
        return ("a series inductance: a loose connector, a splice, a gap in the screen",)
    return ("an inductance in series with the end's resistance (a coil, a long lead)",)
