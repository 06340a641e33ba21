"""calc.calibrate: velocity factor from a known length, a reel, or a stub resonance.

Known-length values are hand-derived from the exact SI value of c0
(299 792 458 m/s, BIPM SI Brochure). Stub resonances are checked against
scikit-rf, which computes the input impedance of the terminated line on its
own (DefinedGammaZ0 media, line ** open / short): the first minimum of
|Z_in| it finds must fall where our calibration says.
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st

from calc.calibrate import (
    DEFAULT_REEL_LENGTH_TOLERANCE,
    quarter_waves,
    stub_resonance_hz,
    vf_from_delay,
    vf_from_reel,
    vf_from_stub,
)
from calc.constants import C0_M_PER_S
from calc.errors import InputError
from calc.locate import expected_delay

skrf = pytest.importorskip("skrf")


# ---------------------------------------------------------------- known length


def test_known_length_hand_derived():
    # SI c0: VF = 2 x 10 m / (299 792 458 m/s x 101 ns) = 0.660523
    cal = vf_from_delay(10.0, 101e-9, length_tolerance_m=0.0, delay_resolution_s=0.0)
    assert cal.vf == pytest.approx(0.6605229608, rel=1e-9)
    assert cal.vf_low == cal.vf == cal.vf_high
    assert cal.method == "known-length"


def test_known_length_uncertainty_hand_derived():
    # SI c0, worst case: 2 x 9.95 m / (c0 x 102 ns) = 0.650777 ..
    #                    2 x 10.05 m / (c0 x 100 ns) = 0.670464
    cal = vf_from_delay(10.0, 101e-9, length_tolerance_m=0.05, delay_resolution_s=1e-9)
    assert cal.vf_low == pytest.approx(0.650777, rel=1e-6)
    assert cal.vf_high == pytest.approx(0.670464, rel=1e-6)
    assert cal.vf_tolerance == pytest.approx(0.670464 / 0.660523 - 1, rel=1e-4)


def test_default_length_tolerance_is_half_a_percent():
    cal = vf_from_delay(10.0, 101e-9)
    assert cal.length_tolerance_m == pytest.approx(0.05)
    assert cal.delay_resolution_s == pytest.approx(1e-9)


def test_reel_is_the_known_length_relation_with_a_wider_default():
    # a 305 m reel, far end 3.1 us: VF = 610 m / (c0 x 3.1 us) = 0.656368 (SI c0)
    reel = vf_from_reel(305.0, 3.1e-6)
    assert reel.method == "reel"
    assert reel.vf == pytest.approx(0.6563680583, rel=1e-9)
    assert reel.length_tolerance_m == pytest.approx(305.0 * DEFAULT_REEL_LENGTH_TOLERANCE)
    assert reel.vf_high - reel.vf_low > vf_from_delay(305.0, 3.1e-6).vf_high - \
        vf_from_delay(305.0, 3.1e-6).vf_low


def test_faster_than_light_is_refused():
    # 10 m and back needs 66.7 ns at c0 (SI c0); 50 ns cannot be this piece's far end
    with pytest.raises(InputError, match="faster than light"):
        vf_from_delay(10.0, 50e-9)


def test_vf_high_is_capped_at_one():
    # 2 x 10 m / (c0 x 67 ns) = 0.9957; with 1 ns resolution the top would pass 1
    assert vf_from_delay(10.0, 67e-9).vf_high == 1.0


@pytest.mark.parametrize("kwargs, field", [
    ({"length_m": 0.0, "delay_s": 1e-7}, "--length"),
    ({"length_m": -1.0, "delay_s": 1e-7}, "--length"),
    ({"length_m": float("inf"), "delay_s": 1e-7}, "--length"),
    ({"length_m": 10.0, "delay_s": 0.0}, "--delay"),
    ({"length_m": 10.0, "delay_s": float("nan")}, "--delay"),
    ({"length_m": 10.0, "delay_s": 1e-7, "delay_resolution_s": 2e-7}, "--delay-resolution"),
    ({"length_m": 10.0, "delay_s": 1e-7, "length_tolerance_m": 11.0}, "--length-tolerance"),
    ({"length_m": 10.0, "delay_s": 1e-7, "length_tolerance_m": -0.1}, "--length-tolerance"),
])
def test_bad_inputs_name_their_field(kwargs, field):
    with pytest.raises(InputError) as info:
        vf_from_delay(**kwargs)
    assert info.value.field == field


@given(length=st.floats(0.1, 5000.0), vf=st.floats(0.3, 1.0))
def test_known_length_inverts_locate(length, vf):
    delay = expected_delay(length, vf).round_trip_delay_s
    cal = vf_from_delay(length, delay, delay_resolution_s=0.0)
    assert cal.vf == pytest.approx(vf, rel=1e-12)
    assert cal.vf_low <= cal.vf <= cal.vf_high


# ---------------------------------------------------------------- stubs


def test_quarter_waves_per_end_and_order():
    # open: Z_in = -j Z0 cot(beta l), zero at odd quarter waves; short: Z_in = j Z0 tan(beta l),
    # zero at whole half waves (Pozar, Microwave Engineering, ch. 2, terminated lossless line)
    assert [quarter_waves("open", n) for n in (1, 2, 3)] == [1, 3, 5]
    assert [quarter_waves("short", n) for n in (1, 2, 3)] == [2, 4, 6]
    with pytest.raises(InputError):
        quarter_waves("open", 0)
    with pytest.raises(InputError):
        quarter_waves("shorted?", 1)


def test_open_stub_hand_derived():
    # SI c0: VF = 4 x 10 m x 4.95 MHz / 299 792 458 m/s = 0.660457
    cal = vf_from_stub(10.0, 4.95e6, "open", 1, length_tolerance_m=0.0,
                       frequency_resolution_hz=0.0)
    assert cal.vf == pytest.approx(0.6604569085, rel=1e-9)
    assert cal.quarter_waves == 1


def _skrf_low_impedance_frequencies(length_m: float, vf: float, end: str, z0: float,
                                    f_max_hz: float) -> np.ndarray:
    """Local minima of |Z_in| of a stub as scikit-rf computes it (1 kHz grid)."""
    freq = skrf.Frequency(0.1e6, f_max_hz, int((f_max_hz - 0.1e6) / 1e3) + 1, unit="Hz")
    beta = 2 * np.pi * freq.f / (vf * C0_M_PER_S)
    alpha = 2e-3  # a little loss, Np/m, so the minima are finite and well defined
    media = skrf.media.DefinedGammaZ0(frequency=freq, z0=z0, gamma=alpha + 1j * beta)
    termination = media.open() if end == "open" else media.short()
    stub = media.line(length_m, unit="m") ** termination
    z = np.abs(stub.z[:, 0, 0])
    minima = np.flatnonzero((z[1:-1] < z[:-2]) & (z[1:-1] < z[2:])) + 1
    return freq.f[minima]


@pytest.mark.parametrize("end, order, z0", [
    ("open", 1, 50.0), ("open", 2, 50.0), ("open", 3, 75.0),
    ("short", 1, 50.0), ("short", 2, 93.0),
])
def test_stub_resonance_against_scikit_rf(end, order, z0):
    # scikit-rf: an invented 10 m stub of VF 0.66; its order-th minimum of |Z_in| must be
    # the frequency at which our calibration gives back VF 0.66
    length_m, vf = 10.0, 0.66
    minima = _skrf_low_impedance_frequencies(length_m, vf, end, z0, 40e6)
    f_ref = minima[order - 1]
    cal = vf_from_stub(length_m, f_ref, end, order)
    assert cal.vf == pytest.approx(vf, rel=3e-4)  # the 1 kHz grid limits the match
    assert stub_resonance_hz(length_m, vf, end, order) == pytest.approx(f_ref, abs=1e3)
    assert cal.vf_low < vf < cal.vf_high


def test_misread_order_is_refused_with_a_hint():
    # the third-quarter-wave dip of the stub above read as if it were the first
    f3 = stub_resonance_hz(10.0, 0.66, "open", 2)
    with pytest.raises(InputError, match="--order 2"):
        vf_from_stub(10.0, f3, "open", 1)


def test_stub_uncertainty_hand_derived():
    # SI c0, worst case: 4 x 9.99 m x 4.94 MHz / c0 = 0.658463 .. 4 x 10.01 m x 4.96 MHz / c0
    # = 0.662453
    cal = vf_from_stub(10.0, 4.95e6, "open", 1, length_tolerance_m=0.01,
                       frequency_resolution_hz=10e3)
    assert cal.vf_low == pytest.approx(4 * 9.99 * 4.94e6 / 299_792_458.0, rel=1e-12)
    assert cal.vf_low == pytest.approx(0.658463, rel=1e-6)
    assert cal.vf_high == pytest.approx(0.662453, rel=1e-6)


@given(length=st.floats(0.05, 100.0), vf=st.floats(0.3, 1.0),
       end=st.sampled_from(("open", "short")), order=st.integers(1, 10))
def test_stub_round_trips(length, vf, end, order):
    f = stub_resonance_hz(length, vf, end, order)
    assert vf_from_stub(length, f, end, order).vf == pytest.approx(vf, rel=1e-12)


def test_shorted_stub_read_as_open_is_refused_with_a_hint():
    # A shorted stub's first low-impedance resonance is where it is a half wave
    # (Z_in = j Z0 tan(beta l); Pozar, Microwave Engineering, ch. 2): 1 m at VF 0.66
    # shows it at 0.66 c0 / 2 m = 98.93 MHz (SI c0). Read with the default open end it
    # would be a quarter wave at VF 1.32: refused, and the hint names --end short.
    f = stub_resonance_hz(1.0, 0.66, "short", 1)
    assert f == pytest.approx(0.66 * 299_792_458.0 / 2.0, rel=1e-12)
    with pytest.raises(InputError, match=r"--end short gives VF 0\.66"):
        vf_from_stub(1.0, f, "open", 1)
