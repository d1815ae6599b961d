"""Gaps other than the main one: stray gaps at cathode potential, and longer paths left of the minimum.

A shield, feedthrough or clamp gap is checked at the operating pressure with the same breakdown
law as the main gap; left of the Paschen minimum a longer path breaks down at a lower voltage,
so the back and sides of the cathode matter. SI in.
"""

from __future__ import annotations

from collections.abc import Callable

from .bench import Bench, OperatingPoint
from .glow import LoadLine
from .results import Flag, StrayResult

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


def _first_reason(g: StrayResult, vb: float | None, V: float | None) -> str:
    where = f"{g.name} ({g.length * 1e3:.3g} mm) breaks down at {g.breakdown_voltage:.0f} V"
    if vb is None:
        lead = f"{where}, while the main gap cannot break down at any voltage"
    else:
        lead = f"{where}, at or below the main gap's {vb:.0f} V"
    if V is None:
        return f"{lead}: a discharge would start there"
    if V >= g.breakdown_voltage:
        return f"{lead}, and the supply's {V:.0f} V reaches it: the discharge would start there"
    return f"{lead}; the supply's {V:.0f} V does not reach it yet, but a higher voltage would strike there first"


def stray_flags(
    strays: tuple[StrayResult, ...], vb: float | None, V: float | None, load: LoadLine | None
) -> list[Flag]:
    """danger where a stray gap strikes first; watch where the running glow's voltage reaches one."""
    flags: list[Flag] = []
    running = load.voltage if load is not None else V
    for g in strays:
        if g.first:
            flags.append(Flag("stray_gap_first", "danger", _first_reason(g, vb, V), _METHOD))
        elif g.breakdown_voltage is not None and running is not None and running >= g.breakdown_voltage:
            flags.append(
                Flag(
                    "stray_gap_may_strike",
                    "watch",
                    f"{g.name} ({g.length * 1e3:.3g} mm) breaks down at {g.breakdown_voltage:.0f} V, "
                    f"within the {running:.0f} V across it while the glow runs",
                    _METHOD,
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
    chamber = ""
    if bench.chamber is not None and max(bench.chamber.radius, bench.chamber.length / 2) > point.gap:
        chamber = f"; the chamber ({bench.chamber.radius * 1e3:.0f} mm radius) holds such paths"
    return [
        Flag(
            "left_branch_longer_paths",
            "watch",
            f"the main gap ({point.gap * 1e3:.3g} mm) is left of the "
            f"minimum: longer paths at cathode potential, up to {l_min * 1e3:.3g} mm, break down at lower "
            f"voltage (down to {v_min:.0f} V){chamber}; shield the back and sides of the cathode",
            "Paschen's law, left branch",
        )
    ]
