"""Velocity conventions against outside sources (issue 2)."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from calc import velocity as vel
from calc.constants import C0_M_PER_S, FOOT_M
from calc.errors import InputError


def test_c0_is_the_si_value():
    # SI Brochure (BIPM), definition of the metre: c = 299 792 458 m/s exactly.
    assert C0_M_PER_S == 299_792_458.0


def test_vacuum_rule_of_thumb_about_a_foot_per_nanosecond():
    # Common practice: light travels "about a foot per nanosecond"; the exact
    # figure from the SI c0 and the international foot is 0.98357 ft/ns.
    v = vel.from_vf(1.0)
    ft_per_ns = v.velocity_m_per_s * 1e-9 / FOOT_M
    assert ft_per_ns == pytest.approx(0.98357, abs=5e-6)
    assert v.delay_per_length_s_per_m * FOOT_M * 1e9 == pytest.approx(1.0167, abs=1e-4)


@pytest.mark.parametrize(
    "eps_r,vf,source",
    [
        # Ellingson, Electromagnetics (open textbook), appendix permittivity table.
        (2.25, 0.6667, "solid polyethylene"),
        (2.1, 0.6901, "solid PTFE"),
        # Handbook permittivity tables: dry air at sea level, eps_r 1.0006.
        (1.0006, 0.9997, "dry air"),
    ],
)
def test_vf_from_handbook_permittivity(eps_r, vf, source):
    assert vel.velocity_from("eps_r", eps_r).vf == pytest.approx(vf, abs=1e-4), source


def test_solid_pe_delay_per_foot():
    # VF 0.66 (solid PE, common practice) -> 1.5405 ns/ft, hand-derived from SI c0:
    # 0.3048 / (0.66 * 299792458) = 1.54046e-9 s.
    v = vel.from_vf(0.66)
    assert v.delay_per_length_s_per_m * FOOT_M == pytest.approx(1.54046e-9, rel=1e-5)


def test_half_velocity_of_xlpe_cable():
    # V/2 = 85 m/us (XLPE power cable, from memory) -> VF = 170e6 / c0 = 0.56706.
    assert vel.velocity_from("half_velocity_m_per_s", 85e6).vf == pytest.approx(0.56706, abs=1e-5)


@pytest.mark.parametrize("bad", [0.0, -0.5, 1.0001, math.nan, math.inf])
def test_refuses_vf_outside_unit_interval(bad):
    with pytest.raises(InputError):
        vel.from_vf(bad)


def test_delay_per_length_faster_than_light_is_refused():
    with pytest.raises(InputError):
        vel.velocity_from("delay_per_length_s_per_m", 1e-9 / FOOT_M * 0.5)


@settings(max_examples=300, deadline=None)
@given(st.floats(min_value=0.05, max_value=1.0), st.sampled_from(vel.CONVENTIONS))
def test_every_convention_round_trips(vf, convention):
    v = vel.from_vf(vf)
    value = getattr(v, convention)
    assert vel.vf_from(convention, value) == pytest.approx(vf, rel=1e-12)
