"""Summaries of a logbook for ``strikeline log``."""

from __future__ import annotations

import statistics
from collections import Counter, defaultdict
from typing import Any

from ..drivers.logbook import LogRead

__all__ = ["STRIKE_COLUMNS", "strike_rows", "summarise"]

_STRIKE_EVENTS = ("strike proposed", "strike dropped", "strike unproposed")
"""Events of the strikes the instruments showed (not faults)."""
STRIKE_COLUMNS = ("pressure_Pa", "gap_m", "voltage_V", "gas")
"""The calibration CSV's columns (``strikeline fit`` reads them; it skips strikes in another gas fill)."""
_NEEDED = STRIKE_COLUMNS[:3]


def summarise(log: LogRead) -> dict[str, Any]:
    """Span, readings per channel, gaps and faults, strike marks, flag changes and gas fill changes."""
    recs = log.records
    times = [r["t_unix"] for r in recs if "t_unix" in r]
    header = next((r for r in recs if r.get("kind") == "session"), {})
    per: dict[str, Counter] = defaultdict(Counter)
    last_t: dict[str, list[float]] = defaultdict(list)
    gaps: list[dict[str, Any]] = []
    lost_since: dict[str, float] = {}
    for r in recs:
        if r.get("kind") != "reading":
            continue
        ch = r.get("channel", "?")
        per[ch][r.get("status", "?")] += 1
        t = r.get("t_unix")
        if r.get("status") in ("lost", "stale") and ch not in lost_since and t is not None:
            lost_since[ch] = t
        elif r.get("status") == "ok":
            if ch in lost_since:
                gaps.append({"channel": ch, "from": lost_since.pop(ch), "to": t, "why": "lost"})
            if t is not None:
                last_t[ch].append(t)
    for ch, since in lost_since.items():
        gaps.append({"channel": ch, "from": since, "to": None, "why": "lost until the end"})
    for ch, ts in last_t.items():
        if len(ts) < 3:
            continue
        step = statistics.median(b - a for a, b in zip(ts, ts[1:], strict=False))
        limit = max(5 * step, 2.0)
        for a, b in zip(ts, ts[1:], strict=False):
            if b - a > limit and not any(g["channel"] == ch and g["from"] <= b and (g["to"] or b) >= a for g in gaps):
                gaps.append({"channel": ch, "from": a, "to": b, "why": f"no reading for {b - a:.1f} s"})
    events = [r for r in recs if r.get("kind") == "event"]
    return {
        "bench": header.get("bench"),
        "start": None if not times else min(times),
        "end": None if not times else max(times),
        "span_s": 0.0 if not times else max(times) - min(times),
        "records": len(recs),
        "readings": {ch: dict(c) for ch, c in sorted(per.items())},
        "gaps": sorted(gaps, key=lambda g: g["from"]),
        "faults": [e for e in events if e.get("event") not in ("connected", "counts", *_STRIKE_EVENTS)],
        "proposed_strikes": [e for e in events if e.get("event") in _STRIKE_EVENTS],
        "port_counts": [e for e in events if e.get("event") == "counts"],
        "connections": sum(1 for e in events if e.get("event") == "connected"),
        "strikes": [r for r in recs if r.get("kind") == "strike"],
        "flag_changes": [r for r in recs if r.get("kind") == "flag"],
        "fills": _fill_changes(header, recs),
        "skipped": [{"line": line, "why": why} for line, why in log.skipped],
        "torn_tail": log.torn_tail,
    }


def _fill_changes(header: dict[str, Any], recs: list[dict[str, Any]]) -> list[dict[str, Any]]:
    """The gas fill at the start and every change of it (typed, or from the flow meters)."""
    out = []
    if header.get("gas"):
        out.append({"t": header.get("t"), "composition": header["gas"], "source": "profile", "flows_Pa_m3_s": {}})
    for r in recs:
        if r.get("kind") == "fill":
            if out and out[-1]["composition"] == r["composition"]:
                continue
            out.append(
                {k: r.get(k) for k in ("t", "composition", "source")} | {"flows_Pa_m3_s": r.get("flows_Pa_m3_s", {})}
            )
    return out


def strike_rows(log: LogRead) -> list[dict[str, Any]]:
    """The strike marks as calibration CSV rows (SI), each with its gas fill (empty if not recorded)."""
    return [
        {k: r[k] for k in _NEEDED} | {"gas": r.get("gas", "")}
        for r in log.records
        if r.get("kind") == "strike" and all(k in r for k in _NEEDED)
    ]
