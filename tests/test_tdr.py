"""calc.tdr: a one-port sweep seen in time, checked against scikit-rf (issue 6).

Reference: scikit-rf builds the network (``DefinedGammaZ0`` media: line,
resistor, open, short), writes it as a Touchstone file, reads the same file
back and transforms it with ``Network.step_response`` (and
``extrapolate_to_dc`` for a sweep without 0 Hz). Physical checks use the
round trip 2 L / (VF c0) with the SI value of c0 (BIPM SI Brochure) and the
DC reflections of an open (+1) and a short (-1), common practice.
"""

from __future__ import annotations

import warnings

import numpy as np
import pytest

from calc.constants import C0_M_PER_S
from calc.errors import InputError
from calc.tdr import time_domain
from calc.trace_read import read_touchstone

skrf = pytest.importorskip("skrf")

VF = 0.66
LENGTH_M = 4.0
ROUND_TRIP_S = 2 * LENGTH_M / (VF * C0_M_PER_S)  # 40.42 ns


def _network(f_hz, termination="r", r_ohm=120.0, z0=50.0):
    from skrf.media import DefinedGammaZ0

    freq = skrf.Frequency.from_f(f_hz, unit="Hz")
    gamma = 1j * 2 * np.pi * freq.f / (VF * C0_M_PER_S)
    media = DefinedGammaZ0(frequency=freq, z0=z0, gamma=gamma)
    line = media.line(LENGTH_M, "m")
    end = {"r": media.resistor(r_ohm) ** media.short(), "open": media.open(),
           "short": media.short()}[termination]
    return line ** end


def _via_file(net, tmp_path, form="ri"):
    net.write_touchstone(str(tmp_path / "sweep"), form=form)
    path = tmp_path / "sweep.s1p"
    return skrf.Network(str(path)), read_touchstone(path.read_bytes(), "sweep.s1p")


SKRF_WINDOWS = {"kaiser": ("kaiser", 6.0), "hann": "hann", "none": None}


@pytest.mark.parametrize("window", ["kaiser", "hann", "none"])
def test_step_response_matches_scikit_rf_with_dc_point(tmp_path, window):
    f = np.arange(0, 1001) * 1e6  # 0 Hz .. 1 GHz, a harmonic grid
    ref_net, sweep = _via_file(_network(f), tmp_path)
    pad = 4
    ours = time_domain(sweep.frequency_hz, sweep.s11, window=window, pad=pad)
    n = ours.time_s.size  # the same transform length for the reference
    t_ref, s_ref = ref_net.step_response(window=SKRF_WINDOWS[window], n=n)
    assert t_ref.size == n
    assert ours.time_s[1] - ours.time_s[0] == pytest.approx(t_ref[1] - t_ref[0], rel=1e-9)
    assert ours.dc_source == "measured"
    t_imp, h_ref = ref_net.impulse_response(window=SKRF_WINDOWS[window], n=n)
    keep = (ours.time_s > -ours.alias_free_s / 20) & (ours.time_s < ours.alias_free_s / 2.2)
    h = np.interp(ours.time_s[keep], t_imp, h_ref.real)
    np.testing.assert_allclose(ours.impulse[keep], h, atol=1e-9)
    # The steps differ only by where each view starts integrating (ours at -T/16,
    # scikit-rf's at -T/2): a constant, small next to any event.
    diff = ours.step[keep] - np.interp(ours.time_s[keep], t_ref, s_ref.real)
    assert np.ptp(diff) < 2e-5
    assert abs(diff.mean()) < 5e-4


def test_step_settles_where_the_line_says():
    # 120 ohm on 50 ohm: rho = 70/170 (reflection coefficient, Pozar ch. 2).
    f = np.arange(0, 2001) * 1e6
    net = _network(f)
    td = time_domain(f, net.s[:, 0, 0])
    before = np.interp(ROUND_TRIP_S - 3 * td.rise_time_s, td.time_s, td.step)
    after = np.interp(ROUND_TRIP_S + 3 * td.rise_time_s, td.time_s, td.step)
    assert before == pytest.approx(0.0, abs=2e-3)
    assert after == pytest.approx(70 / 170, abs=2e-3)
    # the 50 % point of the edge is at the round trip 2 L / (VF c0)
    mid = td.time_s[np.argmax(td.step >= 35 / 170)]
    assert mid == pytest.approx(ROUND_TRIP_S, abs=td.time_s[1] - td.time_s[0] + 0.05e-9)


@pytest.mark.parametrize("termination, dc", [("open", 1.0), ("short", -1.0)])
def test_dc_extrapolated_for_a_sweep_without_0_hz(tmp_path, termination, dc):
    f = np.arange(1, 1001) * 1e6  # 1 MHz .. 1 GHz: on the grid, without 0 Hz
    ref_net, sweep = _via_file(_network(f, termination), tmp_path)
    td = time_domain(sweep.frequency_hz, sweep.s11)
    assert td.dc_source == "extrapolated"
    assert td.dc_value == pytest.approx(dc, abs=0.01)
    late = np.interp(ROUND_TRIP_S + 5e-9, td.time_s, td.step)
    assert late == pytest.approx(dc, abs=0.01)
    # scikit-rf's own DC extrapolation and transform of the same file agree
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        ext = ref_net.extrapolate_to_dc(kind="cubic")
    t_ref, s_ref = ext.step_response(window=("kaiser", 6.0), n=td.time_s.size)
    keep = (td.time_s > 0) & (td.time_s < td.alias_free_s / 2.2)
    ref = np.interp(td.time_s[keep], t_ref, s_ref.real)
    assert np.max(np.abs(td.step[keep] - ref)) < 0.02


def test_given_dc_value_is_used():
    f = np.arange(1, 501) * 2e6
    net = _network(f, "open")
    td = time_domain(f, net.s[:, 0, 0], dc_value=1.0)
    assert td.dc_source == "given" and td.dc_value == 1.0


def test_off_grid_sweep_is_resampled_and_still_places_the_edge():
    f = np.linspace(3.3e5, 1.5e9, 1601)  # a typical analyser sweep, not on a 0 Hz grid
    net = _network(f, "short")
    td = time_domain(f, net.s[:, 0, 0])
    assert td.resampled
    assert any("interpolated" in n for n in td.notes)
    mid = td.time_s[np.argmax(td.step <= -0.5)]
    assert mid == pytest.approx(ROUND_TRIP_S, abs=0.3e-9)


def test_band_limits_the_points_used():
    f = np.arange(0, 1001) * 1e6
    net = _network(f)
    td = time_domain(f, net.s[:, 0, 0], band_hz=(None, 500e6))
    assert td.band_high_hz == pytest.approx(500e6)
    full = time_domain(f, net.s[:, 0, 0])
    assert td.rise_time_s == pytest.approx(2 * full.rise_time_s, rel=0.02)


def test_fft_size_is_a_quick_length_at_or_above():
    from calc.tdr import fft_size

    for n in (1, 7, 8001, 800007, 2**20 + 1):
        m = fft_size(n)
        assert m >= n and m < 1.5 * n and m % 2 == 1
        for p in (3, 5, 7):
            while m % p == 0:
                m //= p
        assert m == 1


def test_fft_size_even_is_the_next_7_smooth_length():
    # common practice: an FFT is quickest on lengths whose prime factors are all small;
    # the run predictor (calc.simulate) takes any 2^a 3^b 5^c 7^d, the smallest at or
    # above n, checked here against every length in between
    from calc.tdr import fft_size

    def smooth(m: int) -> bool:
        for p in (2, 3, 5, 7):
            while m % p == 0:
                m //= p
        return m == 1

    for n in (1, 2, 11, 97, 5120, 20481, 65537, 1310721):
        m = fft_size(n, odd=False)
        assert m >= n and smooth(m)
        assert not any(smooth(k) for k in range(n, m))
    assert fft_size(5120, odd=False) == 5120  # 4096 points, 1.25 periods: 2^10 x 5


@pytest.mark.parametrize("kwargs, field", [
    ({"band_hz": (2e9, None)}, "--band"),
    ({"dc_value": 1.5}, "--dc"),
    ({"window": "triangle"}, "--window"),
    ({"pad": 0}, "--pad"),
])
def test_bad_options(kwargs, field):
    f = np.arange(0, 101) * 1e6
    with pytest.raises(InputError) as err:
        time_domain(f, np.zeros(f.size, complex), **kwargs)
    assert err.value.field == field
