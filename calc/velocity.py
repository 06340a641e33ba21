"""Velocity of propagation in every convention the trade uses.

.. math::

    VF = v / c_0, \\quad NVP = 100\\,VF, \\quad \\varepsilon_r = 1/VF^2,
    \\quad \\tau' = 1/v, \\quad V/2 = v/2

c0 is the exact SI value. eps_r = 1/VF^2 is the homogeneous-dielectric
relation; for cables with mixed or semiconducting layers it is the
*effective* permittivity the measured velocity implies.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from calc.constants import C0_M_PER_S
from calc.errors import InputError

#: Slowest velocity factor accepted. Cables run from about 0.4 (power cable
#: with semiconducting screens) to 1; helical delay lines go lower, but below
#: this the derived quantities (eps_r, delay per length) stop being useful
#: numbers (common practice).
VF_MIN = 0.01

#: Names of the conventions accepted by :func:`velocity_from`.
CONVENTIONS = (
    "vf",
    "nvp_percent",
    "eps_r",
    "delay_per_length_s_per_m",
    "velocity_m_per_s",
    "half_velocity_m_per_s",
)


@dataclass(frozen=True)
class Velocity:
    """One propagation speed, stated every way the trade states it."""

    vf: float
    nvp_percent: float
    eps_r: float
    delay_per_length_s_per_m: float
    velocity_m_per_s: float
    half_velocity_m_per_s: float


def from_vf(vf: float, field: str = "velocity factor") -> Velocity:
    """Build a :class:`Velocity` from a velocity factor in (0, 1]."""
    if not (math.isfinite(vf) and 0.0 < vf <= 1.0):
        raise InputError(field, f"velocity factor {vf:g} is outside (0, 1]", "0.66")
    if vf < VF_MIN:
        raise InputError(field, f"velocity factor {vf:g} is below {VF_MIN:g}", "0.66")
    v = vf * C0_M_PER_S
    return Velocity(
        vf=vf,
        nvp_percent=100.0 * vf,
        eps_r=1.0 / (vf * vf),
        delay_per_length_s_per_m=1.0 / v,
        velocity_m_per_s=v,
        half_velocity_m_per_s=v / 2.0,
    )


def vf_from(convention: str, value: float) -> float:
    """Velocity factor from a value in one of :data:`CONVENTIONS` (SI units)."""
    if not math.isfinite(value) or value <= 0.0:
        raise InputError(convention, f"{value:g} must be a positive finite number", "0.66")
    if convention == "vf":
        return value
    if convention == "nvp_percent":
        return value / 100.0
    if convention == "eps_r":
        return 1.0 / math.sqrt(value)
    if convention == "delay_per_length_s_per_m":
        return 1.0 / (value * C0_M_PER_S)
    if convention == "velocity_m_per_s":
        return value / C0_M_PER_S
    if convention == "half_velocity_m_per_s":
        return 2.0 * value / C0_M_PER_S
    raise ValueError(f"unknown velocity convention {convention!r}")


def velocity_from(convention: str, value: float) -> Velocity:
    """A :class:`Velocity` from any convention; refuses VF outside (0, 1]."""
    return from_vf(vf_from(convention, value), convention)
