"""Reactive sputtering: the target's mode from the gas balance, and charging arcs on its film.

Target mode. With every gas pumped alike at speed S and in steady state, a gas let in at flow Q
would sit at the partial pressure Q/S if nothing took it away. The inert gases are not consumed,
so the reactive gas's measured partial pressure is the total pressure minus the inert gases'
expected ones; the target's film takes the rest. The consumed fraction names the mode: metal
(most reactive gas consumed), transition, poisoned (little consumed). The thresholds are ours.

Charging. A film of relative permittivity eps_r on the cathode charges under the ion current
density j until its field reaches the film's dielectric strength E_bd, in t = eps0 eps_r E_bd / j,
whatever its thickness; then it breaks down as an arc. A supply whose on-time exceeds t arcs.

SI: pressures in Pa, flows in Pa m^3/s, pumping speed in m^3/s, current in A, areas in m^2,
times in s.
"""

from __future__ import annotations

import math
from collections.abc import Mapping

from . import constants as _c
from .bench import Bench, OperatingPoint
from .gas import Film, Gas
from .results import Charging, TargetMode
from .sentence import Flag, Quantity, flag, q

__all__ = [
    "METAL_ABOVE",
    "BALANCE_SLACK",
    "POISONED_BELOW",
    "RESOLVABLE",
    "Charging",
    "TargetMode",
    "charging_flags",
    "charging_time",
    "reactive_results",
    "target_flags",
    "target_mode",
]

METAL_ABOVE = 0.8
"""Consumed fraction of the reactive gas above which the target is taken as metallic (ours)."""
POISONED_BELOW = 0.2
"""Consumed fraction below which the target is taken as poisoned (ours)."""
RESOLVABLE = 0.05
"""The reactive gases must be at least this share of the expected pressure for the balance to tell
what the target takes: a few per cent of error in the gauge or the pumping speed would hide less
(our judgement)."""
BALANCE_SLACK = 1.5
"""The gauge may read up to this factor above every gas's Q/S, or below the inert gases' Q/S by it,
before the gas balance is called off (gauge calibration and pumping speed are rarely better than
that; our judgement)."""


def target_mode(pressure: float, flows: Mapping[Gas, float], speed: float) -> TargetMode | None:
    """The target mode at total pressure ``pressure`` (Pa) with ``flows`` (Pa m^3/s) by gas and
    pumping speed ``speed`` (m^3/s); None without a reactive gas flowing.

    >>> from strikeline.profiles.gasdata import find_gas
    >>> ar, o2 = find_gas("argon"), find_gas("oxygen")
    >>> m = target_mode(0.45, {ar: 0.1, o2: 0.02}, 0.25)   # expected Ar 0.4 Pa, O2 0.08 Pa
    >>> round(m.measured, 3), round(m.consumed, 3), m.mode
    (0.05, 0.375, 'transition')
    """
    reactive = {g: q for g, q in flows.items() if g.reactive and q > 0}
    if not reactive or speed <= 0:
        return None
    expected = math.fsum(reactive.values()) / speed
    inert = math.fsum(q for g, q in flows.items() if not g.reactive) / speed
    measured = max(pressure - inert, 0.0)
    consumed = min(max(1.0 - measured / expected, 0.0), 1.0)
    mode = "metal" if consumed >= METAL_ABOVE else "poisoned" if consumed <= POISONED_BELOW else "transition"
    if pressure > BALANCE_SLACK * (inert + expected) or pressure * BALANCE_SLACK < inert:
        mode = "unclear"
    elif expected < RESOLVABLE * (inert + expected):
        mode = "unresolved"
    return TargetMode(tuple(sorted(g.key for g in reactive)), expected, measured, consumed, mode, inert)


def target_flags(m: TargetMode) -> list[Flag]:
    """The mode in words, and what the operator can do in the transition and poisoned modes."""
    gases = " and ".join(m.reactive)
    method = (
        "gas balance in steady state, every gas pumped alike: expected partial pressure flow/speed, "
        f"measured = total - inert gases' flow/speed; metal above {METAL_ABOVE:.0%} consumed, poisoned "
        f"below {POISONED_BELOW:.0%} (our thresholds)"
    )
    took = "the target takes {consumed} of the " + gases + " ({measured} left of {expected} expected)"
    balance = {
        "consumed": q(m.consumed, "fraction", "%", ".0%", "share of the reactive gas the target takes"),
        "measured": q(m.measured, "pressure", "Pa", what="reactive partial pressure measured"),
        "expected": q(m.expected, "pressure", "Pa", what="reactive partial pressure if nothing took it"),
    }
    if m.mode == "unclear":
        return [
            flag(
                "gas_balance_off",
                "watch",
                "the gauge reads {total} but the flows over the pumping speed give {inert} of inert gas and "
                "{expected} of " + gases + " at most: check the pumping speed (a throttle valve?), the gauge's gas "
                "correction or a leak; the target mode is not judged",
                method,
                total=q(m.measured + m.inert, "pressure", "Pa", what="gauge reading"),
                inert=q(m.inert, "pressure", "Pa", what="inert gases' partial pressure from the flows"),
                expected=balance["expected"],
            )
        ]
    if m.mode == "unresolved":
        share = m.expected / (m.expected + m.inert)
        return [
            flag(
                "target_unresolved",
                "ok",
                "the " + gases + " is {share} of the expected pressure: a few per cent of error in the gauge or the "
                "pumping speed would hide what the target takes; the mode is judged from {least} up",
                method,
                share=q(share, "fraction", "%", ".1%", "reactive share of the expected pressure"),
                least=q(RESOLVABLE, "fraction", "%", ".0%", "least share the mode is judged from"),
            )
        ]
    if m.mode == "metal":
        return [flag("target_metal", "ok", "metal mode: " + took, method, **balance)]
    if m.mode == "transition":
        return [
            flag(
                "target_transition",
                "watch",
                "transition mode: " + took + "; where it tips into poisoned mode the discharge voltage and the "
                "deposition rate jump: hold the reactive flow steady",
                method,
                **balance,
            )
        ]
    return [
        flag(
            "target_poisoned",
            "watch",
            "poisoned mode: " + took + "; the target is covered with its film (slower deposition, arcs): "
            f"less {gases} flow or more pumping brings it back",
            method,
            **balance,
        )
    ]


def charging_time(eps_r: float, strength: float, j: float) -> float:
    """Time for an insulating film to charge to its breakdown field under ion current density j:
    t = eps0 eps_r E_bd / j, s (eps_r dimensionless, E_bd in V/m, j in A/m^2).

    >>> round(charging_time(3.9, 1e9, 10.0) * 1e3, 2)   # SiO2 at 1 mA/cm^2
    3.45
    """
    return _c.epsilon_0 * eps_r * strength / j


def charging_flags(
    film: Film,
    current: float,
    area: float,
    gamma: float,
    on_time: float | None,
    off_time: float | None,
) -> tuple[Charging, list[Flag]]:
    """Charging of ``film`` under ``current`` (A) on ``area`` (m^2, the part that carries it): the
    ion share of the cathode current is 1/(1 + gamma) (common practice). A DC supply (``on_time``
    None) or an on-time longer than the charging time arcs."""
    j = current / (1.0 + gamma) / area
    t = charging_time(film.eps_r[0], film.strength[0], j)
    result = Charging(film.name, j, t, on_time)
    method = (
        f"t = eps0 eps_r E_bd / j with {film.name} eps_r {film.eps_r[0]:g}-{film.eps_r[1]:g}, E_bd "
        f"{film.strength[0]:.2g}-{film.strength[1]:.2g} V/m (the low ends: the shortest time; {film.source}); "
        "ion share of the current 1/(1 + gamma) (common practice)"
    )
    lead = f"the {film.name} film on the target charges to breakdown in {{t}} under {{j}} of ions"
    half_duty = 1.0 / (2.0 * t)
    said = {"t": _time(t, "charging time"), "j": q(j, "current_density", "mA/cm^2", what="ion current density")}
    if on_time is None:
        return result, [
            flag(
                "charging_arcs",
                "danger",
                lead + "; a DC supply keeps charging it, so it arcs: pulse the supply with on-times under {t} (at "
                "50 % duty, above {f})",
                method,
                f=_frequency(half_duty, "least pulse frequency at 50 % duty"),
                **said,
            )
        ]
    if on_time > t:
        faster = 1.0 / (t + (off_time or t))
        return result, [
            flag(
                "charging_arcs",
                "watch",
                lead + ", shorter than the {on} on-time: expect arcs; keep the on-time under {t} (with this "
                "off-time, pulse above {f})",
                method,
                on=_time(on_time, "on-time per pulse"),
                f=_frequency(faster, "least pulse frequency with this off-time"),
                **said,
            )
        ]
    return result, [
        flag(
            "charging_held",
            "ok",
            lead + ", longer than the {on} on-time: each pulse ends first",
            method,
            on=_time(on_time, "on-time per pulse"),
            **said,
        )
    ]


def _time(t: float, what: str) -> Quantity:
    return q(t, "time", "us" if t < 1e-2 else "ms" if t < 10 else "s", what=what)


def _frequency(f: float, what: str) -> Quantity:
    return q(f, "frequency", "kHz" if f >= 1e3 else "Hz", what=what)


def reactive_results(point: OperatingPoint, bench: Bench, gamma: float, load, frequency: float | None):
    """(target mode, charging, expected partial pressures, flags) of a reactive process: each gas's
    expected partial pressure flow / speed (steady state, every gas pumped alike), the target mode from
    the gas balance, and charging arcs on the target's film (``load`` the load line, if any, for the
    current; ``frequency`` an alternating supply's, whose half periods discharge the film)."""
    flags: list[Flag] = []
    partial = () if bench.pumping_speed is None else tuple((g.key, q / bench.pumping_speed) for g, q in point.flows)
    target = None
    if bench.pumping_speed is not None and point.flows:
        target = target_mode(point.pressure, dict(point.flows), bench.pumping_speed)
        if target is not None:
            flags += target_flags(target)
    charging = None
    reactive_fill = any(g.reactive for g in bench.fill.gases)
    film_there = target.mode not in ("metal", "unresolved") if target is not None else reactive_fill
    current = point.current if point.current is not None else (load.current if load is not None else None)
    s = bench.supply
    if bench.film is not None and film_there and s is not None and bench.cathode_area and current:
        if math.isfinite(current) and current > 0:
            if frequency is not None:  # each half period reverses the field and discharges the film
                on = off = 0.5 / frequency
            else:
                on = None if s.mode != "pulsed" else 1.0 / s.frequency - s.off_time
                off = s.off_time
            area = bench.cathode_area * bench.racetrack_fraction
            charging, more = charging_flags(bench.film, current, area, gamma, on, off)
            flags += more
    return target, charging, partial, flags
