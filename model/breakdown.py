"""The breakdown law of a gas fill: V_b(pd), its minimum, its branches, alpha and eta at any field.

One law for every fill, pure or mixed (:class:`Law`): each gas's own ionisation and attachment laws
(:mod:`.ionisation`), mixed by mole fraction, and the cathode's gamma(E/N) (:mod:`.secondary`),
weighted by each gas's share of the ionisation (:mod:`.mixture`). Townsend's criterion with
attachment is explicit in the reduced field y = E/p, pd(y) = ln(1 + z)/(gamma a z), so the curve is
traced over y once (a table); many points are read off it by linear interpolation in pd, a few are
polished to the criterion's own root. Air also has its empirical uniform-field law at high pd,
blended in smoothly ([kuffel-zaengl-2000]). A bench curve fitted to strikes is the same law with its
ionisation, its field axis and its gamma scaled (:attr:`Law.scales`).

SI: pd in Pa m reduced to the data's reference density, E/p in V/(Pa m), voltages in V, p the
reduced pressure in Pa.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from functools import cached_property, lru_cache

import numpy as np
from numpy.typing import ArrayLike, NDArray

from . import mixture as mx
from .composition import Composition
from .gas import Gas, TownsendConstants, UniformFieldLaw
from .secondary import Yield

__all__ = ["COVERED_SHARE", "Law", "law_for", "trace", "uniform_field_voltage", "uniform_weight"]

_TABLE = 4096
"""Points of the traced curve, before refinement; linear interpolation between them is good to 1e-5."""
_MAX_LN_PD_STEP = 2e-3
"""Largest step of ln pd between table points: where pd moves faster than ln E/p, points are added."""
_PD_TOP = 1e8
"""Pa m: the table ends past this reduced pd (the accepted pd ends at 1e7, model/limits.py)."""
_ZOOM = 256
"""Points of each finer grid that closes in on the attachment limit and the minimum."""
_EXACT_BELOW = 64
_FAR_PD = 1e12
"""Where the appended far point of the lookup table sits, in multiples of the table's last pd."""
"""Arrays up to this size are polished to the exact root; longer ones are read off the table."""
COVERED_SHARE = 0.05
"""A gas under this mole fraction does not make a forecast "outside its data" (ours)."""


def uniform_field_voltage(x: ArrayLike, law: UniformFieldLaw) -> NDArray[np.float64]:
    """The empirical air law, V_b = a x + b sqrt(x) in V, x = delta d in m ([kuffel-zaengl-2000]).

    >>> law = UniformFieldLaw(24.22e5, 6.08e4, 101325.0, 293.0, 5e-5, 2e-4, 0.1, "")
    >>> round(float(uniform_field_voltage(0.01, law)))   # 1 cm of air at 1 atm, 20 C
    30300
    """
    x = np.asarray(x, dtype=float)
    return law.a * x + law.b * np.sqrt(x)


def _law_x(pd: NDArray, T_ref: float, law: UniformFieldLaw) -> NDArray:
    # pd is reduced to T_ref; delta d re-references it to the law's own p_ref, T_ref.
    return pd * (law.reference_temperature / T_ref) / law.reference_pressure


def uniform_weight(pd: ArrayLike, T_ref: float, law: UniformFieldLaw) -> NDArray[np.float64]:
    """The empirical law's weight at reduced pd ``pd`` (Pa m): a smoothstep in ln x from 0 at
    ``blend_from`` to 1 at ``blend_to`` (the blend is ours, placed where the two laws meet)."""
    x = _law_x(np.asarray(pd, dtype=float), T_ref, law)
    with np.errstate(divide="ignore"):
        t = np.clip(np.log(x / law.blend_from) / math.log(law.blend_to / law.blend_from), 0.0, 1.0)
    return t * t * (3.0 - 2.0 * t)


@dataclass(frozen=True)
class Law:
    """The breakdown law of ``fill`` on a cathode whose gamma for each gas is in ``yields`` (component
    order), its ionisation scaled by ``scales`` = (alpha, field, gamma) for a fitted bench curve, and
    the band's end of the yields in ``which`` ("value", "low", "high")."""

    fill: Composition
    yields: tuple[Yield, ...]
    uniform: UniformFieldLaw | None = None
    scales: tuple[float, float, float] = (1.0, 1.0, 1.0)
    which: str = "value"

    # -- the coefficients, at any reduced field y = E/p (V/(Pa m)) --------------------------

    @property
    def reference_temperature(self) -> float:
        return self.fill.main.constants.reference_temperature

    def a(self, y: ArrayLike) -> NDArray[np.float64]:
        """alpha/p (1/(Pa m)) at E/p ``y``."""
        s, b, _g = self.scales
        return s * mx.ionisation_per_p(self.fill, np.asarray(y, dtype=float) / b)

    def e(self, y: ArrayLike, p: ArrayLike | None = None) -> NDArray[np.float64]:
        """eta/p (1/(Pa m)) at E/p ``y``, with three-body attachment at reduced pressure ``p`` (Pa)."""
        return mx.attachment_per_p(self.fill, np.asarray(y, dtype=float) / self.scales[1], p)

    def g(self, y: ArrayLike) -> NDArray[np.float64]:
        """gamma at E/p ``y``."""
        return self.scales[2] * mx.gamma_at(
            self.fill, self.yields, np.asarray(y, dtype=float) / self.scales[1], self.which
        )

    def pd_of(self, y: ArrayLike, p: ArrayLike | None = None) -> NDArray[np.float64]:
        """The reduced pd (Pa m) that breaks down with E/p ``y`` (NaN where none does)."""
        return mx.pd_at(self.a(y), self.e(y, p), self.g(y))

    def alpha(self, E: float, p: float) -> float:
        """alpha (1/m) at field E (V/m) and reduced pressure p (Pa)."""
        return float(p * self.a(E / p))

    def eta(self, E: float, p: float) -> float:
        """eta (1/m) at field E (V/m) and reduced pressure p (Pa), three-body attachment included."""
        return float(p * self.e(E / p, p))

    @property
    def attaches(self) -> bool:
        return any(c.gas.attachment is not None for c in self.fill.components)

    # -- the curve, traced over E/p ----------------------------------------------------------

    @cached_property
    def y_range(self) -> tuple[float, float]:
        """E/p from a field too low to ionise (or just above the attachment limit) to one so high that
        pd is far left of any bench."""
        b = self.scales[1]
        firsts = [c.gas.ionisation.segments[0] for c in self.fill.components]
        lo = b * min(s.B / (60.0 if s.power == 1.0 else 3600.0) for s in firsts)  # exp(-60): nothing ionises
        hi = b * 1e6 * max(s.B for c in self.fill.components for s in c.gas.ionisation.segments)
        if self.attaches:
            a, bb = lo, hi
            for _ in range(4):
                # Attachment ends the criterion below some field: close in on the highest such field, each
                # grid _ZOOM times finer. (A two-body fit that falls to zero at still lower fields leaves a
                # criterion met there only at absurd pd: the highest limit is the one that counts.)
                y = np.geomspace(a, bb, _ZOOM)
                ended = np.flatnonzero(~np.isfinite(self.pd_of(y)))
                if ended.size == 0 or ended[-1] == _ZOOM - 1:
                    break
                k = int(ended[-1])
                a, bb = float(y[k]), float(y[k + 1])
                lo = bb
        return lo, hi

    @cached_property
    def table(self) -> tuple[NDArray, NDArray, NDArray]:
        """(pd ascending, V, y) of the traced curve."""
        lo, hi = self.y_range
        y, pd = trace(math.log(hi), math.log(lo), self.pd_of, self._kinks())
        return pd, y * pd, y

    def _kinks(self) -> list[float]:
        """E/p (V/(Pa m)) where a gas's law changes segment or branch, or its gamma bends."""
        b = self.scales[1]
        out = []
        for c, g in zip(self.fill.components, self.yields, strict=True):
            out += list(c.gas.ionisation.handovers)
            if g.slope and g.knee:
                out.append(g.knee)
            at = c.gas.attachment
            if at is not None:
                out += [at.switch, at.valid_high]
                for k1, k0 in ((at.k1_low, at.k0_low), (at.k1_high, at.k0_high)):
                    if k1 > 0 and k0 < 0:
                        out.append(-k0 / k1)  # where a branch falls to zero (eta is never negative)
        lo, hi = self.y_range
        return [b * k for k in out if lo < b * k < hi]

    @cached_property
    def y_at_minimum(self) -> float:
        """E/p at the curve's minimum: the table's least V, then two finer grids around it."""
        _pd, v, y = self.table
        i = int(np.argmin(v))
        lo, hi = y[min(i + 1, len(y) - 1)], y[max(i - 1, 0)]
        for _ in range(2):
            grid = np.geomspace(lo, hi, _ZOOM)
            j = int(np.nanargmin(grid * self.pd_of(grid)))
            lo, hi = grid[max(j - 1, 0)], grid[min(j + 1, _ZOOM - 1)]
        return float(np.sqrt(lo * hi))

    def minimum(self) -> tuple[float, float]:
        """(reduced pd in Pa m, V) of the curve's lowest point."""
        y = self.y_at_minimum
        pd = float(self.pd_of(y))
        return pd, y * pd

    @property
    def gamma(self) -> float:
        """gamma at the curve's minimum (the one quoted beside the curve)."""
        return float(self.g(self.y_at_minimum))

    def no_breakdown_pd(self) -> float:
        """Reduced pd (Pa m) at or below which nothing breaks down: the left asymptote of a constant
        gamma, or the far end of the traced curve where gamma grows with E/N."""
        return float(self.table[0][0])

    # -- a point or many ---------------------------------------------------------------------

    def e_over_p(self, rpd: ArrayLike, p: ArrayLike | None = None) -> NDArray:
        """E/p at breakdown (V/(Pa m)) for each reduced pd (three-body attachment at the reduced
        pressure ``p`` where it is given); NaN where nothing breaks down. Beyond the traced range the
        field is the attachment limit's (a long gap breaks down there)."""
        rpd = np.asarray(rpd, dtype=float)
        pd, _v, y = self.table
        with np.errstate(divide="ignore", invalid="ignore"):
            lnpd = np.log(rpd)
            lny = np.interp(lnpd, np.log(pd), np.log(y), left=np.nan, right=math.log(y[-1]))
            if rpd.size <= _EXACT_BELOW or p is not None:
                lny = self._refine(lny, lnpd, p)
        out = np.where(rpd >= pd[0], np.exp(lny), np.nan)
        return out if out.ndim else out[()]

    def _refine(self, lny: NDArray, lnpd: NDArray, p) -> NDArray:
        """Polish the table's E/p to the criterion's own root (with three-body attachment at ``p``):
        secant steps on ln pd(ln y) - ln pd, kept near the table's value."""
        lny = np.array(lny, dtype=float)
        inside = np.isfinite(lny)
        if not np.any(inside):
            return lny
        pp = None if p is None else np.broadcast_to(np.asarray(p, dtype=float), lny.shape)[inside]
        step = 2.0 * math.log(self.y_range[1] / self.y_range[0]) / _TABLE
        x0, x1 = lny[inside] - step, lny[inside]
        target = lnpd[inside]

        def f(x):
            with np.errstate(invalid="ignore", divide="ignore"):
                return np.log(self.pd_of(np.exp(x), pp)) - target

        f0, f1 = f(x0), f(x1)
        for _ in range(8 if p is not None else 3):
            with np.errstate(divide="ignore", invalid="ignore"):
                x2 = np.where(f1 != f0, x1 - f1 * (x1 - x0) / (f1 - f0), x1)
            x2 = np.where(np.isfinite(x2), np.clip(x2, x1 - 8 * step, x1 + 8 * step), x1)
            if np.all(np.abs(x2 - x1) < 1e-14):
                x1 = x2
                break
            x0, f0, x1 = x1, f1, x2
            f1 = f(x1)
        lny[inside] = np.where(np.isfinite(f1), x1, lny[inside])
        return lny

    def townsend_voltage(self, rpd: ArrayLike, p: ArrayLike | None = None) -> NDArray[np.float64]:
        """V_b (V) by Townsend's criterion alone (no empirical law), NaN where nothing breaks down."""
        rpd = np.asarray(rpd, dtype=float)
        if rpd.size <= _EXACT_BELOW or p is not None:
            return self.e_over_p(rpd, p) * rpd
        pd, vt = self._lookup  # pd[0] is the left end: left of it, NaN
        return np.interp(rpd, pd, vt, left=np.nan)

    @cached_property
    def _lookup(self) -> tuple[NDArray, NDArray]:
        """The table with one far point appended on the line V = (E/p)_last pd, so that one np.interp
        also gives the curve beyond the table, where the field is the limit's."""
        pd, vt, y = self.table
        far = _FAR_PD * max(float(pd[-1]), 1.0)
        return np.append(pd, far), np.append(vt, y[-1] * far)

    def voltage(self, rpd: ArrayLike, p: ArrayLike | None = None) -> tuple[NDArray, NDArray]:
        """(V_b in V, NaN where none; weight of the empirical uniform-field law, 0 to 1)."""
        v = self.townsend_voltage(rpd, p)
        if self.uniform is None:
            return v, np.zeros(np.shape(v))
        w = uniform_weight(rpd, self.reference_temperature, self.uniform)
        x = _law_x(np.asarray(rpd, dtype=float), self.reference_temperature, self.uniform)
        mixed = (1.0 - w) * v + w * uniform_field_voltage(x, self.uniform)
        return np.where(w > 0, mixed, v), w

    def branch(self, rpd: ArrayLike) -> NDArray:
        """ "left", "right" of the minimum, or "none" where nothing breaks down."""
        rpd = np.asarray(rpd, dtype=float)
        pd_min, _ = self.minimum()
        return np.where(rpd <= self.no_breakdown_pd(), "none", np.where(rpd < pd_min, "left", "right"))

    # -- what the law rests on -----------------------------------------------------------------

    @cached_property
    def critical_E_over_p(self) -> float | None:
        """E/p where alpha = eta by two-body attachment (V/(Pa m)); None: nothing attaches."""
        y = mx.critical_E_over_p(self.fill)
        return None if y is None else y * self.scales[1]

    def uncovered(self, y: float) -> list[Gas]:
        """The gases (of at least :data:`COVERED_SHARE` of the fill) whose published ionisation data do
        not reach the reduced field ``y``: there the law is extrapolated."""
        y0 = y / self.scales[1]
        return [c.gas for c in self.fill.components if c.fraction >= COVERED_SHARE and not c.gas.ionisation.covers(y0)]

    def ionisation_sources(self, y: float) -> str:
        """Where the ionisation in force at E/p ``y`` comes from: each gas's segment there."""
        y0 = y / self.scales[1]
        parts = [(c.gas.key, c.gas.ionisation.source_at(y0)) for c in self.fill.components]
        if len(parts) == 1:
            return parts[0][1]
        return "mixed from " + "; ".join(f"{k}: {src}" for k, src in parts)

    @cached_property
    def effective_constants(self) -> TownsendConstants:
        """The A, B pair that stands for this law: a pure gas's own textbook pair; for a mixture (or a
        scaled law) the pair through its alpha/p at E/p 1.5 times either side of the curve's minimum."""
        if self.fill.pure and self.scales == (1.0, 1.0, 1.0):
            return self.fill.main.constants
        y0 = self.y_at_minimum
        y1, y2 = y0 / 1.5, y0 * 1.5
        a1, a2 = float(self.a(y1)), float(self.a(y2))
        B = math.log(a2 / a1) / (1.0 / y1 - 1.0 / y2)
        A = a2 * math.exp(B / y2)
        source = f"effective A, B of {self.fill.key} near its minimum"
        return TownsendConstants(A, B, y0 / 3, y0 * 3, self.reference_temperature, source)

    def unscaled(self) -> Law:
        """This law without a bench curve's scales (what the fit started from)."""
        return law_for(self.fill, self.yields, (1.0, 1.0, 1.0), self.which)

    def at(self, which: str) -> Law:
        """This law with the ``which`` end ("low", "high") of the yields' band."""
        return law_for(self.fill, self.yields, self.scales, which)


def trace(start: float, end: float, pd_of: Callable[[NDArray], NDArray], kinks=()) -> tuple[NDArray, NDArray]:
    """A curve pd(x) traced from ln x = ``start`` towards ``end`` while pd grows: even steps in ln x,
    more points wherever ln pd moves by over _MAX_LN_PD_STEP between two, ``kinks`` (where a law
    changes segment) as points of their own, and an end past _PD_TOP (no bench reaches such pd).
    Returns (x, pd) in trace order, pd finite and rising."""
    lnx = np.linspace(start, end, _TABLE)
    lnx = np.concatenate((lnx, [math.log(k) for k in kinks]))
    lnx = np.sort(lnx) if end > start else np.sort(lnx)[::-1]
    pd = pd_of(np.exp(lnx))
    beyond = np.flatnonzero(pd > _PD_TOP)
    if beyond.size:
        lnx, pd = lnx[: beyond[0] + 1], pd[: beyond[0] + 1]
    with np.errstate(divide="ignore", invalid="ignore"):
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
    keep = np.isfinite(pd) & (pd > 0)
    x, pd = x[keep], pd[keep]
    if x.size == 0:
        return x, pd
    # any wiggle from a segment's hand-over is dropped so pd rises along the trace
    keep = np.concatenate(([True], np.diff(pd) > 0))
    return x[keep], pd[keep]


def law_for(
    fill: Composition,
    yields: Sequence[Yield],
    scales: tuple[float, float, float] = (1.0, 1.0, 1.0),
    which: str = "value",
) -> Law:
    """The law of ``fill`` with these yields (one per component), made once per set of arguments (its
    table and minimum are worked out once). A pure gas with an empirical uniform-field law (air) has it
    blended in at high pd."""
    uniform = fill.main.law if fill.pure else None
    return _law(fill, tuple(yields), uniform, tuple(float(s) for s in scales), which)


@lru_cache(maxsize=64)
def _law(fill, yields, uniform, scales, which) -> Law:
    return Law(fill, yields, uniform, scales, which)
