"""The input edge: text as people type it -> SI floats, with a dimension check.

Every quantity a person types goes through :func:`parse`, which returns a
plain float in SI units or raises :class:`calc.errors.InputError` naming the
field and showing an accepted example. Nothing else in ``calc`` sees text.

pint costs several hundred milliseconds to import and build its registry, so
it is loaded on first use (or ahead of time with :func:`warm_up`, which the TUI
calls from a background thread after the first frame).

Accepted forms, beyond what pint understands directly:

* compound lengths: ``"12 ft 6 in"``, ``"12' 6\\""``, ``"6 1/2 in"``,
  ``"3 ft 2-3/8 in"``;
* percentages: ``"66 %"``, ``"66%"``;
* fractions of a wavelength: ``"0.25 wl"``, ``"0.25 wavelength"``, ``"0.25 λ"``;
* ``µ``, ``μ`` and ``u`` as the micro prefix, ``Ω`` for ohm;
* unit symbols in the wrong case, as they get typed on a phone or with caps
  lock on (``"146 mhz"``, ``"245 NS"``, ``"80 FT"``, ``"10 PF"``): within the
  field's own kind each symbol is read as the one people mean (MHz, not
  millihertz; pF, not petafarad; ms, not megaseconds): :data:`CASE_FOLDED`.

A comma inside a number (``"2,5 m"``, ``"1,250 ft"``) is refused: read as
a decimal comma or as a thousands separator it gives answers a thousand
times apart, and pint would silently read ``"2,5"`` as 25.
"""

from __future__ import annotations

import math
import re
import threading
import warnings
from dataclasses import dataclass
from functools import lru_cache

from calc.errors import InputError

MAX_INPUT_CHARS = 200

_registry = None
_registry_lock = threading.Lock()


def _ureg():
    """Return the package's one pint registry, building it on first use."""
    global _registry
    if _registry is None:
        with _registry_lock:
            if _registry is None:
                import pint  # deferred: ~0.3-0.6 s of import and registry build

                _registry = pint.UnitRegistry(autoconvert_offset_to_baseunit=True)
    return _registry


def warm_up() -> None:
    """Build the pint registry now (call from a background thread)."""
    _ureg()
    parse("1 ns", "warm-up", "time")


@dataclass(frozen=True)
class Kind:
    """What a field holds: its SI unit, range and a typed example."""

    si_unit: str  # pint expression of the SI unit the float is returned in
    example: str
    bare_unit: str | None = None  # unit assumed for a bare number; None refuses
    minimum: float | None = 0.0  # exclusive lower bound unless min_inclusive
    min_inclusive: bool = False
    maximum: float | None = None  # inclusive upper bound
    noun: str = "value"
    percent: bool = False  # state the bounds in percent (NVP, tolerance)


KINDS: dict[str, Kind] = {
    # At most 1 s and 10,000 km: a second is the round trip of some 100,000 km of
    # cable, and no run is longer than 10,000 km; beyond, the line arithmetic
    # overflows (fuzz found 1e300 s and 1e308 m; common practice).
    "time": Kind("s", "245 ns", maximum=1.0, noun="time"),
    "length": Kind("m", "12 ft 6 in", maximum=1e7, noun="length"),
    "length_or_zero": Kind("m", "15 mm", minimum=0.0, min_inclusive=True, maximum=1e7,
                           noun="length"),
    # 1 mHz to 1 THz: outside, no cable measurement is meant and the line
    # arithmetic overflows (fuzz found 1e-301 Hz; common practice).
    "frequency": Kind("Hz", "146.52 MHz", minimum=1e-3, min_inclusive=True, maximum=1e12,
                      noun="frequency"),
    # 1 micro-ohm to 1 gigaohm: beyond either end no cable or load is meant, and
    # the terminated-line arithmetic would overflow (common practice).
    "impedance": Kind("ohm", "50 ohm", bare_unit="ohm", minimum=1e-6, min_inclusive=True,
                      maximum=1e9, noun="impedance"),
    "resistance": Kind("ohm", "75 ohm", bare_unit="ohm", minimum=0.0, min_inclusive=True,
                       noun="resistance"),
    "capacitance": Kind("F", "10 pF", noun="capacitance"),
    "inductance": Kind("H", "100 nH", noun="inductance"),
    "vf": Kind("dimensionless", "0.66", bare_unit="dimensionless", minimum=0.01,
               min_inclusive=True, maximum=1.0, noun="velocity factor"),
    "nvp": Kind("dimensionless", "66 %", bare_unit="percent", minimum=0.01, min_inclusive=True,
                maximum=1.0, noun="NVP",
                percent=True),
    "eps_r": Kind("dimensionless", "2.25", bare_unit="dimensionless", minimum=1.0,
                  min_inclusive=True, noun="relative permittivity"),
    "tolerance": Kind("dimensionless", "3 %", bare_unit="dimensionless", minimum=0.0,
                      min_inclusive=True, maximum=0.5, noun="tolerance", percent=True),
    "delay_per_length": Kind("s/m", "1.54 ns/ft", noun="delay per length"),
    "velocity": Kind("m/s", "198 m/us", noun="velocity"),
    "angle": Kind("degree", "90 deg", bare_unit="degree", noun="electrical length"),
    "voltage": Kind("V", "2.5 V", bare_unit="V", minimum=None, noun="voltage"),
    "ratio": Kind("dimensionless", "-0.33", bare_unit="dimensionless", minimum=None,
                  noun="level"),
}

def _symbols(*names: str) -> dict[str, str]:
    return {n.lower(): n for n in names}


_TIME_SYMBOLS = _symbols("fs", "ps", "ns", "us", "ms", "s")
_LENGTH_SYMBOLS = _symbols("mm", "cm", "m", "km", "ft", "in")

#: Unit symbols read whatever their case, per kind (lower-cased key -> the
#: symbol people mean in this trade; common practice: nobody here means
#: millihertz, petafarads or megaseconds).
CASE_FOLDED: dict[str, dict[str, str]] = {
    "time": _TIME_SYMBOLS,
    "length": _LENGTH_SYMBOLS,
    "length_or_zero": _LENGTH_SYMBOLS,
    "frequency": _symbols("Hz", "kHz", "MHz", "GHz"),
    "impedance": _symbols("ohm", "kohm"),
    "resistance": _symbols("ohm", "kohm"),
    "capacitance": _symbols("fF", "pF", "nF", "uF"),
    "inductance": _symbols("pH", "nH", "uH", "mH"),
    "delay_per_length": _TIME_SYMBOLS | _LENGTH_SYMBOLS,
    "velocity": _TIME_SYMBOLS | _LENGTH_SYMBOLS,
    "angle": _symbols("deg"),
}
#: The SI scale of every symbol in :data:`CASE_FOLDED`: "number symbol" in a field
#: of its own kind is read without pint (whose import and registry take about
#: 0.4 s of a CLI command's start-up). ``tests/test_parse.py`` holds every entry
#: to pint's own conversion.
SYMBOL_SCALE: dict[str, float] = {
    "fs": 1e-15, "ps": 1e-12, "ns": 1e-9, "us": 1e-6, "ms": 1e-3, "s": 1.0,
    "mm": 1e-3, "cm": 1e-2, "m": 1.0, "km": 1e3, "ft": 0.3048, "in": 0.0254,
    "Hz": 1.0, "kHz": 1e3, "MHz": 1e6, "GHz": 1e9, "ohm": 1.0, "kohm": 1e3,
    "fF": 1e-15, "pF": 1e-12, "nF": 1e-9, "uF": 1e-6,
    "pH": 1e-12, "nH": 1e-9, "uH": 1e-6, "mH": 1e-3, "deg": 1.0,
}
#: Kinds whose symbols all measure the kind itself (not ns/ft or m/us).
_SCALED_KINDS = frozenset(CASE_FOLDED) - {"delay_per_length", "velocity"}
_SYMBOL = re.compile(r"(?<![A-Za-z])[A-Za-z]+(?![A-Za-z])")
_COMMA_IN_NUMBER = re.compile(r"\d,\d")

_WAVELENGTH_WORDS = ("wavelengths", "wavelength", "lambda", "wl", "λ")
_NUMBER = r"[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?"
_MIXED_FRACTION = re.compile(r"(?<![\w.])(\d+)[\s-]+(\d+)/(\d+)(?![\w.])")
_SIMPLE_FRACTION = re.compile(r"(?<![\w./])(\d+)/(\d+)(?![\d./])")
_NUMBER_SYMBOL = re.compile(rf"^\s*(?P<number>{_NUMBER})\s*(?P<symbol>[A-Za-z]+)\s*$")
_FEET_INCHES = re.compile(
    rf"^\s*(?:(?P<ft>{_NUMBER})\s*(?:ft|feet|foot|')\s*)?"
    rf"(?:(?P<inch>{_NUMBER})\s*(?:in|inch|inches|\"|''))?\s*$"
)


def _normalise(text: str) -> str:
    """Spellings people type -> spellings pint reads."""
    t = text.strip()
    t = t.replace("\u00b5", "u").replace("\u03bc", "u")  # micro sign, Greek mu
    t = t.replace("\u03a9", " ohm").replace("\u2126", " ohm")  # Omega, ohm sign
    t = t.replace("\u2032", "'").replace("\u2033", '"')  # prime, double prime
    t = t.replace("\u2212", "-")  # minus sign
    t = re.sub(r"\bohms\b", "ohm", t, flags=re.IGNORECASE)
    t = re.sub(r"\bOhm\b", "ohm", t)
    t = t.replace("%", " percent")
    # mixed and simple fractions: "6 1/2 in", "2-3/8 in" -> decimal
    t = _MIXED_FRACTION.sub(lambda m: _frac(m.group(1), m.group(2), m.group(3)), t)
    t = _SIMPLE_FRACTION.sub(lambda m: _frac("0", m.group(1), m.group(2)), t)
    return t


def _fold_case(text: str, kind: str) -> str:
    """Unit symbols of ``kind`` in any case -> their proper case (:data:`CASE_FOLDED`)."""
    symbols = CASE_FOLDED.get(kind)
    if not symbols:
        return text
    return _SYMBOL.sub(lambda m: symbols.get(m.group(0).lower(), m.group(0)), text)


def _frac(whole: str, num: str, den: str) -> str:
    d = int(den)
    if d == 0:
        return f"{whole} {num}/{den}"  # leave it for pint to refuse
    return repr(int(whole) + int(num) / d)


def _feet_inches_m(text: str) -> float | None:
    """'12 ft 6 in', '12\\' 6"', '6"' -> metres; None if not that shape."""
    m = _FEET_INCHES.match(text)
    if not m or (m.group("ft") is None and m.group("inch") is None):
        return None
    feet = float(m.group("ft") or 0.0)
    inches = float(m.group("inch") or 0.0)
    return feet * 0.3048 + inches * 0.0254


def _scaled(text: str, kind: str) -> float | None:
    """'245 ns', '146.52MHz' -> SI float by :data:`SYMBOL_SCALE`; None if not that shape."""
    m = _NUMBER_SYMBOL.match(text)
    if not m or m.group("symbol") not in CASE_FOLDED[kind].values():
        return None
    return float(m.group("number")) * SYMBOL_SCALE[m.group("symbol")]


def _fail(field: str, kind: Kind, problem: str) -> InputError:
    return InputError(field, problem, kind.example)


@lru_cache(maxsize=4096)
def parse(text: str, field: str, kind: str) -> float:
    """Parse ``text`` as a quantity of ``kind`` (a key of :data:`KINDS`).

    Returns the value as a float in the kind's SI unit (seconds, metres,
    hertz, ohms, farads, henries, a plain fraction for VF/NVP/tolerance,
    degrees for electrical length, s/m, m/s). Raises
    :class:`~calc.errors.InputError` for anything else.
    """
    k = KINDS[kind]
    if not isinstance(text, str):
        raise _fail(field, k, "expected text")
    if len(text) > MAX_INPUT_CHARS:
        raise _fail(field, k, f"input longer than {MAX_INPUT_CHARS} characters")
    raw = text.strip()
    if not raw:
        raise _fail(field, k, f"a {k.noun} is required")
    if _COMMA_IN_NUMBER.search(raw):
        raise _fail(field, k, f"{raw!r} has a comma in a number: write decimals with a point "
                              "and no thousands separator")
    t = _fold_case(_normalise(raw), kind)
    value: float | None = None
    if kind == "angle":
        for word in _WAVELENGTH_WORDS:
            if t.lower().endswith(word):
                number = t[: -len(word)].strip()
                value = 360.0 * _plain_number(number, field, k)
                break
    if value is None and kind.startswith("length"):
        value = _feet_inches_m(t)
    if value is None and kind in _SCALED_KINDS:
        value = _scaled(t, kind)
    if value is None:
        value = _with_pint(t, field, k)
    return _check_range(value, field, k, raw)


def _plain_number(text: str, field: str, k: Kind) -> float:
    if not re.fullmatch(_NUMBER, text.strip()):
        raise _fail(field, k, f"cannot read {text.strip()!r} as a number")
    return float(text)


def _with_pint(t: str, field: str, k: Kind) -> float:
    if re.fullmatch(_NUMBER, t):
        if k.bare_unit is None:
            raise _fail(field, k, f"{t!r} needs a unit")
        if k.bare_unit == k.si_unit:  # already in the SI unit: no registry needed (~0.5 s)
            return float(t)
        t = f"{t} {k.bare_unit}"
    ureg = _ureg()
    try:
        q = ureg.Quantity(t)
    except Exception as exc:  # pint raises many types for bad text; all mean the same here
        raise _fail(field, k, f"cannot read {t!r} ({_pint_reason(exc)})") from None
    if not isinstance(q, ureg.Quantity):  # a bare number slipped through as float
        q = ureg.Quantity(float(q), k.bare_unit or "dimensionless")
    target = ureg.Quantity(1.0, k.si_unit)
    if q.dimensionality != target.dimensionality:
        raise _fail(field, k, f"{t!r} is not a {k.noun}")
    try:
        with warnings.catch_warnings():  # an overflow (say "1e300 dB") is refused below, quietly
            warnings.simplefilter("ignore", RuntimeWarning)
            value = float(q.to(k.si_unit).magnitude)
    except Exception as exc:
        raise _fail(field, k, f"cannot convert {t!r} ({_pint_reason(exc)})") from None
    return value


def _pint_reason(exc: Exception) -> str:
    name = type(exc).__name__
    if name == "UndefinedUnitError":
        return "unknown unit"
    return "not a quantity"


def _check_range(value: float, field: str, k: Kind, raw: str) -> float:
    scale = 100.0 if k.percent else 1.0
    unit = " %" if k.percent else ("" if k.si_unit == "dimensionless" else f" {k.si_unit}")
    if not math.isfinite(value):
        raise _fail(field, k, f"{raw!r} is not a finite {k.noun}")
    low = None if k.minimum is None else k.minimum * scale
    high = None if k.maximum is None else k.maximum * scale
    if low is not None:
        if k.min_inclusive and value < k.minimum:
            raise _fail(field, k, f"{raw!r}: the {k.noun} must be at least {low:g}{unit}")
        if not k.min_inclusive and value <= k.minimum:
            raise _fail(field, k, f"{raw!r}: the {k.noun} must be greater than {low:g}{unit}")
    if high is not None and value > k.maximum:
        if k.percent and k.bare_unit == "dimensionless" and re.fullmatch(_NUMBER, raw):
            raise _fail(field, k, f"{raw!r} is read as a fraction ({value * 100:g} %) and the "
                                  f"{k.noun} must be at most {high:g}{unit}; for percent write "
                                  f"'{raw} %'")
        if k.maximum == 1.0 and not k.percent and re.fullmatch(_NUMBER, raw) \
                and 10 <= value <= 100:
            raise _fail(field, k, f"{raw!r}: the {k.noun} must be at most 1; for "
                                  f"{value:g} percent write '{value / 100:g}' or '{raw} %'")
        raise _fail(field, k, f"{raw!r}: the {k.noun} must be at most {high:g}{unit}")
    return value


def parse_complex_impedance(text: str, field: str) -> complex:
    """``"60+40j ohm"``, ``"60-j40"``, ``"75 ohm"`` -> complex ohms (real part >= 0)."""
    example = "60+40j ohm"
    t = _normalise(text if isinstance(text, str) else "")
    if len(t) > MAX_INPUT_CHARS or not t:
        raise InputError(field, "an impedance is required", example)
    body = re.sub(r"\s*ohm\s*$", "", t).replace(" ", "")
    body = re.sub(r"([+-])j(\d+(?:\.\d*)?(?:[eE][+-]?\d+)?)", r"\g<1>\2j", body)  # 60-j40 -> 60-40j
    if body.startswith("j"):
        body = body[1:] + "j"
    try:
        z = complex(body)
    except ValueError:
        raise InputError(field, f"cannot read {text.strip()!r} as an impedance", example) from None
    if not (math.isfinite(z.real) and math.isfinite(z.imag)):
        raise InputError(field, "must be finite", example)
    if z.real < 0:
        raise InputError(field, "a passive load has a real part of zero or more", example)
    return z


_BAND = re.compile(
    rf"^\s*(?P<lo>{_NUMBER})\s*(?P<lo_unit>[A-Za-z]*)\s*(?:-|\u2013|\u2014|\.\.|to)\s*"
    rf"(?P<hi>{_NUMBER})\s*(?P<hi_unit>[A-Za-z]*)\s*$"
)


def parse_band(text: str, field: str) -> tuple[float, float]:
    """``"144-148 MHz"``, ``"144 MHz - 148 MHz"``, ``"430 to 440 MHz"`` -> (low, high) in Hz.

    A unit given only after the upper edge applies to both edges.
    """
    example = "144-148 MHz"
    t = text.strip() if isinstance(text, str) else ""
    m = _BAND.match(t) if len(t) <= MAX_INPUT_CHARS else None
    if not m or not (m.group("lo_unit") or m.group("hi_unit")):
        raise InputError(field, f"cannot read {t!r} as a band LOW-HIGH UNIT", example)
    unit = m.group("hi_unit") or m.group("lo_unit")
    try:
        lo = parse(f"{m.group('lo')} {m.group('lo_unit') or unit}", field, "frequency")
        hi = parse(f"{m.group('hi')} {m.group('hi_unit') or unit}", field, "frequency")
    except InputError as exc:
        raise InputError(field, exc.problem, example) from None
    if not lo < hi:
        raise InputError(field, f"{t!r}: the low edge must be below the high edge", example)
    return lo, hi


#: A level typed in volts ends in a voltage unit (``0.67 V``, ``670 mV``).
_IN_VOLTS = re.compile(r"[0-9.]\s*[munµμk]?V\s*$")


def parse_level(text: str, field: str) -> tuple[float, bool]:
    """A level read off a trace, as typed: ``(volts, True)`` for ``"0.67 V"``, or
    ``(rho, False)`` for a fraction of the incident step (``"-0.33"``)."""
    in_volts = bool(_IN_VOLTS.search(text.strip())) if isinstance(text, str) else False
    return parse(text, field, "voltage" if in_volts else "ratio"), in_volts
