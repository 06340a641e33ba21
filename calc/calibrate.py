"""Measuring a cable's velocity factor, with the uncertainty the inputs carry.

Three methods, all on plain SI floats:

* :func:`vf_from_delay`: a piece of known length, far end open (or shorted),
  and the round-trip delay of its far-end reflection:
  :math:`VF = 2 L / (c_0 t)`.
* :func:`vf_from_reel`: the same measurement on a whole reel, whose length
  is the one printed on the reel rather than one measured with a tape, so it
  carries a larger default length tolerance.
* :func:`vf_from_stub`: the resonance of a cut stub, read as the frequency of
  its *low-impedance* resonance (see :func:`quarter_waves`).

Uncertainty. Each method takes the length tolerance ``length_tolerance_m``
(absolute, metres) and the reading's resolution (``delay_resolution_s`` or
``frequency_resolution_hz``, absolute) and reports the worst-case interval
``[vf_low, vf_high]``: every input pushed to the end of its own interval in
the direction that moves VF the same way. Worst case rather than root-sum-
square, because two inputs are few and a field user prefers a bound to a
statistic. ``vf_high`` is capped at 1 (nothing travels faster than light).

Defaults when the user gives none (assumptions of ours, not published
figures; give your own instrument's and tape's figures when you know them):

* :data:`DEFAULT_LENGTH_TOLERANCE`: 0.5 % of a length measured with a tape;
* :data:`DEFAULT_REEL_LENGTH_TOLERANCE`: 2 % of a length printed on a reel;
* :data:`DEFAULT_DELAY_RESOLUTION_S`: 1 ns, about what a scope reading of a
  step edge is good to;
* :data:`DEFAULT_FREQUENCY_RESOLUTION`: 0.5 % of the frequency, about how
  well the bottom of a resonance dip can be read on a sweep.
"""

from __future__ import annotations

from dataclasses import dataclass

from calc.constants import C0_M_PER_S
from calc.errors import InputError
from calc.locate import check_positive, check_vf, faster_than_light
from calc.velocity import VF_MIN

DEFAULT_LENGTH_TOLERANCE = 0.005  # relative, of a length measured with a tape
DEFAULT_REEL_LENGTH_TOLERANCE = 0.02  # relative, of a length printed on a reel
DEFAULT_DELAY_RESOLUTION_S = 1e-9
DEFAULT_FREQUENCY_RESOLUTION = 0.005  # relative
STUB_ENDS = ("open", "short")
MAX_ORDER = 50


@dataclass(frozen=True)
class Calibration:
    """A measured velocity factor with its worst-case interval.

    ``method`` is ``"known-length"``, ``"reel"``, ``"stub-open"`` or
    ``"stub-short"``. Fields that do not apply to the method are None.
    """

    method: str
    vf: float
    vf_low: float
    vf_high: float
    length_m: float
    length_tolerance_m: float
    delay_s: float | None = None
    delay_resolution_s: float | None = None
    frequency_hz: float | None = None
    frequency_resolution_hz: float | None = None
    end: str | None = None
    order: int | None = None
    quarter_waves: int | None = None

    @property
    def vf_tolerance(self) -> float:
        """The interval as one relative tolerance: the larger side, ``max(hi/vf - 1, 1 - lo/vf)``."""
        return max(self.vf_high / self.vf - 1.0, 1.0 - self.vf_low / self.vf)


def _check_resolution(value: float, field: str, example: str) -> float:
    """A tolerance or resolution: finite and zero or more."""
    if value == 0.0:
        return 0.0
    if isinstance(value, int | float) and not isinstance(value, bool) and value < 0.0:
        raise InputError(field, f"{value:g} must be zero or more", example)
    return check_positive(value, field, example)


def _checked_length(length_m: float, length_tolerance_m: float) -> tuple[float, float]:
    length_m = check_positive(length_m, "--length", "10 m")
    tol = _check_resolution(length_tolerance_m, "--length-tolerance", "1 cm")
    if tol >= length_m:
        raise InputError("--length-tolerance", f"{tol:g} m is not smaller than the length "
                                               f"{length_m:g} m", "1 cm")
    return length_m, tol


def _at_most_light(vf: float, field: str, hint: str) -> float:
    """``vf``, or :class:`InputError` if it is faster than light (beyond float rounding)
    or slower than :data:`calc.velocity.VF_MIN`."""
    if faster_than_light(vf):
        raise InputError(field, f"these readings give VF {vf:.4g}, faster than light; {hint}")
    if vf < VF_MIN:
        raise InputError(field, f"these readings give VF {vf:.4g}, below {VF_MIN:g}, slower "
                                "than any cable; check the length and the reading")
    return min(vf, 1.0)


def vf_from_delay(length_m: float, delay_s: float, length_tolerance_m: float | None = None,
                  delay_resolution_s: float = DEFAULT_DELAY_RESOLUTION_S,
                  method: str = "known-length") -> Calibration:
    """VF of a piece of known length from the round-trip delay of its far end.

    .. math::

        VF = \\frac{2 L}{c_0 t}, \\quad
        VF_{lo} = \\frac{2 (L - \\delta L)}{c_0 (t + \\delta t)}, \\quad
        VF_{hi} = \\min\\left(\\frac{2 (L + \\delta L)}{c_0 (t - \\delta t)}, 1\\right)

    ``length_tolerance_m`` (``delta L``) defaults to
    :data:`DEFAULT_LENGTH_TOLERANCE` of the length; ``delay_resolution_s``
    (``delta t``) must be smaller than the delay.
    """
    if length_tolerance_m is None:
        length_tolerance_m = DEFAULT_LENGTH_TOLERANCE * abs(length_m)
    length_m, d_len = _checked_length(length_m, length_tolerance_m)
    delay_s = check_positive(delay_s, "--delay", "101 ns")
    d_t = _check_resolution(delay_resolution_s, "--delay-resolution", "0.5 ns")
    if d_t >= delay_s:
        raise InputError("--delay-resolution", f"{d_t:g} s is not smaller than the delay "
                                               f"{delay_s:g} s", "0.5 ns")
    vf = _at_most_light(2.0 * length_m / (C0_M_PER_S * delay_s), "--delay",
                        "check the length and that the delay is round-trip (out and back)")
    return Calibration(
        method=method,
        vf=vf,
        vf_low=2.0 * (length_m - d_len) / (C0_M_PER_S * (delay_s + d_t)),
        vf_high=min(2.0 * (length_m + d_len) / (C0_M_PER_S * (delay_s - d_t)), 1.0),
        length_m=length_m,
        length_tolerance_m=d_len,
        delay_s=delay_s,
        delay_resolution_s=d_t,
    )


def vf_from_reel(length_m: float, delay_s: float, length_tolerance_m: float | None = None,
                 delay_resolution_s: float = DEFAULT_DELAY_RESOLUTION_S) -> Calibration:
    """VF of a whole reel from its printed length and the far end's round-trip delay.

    The same relation as :func:`vf_from_delay` (:math:`VF = 2L/(c_0 t)`), with
    the length the one printed on the reel: its tolerance defaults to
    :data:`DEFAULT_REEL_LENGTH_TOLERANCE` of the length, and ``method`` is
    ``"reel"``. A long reel gives a long delay, so the reading's resolution
    matters little; the printed length is what limits the result.
    """
    if length_tolerance_m is None:
        length_tolerance_m = DEFAULT_REEL_LENGTH_TOLERANCE * abs(length_m)
    return vf_from_delay(length_m, delay_s, length_tolerance_m, delay_resolution_s,
                         method="reel")


def quarter_waves(end: str, order: int) -> int:
    """How many quarter waves long a stub is at its ``order``-th low-impedance resonance.

    The stub is read at its input, and the resonance the user reads is the
    **low-impedance** one: a dip of ``|Z_in|`` on an analyser, or the null
    of a signal passing a T connector with the stub hanging off it.

    * open end: :math:`Z_{in} = -j Z_0 \\cot\\beta\\ell` is low where the stub
      is an odd number of quarter waves: ``2 order - 1`` (1, 3, 5, ...);
    * shorted end: :math:`Z_{in} = j Z_0 \\tan\\beta\\ell` is low where the
      stub is a whole number of half waves: ``2 order`` (2, 4, 6, ...; the
      low impedance at 0 Hz does not count).

    (Any transmission-line text, e.g. Pozar, *Microwave Engineering*, ch. 2,
    the terminated lossless line.)
    """
    if end not in STUB_ENDS:
        raise InputError("--end", f"{end!r} is not one of {', '.join(STUB_ENDS)}", "open")
    if isinstance(order, bool) or not isinstance(order, int) or not 1 <= order <= MAX_ORDER:
        raise InputError("--order", f"{order!r} must be a whole number from 1 to {MAX_ORDER}", "1")
    return 2 * order - 1 if end == "open" else 2 * order


def _order_hint(vf_one_quarter_wave: float, end: str, order: int) -> str:
    """Which higher order (or, for an open end, a shorted end) would make sense of a
    resonance read as ``order``."""
    hints = []
    if end == "open":
        vf = vf_one_quarter_wave / quarter_waves("short", order)
        if vf <= 1.0:
            hints.append(f"is the far end shorted? (--end short gives VF {vf:.4g})")
    for n in range(order + 1, MAX_ORDER + 1):
        vf = vf_one_quarter_wave / quarter_waves(end, n)
        if vf <= 1.0:
            hints.append(f"is it a higher resonance? (--order {n} gives VF {vf:.4g})")
            break
    return "; ".join(hints) or "check the length and the frequency"


def vf_from_stub(length_m: float, frequency_hz: float, end: str = "open", order: int = 1,
                 length_tolerance_m: float | None = None,
                 frequency_resolution_hz: float | None = None) -> Calibration:
    """VF of a cut stub from the frequency of its ``order``-th low-impedance resonance.

    With ``m`` = :func:`quarter_waves` (``2n - 1`` open, ``2n`` shorted), the
    stub is ``m`` quarter waves long at ``f``: :math:`L = m\\,VF\\,c_0 / (4 f)`, so

    .. math::

        VF = \\frac{4 L f}{m\\,c_0}, \\quad
        VF_{lo} = \\frac{4 (L - \\delta L)(f - \\delta f)}{m\\,c_0}, \\quad
        VF_{hi} = \\min\\left(\\frac{4 (L + \\delta L)(f + \\delta f)}{m\\,c_0}, 1\\right)

    ``L`` runs from the plane where the impedance is read (the connector's
    reference plane) to the cut end. An open end's fringing field makes the
    stub electrically a little longer than cut (common practice: cut it
    square, no strands left), so the VF comes out a little low.
    ``frequency_resolution_hz`` defaults to
    :data:`DEFAULT_FREQUENCY_RESOLUTION` of the frequency.
    """
    m = quarter_waves(end, order)
    if length_tolerance_m is None:
        length_tolerance_m = DEFAULT_LENGTH_TOLERANCE * abs(length_m)
    length_m, d_len = _checked_length(length_m, length_tolerance_m)
    frequency_hz = check_positive(frequency_hz, "--resonance", "24.7 MHz")
    if frequency_resolution_hz is None:
        frequency_resolution_hz = DEFAULT_FREQUENCY_RESOLUTION * frequency_hz
    d_f = _check_resolution(frequency_resolution_hz, "--frequency-resolution", "50 kHz")
    if d_f >= frequency_hz:
        raise InputError("--frequency-resolution", f"{d_f:g} Hz is not smaller than the "
                                                   f"resonance {frequency_hz:g} Hz", "50 kHz")
    vf = 4.0 * length_m * frequency_hz / (m * C0_M_PER_S)
    vf = _at_most_light(vf, "--resonance", _order_hint(vf * m, end, order) if vf > 1.0 else "")
    return Calibration(
        method=f"stub-{end}",
        vf=vf,
        vf_low=4.0 * (length_m - d_len) * (frequency_hz - d_f) / (m * C0_M_PER_S),
        vf_high=min(4.0 * (length_m + d_len) * (frequency_hz + d_f) / (m * C0_M_PER_S), 1.0),
        length_m=length_m,
        length_tolerance_m=d_len,
        frequency_hz=frequency_hz,
        frequency_resolution_hz=d_f,
        end=end,
        order=order,
        quarter_waves=m,
    )


def stub_resonance_hz(length_m: float, vf: float, end: str = "open", order: int = 1) -> float:
    """The reverse of :func:`vf_from_stub`: where a stub of ``vf`` shows its resonance.

    .. math:: f = \\frac{m\\,VF\\,c_0}{4 L}
    """
    m = quarter_waves(end, order)
    length_m = check_positive(length_m, "--length", "10 m")
    vf = check_vf(vf)
    return m * vf * C0_M_PER_S / (4.0 * length_m)
