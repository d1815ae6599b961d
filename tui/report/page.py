"""The shift report as one self-contained HTML file: figures inline as SVG, no script, no fetch, A4.

The page is plain HTML with its own short stylesheet; it reads the same on screen, in an e-mail and
on paper (``@page`` A4, figures never split across pages). Everything shown comes from
:mod:`~strikeline.tui.report.data`; the figures from :mod:`~strikeline.tui.report.figures`.
"""

from __future__ import annotations

import html
from typing import Any

from ...drivers.logbook import iso_utc
from .data import FlagSpan, ReportData

__all__ = ["page"]

_STYLE = """
@page { size: A4; margin: 15mm 12mm; }
body { font-family: sans-serif; font-size: 10pt; color: #000; background: #fff; max-width: 180mm; margin: auto; }
h1 { font-size: 15pt; margin: 0 0 4pt 0; }
h2 { font-size: 12pt; margin: 14pt 0 4pt 0; border-bottom: 1px solid #000; }
table { border-collapse: collapse; width: 100%; margin: 4pt 0; page-break-inside: auto; }
th, td { border: 1px solid #888; padding: 2pt 4pt; text-align: left; vertical-align: top; font-size: 9pt; }
td.n { text-align: right; font-variant-numeric: tabular-nums; }
tr { page-break-inside: avoid; }
figure { margin: 6pt 0; page-break-inside: avoid; }
figure svg { width: 100%; height: auto; }
figcaption { font-size: 8.5pt; }
.caution { border: 2px solid #000; padding: 4pt 6pt; font-weight: bold; }
.note { font-size: 8.5pt; }
"""


def _e(x: Any) -> str:
    return html.escape(str(x), quote=True)


def _table(head: list[str], rows: list[list[Any]], numeric: set[int] = frozenset(), empty: str = "none") -> str:
    if not rows:
        return f"<p class='note'>{_e(empty)}</p>"
    th = "".join(f"<th>{_e(h)}</th>" for h in head) if any(head) else ""
    body = "".join("<tr>" + "".join(_cell(c, i in numeric) for i, c in enumerate(r)) + "</tr>" for r in rows)
    thead = f"<thead><tr>{th}</tr></thead>" if th else ""
    return f"<table>{thead}<tbody>{body}</tbody></table>"


def _cell(value: Any, numeric: bool) -> str:
    return f"<td class='n'>{_e(value)}</td>" if numeric else f"<td>{_e(value)}</td>"


def _figure(svg: str, caption: str) -> str:
    return f"<figure>{svg}<figcaption>{_e(caption)}</figcaption></figure>"


def page(
    data: ReportData,
    about: dict[str, str],
    figures: dict[str, str],
    sources: list[tuple[str, str, str]],
    caution: str,
    skipped: str | None,
) -> str:
    """The whole report. ``about`` names the bench, gas, cathode and supply; ``figures`` holds the SVG
    of "curve", "series" and "flags"; ``sources`` the constants with their sources."""
    s = data.summary
    span = "no timed records"
    if s["start"] is not None:
        span = f"{iso_utc(s['start'])} to {iso_utc(s['end'])} ({_duration(s['span_s'])})"
    if data.t_from is not None or data.t_to is not None:
        span += " (the part asked for with --from/--to)"
    head_rows = [[k, v] for k, v in about.items()] + [["log", span]]
    parts = [
        "<!DOCTYPE html>",
        "<html lang='en'><head><meta charset='utf-8'>",
        f"<title>strikeline shift report: {_e(about.get('bench', ''))}</title>",
        f"<style>{_STYLE}</style></head><body>",
        f"<h1>Shift report: {_e(about.get('bench', ''))}</h1>",
        _table(["", ""], head_rows),
        f"<p class='caution'>{_e(caution)}</p>",
    ]
    if skipped:
        parts.append(f"<p class='note'>The logbook has lines that could not be read: {_e(skipped)}.</p>")
    parts += [
        "<h2>1. The breakdown curve</h2>",
        _figure(
            figures["curve"],
            "Breakdown voltage against pd; the supply's voltage, every strike mark and the "
            "path the operating point took (pd, supply voltage) through the log.",
        ),
        "<h2>2. Through the shift</h2>",
        _figure(
            figures["series"],
            "Shaded with crosses: gaps (a channel lost, stale or silent); dash-dot lines: "
            "faults; dotted lines: strike marks. Drawn from at most 3000 points a line (each bin's lowest and "
            "highest); the tables count every reading.",
        ),
        "<h2>3. Flags</h2>",
        _figure(figures["flags"], "Each flag's raised spans, worst first (danger: dense hatching, watch: dots)."),
        _flag_list(data.flags),
        "<h2>4. Tables</h2>",
        "<h3>Readings per channel</h3>",
        _readings_table(s),
        "<h3>Faults and reconnects</h3>",
        _faults_table(s),
        "<h3>Strike marks</h3>",
        _strikes_table(data.strikes),
        "<h3>Constants and their sources</h3>",
        _table(["what", "value", "source"], [list(r) for r in sources]),
        "</body></html>",
    ]
    return "\n".join(parts) + "\n"


def _duration(seconds: float) -> str:
    h, rem = divmod(int(round(seconds)), 3600)
    m, sec = divmod(rem, 60)
    return f"{h} h {m:02d} min" if h else f"{m} min {sec:02d} s"


def _flag_list(flags: list[FlagSpan]) -> str:
    if not flags:
        return "<p class='note'>No flag was raised above ok.</p>"
    items = "".join(
        f"<li><b>{_e(f.level.upper())} {_e(f.code)}</b> ({len(f.spans)} time{'s' if len(f.spans) != 1 else ''}): "
        f"{_e(f.reason)}</li>"
        for f in flags
    )
    return f"<ul>{items}</ul>"


def _readings_table(s: dict[str, Any]) -> str:
    statuses = sorted({st for c in s["readings"].values() for st in c})
    rows = [[ch, sum(c.values()), *(c.get(st, 0) for st in statuses)] for ch, c in s["readings"].items()]
    return _table(
        ["channel", "readings", *statuses], rows, numeric=set(range(1, len(statuses) + 2)), empty="no readings"
    )


def _faults_table(s: dict[str, Any]) -> str:
    rows = [
        [iso_utc(e["t_unix"]) if "t_unix" in e else "", e.get("port", ""), e.get("event", ""), e.get("message", "")]
        for e in s["faults"]
    ]
    rows += [[iso_utc(g["from"]), g["channel"], "gap", g["why"]] for g in s["gaps"]]
    rows.sort(key=lambda r: r[0])
    table = _table(["time (UTC)", "port or channel", "what", "message"], rows, empty="no fault and no gap")
    words = ("readings", "garbled", "unanswered", "overlong", "exceptions", "faults", "reconnects")
    counts = [[e.get("port", ""), *(e.get(k, 0) for k in words)] for e in s["port_counts"]]
    note = f"<p class='note'>{s['connections']} connections made; each port's counts at the end of the session:</p>"
    return table + note + _table(["port", *words], counts, set(range(1, len(words) + 1)), empty="not recorded")


def _strikes_table(strikes: list[dict[str, Any]]) -> str:
    rows = [
        [
            iso_utc(m["t_unix"]) if "t_unix" in m else "",
            f"{m['pressure_Pa']:.4g}",
            f"{m['gap_m'] * 1e3:.4g}",
            f"{m['pressure_Pa'] * m['gap_m']:.4g}",
            f"{m['voltage_V']:.4g}",
            "seen by the instruments, confirmed" if m.get("made_by") == "detected" else "marked by key",
            m.get("gas", ""),
        ]
        for m in strikes
    ]
    head = ["time (UTC)", "pressure (Pa)", "gap (mm)", "pd (Pa m)", "voltage (V)", "made", "gas"]
    return _table(head, rows, numeric={1, 2, 3, 4}, empty="no strike mark")
