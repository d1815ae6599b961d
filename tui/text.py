"""Plain-text renderings shared by the command line and the screen."""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from ..drivers.logbook import iso_utc
from ..model import constants as _c
from ..model.units import format_value

if TYPE_CHECKING:
    from ..model.forecast import Forecast

UNIT_SYSTEMS = {
    # pressure unit, length unit, pd unit (pressure, length)
    "SI": ("Pa", "mm", ("Pa", "m")),
    "mbar": ("mbar", "mm", ("mbar", "mm")),
    "Torr": ("mTorr", "cm", ("Torr", "cm")),
}

_LEVEL_MARK = {"ok": "ok    ", "watch": "WATCH ", "danger": "DANGER"}


def pd_text(pd_si: float | None, system: str) -> str:
    """A pd value (Pa m) in the unit system's pd unit.

    >>> pd_text(1.3332236842105263, "Torr"), pd_text(0.6, "SI"), pd_text(None, "SI")
    ('1 Torr cm', '0.6 Pa m', 'none')
    """
    if pd_si is None:
        return "none"
    pu, lu = UNIT_SYSTEMS[system][2]
    from ..model.units import convert

    value = convert(pd_si, "pressure", pu) * convert(1.0, "length", lu)
    return f"{_g(value)} {pu} {lu}"


def amps(i: float) -> str:
    """A current as mA below 1 A, as A above.

    >>> amps(0.0213), amps(1.5)
    ('21.3 mA', '1.5 A')
    """
    return f"{i:.3g} A" if i >= 1 else f"{i * 1e3:.3g} mA"


def _g(x: float) -> str:
    return f"{x:.3g}"


def forecast_text(f: Forecast, system: str = "SI") -> str:
    """The forecast as the lines ``strikeline strike`` prints."""
    pu, lu, _ = UNIT_SYSTEMS[system]
    rows: list[tuple[str, str]] = [
        (
            "gas / cathode",
            f"{f.gas} / {f.cathode}   gamma {f.gamma:.3g} (range {f.gamma_range[0]:.2g}-{f.gamma_range[1]:.2g})",
        ),
        ("pressure", format_value(f.pressure, "pressure", pu)),
        ("gap", format_value(f.gap, "length", lu)),
        ("gas temperature", f"{f.gas_temperature:.1f} K (constants at {f.reference_temperature:.2f} K)"),
        ("pd", f"{pd_text(f.pd, system)}   reduced {pd_text(f.reduced_pd, system)}"),
        (
            "breakdown voltage",
            "none (no voltage breaks this gap down)"
            if f.breakdown_voltage is None
            else format_value(f.breakdown_voltage, "voltage", "V") + f"   [{f.law} law]",
        ),
        (
            "branch",
            {"left": "left of the minimum", "right": "right of the minimum", "none": "left of the asymptote"}[f.branch],
        ),
        (
            "Paschen minimum",
            f"{format_value(f.minimum_voltage, 'voltage', 'V')} at {pd_text(f.minimum_pd, system)}"
            f" (at this gap: {format_value(f.minimum_pressure, 'pressure', pu)})",
        ),
        ("no breakdown below", format_value(f.no_breakdown_pressure, "pressure", pu) + " at this gap"),
    ]
    if f.voltage is not None:
        rows += [
            ("voltage", format_value(f.voltage, "voltage", "V")),
            ("strike margin", "none" if f.margin is None else f"{f.margin:+.0f} V"),
            ("E/N", f"{_g(f.E_over_N_Td)} Td"),
            (
                "alpha d",
                f"{_g(f.alpha_d)}   avalanche gain exp(alpha d) "
                + (_g(f.gain) if f.gain is not None and f.gain < 1e300 else "> 1e300"),
            ),
        ]
    if f.effective_pressure is not None:
        rows.append(
            (
                "magnetised",
                f"effective pressure {format_value(f.effective_pressure, 'pressure', pu)}, "
                f"omega_ce/nu_m {_g(f.hall_parameter)} (crossed-field approximation)",
            )
        )
    lo, hi = f.breakdown_band
    if f.breakdown_voltage is not None:
        rows.append(
            (
                "breakdown band",
                f"{'?' if lo is None else f'{lo:.0f}'} to {'?' if hi is None else f'{hi:.0f}'} V ({f.band_source})",
            )
        )
    for g in f.stray_gaps:
        v = "none" if g.breakdown_voltage is None else f"{g.breakdown_voltage:.0f} V"
        rows.append(
            (
                f"stray: {g.name}",
                f"{format_value(g.length, 'length', lu)}, breaks down at {v}" + ("  << FIRST" if g.first else ""),
            )
        )
    if f.load_line is not None:
        ll = f.load_line
        cover = "" if ll.covered_fraction is None else f", covers {ll.covered_fraction:.0%} of the cathode"
        rows.append(
            (
                "glow after ignition",
                f"{ll.regime.replace('_', ' ')}: {amps(ll.current)} at "
                f"{ll.voltage:.0f} V{cover} (limited by the {ll.limited_by.replace('_', ' ')})",
            )
        )
    if f.afterglow is not None:
        a = f.afterglow
        left = "" if a.residual_fraction is None else f", {a.residual_fraction:.0%} left after the off-time"
        rows.append(
            (
                "afterglow",
                f"decay time {_g(a.decay_time * 1e6)} us (D_a {_g(a.ambipolar_diffusion)} m2/s, "
                f"Lambda {_g(a.diffusion_length * 1e3)} mm){left}",
            )
        )
    width = max(len(k) for k, _ in rows)
    lines = [f"{k:<{width}}  {v}" for k, v in rows]
    lines.append("")
    lines.append("flags")
    for flag in f.flags:
        lines.append(f"  {_LEVEL_MARK[flag.level]} {flag.code}: {flag.reason}")
    if not f.flags:
        lines.append("  none")
    lines.append("")
    lines.append(f"constants: {f.constants_source}")
    lines.append(f"gamma: {f.gamma_source}")
    lines.append("Advisory only: strikeline controls nothing. High voltage can kill.")
    return "\n".join(lines)


_READING_UNITS = {"pressure": "Pa", "voltage": "V", "current": "mA", "flow": "sccm"}


def state_word(value: float | None, labels: dict[int, str]) -> str:
    """The word a state channel's value stands for ("closed"), or the number where none is given.

    >>> state_word(1.0, {0: "open", 1: "closed"}), state_word(7.0, {0: "open"}), state_word(None, {})
    ('closed', '7', '-')
    """
    if value is None:
        return "-"
    return labels.get(int(value), f"{value:g}") if float(value).is_integer() else f"{value:g}"


def corrected_value(r, corr) -> tuple[float | None, bool]:
    """(true value, approximate?) of a reading after its gauge's gas correction."""
    from ..model.gauges import correct

    if r.value is None or corr is None:
        return r.value, False
    return correct(r.value, corr)


def reading_json(r, corr=None, labels: dict[int, str] | None = None) -> dict[str, Any]:
    """One reading as ``strikeline gauge --json`` prints it (SI; a state also in words)."""
    value, approx = corrected_value(r, corr)
    out = {
        "kind": "reading",
        "channel": r.channel,
        "quantity": r.quantity,
        "value_si": value,
        "indicated": r.value,
        "status": str(r.status),
        "approximate": approx,
        "gauge": None if corr is None else corr.kind,
        "source": r.source,
        "raw": r.raw,
        "t": iso_utc(r.t_wall),
    }
    if r.quantity == "state":
        out["state"] = None if r.value is None else state_word(r.value, labels or {})
    return out


def reading_text(r, corr=None, labels: dict[int, str] | None = None) -> str:
    """One reading as a line of text."""
    value, approx = corrected_value(r, corr)
    if r.quantity == "state":
        shown = state_word(value, labels or {}) if value is not None else str(r.status).upper()
        return f"{iso_utc(r.t_wall)[11:23]}  {r.channel:<16} {shown:>14}  {r.status}"
    unit = _READING_UNITS[r.quantity]
    kind = r.quantity
    shown = format_value(value, kind, unit) if value is not None else str(r.status).upper()
    extra = ""
    if corr is not None and r.value is not None:
        extra = (
            f"  (indicated {format_value(r.value, kind, unit)}, {corr.kind} gauge{', approximate' if approx else ''})"
        )
    return f"{iso_utc(r.t_wall)[11:23]}  {r.channel:<16} {shown:>14}  {r.status}{extra}"


def gases_json() -> dict[str, Any]:
    """Gas and cathode data in SI, with sources."""
    from ..model import paschen
    from ..profiles.loader import cathodes, gases, unsupported_gases

    out_g = []
    for g in gases().values():
        c = g.constants
        pd_min, v_min = paschen.minimum(c.A, c.B, 0.01)
        out_g.append(
            {
                "name": g.key,
                "symbol": g.symbol,
                "A_per_Pa_m": c.A,
                "B_V_per_Pa_m": c.B,
                "E_over_p_range_V_per_Pa_m": [c.E_over_p_low, c.E_over_p_high],
                "reference_temperature_K": c.reference_temperature,
                "source": c.source,
                "minimum_at_gamma_0.01": {"pd_Pa_m": pd_min, "voltage_V": v_min},
                "ionisation_energy_eV": g.ionisation_energy,
                "ion_mobility_m2_per_V_s": g.ion_mobility,
                "ion_mobility_source": g.ion_mobility_source,
                "uniform_field_law": None if g.law is None else {"source": g.law.source},
            }
        )
    seen = set()
    unsupported = []
    for name, reason in unsupported_gases().items():
        if reason not in seen:
            seen.add(reason)
            unsupported.append({"name": name, "reason": reason})
    gas_list = list(gases().values())
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
    return {"gases": out_g, "unsupported": unsupported, "cathodes": out_c}


def gases_text() -> str:
    """Gas and cathode tables as ``strikeline gases`` prints them."""
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
        if g["uniform_field_law"]:
            lines.append(f"  {'':<15} high pd: {g['uniform_field_law']['source']}")
    for u in d["unsupported"]:
        lines.append(f"  {u['name']:<15} not supported: {u['reason']}")
    lines += ["", "cathodes (gamma by gas)", ""]
    for c in d["cathodes"]:
        note = f"  ({c['note']})" if c["note"] else ""
        lines.append(f"  {c['symbol']} {c['name']}, work function {c['work_function_eV']:g} eV{note}")
        for gas, y in c["gamma"].items():
            lines.append(
                f"      {gas:<15} {y['value']:<7.3g} range {y['range'][0]:.2g}-{y['range'][1]:.2g}  {y['source']}"
            )
    return "\n".join(lines)


def log_summary_text(s: dict[str, Any]) -> str:
    """A logbook summary as ``strikeline log`` prints it."""
    lines = [f"bench {s['bench'] or '(not named)'}: {s['records']} records over {s['span_s']:.1f} s"]
    if s["start"] is not None:
        lines.append(f"  from {iso_utc(s['start'])} to {iso_utc(s['end'])}")
    lines.append("readings per channel")
    for ch, counts in s["readings"].items():
        parts = ", ".join(f"{n} {st}" for st, n in sorted(counts.items()))
        lines.append(f"  {ch:<18} {parts}")
    lines.append(f"gaps and faults ({len(s['gaps'])} gaps, {len(s['faults'])} faults, {s['connections']} connections)")
    for g in s["gaps"]:
        end = "end" if g["to"] is None else iso_utc(g["to"])[11:23]
        lines.append(f"  {g['channel']:<18} {iso_utc(g['from'])[11:23]} to {end}: {g['why']}")
    for e in s["faults"]:
        lines.append(f"  {e.get('port', '?'):<18} {e['t'][11:23]} {e.get('event')}: {e.get('message', '')}")
    lines.append(f"strike marks ({len(s['strikes'])})")
    for m in s["strikes"]:
        lines.append(
            f"  {m['t'][11:23]}  {m['pressure_Pa']:.4g} Pa, gap {m['gap_m'] * 1e3:.4g} mm, {m['voltage_V']:.0f} V"
        )
    lines.append(f"flag changes ({len(s['flag_changes'])})")
    for f in s["flag_changes"]:
        lines.append(f"  {f['t'][11:23]}  {f['change']:<7} {f['level']:<6} {f['code']}: {f['reason']}")
    if s["skipped"] or s["torn_tail"]:
        lines.append(f"skipped lines ({len(s['skipped']) + s['torn_tail']}), not records this version can read")
        for x in s["skipped"][:20]:
            lines.append(f"  line {x['line']}: {x['why']}")
        if len(s["skipped"]) > 20:
            lines.append(f"  and {len(s['skipped']) - 20} more (strikeline log --json lists them all)")
        if s["torn_tail"]:
            lines.append("  the last line, cut short (a crash mid-write)")
    return "\n".join(lines)
