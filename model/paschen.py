"""Paschen breakdown: V_b(pd), its minimum, both inverse branches, and the air law.

SI throughout: ``pd`` in Pa m at the reference gas density of the constants (see
:func:`reduced_pd`), A in 1/(Pa m), B in V/(Pa m), voltages in V. Every function is
vectorised over numpy arrays.

Townsend's criterion gamma (exp(alpha d) - 1) = 1 with alpha = A p exp(-B p/E) and
E = V/d gives Paschen's law

    V_b = B pd / (ln(A pd) - ln(ln(1 + 1/gamma)))

(e.g. Raizer, *Gas Discharge Physics* (1991), eq. 7.4; arXiv:1612.07170 eq. 1). The
denominator falls to zero at pd_0 = ln(1 + 1/gamma)/A: at or below it no voltage breaks
the gap down (the law gives a negative or infinite number, reported here as NaN).
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import ArrayLike, NDArray

from .bench import TownsendConstants, UniformFieldLaw
from .townsend import breakdown_alpha_d

__all__ = [
    "TownsendConstants",
    "UniformFieldLaw",
    "branch",
    "breakdown_E_over_p",
    "breakdown_voltage",
    "breakdown_voltage_with_law",
    "inverse_pd",
    "inverse_pd_with_law",
    "minimum",
    "no_breakdown_pd",
    "reduced_pd",
    "uniform_field_voltage",
]


def reduced_pd(p: ArrayLike, d: ArrayLike, T: ArrayLike, T_ref: float) -> NDArray[np.float64]:
    """pd scaled to the gas density of the constants: p d (T_ref / T), Pa m.

    Breakdown depends on the number of molecules in the gap, N d; A and B are tabulated
    for pressures at ``T_ref``, so a hotter gas at the same pressure behaves like a
    lower pressure (p in Pa, d in m, T and T_ref in K).

    >>> float(reduced_pd(100.0, 0.01, 546.3, 273.15))
    0.5
    """
    return np.asarray(p, dtype=float) * np.asarray(d, dtype=float) * (T_ref / np.asarray(T, dtype=float))


def no_breakdown_pd(A: float, gamma: float) -> float:
    """pd_0 = ln(1 + 1/gamma) / A, Pa m: at or below it no voltage breaks the gap down.

    It is the vertical asymptote of the left branch of the Paschen curve.

    >>> round(no_breakdown_pd(1.0, 1 / (math.e - 1)), 12)
    1.0
    """
    return float(breakdown_alpha_d(gamma)) / A


def minimum(A: float, B: float, gamma: float) -> tuple[float, float]:
    """The Paschen minimum ((pd)_min in Pa m, V_min in V), from dV_b/d(pd) = 0.

    (pd)_min = e ln(1 + 1/gamma) / A,   V_min = e B ln(1 + 1/gamma) / A

    >>> pd, v = minimum(15 / 1.33322368, 365 / 1.33322368, 0.01)  # air, Raizer's A, B
    >>> round(pd / 1.33322368, 3), round(v)                        # Torr cm, V
    (0.836, 305)
    """
    K = float(breakdown_alpha_d(gamma))
    return math.e * K / A, math.e * B * K / A


def breakdown_voltage(pd: ArrayLike, A: float, B: float, gamma: float) -> NDArray[np.float64]:
    """Paschen's law V_b(pd) in V, NaN where no voltage breaks the gap down.

    V_b = B pd / (ln(pd) + ln(A) - ln(ln(1 + 1/gamma)))

    pd in Pa m (reduced to the constants' density), A in 1/(Pa m), B in V/(Pa m),
    gamma dimensionless. Written with one logarithm per point and in-place arithmetic:
    this is the hot path of every curve drawn.

    >>> pd_min, v_min = minimum(10.0, 200.0, 0.05)
    >>> bool(np.isclose(breakdown_voltage(pd_min, 10.0, 200.0, 0.05), v_min))
    True
    >>> breakdown_voltage([0.1, 1.0], 10.0, 200.0, 0.05).round(1).tolist()
    [nan, 168.2]
    """
    pd = np.asarray(pd, dtype=float)
    scalar = pd.ndim == 0
    pd = np.atleast_1d(pd)
    shift = math.log(A) - math.log(float(breakdown_alpha_d(gamma)))
    # One output buffer, reused in place: a second 1e6-point temporary costs more in
    # page faults than the logarithm itself.
    with np.errstate(divide="ignore", invalid="ignore"):
        out = np.log(pd)
        out += shift
        out[~(out > 0)] = np.nan  # left of pd_0: no breakdown at any voltage
        np.divide(pd, out, out=out)
        out *= B
    return out[0] if scalar else out


def breakdown_E_over_p(pd: ArrayLike, A: float, gamma: float, B: float) -> NDArray[np.float64]:
    """Reduced field at breakdown, E/p = V_b/(pd) = B / ln(A pd / ln(1 + 1/gamma)), V/(Pa m).

    NaN where there is no breakdown.

    >>> round(float(breakdown_E_over_p(math.e * 4.0 / 2.0, 2.0, 1 / (math.exp(4.0) - 1), 300.0)), 6)
    300.0
    """
    pd = np.asarray(pd, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        denom = np.log(A * pd / breakdown_alpha_d(gamma))
        out = np.where(denom > 0, B / np.where(denom > 0, denom, 1.0), np.nan)
    return out if out.ndim else out[()]


def branch(pd: ArrayLike, A: float, gamma: float) -> NDArray[np.str_]:
    """Which side of the minimum each pd sits on: "left", "right", or "none".

    "none" marks pd at or below :func:`no_breakdown_pd`, where the gap cannot break
    down at any voltage.

    >>> branch([0.1, 0.5, 5.0], 10.0, 0.1).tolist()
    ['none', 'left', 'right']
    """
    pd = np.asarray(pd, dtype=float)
    K = float(breakdown_alpha_d(gamma))
    pd_min = math.e * K / A
    return np.where(pd <= K / A, "none", np.where(pd < pd_min, "left", "right"))


def inverse_pd(V: ArrayLike, A: float, B: float, gamma: float) -> tuple[NDArray, NDArray]:
    """Both pd (Pa m) at which the Paschen curve reaches the voltage V (V).

    Substituting u = ln(A pd / K), K = ln(1 + 1/gamma), turns V = V_b(pd) into
    u exp(-u) = V_min / (e V), solved by the two real branches of the Lambert W
    function: u = -W_0(-V_min/(e V)) on the left branch (u <= 1) and
    u = -W_-1(-V_min/(e V)) on the right (u >= 1); pd = K exp(u) / A.
    Returns (pd_left, pd_right), NaN where V is below V_min.

    >>> left, right = inverse_pd(1000.0, 10.0, 200.0, 0.05)
    >>> [round(float(breakdown_voltage(x, 10.0, 200.0, 0.05)), 6) for x in (left, right)]
    [1000.0, 1000.0]
    """
    from scipy.special import lambertw  # deferred: keeps scipy.special off start-up

    V = np.asarray(V, dtype=float)
    K = float(breakdown_alpha_d(gamma))
    _, v_min = minimum(A, B, gamma)
    with np.errstate(divide="ignore", invalid="ignore"):
        z = -v_min / (math.e * V)
        ok = (z >= -1.0 / math.e) & (z < 0)
        z = np.where(ok, z, -0.1)
        u_left = -lambertw(z, 0).real
        u_right = -lambertw(z, -1).real
        left = np.where(ok, K * np.exp(u_left) / A, np.nan)
        right = np.where(ok, K * np.exp(u_right) / A, np.nan)
    if left.ndim == 0:
        return left[()], right[()]
    return left, right


def uniform_field_voltage(x: ArrayLike, law: UniformFieldLaw) -> NDArray[np.float64]:
    """The empirical air law, V_b = a x + b sqrt(x) in V, x = delta d in m.

    >>> law = UniformFieldLaw(24.22e5, 6.08e4, 101325.0, 293.0, 5e-5, 2e-4, 0.1, "")
    >>> round(float(uniform_field_voltage(0.01, law)))   # 1 cm of air at 1 atm, 20 C
    30300
    """
    x = np.asarray(x, dtype=float)
    return law.a * x + law.b * np.sqrt(x)


def _law_x(pd: NDArray, T_ref: float, law: UniformFieldLaw) -> NDArray:
    # pd is reduced to T_ref; delta d re-references it to the law's own p_ref, T_ref.
    return pd * (law.reference_temperature / T_ref) / law.reference_pressure


def _law_weight(x: NDArray, law: UniformFieldLaw) -> NDArray:
    """Smoothstep in ln x from 0 at blend_from to 1 at blend_to."""
    t = np.clip(np.log(x / law.blend_from) / math.log(law.blend_to / law.blend_from), 0.0, 1.0)
    return t * t * (3.0 - 2.0 * t)


def breakdown_voltage_with_law(
    pd: ArrayLike,
    c: TownsendConstants,
    gamma: float,
    law: UniformFieldLaw | None,
) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
    """V_b (V) with the high-pd empirical law blended in where one is given.

    Returns (V_b, w) where w in [0, 1] is the weight of the empirical law at each pd
    (0: Paschen's law alone, 1: the empirical law alone). Without a law, w is 0.
    """
    pd = np.asarray(pd, dtype=float)
    v = breakdown_voltage(pd, c.A, c.B, gamma)
    if law is None:
        return v, np.zeros_like(v, dtype=float)
    x = _law_x(pd, c.reference_temperature, law)
    w = _law_weight(x, law)
    mixed = (1.0 - w) * v + w * uniform_field_voltage(x, law)
    return np.where(w > 0, mixed, v), w


def inverse_pd_with_law(
    V: ArrayLike, c: TownsendConstants, gamma: float, law: UniformFieldLaw | None
) -> tuple[NDArray, NDArray]:
    """Both pd (Pa m) where :func:`breakdown_voltage_with_law` reaches V.

    The left branch lies far below the law's range and is Paschen's alone; on the
    right branch the blended curve is monotonic and lies between the two laws, so its
    root lies between their closed-form roots and is bracketed by bisection in ln pd.
    """
    left, right = inverse_pd(V, c.A, c.B, gamma)
    if law is None:
        return left, right
    V = np.asarray(V, dtype=float)
    # Closed-form root of a x + b sqrt(x) = V for x, then back to reduced pd.
    s = (-law.b + np.sqrt(law.b**2 + 4.0 * law.a * V)) / (2.0 * law.a)
    pd_law = s * s * law.reference_pressure * c.reference_temperature / law.reference_temperature
    lo = np.fmin(right, pd_law)
    hi = np.fmax(right, pd_law)
    need = np.isfinite(right) & (
        _law_weight(_law_x(np.where(np.isfinite(hi), hi, 1.0), c.reference_temperature, law), law) > 0
    )
    if np.any(need):
        a = np.log(np.where(need, lo, 1.0))
        b = np.log(np.where(need, hi, 1.0))
        for _ in range(60):
            mid = 0.5 * (a + b)
            vm, _w = breakdown_voltage_with_law(np.exp(mid), c, gamma, law)
            below = vm < V
            a = np.where(below, mid, a)
            b = np.where(below, b, mid)
        right = np.where(need, np.exp(0.5 * (a + b)), right)
    if np.ndim(right) == 0:
        return left, right[()]
    return left, right
