"""The bench's breakdown law, whatever is in the chamber: V_b(pd), its minimum, its branches.

:func:`breakdown_law` gives a :class:`PaschenLaw` for a pure gas (Paschen's law in closed form,
with the uniform-field law of air blended in: the same numbers as :mod:`.paschen`, bit for bit)
or a :class:`MixtureLaw` for a mixture (linear mixing with attachment, :mod:`.mixture`). Everything
that draws or judges a breakdown curve (forecast, curve panel, ``curve``, calibration) asks the law,
never the gas constants themselves.

SI: pd in Pa m reduced to the constants' reference density, E/p in V/(Pa m), voltages in V.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass
from functools import cached_property, lru_cache

import numpy as np
from numpy.typing import ArrayLike, NDArray

from . import mixture as mx
from . import paschen, townsend
from .bench import Bench, Component, Gas, Mixture, TownsendConstants, UniformFieldLaw

__all__ = ["MixtureLaw", "PaschenLaw", "alternating_law", "breakdown_law", "gas_law", "solved_mixture", "trace"]

_TABLE = 4096
"""Points of a mixture's parametric curve, before refinement; linear interpolation between them is
good to about 1e-5."""
_MAX_LN_PD_STEP = 2e-3
"""Largest step of ln pd between table points: where pd moves faster than ln E/p, points are added."""
_PD_TOP = 1e8
"""Pa m: the table ends past this reduced pd (the accepted pd ends at 1e7, model/limits.py)."""
_ZOOM = 256
"""Points of each finer grid that closes in on the attachment limit and the minimum."""
_EXACT_BELOW = 64
"""Arrays up to this size are polished to the exact root; longer ones are read off the table."""


@dataclass(frozen=True)
class PaschenLaw:
    """Paschen's law of one gas (and the uniform-field law of air where it has one)."""

    constants: TownsendConstants
    gamma: float
    law: UniformFieldLaw | None = None
    mixture = None

    @property
    def reference_temperature(self) -> float:
        return self.constants.reference_temperature

    @property
    def effective_constants(self) -> TownsendConstants:
        """The A, B pair that stands for this law (a fit starts from it): the gas's own."""
        return self.constants

    def with_gamma(self, gamma: float) -> PaschenLaw:
        return PaschenLaw(self.constants, gamma, self.law)

    def voltage(self, rpd: ArrayLike) -> tuple[NDArray, NDArray]:
        """(V_b in V, NaN where none; weight of the uniform-field law, 0 to 1)."""
        return paschen.breakdown_voltage_with_law(rpd, self.constants, self.gamma, self.law)

    def minimum(self) -> tuple[float, float]:
        return paschen.minimum(self.constants.A, self.constants.B, self.gamma)

    def no_breakdown_pd(self) -> float:
        return paschen.no_breakdown_pd(self.constants.A, self.gamma)

    def branch(self, rpd: ArrayLike) -> NDArray:
        return paschen.branch(rpd, self.constants.A, self.gamma)

    def e_over_p(self, rpd: ArrayLike) -> NDArray:
        return paschen.breakdown_E_over_p(rpd, self.constants.A, self.gamma, self.constants.B)

    def alpha(self, E: float, p: float) -> float:
        """Ionisation coefficient alpha (1/m) at field E (V/m) and reduced pressure p (Pa)."""
        return float(townsend.alpha(E, p, self.constants.A, self.constants.B))

    def eta(self, E: float, p: float) -> float:
        return 0.0


@dataclass(frozen=True)
class MixtureLaw:
    """Breakdown of a gas mixture by linear mixing with attachment (:mod:`.mixture`).

    The criterion is explicit in E/p: pd(y) = ln(1 + z)/(gamma a z) (:func:`.mixture.pd_at`), so
    the curve is traced over y once (a table); a point is read off it by interpolation and, for a
    few points, polished to the criterion's own root by secant steps.
    """

    mixture: Mixture
    gammas: tuple[float, ...]
    """Each component's gamma on this cathode, in component order."""
    law = None

    @property
    def reference_temperature(self) -> float:
        return self.mixture.main.constants.reference_temperature

    @cached_property
    def gamma(self) -> float:
        """The yield at the curve's minimum (the one the forecast quotes)."""
        return float(mx.gamma_of(self.mixture, self.gammas, self.y_at_minimum))

    def with_gammas(self, gammas: tuple[float, ...]) -> MixtureLaw:
        return MixtureLaw(self.mixture, gammas)

    # -- the curve, traced over E/p ------------------------------------------------------

    def _pd(self, y):
        return mx.pd_at(self.mixture, self.gammas, y)

    @cached_property
    def y_range(self) -> tuple[float, float]:
        """E/p from just above the attachment limit (or a field too low to ionise) to a field so high
        that pd sits on the left asymptote."""
        bs = [c.gas.constants.B for c in self.mixture.components]
        lo, hi = min(bs) / 60.0, 1e6 * max(bs)  # exp(-60): no ionisation worth the name below lo
        a, b = lo, hi
        for _ in range(4):
            # Attachment ends the criterion below some field: close in on the highest such field, each
            # grid _ZOOM times finer. (A two-body attachment fit that falls to zero at still lower fields
            # leaves a criterion met there only at absurd pd: the highest limit is the one that counts.)
            y = np.geomspace(a, b, _ZOOM)
            ended = np.flatnonzero(~np.isfinite(self._pd(y)))
            if ended.size == 0 or ended[-1] == _ZOOM - 1:
                break
            k = int(ended[-1])
            a, b = float(y[k]), float(y[k + 1])
            lo = b
        return lo, hi

    @cached_property
    def table(self) -> tuple[NDArray, NDArray, NDArray]:
        """(pd ascending, V, y) of the traced curve: even steps in ln E/p, with more points put in
        wherever pd runs ahead of them (towards the attachment limit, pd grows without bound)."""
        lo, hi = self.y_range
        kinks = [k for k in self._kinks() if lo < k < hi]
        y, pd = trace(math.log(hi), math.log(lo), self._pd, kinks)
        return pd, y * pd, y

    def _kinks(self) -> list[float]:
        """E/p (V/(Pa m)) where a component's fit switches branch."""
        out = []
        for c in self.mixture.components:
            if c.gas.low_field is not None:
                out.append(c.gas.constants.E_over_p_low)
            at = c.gas.attachment
            if at is not None:
                out += [at.switch, at.valid_high]
                for k1, k0 in ((at.k1_low, at.k0_low), (at.k1_high, at.k0_high)):
                    if k1 > 0 and k0 < 0:
                        out.append(-k0 / k1)  # where a branch falls to zero (eta is never negative)
        return out

    @cached_property
    def y_at_minimum(self) -> float:
        """E/p at the curve's minimum: the table's least V, then two finer grids around it."""
        _pd, v, y = self.table
        i = int(np.argmin(v))
        lo, hi = y[min(i + 1, len(y) - 1)], y[max(i - 1, 0)]
        for _ in range(2):
            grid = np.geomspace(lo, hi, _ZOOM)
            j = int(np.nanargmin(grid * self._pd(grid)))
            lo, hi = grid[max(j - 1, 0)], grid[min(j + 1, _ZOOM - 1)]
        return float(np.sqrt(lo * hi))

    def minimum(self) -> tuple[float, float]:
        y = self.y_at_minimum
        pd = float(self._pd(y))
        return pd, y * pd

    @cached_property
    def effective_constants(self) -> TownsendConstants:
        """An A, B pair through the mixture's alpha/p at E/p 1.5 times either side of the curve's
        minimum (a fit of Paschen's law to this bench's strikes starts from it)."""
        y0 = self.y_at_minimum
        y1, y2 = y0 / 1.5, y0 * 1.5
        a1, a2 = (float(mx.mixture_ionisation(self.mixture, y)) for y in (y1, y2))
        B = math.log(a2 / a1) / (1.0 / y1 - 1.0 / y2)
        A = a2 * math.exp(B / y2)
        source = f"effective A, B of {self.mixture.key} near its minimum (linear mixing)"
        return TownsendConstants(A, B, y0 / 3, y0 * 3, self.reference_temperature, source)

    @cached_property
    def critical_E_over_p(self) -> float | None:
        """E/p where alpha = eta (V/(Pa m)); None: nothing attaches (:func:`.mixture.critical_E_over_p`)."""
        return mx.critical_E_over_p(self.mixture)

    @cached_property
    def _pd0(self) -> float:
        return float(self._pd(self.y_range[1]))

    def no_breakdown_pd(self) -> float:
        return self._pd0

    # -- a point or many -----------------------------------------------------------------

    def e_over_p(self, rpd: ArrayLike) -> NDArray:
        """E/p at breakdown (V/(Pa m)) for each reduced pd; NaN where nothing breaks down. Beyond the
        traced range the field is the attachment limit's (a long gap breaks down there)."""
        rpd = np.asarray(rpd, dtype=float)
        pd, _v, y = self.table
        with np.errstate(divide="ignore", invalid="ignore"):
            lnpd = np.log(rpd)
            lny = np.interp(lnpd, np.log(pd), np.log(y), left=np.nan, right=math.log(y[-1]))
            if rpd.size <= _EXACT_BELOW:
                lny = self._refine(lny, lnpd, math.log(y[-1]))
        out = np.where(rpd > self.no_breakdown_pd(), np.exp(lny), np.nan)
        return out if out.ndim else out[()]

    def _refine(self, lny: NDArray, lnpd: NDArray, lny_limit: float) -> NDArray:
        """Polish the table's E/p to the criterion's own root: secant steps on ln pd(ln y) - ln pd,
        each point bracketed by the table's neighbours so a step never leaves it."""
        lny = np.array(lny, dtype=float)
        inside = np.isfinite(lny) & (lny > lny_limit)
        if not np.any(inside):
            return lny
        step = 2.0 * math.log(self.y_range[1] / self.y_range[0]) / _TABLE
        x0, x1 = lny[inside] - step, lny[inside]
        target = lnpd[inside]
        f0 = np.log(self._pd(np.exp(x0))) - target
        f1 = np.log(self._pd(np.exp(x1))) - target
        for _ in range(3):
            with np.errstate(divide="ignore", invalid="ignore"):
                x2 = np.where(f1 != f0, x1 - f1 * (x1 - x0) / (f1 - f0), x1)
            x2 = np.where(np.isfinite(x2), np.clip(x2, x1 - 4 * step, x1 + 4 * step), x1)
            if np.all(np.abs(x2 - x1) < 1e-14):
                x1 = x2
                break
            x0, f0, x1 = x1, f1, x2
            f1 = np.log(self._pd(np.exp(x1))) - target
        lny[inside] = x1
        return lny

    def voltage(self, rpd: ArrayLike) -> tuple[NDArray, NDArray]:
        """(V_b in V, NaN where none; zeros: no uniform-field law is mixed in)."""
        rpd = np.asarray(rpd, dtype=float)
        if rpd.size <= _EXACT_BELOW:
            v = self.e_over_p(rpd) * rpd
        else:
            pd, vt, y = self.table  # pd[0] is the asymptote: left of it, NaN
            v = np.interp(rpd, pd, vt, left=np.nan, right=np.nan)
            far = rpd > pd[-1]
            if far.any():  # beyond the table: the field is the limit's
                v[far] = y[-1] * rpd[far]
        return v, np.zeros(np.shape(v))

    def branch(self, rpd: ArrayLike) -> NDArray:
        rpd = np.asarray(rpd, dtype=float)
        pd_min, _ = self.minimum()
        return np.where(rpd <= self.no_breakdown_pd(), "none", np.where(rpd < pd_min, "left", "right"))

    def alpha(self, E: float, p: float) -> float:
        return float(p * mx.mixture_ionisation(self.mixture, E / p))

    def eta(self, E: float, p: float) -> float:
        return float(p * mx.mixture_attachment(self.mixture, E / p))


def trace(start: float, end: float, pd_of: Callable[[NDArray], NDArray], kinks=()) -> tuple[NDArray, NDArray]:
    """A curve pd(x) traced from ln x = ``start`` towards ``end`` while pd grows: even steps in ln x,
    more points wherever ln pd moves by over _MAX_LN_PD_STEP between two, ``kinks`` (where a fit
    changes branch) as points of their own, and an end past _PD_TOP (no bench reaches such pd).
    Returns (x, pd) in trace order, pd finite and rising."""
    lnx = np.linspace(start, end, _TABLE)
    lnx = np.concatenate((lnx, [math.log(k) for k in kinks]))
    lnx = np.sort(lnx) if end > start else np.sort(lnx)[::-1]
    pd = pd_of(np.exp(lnx))
    beyond = np.flatnonzero(pd > _PD_TOP)
    if beyond.size:
        lnx, pd = lnx[: beyond[0] + 1], pd[: beyond[0] + 1]
    steps = np.abs(np.diff(np.log(pd)))
    extra = np.nan_to_num(np.ceil(steps / _MAX_LN_PD_STEP) - 1, nan=0.0).clip(0, _TABLE).astype(int)
    if extra.any():
        # each interval i gets extra[i] evenly spaced points between lnx[i] and lnx[i + 1]
        starts = np.repeat(lnx[:-1], extra)
        widths = np.repeat(np.diff(lnx) / (extra + 1), extra)
        rank = np.arange(extra.sum()) - np.repeat(np.cumsum(extra) - extra, extra) + 1
        new = starts + rank * widths
        both = np.concatenate((lnx, new))
        order = np.argsort(both if end > start else -both, kind="stable")
        lnx = both[order]
        pd = np.concatenate((pd, pd_of(np.exp(new))))[order]
    x = np.exp(lnx)
    keep = np.isfinite(pd)
    x, pd = x[keep], pd[keep]
    if x.size == 0:
        return x, pd
    # any wiggle from a two-branch fit is dropped so pd rises along the trace
    keep = np.concatenate(([True], np.diff(pd) > 0))
    return x[keep], pd[keep]


def gas_law(gas: Gas, gamma: float) -> PaschenLaw | MixtureLaw:
    """One gas's law at one yield: Paschen's, or the mixture law for a gas that attaches."""
    if gas.attachment is None:
        return PaschenLaw(gas.constants, gamma, gas.law)
    return _mixture_law(Mixture((Component(gas, 1.0),)), (gamma,))


def solved_mixture(bench: Bench) -> Mixture | None:
    """What the mixture law solves for this bench: its mixture, or a pure gas that attaches
    electrons as a one-gas mixture (Paschen's closed form has no attachment); None otherwise."""
    if bench.mixture is not None:
        return bench.mixture
    if bench.gas.attachment is not None:
        return Mixture((Component(bench.gas, 1.0),))
    return None


def breakdown_law(bench: Bench, gamma: float | None = None, which: str = "value") -> PaschenLaw | MixtureLaw:
    """The bench's law: Paschen's for a pure gas (with ``gamma``, default the bench's), linear mixing
    with attachment for a mixture or an attaching gas (each component's gamma on the cathode, its
    ``which`` end: "value", "low" or "high"; or the bench's override)."""
    mix = solved_mixture(bench)
    if mix is None:
        g = bench.yield_().value if gamma is None else gamma
        return PaschenLaw(bench.gas.constants, g, bench.gas.law)
    gammas = tuple(
        bench.gamma if bench.gamma is not None else getattr(bench.cathode.yield_for(c.gas), which)
        for c in mix.components
    )
    return _mixture_law(mix, gammas)


def alternating_law(bench: Bench, frequency: float, gap: float):
    """The bench's law for an alternating voltage of ``frequency`` (Hz) across ``gap`` (m):
    :class:`.alternating.AlternatingLaw` over its DC law (a pure gas counts as a one-gas mixture)."""
    mix = solved_mixture(bench) or Mixture((Component(bench.gas, 1.0),))
    return _alternating_law(mix, float(frequency), float(gap), breakdown_law(bench))


@lru_cache(maxsize=64)
def _alternating_law(mix: Mixture, frequency: float, gap: float, dc):
    from .alternating import AlternatingLaw

    return AlternatingLaw(mix, frequency, gap, dc)


@lru_cache(maxsize=32)
def _mixture_law(mix: Mixture, gammas: tuple[float, ...]) -> MixtureLaw:
    """One law per mixture and yields: its traced curve and minimum are worked out once."""
    return MixtureLaw(mix, gammas)
