"""Text of the screen's panels, built from a Session view (no Textual here: plain strings).

Every state is spelled out in words (LIVE, STALE, LOST, WITHDRAWN, DANGER...) so the screen
reads the same on a monochrome terminal or with NO_COLOR.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from ...drivers.reading import Reading
from ...model.units import SYSTEMS, convert, format_value, from_amplitude
from ..session.session import View
from ..text import CONVENTION_TAG, amps, flag_sentence, pd_text, state_word

if TYPE_CHECKING:
    from ...model.results import Forecast

__all__ = [
    "LEVEL_STYLE",
    "LEVEL_WORD",
    "NUDGE_FIELDS",
    "STYLE",
    "channel_line",
    "flag_lines",
    "pd_display",
    "readout_lines",
    "sparkline",
]

LEVEL_WORD = {"ok": "ok", "watch": "WATCH", "danger": "DANGER"}
LEVEL_STYLE = {"DANGER": "bold reverse red", "WATCH": "bold yellow", "ok": "green"}
"""Rich style of each flag level word (the word itself carries the meaning without colour)."""
STYLE = {"bad": "bold reverse", "warn": "bold", "good": "", "": ""}
"""Rich style of the readouts' style words."""
_STATUS_WORD = {
    "ok": "LIVE",
    "stale": "STALE",
    "lost": "LOST",
    "over_range": "OVER RANGE",
    "under_range": "UNDER RANGE",
    "sensor_error": "SENSOR ERROR",
    "garbled": "GARBLED",
}
NUDGE_FIELDS = ("pressure", "gap", "voltage")


def _v(x: float | None, convention: str | None = None) -> str:
    """A voltage; an alternating supply's (an amplitude inside) shown as ``convention``."""
    if x is None:
        return "none"
    if convention is None:
        return format_value(x, "voltage", "V")
    return format_value(from_amplitude(x, convention), "voltage", "V") + f" {CONVENTION_TAG[convention]}"


def readout_lines(
    view: View,
    system: str,
    selected: str,
    manual_gap: float,
    voltage: float | None,
    fill: str = "",
    convention: str | None = None,
    wide: bool = False,
) -> list[tuple[str, str, str]]:
    """(label, value, style) rows of the readouts panel; style is "", "bad", "warn" or "good".
    ``fill`` is the gas fill in a few characters; a mixture, or a fill from the flow meters, gets a
    row of its own, and a reactive process a row for the target (both last: a short terminal clips
    them first). ``convention`` (peak, rms or pp) shows an alternating supply's voltages; ``wide``
    (a wide terminal) adds what the band is made of and what limits the glow."""
    pu, lu = SYSTEMS[system]["pressure"], SYSTEMS[system]["length"]
    p = view.pressure
    mark = {name: (">" if selected == name else " ") for name in NUDGE_FIELDS}
    rows: list[tuple[str, str, str]] = []
    if p.value is not None:
        if p.approximate:
            tag = " approx."  # outside the gauge's linear range, or no factor for this gas
        elif p.source != "manual" and p.indicated != p.value:
            tag = " gas-corr."
        else:
            tag = ""
        rows.append((f"{mark['pressure']}pressure", format_value(p.value, "pressure", pu) + tag, ""))
    else:
        shown = "-" if p.indicated is None else format_value(p.indicated, "pressure", pu)
        rows.append((f"{mark['pressure']}pressure", f"{shown} {p.status.upper()}", "bad"))
    if p.source == "manual":
        rows.append(("  source", "typed (manual)", ""))
    else:
        ind = "-" if p.indicated is None else format_value(p.indicated, "pressure", pu)
        rows.append(("  indicated", f"{ind} ({p.source})", ""))
    rows.append((f"{mark['gap']}gap", format_value(manual_gap, "length", lu), ""))
    rows.append((f"{mark['voltage']}supply", _v(voltage, convention), ""))
    f = view.forecast
    if f is None:
        rows.append(("FORECAST", "WITHDRAWN", "bad"))
        rows.append(("  why", view.withdrawn or "", "bad"))
        for label in ("pd", "breakdown", "margin", "gain", "E/N", "branch", "glow"):
            rows.append((label, "--", ""))
        return rows + _fill_rows(view, fill)
    rows.append(("pd", pd_text(f.pd, system), ""))
    k = 1.0 if convention is None else from_amplitude(1.0, convention)
    tag = "" if convention is None else f" {CONVENTION_TAG[convention]}"
    if f.breakdown_voltage is None:
        rows.append(("breakdown", "none at any voltage", "warn"))
    else:
        lo, hi = f.breakdown_band
        band = "" if lo is None or hi is None else f" ({lo * k:.0f}-{hi * k:.0f}"
        band += (f": {f.band_source})" if wide else ")") if band else ""
        rows.append(("breakdown", f"{f.breakdown_voltage * k:.0f} V{tag}{band}", ""))
    if f.margin is None:
        rows.append(("margin", "none", "warn"))
    else:
        rows.append(("margin", f"{f.margin * k:+.0f} V {f.margin_fraction:+.0%}", "good" if f.strikes else "warn"))
    if f.alpha_d is not None:
        gain = f"{f.gain:.3g}" if f.gain is not None and f.gain < 1e300 else ">1e300"
        rows.append(("gain", f"{gain} (alpha d {f.alpha_d:.3g})", ""))
        rows.append(("E/N", f"{f.E_over_N_Td:.3g} Td", ""))
    elif f.voltage is not None:  # volume breakdown: no transit, no avalanche across the gap
        rows.append(("gain", "n/a (volume breakdown)", ""))
        rows.append(("E_eff/N", f"{f.E_over_N_Td:.3g} Td", ""))
    else:
        rows.append(("gain", "-- (no voltage)", ""))
        rows.append(("E/N", "--", ""))
    side = {"left": "left of minimum", "right": "right of minimum", "none": "left of asymptote"}[f.branch]
    rows.append(("branch", side, ""))
    ll = f.load_line
    a = f.alternating
    if a is not None:
        up = "" if a.upper_voltage is None else f", up to {a.upper_voltage * k:.0f} V"
        rows.append(("regime", f"{a.regime}{up}", "warn" if a.regime in ("drift-limited", "none") else ""))
    elif ll is None:
        rows.append(("glow", "no strike" if not f.strikes else "no supply data", ""))
    else:
        limit = f", limited by the {ll.limited_by.replace('_', ' ')}" if wide else ""
        rows.append(
            (
                "glow",
                f"{ll.regime.replace('_', ' ')} {amps(ll.current)}{limit}",
                "bad" if ll.regime == "arc_risk" else "",
            )
        )
    return rows + _fill_rows(view, fill)


def _fill_rows(view: View, fill: str) -> list[tuple[str, str, str]]:
    """The gas fill (a mixture, or one the flow meters set) and the target of a reactive process."""
    rows: list[tuple[str, str, str]] = []
    if view.fill_note is not None:
        rows.append(("gas", f"{fill} held: {view.fill_note}", "warn"))
    elif "%" in fill or view.fill_source == "flows":
        rows.append(("gas", f"{fill} ({view.fill_source})", ""))
    f = view.forecast
    if f is not None and f.target is not None:
        t = f.target
        if t.mode == "unclear":
            rows.append(("target", "not judged: gauge and flows disagree", "warn"))
        elif t.mode == "unresolved":
            rows.append(("target", f"too little {'+'.join(t.reactive)} to judge", ""))
        else:
            rows.append(("target", f"{t.mode}, {t.consumed:.0%} taken", "" if t.mode == "metal" else "warn"))
    elif f is not None and f.charging is not None:
        c = f.charging
        rows.append(("film", f"{c.film} arcs after {c.time * 1e6:.3g} us", "warn" if c.on_time is None else ""))
    return rows


def channel_line(
    readings: dict[str, Reading],
    paused: bool,
    manual: bool,
    replay: bool,
    labels: dict[str, dict[int, str]] | None = None,
) -> list[tuple[str, str]]:
    """(text, style) pieces of the instrument status bar; a state channel (an interlock) in its
    own words from ``labels``."""
    parts: list[tuple[str, str]] = []
    if paused:
        parts.append(("PAUSED", "warn"))
    if replay:
        parts.append(("REPLAY", "warn"))
    if manual:
        parts.append(("pressure MANUAL", ""))
    for name, r in readings.items():
        word = _STATUS_WORD.get(str(r.status), str(r.status).upper())
        if word == "LIVE" and r.quantity == "state":
            word = state_word(r.value, (labels or {}).get(name, {})).upper()
        elif word == "LIVE":
            word = {"simulated": "SIM", "replay": "REPLAY", "manual": "MANUAL"}.get(r.source, word)
        style = "" if str(r.status) == "ok" else "bad"
        parts.append((f"{name} {word}", style))
    if not parts:
        parts.append(("no instruments: manual entry", ""))
    return parts


def flags_text(rows: list[tuple[str, str, str]], withdrawn: str | None, width: int, height: int):
    """The flags panel: (rich Text, whether it wraps). Every sentence whole when the wrapped lines fit
    the panel's ``height``; otherwise one line each, cut at the edge (the `d` screen shows them all)."""
    from rich.text import Text

    lines = ([f"WITHDRAWN no forecast: {withdrawn}"] if withdrawn is not None else []) + [
        f"{level:<6} {code}: {reason}" for level, code, reason in rows
    ]
    needed = sum(-(-len(line) // max(width, 1)) for line in lines)
    wrapped = 0 < width and needed <= height
    t = Text(no_wrap=not wrapped, overflow="fold" if wrapped else "ellipsis")
    if withdrawn is not None:
        t.append("WITHDRAWN ", style="bold reverse")
        t.append(f"no forecast: {withdrawn}")
    for i, (level, code, reason) in enumerate(rows):
        if i or withdrawn is not None:
            t.append("\n")
        t.append(f"{level:<6} ", style=LEVEL_STYLE.get(level, ""))
        t.append(f"{code}: {reason}")
    return t, wrapped


def flag_lines(f: Forecast | None, system: str = "SI") -> list[tuple[str, str, str]]:
    """(level word, code, reason in the unit system's units) of the flags, worst first."""
    if f is None:
        return []
    order = {"danger": 0, "watch": 1, "ok": 2}
    return [
        (LEVEL_WORD[x.level], x.code, flag_sentence(x, system)) for x in sorted(f.flags, key=lambda x: order[x.level])
    ]


_BARS = "▁▂▃▄▅▆▇█"


def sparkline(values: list[float | None], width: int, log: bool = True) -> str:
    """A one-line history (missing values as spaces), newest on the right, on a log scale.

    >>> sparkline([1.0, 10.0, None, 100.0], 10)
    '▁▅ █'
    """
    import math

    vals = values[-width:]
    good = [v for v in vals if v is not None and v > 0]
    if not good:
        return " " * len(vals)
    f = math.log10 if log else (lambda v: v)
    lo, hi = f(min(good)), f(max(good))
    span = hi - lo or 1.0
    out = []
    for v in vals:
        if v is None or v <= 0:
            out.append(" ")
        else:
            out.append(_BARS[min(int((f(v) - lo) / span * (len(_BARS) - 1) + 0.5), len(_BARS) - 1)])
    return "".join(out)


def pd_display(pd_si: float, system: str) -> float:
    """pd in the unit system's pd unit (for the picture's axis)."""
    return convert(pd_si, "pd", SYSTEMS[system]["pd"])
