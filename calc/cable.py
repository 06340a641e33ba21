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
#: (see :func:`propagation_terms`).
DIELECTRIC_REF_HZ = 1e9


def propagation_terms(
    vf: float, k1: float | None = None, k2: float | None = None
) -> tuple[complex, complex, complex]:
    r"""The causal propagation constant's three terms, for ``f >= 0``:

    .. math::

        \gamma(f) = t_s\sqrt{f} + t_f\,f + t_g\,f\ln(f/f_{ref})

    with :math:`t_s = (1+j)a_1` (skin effect with its equal phase term),
    :math:`t_f = a_2 + j2\pi/(VF\,c_0)` and :math:`t_g = -j(2/\pi)a_2`, where
    ``a1`` and ``a2`` are the k1 and k2 loss terms in Np/m. The last term is the
    phase that a loss rising in proportion to f must carry to stay causal
    (Kramers-Kronig; it vanishes at ``f_ref`` = :data:`DIELECTRIC_REF_HZ`).

    For transforms to time (:mod:`calc.simulate`): without that phase a
    reflection seen through the line shows energy ahead of its edge.
    Answers at one frequency use :func:`propagation_constant`, which keeps
    the catalog VF at every frequency; the two differ by that phase, under
    a few tenths of a percent of the delay at 10 MHz for the catalog's cables.
    """
    a1 = (k1 or 0.0) / 100.0 / DB_PER_NEPER / math.sqrt(1e6)  # Np/m/sqrt(Hz)
    a2 = (k2 or 0.0) / 100.0 / DB_PER_NEPER / 1e6  # Np/m/Hz
    t_s = complex(a1, a1)
    t_f = complex(a2, 2.0 * math.pi / (vf * C0_M_PER_S))
    t_g = complex(0.0, -2.0 / math.pi * a2)
    return t_s, t_f, t_g


def f_log_f(frequency_hz: np.ndarray | float) -> np.ndarray:
    r""":math:`|f|\ln(|f|/f_{ref})`, with its limit 0 at f = 0."""
    fa = np.abs(np.asarray(frequency_hz, dtype=float))
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(fa > 0.0, fa * np.log(fa / DIELECTRIC_REF_HZ), 0.0)


def causal_propagation_constant(
    frequency_hz: np.ndarray | float,
    vf: float,
    k1: float | None = None,
    k2: float | None = None,
) -> np.ndarray:
    """:func:`propagation_constant` with the causal dielectric phase of :func:`propagation_terms`.

    Negative frequencies give the conjugate.
    """
    f = np.asarray(frequency_hz, dtype=float)
    fa = np.abs(f)
    t_s, t_f, t_g = propagation_terms(vf, k1, k2)
    g = t_s * np.sqrt(fa) + t_f * fa + t_g * f_log_f(fa)
    return np.where(f < 0, np.conj(g), g)
