"""The reference library's view of a run: scikit-rf building and transforming it.

Used by the echo tests (test_loads, test_simulate) to check halftrip's core
against an independent general-purpose RF library computing the same network:
DefinedGammaZ0 media with the same propagation constant, ``line``,
``resistor``/``inductor``/``shunt_capacitor`` and terminations cascaded with
``**``, and ``Network.step_response`` with the 0 Hz point in the grid.
"""

from __future__ import annotations

import warnings

import numpy as np
import skrf as rf
from skrf.media import DefinedGammaZ0

from calc.cable import causal_propagation_constant
from calc.simulate import RISE_PER_SIGMA

#: Terminations in scikit-rf's own elements; ``m`` is a media of the port impedance.
TERMINATIONS = {
    "open": lambda m: m.open(),
    "short": lambda m: m.short(),
    "75 ohm": lambda m: m.resistor(75.0) ** m.short(),
    "25 ohm": lambda m: m.resistor(25.0) ** m.short(),
    "20 pF": lambda m: m.shunt_capacitor(20e-12) ** m.open(),
    "100 nH": lambda m: m.inductor(100e-9) ** m.short(),
    "75 ohm || 10 pF": lambda m: m.shunt_capacitor(10e-12) ** m.resistor(75.0) ** m.short(),
    "50 ohm + 30 nH": lambda m: m.inductor(30e-9) ** m.resistor(50.0) ** m.short(),
}


def network(segments, lumps, termination: str, f: np.ndarray, source_z: float):
    """The run as a scikit-rf one-port referenced to ``source_z``."""
    freq = rf.Frequency.from_f(f, unit="hz")
    port = DefinedGammaZ0(frequency=freq, z0_port=source_z, z0=source_z, gamma=1j * f)
    with warnings.catch_warnings():  # scikit-rf warns about the 0 Hz point; it is meant
        warnings.simplefilter("ignore")
        net = None
        for i, seg in enumerate(segments):
            gamma = causal_propagation_constant(f, seg.vf, seg.atten_k1, seg.atten_k2)
            media = DefinedGammaZ0(frequency=freq, z0_port=source_z, z0=seg.z0_ohm, gamma=gamma)
            piece = media.line(seg.length_m, "m")
            net = piece if net is None else net ** piece
            for lump in lumps:
                if lump.after_segment == i:
                    element = {"series_r": port.resistor, "series_l": port.inductor,
                               "shunt_c": port.shunt_capacitor}[lump.kind](lump.value)
                    net = net ** element
        return net ** TERMINATIONS[termination](port)


def step(prediction, segments, lumps, termination: str, periods: int = 64, oversample: int = 8
         ) -> np.ndarray:
    """scikit-rf's step response of the same run and instrument, at the prediction's times.

    The grid: 0 Hz to the prediction's Nyquist frequency, ``periods`` times
    finer than the prediction's frequency step (a longer window), with the
    instrument's Gaussian edge and pre-trigger delay applied to the network's
    s11. ``step_response`` integrates with the trapezoid rule, so its spectrum
    is zero-padded ``oversample`` times to sample it finely. It integrates
    from -T/2, through the stretch where the skin-effect creep beyond its
    window has folded back, so its level where nothing has arrived yet
    (the prediction's first sample) is taken as its baseline.
    """
    t_pre = -prediction.time_s[0]
    dt = prediction.time_s[1] - prediction.time_s[0]
    df = prediction.frequency_step_hz / periods
    m = int(round(0.5 / dt / df)) + 1
    f = np.arange(m) * df
    one = network(segments, lumps, termination, f, prediction.source_z_ohm)
    sigma = prediction.rise_time_s / RISE_PER_SIGMA
    edge = np.exp(-2.0 * (np.pi * sigma * f) ** 2 - 2j * np.pi * f * t_pre)
    if prediction.pulse_width_s:
        edge = edge * (1.0 - np.exp(-2j * np.pi * f * prediction.pulse_width_s))
    one.s = one.s * edge[:, None, None]
    t, y = one.step_response(window=None, pad=(oversample - 1) * m)
    y = np.interp(prediction.time_s + t_pre, t, y.real)
    return y - y[0]
