"""calc.simulate: the whole-run prediction against scikit-rf, textbook step signatures,
the trade's polarities and causality.

References, named beside each check:
* scikit-rf computing the same network (tests/echo_reference.py): its cascade
  of DefinedGammaZ0 lines and lumped elements, and its ``step_response`` with the
  0 Hz point in the grid;
* Hall, Hall and McCall, *High-Speed Digital System Design*, TDR section: the
  time constants of reactive terminations and discontinuities;
* the bounce (lattice) diagram relations of any transmission-line text
  (Pozar, *Microwave Engineering*, ch. 2 for the reflection and transmission
  coefficients at a junction);
* common practice for the polarities of an open and a short.
"""

from __future__ import annotations

import math

import echo_reference as ref
import numpy as np
import pytest

from calc.constants import C0_M_PER_S
from calc.errors import InputError
from calc.loads import Load, parse_load
from calc.simulate import (
    MAX_POINTS,
    Lump,
    Segment,
    distance_from_round_trip,
    parse_lump,
    reflection_spectrum,
    simulate,
)

RG58 = dict(z0_ohm=50.0, vf=0.66, atten_k1=1.39, atten_k2=0.021)  # catalog values
RG6 = dict(z0_ohm=75.0, vf=0.84, atten_k1=0.6, atten_k2=0.006)


def seg(length, **kw):
    return Segment(length, **kw)


def lossless(length, z0=50.0, vf=0.66):
    return Segment(length, z0, vf)


#: Runs for the reference comparisons: (segments, lumps, termination, source Z)
RUNS = {
    "lossless open": ([lossless(10.0)], [], "open", 50.0),
    "lossy 75 ohm": ([seg(30.0, **RG58)], [], "75 ohm", 50.0),
    "lossy short": ([seg(30.0, **RG58)], [], "short", 50.0),
    "capacitor end": ([seg(3.0, **RG58), seg(5.0, **RG6)], [], "20 pF", 50.0),
    "inductor end": ([lossless(4.0), lossless(6.0, 75.0, 0.84)], [], "100 nH", 50.0),
    "multi-segment with lumps": (
        [seg(3.0, **RG58), seg(5.0, **RG6), seg(2.0, **RG58)],
        [Lump("series_l", 5e-9, 0), Lump("shunt_c", 3e-12, 1)], "75 ohm || 10 pF", 50.0),
    "mismatched source, re-reflections": ([lossless(6.0), seg(8.0, **RG6)], [], "open", 25.0),
    "series R-L load": ([seg(12.0, **RG58)], [Lump("series_r", 2.0, 0)], "50 ohm + 30 nH", 50.0),
}


# -- the frequency-domain cascade against scikit-rf -------------------------------------
@pytest.mark.parametrize("name", sorted(RUNS))
def test_cascade_matches_scikit_rf(name):
    segments, lumps, term, zs = RUNS[name]
    f = np.linspace(0.0, 3e9, 1501)  # with the 0 Hz point
    mine = reflection_spectrum(segments, parse_load(term), f, lumps=lumps, source_z_ohm=zs)
    theirs = ref.network(segments, lumps, term, f, zs).s[:, 0, 0]
    # scikit-rf's own cascade of the same network, to 1e-7 (the differences, a few 1e-9,
    # are at its 0 Hz point, which it evaluates a hair away from zero)
    assert mine == pytest.approx(theirs, abs=1e-7)


# -- the step response against scikit-rf's time-domain transform -------------------------
@pytest.mark.parametrize("name", sorted(RUNS))
def test_step_response_matches_scikit_rf(name):
    segments, lumps, term, zs = RUNS[name]
    p = simulate(segments, parse_load(term), lumps=lumps, source_z_ohm=zs, n_points=512)
    theirs = ref.step(p, segments, lumps, term)
    # tolerance 5e-4 of the incident step: scikit-rf integrates with the trapezoid rule
    # (zero-padded 8 times here) and has its own window; ours agrees to about 1e-4
    assert np.max(np.abs(p.level - theirs)) < 5e-4


def test_pulse_matches_scikit_rf():
    segments, lumps, term, zs = RUNS["multi-segment with lumps"]
    p = simulate(segments, parse_load(term), lumps=lumps, source_z_ohm=zs, n_points=512,
                 pulse_width_s=5e-9)
    theirs = ref.step(p, segments, lumps, term)
    assert np.max(np.abs(p.level - theirs)) < 5e-4  # scikit-rf, as above


# -- textbook step signatures: Hall, Hall and McCall, TDR section ---------------------------
def _tau_from_tail(p, t_from, t_to, final):
    """Time constant of an exponential approach to ``final``, from a log-linear fit."""
    m = (p.time_s > t_from) & (p.time_s < t_to)
    y = np.abs(p.level[m] - final)
    slope = np.polyfit(p.time_s[m], np.log(y), 1)[0]
    return -1.0 / slope


def test_capacitor_across_end_tau_is_z0_c():
    c = 40e-12  # tau = Z0 C = 2 ns
    line = lossless(10.0)
    p = simulate([line], Load.capacitor(c), rise_time_s=100e-12, span_s=140e-9)
    t0 = 2 * line.delay_s
    assert p.level[np.searchsorted(p.time_s, t0 + 0.3e-9)] < -0.6  # starts like a short
    assert p.level[-1] == pytest.approx(1.0, abs=1e-3)  # settles like an open
    assert _tau_from_tail(p, t0 + 1e-9, t0 + 10e-9, 1.0) == pytest.approx(50.0 * c, rel=0.01)


def test_inductor_termination_tau_is_l_over_z0():
    ind = 100e-9  # tau = L / Z0 = 2 ns
    line = lossless(10.0)
    p = simulate([line], Load.inductor(ind), rise_time_s=100e-12, span_s=140e-9)
    t0 = 2 * line.delay_s
    assert p.level[np.searchsorted(p.time_s, t0 + 0.3e-9)] > 0.6  # starts like an open
    assert p.level[-1] == pytest.approx(-1.0, abs=1e-3)  # settles like a short
    assert _tau_from_tail(p, t0 + 1e-9, t0 + 10e-9, -1.0) == pytest.approx(ind / 50.0, rel=0.01)


def test_series_inductor_between_lines_tau_is_l_over_2z0():
    ind = 100e-9  # tau = L / (2 Z0) = 1 ns: a bump that decays back to 0
    a, b = lossless(5.0), lossless(20.0)
    p = simulate([a, b], Load.match(), lumps=[Lump("series_l", ind, 0)], rise_time_s=100e-12)
    t0 = 2 * a.delay_s
    assert p.level[np.searchsorted(p.time_s, t0 + 0.2e-9)] > 0.6
    assert _tau_from_tail(p, t0 + 1e-9, t0 + 6e-9, 0.0) == pytest.approx(ind / 100.0, rel=0.01)


def test_shunt_capacitor_mid_line_tau_is_z0_c_over_2():
    c = 40e-12  # tau = Z0 C / 2 = 1 ns: a dip that recovers to 0
    a, b = lossless(5.0), lossless(20.0)
    p = simulate([a, b], Load.match(), lumps=[Lump("shunt_c", c, 0)], rise_time_s=100e-12)
    t0 = 2 * a.delay_s
    assert p.level[np.searchsorted(p.time_s, t0 + 0.2e-9)] < -0.6
    assert _tau_from_tail(p, t0 + 1e-9, t0 + 6e-9, 0.0) == pytest.approx(50.0 * c / 2, rel=0.01)


# -- polarity (common practice) and the DC value -------------------------------------------
def test_open_and_short_polarity_and_dc_levels():
    # common practice: an open's echo is positive and settles at +1, a short's at -1,
    # and nothing comes back before the echo
    line = lossless(20.0)
    for load, final in ((Load.open(), 1.0), (Load.short(), -1.0), (Load.match(), 0.0)):
        p = simulate([line], load)
        before = p.time_s < 2 * line.delay_s - 3 * p.rise_time_s
        assert np.max(np.abs(p.level[before])) < 1e-5
        assert p.level[-1] == pytest.approx(final, abs=1e-6)


def test_lossy_short_settles_toward_minus_one():
    # the sqrt(f) loss has no DC resistance: the level creeps on toward -1 (common practice
    # for skin-effect loss: a reflection through a lossy line is slowed, not lost)
    p = simulate([seg(30.0, **RG58)], Load.short(), span_s=4e-6)
    assert -1.0 < p.level[-1] < -0.97


# -- causality ------------------------------------------------------------------------------
def test_lossy_line_is_causal():
    # a lossy line's echo cannot arrive before the lossless delay: nothing ahead of the edge
    line = seg(60.0, **RG58)
    p = simulate([line], Load.open(), rise_time_s=200e-12)
    sigma = p.rise_time_s / 2.5631
    ahead = p.time_s < 2 * line.delay_s - 6 * sigma
    assert np.max(np.abs(p.level[ahead])) < 1e-5


def test_non_causal_loss_would_show_a_precursor():
    # the same line with a loss that has no phase terms (not causal) puts energy well ahead
    # of the edge: what the causal model avoids (DESIGN notes, whole-run prediction)
    from calc.cable import DB_PER_NEPER
    line = seg(60.0, **RG58)
    n, dt = 1 << 16, 25e-12
    f = np.fft.rfftfreq(n, dt)
    a1 = 1.39 / 100 / DB_PER_NEPER / 1e3
    a2 = 0.021 / 100 / DB_PER_NEPER / 1e6
    gamma = a1 * np.sqrt(f) + a2 * f + 2j * math.pi * f / (0.66 * C0_M_PER_S)
    h = np.fft.irfft(np.exp(-2 * gamma * 60.0) * np.exp(-2 * (math.pi * 80e-12 * f) ** 2), n)
    step = np.cumsum(h)
    t = np.arange(n) * dt
    ahead = t < 2 * line.delay_s - 0.5e-9
    assert np.max(np.abs(step[ahead])) > 1e-3


# -- the window: nothing wraps ----------------------------------------------------------------
def test_ringing_run_does_not_wrap():
    # a 25 ohm source and an open: bounces every round trip, 1/3 smaller each time. The
    # prediction of a short window must equal the same run seen in a long one.
    segments = [lossless(10.0)]
    short = simulate(segments, Load.open(), source_z_ohm=25.0, n_points=1024)
    long = simulate(segments, Load.open(), source_z_ohm=25.0, n_points=16 * 1024,
                    span_s=16 * short.span_s + 15 * (-short.time_s[0]),
                    rise_time_s=short.rise_time_s)
    on_long = np.interp(short.time_s, long.time_s, long.level)
    assert np.max(np.abs(short.level - on_long)) < 1e-4


# -- distance axis ------------------------------------------------------------------------------
def test_distance_axis_is_piecewise_per_segment():
    # distance = v t / 2 in each segment (DESIGN notes): at each joint's round trip the
    # axis reads the cumulative length
    segments = [lossless(10.0, vf=0.66), lossless(25.0, vf=0.88), lossless(5.0, vf=0.66)]
    rt = np.cumsum([2 * s.delay_s for s in segments])
    assert distance_from_round_trip(rt, segments) == pytest.approx([10.0, 35.0, 40.0])
    mid = 2 * segments[0].delay_s + segments[1].delay_s  # half way through segment 2
    assert distance_from_round_trip(mid, segments) == pytest.approx(10.0 + 12.5)


# -- arrivals: the bounce (lattice) diagram ------------------------------------------------------
def test_arrivals_follow_the_lattice_diagram():
    # 50 ohm then 75 ohm, open end, matched source. Junction relations (Pozar ch. 2):
    # Gamma = +0.2 going up, -0.2 coming back, T = 1.2 up and 0.8 down. By hand:
    # joint echo +0.2 at 2 t1; load echo 1.2 * 1 * 0.8 = 0.96 at 2 (t1 + t2);
    # first re-reflection 1.2 * 1 * (-0.2) * 1 * 0.8 = -0.192 at 2 (t1 + 2 t2).
    a, b = lossless(5.0), lossless(10.0, 75.0, 0.66)
    p = simulate([a, b], Load.open(), span_s=2.2 * (a.delay_s + 2 * b.delay_s))
    got = {round(x.time_s * 1e12): x.size for x in p.arrivals}
    t1, t2 = a.delay_s, b.delay_s
    assert got[round(2 * t1 * 1e12)] == pytest.approx(0.2)
    assert got[round(2 * (t1 + t2) * 1e12)] == pytest.approx(0.96)
    assert got[round(2 * (t1 + 2 * t2) * 1e12)] == pytest.approx(-0.192)
    load_echo = next(x for x in p.arrivals if x.size == pytest.approx(0.96))
    assert load_echo.path == "through joint 1 > reflect at the load > through joint 1"
    assert load_echo.distance_m == pytest.approx(15.0)
    # the waveform settles at the sum of the echoes so far
    settled = p.level[np.searchsorted(p.time_s, 2 * (t1 + 2 * t2) + 10 * p.rise_time_s)]
    assert settled == pytest.approx(0.2 + 0.96 - 0.192, abs=2e-3)


def test_source_re_reflection_is_named():
    p = simulate([lossless(10.0)], Load.open(), source_z_ohm=25.0,
                 span_s=2.5 * 2 * lossless(10.0).delay_s)
    # first echo through the port: (1 + r) with r = (25 - 50)/75 = -1/3 on the way back
    first, second = p.arrivals[1], p.arrivals[2]
    assert first.size == pytest.approx(2 / 3 * 4 / 3)
    assert "re-reflect at the instrument" in second.path
    assert second.size == pytest.approx(first.size * (-1 / 3))
    assert p.arrivals[0].time_s == 0.0 and p.arrivals[0].size == pytest.approx(1 / 3)


def test_lossy_arrival_size_matches_waveform():
    line = seg(100.0, **RG58)
    p = simulate([line], Load.open())
    echo = p.arrivals[0]
    at = np.interp(echo.time_s + 8 * p.rise_time_s, p.time_s, p.level)
    assert echo.size == pytest.approx(at, abs=2e-3)  # size: the level 8 rise times on


def test_dip_of_a_shunt_capacitor_is_listed():
    a, b = lossless(5.0), lossless(20.0)
    p = simulate([a, b], Load.match(), lumps=[Lump("shunt_c", 4e-12, 0)], rise_time_s=200e-12)
    dip = p.arrivals[0]
    assert dip.size == pytest.approx(0.0, abs=1e-9) and dip.start < -0.05
    assert np.min(p.level) == pytest.approx(dip.start, abs=0.02)


# -- the edge ------------------------------------------------------------------------------------
def test_rise_time_10_to_90_percent():
    # the 10-90 % rise of an open's echo on a lossless line is the instrument's own
    # (definition of rise time, common practice)
    line = lossless(10.0)
    p = simulate([line], Load.open(), rise_time_s=500e-12, span_s=200e-9)
    t10 = np.interp(0.1, p.level, p.time_s)
    t90 = np.interp(0.9, p.level, p.time_s)
    assert t90 - t10 == pytest.approx(500e-12, rel=0.01)
    assert 0.5 * (t10 + t90) == pytest.approx(2 * line.delay_s, abs=5e-12)


def test_pulse_returns_to_zero():
    p = simulate([lossless(10.0)], Load.open(), pulse_width_s=5e-9)
    assert np.max(p.level) == pytest.approx(1.0, abs=1e-3)
    assert abs(p.level[-1]) < 1e-4


def test_rise_time_limited_by_grid_is_reported():
    p = simulate([lossless(1000.0)], Load.open(), rise_time_s=1e-12, n_points=1024)
    assert "rise-time-limited" in p.warnings and p.rise_time_s > 1e-12


# -- refusals -----------------------------------------------------------------------------------
@pytest.mark.parametrize("kwargs, field", [
    (dict(segments=[lossless(0.0)]), "--run"),
    (dict(segments=[]), "--run"),
    (dict(lumps=[Lump("series_l", -1e-9, 0)]), "--lump"),
    (dict(lumps=[Lump("shunt_c", 1e-12, 5)]), "--lump"),
    (dict(lumps=[Lump("shunt_r", 10.0, 0)]), "--lump"),
    (dict(span_s=1e-9), "--span"),
    (dict(n_points=MAX_POINTS + 1), "--points"),
    (dict(n_points=10), "--points"),
    (dict(load=parse_load("60+40j ohm")), "--load"),
    (dict(source_z_ohm=0.0), "--source-z"),
    (dict(source_z_ohm=1e100), "--source-z"),  # an open for a source: nothing to drive
    (dict(rise_time_s=-1e-9), "--rise-time"),
])
def test_refusals(kwargs, field):
    args = dict(segments=[lossless(10.0)], load=Load.open())
    args.update(kwargs)
    segments, load = args.pop("segments"), args.pop("load")
    with pytest.raises(InputError) as exc:
        simulate(segments, load, **args)
    assert exc.value.field == field


def test_parse_lump():
    assert parse_lump("2: 3 pF", 3) == Lump("shunt_c", 3e-12, 1)
    assert parse_lump("1: 5 nH", 3) == Lump("series_l", 5e-9, 0)
    assert parse_lump("3: 0.2 ohm", 3) == Lump("series_r", 0.2, 2)
    for bad in ("4: 3 pF", "0: 3 pF", "3 pF", "1: -2 nH", "x: 1 nH"):
        with pytest.raises(InputError):
            parse_lump(bad, 3)
