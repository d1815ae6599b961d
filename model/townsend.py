"""Townsend avalanche: first ionisation coefficient, gain and current growth.

All inputs and outputs are SI: pressure in Pa, field in V/m, lengths in m, alpha in 1/m.
Every function takes scalars or numpy arrays and returns the broadcast shape.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike, NDArray

from . import constants as _c

__all__ = [
    "TOWNSEND",
    "alpha",
    "avalanche_gain",
    "breakdown_alpha_d",
    "current_growth",
    "number_density",
    "reduced_field_Td",
    "self_sustained",
]

TOWNSEND = 1e-21
"""One townsend (Td) in V m^2: the unit of the reduced field E/N (definition)."""


def alpha(E: ArrayLike, p: ArrayLike, A: float, B: float) -> NDArray[np.float64]:
    """First Townsend ionisation coefficient from the two-constant fit.

    alpha = A p exp(-B p / E)

    E field in V/m, p pressure in Pa at the constants' reference density, A in
    1/(Pa m), B in V/(Pa m); returns alpha in 1/m (ionisations per metre of electron
    drift). Townsend's exponential form, e.g. Raizer, *Gas Discharge Physics* (1991),
    eq. (4.1).

    >>> float(alpha(1e5, 100.0, 11.25, 273.8)) > 0
    True
    """
    E = np.asarray(E, dtype=float)
    p = np.asarray(p, dtype=float)
    with np.errstate(divide="ignore", over="ignore"):
        return A * p * np.exp(-B * p / E)


def breakdown_alpha_d(gamma: ArrayLike) -> NDArray[np.float64]:
    """Ionisations per electron needed for a self-sustained discharge, ln(1 + 1/gamma).

    From Townsend's criterion gamma (exp(alpha d) - 1) = 1; gamma is the
    secondary-electron yield per ion at the cathode (dimensionless, 0 < gamma).

    >>> round(float(breakdown_alpha_d(0.01)), 4)
    4.6151
    """
    return np.log1p(1.0 / np.asarray(gamma, dtype=float))


def avalanche_gain(alpha_d: ArrayLike) -> NDArray[np.float64]:
    """Electrons arriving at the anode per electron leaving the cathode, exp(alpha d).

    Returns ``inf`` where the gain overflows a float (alpha d above about 709).

    >>> f"{float(avalanche_gain(np.log(1e8))):.6g}"
    '1e+08'
    """
    with np.errstate(over="ignore"):
        return np.exp(np.asarray(alpha_d, dtype=float))


def current_growth(alpha_d: ArrayLike, gamma: float, eta_d: float = 0.0) -> NDArray[np.float64]:
    """Steady current amplification with secondary emission, I/I0.

    I/I0 = exp(alpha d) / (1 - gamma (exp(alpha d) - 1))

    Townsend's second-coefficient current growth (e.g. Raizer 1991, eq. 7.1). The
    denominator reaches zero at breakdown; there and beyond, the current no longer
    depends on an external source and the steady formula has no meaning, so ``inf``
    is returned.

    With attachment (``eta_d`` = eta d) the same balance reads
    I/I0 = exp((alpha - eta) d) / (1 - gamma alpha/(alpha - eta) (exp((alpha - eta) d) - 1)).

    >>> float(current_growth(0.0, 0.1))
    1.0
    >>> float(current_growth(breakdown_alpha_d(0.1), 0.1))
    inf
    """
    if eta_d:
        net = np.asarray(alpha_d, dtype=float) - eta_d
        g = avalanche_gain(net)
        with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
            ions = np.where(np.abs(net) > 1e-12, alpha_d / net * (g - 1.0), alpha_d)
            denom = 1.0 - gamma * ions
            return np.where(denom > 1e-12, g / np.where(denom > 1e-12, denom, 1.0), np.inf)
    g = avalanche_gain(alpha_d)
    with np.errstate(over="ignore", invalid="ignore"):
        denom = 1.0 - gamma * (g - 1.0)
        out = np.where(denom > 1e-12, g / np.where(denom > 1e-12, denom, 1.0), np.inf)
    return out


def self_sustained(alpha_d: ArrayLike, gamma: float) -> NDArray[np.bool_]:
    """Townsend's self-sustainment criterion, gamma (exp(alpha d) - 1) >= 1.

    Written as alpha d >= ln(1 + 1/gamma) so that it cannot overflow.

    >>> bool(self_sustained(5.0, 0.01)), bool(self_sustained(4.0, 0.01))
    (True, False)
    """
    return np.asarray(alpha_d, dtype=float) >= breakdown_alpha_d(gamma)


def number_density(p: ArrayLike, T: ArrayLike) -> NDArray[np.float64]:
    """Gas number density N = p / (k_B T) in 1/m^3 (ideal gas), p in Pa, T in K.

    >>> round(float(number_density(101325.0, 273.15)) / 1e25, 5)
    2.68678
    """
    return np.asarray(p, dtype=float) / (_c.k * np.asarray(T, dtype=float))


def reduced_field_Td(E: ArrayLike, N: ArrayLike) -> NDArray[np.float64]:
    """Reduced field E/N in townsends (1 Td = 1e-21 V m^2), E in V/m, N in 1/m^3.

    >>> float(reduced_field_Td(1e6, 1e27))
    1.0
    """
    return np.asarray(E, dtype=float) / np.asarray(N, dtype=float) / TOWNSEND
