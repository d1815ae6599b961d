"""Gaps other than the main one: stray gaps at cathode potential, and longer paths left of the minimum.

A shield, feedthrough or clamp gap is checked at the operating pressure with the same breakdown
law as the main gap; left of the Paschen minimum a longer path breaks down at a lower voltage,
so the back and sides of the cathode matter. SI in.
"""

from __future__ import annotations

from collections.abc import Callable

from .bench import Bench, OperatingPoint
from .glow import LoadLine
from .results import StrayResult
from .sentence import Flag, flag, q

__all__ = ["left_branch_flags", "stray_flags", "stray_gaps"]

_METHOD = "Paschen's law at each gap's own pd"


def stray_gaps(
    bench: Bench, breakdown: Callable[[float, float], float | None], p_eff: float, scale: float, vb: float | None
) -> tuple[StrayResult, ...]:
    """Each of the bench's stray gaps at pressure ``p_eff`` (Pa): its breakdown voltage, by
    ``breakdown(reduced pd, length)``, and whether it breaks down at or below the main gap's ``vb``
    (V). ``scale`` turns actual pd into reduced pd."""
    out = []
    for g in bench.stray_gaps:
        v = breakdown(p_eff * g.length * scale, g.length)
        first = v is not None and (vb is None or v <= vb)
        out.append(StrayResult(g.name, g.length, v, first))
    return tuple(out)


def _first_flag(g: StrayResult, vb: float | None, V: float | None) -> Flag:
    quantities = {
        "length": q(g.length, "length", "mm", what="stray gap length"),
        "vs": q(g.breakdown_voltage, "voltage", "V", ".0f", "stray gap breakdown voltage"),
    }
    where = g.name + " ({length}) breaks down at {vs}"
    if vb is None:
        lead = where + ", while the main gap cannot break down at any voltage"
    else:
        lead = where + ", at or below the main gap's {vb}"
        quantities["vb"] = q(vb, "voltage", "V", ".0f", "main gap breakdown voltage")
    if V is None:
        text = lead + ": a discharge would start there"
    else:
        quantities["V"] = q(V, "voltage", "V", ".0f", "supply voltage")
        if V >= g.breakdown_voltage:
            text = lead + ", and the supply's {V} reaches it: the discharge would start there"
        else:
            text = lead + "; the supply's {V} does not reach it yet, but a higher voltage would strike there first"
    return flag("stray_gap_first", "danger", text, _METHOD, **quantities)


def stray_flags(
    strays: tuple[StrayResult, ...], vb: float | None, V: float | None, load: LoadLine | None
) -> list[Flag]:
    """danger where a stray gap strikes first; watch where the running glow's voltage reaches one."""
    flags: list[Flag] = []
    running = load.voltage if load is not None else V
    for g in strays:
        if g.first:
            flags.append(_first_flag(g, vb, V))
        elif g.breakdown_voltage is not None and running is not None and running >= g.breakdown_voltage:
            flags.append(
                flag(
                    "stray_gap_may_strike",
                    "watch",
                    g.name + " ({length}) breaks down at {vs}, within the {running} across it while the glow runs",
                    _METHOD,
                    length=q(g.length, "length", "mm", what="stray gap length"),
                    vs=q(g.breakdown_voltage, "voltage", "V", ".0f", "stray gap breakdown voltage"),
                    running=q(running, "voltage", "V", ".0f", "voltage while the glow runs"),
                )
            )
    if strays and not flags:
        names = ", ".join(g.name for g in strays)
        flags.append(
            Flag(
                "stray_gaps_hold",
                "ok",
                f"no stray gap ({names}) breaks down below the main gap or the running voltage",
                _METHOD,
            )
        )
    return flags


def left_branch_flags(
    br: str, point: OperatingPoint, bench: Bench, pd_min: float, v_min: float, scale: float, p_eff: float
) -> list[Flag]:
    """Left of the minimum, longer paths at cathode potential break down at lower voltage."""
    if br != "left":
        return []
    l_min = pd_min / scale / p_eff  # the length that sits at the minimum at this pressure
    chamber, extra = "", {}
    if bench.chamber is not None and max(bench.chamber.radius, bench.chamber.length / 2) > point.gap:
        chamber = "; the chamber ({radius} radius) holds such paths"
        extra["radius"] = q(bench.chamber.radius, "length", "mm", ".0f", "chamber radius")
    return [
        flag(
            "left_branch_longer_paths",
            "watch",
            "the main gap ({gap}) is left of the minimum: longer paths at cathode potential, up to {l_min}, break "
            "down at lower voltage (down to {v_min})" + chamber + "; shield the back and sides of the cathode",
            "Paschen's law, left branch",
            gap=q(point.gap, "length", "mm", what="main gap"),
            l_min=q(l_min, "length", "mm", what="path length at the curve's minimum"),
            v_min=q(v_min, "voltage", "V", ".0f", "minimum breakdown voltage"),
            **extra,
        )
    ]
