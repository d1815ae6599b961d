"""A gas's ionisation and attachment as functions of the reduced field: published segments, joined.

Every coefficient is per unit pressure at the gas data's reference density (alpha/p, eta/p in
1/(Pa m)) against the reduced field y = E/p in V/(Pa m) at that density; E/N in Td is y times
:data:`TD_PER_V_PER_PA_M`. A law is a list of published segments, each valid over its own E/p range:

- ``power`` 1, Townsend's exponential form alpha/p = A exp(-B/y) (e.g. [raizer-1991] Table 4.1);
- ``power`` 0.5, the square-root form alpha/p = A exp(-sqrt(B/y)) that fits noble gases over a
  wider range (B = D^2 of the usual C exp(-D sqrt(p/E)); [raizer-1991] sec. 4.1);
- any other ``power`` q, alpha/p = A exp(-(B/y)^q), a smooth form through published facts where no
  fit is published (each such segment says so in its source).

Consecutive segments hand over where their values cross inside the overlap of their ranges (so the
law is continuous there), else at the nearer end of the overlap, else half-way across the gap
between them. Outside the first segment's low end and the last segment's high end a law is
extrapolated: :meth:`Ionisation.covers` says where it is not, and the forecast says so.

Attachment (electronegative gases) is two-body, eta2/p = k1 y + k0 in two branches meeting at
``switch`` and never negative, plus three-body, eta3/p = c3 y^n p, which grows with the pressure p
([morrow-lowke-1997] for dry air).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from functools import cached_property
from typing import TYPE_CHECKING

if TYPE_CHECKING:  # numpy loads with the first coefficient worked out, not with the gas data
    import numpy as np
    from numpy.typing import ArrayLike, NDArray

__all__ = ["TD_PER_V_PER_PA_M", "Attachment", "Ionisation", "Segment", "ionisation"]

TD_PER_V_PER_PA_M = 1.380649e-23 * 273.15 / 1e-21
"""E/N in Td per E/p in V/(Pa m) at 0 C (N = p / k T; k from the SI definition)."""


@dataclass(frozen=True)
class Segment:
    """One published fit of alpha/p over its E/p range (SI)."""

    A: float
    """Saturation value of alpha/p, 1/(Pa m)."""
    B: float
    """Characteristic reduced field, V/(Pa m) (for the square-root form, D^2)."""
    low: float
    high: float
    """The E/p range the fit was made over, V/(Pa m)."""
    source: str
    power: float = 1.0
    """q in A exp(-(B/y)^q): 1 the exponential form, 0.5 the square-root form."""

    def per_p(self, y: ArrayLike) -> NDArray[np.float64]:
        """alpha/p (1/(Pa m)) at E/p ``y`` (V/(Pa m)).

        >>> round(float(Segment(10.0, 200.0, 1.0, 1e4, "").per_p(200.0)), 6)   # 10 exp(-1)
        3.678794
        >>> round(float(Segment(10.0, 400.0, 1.0, 1e4, "", 0.5).per_p(100.0)), 6)  # 10 exp(-2)
        1.353353
        """
        import numpy as np

        y = np.asarray(y, dtype=float)
        with np.errstate(divide="ignore", over="ignore", invalid="ignore"):
            if self.power == 1.0:
                return self.A * np.exp(-self.B / y)
            return self.A * np.exp(-((self.B / y) ** self.power))


def _handover(a: Segment, b: Segment) -> float:
    """Where segment ``a`` hands over to ``b``: their crossing inside the overlap of the ranges,
    else the nearer end of the overlap, else the middle of the gap between them (in ln y)."""
    import numpy as np

    lo, hi = max(a.low, b.low), min(a.high, b.high)
    if lo > hi:  # a gap between the ranges
        return math.sqrt(a.high * b.low)
    grid = np.geomspace(lo, hi, 257) if hi > lo else np.array([lo])
    diff = np.log(a.per_p(grid)) - np.log(b.per_p(grid))
    sign = np.flatnonzero(np.diff(np.sign(diff)) != 0)
    if sign.size:
        i = int(sign[0])
        x0, x1, d0, d1 = math.log(grid[i]), math.log(grid[i + 1]), diff[i], diff[i + 1]
        return math.exp(x0 - d0 * (x1 - x0) / (d1 - d0))
    return lo if abs(diff[0]) < abs(diff[-1]) else hi


@dataclass(frozen=True)
class Ionisation:
    """alpha/p of one gas from its segments, lowest E/p first (build with :func:`ionisation`)."""

    segments: tuple[Segment, ...]

    @cached_property
    def handovers(self) -> tuple[float, ...]:
        """E/p (V/(Pa m)) at which each segment hands over to the next (worked out when first asked: the
        gas data load without numpy)."""
        return tuple(_handover(a, b) for a, b in zip(self.segments, self.segments[1:], strict=False))

    def per_p(self, y: ArrayLike) -> NDArray[np.float64]:
        """alpha/p in 1/(Pa m) at E/p ``y`` in V/(Pa m), any shape."""
        import numpy as np

        y = np.asarray(y, dtype=float)
        out = self.segments[0].per_p(y)
        for at, seg in zip(self.handovers, self.segments[1:], strict=True):
            out = np.where(y >= at, seg.per_p(y), out)
        return out

    @property
    def low(self) -> float:
        """Lowest E/p any segment was fitted at, V/(Pa m)."""
        return self.segments[0].low

    @property
    def high(self) -> float:
        """Highest E/p any segment was fitted at, V/(Pa m)."""
        return self.segments[-1].high

    def covers(self, y: float) -> bool:
        """Whether ``y`` (V/(Pa m)) lies inside the published ranges (not extrapolated)."""
        return self.low <= y <= self.high

    def source_at(self, y: float) -> str:
        """The source of the segment in force at ``y``."""
        i = sum(1 for at in self.handovers if y >= at)
        return self.segments[i].source

    @property
    def saturation(self) -> float:
        """alpha/p as E/p grows without bound (the last segment's A), 1/(Pa m)."""
        return self.segments[-1].A


def ionisation(segments: Sequence[Segment]) -> Ionisation:
    """A law of ``segments`` (any order), handing over as the module text says.

    >>> low = Segment(8.8, 275.0, 27.0, 200.0, "")
    >>> high = Segment(12.0, 342.0, 100.0, 600.0, "")
    >>> law = ionisation([high, low])
    >>> [round(x) for x in law.handovers], law.low, law.high
    ([200], 27.0, 600.0)
    """
    ordered = tuple(sorted(segments, key=lambda s: (s.low, s.high)))
    if not ordered:
        raise ValueError("an ionisation law needs at least one segment")
    return Ionisation(ordered)


@dataclass(frozen=True)
class Attachment:
    """Electron attachment of an electronegative gas (SI: eta/p in 1/(Pa m), y = E/p in V/(Pa m)).

    Two-body: eta2/p = k1 y + k0 on each side of ``switch``, never negative, held at its value at
    ``valid_high`` above it. Three-body: eta3/p = three_body * y^three_body_exponent * p, p the
    reduced pressure in Pa (zero where ``three_body`` is 0)."""

    k1_high: float
    k0_high: float
    k1_low: float
    k0_low: float
    switch: float
    valid_low: float
    valid_high: float
    source: str
    three_body: float = 0.0
    """c3 in eta3/p = c3 y^n p, SI."""
    three_body_exponent: float = 0.0
    three_body_source: str = ""

    def two_body(self, y: ArrayLike) -> NDArray[np.float64]:
        """eta2/p at ``y``."""
        import numpy as np

        y = np.minimum(np.asarray(y, dtype=float), self.valid_high)
        out = np.where(y >= self.switch, self.k1_high * y + self.k0_high, self.k1_low * y + self.k0_low)
        return np.maximum(out, 0.0)

    def per_p(self, y: ArrayLike, p: ArrayLike | None = None) -> NDArray[np.float64]:
        """eta/p at ``y``: two-body, plus three-body where the reduced pressure ``p`` (Pa) is given.

        >>> a = Attachment(0.0, 1.0, 0.0, 1.0, 10.0, 1.0, 100.0, "", three_body=1e-3, three_body_exponent=-1.0)
        >>> float(a.per_p(10.0)), float(a.per_p(10.0, 1000.0))   # 1, then 1 + 1e-3 / 10 * 1000
        (1.0, 1.1)
        """
        import numpy as np

        out = self.two_body(y)
        if p is not None and self.three_body:
            y = np.maximum(np.asarray(y, dtype=float), 1e-300)
            out = out + self.three_body * y**self.three_body_exponent * np.asarray(p, dtype=float)
        return out
