"""Fit this bench's breakdown curve to the strikes recorded on it.

Paschen's law V_b = B pd / (ln(A pd) - ln ln(1 + 1/gamma)) is fitted to observed
(reduced pd, V) points with :func:`scipy.optimize.least_squares`. Parameters are
theta = (ln A, ln B, ln gamma) - positive by construction and of similar scale - and
residuals are on ln V, so a 5 % miss counts the same at 200 V and at 2 kV. A soft-L1 loss
keeps one bad mark from dragging the fit. A and gamma appear only as A / ln(1 + 1/gamma),
so at most one of them can be free. Uncertainties come from the Jacobian at the
solution, J^T J scaled by the residual variance (Gauss-Newton covariance), with Student-t
quantiles for the small numbers of points a bench yields. The prediction band for a new
strike adds the scatter of single strikes to the curve's own uncertainty (delta method).

SI throughout: pd in Pa m at the gas constants' reference density, V in V.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from .bench import BenchCurve
from .paschen import minimum

__all__ = ["FitRefused", "FitResult", "fit_curve", "prediction_band", "PARAMETERS"]

PARAMETERS = ("A", "B", "gamma")
_NO_BREAKDOWN_RESIDUAL = 5.0  # ln V residual for a point the trial curve cannot break down


class FitRefused(ValueError):
    """The data cannot support the fit asked for; the message says why and what would help."""


@dataclass(frozen=True)
class FitResult:
    curve: BenchCurve
    residuals: tuple[float, ...]
    """Observed minus fitted voltage per point, V."""
    warnings: tuple[str, ...]
    free: tuple[str, ...]
    cost: float


def _vb(theta: NDArray, pd: NDArray) -> NDArray:
    A, B, g = np.exp(theta)
    K = math.log1p(1.0 / g)
    denom = np.log(A * pd / K)
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(denom > 1e-9, B * pd / np.where(denom > 1e-9, denom, 1.0), np.nan)


def _ln_vb_grad(theta: NDArray, pd: NDArray) -> NDArray:
    """d ln V_b / d theta at each pd, shape (n, 3)."""
    A, B, g = np.exp(theta)
    K = math.log1p(1.0 / g)
    u = np.log(A * pd / K)
    # ln V = ln B + ln pd - ln u;  du/dlnA = 1;  du/dln g = -(dK/dg) g / K
    dK_dlng = -(1.0 / (g * (1.0 + g))) * g  # dK/dg * g, with dK/dg = -1/(g (1+g))
    du_dlng = -dK_dlng / K
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.stack([-1.0 / u, np.ones_like(u), -du_dlng / u], axis=-1)


def fit_curve(
    pd: ArrayLike,
    voltage: ArrayLike,
    *,
    A: float,
    B: float,
    gamma: float,
    free: tuple[str, ...] = ("A", "B"),
    gas: str = "",
    cathode: str = "",
    fitted_on: str = "",
    level: float = 0.95,
) -> FitResult:
    """Fit the free ones of A (1/(Pa m)), B (V/(Pa m)), gamma to strikes at ``pd`` (Pa m, reduced)
    and ``voltage`` (V); the others stay at the values given. Raises :class:`FitRefused`.

    Trial steps of the optimiser may overflow (gamma toward 0, A toward infinity); those numbers
    are judged below (a degenerate or non-finite fit is refused), so numpy's warnings about them
    are not passed on."""
    with np.errstate(all="ignore"):
        return _fit(pd, voltage, A, B, gamma, free, gas, cathode, fitted_on, level)


def _fit(pd, voltage, A, B, gamma, free, gas, cathode, fitted_on, level) -> FitResult:
    from scipy import optimize, stats

    pd = np.asarray(pd, dtype=float)
    v = np.asarray(voltage, dtype=float)
    free = tuple(p for p in PARAMETERS if p in free)
    unknown = set(free) - set(PARAMETERS)
    if not free or unknown:
        raise FitRefused(f"choose which of A, B, gamma to fit (got {', '.join(free) or 'none'})")
    n, k = len(pd), len(free)
    if pd.shape != v.shape:
        raise FitRefused(f"{len(pd)} pd values but {len(v)} voltages")
    bad = np.flatnonzero(~(np.isfinite(pd) & np.isfinite(v) & (pd > 0) & (v > 0)))
    if bad.size:
        raise FitRefused(f"point {bad[0] + 1} has a pd or voltage that is not a positive number")
    if n < k + 2:
        raise FitRefused(
            f"too few points: {n} strike(s) for {k} free parameter(s); record at least {k + 2}, spread over pd"
        )
    if "A" in free and "gamma" in free:
        raise FitRefused(
            "A and gamma enter Paschen's law only as A / ln(1 + 1/gamma), so no set of strikes can tell them "
            "apart; fit A,B (gamma from the cathode data) or B,gamma (A from the gas data)"
        )
    theta0 = np.log([A, B, gamma])
    pd_min0, _ = minimum(A, B, gamma)
    left, right = int(np.sum(pd < pd_min0)), int(np.sum(pd >= pd_min0))
    if "gamma" in free and "B" in free and (left == 0 or right == 0):
        side, other = ("right", "below") if left == 0 else ("left", "above")
        raise FitRefused(
            f"all {n} points are {side} of the Paschen minimum (pd {pd_min0:.3g} Pa m): with B free, gamma is "
            f"pinned by where the minimum sits; record strikes on the other side of the minimum (pd {other} "
            f"{pd_min0:.3g} Pa m), or fit gamma alone"
        )
    if np.ptp(np.log(pd)) < math.log(1.3) and k >= 2:
        raise FitRefused(
            f"the points span pd {pd.min():.3g}-{pd.max():.3g} Pa m only: too narrow for {k} parameters; "
            "record strikes over a wider range of pressure or gap"
        )
    idx = [PARAMETERS.index(p) for p in free]

    def full(x):
        th = theta0.copy()
        th[idx] = x
        return th

    ln_v = np.log(v)

    def residuals(x):
        model = _vb(full(x), pd)
        return np.where(
            np.isfinite(model) & (model > 0), np.log(np.where(model > 0, model, 1.0)) - ln_v, _NO_BREAKDOWN_RESIDUAL
        )

    def jac(x):
        g = _ln_vb_grad(full(x), pd)[:, idx]
        model = _vb(full(x), pd)
        return np.where(np.isfinite(model)[:, None], g, 0.0)

    res = optimize.least_squares(residuals, theta0[idx], jac=jac, loss="soft_l1", f_scale=0.05, x_scale="jac")
    theta = full(res.x)
    r = residuals(res.x)
    J = jac(res.x)
    dof = n - k
    s2 = float(np.sum(r**2) / dof)
    JTJ = J.T @ J
    cond = np.linalg.cond(JTJ) if JTJ.size else math.inf
    if not np.isfinite(cond) or cond > 1e10:
        raise FitRefused(
            f"the points cannot separate {', '.join(free)} (the fit is degenerate: condition number "
            f"{cond:.2g}); fit fewer of them, or add strikes spread over both sides of the minimum"
        )
    if not (np.all(np.isfinite(res.x)) and np.all(np.isfinite(JTJ))):
        raise FitRefused(
            f"the fit of {', '.join(free)} ran off to values that are not finite numbers: the strikes do not "
            "follow Paschen's law here; check them, or fit fewer parameters"
        )
    cov_free = np.linalg.inv(JTJ) * s2
    cov = np.zeros((3, 3))
    cov[np.ix_(idx, idx)] = cov_free
    sig = np.sqrt(np.diag(cov))
    A_f, B_f, g_f = np.exp(theta)
    fitted_v = _vb(theta, pd)
    resid_v = v - fitted_v
    warnings: list[str] = []
    if not res.success:
        warnings.append(f"the optimiser stopped early: {res.message}")
    scale = math.sqrt(s2)
    for i in np.flatnonzero(np.abs(r) > 3 * max(scale, 0.01)):
        warnings.append(f"point {i + 1} (pd {pd[i]:.3g} Pa m, {v[i]:.0f} V) is {r[i]:+.0%} off the fit: check it")
    if np.any(~np.isfinite(fitted_v)):
        warnings.append("some points lie where the fitted curve has no breakdown: the fit cannot describe them")
    if not 1e-6 < g_f < 1:
        warnings.append(f"fitted gamma {g_f:.3g} is outside 0-1: the data may not follow Paschen's law")
    t = float(stats.t.ppf(0.5 + level / 2, dof))
    curve = BenchCurve(
        A=float(A_f),
        B=float(B_f),
        gamma=float(g_f),
        A_sigma=float(A_f * sig[0]),
        B_sigma=float(B_f * sig[1]),
        gamma_sigma=float(g_f * sig[2]),
        covariance=tuple(tuple(float(x) for x in row) for row in cov),
        rms_residual=float(np.sqrt(np.nanmean(resid_v**2))),
        n_points=n,
        pd_low=float(pd.min()),
        pd_high=float(pd.max()),
        gas=gas,
        cathode=cathode,
        fitted_on=fitted_on,
        residual_scale=scale,
        t_quantile=t,
        free=free,
        marks=tuple((float(x), float(y)) for x, y in zip(pd, v, strict=True)),
    )
    return FitResult(curve, tuple(float(x) for x in resid_v), tuple(warnings), free, float(res.cost))


def prediction_band(curve: BenchCurve, pd: ArrayLike) -> tuple[NDArray, NDArray, NDArray]:
    """(V_b, low, high) at ``pd`` (Pa m, reduced): where the next strike should fall.

    ln V +/- t sqrt(g^T C g + s^2), with g = d ln V_b / d theta, C the parameter covariance,
    s the scatter of single strikes about the curve and t the Student-t quantile.
    """
    pd = np.atleast_1d(np.asarray(pd, dtype=float))
    theta = np.log([curve.A, curve.B, curve.gamma])
    with np.errstate(all="ignore"):  # far from the fit the band may run to 0 or inf: drawn, never warned
        v = _vb(theta, pd)
        g = _ln_vb_grad(theta, pd)
        C = np.asarray(curve.covariance)
        var = np.einsum("ni,ij,nj->n", g, C, g) + curve.residual_scale**2
        half = curve.t_quantile * np.sqrt(var)
        return v, v * np.exp(-half), v * np.exp(half)
