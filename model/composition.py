"""Compositions: building a mixture from parts, and reading a composition key back into parts.

A composition key is the text :attr:`Mixture.key` writes ("argon:80,oxygen:20", percent, largest
first) or a pure gas's key ("argon"). Pure, no numpy: a bench profile's curve is matched to the gas
fill with these before any number is worked out.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

from .bench import Component, Gas, Mixture

__all__ = ["SAME_WITHIN", "make_mixture", "parts_of", "same_composition"]

SAME_WITHIN = 0.01
"""Two compositions whose mole fractions all agree within this (absolute) are the same fill: a bench
curve fitted at one applies at the other (our judgement: flows drift by that much)."""


def make_mixture(items: Sequence[tuple[Gas, float]]) -> Mixture | Gas:
    """A mixture of ``items`` (gas, parts; parts are normalised, largest first), or the gas itself
    when only one has parts above zero (a one-gas mixture is that gas exactly).

    >>> from strikeline.model.bench import TownsendConstants
    >>> c = TownsendConstants(1.0, 1.0, 1.0, 2.0, 273.15, "")
    >>> ar = Gas("argon", "Ar", c, None, 15.76, 0.04, 1.6e-4, "", 5e9, True)
    >>> o2 = Gas("oxygen", "O2", c, None, 12.07, 0.032, 2.2e-4, "", 4e9, False)
    >>> make_mixture([(o2, 1), (ar, 4)]).key, make_mixture([(ar, 3), (o2, 0)]) is ar
    ('argon:80,oxygen:20', True)
    """
    present = [(g, x) for g, x in items if x > 0]
    if len(present) == 1:
        return present[0][0]
    total = math.fsum(x for _, x in present)
    ordered = sorted(present, key=lambda item: (-item[1], item[0].key))
    return Mixture(tuple(Component(g, x / total) for g, x in ordered))


def parts_of(key: str) -> dict[str, float]:
    """Mole fractions by gas key from a composition key.

    >>> parts_of("argon:80,oxygen:20"), parts_of("argon")
    ({'argon': 0.8, 'oxygen': 0.2}, {'argon': 1.0})
    """
    if ":" not in key:
        return {key: 1.0}
    out = {}
    for part in key.split(","):
        name, _, pct = part.partition(":")
        out[name] = float(pct) / 100.0
    return out


def same_composition(a: str, b: str, within: float = SAME_WITHIN) -> bool:
    """Whether two composition keys name the same gases with mole fractions within ``within``.

    >>> same_composition("argon:80,oxygen:20", "argon:80.5,oxygen:19.5"), same_composition("argon", "argon:95,oxygen:5")
    (True, False)
    """
    pa, pb = parts_of(a), parts_of(b)
    return pa.keys() == pb.keys() and all(abs(pa[k] - pb[k]) <= within for k in pa)
