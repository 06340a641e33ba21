"""One-port sweep -> reflection trace in time: the distance view of a network
analyser, done in the low-pass (step) mode.

Steps, each a plain numpy operation:

1. **Band.** Keep the points inside the chosen band (all of them by default).
2. **Harmonic grid.** The inverse transform needs points at f_k = k df,
   k = 0 .. K. A sweep that is uniform with a first point on that grid (the
   usual "low-pass" set-up) is used as it stands. Any other sweep is
   interpolated linearly in real and imaginary parts onto
   df = f_max / ceil(f_max / median step); this smears fine detail, so the
   result says so.
3. **DC and the gap below the first point.** A measured 0 Hz point is used
   (its real part). Otherwise S11(0) is extrapolated: the lowest points'
   magnitude trend (a least-squares line, clipped to [0, 1]) gives its size,
   and their unwrapped-phase trend, taken to the nearest multiple of 180
   degrees at 0 Hz, gives its sign (S11 is real at DC). The points between
   0 Hz and the first measured one are filled linearly in magnitude and in
   unwrapped phase. When the far end's DC state is known (an open is +1, a
   short -1, a resistance R gives (R - Z0)/(R + Z0)) it can be given instead,
   which is better: the DC value sets the level the step settles to.
4. **Window.** The spectrum is multiplied by the upper half of a symmetric
   window centred on 0 Hz, w(f_k) = W(K + 1 + k) for a window W of 2(K+1)+1
   points (``kaiser``, beta 6 by default: sidelobes about 44 dB down; ``hann``
   gives lower sidelobes and a slower edge; ``none`` the sharpest edge and
   the most ringing). The window sets the view's rise time, reported as
   ``rise_time_s`` (10-90 % of the windowed step of a constant reflection),
   and its ripple, ``ringing`` (the largest departure of that step from an
   ideal one, two rise times or more from the edge, as a fraction).
5. **Transform.** The impulse response is the inverse real FFT of the
   windowed spectrum (zero-padded about ``pad`` times for a finer time step,
   to a length the FFT does quickly),
   so that its sum is S11(0); the step response is its running trapezoid
   integral. Time runs from -T/16 to 15 T/16 where T = 1/df is the longest
   round trip the sweep shows without wrap-around.

.. math::

    h[n] = \\frac{1}{N}\\sum_{k} w_k S_{11}(k\\,\\Delta f)\\,e^{j2\\pi kn/N}
    \\text{ (Hermitian)},\\qquad s(t) = \\int_{-\\infty}^{t} h

scikit-rf's ``Network.impulse_response`` / ``step_response`` perform the
same low-pass transform and are the tests' reference.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from calc.errors import InputError

WINDOWS = ("kaiser", "hann", "none")
DEFAULT_KAISER_BETA = 6.0
DEFAULT_PAD = 4
#: Largest transform, in time points (memory guard).
MAX_POINTS = 1 << 23
#: Lowest points used for the DC extrapolation.
DC_FIT_POINTS = 8
#: Fraction of the alias-free span shown before t = 0.
PRE_FRACTION = 1.0 / 16.0


@dataclass(frozen=True, eq=False)
class TimeDomain:
    """A sweep seen in time. ``step`` is the reflection step response (rho)."""

    time_s: np.ndarray
    step: np.ndarray
    impulse: np.ndarray
    frequency_step_hz: float
    band_low_hz: float  # lowest measured frequency used
    band_high_hz: float  # highest frequency used
    window: str
    kaiser_beta: float | None
    rise_time_s: float
    ringing: float  # largest ripple of the window's own step, as a fraction of the step
    alias_free_s: float
    dc_value: float
    dc_source: str  # "measured", "extrapolated" or "given"
    resampled: bool
    notes: tuple[str, ...] = ()


def window_weights(name: str, n: int, kaiser_beta: float = DEFAULT_KAISER_BETA) -> np.ndarray:
    """Upper half (from the centre) of a symmetric window of 2n+1 points: n weights."""
    if name == "kaiser":
        return np.kaiser(2 * n + 1, kaiser_beta)[n:2 * n]
    if name == "hann":
        return np.hanning(2 * n + 1)[n:2 * n]
    if name == "none":
        return np.ones(n)
    raise InputError("--window", f"unknown window {name!r}; one of {', '.join(WINDOWS)}",
                     "kaiser")


def _harmonic(f: np.ndarray) -> tuple[float, int] | None:
    """(df, k0) when f is uniform with f[0] = k0 df; else None."""
    if f.size < 2:
        return None
    steps = np.diff(f)
    df = float(np.median(steps))
    if df <= 0 or np.max(np.abs(steps - df)) > 1e-6 * df:
        return None
    k0 = f[0] / df
    if abs(k0 - round(k0)) > 1e-3:
        return None
    return df, int(round(k0))


def _dc_fill(f_low: np.ndarray, s_low: np.ndarray, f_gap: np.ndarray,
             dc_value: float | None) -> tuple[float, np.ndarray, list[str]]:
    """S11 at 0 Hz and at ``f_gap`` (below the first point) from the lowest points."""
    notes: list[str] = []
    phase = np.unwrap(np.angle(s_low))
    mag = np.abs(s_low)
    if f_low.size >= 2:
        slope, phase0 = np.polyfit(f_low, phase, 1)
        mag_slope, mag0 = np.polyfit(f_low, mag, 1)
        if np.max(np.abs(np.diff(phase))) > 0.75 * math.pi:
            notes.append("the phase turns by more than 135 degrees between the lowest points: "
                         "the sweep is too coarse for the run and the DC estimate is uncertain")
    else:
        phase0, mag0 = float(phase[0]), float(mag[0])
    if dc_value is None:
        mag_dc = float(np.clip(mag0, 0.0, 1.0))
        phase_dc = math.pi * round(phase0 / math.pi)
        dc = mag_dc * math.cos(phase_dc)
    else:
        dc = float(dc_value)
        mag_dc = abs(dc)
        parity = 0 if dc >= 0 else 1  # even or odd multiple of pi
        k = round((phase0 / math.pi - parity) / 2.0)
        phase_dc = math.pi * (2 * k + parity)
    f1, p1, m1 = f_low[0], phase[0], mag[0]
    frac = f_gap / f1
    gap = (mag_dc + (m1 - mag_dc) * frac) * np.exp(1j * (phase_dc + (p1 - phase_dc) * frac))
    return dc, gap, notes


def time_domain(frequency_hz: np.ndarray, s11: np.ndarray, *, window: str = "kaiser",
                kaiser_beta: float = DEFAULT_KAISER_BETA,
                band_hz: tuple[float | None, float | None] = (None, None),
                dc_value: float | None = None, pad: int = DEFAULT_PAD) -> TimeDomain:
    """The reflection step and impulse responses of a one-port sweep (see module doc).

    ``band_hz`` = (low, high) limits the points used (None: no limit);
    ``dc_value`` is S11 at 0 Hz when known (+1 open, -1 short).
    """
    f_all = np.asarray(frequency_hz, dtype=float)
    s_all = np.asarray(s11, dtype=complex)
    lo, hi = band_hz
    keep = np.ones(f_all.size, dtype=bool)
    if lo is not None:
        keep &= f_all >= lo
    if hi is not None:
        keep &= f_all <= hi
    f, s = f_all[keep], s_all[keep]
    if f.size < 2:
        raise InputError("--band", f"{f.size} sweep point(s) inside the band; at least 2 needed",
                         "1 MHz..500 MHz")
    if dc_value is not None and not (math.isfinite(dc_value) and -1.0 <= dc_value <= 1.0):
        raise InputError("--dc", "the DC reflection must lie between -1 and +1", "open")
    if not (math.isfinite(kaiser_beta) and 0 <= kaiser_beta <= 50):
        raise InputError("--kaiser-beta", "beta must lie between 0 and 50", "6")
    if not (isinstance(pad, int) and 1 <= pad <= 64):
        raise InputError("--pad", "pad must be a whole number from 1 to 64", "4")
    notes: list[str] = []
    grid = _harmonic(f)
    resampled = grid is None
    if grid is None:
        df_data = float(np.median(np.diff(f)))
        k_max = int(math.ceil(f[-1] / df_data))
        df = f[-1] / k_max
        k_first = int(math.ceil(f[0] / df - 1e-9))
        fk = np.arange(k_first, k_max + 1) * df
        s_band = np.interp(fk, f, s.real) + 1j * np.interp(fk, f, s.imag)
        notes.append("the sweep is not on a uniform grid from 0 Hz; it was interpolated, "
                     "which smears fine detail (sweep from a multiple of the step to avoid this)")
    else:
        df, k_first = grid
        k_max = k_first + f.size - 1
        s_band = s
    m = k_max + 1
    n_time = fft_size(2 * m * pad - 1)
    if n_time > MAX_POINTS:
        raise InputError("--pad", f"the transform would need {n_time} points; at most "
                         f"{MAX_POINTS} (lower --pad or narrow the band)", "2")
    spectrum = np.empty(m, dtype=complex)
    spectrum[k_first:] = s_band
    if k_first == 0:
        dc = float(s_band[0].real)
        dc_source = "measured"
        if dc_value is not None:
            dc, dc_source = float(dc_value), "given"
        spectrum[0] = dc
    else:
        low = slice(0, min(DC_FIT_POINTS, s_band.size))
        f_band = np.arange(k_first, k_max + 1) * df
        dc, gap, dc_notes = _dc_fill(f_band[low], s_band[low], np.arange(1, k_first) * df,
                                     dc_value)
        notes += dc_notes
        spectrum[0] = dc
        spectrum[1:k_first] = gap
        dc_source = "given" if dc_value is not None else "extrapolated"
        if dc_value is None and k_first > 0.05 * m:
            notes.append(f"the sweep starts {k_first} steps above 0 Hz; the slow part of the "
                         "step (the level it settles to) rests on the DC estimate")
    weights = window_weights(window, m, kaiser_beta)
    impulse, time_s, step = _transform(spectrum * weights, n_time, df)
    _imp, _t, window_step = _transform(weights.astype(complex), n_time, df)
    rise = _rise_time(time_s, window_step)
    far = np.abs(time_s) > 2.0 * rise
    ideal = (time_s > 0).astype(float)
    ringing = float(np.max(np.abs(window_step - ideal)[far])) if far.any() else 0.0
    return TimeDomain(
        time_s=time_s, step=step, impulse=impulse, frequency_step_hz=df,
        band_low_hz=float(f[0]), band_high_hz=float(k_max * df), window=window,
        kaiser_beta=kaiser_beta if window == "kaiser" else None, rise_time_s=rise,
        ringing=ringing,
        alias_free_s=1.0 / df, dc_value=dc, dc_source=dc_source, resampled=resampled,
        notes=tuple(notes))


def fft_size(n: int, odd: bool = True) -> int:
    """The smallest 2^a 3^b 5^c 7^d at or above ``n``: a length the FFT does quickly (one
    with a large prime factor can take many times longer). ``odd`` (a = 0), as the
    low-pass transform here uses, like scikit-rf's, so the two share a time grid; the
    run predictor (:mod:`calc.simulate`) takes any such length."""
    n = max(int(n), 1)
    primes = (3, 5, 7) if odd else (2, 3, 5, 7)
    best = None

    def search(value: int, i: int) -> None:
        nonlocal best
        if best is not None and value >= best:
            return
        if value >= n:
            best = value
            return
        if i == len(primes):
            return
        while True:  # every power of this prime, then the next prime's
            search(value, i + 1)
            if value >= n:
                return
            value *= primes[i]

    search(1, 0)
    return best


def _transform(spectrum: np.ndarray, n_time: int, df: float):
    """(impulse, time, step) with the view starting PRE_FRACTION of the span before 0."""
    h = np.fft.irfft(spectrum, n=n_time)
    n_pre = int(round(n_time * PRE_FRACTION))
    h = np.roll(h, n_pre)
    dt = 1.0 / (n_time * df)
    t = (np.arange(n_time) - n_pre) * dt
    step = np.empty_like(h)
    step[0] = 0.0
    np.cumsum(0.5 * (h[1:] + h[:-1]), out=step[1:])
    return h, t, step


def _rise_time(t: np.ndarray, step: np.ndarray) -> float:
    """10-90 % rise time of the window's own step (which settles to 1)."""
    i10 = int(np.argmax(step >= 0.1))
    i90 = int(np.argmax(step >= 0.9))
    return _cross(t, step, i90, 0.9) - _cross(t, step, i10, 0.1)


def _cross(t: np.ndarray, y: np.ndarray, i: int, level: float) -> float:
    """Time where y crosses ``level`` between samples i-1 and i (linear)."""
    if i <= 0:
        return float(t[0])
    y0, y1 = y[i - 1], y[i]
    frac = (level - y0) / (y1 - y0) if y1 != y0 else 0.0
    return float(t[i - 1] + frac * (t[i] - t[i - 1]))
