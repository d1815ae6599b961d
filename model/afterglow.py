"""Afterglow between pulses: ambipolar diffusion to the walls and the charge left.

SI: mobilities in m^2/(V s), diffusion coefficients in m^2/s, lengths in m, times in s,
temperatures in eV where named so.
"""

from __future__ import annotations

import math

__all__ = [
    "BESSEL_J0_FIRST_ZERO",
    "ambipolar_diffusion",
    "cylinder_diffusion_length",
    "decay_time",
    "ion_mobility",
    "residual_fraction",
]

BESSEL_J0_FIRST_ZERO = 2.404825557695773
"""First zero of the Bessel function J0 (tests compare it with scipy.special.jn_zeros)."""

_P0 = 101325.0
_T0 = 273.15


def ion_mobility(K0: float, p: float, T: float) -> float:
    """Ion mobility mu = K0 (p0 / p)(T / T0), m^2/(V s), from the reduced mobility K0.

    K0 in m^2/(V s) at p0 = 101325 Pa, T0 = 273.15 K; p in Pa, T in K.

    >>> round(ion_mobility(1.6e-4, 101325.0, 273.15), 10)
    0.00016
    """
    return K0 * (_P0 / p) * (T / _T0)


def ambipolar_diffusion(mu_i: float, Te_eV: float, Ti_eV: float) -> float:
    """Ambipolar diffusion coefficient D_a = D_i (1 + T_e/T_i) = mu_i (T_e + T_i) [eV] , m^2/s.

    The limit of D_a = (mu_i D_e + mu_e D_i)/(mu_i + mu_e) for mu_e >> mu_i, with the
    Einstein relation D = mu k T / e (Lieberman & Lichtenberg, sec. 5.2, from memory).

    >>> round(ambipolar_diffusion(0.1, 2.0, 0.03), 6)
    0.203
    """
    return mu_i * (Te_eV + Ti_eV)


def cylinder_diffusion_length(radius: float, length: float) -> float:
    """Fundamental diffusion length of a finite cylinder, 1/Lambda^2 = (j01/R)^2 + (pi/L)^2, m.

    >>> round(cylinder_diffusion_length(1.0, math.inf), 6)
    0.415831
    """
    inv2 = (BESSEL_J0_FIRST_ZERO / radius) ** 2 + (math.pi / length) ** 2
    return 1.0 / math.sqrt(inv2)


def decay_time(diffusion_length: float, D_a: float) -> float:
    """Decay time of the fundamental diffusion mode, tau = Lambda^2 / D_a, s.

    >>> decay_time(0.1, 1.0)
    0.010000000000000002
    """
    return diffusion_length**2 / D_a


def residual_fraction(off_time: float, tau: float) -> float:
    """Fraction of the charge left after ``off_time`` of free decay, exp(-t/tau).

    >>> round(residual_fraction(1.0, 1.0), 6)
    0.367879
    """
    return math.exp(-off_time / tau)
