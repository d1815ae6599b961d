"""Fit this bench's breakdown curve to the strikes recorded on it.

The bench curve is the fill's own law (:class:`~strikeline.model.breakdown.Law`) with three scales:
its ionisation alpha/p times s ("A"), its field axis times b ("B": alpha/p(y) becomes s a(y/b)) and
its gamma times g ("gamma"). For Paschen's closed form these are exactly A, B and gamma; for any law
they move the curve as A, B and gamma move Paschen's. The free ones of theta = (ln s, ln b, ln g) are
fitted to observed (reduced pd, V) points with :func:`scipy.optimize.least_squares`, residuals on
ln V (a 5 % miss counts the same at 200 V and at 2 kV) and a soft-L1 loss so one bad mark cannot drag
the fit. The ionisation scale and gamma move the curve almost alike (for a constant gamma exactly:
only s / ln(1 + 1/g) counts), so at most one of them is free. Uncertainties come from the Jacobian at
the solution, J^T J scaled by the residual variance, with Student-t quantiles for the small numbers
of points a bench yields; the prediction band for a new strike adds the scatter of single strikes to
the curve's own uncertainty (delta method).

SI throughout: pd in Pa m at the data's reference density, V in V.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import cached_property

import numpy as np
from numpy.typing import ArrayLike, NDArray

from . import mixture as mx
from .bench import BenchCurve
from .breakdown import Law, uniform_field_voltage, uniform_weight

__all__ = ["PARAMETERS", "FitRefused", "FitResult", "ScaledLaw", "fit_curve", "prediction_band"]

PARAMETERS = ("A", "B", "gamma")
"""The scales a fit may free: ionisation (A), field (B), gamma."""
_NO_BREAKDOWN_RESIDUAL = 5.0  # ln V residual for a point the trial curve cannot break down
_STEP = 1e-4  # ln-scale step of the numerical derivatives


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


@dataclass(frozen=True)
class ScaledLaw:
    """A law's curve under any scales theta = (ln s, ln b, ln g), worked out quickly on the law's own
    traced field grid (the coefficients there are computed once)."""

    law: Law
    """The unscaled law (scales 1)."""

    @cached_property
    def _grid(self) -> tuple[NDArray, NDArray, NDArray, NDArray]:
        _pd, _v, u = self.law.table
        u = u[::-1].copy()  # ascending field: pd falls along it
        return u, mx.ionisation_per_p(self.law.fill, u), mx.attachment_per_p(self.law.fill, u), self.law.g(u)

    def voltage(self, rpd: ArrayLike, theta: ArrayLike) -> NDArray[np.float64]:
        """V_b (V; NaN where none) at reduced pd ``rpd`` under the scales ``theta``."""
        s, b, g = np.exp(np.asarray(theta, dtype=float))
        u, a, e, gam = self._grid
        pd = mx.pd_at(s * a, e, g * gam)
        ok = np.isfinite(pd)
        pd, v = pd[ok][::-1], (b * u[ok] * pd[ok])[::-1]  # pd ascending
        rpd = np.asarray(rpd, dtype=float)
        if pd.size < 2:
            return np.full(rpd.shape, np.nan)
        with np.errstate(divide="ignore", invalid="ignore"):
            lnv = np.interp(np.log(rpd), np.log(pd), np.log(v), left=np.nan, right=np.nan)
            out = np.exp(lnv)
            far = rpd > pd[-1]
            out = np.where(far, v[-1] / pd[-1] * rpd, out)  # beyond the table: the last field
        law = self.law.uniform
        if law is not None:
            T = self.law.reference_temperature
            w = uniform_weight(rpd, T, law)
            x = rpd * (law.reference_temperature / T) / law.reference_pressure
            out = np.where(w > 0, (1 - w) * out + w * uniform_field_voltage(x, law), out)
        return out

    def gradient(self, rpd: ArrayLike, theta: ArrayLike) -> NDArray[np.float64]:
        """d ln V_b / d theta at each rpd, shape (n, 3) (central differences)."""
        theta = np.asarray(theta, dtype=float)
        cols = []
        for i in range(3):
            up, dn = theta.copy(), theta.copy()
            up[i] += _STEP
            dn[i] -= _STEP
            with np.errstate(divide="ignore", invalid="ignore"):
                cols.append((np.log(self.voltage(rpd, up)) - np.log(self.voltage(rpd, dn))) / (2 * _STEP))
        return np.stack(cols, axis=-1)


def fit_curve(
    pd: ArrayLike,
    voltage: ArrayLike,
    law: Law,
    *,
    free: tuple[str, ...] = ("A", "B"),
    gas: str = "",
    cathode: str = "",
    fitted_on: str = "",
    level: float = 0.95,
) -> FitResult:
    """Fit the free scales of ``law`` (unscaled: the fill's textbook law on this cathode) to strikes at
    ``pd`` (Pa m, reduced) and ``voltage`` (V). Raises :class:`FitRefused`.

    Trial steps of the optimiser may run the curve off its range; those are judged below (a degenerate
    or non-finite fit is refused), so numpy's warnings about them are not passed on."""
    with np.errstate(all="ignore"):
        return _fit(np.asarray(pd, dtype=float), np.asarray(voltage, dtype=float), law, free, gas, cathode,
                    fitted_on, level)  # fmt: skip


def _refusals(pd, v, free, law: Law) -> None:
    n, k = len(pd), len(free)
    if not free or set(free) - set(PARAMETERS):
        raise FitRefused(f"choose which of A, B, gamma to fit (got {', '.join(free) or 'none'})")
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
            "the ionisation scale A and gamma move the curve almost alike (for a constant gamma only "
            "A / ln(1 + 1/gamma) counts), so no set of strikes can tell them apart; fit A,B (gamma from the "
            "cathode data) or B,gamma"
        )
    pd_min0, _ = law.minimum()
    left, right = int(np.sum(pd < pd_min0)), int(np.sum(pd >= pd_min0))
    if "gamma" in free and "B" in free and (left == 0 or right == 0):
        side, other = ("right", "below") if left == 0 else ("left", "above")
        raise FitRefused(
            f"all {n} points are {side} of the curve's minimum (reduced pd {pd_min0:.3g} Pa m): with B free, gamma "
            f"is pinned by where the minimum sits; record strikes on the other side of the minimum (pd {other} "
            f"{pd_min0:.3g} Pa m), or fit gamma alone"
        )
    if np.ptp(np.log(pd)) < math.log(1.3) and k >= 2:
        raise FitRefused(
            f"the points span reduced pd {pd.min():.3g}-{pd.max():.3g} Pa m only: too narrow for {k} parameters; "
            "record strikes over a wider range of pressure or gap"
        )


def _fit(pd, v, law, free, gas, cathode, fitted_on, level) -> FitResult:
    from scipy import optimize, stats

    free = tuple(p for p in PARAMETERS if p in free) if set(free) <= set(PARAMETERS) else tuple(free)
    _refusals(pd, v, free, law)
    n, k = len(pd), len(free)
    scaled = ScaledLaw(law)
    idx = [PARAMETERS.index(p) for p in free]
    theta0 = np.zeros(3)

    def full(x):
        th = theta0.copy()
        th[idx] = x
        return th

    ln_v = np.log(v)

    def residuals(x):
        model = scaled.voltage(pd, full(x))
        return np.where(np.isfinite(model) & (model > 0), np.log(np.where(model > 0, model, 1.0)) - ln_v,
                        _NO_BREAKDOWN_RESIDUAL)  # fmt: skip

    def jac(x):
        g = scaled.gradient(pd, full(x))[:, idx]
        return np.where(np.isfinite(g), g, 0.0)

    res = optimize.least_squares(residuals, np.zeros(k), jac=jac, loss="soft_l1", f_scale=0.05, x_scale="jac")
    theta = full(res.x)
    r = residuals(res.x)
    J = jac(res.x)
    s2 = float(np.sum(r**2) / (n - k))
    JTJ = J.T @ J
    cond = np.linalg.cond(JTJ) if JTJ.size else math.inf
    if not (np.all(np.isfinite(res.x)) and np.all(np.isfinite(JTJ))):
        raise FitRefused(
            f"the fit of {', '.join(free)} ran off to values that are not finite numbers: the strikes do not "
            "follow a breakdown curve here; check them, or fit fewer parameters"
        )
    if not np.isfinite(cond) or cond > 1e10:
        raise FitRefused(
            f"the points cannot separate {', '.join(free)} (the fit is degenerate: condition number "
            f"{cond:.2g}); fit fewer of them, or add strikes spread over both sides of the minimum"
        )
    cov = np.zeros((3, 3))
    cov[np.ix_(idx, idx)] = np.linalg.inv(JTJ) * s2
    fitted_v = scaled.voltage(pd, theta)
    resid_v = v - fitted_v
    warnings: list[str] = []
    if not res.success:
        warnings.append(f"the optimiser stopped early: {res.message}")
    scale = math.sqrt(s2)
    for i in np.flatnonzero(np.abs(r) > 3 * max(scale, 0.01)):
        warnings.append(
            f"point {i + 1} (reduced pd {pd[i]:.3g} Pa m, {v[i]:.0f} V) is {r[i]:+.0%} off the fit: check it"
        )
    if np.any(~np.isfinite(fitted_v)):
        warnings.append("some points lie where the fitted curve has no breakdown: the fit cannot describe them")
    s, b, g = np.exp(theta)
    g_min = g * law.gamma
    if not 1e-6 < g_min < 1:
        warnings.append(
            f"the fitted gamma at the minimum, {g_min:.3g}, is outside 0-1: the strikes may not follow the law"
        )
    curve = BenchCurve(
        alpha_scale=float(s),
        field_scale=float(b),
        gamma_scale=float(g),
        covariance=tuple(tuple(float(x) for x in row) for row in cov),
        rms_residual=float(np.sqrt(np.nanmean(resid_v**2))),
        n_points=n,
        pd_low=float(pd.min()),
        pd_high=float(pd.max()),
        gas=gas,
        cathode=cathode,
        fitted_on=fitted_on,
        residual_scale=scale,
        t_quantile=float(stats.t.ppf(0.5 + level / 2, n - k)),
        free=free,
        marks=tuple((float(x), float(y)) for x, y in zip(pd, v, strict=True)),
    )
    return FitResult(curve, tuple(float(x) for x in resid_v), tuple(warnings), free, float(res.cost))


def prediction_band(curve: BenchCurve, law: Law, rpd: ArrayLike) -> tuple[NDArray, NDArray, NDArray]:
    """(V_b, low, high) at reduced pd ``rpd`` (Pa m): where the next strike should fall on the fitted
    curve. ``law`` is the curve's own unscaled law (scales 1).

    ln V +/- t sqrt(g^T C g + s^2), with g = d ln V_b / d theta, C the scales' covariance, s the
    scatter of single strikes about the curve and t the Student-t quantile.
    """
    rpd = np.atleast_1d(np.asarray(rpd, dtype=float))
    theta = np.log([curve.alpha_scale, curve.field_scale, curve.gamma_scale])
    scaled = ScaledLaw(law)
    with np.errstate(all="ignore"):  # far from the fit the band may run to 0 or inf: drawn, never warned
        v = scaled.voltage(rpd, theta)
        g = scaled.gradient(rpd, theta)
        var = np.einsum("ni,ij,nj->n", g, np.asarray(curve.covariance), g) + curve.residual_scale**2
        half = curve.t_quantile * np.sqrt(var)
        return v, v * np.exp(-half), v * np.exp(half)
