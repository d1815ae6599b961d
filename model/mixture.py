"""Mixing rules for a gas fill: ionisation, attachment, secondary emission, Townsend's criterion,
Penning pairs, the critical field.

A pure gas is a one-component fill and goes through the same rules (each then reduces to the gas's
own law exactly). Every rule for more than one gas is an assumption and says so where its result is
shown (:data:`ASSUMPTIONS`):

- ionisation: alpha/N of the fill at one E/N is the mole-fraction sum of each gas's own alpha/N
  (linear mixing; it ignores that the mixture sets its own electron energy distribution);
- attachment: likewise, eta/N = sum of x_i eta_i/N (only electronegative gases attach); three-body
  attachment grows with the pressure and is added where the pressure is known;
- secondary emission: each gas's gamma(E/N) on this cathode, weighted by that gas's share of the
  ionisation at the E/N in question (the ion that strikes the cathode is the one that was made; ours);
- Penning pairs: a noble gas whose metastable level lies above another component's ionisation
  energy ionises it on collision, so the pair breaks down far below linear mixing: flagged, not
  modelled.

SI inside: E/p ("y") in V/(Pa m) at the data's reference density, alpha/p and eta/p in 1/(Pa m),
pd in Pa m, p the reduced pressure in Pa.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np
from numpy.typing import ArrayLike, NDArray

from .composition import Composition
from .gas import Gas
from .secondary import Yield

__all__ = [
    "ASSUMPTIONS",
    "attachment_per_p",
    "critical_E_over_p",
    "gamma_at",
    "ionisation_per_p",
    "pd_at",
    "penning_pairs",
]

ASSUMPTIONS = (
    "linear mixing: the mixture's alpha/N and eta/N at one E/N are the mole-fraction sums of its gases'",
    "gamma of each gas weighted by its share of the ionisation (our assumption)",
)


def ionisation_per_p(fill: Composition, y: ArrayLike) -> NDArray[np.float64]:
    """alpha/p of the fill at E/p ``y``: sum of x_i alpha_i/p (a pure gas: its own law)."""
    y = np.asarray(y, dtype=float)
    return sum((c.fraction * c.gas.ionisation.per_p(y) for c in fill.components), np.zeros(y.shape))


def attachment_per_p(fill: Composition, y: ArrayLike, p: ArrayLike | None = None) -> NDArray[np.float64]:
    """eta/p of the fill at E/p ``y``: sum of x_i eta_i/p, with three-body attachment where the reduced
    pressure ``p`` (Pa) is given (0 for a fill that does not attach)."""
    y = np.asarray(y, dtype=float)
    out = np.zeros(np.broadcast_shapes(y.shape, np.shape(p) if p is not None else ()))
    for c in fill.components:
        if c.gas.attachment is not None:
            # three-body attachment scales with the attaching gas's own density, x_i p
            partial = None if p is None else c.fraction * np.asarray(p, dtype=float)
            out = out + c.fraction * c.gas.attachment.per_p(y, partial)
    return out


def gamma_at(fill: Composition, yields: Sequence[Yield], y: ArrayLike, which: str = "value") -> NDArray[np.float64]:
    """The fill's secondary yield at E/p ``y``: each gas's gamma(y) (``yields``, in component order)
    weighted by its share of the ionisation there (our assumption); a pure gas's own gamma(y)."""
    y = np.asarray(y, dtype=float)
    if fill.pure:
        return yields[0].at(y, which)
    shares = [c.fraction * c.gas.ionisation.per_p(y) for c in fill.components]
    total = sum(shares, np.zeros(y.shape))
    weighted = sum((s * g.at(y, which) for s, g in zip(shares, yields, strict=True)), np.zeros(y.shape))
    plain = sum((c.fraction * g.at(y, which) for c, g in zip(fill.components, yields, strict=True)), np.zeros(y.shape))
    with np.errstate(invalid="ignore", divide="ignore"):
        return np.where(total > 0, weighted / np.where(total > 0, total, 1.0), plain)


def pd_at(a: ArrayLike, e: ArrayLike, g: ArrayLike) -> NDArray[np.float64]:
    """The pd (Pa m) at which the gap breaks down where alpha/p = ``a``, eta/p = ``e`` and gamma = ``g``
    (all at the breakdown field), from Townsend's criterion with attachment,
    gamma alpha/(alpha - eta) (exp((alpha - eta) d) - 1) = 1:

        pd = ln(1 + z) / (gamma a z),   z = (a - e) / (gamma a)

    (z -> 0 gives pd = 1 / (gamma a)). NaN where z <= -1 (attachment wins at every pd) or a = 0.
    Without attachment z = 1/gamma and this is the Townsend criterion alpha d = ln(1 + 1/gamma).

    >>> round(float(pd_at(10 * math.exp(-1), 0.0, 0.05)), 9) == round(math.log1p(1 / 0.05) / (10 * math.exp(-1)), 9)
    True
    """
    a = np.asarray(a, dtype=float)
    e = np.asarray(e, dtype=float)
    g = np.asarray(g, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        z = (a - e) / (g * a)
        small = np.abs(z) < 1e-8
        ratio = np.where(small, 1.0 - z / 2, np.log1p(np.where(small, 0.0, z)) / np.where(small, 1.0, z))
        out = ratio / (g * a)
    return np.where((z > -1) & (a > 0), out, np.nan)


def penning_pairs(fill: Composition) -> list[tuple[Gas, Gas]]:
    """(buffer, admixture) pairs of the fill where the buffer gas's metastable level lies above the
    admixture's ionisation energy, so collisions ionise the admixture (the Penning effect)."""
    return [
        (a.gas, b.gas)
        for a in fill.components
        for b in fill.components
        if a is not b and a.gas.metastable_energy is not None and b.gas.ionisation_energy < a.gas.metastable_energy
    ]


def critical_E_over_p(fill: Composition) -> float | None:
    """E/p (V/(Pa m)) where the fill's ionisation equals its two-body attachment (alpha = eta): below it
    an electron avalanche shrinks. None for a fill that does not attach.

    The highest such field within the attaching gases' fit ranges (a two-body fit that falls to zero
    at low fields leaves a second, meaningless crossing below), found on a grid and then by bisection.
    """
    attaching = [c.gas.attachment for c in fill.components if c.gas.attachment is not None]
    if not attaching:
        return None
    lo = min(a.valid_low for a in attaching)
    hi = max(a.valid_high for a in attaching)

    def net(y):
        return ionisation_per_p(fill, y) - attachment_per_p(fill, y)

    grid = np.geomspace(lo, hi, 512)
    losing = np.flatnonzero(net(grid) < 0)
    if losing.size == 0 or losing[-1] == grid.size - 1:
        return None
    a, b = math.log(grid[losing[-1]]), math.log(grid[losing[-1] + 1])
    for _ in range(60):
        mid = 0.5 * (a + b)
        if float(net(math.exp(mid))) < 0:
            a = mid
        else:
            b = mid
    return math.exp(0.5 * (a + b))
