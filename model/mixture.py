"""Mixing rules for gas mixtures: ionisation, attachment, secondary emission, Penning pairs, gauges.

Every rule is an assumption and says so where its result is shown (:data:`ASSUMPTIONS`):

- ionisation: alpha/N of the mixture at one E/N is the mole-fraction sum of each gas's alpha/N
  (linear mixing; it ignores that the mixture sets its own electron energy distribution);
- attachment: likewise, eta/N = sum of x_i eta_i/N (only electronegative gases attach);
- secondary emission: each gas's gamma on this cathode, weighted by that gas's share of the
  ionisation at the E/N in question (the ion that strikes the cathode is the one that was made;
  our assumption);
- Penning pairs: a noble gas whose metastable level lies above another component's ionisation
  energy ionises it on collision, so the pair breaks down far below linear mixing: flagged, not
  modelled.

(Gauges in a mixture: :func:`strikeline.model.gauges.sensitivity`.)

SI inside: E/p ("y") in V/(Pa m) at the constants' reference density, alpha/p and eta/p in
1/(Pa m), pd in Pa m.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np
from numpy.typing import ArrayLike, NDArray

from .bench import Gas, Mixture

__all__ = [
    "ASSUMPTIONS",
    "attachment_per_p",
    "critical_E_over_p",
    "gamma_of",
    "ionisation_per_p",
    "mixture_attachment",
    "mixture_ionisation",
    "pd_at",
    "penning_pairs",
]

ASSUMPTIONS = (
    "linear mixing: the mixture's alpha/N and eta/N at one E/N are the mole-fraction sums of its gases'",
    "gamma of each gas weighted by its share of the ionisation (our assumption)",
)


def ionisation_per_p(gas: Gas, y: ArrayLike) -> NDArray[np.float64]:
    """alpha/p of one gas at E/p ``y``: A exp(-B/y), with the low-field pair below its switch.

    >>> from strikeline.model.bench import Component, Gas, TownsendConstants
    >>> g = Gas("x", "X", TownsendConstants(10.0, 200.0, 100.0, 1e4, 273.15, ""), None, 15, 0.04, 1e-4, "", 1e9, True)
    >>> round(float(ionisation_per_p(g, 200.0)), 6)   # 10 exp(-1)
    3.678794
    """
    y = np.asarray(y, dtype=float)
    c = gas.constants
    with np.errstate(divide="ignore", over="ignore"):
        out = c.A * np.exp(-c.B / y)
        if gas.low_field is not None:
            lo = gas.low_field
            out = np.where(y < c.E_over_p_low, lo.A * np.exp(-lo.B / y), out)
    return out


def attachment_per_p(gas: Gas, y: ArrayLike) -> NDArray[np.float64]:
    """eta/p of one gas at E/p ``y`` (0 for a gas that does not attach); never negative, and held at
    its value at the top of the fit's range above it."""
    y = np.asarray(y, dtype=float)
    at = gas.attachment
    if at is None:
        return np.zeros_like(y)
    yc = np.minimum(y, at.valid_high)
    out = np.where(yc >= at.switch, at.k1_high * yc + at.k0_high, at.k1_low * yc + at.k0_low)
    return np.maximum(out, 0.0)


def mixture_ionisation(mix: Mixture, y: ArrayLike) -> NDArray[np.float64]:
    """alpha/p of the mixture: sum of x_i alpha_i/p (linear mixing)."""
    return sum((c.fraction * ionisation_per_p(c.gas, y) for c in mix.components), np.zeros(np.shape(y)))


def mixture_attachment(mix: Mixture, y: ArrayLike) -> NDArray[np.float64]:
    """eta/p of the mixture: sum of x_i eta_i/p (linear mixing)."""
    return sum((c.fraction * attachment_per_p(c.gas, y) for c in mix.components), np.zeros(np.shape(y)))


def gamma_of(mix: Mixture, gammas: Sequence[float], y: ArrayLike) -> NDArray[np.float64]:
    """The mixture's secondary yield at E/p ``y``: each gas's gamma (``gammas``, in component order)
    weighted by its share of the ionisation there (our assumption)."""
    shares = [c.fraction * ionisation_per_p(c.gas, y) for c in mix.components]
    total = sum(shares, np.zeros(np.shape(y)))
    weighted = sum((s * g for s, g in zip(shares, gammas, strict=True)), np.zeros(np.shape(y)))
    with np.errstate(invalid="ignore", divide="ignore"):
        return np.where(total > 0, weighted / np.where(total > 0, total, 1.0), _plain_gamma(mix, gammas))


def _plain_gamma(mix: Mixture, gammas: Sequence[float]) -> float:
    """Where no gas ionises at all (y -> 0) the plain mole-fraction average stands in."""
    return math.fsum(c.fraction * g for c, g in zip(mix.components, gammas, strict=True))


def pd_at(mix: Mixture, gammas: Sequence[float], y: ArrayLike) -> NDArray[np.float64]:
    """The pd (Pa m) at which the gap breaks down with E/p = ``y``, from Townsend's criterion with
    attachment, gamma alpha/(alpha - eta) (exp((alpha - eta) d) - 1) = 1:

        pd = ln(1 + z) / (gamma a z),   z = (a - e) / (gamma a),   a = alpha/p, e = eta/p

    (z -> 0 gives pd = 1 / (gamma a)). NaN where z <= -1: so much attachment that no pd breaks
    down at this E/p. Without attachment z = 1/gamma and this is Paschen's law solved for pd.

    >>> from strikeline.model.bench import Component, Gas, TownsendConstants
    >>> g = Gas("x", "X", TownsendConstants(10.0, 200.0, 1.0, 1e4, 273.15, ""), None, 15, 0.04, 1e-4, "", 1e9, True)
    >>> pd = float(pd_at(Mixture((Component(g, 1.0),)), [0.05], 200.0))
    >>> round(pd, 6) == round(math.log1p(1 / 0.05) / (10 * math.exp(-1)), 6)
    True
    """
    y = np.asarray(y, dtype=float)
    shares = [c.fraction * ionisation_per_p(c.gas, y) for c in mix.components]
    a = sum(shares[1:], shares[0])
    e = mixture_attachment(mix, y)
    with np.errstate(divide="ignore", invalid="ignore"):
        # gamma weighted by each gas's share of the ionisation (as gamma_of, in one pass)
        weighted = sum((s * g for s, g in zip(shares[1:], gammas[1:], strict=True)), shares[0] * gammas[0])
        g = np.where(a > 0, weighted / np.where(a > 0, a, 1.0), _plain_gamma(mix, gammas))
        z = (a - e) / (g * a)
        small = np.abs(z) < 1e-8
        ratio = np.where(small, 1.0 - z / 2, np.log1p(np.where(small, 0.0, z)) / np.where(small, 1.0, z))
        out = ratio / (g * a)
    return np.where((z > -1) & (a > 0), out, np.nan)


def penning_pairs(mix: Mixture) -> list[tuple[Gas, Gas]]:
    """(buffer, admixture) pairs of the mixture where the buffer gas's metastable level lies above
    the admixture's ionisation energy, so collisions ionise the admixture (the Penning effect).

    >>> from strikeline.model.bench import Component, Gas, TownsendConstants
    >>> c = TownsendConstants(1.0, 1.0, 1.0, 2.0, 273.15, "")
    >>> ne = Gas("neon", "Ne", c, None, 21.56, 0.02, 4e-4, "", 1e9, True, metastable_energy=16.62)
    >>> ar = Gas("argon", "Ar", c, None, 15.76, 0.04, 1.6e-4, "", 5e9, True, metastable_energy=11.55)
    >>> [(a.key, b.key) for a, b in penning_pairs(Mixture((Component(ar, 0.5), Component(ne, 0.5))))]
    [('neon', 'argon')]
    """
    return [
        (a.gas, b.gas)
        for a in mix.components
        for b in mix.components
        if a is not b and a.gas.metastable_energy is not None and b.gas.ionisation_energy < a.gas.metastable_energy
    ]


def critical_E_over_p(mix: Mixture) -> float | None:
    """E/p (V/(Pa m)) where the mixture's ionisation equals its attachment (alpha = eta): below it an
    electron avalanche shrinks. None for a mixture that does not attach.

    The highest such field within the attaching gases' fit ranges (a two-body fit that falls to zero
    at low fields leaves a second, meaningless crossing below), found on a grid and then by bisection.
    """
    attaching = [c.gas.attachment for c in mix.components if c.gas.attachment is not None]
    if not attaching:
        return None
    lo = min(a.valid_low for a in attaching)
    hi = max(a.valid_high for a in attaching)

    def net(y):
        return mixture_ionisation(mix, y) - mixture_attachment(mix, y)

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
