"""Terminated-line relations: reflection, return loss, VSWR, input impedance.

All functions are vectorised over numpy arrays. References: any microwave
engineering text's transmission-line chapter (e.g. Pozar, *Microwave
Engineering*, ch. 2).
"""

from __future__ import annotations

import math

import numpy as np

ArrayLike = np.ndarray | complex | float


def reflection_coefficient(z_load: ArrayLike, z0: ArrayLike) -> np.ndarray:
    """.. math:: \\Gamma = (Z_L - Z_0)/(Z_L + Z_0)

    ``z_load`` may be ``inf`` for an open (Gamma = +1).
    """
    zl = np.asarray(z_load, dtype=complex)
    z0 = np.asarray(z0, dtype=complex)
    with np.errstate(invalid="ignore", divide="ignore"):
        g = (zl - z0) / (zl + z0)
    return np.where(np.isinf(zl), 1.0 + 0j, g)


def return_loss_db(gamma: ArrayLike) -> np.ndarray:
    """.. math:: RL = -20\\log_{10}|\\Gamma|   (``inf`` for a perfect match)"""
    mag = np.abs(np.asarray(gamma))
    with np.errstate(divide="ignore"):
        return -20.0 * np.log10(mag)


def vswr(gamma: ArrayLike) -> np.ndarray:
    """.. math:: VSWR = (1+|\\Gamma|)/(1-|\\Gamma|)   (``inf`` for |Gamma| = 1)"""
    mag = np.minimum(np.abs(np.asarray(gamma)), 1.0)
    with np.errstate(divide="ignore"):
        return (1.0 + mag) / (1.0 - mag)


def mismatch_loss_db(gamma: ArrayLike) -> np.ndarray:
    """.. math:: ML = -10\\log_{10}(1-|\\Gamma|^2)   (``inf`` for |Gamma| = 1)"""
    mag = np.minimum(np.abs(np.asarray(gamma)), 1.0)
    with np.errstate(divide="ignore"):
        return -10.0 * np.log10(1.0 - mag * mag)


def impedance_from_gamma(gamma: ArrayLike, z0: ArrayLike) -> np.ndarray:
    """.. math:: Z_L = Z_0 (1+\\Gamma)/(1-\\Gamma)   (``inf`` at Gamma = +1)"""
    g = np.asarray(gamma, dtype=complex)
    with np.errstate(divide="ignore", invalid="ignore"):
        z = np.asarray(z0, dtype=complex) * (1.0 + g) / (1.0 - g)
    return np.where(g == 1.0, complex(math.inf, 0.0), z)


def input_impedance(
    z_load: ArrayLike, z0: ArrayLike, gamma_prop: ArrayLike, length_m: float
) -> np.ndarray:
    """Input impedance of a line of ``length_m`` terminated in ``z_load``.

    .. math:: Z_{in} = Z_0 \\frac{Z_L + Z_0\\tanh(\\gamma l)}{Z_0 + Z_L\\tanh(\\gamma l)}

    ``gamma_prop`` is the complex propagation constant in 1/m
    (:func:`calc.cable.propagation_constant`). ``z_load = inf`` is an open
    (Z_in = Z0 coth(gamma l)); ``0`` a short.
    """
    zl = np.asarray(z_load, dtype=complex)
    z0c = np.asarray(z0, dtype=complex)
    t = np.tanh(np.asarray(gamma_prop, dtype=complex) * length_m)
    # over: an open behind a line too short to matter (tanh underflows) is still an open
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        finite = z0c * (zl + z0c * t) / (z0c + zl * t)
        open_end = z0c / t
    return np.where(np.isinf(zl), open_end, finite)
