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


def _yield_json(y) -> dict[str, Any]:
    return {
        "value": y.value,
        "range": [y.low, y.high],
        "reference_E_over_p_V_per_Pa_m": y.reference or None,
        "knee_E_over_p_V_per_Pa_m": y.knee or None,
        "slope": y.slope,
        "cap": y.cap,
        "source": y.source,
    }


def gases_json() -> dict[str, Any]:
    """Gas, mixing and cathode data in SI, with sources."""
    from ..model import mixture as mx
    from ..model.breakdown import law_for
    from ..model.composition import pure
    from ..model.flags import MIXTURE_UNCERTAINTY
    from ..model.ionisation import TD_PER_V_PER_PA_M
    from ..profiles.fill import films
    from ..profiles.gasdata import cathodes, gases, sources

    out_g = []
    for g in gases().values():
        c = g.constants
        law = law_for(pure(g), [g.yield_])
        pd_min, v_min = law.minimum()
        critical = law.critical_E_over_p
        out_g.append(
            {
                "name": g.key,
                "symbol": g.symbol,
                "A_per_Pa_m": c.A,
                "B_V_per_Pa_m": c.B,
                "E_over_p_range_V_per_Pa_m": [c.E_over_p_low, c.E_over_p_high],
                "reference_temperature_K": c.reference_temperature,
                "source": c.source,
                "ionisation": [
                    {
                        "form": "A exp(-B/y)" if seg.power == 1.0 else "A exp(-sqrt(B/y))",
                        "A_per_Pa_m": seg.A,
                        "B_V_per_Pa_m": seg.B,
                        "E_over_p_range_V_per_Pa_m": [seg.low, seg.high],
                        "source": seg.source,
                    }
                    for seg in g.ionisation.segments
                ],
                "gamma_technical": _yield_json(g.yield_),
                "minimum_checked": g.minimum_checked,
                "attachment": None
                if g.attachment is None
                else {
                    "E_over_p_range_V_per_Pa_m": [g.attachment.valid_low, g.attachment.valid_high],
                    "source": g.attachment.source,
                    "three_body_source": g.attachment.three_body_source or None,
                },
                "attaches": "yes" if g.attachment else ("yes, no data held" if g.attaches_unmodelled else "no"),
                "critical_E_over_N_Td": None if critical is None else critical * TD_PER_V_PER_PA_M,
                "minimum": {"reduced_pd_Pa_m": pd_min, "voltage_V": v_min},
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
                "gamma_own": {key: _yield_json(y) for key, y in cat.yields.items()},
                "gamma_clean_metal": {
                    g.key: {"value": y.value, "range": [y.low, y.high], "source": y.source}
                    for g in gas_list
                    if (y := cat.yield_for(g, "clean-metal")) is not g.yield_
                },
            }
        )
    out_f = [
        {"film": f.name, "eps_r": list(f.eps_r), "strength_V_per_m": list(f.strength), "source": f.source}
        for f in films().values()
    ]
    return {"gases": out_g, "mixing": mixing, "cathodes": out_c, "films": out_f, "sources": sources()}


def gases_text() -> str:
    """Gas, mixing and cathode tables as ``strikeline gases`` prints them, and the sources they cite."""
    from ..profiles.gasdata import cite

    d = gases_json()
    per = 1.0 / (_c.centi * _c.torr)
    tc = _c.torr * _c.centi
    lines = [
        "gases: the ionisation law (alpha/p against E/p, published segments), the effective gamma on a",
        "technical cathode, the minimum they give, and the critical field where attachment equals ionisation",
        "(A per cm Torr, B and E/p in V/(cm Torr), pressures at 0 C)",
        "",
    ]
    for g in d["gases"]:
        m = g["minimum"]
        crit = g["critical_E_over_N_Td"]
        attach = "does not attach" if g["attaches"] == "no" else (
            f"critical E/N {crit:.0f} Td" if crit is not None else "attaches: no data held"
        )  # fmt: skip
        name = g["symbol"] + ("" if g["symbol"].casefold() == g["name"] else f" {g['name']}")
        lines.append(
            f"  {name:<19} minimum {m['voltage_V']:.0f} V at {m['reduced_pd_Pa_m'] / tc:.3g} Torr cm; {attach}"
            + ("" if g["minimum_checked"] else "; not checked against a measured minimum")
        )
        for seg in g["ionisation"]:
            lo, hi = seg["E_over_p_range_V_per_Pa_m"]
            lines.append(
                f"      {seg['form']:<18} A {seg['A_per_Pa_m'] / per:<7.4g} B {seg['B_V_per_Pa_m'] / per:<7.4g} "
                f"{lo / per:.4g}-{hi / per:.4g}  {seg['source']}"
            )
        y = g["gamma_technical"]
        shape = ""
        if y["slope"]:
            knee = y["knee_E_over_p_V_per_Pa_m"]
            shape = f" at {y['reference_E_over_p_V_per_Pa_m'] / per:.4g}, x (E/p)^{y['slope']:g}"
            shape += f" above {knee / per:.4g}" if knee else ""
            shape += f", at most {y['cap']:g}" if y["cap"] else ""
        lines.append(
            f"      gamma {y['value']:.3g}{shape} (range {y['range'][0]:.2g}-{y['range'][1]:.2g})  {y['source']}"
        )
        if g["attachment"]:
            lines.append(f"      attaches electrons: {g['attachment']['source']}")
            if g["attachment"]["three_body_source"]:
                lines.append(f"      three-body: {g['attachment']['three_body_source']}")
        if g["uniform_field_law"]:
            lines.append(f"      high pd: {g['uniform_field_law']['source']}")
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
    lines += ["", "cathodes (their own gamma where a source gives one; the clean-metal estimate, gamma_model = "
              '"clean-metal", by gas)', ""]  # fmt: skip
    for c in d["cathodes"]:
        note = f"  ({c['note']})" if c["note"] else ""
        lines.append(f"  {c['symbol']} {c['name']}, work function {c['work_function_eV']:g} eV{note}")
        for gas, y in c["gamma_own"].items():
            lines.append(
                f"      {gas:<15} {y['value']:<7.3g} range {y['range'][0]:.2g}-{y['range'][1]:.2g}  {y['source']}"
            )
        clean = ", ".join(f"{gas} {y['value']:.2g}" for gas, y in c["gamma_clean_metal"].items())
        lines.append(f"      clean metal: {clean or 'none'}")
    lines += ["", "sources (each [key] above)", ""]
    lines += [f"  [{key}] {cite(entry)}" for key, entry in d["sources"].items()]
    return "\n".join(lines)


def _span(lo: float, hi: float) -> str:
    """ "3.9" or "9-10".

    >>> _span(3.9, 3.9), _span(9.0, 10.0)
    ('3.9', '9-10')
    """
    return f"{lo:g}" if lo == hi else f"{lo:g}-{hi:g}"
