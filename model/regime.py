"""The glow regime after ignition: the supply's load line judged, with its flags.

:mod:`strikeline.model.glow` holds the formulas; this module picks the gas-cathode pair's
normal-glow data, solves the load line and says what it means for the operator. SI in.
"""

from __future__ import annotations

from . import glow
from .bench import Bench
from .sentence import Flag, Quantity, flag, q

__all__ = ["ARC_SPOT_CURRENT", "glow_after_ignition", "normal_glow_data"]

ARC_SPOT_CURRENT = 1.0
"""A: about the least current a metal cathode spot needs to keep an arc burning (from memory)."""


def normal_glow_data(bench: Bench, v_min: float) -> tuple[float, float | None, float | None, str]:
    """(V_n in V, j_n/p^2 in A m^-2 Pa^-2, pd_n in Pa m, source) for the bench's gas-cathode pair;
    without data, V_n is taken as the Paschen minimum ``v_min`` and the rest is unknown."""
    row = bench.cathode.normal_glow.get(bench.fill.main.key)
    if row is None:
        return v_min, None, None, "V_n taken as the Paschen minimum V_min, no normal-glow data for this pair"
    return row.cathode_fall, row.current_density_per_p2, row.pd_n, row.source


def glow_after_ignition(bench: Bench, p_eff: float, v_min: float, V: float) -> tuple[glow.LoadLine, list[Flag]]:
    """Where the load line of ``bench.supply`` at ``V`` (V) meets the glow at pressure ``p_eff`` (Pa),
    and the flags it raises: the regime, arc risk, a supply that can feed an arc."""
    s = bench.supply
    v_n, j_p2, _pdn, source = normal_glow_data(bench, v_min)
    j_n = None if j_p2 is None else glow.normal_current_density(j_p2, p_eff)
    ll = glow.load_line(V, s.ballast, s.current_limit, v_n, j_n, bench.cathode_area)
    method = (
        f"load line V0 - I R against the glow curve: normal glow at V_n = {v_n:.0f} V ({source}), "
        f"abnormal glow V_n (j/j_n)^(1/{glow.ABNORMAL_EXPONENT:g}) (our assumption); cathode fall only"
    )
    flags: list[Flag] = []
    if ll.limited_by == "nothing":
        flags.append(
            Flag(
                "unlimited_current",
                "danger",
                "no ballast resistor and no current limit: nothing holds "
                "the current after ignition, so the glow runs away into an arc",
                method,
            )
        )
        return ll, flags
    amps = "{I} at {V}"
    at = {"I": _amps(ll.current), "V": q(ll.voltage, "voltage", "V", ".0f", "glow voltage")}
    if ll.regime == "arc_risk":
        flags.append(
            flag(
                "glow_to_arc",
                "danger",
                amps + ": {j} on the cathode approaches the {j_arc} where glows turn into arcs",
                method,
                j=q(ll.current_density, "current_density", "A/cm^2", what="current density on the cathode"),
                j_arc=q(glow.ARC_CURRENT_DENSITY, "current_density", "A/cm^2", "g", "glow-to-arc current density"),
                **at,
            )
        )
    elif ll.regime == "townsend_dark":
        flags.append(
            flag(
                "dark_discharge",
                "watch",
                amps + ": below {dark} the discharge stays dark (Townsend); lower the ballast to reach a glow",
                method,
                dark=q(glow.TOWNSEND_DARK_MAX_CURRENT, "current", "uA", "g", "largest dark-discharge current"),
                **at,
            )
        )
    else:
        cover = "" if ll.covered_fraction is None else ", glow covers {cover} of the cathode"
        if ll.covered_fraction is not None:
            at["cover"] = q(ll.covered_fraction, "fraction", "%", ".0%", "share of the cathode the glow covers")
        flags.append(
            flag(
                "glow_regime",
                "ok",
                amps
                + f": {ll.regime.replace('_', ' ')}"
                + cover
                + f", limited by the {ll.limited_by.replace('_', ' ')}",
                method,
                **at,
            )
        )
    if ll.short_circuit_current is not None and ll.short_circuit_current >= ARC_SPOT_CURRENT:
        flags.append(
            flag(
                "arc_sustainable",
                "watch",
                "the supply can drive {short} into a short, above the ~{spot} a cathode spot needs: an arc, once "
                "started, can keep burning; use arc detection or a faster current limit",
                "cathode-spot threshold current of metals (from memory)",
                short=q(ll.short_circuit_current, "current", "A", what="short-circuit current"),
                spot=q(ARC_SPOT_CURRENT, "current", "A", "g", "least current a cathode spot needs"),
            )
        )
    return ll, flags


def _amps(i: float) -> Quantity:
    return q(i, "current", "A" if i >= 1 else "mA", what="glow current")
