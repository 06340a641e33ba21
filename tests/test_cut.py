"""calc.cut: electrical and physical length, allowances, reach, stubs, trimming.

Reference values are derived by hand from c0 = 299 792 458 m/s (exact, SI
definition of the metre) and the inch = 0.0254 m (exact, 1959 international
yard and pound agreement); stub impedances are checked against scikit-rf
computing the same lossless line.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st

from calc import cut
from calc.errors import InputError

# At 299.792458 MHz the free-space wavelength is exactly 1 m (SI c0).
F_ONE_METRE = 299_792_458.0
# 299 792 458 / 146 000 000 = 2.053373 m exactly (146 x 2 053 373 = 299 792 458).
F_146 = 146e6


# --- physical lengths hand-derived from the SI c0 -------------------------------


def test_quarter_wave_where_free_space_wavelength_is_one_metre():
    # SI c0: lambda0 = 1 m at 299.792458 MHz; VF 0.66 -> 0.66 m in the line; / 4 = 0.165 m.
    assert cut.wavelength_in_line_m(F_ONE_METRE, 0.66) == pytest.approx(0.66, rel=1e-15)
    assert cut.physical_length_m(90.0, F_ONE_METRE, 0.66) == pytest.approx(0.165, rel=1e-15)


def test_quarter_wave_at_146_mhz_in_solid_pe():
    # SI c0: lambda0 = 2.053373 m at 146 MHz; x 0.66 = 1.35522618 m; / 4 = 0.338806545 m.
    assert cut.wavelength_in_line_m(F_146, 0.66) == pytest.approx(1.35522618, rel=1e-14)
    assert cut.physical_length_m(90.0, F_146, 0.66) == pytest.approx(0.338806545, rel=1e-14)


def test_half_wave_at_100_mhz_in_foam():
    # SI c0: lambda0 = 2.99792458 m at 100 MHz; x 0.8 = 2.398339664 m; / 2 = 1.199169832 m.
    assert cut.physical_length_m(180.0, 100e6, 0.8) == pytest.approx(1.199169832, rel=1e-14)


def test_reverse_gives_the_electrical_length_of_a_piece():
    # SI c0: 0.165 m of VF 0.66 line is a quarter of the 0.66 m line wavelength -> 90 deg.
    assert cut.electrical_length_deg(0.165, F_ONE_METRE, 0.66) == pytest.approx(90.0, rel=1e-14)
    # 1 m of air line (VF 1) at 299.792458 MHz is one wavelength: 360 deg.
    assert cut.electrical_length_deg(1.0, F_ONE_METRE, 1.0) == pytest.approx(360.0, rel=1e-14)


def test_cut_length_takes_the_allowance_off_both_ends():
    # 0.338806545 m between reference planes - 2 x 15 mm = 0.308806545 m of cable.
    c = cut.cut_length(0.338806545, 0.015)
    assert c.cut_length_m == pytest.approx(0.308806545, rel=1e-14)
    assert c.cut_rounded_mm_m == pytest.approx(0.309)
    # 0.308806545 m / 0.0254 = 12.1577 in -> 12-3/16 in on a 1/16 tape (exact inch).
    assert (c.cut_tape.feet, c.cut_tape.inches, c.cut_tape.numerator, c.cut_tape.denominator) == (
        1, 0, 3, 16)


def test_tape_shows_165_mm_as_six_and_a_half_inches():
    # 0.165 m / 0.0254 m = 6.496 in -> nearest 1/16 in is 6-8/16 = 6-1/2 in.
    c = cut.cut_length(0.165, 0.0, denominator=16)
    assert (c.cut_tape.feet, c.cut_tape.inches, c.cut_tape.numerator, c.cut_tape.denominator) == (
        0, 6, 1, 2)


@pytest.mark.parametrize("allowance_m", [0.17, 0.1694032725, 0.5])
def test_allowance_that_eats_the_line_is_refused(allowance_m):
    # 2 x 169.4 mm is the whole 338.8 mm quarter wave: no cable would be left.
    with pytest.raises(InputError, match="no cable would be left"):
        cut.cut_length(0.338806545, allowance_m)


def test_stub_allowance_comes_off_one_end_only():
    assert cut.cut_length(0.1, 0.01, ends=1).cut_length_m == pytest.approx(0.09)


# --- reach -------------------------------------------------------------------------


def test_transformer_reach_takes_the_next_odd_quarter_wave():
    # quarter wave 0.3388 m (above); 3/4 wave 1.0164 m reaches 1 m; with 5 cm slack
    # (1.05 m) only 5/4 wave 1.6940 m does.
    r = cut.reach(1.0, F_146, 0.66, "transformer")
    assert (r.multiple, r.electrical_deg) == (3, 270.0)
    assert r.physical_length_m == pytest.approx(3 * 0.338806545)
    assert cut.reach(1.0, F_146, 0.66, "transformer", slack_m=0.05).multiple == 5


def test_repeater_reach_takes_whole_half_waves():
    # half wave 0.6776 m; 1 m needs 2 half waves (1.3552 m).
    r = cut.reach(1.0, F_146, 0.66, "repeater")
    assert (r.multiple, r.unit_deg) == (2, 180.0)
    assert r.spare_m == pytest.approx(2 * 0.67761309 - 1.0)


def test_delay_reach_is_the_span_plus_slack():
    r = cut.reach(1.0, F_146, 0.66, "delay", slack_m=0.1)
    assert r.multiple is None
    assert r.physical_length_m == pytest.approx(1.1)


def test_reach_exactly_on_a_multiple_does_not_skip_it():
    # a span of exactly three quarter waves is reached by three, not five.
    assert cut.reach(3 * 0.338806545, F_146, 0.66, "transformer").multiple == 3


def test_plan_refuses_a_length_its_kind_cannot_have():
    with pytest.raises(InputError, match="odd number of quarter waves"):
        cut.plan_cut(F_146, 180.0, 0.66, kind="transformer")
    with pytest.raises(InputError, match="whole number of half waves"):
        cut.plan_cut(F_146, 90.0, 0.66, kind="repeater")


def test_plan_carries_the_vf_tolerance_into_length():
    p = cut.plan_cut(F_146, 90.0, 0.66, vf_tolerance=0.03, allowance_per_end_m=0.01)
    assert p.tolerance_m == pytest.approx(0.03 * 0.338806545)
    assert p.cut.cut_length_m == pytest.approx(0.318806545)


@given(span=st.floats(0.01, 200.0), slack=st.floats(0.0, 5.0), vf=st.floats(0.3, 1.0),
       f=st.floats(1e5, 3e9), kind=st.sampled_from(["transformer", "repeater"]))
def test_reach_is_the_smallest_allowed_length(span, slack, vf, f, kind):
    r = cut.reach(span, f, vf, kind, slack)
    need = span + slack
    assert r.physical_length_m >= need * (1 - 1e-9)
    assert cut.is_allowed(kind, r.electrical_deg)
    step = 2 if kind == "transformer" else 1
    if r.multiple > step:  # the next shorter allowed length falls short
        shorter = (r.multiple - step) * r.unit_deg / 360.0 * cut.wavelength_in_line_m(f, vf)
        assert shorter < need * (1 + 1e-9)


# --- property: cut, then reverse ---------------------------------------------------


@given(deg=st.floats(1.0, 3600.0), f=st.floats(1e5, 6e9), vf=st.floats(0.3, 1.0),
       allowance=st.floats(0.0, 0.02))
def test_cut_then_reverse_gives_the_same_electrical_length(deg, f, vf, allowance):
    physical = cut.physical_length_m(deg, f, vf)
    if 2 * allowance >= physical:
        return
    c = cut.cut_length(physical, allowance)
    back = cut.electrical_length_deg(c.cut_length_m + 2 * allowance, f, vf)
    assert back == pytest.approx(deg, rel=1e-9)


# --- stubs against scikit-rf ------------------------------------------------------


def _skrf_stub_impedance(end: str, deg: float, z0: float, f: float) -> complex:
    import skrf
    from skrf.media import DefinedGammaZ0

    freq = skrf.Frequency.from_f([f], unit="hz")
    beta = 2 * math.pi * f / (0.66 * 299_792_458.0)
    media = DefinedGammaZ0(frequency=freq, z0=z0, gamma=1j * beta)
    termination = media.open() if end == "open" else media.short()
    return complex((media.line(deg, "deg") ** termination).z[0, 0, 0])


@pytest.mark.parametrize("end", ["open", "short"])
@pytest.mark.parametrize("x", [25.0, -25.0, 50.0, -50.0, 300.0, -7.5])
def test_stub_presents_the_reactance_in_scikit_rf(end, x):
    # scikit-rf builds the same lossless line of the stub's electrical length, terminated
    # in its own open or short; its input must be jX.
    s = cut.stub_length(F_146, 0.66, end, x, 50.0)
    assert 0.0 < s.electrical_deg <= 180.0
    z = _skrf_stub_impedance(end, s.electrical_deg, 50.0, F_146)
    assert z.real == pytest.approx(0.0, abs=1e-6)
    assert z.imag == pytest.approx(x, rel=1e-6)


def test_eighth_wave_stubs_present_plus_and_minus_j_z0():
    # Pozar, Microwave Engineering, ch. 2 (shorted line jZ0 tan(beta l), open line
    # -jZ0 cot(beta l)): at 45 deg, tan = cot = 1.
    assert cut.stub_length(F_146, 0.66, "short", 50.0, 50.0).electrical_deg == pytest.approx(45)
    assert cut.stub_length(F_146, 0.66, "open", -50.0, 50.0).electrical_deg == pytest.approx(45)
    assert cut.stub_length(F_146, 0.66, "open", 50.0, 50.0).electrical_deg == pytest.approx(135)


def test_stub_presenting_a_short_or_an_open():
    # common practice: an open quarter wave looks like a short, a shorted one like an open;
    # a stub that presents its own end needs a half wave of line (shortest positive).
    cases = {("open", 0.0): 90.0, ("short", math.inf): 90.0, ("short", 0.0): 180.0,
             ("open", math.inf): 180.0}
    for (end, x), deg in cases.items():
        s = cut.stub_length(F_146, 0.66, end, x)
        assert s.electrical_deg == pytest.approx(deg)
        assert s.period_m == pytest.approx(0.67761309)  # half of 1.35522618 m


def test_stub_reactance_needs_z0():
    with pytest.raises(InputError, match="Z0"):
        cut.stub_length(F_146, 0.66, "short", 25.0)


# --- trimming ----------------------------------------------------------------------


def test_trim_from_delay_keeps_the_quarter_wave_without_knowing_vf():
    # A 0.400 m piece of VF 0.66 line: round trip 2 x 0.4 / (0.66 c0) = 4.0432e-9 s.
    # Its quarter wave at 146 MHz is 0.338806545 m (above), whatever the trimmer knows.
    t_rt = 2 * 0.4 / (0.66 * 299_792_458.0)
    t = cut.trim_from_delay(90.0, F_146, t_rt, 0.4)
    assert t.keep_length_m == pytest.approx(0.338806545, rel=1e-12)
    assert t.cut_off_m == pytest.approx(0.4 - 0.338806545, rel=1e-9)
    assert t.implied_vf == pytest.approx(0.66, rel=1e-12)


def test_trim_from_resonance_keeps_the_quarter_wave():
    # The same piece resonates first (quarter wave) at 0.66 c0 / (4 x 0.4) = 123.664389 MHz.
    f1 = 0.66 * 299_792_458.0 / 1.6
    t = cut.trim_from_resonance(90.0, F_146, f1, 0.4)
    assert t.keep_length_m == pytest.approx(0.338806545, rel=1e-12)
    assert t.implied_vf == pytest.approx(0.66, rel=1e-12)  # VF = 4 L f1 / c0


def test_trim_without_length_gives_the_fraction_to_keep():
    t = cut.trim_from_resonance(90.0, 100e6, 80e6)
    assert t.keep_fraction == pytest.approx(0.8)  # 80 MHz / 100 MHz
    assert t.keep_length_m is None and t.implied_vf is None


def test_a_piece_already_too_short_is_refused():
    # measured 80 deg at 146 MHz against a 90 deg target
    t_rt = 2 * 80.0 / 360.0 / F_146
    with pytest.raises(InputError, match="cannot be lengthened"):
        cut.trim_from_delay(90.0, F_146, t_rt, 0.3)
    with pytest.raises(InputError, match="cannot be lengthened"):
        cut.trim_from_resonance(90.0, F_146, 150e6, 0.3)  # first resonance above 146 MHz


def test_a_measurement_faster_than_light_is_refused():
    # 1 m with a 5 ns round trip would be 2 / (c0 x 5e-9) = 1.33 c0.
    with pytest.raises(InputError, match="faster than light"):
        cut.trim_from_delay(90.0, 10e6, 5e-9, 1.0)


@given(length=st.floats(0.05, 50.0), vf=st.floats(0.3, 1.0), f=st.floats(1e5, 3e9),
       share=st.floats(0.05, 1.0))
def test_trim_from_delay_and_from_resonance_agree(length, vf, f, share):
    v = vf * 299_792_458.0
    measured_deg = 360.0 * length * f / v
    target = share * measured_deg
    by_delay = cut.trim_from_delay(target, f, 2 * length / v, length)
    by_resonance = cut.trim_from_resonance(target, f, v / (4 * length), length)
    assert by_delay.keep_length_m == pytest.approx(by_resonance.keep_length_m, rel=1e-9)
    assert by_delay.implied_vf == pytest.approx(by_resonance.implied_vf, rel=1e-9)
    assert by_delay.implied_vf == pytest.approx(vf, rel=1e-9)


# --- results are plain floats ---------------------------------------------------


def test_lengths_are_plain_floats():
    assert isinstance(cut.physical_length_m(90.0, F_146, 0.66), float)
    assert not isinstance(cut.physical_length_m(90.0, F_146, 0.66), np.ndarray)
