"""The gas, mixing and cathode tables that ``strikeline gases`` prints (text and JSON)."""

from __future__ import annotations

from itertools import permutations
from typing import Any

from ..model import constants as _c

__all__ = ["gases_json", "gases_text"]

_REFUSED = (
    (("air", "nitrogen"), "air already holds nitrogen and oxygen: write the whole mixture in its gases"),
    (("air", "oxygen"), "air already holds nitrogen and oxygen: write the whole mixture in its gases"),
)


def gases_json() -> dict[str, Any]:
    """Gas, mixing and cathode data in SI, with sources."""
    from ..model import mixture as mx
    from ..model.breakdown import gas_law
    from ..model.flags import MIXTURE_UNCERTAINTY
    from ..profiles.fill import films
    from ..profiles.loader import cathodes, gases

    out_g = []
    for g in gases().values():
        c = g.constants
        pd_min, v_min = gas_law(g, 0.01).minimum()
        out_g.append(
            {
                "name": g.key,
                "symbol": g.symbol,
                "A_per_Pa_m": c.A,
                "B_V_per_Pa_m": c.B,
                "E_over_p_range_V_per_Pa_m": [c.E_over_p_low, c.E_over_p_high],
                "reference_temperature_K": c.reference_temperature,
                "source": c.source,
                "low_field": None
                if g.low_field is None
                else {
                    "A_per_Pa_m": g.low_field.A,
                    "B_V_per_Pa_m": g.low_field.B,
                    "E_over_p_range_V_per_Pa_m": [g.low_field.E_over_p_low, g.low_field.E_over_p_high],
                },
                "attachment": None
                if g.attachment is None
                else {
                    "E_over_p_range_V_per_Pa_m": [g.attachment.valid_low, g.attachment.valid_high],
                    "source": g.attachment.source,
                },
                "minimum_at_gamma_0.01": {"pd_Pa_m": pd_min, "voltage_V": v_min},
                "ionisation_energy_eV": g.ionisation_energy,
                "metastable_energy_eV": g.metastable_energy,
                "reactive": g.reactive,
                "ion_mobility_m2_per_V_s": g.ion_mobility,
                "ion_mobility_source": g.ion_mobility_source,
                "uniform_field_law": None if g.law is None else {"source": g.law.source},
            }
        )
    gas_list = list(gases().values())
    penning = [
        {
            "buffer": a.key,
            "admixture": b.key,
            "why": f"{a.key} metastables ({a.metastable_energy:g} eV) ionise {b.key} ({b.ionisation_energy:g} eV)",
        }
        for a, b in permutations(gas_list, 2)
        if a.metastable_energy is not None and b.ionisation_energy < a.metastable_energy
    ]
    mixing = {
        "form": "gas:parts,... (argon:80,oxygen:20) or gas:flow,... (argon:40 sccm,oxygen:8 sccm)",
        "rules": list(mx.ASSUMPTIONS),
        "band_widened_by": MIXTURE_UNCERTAINTY,
        "refused": [{"gases": list(pair), "why": why} for pair, why in _REFUSED],
        "penning": penning,
        "penning_note": "a Penning pair breaks down well below linear mixing: flagged; fit gives the bench curve",
    }
    out_c = []
    for cat in cathodes().values():
        out_c.append(
            {
                "name": cat.key,
                "symbol": cat.symbol,
                "work_function_eV": cat.work_function,
                "note": cat.note,
                "gamma": {
                    g.key: {"value": y.value, "range": [y.low, y.high], "source": y.source}
                    for g in gas_list
                    for y in [cat.yield_for(g)]
                },
            }
        )
    out_f = [
        {"film": f.name, "eps_r": list(f.eps_r), "strength_V_per_m": list(f.strength), "source": f.source}
        for f in films().values()
    ]
    return {"gases": out_g, "mixing": mixing, "cathodes": out_c, "films": out_f}


def gases_text() -> str:
    """Gas, mixing and cathode tables as ``strikeline gases`` prints them."""
    d = gases_json()
    per = 1.0 / (_c.centi * _c.torr)
    lines = ["gases (A, B per cm Torr; minimum at gamma 0.01)", ""]
    lines.append(f"  {'gas':<15} {'A':>6} {'B':>6} {'E/p range':>11} {'V_min':>7} {'pd_min':>13}  source")
    for g in d["gases"]:
        lo, hi = g["E_over_p_range_V_per_Pa_m"]
        m = g["minimum_at_gamma_0.01"]
        lines.append(
            f"  {g['symbol'] + ' ' + ('' if g['symbol'].casefold() == g['name'] else g['name']):<15} "
            f"{g['A_per_Pa_m'] / per:>6.3g} {g['B_V_per_Pa_m'] / per:>6.4g} "
            f"{f'{lo / per:.0f}-{hi / per:.0f}':>11} {m['voltage_V']:>5.0f} V "
            f"{m['pd_Pa_m'] / (_c.torr * _c.centi):>5.3g} Torr cm  {g['source']}"
        )
        if g["low_field"]:
            lf = g["low_field"]
            lo, hi = lf["E_over_p_range_V_per_Pa_m"]
            lines.append(
                f"  {'':<15} {lf['A_per_Pa_m'] / per:>6.3g} {lf['B_V_per_Pa_m'] / per:>6.4g} "
                f"{f'{lo / per:.3g}-{hi / per:.0f}':>11}  (low fields)"
            )
        if g["attachment"]:
            lines.append(f"  {'':<15} attaches electrons: {g['attachment']['source']}")
        if g["uniform_field_law"]:
            lines.append(f"  {'':<15} high pd: {g['uniform_field_law']['source']}")
    mix = d["mixing"]
    lines += ["", f"mixtures: {mix['form']}", ""]
    lines += [f"  {rule}" for rule in mix["rules"]]
    lines.append(f"  the breakdown band is widened by {mix['band_widened_by']:.0%} for a mixture")
    for r in mix["refused"]:
        lines.append(f"  refused: {' with '.join(r['gases'])}: {r['why']}")
    by_buffer: dict[str, list[str]] = {}
    for p in mix["penning"]:
        by_buffer.setdefault(p["buffer"], []).append(p["admixture"])
    for buffer, others in by_buffer.items():
        lines.append(f"  Penning (flagged): {buffer} with {', '.join(others)}")
    lines.append(f"  {mix['penning_note']}")
    lines += ["", "target films (eps_r, dielectric strength; for charging arcs)", ""]
    for f in d["films"]:
        lo, hi = f["strength_V_per_m"]
        lines.append(
            f"  {f['film']:<7} eps_r {_span(*f['eps_r'])}  E_bd {_span(lo / 1e8, hi / 1e8)} MV/cm  {f['source']}"
        )
    lines += ["", "cathodes (gamma by gas)", ""]
    for c in d["cathodes"]:
        note = f"  ({c['note']})" if c["note"] else ""
        lines.append(f"  {c['symbol']} {c['name']}, work function {c['work_function_eV']:g} eV{note}")
        for gas, y in c["gamma"].items():
            lines.append(
                f"      {gas:<15} {y['value']:<7.3g} range {y['range'][0]:.2g}-{y['range'][1]:.2g}  {y['source']}"
            )
    return "\n".join(lines)


def _span(lo: float, hi: float) -> str:
    """ "3.9" or "9-10".

    >>> _span(3.9, 3.9), _span(9.0, 10.0)
    ('3.9', '9-10')
    """
    return f"{lo:g}" if lo == hi else f"{lo:g}-{hi:g}"
