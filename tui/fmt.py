"""Formatting of core results for people (screen and terminal) and for JSON.

The core returns SI floats; everything a person reads is shaped here, so the
TUI and the CLI show the same numbers the same way.
"""

from __future__ import annotations

import math
from typing import NamedTuple

from calc.tape import to_feet_inches

UNIT_SYSTEMS = ("metric", "imperial")


def length(length_m: float, units: str = "metric", fraction: int = 16) -> str:
    """A length as a tape shows it: ``"12.345 m"`` / ``"850 mm"`` or ``"40 ft 6-3/8 in"``."""
    if length_m is None or not math.isfinite(length_m):
        return "-"
    if units == "imperial":
        fi = to_feet_inches(length_m, fraction)
        sign = "-" if fi.negative else ""
        frac = f"-{fi.numerator}/{fi.denominator}" if fi.numerator else ""
        if fi.feet:
            return f"{sign}{fi.feet} ft {fi.inches}{frac} in"
        if not fi.inches and frac:  # under an inch: "9/16 in", not "0-9/16 in"
            return f"{sign}{fi.numerator}/{fi.denominator} in"
        return f"{sign}{fi.inches}{frac} in"
    a = abs(length_m)
    if a < 1.0:
        return f"{length_m * 1000:.1f} mm" if a < 0.1 else f"{length_m * 1000:.0f} mm"
    if a < 1000.0:
        return f"{length_m:.3f} m"
    return f"{length_m / 1000:.4f} km"


class UncertainLength(NamedTuple):
    """A distance shown to the precision its uncertainty supports (:func:`uncertain_length`):
    ``str()`` gives ``"24.2 m +/- 0.8 m"``."""

    value: str  # the distance, rounded to the step
    plus_minus: str  # the half-width of the range, rounded up to the step ("" without one)
    low: str  # the range's ends, rounded outwards to the step
    high: str

    def __str__(self) -> str:
        return f"{self.value} +/- {self.plus_minus}" if self.plus_minus else self.value

    @property
    def span(self) -> str:
        """The range as ``"23.5 m to 25.0 m"``."""
        return f"{self.low} to {self.high}"


#: Steps for imperial distances, in inches (those finer than the tape fraction are skipped).
_INCH_STEPS = (1 / 32, 1 / 16, 1 / 8, 1 / 4, 1 / 2, 1, 2, 3, 6, 12, 24, 36, 60, 120)


def _metric_step(limit_m: float) -> float:
    """The smallest step of 1, 2 or 5 times a power of ten that is at least ``limit_m``."""
    power = 10.0 ** math.floor(math.log10(limit_m))
    return next(m * power for m in (1, 2, 5, 10) if m * power >= limit_m * (1 - 1e-9))


def uncertain_length(distance_m: float, low_m: float | None, high_m: float | None,
                     units: str = "metric", fraction: int = 16) -> UncertainLength:
    """A distance with its range (``low_m`` to ``high_m``, e.g. from the VF tolerance) shown
    no finer than the range allows: rounded to a step of at least a tenth of the +/- half
    width (1, 2 or 5 times a power of ten in metric; a tape fraction, inches, feet in
    imperial), the +/- rounded up and the range's ends outwards to that step. Without a
    range the distance is shown in full (:func:`length`)."""
    half = None
    if None not in (low_m, high_m) and all(math.isfinite(v) for v in (distance_m, low_m, high_m)):
        half = max(distance_m - low_m, high_m - distance_m)
    if not half or half <= 0:
        return UncertainLength(length(distance_m, units, fraction), "",
                               length(low_m, units, fraction), length(high_m, units, fraction))
    if units == "imperial":
        inches = half / 0.0254 / 10
        usable = [s for s in _INCH_STEPS if s >= 1 / fraction]
        step_in = next((s for s in usable if s >= inches * (1 - 1e-9)), None)
        if step_in is None:  # beyond ten feet a step: whole multiples of 10 ft
            step_in = 120 * math.ceil(inches / 120)
        step = step_in * 0.0254

        def shown(v: float) -> str:
            return length(v, units, fraction)
    else:
        step = _metric_step(half / 10)
        a = abs(distance_m)
        scale, unit = (1e-3, "mm") if a < 1.0 else (1.0, "m") if a < 1000.0 else (1e3, "km")
        decimals = max(0, math.ceil(-math.log10(step / scale) - 1e-9))

        def shown(v: float) -> str:
            return f"{v / scale:.{decimals}f} {unit}"
    return UncertainLength(shown(round(distance_m / step) * step),
                           shown(math.ceil(half / step * (1 - 1e-12)) * step),
                           shown(math.floor(low_m / step * (1 + 1e-12)) * step),
                           shown(math.ceil(high_m / step * (1 - 1e-12)) * step))


def length_mm(length_m: float) -> str:
    """Millimetres to the nearest millimetre, as a cut list wants."""
    return f"{length_m * 1000:.0f} mm"


def _scaled(value: float, unit: str, steps: tuple[tuple[float, str], ...], digits: int = 4) -> str:
    if value is None or not math.isfinite(value):
        return "-"
    a = abs(value)
    for scale, prefix in steps:
        if a >= scale:
            return f"{value / scale:.{digits}g} {prefix}{unit}"
    scale, prefix = steps[-1]
    return f"{value / scale:.{digits}g} {prefix}{unit}"


def time(t_s: float, digits: int = 4) -> str:
    return _scaled(t_s, "s", ((1.0, ""), (1e-3, "m"), (1e-6, "u"), (1e-9, "n"), (1e-12, "p")), digits)


def frequency(f_hz: float, digits: int = 6) -> str:
    return _scaled(f_hz, "Hz", ((1e9, "G"), (1e6, "M"), (1e3, "k"), (1.0, "")), digits)


def impedance(z_ohm: float | complex, digits: int = 4) -> str:
    if isinstance(z_ohm, complex):
        if not (math.isfinite(z_ohm.real) and math.isfinite(z_ohm.imag)):
            return "open (infinite)"
        sign = "+" if z_ohm.imag >= 0 else "-"
        return f"{z_ohm.real:.{digits}g} {sign} j{abs(z_ohm.imag):.{digits}g} ohm"
    if not math.isfinite(z_ohm):
        return "open (infinite)"
    return f"{z_ohm:.{digits}g} ohm"


def decibels(db: float) -> str:
    return "infinite (no reflection)" if not math.isfinite(db) else f"{db:.2f} dB"


def vf(x: float, digits: int = 3) -> str:
    """A velocity factor: ``"0.660"`` (a catalog or stated one); a measured or
    derived one carries ``digits=4`` (``"0.6605"``)."""
    return "-" if x is None or not math.isfinite(x) else f"{x:.{digits}f}"


def percent(fraction: float) -> str:
    """A relative figure as a percentage, three significant digits at most:
    0.03 -> ``"3 %"``, 0.025 -> ``"2.5 %"``, 0.00816 -> ``"0.816 %"``."""
    return "-" if fraction is None or not math.isfinite(fraction) else f"{fraction * 100:.3g} %"


def ratio(x: float, digits: int = 4) -> str:
    return "infinite" if not math.isfinite(x) else f"{x:.{digits}g}"


def json_ready(obj):
    """Make ``obj`` JSON-serialisable: numpy scalars/arrays to Python, inf/nan to None."""
    import dataclasses

    if dataclasses.is_dataclass(obj) and not isinstance(obj, type):
        obj = {f.name: getattr(obj, f.name) for f in dataclasses.fields(obj)}
    if isinstance(obj, dict):
        return {str(k): json_ready(v) for k, v in obj.items()}
    if isinstance(obj, list | tuple):
        return [json_ready(v) for v in obj]
    if hasattr(obj, "tolist") and hasattr(obj, "dtype"):  # numpy array or scalar
        return json_ready(obj.tolist())
    if isinstance(obj, bool) or obj is None or isinstance(obj, str | int):
        return obj
    if isinstance(obj, float):
        return obj if math.isfinite(obj) else None
    if isinstance(obj, complex):
        return {"real": json_ready(obj.real), "imag": json_ready(obj.imag)}
    return str(obj)


# -- values by their JSON key (job-log reports and entry views) ------------------------------

_ACRONYMS = {"vf": "VF", "vswr": "VSWR", "nvp": "NVP", "eps": "eps", "rf": "RF", "dc": "DC"}
_UNIT_SUFFIXES = ("m", "s", "hz", "ohm", "db", "percent", "deg")


def key_unit(key: str) -> tuple[str, str]:
    """Split a snake_case key into its name and SI unit suffix: ``distance_low_m`` ->
    (``distance_low``, ``m``); ``delay_per_length_s_per_m`` -> (``delay_per_length``, ``s/m``)."""
    parts = key.split("_")
    if len(parts) >= 4 and parts[-2] == "per" and parts[-3] in _UNIT_SUFFIXES:
        return "_".join(parts[:-3]), f"{parts[-3]}/{parts[-1]}"
    if len(parts) >= 2 and parts[-1] in _UNIT_SUFFIXES:
        return "_".join(parts[:-1]), parts[-1]
    return key, ""


def key_label(key: str) -> str:
    """A JSON key as words for people: ``distance_low_m`` -> ``distance low``."""
    name, _unit = key_unit(key)
    return " ".join(_ACRONYMS.get(w, w) for w in name.split("_") if w) or key


def by_key(key: str, value, units: str = "metric", fraction: int = 16) -> str:
    """A JSON scalar shown for people, formatted by its key's SI suffix."""
    if value is None:
        return "-"
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, str):
        return value
    if isinstance(value, dict) and set(value) == {"real", "imag"}:
        value = complex(value["real"] or 0.0, value["imag"] or 0.0)
    if not isinstance(value, int | float | complex):
        return str(value)
    name, unit = key_unit(key)
    if isinstance(value, complex):
        return impedance(value) if unit == "ohm" else f"{value.real:.6g} {value.imag:+.6g}j"
    if isinstance(value, int) and not unit:
        return str(value)
    value = float(value)
    if name.split("_")[0] == "vswr" and not unit:
        return vswr(value)
    shown = {
        "m": lambda v: length(v, units, fraction),
        "s": time,
        "hz": frequency,
        "ohm": impedance,
        "db": decibels,
        "percent": lambda v: f"{v:.4g} %",
        "deg": lambda v: f"{v:.4g} deg",
    }.get(unit)
    if shown is not None:
        return shown(value)
    text = f"{value:.6g}" if math.isfinite(value) else "infinite"
    return f"{text} {unit}" if unit else text


def other_units(units: str) -> str:
    """The unit system that is not ``units``."""
    return "imperial" if units == "metric" else "metric"


def length_both(length_m: float, units: str = "metric", fraction: int = 16) -> str:
    """A length in both systems, the preferred one first: ``"339 mm (1 ft 1-5/16 in)"``."""
    return f"{length(length_m, units, fraction)} ({length(length_m, other_units(units), fraction)})"


def degrees(deg: float, digits: int = 2) -> str:
    """An electrical length: ``"90.00 deg (0.2500 wl)"``."""
    if deg is None or not math.isfinite(deg):
        return "-"
    return f"{deg:.{digits}f} deg ({deg / 360.0:.4f} wl)"


def table(rows: list[tuple[str, ...]], right: tuple[int, ...] = (),
          max_width: int = 80) -> list[str]:
    """Rows of text as aligned columns (``right``: right-aligned columns), two spaces
    apart, or one where two would pass ``max_width``."""
    widths = [max(len(r[i]) for r in rows) for i in range(len(rows[0]))]
    gap = 2 if sum(widths) + 2 * (len(widths) - 1) <= max_width else 1
    out = []
    for r in rows:
        cells = [v.rjust(w) if i in right else v.ljust(w)
                 for i, (v, w) in enumerate(zip(r, widths, strict=True))]
        out.append((" " * gap).join(cells).rstrip())
    return out


def vswr(x: float) -> str:
    """A VSWR to two decimals (``"1.13"``), ``"infinite"`` for a total reflection."""
    return "infinite" if x is None or not math.isfinite(x) else f"{x:.2f}"


def text_plot(x, y, width: int = 72, height: int = 11, x_label=None) -> list[str]:
    """A trace as plain text lines: ``height`` rows of ``width`` columns, a level axis
    on the left and ``x_label(value)`` under the ends and the middle of the x axis.

    Each column shows the range of levels that fall in it, so a step shows as
    a vertical run and nothing between samples is lost.
    """
    import numpy as np

    x = np.asarray(x, dtype=float)
    y = np.asarray(y, dtype=float)
    lo, hi = min(float(np.min(y)), 0.0), max(float(np.max(y)), 0.0)
    pad = max(0.05 * (hi - lo), 0.01)
    lo, hi = lo - pad, hi + pad
    cols = np.clip(((x - x[0]) / max(x[-1] - x[0], 1e-300) * (width - 1)).astype(int), 0,
                   width - 1)
    top = np.full(width, -np.inf)
    bottom = np.full(width, np.inf)
    np.maximum.at(top, cols, y)
    np.minimum.at(bottom, cols, y)
    row = lambda v: int(round((hi - v) / (hi - lo) * (height - 1)))  # noqa: E731
    grid = [[" "] * width for _ in range(height)]
    zero = row(0.0)
    grid[zero] = ["-"] * width
    for c in range(width):
        if np.isfinite(top[c]):
            for r in range(row(top[c]), row(bottom[c]) + 1):
                grid[r][c] = "*"
    labels = {0: f"{hi:+.2f}", height - 1: f"{lo:+.2f}"}
    labels[zero] = "0"
    lines = [f"{labels.get(r, ''):>6} |" + "".join(grid[r]) for r in range(height)]
    if x_label is not None:
        left, mid, right = x_label(x[0]), x_label(0.5 * (x[0] + x[-1])), x_label(x[-1])
        gap = max(1, (width - len(left) - len(mid) - len(right)) // 2)
        lines.append(" " * 8 + left + " " * gap + mid + " " * gap + right)
    return lines


def component(value: float, unit: str, digits: int = 3) -> str:
    """An inductance (``"H"``) or capacitance (``"F"``) with an SI prefix: ``"6.1 nH"``."""
    return _scaled(value, unit, ((1.0, ""), (1e-3, "m"), (1e-6, "u"), (1e-9, "n"),
                                 (1e-12, "p"), (1e-15, "f")), digits)


def wrapped(line: str, indent: int = 19, width: int = 79) -> list[str]:
    """One line of text folded to ``width`` columns, later lines indented by ``indent``."""
    import textwrap

    return textwrap.wrap(line, width=width, subsequent_indent=" " * indent) or [""]


def event_distance(e, units: str = "metric", fraction: int = 16,
                   distance_m: float | None = None) -> UncertainLength:
    """An event's distance (or ``distance_m``, a position on the same reading such as its
    offset into a segment) to the precision its range allows (:func:`uncertain_length`)."""
    d = e.distance_m if distance_m is None else distance_m
    if e.distance_low_m is None or e.distance_high_m is None:
        return uncertain_length(d, None, None, units, fraction)
    return uncertain_length(d, d - (e.distance_m - e.distance_low_m),
                            d + (e.distance_high_m - e.distance_m), units, fraction)


def event_place(e, units: str = "metric", fraction: int = 16) -> str:
    """Where a found trace event lies (a :class:`calc.events.Event`, placed): its
    distance with its range, the segment or joint, or past the end; "" if it was not
    placed. The second line of an event in ``halftrip trace`` and the Trace panel's
    detail."""
    if e.distance_m is None:
        return ""
    if e.beyond_end:
        return "past the far end of the described run" + \
            (" (at the end, within the cables' tolerance)" if e.at_far_end else "")
    parts = []
    shown = event_distance(e, units, fraction)
    if shown.plus_minus:
        parts.append(f"{shown} ({shown.span})")
    if e.joint_index is not None:
        parts.append(f"at or near the joint of segments {e.joint_index + 1} and "
                     f"{e.joint_index + 2}")
    elif e.segment_index is not None:
        offset = event_distance(e, units, fraction, e.offset_in_segment_m).value
        parts.append(f"segment {e.segment_index + 1} ({e.cable_id}), {offset} into it")
    if e.at_far_end:
        parts.append("at the far end")
    if e.loss_delay_s > 0:
        parts.append(f"placed {time(e.loss_delay_s, 3)} earlier for the loss's slower edge")
    return "; ".join(parts)
