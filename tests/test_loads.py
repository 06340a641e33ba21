"""calc.loads: terminations, what they return, seen through a line, and backwards.

Every check names its source. Hand-worked numbers are our own, from the
relations in Pozar, *Microwave Engineering*, ch. 2 (reflection coefficient,
return loss, VSWR, mismatch loss, terminated-line input impedance, quarter-wave
transformer), and Hall, Hall and McCall, *High-Speed Digital System Design*,
TDR section (step signatures and their time constants).
"""

from __future__ import annotations

import math
import warnings

import numpy as np
import pytest
import skrf as rf
from skrf.media import DefinedGammaZ0

from calc.cable import Cable, propagation_constant
from calc.errors import InputError
from calc.loads import (
    Load,
    from_observed_step,
    load_impedance,
    load_reflection,
    parse_load,
    seen_through,
    step_levels,
    summarize,
)
from calc.simulate import Segment


# -- parsing -------------------------------------------------------------------
@pytest.mark.parametrize("text, kind, r, l_h, c", [
    ("open", "open", None, None, None),
    ("short", "short", None, None, None),
    ("match", "match", None, None, None),
    ("75 ohm", "resistor", 75.0, None, None),
    ("75", "resistor", 75.0, None, None),
    ("10 pF", "capacitor", None, None, 10e-12),
    ("100 nH", "inductor", None, 100e-9, None),
    ("0.1 uH", "inductor", None, 100e-9, None),
    ("75 ohm + 100 nH", "series", 75.0, 100e-9, None),
    ("75 ohm || 10 pF", "parallel", 75.0, None, 10e-12),
    ("10 ohm + 1 uH + 100 pF", "series", 10.0, 1e-6, 100e-12),
    ("10 pF || 10 pF", "capacitor", None, None, 20e-12),  # capacitors in parallel add
    ("10 pF + 10 pF", "capacitor", None, None, 5e-12),  # in series they halve
])
def test_parse_load_forms(text, kind, r, l_h, c):
    load = parse_load(text)
    assert load.kind == kind
    for got, want in ((load.resistance_ohm, r), (load.inductance_h, l_h),
                      (load.capacitance_f, c)):
        assert (got is None) == (want is None)
        if want is not None:
            assert got == pytest.approx(want, rel=1e-12)


def test_parse_complex_and_line_and_cable():
    assert parse_load("60+40j ohm").impedance_ohm == 60 + 40j
    assert parse_load("line 75 ohm").impedance_ohm == 75
    cable = Cable("rg59", "x", "coax", 75.0, 0.66, 0.03, "test")
    load = parse_load("cable:rg59", lookup={"rg59": cable}.__getitem__)
    assert (load.kind, load.impedance_ohm, load.label) == ("line", 75, "rg59")


def test_spec_round_trips():
    for text in ("open", "75 ohm + 100 nH", "75 ohm || 10 pF", "60+40j ohm", "line 93 ohm"):
        load = parse_load(text)
        assert parse_load(load.spec()) == load


@pytest.mark.parametrize("text", [
    "", "banana", "-10 pF", "0 pF", "-5 ohm", "10 V", "75 ohm || 3 pF + 2 nH", "75 ohm +",
    "-60+40j ohm", "cable:rg59", "line -75 ohm", "1e400 pF",
])
def test_parse_load_refuses(text):
    with pytest.raises(InputError) as exc:
        parse_load(text)
    assert "--load" in str(exc.value)


# -- impedance ------------------------------------------------------------------
def test_impedance_exact_at_dc_and_at_a_frequency():
    f = np.array([0.0, 1e8])
    assert np.isinf(load_impedance(Load.open(), f)).all()
    z_c = load_impedance(Load.capacitor(10e-12), f)
    assert np.isinf(z_c[0]) and z_c[1] == pytest.approx(-1j / (2 * math.pi * 1e8 * 10e-12))
    z_l = load_impedance(Load.inductor(100e-9), f)
    assert z_l[0] == 0 and z_l[1] == pytest.approx(2j * math.pi * 1e8 * 100e-9)
    z_rc = load_impedance(Load.parallel(r_ohm=75.0, c_f=10e-12), f)
    y = 1 / 75.0 + 2j * math.pi * 1e8 * 10e-12
    assert z_rc[0] == pytest.approx(75.0) and z_rc[1] == pytest.approx(1 / y)
    assert load_impedance(Load.match(), f, z0_ohm=50.0) == pytest.approx([50, 50])


# -- reflection, return loss, VSWR: textbook and scikit-rf -------------------------
def test_textbook_resistive_load():
    # Pozar ch. 2 relations, our own numbers: 100 ohm on 50 ohm gives Gamma = 50/150 = 1/3,
    # RL = 20 log10(3) = 9.5424 dB, VSWR = (4/3)/(2/3) = 2, ML = -10 log10(8/9) = 0.5115 dB.
    s = summarize(Load.resistor(100.0), 50.0)
    assert s.gamma == pytest.approx(1 / 3)
    assert s.return_loss_db == pytest.approx(9.5424, abs=1e-4)
    assert s.vswr == pytest.approx(2.0)
    assert s.mismatch_loss_db == pytest.approx(0.5115, abs=1e-4)


def test_textbook_complex_load():
    # Pozar ch. 2: Gamma = (ZL - Z0)/(ZL + Z0) for ZL = 60 + j40 on 50 ohm, by hand:
    # (10 + j40)/(110 + j40) = (2700 + j4000)/13700 = 0.19708 + j0.29197, |Gamma| = 0.35226,
    # VSWR = 1.35226/0.64774 = 2.0877.
    s = summarize(parse_load("60+40j ohm"), 50.0, 146e6)
    assert s.gamma.real == pytest.approx(0.19708, abs=1e-5)
    assert s.gamma.imag == pytest.approx(0.29197, abs=1e-5)
    assert s.vswr == pytest.approx(2.0877, abs=1e-4)


@pytest.mark.parametrize("z0", [50.0, 75.0])
@pytest.mark.parametrize("r", [0.0, 12.5, 25.0, 50.0, 75.0, 100.0, 300.0, 1e6])
def test_resistive_loads_against_scikit_rf(z0, r):
    # scikit-rf: a resistor then a short, on a port of the line's impedance
    freq = rf.Frequency.from_f([1e8], unit="hz")
    media = DefinedGammaZ0(frequency=freq, z0_port=z0, z0=z0, gamma=1j)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        net = media.resistor(r) ** media.short()
    g_ref = net.s[0, 0, 0]
    s = summarize(Load.resistor(r), z0, 1e8)
    assert s.gamma == pytest.approx(g_ref, abs=1e-12)
    if abs(g_ref) > 0:
        assert s.return_loss_db == pytest.approx(-net.s_db[0, 0, 0], abs=1e-9)
    if abs(g_ref) < 1:
        assert s.vswr == pytest.approx(net.s_vswr[0, 0, 0], rel=1e-9)


def test_reactive_load_against_scikit_rf():
    # scikit-rf: a shunt capacitor then a resistor to ground, against our R || C
    f = np.array([10e6, 146e6, 1e9])
    freq = rf.Frequency.from_f(f, unit="hz")
    media = DefinedGammaZ0(frequency=freq, z0_port=50.0, z0=50.0, gamma=1j * f)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        net = media.shunt_capacitor(10e-12) ** media.resistor(75.0) ** media.short()
    mine = load_reflection(parse_load("75 ohm || 10 pF"), f, 50.0)
    assert mine == pytest.approx(net.s[:, 0, 0], abs=1e-12)


# -- signs of what comes back (common practice) --------------------------------------
def test_open_keeps_voltage_reverses_current():
    # common practice: an open returns the voltage with its sign, the current reversed
    s = summarize(Load.open(), 50.0)
    assert (s.reflected_voltage, s.reflected_current) == (1, -1)
    assert (s.voltage_sign, s.current_sign) == ("same", "reversed")


def test_short_inverts_voltage_keeps_current():
    # common practice: a short returns the voltage inverted, the current with its sign
    s = summarize(Load.short(), 50.0)
    assert (s.reflected_voltage, s.reflected_current) == (-1, 1)
    assert (s.voltage_sign, s.current_sign) == ("inverted", "same")


def test_match_returns_nothing():
    s = summarize(Load.match(), 50.0)
    assert s.gamma == 0 and s.voltage_sign == "none" and math.isinf(s.return_loss_db)


# -- step signatures: Hall, Hall and McCall, TDR section -------------------------------
def test_capacitor_across_end_starts_short_ends_open_tau_z0c():
    st = step_levels(Load.capacitor(20e-12), 50.0)
    assert (st.start, st.final) == (-1.0, 1.0)
    assert st.time_constant_s == pytest.approx(50.0 * 20e-12)  # tau = Z0 C


def test_inductor_termination_tau_l_over_z0():
    st = step_levels(Load.inductor(100e-9), 50.0)
    assert (st.start, st.final) == (1.0, -1.0)
    assert st.time_constant_s == pytest.approx(100e-9 / 50.0)  # tau = L / Z0


def test_series_r_l_relaxes_to_resistive_level():
    # tau = L/(R + Z0) for an inductor in series with the end's resistance (DESIGN notes;
    # the same circuit relation as the book's L/Z0 with R added to the loop)
    st = step_levels(parse_load("75 ohm + 100 nH"), 50.0)
    assert st.start == pytest.approx(1.0)
    assert st.final == pytest.approx(0.2)
    assert st.time_constant_s == pytest.approx(100e-9 / 125.0)


def test_r_parallel_c_tau_is_c_times_r_parallel_z0():
    # the capacitor sees R in parallel with the line's Z0 (Thevenin resistance)
    st = step_levels(parse_load("75 ohm || 10 pF"), 50.0)
    assert (st.start, st.final) == (pytest.approx(-1.0), pytest.approx(0.2))
    assert st.time_constant_s == pytest.approx(10e-12 * 75.0 * 50.0 / 125.0)


def test_series_rlc_rings():
    st = step_levels(parse_load("10 ohm + 1 uH + 100 pF"), 50.0)
    assert st.rings
    # envelope tau = 2L/(R + Z0) for a series RLC driven from Z0
    assert st.time_constant_s == pytest.approx(2e-6 / 60.0)


def test_summary_sentence_and_no_safety_claim():
    for text in ("open", "short", "match", "75 ohm", "10 pF", "100 nH", "75 ohm || 10 pF",
                 "60+40j ohm", "line 75 ohm"):
        sentence = summarize(parse_load(text), 50.0, 1e8).sentence
        assert sentence.endswith(".") and "safe" not in sentence.lower()


# -- seen through a line -------------------------------------------------------------
def test_quarter_wave_transforms_load():
    # Pozar ch. 2, quarter-wave transformer: Z_in = Z0^2 / Z_L; 100 ohm through a lossless
    # quarter wave of 50 ohm line reads 25 ohm, Gamma (to 50 ohm) = -1/3.
    f = 100e6
    quarter = 0.25 * 0.66 * 299_792_458.0 / f
    r = seen_through(Load.resistor(100.0), f, [Segment(quarter, 50.0, 0.66)])
    assert r.input_impedance_ohm == pytest.approx(25.0 + 0j, abs=1e-9)
    assert r.gamma == pytest.approx(-1 / 3, abs=1e-12)


def test_half_wave_repeats_load():
    # Pozar ch. 2: a half-wave line repeats its load
    f = 146e6
    half = 0.5 * 0.66 * 299_792_458.0 / f
    r = seen_through(parse_load("75 ohm || 10 pF"), f, [Segment(half, 50.0, 0.66)])
    assert r.input_impedance_ohm == pytest.approx(complex(load_impedance(
        parse_load("75 ohm || 10 pF"), f)), rel=1e-9)


def test_through_lossy_run_against_scikit_rf():
    # scikit-rf: the same two lossy lines (same gamma) cascaded into the same load
    f = np.array([10e6, 146e6, 450e6])
    segments = [Segment(12.0, 50.0, 0.66, 1.39, 0.021), Segment(30.0, 75.0, 0.84, 0.6, 0.006)]
    freq = rf.Frequency.from_f(f, unit="hz")
    port = DefinedGammaZ0(frequency=freq, z0_port=50.0, z0=50.0, gamma=1j * f)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        net = None
        for s in segments:
            media = DefinedGammaZ0(frequency=freq, z0_port=50.0, z0=s.z0_ohm,
                                   gamma=propagation_constant(f, s.vf, s.atten_k1, s.atten_k2))
            net = media.line(s.length_m, "m") if net is None else net ** media.line(
                s.length_m, "m")
        net = net ** port.inductor(30e-9) ** port.resistor(50.0) ** port.short()
    r = seen_through(parse_load("50 ohm + 30 nH"), f, segments, reference_z_ohm=50.0)
    assert r.gamma == pytest.approx(net.s[:, 0, 0], abs=1e-10)
    assert r.input_impedance_ohm == pytest.approx(net.z[:, 0, 0], rel=1e-9)


def test_through_refuses_empty():
    with pytest.raises(InputError):
        seen_through(Load.open(), 1e8, [])


# -- backwards --------------------------------------------------------------------------
def test_observed_step_inverse_relation():
    # Pozar ch. 2 inverse: Z_L = Z0 (1 + Gamma)/(1 - Gamma); +1/3 on 50 ohm -> 100 ohm
    r = from_observed_step(1 / 3, 50.0)
    assert r.impedance_ohm == pytest.approx(100.0)
    assert r.kind == "higher-impedance"
    # the same step from a series resistance with matched line beyond: Gamma = R/(R + 2 Z0)
    assert r.series_resistance_ohm == pytest.approx(50.0)
    assert summarize(Load.resistor(r.series_resistance_ohm + 50.0), 50.0).gamma == \
        pytest.approx(1 / 3)


def test_observed_negative_step_and_shunt_reading():
    r = from_observed_step(-1 / 3, 50.0)
    assert r.impedance_ohm == pytest.approx(25.0) and r.kind == "lower-impedance"
    # a resistance R across the line with Z0 beyond: Z = R || Z0 = 25 ohm -> R = 50 ohm
    assert r.shunt_resistance_ohm == pytest.approx(50.0)


@pytest.mark.parametrize("level, kind", [(1.0, "open"), (0.99, "open"), (-1.0, "short"),
                                         (0.0, "matched"), (0.01, "matched")])
def test_observed_extremes(level, kind):
    assert from_observed_step(level, 50.0).kind == kind


def test_open_implies_infinite_impedance():
    assert math.isinf(from_observed_step(1.0, 50.0).impedance_ohm)


def test_observed_changing_level_is_reactive():
    # Hall, Hall and McCall, TDR section: a capacitance dips first, an inductance bumps
    assert from_observed_step(-0.6, 50.0, settles_to=0.0).kind == "capacitive"
    assert from_observed_step(-1.0, 50.0, settles_to=1.0).kind == "capacitive"
    assert from_observed_step(0.5, 50.0, settles_to=0.0).kind == "inductive"
    assert from_observed_step(1.0, 50.0, settles_to=0.2).kind == "inductive"


def test_observed_wording_admits_ambiguity():
    r = from_observed_step(0.2, 50.0)
    assert len(r.alternatives) >= 2


@pytest.mark.parametrize("level", [1.5, -1.2, math.nan, math.inf])
def test_observed_refuses_impossible(level):
    with pytest.raises(InputError):
        from_observed_step(level, 50.0)
