"""The glow after ignition: normal and abnormal glow, the supply's load line, the regime.

SI: currents in A, voltages in V, current densities in A/m^2, pressures in Pa, areas in m^2.

Assumptions (stated in every result that uses them):
- The discharge voltage is the cathode fall; the positive column and anode fall are ignored.
- Normal glow: the cathode fall stays at V_n and the glow covers the area I / j_n of the
  cathode, with j_n = (j_n/p^2) p^2 (normal-glow similarity; Raizer 1991, sec. 8.4).
- Abnormal glow, once the whole cathode is covered: the fall rises with current density as
  V = V_n (j / j_n)^(1/n), n = ABNORMAL_EXPONENT (a steep power law of our choosing that
  stands in for the measured curves; good for the regime, not for the exact voltage).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

__all__ = [
    "ABNORMAL_EXPONENT",
    "ARC_CURRENT_DENSITY",
    "TOWNSEND_DARK_MAX_CURRENT",
    "LoadLine",
    "glow_voltage",
    "load_line",
    "normal_current_density",
]

ABNORMAL_EXPONENT = 3.0
"""n in V = V_n (j/j_n)^(1/n) for the abnormal glow (our modelling assumption)."""

TOWNSEND_DARK_MAX_CURRENT = 1e-5
"""A: below about 10 uA a self-sustained discharge stays a dark (Townsend) discharge
(the classic voltage-current characteristic of a gas discharge, from memory)."""

ARC_CURRENT_DENSITY = 1e4
"""A/m^2 (1 A/cm^2): cathode current densities toward this leave the glow and heat the
cathode into an arc; glows run at uA to tens of mA per cm^2 (from memory; common practice)."""


def normal_current_density(j_over_p2: float, p: float) -> float:
    """Normal current density j_n = (j_n/p^2) p^2, A/m^2 (j_over_p2 in A m^-2 Pa^-2, p in Pa).

    >>> round(normal_current_density(1.0, 3.0), 6)
    9.0
    """
    return j_over_p2 * p * p


def glow_voltage(current: float, v_n: float, i_full: float | None, n: float = ABNORMAL_EXPONENT) -> float:
    """Cathode fall at ``current`` (A): V_n up to full cover ``i_full`` (A), then abnormal.

    >>> glow_voltage(0.5, 200.0, 1.0), glow_voltage(8.0, 200.0, 1.0)
    (200.0, 400.0)
    """
    if i_full is None or current <= i_full:
        return v_n
    return v_n * (current / i_full) ** (1.0 / n)


@dataclass(frozen=True)
class LoadLine:
    """Where the supply's load line meets the glow's voltage-current curve."""

    current: float
    """Operating current, A."""
    voltage: float
    """Discharge (cathode fall) voltage, V."""
    regime: str
    """"townsend_dark", "normal_glow", "abnormal_glow" or "arc_risk"."""
    covered_fraction: float | None
    """Fraction of the cathode the glow covers (None where j_n or the area is unknown)."""
    limited_by: str
    """"ballast", "current_limit" or "nothing" (no ballast and no limit)."""
    current_density: float | None
    """A/m^2 over the covered area (None where the area is unknown)."""
    short_circuit_current: float | None
    """The most the supply can deliver into a short (min of limit and V0/R), A; None if unbounded."""


def load_line(
    v0: float,
    ballast: float,
    current_limit: float | None,
    v_n: float,
    j_n: float | None,
    area: float | None,
    n: float = ABNORMAL_EXPONENT,
) -> LoadLine:
    """Operating point of a glow fed by a supply of open-circuit voltage ``v0`` (V) through
    ``ballast`` (ohm), with an optional ``current_limit`` (A).

    The load line V = v0 - I R meets the glow curve :func:`glow_voltage`; a current limit
    caps I (the supply then drops its output voltage). ``j_n`` (A/m^2) and ``area`` (m^2)
    give the full-cover current j_n A; without them the glow is treated as normal.

    >>> ll = load_line(1000.0, 10e3, None, 200.0, 1.0, 1e-3)  # full cover at 1 mA
    >>> ll.regime, round(ll.current * 1e3, 2), round(ll.voltage)
    ('abnormal_glow', 34.74, 653)
    """
    i_full = j_n * area if (j_n is not None and area is not None) else None
    bounded = [x for x in (current_limit, v0 / ballast if ballast > 0 else None) if x is not None]
    i_sc = min(bounded) if bounded else None
    if ballast <= 0 and current_limit is None:
        return LoadLine(math.inf, v_n, "arc_risk", 1.0 if i_full else None, "nothing", None, None)

    def excess(i: float) -> float:  # supply voltage left over at current i
        return (v0 - i * ballast) - glow_voltage(i, v_n, i_full, n)

    current, limited_by = math.inf, "current_limit"
    if ballast > 0:
        # Bisection: excess falls monotonically from v0 - v_n > 0 at i = 0 to < 0 at v0/R.
        lo, hi = 0.0, v0 / ballast
        for _ in range(200):
            mid = 0.5 * (lo + hi)
            if excess(mid) > 0:
                lo = mid
            else:
                hi = mid
        current, limited_by = 0.5 * (lo + hi), "ballast"
    if current_limit is not None and current > current_limit:
        # The supply holds the current and lets its output voltage fall to the glow's.
        current, limited_by = current_limit, "current_limit"
    voltage = glow_voltage(current, v_n, i_full, n)
    covered = None if i_full is None else min(current / i_full, 1.0)
    if current < TOWNSEND_DARK_MAX_CURRENT:
        regime = "townsend_dark"
    elif i_full is not None and current > i_full:
        regime = "abnormal_glow"
    else:
        regime = "normal_glow"
    density = None
    if area is not None:
        density = current / (area * covered) if covered else current / area
        if density >= ARC_CURRENT_DENSITY:
            regime = "arc_risk"
    return LoadLine(current, voltage, regime, covered, limited_by, density, i_sc)
