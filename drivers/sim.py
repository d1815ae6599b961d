"""A simulated bench: a deterministic scenario of our own invention.

The chamber is pumped down from rough vacuum, argon is let in and the pressure settles to
its setpoint with gauge noise and a slow drift; the supply is switched on later and reads
back its voltage and current. Pure functions of time and a seed: the same seed always
gives the same shift.

The reactive variant (``pumping_speed`` set) lets in argon and oxygen through flow controllers
instead: the oxygen flow climbs and falls back over ``ramp_period``, the target takes oxygen
while it is metallic and less as it poisons (an invented S-curve around ``poison_flow``), and the
pressure is what the flows leave over the pumping speed.
"""

from __future__ import annotations

import math
import random
from dataclasses import dataclass

__all__ = ["SCCM", "Scenario", "flows_at", "pressure_at", "supply_at"]

SCCM = 101325.0 * 1e-6 / 60.0
"""One sccm in Pa m^3/s (0 C, 1 atm)."""


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
    pumping_speed: float | None = None
    """m^3/s; set for the reactive variant (argon and oxygen flows)."""
    argon_flow: float = 40.0
    """sccm."""
    oxygen_max: float = 12.0
    """sccm, the top of the oxygen ramp."""
    ramp_period: float = 600.0
    poison_flow: float = 6.0
    """sccm of oxygen where the target is half poisoned (invented)."""


def _noise(seed: int, channel: int, t: float) -> float:
    """A standard normal number fixed by (seed, channel, 50 ms slot of t)."""
    return random.Random(seed * 1_000_003 + channel * 7919 + math.floor(t * 20)).gauss(0.0, 1.0)


def flows_at(t: float, sc: Scenario) -> tuple[float, float]:
    """(argon, oxygen) flows at scenario time ``t``, sccm: argon from the let-in on, oxygen a
    triangle from 0 to ``oxygen_max`` and back over ``ramp_period`` after the supply is on.

    >>> flows_at(0.0, Scenario(pumping_speed=0.25)), flows_at(316.0, Scenario(pumping_speed=0.25, noise=0))
    ((0.0, 0.0), (40.0, 12.0))
    """
    if t < sc.let_in_at:
        return 0.0, 0.0
    ar = sc.argon_flow * (1.0 + 0.2 * sc.noise * _noise(sc.seed, 3, t))
    phase = max(t - sc.supply_on_at, 0.0) % sc.ramp_period / sc.ramp_period
    o2 = sc.oxygen_max * (1.0 - abs(2.0 * phase - 1.0)) if t >= sc.supply_on_at else 0.0
    return ar, o2 * (1.0 + 0.2 * sc.noise * _noise(sc.seed, 4, t))


def _flow_pressure(t: float, sc: Scenario) -> float:
    """Reactive variant: argon and the oxygen the target leaves, over the pumping speed (Pa)."""
    ar, o2 = flows_at(t, sc)
    taken = 1.0 / (1.0 + math.exp((o2 - sc.poison_flow) / 0.6)) if t >= sc.supply_on_at else 0.0
    return (ar + o2 * (1.0 - taken)) * SCCM / sc.pumping_speed


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
        if sc.pumping_speed is None:
            p = sc.base_pressure + (sc.setpoint - sc.base_pressure) * rise
            p *= 1.0 + sc.drift * math.sin(2 * math.pi * (t - sc.let_in_at) / sc.drift_period)
        else:  # flows set the pressure: no drift of its own
            p = sc.base_pressure + (_flow_pressure(t, sc) - sc.base_pressure) * rise
    return p * (1.0 + sc.noise * _noise(sc.seed, 0, t))


def supply_at(t: float, sc: Scenario) -> tuple[float, float]:
    """Supply read-back (voltage V, current A) at scenario time ``t``."""
    if t < sc.supply_on_at:
        return 0.0, 0.0
    v = sc.supply_voltage * (1.0 + 0.002 * _noise(sc.seed, 1, t))
    i = sc.supply_current * (1.0 + 0.01 * _noise(sc.seed, 2, t))
    return v, i
