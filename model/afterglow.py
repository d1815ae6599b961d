"""Afterglow between pulses: ambipolar diffusion to the walls and the charge left.

SI: mobilities in m^2/(V s), diffusion coefficients in m^2/s, lengths in m, times in s,
temperatures in eV where named so. :func:`afterglow_between_pulses` composes the formulas
for a bench and says what the charge left after the supply's off-time means.
"""

from __future__ import annotations

import math

from .bench import Bench, OperatingPoint
from .results import Afterglow
from .sentence import Flag, flag, q

__all__ = [
    "BESSEL_J0_FIRST_ZERO",
    "GLOW_TE_EV",
    "GLOW_TI_EV",
    "afterglow_between_pulses",
    "ambipolar_diffusion",
    "cylinder_diffusion_length",
    "decay_time",
    "ion_mobility",
    "residual_fraction",
]

GLOW_TE_EV = 2.0
"""Electron temperature of a glow's bulk, eV (1-5 eV: common practice)."""
GLOW_TI_EV = 0.03
"""Ion temperature, eV (about room temperature: common practice)."""

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
    Einstein relation D = mu k T / e ([lieberman-lichtenberg-2005] sec. 5.2, from memory).

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


def afterglow_between_pulses(point: OperatingPoint, bench: Bench) -> tuple[Afterglow | None, list[Flag]]:
    """The afterglow in the bench's chamber at ``point`` and, for a pulsed supply, the charge left
    after its off-time, with a flag saying whether each pulse re-ignites easily. None without a
    chamber."""
    if bench.chamber is None:
        return None, []
    gas = bench.fill.main
    mu = ion_mobility(gas.ion_mobility, point.pressure, point.gas_temperature)
    D_a = ambipolar_diffusion(mu, GLOW_TE_EV, GLOW_TI_EV)
    lam = cylinder_diffusion_length(bench.chamber.radius, bench.chamber.length)
    tau = decay_time(lam, D_a)
    s = bench.supply
    off = s.off_time if s is not None and s.mode == "pulsed" else None
    resid = None if off is None else residual_fraction(off, tau)
    result = Afterglow(D_a, lam, tau, resid, off, GLOW_TE_EV, GLOW_TI_EV)
    if resid is None:
        return result, []
    method = (
        f"ambipolar diffusion D_a = mu_i k (T_e + T_i)/e at T_e {GLOW_TE_EV:g} eV, T_i {GLOW_TI_EV:g} eV "
        f"({gas.ion_mobility_source}); cylinder diffusion length"
    )
    if resid >= 0.1:
        judged = flag(
            "afterglow_carries_over",
            "ok",
            "decay time {tau} against a {off} off-time: {left} of the charge is left, so each pulse re-ignites easily",
            method,
            tau=q(tau, "time", "us", what="afterglow decay time"),
            off=q(off, "time", "us", what="off-time between pulses"),
            left=q(resid, "fraction", "%", ".0%", "charge left after the off-time"),
        )
    else:
        judged = flag(
            "afterglow_lost",
            "watch",
            "decay time {tau} against a {off} off-time: only {left} of the charge is left, so each pulse must "
            "break the gap down afresh (expect ignition delay and jitter)",
            method,
            tau=q(tau, "time", "us", what="afterglow decay time"),
            off=q(off, "time", "us", what="off-time between pulses"),
            left=q(resid, "fraction", "%", ".1%", "charge left after the off-time"),
        )
    return result, [judged]
