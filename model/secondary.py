"""The cathode's effective secondary-electron yield gamma, as a function of the reduced field.

A real (technical: oxidised, gas-covered) cathode's yield is not one number. Ions and fast atoms
arrive with more energy where E/N is higher, so the effective yield found from measured breakdown
rises with E/N ([phelps-petrovic-1999] for argon; [maric-2014] for other gases). strikeline writes it

    gamma(y) = min(cap, value * (max(y, knee) / reference)^slope)

y = E/p in V/(Pa m) at the gas data's reference density: ``value`` at the ``reference`` field,
constant below ``knee``, rising with ``slope`` above it, never above ``cap``. A slope below 1 keeps
the left branch of the curve rising as pd falls (finite, as measured), where a constant gamma gives
a vertical asymptote. ``slope`` 0 is the constant gamma of Townsend's theory.

The values are chosen per gas (and per cathode where a source gives one) from measured minimum
sparking potentials and breakdown curves; each says so in its source. The clean-metal estimate
0.016 (E_iz - 2 phi) ([baragiola-1979]) is the other model a bench file may choose.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import TYPE_CHECKING

if TYPE_CHECKING:  # numpy loads with the first yield worked out, not with the gas data
    import numpy as np
    from numpy.typing import ArrayLike, NDArray

__all__ = ["MODELS", "Yield", "clean_metal_yield"]

MODELS = ("technical", "clean-metal")
"""The yield models a bench file may choose (``gamma_model``)."""


@dataclass(frozen=True)
class Yield:
    """An effective secondary-electron yield gamma(E/p) with its plausible range and source."""

    value: float
    """gamma at the reference field."""
    low: float
    high: float
    """The plausible range of ``value`` (the same ratios hold at every field)."""
    source: str
    reference: float = 0.0
    """E/p at which ``value`` holds, V/(Pa m) (0: a constant gamma)."""
    knee: float = 0.0
    """Below this E/p (V/(Pa m)) gamma stays at its value there."""
    slope: float = 0.0
    """d ln gamma / d ln(E/p) above the knee."""
    cap: float | None = None
    """gamma never exceeds this (None: no cap)."""

    def at(self, y: ArrayLike, which: str = "value") -> NDArray[np.float64]:
        """gamma at E/p ``y`` (V/(Pa m)); ``which`` "low" or "high" gives the band's ends.

        >>> g = Yield(0.02, 0.01, 0.04, "", reference=100.0, knee=50.0, slope=0.5, cap=0.05)
        >>> [round(float(g.at(y)), 4) for y in (10.0, 100.0, 400.0, 1e4)]
        [0.0141, 0.02, 0.04, 0.05]
        """
        import numpy as np

        base = {"value": self.value, "low": self.low, "high": self.high}[which]
        y = np.asarray(y, dtype=float)
        if not self.slope:
            out = np.full(y.shape, base)
        else:
            out = base * (np.maximum(y, self.knee) / self.reference) ** self.slope
        return out if self.cap is None else np.minimum(out, self.cap)

    def scaled(self, factor: float, source: str | None = None) -> Yield:
        """The same shape, every value times ``factor`` (a fitted bench curve's gamma)."""
        cap = None if self.cap is None else self.cap * factor
        return replace(
            self, value=self.value * factor, low=self.low * factor, high=self.high * factor, cap=cap,
            source=self.source if source is None else source,
        )  # fmt: skip

    @property
    def constant(self) -> bool:
        return not self.slope


def clean_metal_yield(ionisation_energy: float, work_function: float) -> Yield | None:
    """Clean-metal estimate of the ion-induced electron yield, gamma ~ 0.016 (E_iz - 2 phi), energies
    in eV ([baragiola-1979], from memory), with the range 0.3x to 1.5x of it; None where it gives no
    yield (E_iz below 2 phi). Good for noble-gas ions on atomically clean metals at low energy; a
    technical (oxidised, gas-covered) cathode's effective yield is far lower ([bogaerts-gijbels-2002]
    model both surfaces, found).

    >>> round(clean_metal_yield(24.59, 4.55).value, 3)   # He+ on tungsten
    0.248
    """
    g = 0.016 * (ionisation_energy - 2.0 * work_function)
    if g <= 0:
        return None
    return Yield(
        g,
        0.3 * g,
        1.5 * g,
        f"clean-metal estimate 0.016 (E_iz - 2 phi) = 0.016 ({ionisation_energy:g} - 2 x {work_function:g}) eV "
        "[baragiola-1979] (from memory)",
    )
