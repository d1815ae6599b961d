"""The simulated bench striking again and again: a scenario of our own invention for strike
detection and calibration drills.

After the supply comes on, each cycle sets a new pressure (steps around the setpoint), ramps the
voltage up from zero at ``ramp_rate`` until it reaches the simulator's own breakdown curve, burns
for ``burn`` seconds and switches off for ``rest`` seconds. The curve is an invented U shape,
V(p) = v_min (p/p_min + p_min/p) / 2, not the model's physics, so a test of the detection compares
against the simulator's truth and not against strikeline itself.

DC: the supply's voltage read-back and current; lit, the voltage falls to ``lit_share`` of the
ignition voltage and the current jumps. RF: forward and reflected power, DC self-bias and the
electrodes' peak-to-peak voltage; lit, a negative self-bias appears and the reflected power drops.
Pure functions of time, as the rest of the simulator.
"""

from __future__ import annotations

from dataclasses import dataclass

from .sim import Scenario, _noise, pressure_at

__all__ = ["Cycle", "Ignition", "cycle_pressure", "dc_at", "ignitions", "rf_at"]


@dataclass(frozen=True)
class Cycle:
    """The repeated strikes (times in s, voltages in V: amplitudes for RF)."""

    kind: str = "dc"
    """"dc" or "rf"."""
    v_min: float = 250.0
    p_min: float = 15.0
    """Pa: where the simulator's own curve has its least voltage."""
    ramp_rate: float = 150.0
    """V/s."""
    burn: float = 3.0
    rest: float = 2.0
    steps: tuple[float, ...] = (0.6, 1.0, 1.6, 2.4, 0.8, 1.3)
    """The pressure of each cycle as a share of the setpoint, in turn."""
    lit_share: float = 0.75
    lit_current: float = 0.02
    """A (DC)."""
    watts_per_volt2: float = 1e-3
    """Forward power per squared amplitude, W/V^2 (RF)."""


@dataclass(frozen=True)
class Ignition:
    t: float
    """Scenario time of ignition, s."""
    pressure: float
    """Pa (the cycle's setpoint, without noise)."""
    voltage: float


def _breakdown(p: float, cy: Cycle) -> float:
    return cy.v_min * (p / cy.p_min + cy.p_min / p) / 2.0


def _cycle(t: float, sc: Scenario, cy: Cycle) -> tuple[int, float, float, float] | None:
    """(cycle number, its pressure, its start, its ignition time), or None before the supply is on."""
    if t < sc.supply_on_at:
        return None
    t0, k = sc.supply_on_at, 0
    while True:  # a few cycles a minute: the walk is short for any bench session
        p = sc.setpoint * cy.steps[k % len(cy.steps)]
        t_ign = t0 + _breakdown(p, cy) / cy.ramp_rate
        end = t_ign + cy.burn + cy.rest
        if t < end:
            return k, p, t0, t_ign
        t0, k = end, k + 1


def ignitions(sc: Scenario, cy: Cycle, until: float) -> list[Ignition]:
    """Every ignition up to scenario time ``until`` (the simulator's truth)."""
    out, t = [], sc.supply_on_at
    while True:
        c = _cycle(t, sc, cy)
        if c is None or c[3] > until:
            return out
        _k, p, _t0, t_ign = c
        out.append(Ignition(t_ign, p, _breakdown(p, cy)))
        t = t_ign + cy.burn + cy.rest


def cycle_pressure(t: float, sc: Scenario, cy: Cycle) -> float:
    """True pressure (Pa): the pump-down and let-in as usual, then each cycle's own setpoint."""
    c = _cycle(t, sc, cy)
    if c is None:
        return pressure_at(t, sc)
    return c[1] * (1.0 + sc.noise * _noise(sc.seed, 0, t))


def _phase(t: float, sc: Scenario, cy: Cycle) -> tuple[str, float]:
    """("off", 0), ("ramp", volts), ("lit", volts) or ("rest", 0) at scenario time t."""
    c = _cycle(t, sc, cy)
    if c is None:
        return "off", 0.0
    _k, p, t0, t_ign = c
    if t < t_ign:
        return "ramp", cy.ramp_rate * (t - t0)
    if t < t_ign + cy.burn:
        return "lit", cy.lit_share * _breakdown(p, cy)
    return "rest", 0.0


def dc_at(t: float, sc: Scenario, cy: Cycle) -> tuple[float, float]:
    """Supply read-back (voltage V, current A): a dark gap draws a leak of a microamp per kilovolt."""
    phase, v = _phase(t, sc, cy)
    if phase == "lit":
        return v * (1.0 + 0.002 * _noise(sc.seed, 1, t)), cy.lit_current * (1.0 + 0.01 * _noise(sc.seed, 2, t))
    return v, v * 1e-9


def rf_at(t: float, sc: Scenario, cy: Cycle) -> tuple[float, float, float, float]:
    """(forward W, reflected W, self-bias V, electrodes' peak-to-peak V)."""
    phase, v = _phase(t, sc, cy)
    forward = cy.watts_per_volt2 * v * v
    if phase == "lit":
        return forward, 0.05 * forward, -0.4 * v * (1.0 + 0.01 * _noise(sc.seed, 5, t)), 2.0 * v
    return forward, 0.3 * forward, 0.2 * _noise(sc.seed, 6, t), 2.0 * v
