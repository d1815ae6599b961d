"""A simulated bench: a deterministic scenario of our own invention.

The chamber is pumped down from rough vacuum, argon is let in and the pressure settles to
its setpoint with gauge noise and a slow drift; the supply is switched on later and reads
back its voltage and current. Pure functions of time and a seed: the same seed always
gives the same shift.
"""

from __future__ import annotations

import math
import random
from dataclasses import dataclass

__all__ = ["Scenario", "pressure_at", "supply_at"]


@dataclass(frozen=True)
class Scenario:
    """The invented demo shift (times in s, pressures in Pa, SI)."""

    setpoint: float = 20.0
    start_pressure: float = 1000.0
    base_pressure: float = 5e-4
    pump_time: float = 8.0
    """Log-linear pump-down from start to base pressure over this time."""
    let_in_at: float = 8.0
    settle_time: float = 3.0
    """Time constant of the pressure rising to the setpoint."""
    noise: float = 0.004
    """Relative gauge noise (one standard deviation)."""
    drift: float = 0.03
    """Relative amplitude of the slow drift."""
    drift_period: float = 240.0
    supply_on_at: float = 16.0
    supply_voltage: float = 1200.0
    supply_current: float = 0.021
    seed: int = 1


def _noise(seed: int, channel: int, t: float) -> float:
    """A standard normal number fixed by (seed, channel, 50 ms slot of t)."""
    return random.Random(seed * 1_000_003 + channel * 7919 + math.floor(t * 20)).gauss(0.0, 1.0)


def pressure_at(t: float, sc: Scenario) -> float:
    """True chamber pressure at scenario time ``t`` (Pa).

    >>> round(pressure_at(0.0, Scenario(noise=0, drift=0)), 3)
    1000.0
    >>> round(pressure_at(1e4, Scenario(noise=0, drift=0)), 3)
    20.0
    """
    if t < sc.let_in_at:
        frac = min(max(t / sc.pump_time, 0.0), 1.0)
        p = sc.start_pressure * (sc.base_pressure / sc.start_pressure) ** frac
    else:
        rise = 1.0 - math.exp(-(t - sc.let_in_at) / sc.settle_time)
        p = sc.base_pressure + (sc.setpoint - sc.base_pressure) * rise
        p *= 1.0 + sc.drift * math.sin(2 * math.pi * (t - sc.let_in_at) / sc.drift_period)
    return p * (1.0 + sc.noise * _noise(sc.seed, 0, t))


def supply_at(t: float, sc: Scenario) -> tuple[float, float]:
    """Supply read-back (voltage V, current A) at scenario time ``t``."""
    if t < sc.supply_on_at:
        return 0.0, 0.0
    v = sc.supply_voltage * (1.0 + 0.002 * _noise(sc.seed, 1, t))
    i = sc.supply_current * (1.0 + 0.01 * _noise(sc.seed, 2, t))
    return v, i
