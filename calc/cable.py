"""A cable as the core sees it: nominal Z0, VF with tolerance, a loss model.

The catalog (``cable_catalog/``) reads its TOML files into these objects; the
core never reads files itself.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from calc.constants import C0_M_PER_S

#: dB -> neper: 1 Np = 20 / ln(10) dB.
DB_PER_NEPER = 20.0 / math.log(10.0)


@dataclass(frozen=True)
class Cable:
    """One cable type.

    ``vf_tolerance`` is relative (0.03 means VF within +/-3 % of nominal).
    The attenuation model, where known, is
    ``loss_dB_per_100m = k1 * sqrt(f_MHz) + k2 * f_MHz``.
    """

    id: str
    description: str
    category: str
    z0_ohm: float
    vf: float
    vf_tolerance: float
    source: str
    dielectric: str = ""
    atten_k1: float | None = None  # dB / 100 m / sqrt(MHz)
    atten_k2: float | None = None  # dB / 100 m / MHz
    hazards: tuple[str, ...] = ()
    notes: str = ""
    origin: str = "built-in"  # or "user"
    extra: dict = field(default_factory=dict, compare=False, hash=False)

    @property
    def velocity_m_per_s(self) -> float:
        return self.vf * C0_M_PER_S

    @property
    def has_loss_model(self) -> bool:
        return self.atten_k1 is not None or self.atten_k2 is not None

    def loss_db_per_m(self, frequency_hz: np.ndarray | float) -> np.ndarray | float:
        """Matched-line loss in dB/m at ``frequency_hz`` (0 where no model)."""
        f_mhz = np.asarray(frequency_hz, dtype=float) / 1e6
        k1 = self.atten_k1 or 0.0
        k2 = self.atten_k2 or 0.0
        return (k1 * np.sqrt(np.abs(f_mhz)) + k2 * np.abs(f_mhz)) / 100.0


def propagation_constant(
    frequency_hz: np.ndarray | float,
    vf: float,
    k1: float | None = None,
    k2: float | None = None,
) -> np.ndarray:
    """Complex propagation constant gamma = alpha + j beta, in 1/m.

    .. math::

        \\gamma(f) = j\\frac{2\\pi f}{VF\\,c_0} + (1+j)\\,a_1\\sqrt{f} + a_2 f

    where ``a1 sqrt(f)`` and ``a2 f`` are the k1 and k2 loss terms in Np/m.
    The skin-effect term carries an equal phase term so the line stays causal
    (a sqrt(f) loss without it puts energy ahead of the edge). ``VF`` is the
    high-frequency velocity factor. Negative frequencies give the conjugate,
    so a time-domain transform stays real.
    """
    f = np.asarray(frequency_hz, dtype=float)
    fa = np.abs(f)
    sign = np.sign(f)
    beta = 2.0 * math.pi * f / (vf * C0_M_PER_S)
    a1 = (k1 or 0.0) / 100.0 / DB_PER_NEPER / math.sqrt(1e6)  # Np/m/sqrt(Hz)
    a2 = (k2 or 0.0) / 100.0 / DB_PER_NEPER / 1e6  # Np/m/Hz
    skin = a1 * np.sqrt(fa)
    return skin + a2 * fa + 1j * (beta + sign * skin)


def cable_propagation_constant(cable: Cable, frequency_hz: np.ndarray | float) -> np.ndarray:
    """:func:`propagation_constant` with a catalog cable's VF and loss terms."""
    return propagation_constant(frequency_hz, cable.vf, cable.atten_k1, cable.atten_k2)


#: Frequency at which the causal dielectric-loss phase term is zero: the
#: catalog VF is taken to hold there in a time-domain prediction
#: (see :func:`causal_line_coefficients`).
DIELECTRIC_REF_HZ = 1e9


def causal_line_coefficients(
    vf: float, k1: float | None = None, k2: float | None = None
) -> tuple[float, float, float]:
    r"""``(a1, 1/v, a2)`` of the causal propagation constant in the complex frequency s:

    .. math::

        \gamma(s) = a_1\sqrt{s/\pi} + rac{s}{v}
                    - rac{a_2}{\pi^2}\, s \lnrac{s}{2\pi f_{ref}}

    with ``a1`` and ``a2`` the k1 and k2 loss terms in Np/m (per sqrt(Hz) and
    per Hz) and v = VF c0 (:func:`causal_basis` holds the three functions of s).
    On the frequency axis, s = j 2 pi f, this is
    :math:`(1+j)a_1\sqrt{f} + a_2 f\,(1 - j	frac{2}{\pi}\ln(f/f_{ref})) + j2\pi f/v`:
    the catalog's loss, with the phase each loss term must carry to stay
    causal (Kramers-Kronig; the dielectric phase vanishes at ``f_ref`` =
    :data:`DIELECTRIC_REF_HZ`). Without those phases a reflection seen
    through the line shows energy ahead of its edge.

    For transforms to time (:mod:`calc.simulate`). Answers at one frequency
    use :func:`propagation_constant`, which keeps the catalog VF at every
    frequency; the two differ by the dielectric phase, a few tenths of a
    percent of the delay at 10 MHz for the catalog's cables.
    """
    a1 = (k1 or 0.0) / 100.0 / DB_PER_NEPER / math.sqrt(1e6)  # Np/m/sqrt(Hz)
    a2 = (k2 or 0.0) / 100.0 / DB_PER_NEPER / 1e6  # Np/m/Hz
    return a1, 1.0 / (vf * C0_M_PER_S), a2


def causal_basis(s: np.ndarray) -> np.ndarray:
    r"""The three functions of s in :func:`causal_line_coefficients`, stacked (3, ...):

    :math:`\sqrt{s/\pi}`, :math:`s`, :math:`-(s/\pi^2)\ln(s/2\pi f_{ref})`
    (principal branches, analytic for Re s > 0; 0 at s = 0).
    """
    s = np.asarray(s, dtype=complex)
    with np.errstate(divide="ignore", invalid="ignore"):
        dielectric = np.where(s == 0, 0.0,
                              -(s / math.pi ** 2) * np.log(s / (2.0 * math.pi * DIELECTRIC_REF_HZ)))
    return np.stack([np.sqrt(s / math.pi), s, dielectric])


def causal_propagation_constant(
    frequency_hz: np.ndarray | float,
    vf: float,
    k1: float | None = None,
    k2: float | None = None,
) -> np.ndarray:
    """The causal line of :func:`causal_line_coefficients` on the frequency axis, in 1/m.

    Negative frequencies give the conjugate.
    """
    f = np.asarray(frequency_hz, dtype=float)
    basis = causal_basis(2j * math.pi * np.abs(f))
    g = sum(a * b for a, b in zip(causal_line_coefficients(vf, k1, k2), basis, strict=True))
    return np.where(f < 0, np.conj(g), g)
