"""calc.match: quarter-wave transformers and phasing harnesses.

Two kinds of outside check:

* textbook relations (Pozar, *Microwave Engineering*: ch. 2 for the
  terminated lossless and lossy line and the quarter-wave transformer, ch. 5
  for the quarter-wave transformer's reflection across frequency), applied
  to numbers of our own, derived by hand in the comments;
* scikit-rf computing the same lines independently (DefinedGammaZ0 media with
  the same propagation constant and Z0, ``line(...) ** load``, its own
  parallel junction and renormalisation for VSWR).
"""

from __future__ import annotations

import math
import warnings

import numpy as np
import pytest

from cable_catalog.loader import load_catalog
from calc import match
from calc.cable import DB_PER_NEPER, Cable, cable_propagation_constant
from calc.errors import InputError
from calc.parse import parse_band

F = 146e6
BAND = (144e6, 148e6)


def lossless(z0: float, vf: float = 0.66, cid: str = "test-line") -> Cable:
    """A line with no loss model (the textbook's lossless line)."""
    return Cable(cid, "test line", "coax", z0, vf, 0.03, "test")


@pytest.fixture(scope="module")
def coax():
    return load_catalog().by_category("coax")


# --- textbook relations (own numbers) ---------------------------------------------


def test_ideal_transformer_impedance():
    # Pozar ch. 2, quarter-wave transformer: Z_T = sqrt(Z0 R_L).
    assert match.transformer_impedance(50.0, 100.0) == pytest.approx(math.sqrt(5000.0))
    assert match.transformer_impedance(50.0, 200.0) == pytest.approx(100.0)


@pytest.mark.parametrize(("z_t", "z_l", "z_in"), [
    (75.0, 100.0, 56.25),  # 75^2 / 100
    (75.0, 50.0, 112.5),  # 75^2 / 50
    (100.0, 200.0, 50.0),  # 100^2 / 200
])
def test_lossless_quarter_wave_inverts_the_load(z_t, z_l, z_in):
    # Pozar ch. 2: a lossless quarter wave of Z_T shows Z_T^2 / Z_L at its input.
    s = match.make_section(lossless(z_t), 1, 90.0, F)
    z = complex(match.section_input_impedance(s, z_l, F))
    assert z.real == pytest.approx(z_in, rel=1e-9)
    assert z.imag == pytest.approx(0.0, abs=1e-6)


def test_eighth_wave_line_input_impedance():
    # Pozar ch. 2 lossless line Z_in = Z0 (Z_L + j Z0 tan bl)/(Z0 + j Z_L tan bl). At 45 deg,
    # tan = 1; Z0 = 50, Z_L = 100: 50 (100 + j50)/(50 + j100) = 40 - j30 ohm (by hand).
    s = match.make_section(lossless(50.0), 1, 45.0, F)
    z = complex(match.section_input_impedance(s, 100.0, F))
    assert z.real == pytest.approx(40.0, rel=1e-9)
    assert z.imag == pytest.approx(-30.0, rel=1e-9)


def test_lossy_shorted_quarter_wave_is_z0_coth_alpha_l():
    # Pozar ch. 2 lossy line Z_in = Z0 (Z_L + Z0 tanh gl)/(Z0 + Z_L tanh gl); for a short,
    # Z0 tanh(al + j pi/2) = Z0 coth(al). With al = 0.1 Np: coth(0.1) = 10.0333111,
    # Z_in = 501.6656 ohm (by hand). The loss is put in the linear (k2) term and evaluated
    # at the reference frequency of its causal phase term (calc.cable.DIELECTRIC_REF_HZ),
    # where that term vanishes, so beta l stays exactly pi/2.
    from calc.cable import DIELECTRIC_REF_HZ as f0

    length = 0.25 * 299_792_458.0 / f0  # quarter wave at f0, VF 1
    alpha_np_per_m = 0.1 / length
    k2 = alpha_np_per_m * DB_PER_NEPER * 100.0 / (f0 / 1e6)  # dB/100 m/MHz at f0
    c = Cable("lossy", "lossy test line", "coax", 50.0, 1.0, 0.0, "test", atten_k2=k2)
    s = match.make_section(c, 1, 90.0, f0)
    z = complex(match.section_input_impedance(s, 0.0, f0))
    assert z.real == pytest.approx(501.6656, rel=1e-6)
    assert z.imag == pytest.approx(0.0, abs=1e-6)


def test_transformer_reflection_across_frequency():
    # Pozar ch. 5, the quarter-wave transformer: for an ideal lossless section,
    # |G(theta)| = 1 / sqrt(1 + (4 Z0 Z_L / (Z_L - Z0)^2) sec^2 theta), theta = 90 deg f/f0.
    # Own numbers: 50 ohm source, 200 ohm load, 100 ohm section, 120-170 MHz around 146 MHz.
    result = match.quarter_wave_match(50.0, 200.0, F, [lossless(100.0)], (120e6, 170e6),
                                      allow_parallel=False)
    (cand,) = result.candidates
    theta = np.radians(90.0 * cand.response.band_hz / F)
    g = 1.0 / np.sqrt(1.0 + (4 * 50.0 * 200.0 / 150.0**2) / np.cos(theta) ** 2)
    expected = (1 + g) / (1 - g)
    np.testing.assert_allclose(cand.response.vswr_band, expected, rtol=1e-9)
    assert cand.response.vswr_center == pytest.approx(1.0, abs=1e-9)
    assert cand.response.vswr_worst == pytest.approx(expected.max(), rel=1e-9)


def test_two_lines_in_parallel_are_one_line_of_half_z0():
    # common practice: two equal lines in parallel carry Z0/2. A lossless quarter wave of
    # 2 x 50 ohm (25 ohm) turns 12.5 ohm into 25^2 / 12.5 = 50 ohm.
    s = match.make_section(lossless(50.0), 2, 90.0, F)
    assert s.z0_ohm == 25.0
    assert complex(match.section_input_impedance(s, 12.5, F)).real == pytest.approx(50.0)


# --- every catalog candidate against scikit-rf -------------------------------------


def skrf_input(section: match.Section, z_load, f: np.ndarray, z_source: float):
    """Input impedance and VSWR (relative to z_source) of ``section`` terminated in
    ``z_load``, computed by scikit-rf."""
    import skrf
    from skrf.media import DefinedGammaZ0

    freq = skrf.Frequency.from_f(f, unit="hz")
    gamma = cable_propagation_constant(section.cable, f)
    media = DefinedGammaZ0(frequency=freq, z0=section.z0_ohm, gamma=gamma)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        net = media.line(section.physical_length_m, "m") ** media.resistor(z_load) ** \
            media.short()
        z = net.z[:, 0, 0].copy()
        net.renormalize(z_source)
        return z, net.s_vswr[:, 0, 0]


def test_every_candidate_section_against_scikit_rf(coax):
    # scikit-rf: the same lossy line (same gamma and Z0) terminated in 100 ohm, seen from 50.
    result = match.quarter_wave_match(50.0, 100.0, F, coax, BAND)
    assert len(result.candidates) == 2 * len(coax)  # single and two in parallel
    for cand in result.candidates:
        r = cand.response
        z0, s0 = skrf_input(cand.section, 100.0, np.array([F]), 50.0)
        z, s = skrf_input(cand.section, 100.0, r.band_hz, 50.0)
        np.testing.assert_allclose(r.impedance_center_ohm, z0[0], rtol=1e-9)
        np.testing.assert_allclose(r.vswr_center, s0[0], rtol=1e-9)
        np.testing.assert_allclose(r.impedance_band_ohm, z, rtol=1e-9)
        np.testing.assert_allclose(r.vswr_band, s, rtol=1e-9)
        assert r.vswr_worst == pytest.approx(max(s.max(), s0[0]), rel=1e-9)


def test_parallel_pair_against_two_lines_in_scikit_rf(coax):
    # scikit-rf: two separate lines of the cable joined at both ends by ideal tees (not a
    # single Z0/2 line), terminated in 12.5 ohm and seen from 50 ohm.
    import skrf
    from skrf.media import DefinedGammaZ0
    from skrf.network import connect, innerconnect

    result = match.quarter_wave_match(50.0, 12.5, F, coax, BAND)
    pairs = [c for c in result.candidates if c.section.parallel == 2]
    assert pairs and pairs[0] is result.candidates[0]  # 2 x 50 = 25 ohm is the ideal
    for cand in pairs:
        sec, f = cand.section, cand.response.band_hz
        freq = skrf.Frequency.from_f(f, unit="hz")
        gamma = cable_propagation_constant(sec.cable, f)
        media = DefinedGammaZ0(frequency=freq, z0=sec.cable.z0_ohm, gamma=gamma)
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            line = media.line(sec.physical_length_m, "m")
            # (connecting a 2-port keeps its far end at the joined port's index)
            net = connect(media.tee(), 1, line, 0)  # ports: in, line A end, tee 2
            net = connect(net, 2, line, 0)  # ports: in, line A end, line B end
            net = connect(net, 1, media.tee(), 1)  # ports: in, line B end, tee 0, tee 2
            net = innerconnect(net, 1, 3)  # ports: in, out
            net = net ** media.resistor(12.5) ** media.short()
            z = net.z[:, 0, 0]
        np.testing.assert_allclose(cand.response.impedance_band_ohm, z, rtol=1e-9)


def test_nearest_candidates_come_first(coax):
    # 50 -> 100 ohm wants 70.7 ohm: the 75 ohm coax is nearest, 50 and 2 x 75 (37.5) farther.
    result = match.quarter_wave_match(50.0, 100.0, F, coax, BAND, limit=3)
    assert [c.section.z0_ohm for c in result.candidates] == [75.0, 75.0, 75.0]
    losses = [c.loss_db for c in result.candidates]
    assert losses == sorted(losses)


def test_band_must_contain_the_design_frequency(coax):
    with pytest.raises(InputError, match="does not contain"):
        match.quarter_wave_match(50.0, 100.0, F, coax, (150e6, 160e6))


@pytest.mark.parametrize("z", [0.0, -50.0, math.inf, math.nan])
def test_impossible_impedances_are_refused(z):
    with pytest.raises(InputError):
        match.transformer_impedance(50.0, z)


# --- band text ---------------------------------------------------------------------


@pytest.mark.parametrize(("text", "band"), [
    ("144-148 MHz", (144e6, 148e6)),
    ("144 MHz - 148 MHz", (144e6, 148e6)),
    ("430 to 440 MHz", (430e6, 440e6)),
    ("7.0\u20137.3 MHz", (7.0e6, 7.3e6)),
    ("900 kHz-1.2 MHz", (900e3, 1.2e6)),
])
def test_band_text(text, band):
    assert parse_band(text, "--band") == pytest.approx(band)


@pytest.mark.parametrize("text", ["148-144 MHz", "144-148", "144-148 m", "0-148 MHz", "abc", ""])
def test_bad_band_text(text):
    with pytest.raises(InputError, match="--band"):
        parse_band(text, "--band")


# --- harnesses --------------------------------------------------------------------


def test_two_antenna_quarter_wave_harness_lossless():
    # Pozar ch. 2 relation, own numbers: two 50 ohm antennas through 75 ohm quarter waves:
    # each arm shows 75^2/50 = 112.5 ohm, two in parallel 56.25 ohm, VSWR 56.25/50 = 1.125.
    cables = [lossless(50.0, cid="l50"), lossless(75.0, cid="l75"), lossless(93.0, cid="l93")]
    h = match.harness(2, 50.0, 50.0, F, cables, allow_parallel=False)
    assert h.arms[0].section.cable.id == "l75"  # nearest sqrt(50 x 2 x 50) = 70.7 ohm
    assert h.ideal_arm_z0_ohm == pytest.approx(math.sqrt(5000.0))
    assert h.junction_center_ohm.real == pytest.approx(56.25)
    assert h.response.vswr_center == pytest.approx(1.125)
    assert len(h.arms) == 2 and h.transformer is None


def test_four_antenna_half_wave_harness_lossless():
    # 4 x 50 ohm through half-wave 50 ohm arms: 12.5 ohm at the junction; the transformer
    # wants sqrt(12.5 x 50) = 25 ohm, which two 50 ohm lines in parallel give exactly:
    # 25^2 / 12.5 = 50 ohm, VSWR 1 at the design frequency.
    cables = [lossless(50.0, cid="l50"), lossless(75.0, cid="l75")]
    h = match.harness(4, 50.0, 50.0, F, cables, topology="half", band_hz=BAND)
    assert h.ideal_transformer_z0_ohm == pytest.approx(25.0)
    assert (h.transformer.section.cable.id, h.transformer.section.parallel) == ("l50", 2)
    assert h.junction_center_ohm.real == pytest.approx(12.5)
    assert h.response.vswr_center == pytest.approx(1.0, abs=1e-9)
    assert h.response.vswr_worst > 1.0
    assert [p.index for p in h.arms] == [1, 2, 3, 4]


def test_harness_arms_reach_the_span():
    # arm reach 4.5 m; quarter wave of VF 0.66 at 146 MHz is 0.3388 m: 13 quarters
    # (4.404 m) fall short, 15 (5.082 m) reach.
    h = match.harness(4, 50.0, 50.0, F, [lossless(93.0)], arm_reach_m=4.5, allow_parallel=False)
    assert h.arms[0].multiple == 15
    assert h.arms[0].section.physical_length_m == pytest.approx(15 * 0.338806545)


def test_harness_prefers_the_lower_loss_line_among_equals(coax):
    h = match.harness(2, 50.0, 50.0, F, coax, band_hz=BAND)
    arm = h.arms[0].section
    assert arm.z0_ohm == 75.0
    same = [c for c in coax if c.z0_ohm == 75.0]
    assert arm.loss_db(F) == pytest.approx(
        min(match.make_section(c, 1, 90.0, F).loss_db(F) for c in same))


def skrf_harness(h: match.Harness, f: np.ndarray):
    """What the feed line sees, computed by scikit-rf with its own N-way junction."""
    import skrf
    from skrf.media import DefinedGammaZ0
    from skrf.network import connect

    freq = skrf.Frequency.from_f(f, unit="hz")

    def media_of(section):
        return DefinedGammaZ0(frequency=freq, z0=section.z0_ohm,
                              gamma=cable_propagation_constant(section.cable, f))

    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        arm = h.arms[0].section
        m = media_of(arm)
        arm_net = m.line(arm.physical_length_m, "m") ** m.resistor(h.antenna_z_ohm) ** m.short()
        junction = DefinedGammaZ0(frequency=freq, z0=h.feed_z_ohm).splitter(h.antennas + 1)
        for _ in range(h.antennas):
            junction = connect(junction, 1, arm_net, 0)
        seen = junction
        if h.transformer is not None:
            t = h.transformer.section
            mt = media_of(t)
            seen = mt.line(t.physical_length_m, "m") ** junction
        z = seen.z[:, 0, 0].copy()
        seen.renormalize(h.feed_z_ohm)
        return z, seen.s_vswr[:, 0, 0]


@pytest.mark.parametrize("topology", ["quarter", "half"])
@pytest.mark.parametrize("n", [2, 3, 4])
def test_harness_against_scikit_rf(coax, topology, n):
    # scikit-rf: N equal arms joined by its ideal N-way splitter, then the transformer.
    h = match.harness(n, 50.0, 50.0, F, coax, topology=topology, band_hz=BAND, arm_reach_m=1.2)
    z0, s0 = skrf_harness(h, np.array([F]))
    z, s = skrf_harness(h, h.response.band_hz)
    np.testing.assert_allclose(h.response.impedance_center_ohm, z0[0], rtol=1e-9)
    np.testing.assert_allclose(h.response.vswr_center, s0[0], rtol=1e-9)
    np.testing.assert_allclose(h.response.impedance_band_ohm, z, rtol=1e-9)
    np.testing.assert_allclose(h.response.vswr_band, s, rtol=1e-9)
    assert h.response.vswr_worst == pytest.approx(max(s.max(), s0[0]), rel=1e-9)


def test_phase_spread_from_cut_and_vf_tolerance():
    # One wavelength in VF 0.66 line at 146 MHz is 1.35522618 m; two arms cut +2 and -2 mm
    # differ by 4 mm, 360 x 0.004 / 1.35522618 = 1.062553 deg (by hand). A 90 deg arm with VF +/- 3 %
    # spans 90/0.97 - 90/1.03 = 5.4049 deg.
    h = match.harness(2, 50.0, 50.0, F, [lossless(75.0)], cut_tolerance_m=0.002,
                      allow_parallel=False)
    assert h.phase.cut_spread_deg[1] == pytest.approx(1.062553, abs=5e-7)
    assert h.phase.vf_spread_deg[1] == pytest.approx(90 / 0.97 - 90 / 1.03, rel=1e-9)
    assert h.phase.vf_spread_deg[1] == pytest.approx(5.4049, abs=5e-5)


def test_phase_spread_grows_to_the_upper_band_edge():
    h = match.harness(2, 50.0, 50.0, F, [lossless(75.0)], band_hz=BAND, allow_parallel=False)
    lo, mid, hi = h.phase.cut_spread_deg
    assert lo < mid < hi
    assert hi / lo == pytest.approx(148 / 144)  # proportional to frequency
    assert h.phase.frequencies_hz == (144e6, F, 148e6)


@pytest.mark.parametrize(("kwargs", "message"), [
    ({"antennas": 1}, "at least 2"),
    ({"antenna_z_ohm": 0.0}, "antenna impedance"),
    ({"feed_z_ohm": -50.0}, "feed impedance"),
    ({"band_hz": (150e6, 160e6)}, "does not contain"),
    ({"topology": "star"}, "topology"),
    ({"allowance_per_end_m": 0.3}, "no cable would be left"),
])
def test_harness_refusals(coax, kwargs, message):
    args = {"antennas": 4, "antenna_z_ohm": 50.0, "feed_z_ohm": 50.0, "frequency_hz": F,
            "cables": coax} | kwargs
    with pytest.raises(InputError, match=message):
        match.harness(args.pop("antennas"), args.pop("antenna_z_ohm"), args.pop("feed_z_ohm"),
                      args.pop("frequency_hz"), args.pop("cables"), **args)
