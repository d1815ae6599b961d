"""Plain-text renderings shared by the command line and the screen."""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from ..drivers.logbook import iso_utc
from ..model.units import READINGS, SYSTEMS, convert, format_value

if TYPE_CHECKING:
    from ..model.results import Forecast
    from ..model.sentence import Flag, Quantity

_LEVEL_MARK = {"ok": "ok    ", "watch": "WATCH ", "danger": "DANGER"}


def pd_text(pd_si: float | None, system: str) -> str:
    """A pd value (Pa m) in the unit system's pd unit.

    >>> pd_text(1.3332236842105263, "Torr"), pd_text(0.6, "SI"), pd_text(None, "SI")
    ('1 Torr cm', '0.6 Pa m', 'none')
    """
    if pd_si is None:
        return "none"
    unit = SYSTEMS[system]["pd"]
    return f"{_g(convert(pd_si, 'pd', unit))} {unit}"


def shown(x: Quantity, system: str) -> str:
    """A flag's quantity in the unit system's units: pressures, pds, fields over pressure and lengths
    the model writes in mm; every other one as the model wrote it.

    >>> from strikeline.model.sentence import q
    >>> shown(q(20.0, "pressure", "Pa"), "Torr"), shown(q(0.03, "length", "mm"), "Torr")
    ('150 mTorr', '3 cm')
    >>> shown(q(0.015, "length", "cm"), "Torr"), shown(q(0.6, "pd", "Pa m", bare=True), "mbar")
    ('1.5 cm', '6')
    """
    if x.kind in ("pressure", "pd", "e_over_p") or (x.kind == "length" and x.unit == "mm"):
        return x.text(SYSTEMS[system][x.kind], ".3g")
    return x.text()


def pressure_text(p: float, system: str, digits: int = 4) -> str:
    """A pressure (Pa) in the unit system's pressure unit, ``digits`` significant figures.

    >>> pressure_text(40.0, "SI"), pressure_text(40.0, "Torr")
    ('40 Pa', '300 mTorr')
    """
    unit = SYSTEMS[system]["pressure"]
    return f"{convert(p, 'pressure', unit):.{digits}g} {unit}"


def flag_sentence(flag: Flag, system: str) -> str:
    """A flag's sentence with its quantities in the unit system's units."""
    return flag.sentence(lambda x: shown(x, system))


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
    pu, lu = SYSTEMS[system]["pressure"], SYSTEMS[system]["length"]
    rows: list[tuple[str, str]] = [
        (
            "gas / cathode",
            f"{f.gas} / {f.cathode}   gamma {f.gamma:.3g} (range {f.gamma_range[0]:.2g}-{f.gamma_range[1]:.2g})",
        ),
        ("pressure", format_value(f.pressure, "pressure", pu)),
        *mixture_rows(f, pu),
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
            "curve minimum" if f.alternating is not None else "Paschen minimum",
            f"{format_value(f.minimum_voltage, 'voltage', 'V')} at {pd_text(f.minimum_pd, system)}"
            f" (at this gap: {format_value(f.minimum_pressure, 'pressure', pu)})",
        ),
        ("no breakdown below", format_value(f.no_breakdown_pressure, "pressure", pu) + " at this gap"),
    ]
    rows += alternating_rows(f, system)
    if f.voltage is not None:
        ac = f.alternating is not None
        rows += [
            ("voltage", format_value(f.voltage, "voltage", "V") + (" " + conventions(f.voltage) if ac else "")),
            ("strike margin", "none" if f.margin is None else f"{f.margin:+.0f} V"),
            ("E_eff/N" if ac else "E/N", f"{_g(f.E_over_N_Td)} Td"),
        ]
        if f.alpha_d is not None:
            gain = _g(f.gain) if f.gain is not None and f.gain < 1e300 else "> 1e300"
            rows.append(("alpha d", f"{_g(f.alpha_d)}   avalanche gain exp(alpha d) {gain}"))
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
    rows += reactive_rows(f)
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
    rows += [(f"not applicable: {what}", why) for what, why in f.not_applicable]
    width = max(len(k) for k, _ in rows)
    lines = [f"{k:<{width}}  {v}" for k, v in rows]
    lines.append("")
    lines.append("flags")
    for flag in f.flags:
        lines.append(f"  {_LEVEL_MARK[flag.level]} {flag.code}: {flag_sentence(flag, system)}")
    if not f.flags:
        lines.append("  none")
    lines.append("")
    lines.append(f"constants: {f.constants_source}")
    lines.append(f"gamma: {f.gamma_source}")
    lines.append("Advisory only: strikeline controls nothing. High voltage can kill.")
    return "\n".join(lines)


def fill_label(bench) -> str:
    """The gas fill in a few characters: "Ar", or "Ar 83%+O2 17%" (percent to two figures).

    >>> from strikeline.profiles.fill import read_fill, with_fill
    >>> from strikeline.profiles.bench import load_bench
    >>> fill_label(with_fill(load_bench("demo").bench, read_fill("argon:40 sccm,oxygen:8 sccm")))
    'Ar 83%+O2 17%'
    """
    if bench.fill.pure:
        return bench.fill.main.symbol
    return "+".join(f"{c.gas.symbol} {100 * c.fraction:.2g}%" for c in bench.fill.components)


def supply_label(supply, convention: str = "peak") -> str:
    """The supply in a few characters: "DC", "pulsed 10 kHz", "AC 13.56 MHz rms", "no supply" (the
    convention is how the screen shows an AC supply's voltages).

    >>> from strikeline.model.bench import Supply
    >>> supply_label(Supply(400.0, mode="ac", frequency=13.56e6), "rms"), supply_label(None)
    ('AC 13.56 MHz rms', 'no supply')
    """
    if supply is None:
        return "no supply"
    if supply.mode == "dc":
        return "DC"
    if supply.mode == "pulsed":
        return f"pulsed {frequency_text(supply.frequency)}"
    return f"AC {frequency_text(supply.frequency)} {CONVENTION_TAG[convention]}"


CONVENTION_TAG = {"peak": "pk", "rms": "rms", "pp": "pp"}
"""How a voltage's convention is marked beside it."""


def conventions(amplitude: float) -> str:
    """An alternating voltage's amplitude, quoted all three ways.

    >>> conventions(400.0)
    'peak (283 V rms, 800 V pp)'
    """
    from ..model.units import from_amplitude

    return f"peak ({from_amplitude(amplitude, 'rms'):.0f} V rms, {from_amplitude(amplitude, 'pp'):.0f} V pp)"


def frequency_text(f: float) -> str:
    """A frequency in the unit that reads best.

    >>> frequency_text(13.56e6), frequency_text(40e3), frequency_text(50.0)
    ('13.56 MHz', '40 kHz', '50 Hz')
    """
    for unit, scale in (("MHz", 1e6), ("kHz", 1e3)):
        if f >= scale:
            return f"{f / scale:.4g} {unit}"
    return f"{f:.4g} Hz"


def alternating_rows(f: Forecast, system: str) -> list[tuple[str, str]]:
    """What an alternating supply adds: regime, both branches, the turning point, the swings."""
    a = f.alternating
    if a is None:
        return []
    pu = SYSTEMS[system]["pressure"]
    rows = [("alternating", f"{frequency_text(a.frequency)}, {a.regime}; voltages are amplitudes (peak)")]
    if f.breakdown_voltage is not None:
        rows.append(
            ("  breakdown", conventions(f.breakdown_voltage).replace("peak", f"{f.breakdown_voltage:.0f} V peak"))
        )
    if a.upper_voltage is not None:
        rows.append(("  upper branch", f"{a.upper_voltage:.0f} V peak: above it electrons are swept out"))
    if a.turning_pressure is not None:
        rows.append(
            (
                "  turning point",
                f"{format_value(a.turning_pressure, 'pressure', pu)} at this gap ({a.turning_voltage:.0f} V): "
                "no volume breakdown below",
            )
        )
    dc = "none" if a.dc_voltage is None else f"{a.dc_voltage:.0f} V"
    ions = "" if a.ion_swing_ratio is None else f"; ions' swing {a.ion_swing_ratio:.2g} x the gap"
    rows.append(("  DC at this pd", f"{dc}{ions}"))
    if a.electron_swing is not None:
        rows.append(("  electron swing", f"{a.electron_swing * 1e3:.3g} mm amplitude at the applied voltage"))
    return rows


def mixture_rows(f: Forecast, pu: str) -> list[tuple[str, str]]:
    """What a mixture (or an attaching gas) adds: its make-up, the attachment limit, the expected
    partial pressures."""
    rows = []
    if len(f.composition) > 1:
        parts = " + ".join(f"{100 * x:.3g} % {g}" for g, x in f.composition)
        rows.append(("mixture", f"{parts} (linear mixing; band widened, see flags)"))
    if f.critical_E_over_N_Td is not None:
        eta = "" if f.eta is None else f"; eta here {_g(f.eta)} /m"
        rows.append(("attachment", f"alpha = eta at {f.critical_E_over_N_Td:.0f} Td{eta}"))
    if f.partial_pressures:
        rows.append(
            (
                "expected partials",
                ", ".join(f"{g} {format_value(p, 'pressure', pu)}" for g, p in f.partial_pressures)
                + " (flow / pumping speed, steady state)",
            )
        )
    return rows


def reactive_rows(f: Forecast) -> list[tuple[str, str]]:
    """The target mode and the charging of its film."""
    rows = []
    if f.target is not None:
        t = f.target
        if t.mode in ("unclear", "unresolved"):
            rows.append(("target mode", "not judged (see flags)"))
        else:
            rows.append(("target mode", f"{t.mode}: {t.consumed:.0%} of the {' and '.join(t.reactive)} consumed"))
    if f.charging is not None:
        c = f.charging
        on = "DC (always on)" if c.on_time is None else f"on-time {_g(c.on_time * 1e6)} us"
        rows.append(("film charging", f"{c.film} to breakdown in {_g(c.time * 1e6)} us; {on}"))
    return rows


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
    kind, unit = READINGS[r.quantity]
    shown = format_value(value, kind, unit) if value is not None else str(r.status).upper()
    extra = ""
    if corr is not None and r.value is not None:
        extra = (
            f"  (indicated {format_value(r.value, kind, unit)}, {corr.kind} gauge{', approximate' if approx else ''})"
        )
    return f"{iso_utc(r.t_wall)[11:23]}  {r.channel:<16} {shown:>14}  {r.status}{extra}"


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
    detected = sum(1 for m in s["strikes"] if m.get("made_by") == "detected")
    proposed = sum(1 for e in s["proposed_strikes"] if e.get("event") == "strike proposed")
    dropped = sum(1 for e in s["proposed_strikes"] if e.get("event") == "strike dropped")
    lines.append(
        f"strike marks ({len(s['strikes'])}: {detected} seen by the instruments and kept; "
        f"{proposed} proposed, {dropped} dropped)"
    )
    for m in s["strikes"]:
        by = " (instruments)" if m.get("made_by") == "detected" else ""
        lines.append(
            f"  {m['t'][11:23]}  {m['pressure_Pa']:.4g} Pa, gap {m['gap_m'] * 1e3:.4g} mm, {m['voltage_V']:.0f} V{by}"
        )
    lines.append(f"gas fill ({len(s['fills'])})")
    for fl in s["fills"]:
        when = "start" if fl["source"] == "profile" else (fl["t"] or "?")[11:23]
        lines.append(f"  {when:<12}  {fl['composition']} ({fl['source']})")
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
