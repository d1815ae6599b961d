"""Paschen's law in its closed form: the textbook view of a breakdown law with one A, B pair and a
constant gamma (the law a gas's data reduce to in the classic tables; the tool's own curves come from
:mod:`.breakdown`, which is exactly this law for one exp segment and a constant gamma).

SI throughout: ``pd`` in Pa m at the reference gas density of the constants, A in 1/(Pa m), B in
V/(Pa m), voltages in V. Every function is vectorised over numpy arrays.

Townsend's criterion gamma (exp(alpha d) - 1) = 1 with alpha = A p exp(-B p/E) and
E = V/d gives Paschen's law

    V_b = B pd / (ln(A pd) - ln(ln(1 + 1/gamma)))

([raizer-1991] eq. 7.4). The
denominator falls to zero at pd_0 = ln(1 + 1/gamma)/A: at or below it no voltage breaks
the gap down (the law gives a negative or infinite number, reported here as NaN).
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import ArrayLike, NDArray

from .townsend import breakdown_alpha_d

__all__ = [
    "branch",
    "breakdown_E_over_p",
    "breakdown_voltage",
    "inverse_pd",
    "minimum",
    "no_breakdown_pd",
]


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
