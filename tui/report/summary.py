"""Summaries of a logbook for ``strikeline log``."""

from __future__ import annotations

import statistics
from array import array
from collections import Counter, defaultdict
from typing import Any

from ...drivers.logbook_read import LogRead

__all__ = ["STRIKE_COLUMNS", "Summary", "strike_rows", "summarise"]

_STRIKE_EVENTS = ("strike proposed", "strike dropped", "strike unproposed")
"""Events of the strikes the instruments showed (not faults)."""
STRIKE_COLUMNS = ("pressure_Pa", "gap_m", "voltage_V", "gas")
"""The calibration CSV's columns (``strikeline fit`` reads them; it skips strikes in another gas fill)."""
_NEEDED = STRIKE_COLUMNS[:3]


def summarise(log: LogRead) -> dict[str, Any]:
    """Span, readings per channel, gaps and faults, strike marks, flag changes and gas fill changes."""
    summary = Summary()
    for r in log.records:
        summary.add(r)
    return summary.result(log)


class Summary:
    """:func:`summarise` one record at a time, so a long logbook need not be in memory (the report
    streams its logbook through this); the records themselves are not kept, only what is summed."""

    def __init__(self) -> None:
        self.records = 0
        self.start: float | None = None
        self.end: float | None = None
        self.header: dict[str, Any] = {}
        self.per: dict[str, Counter] = defaultdict(Counter)
        self.ok_times: dict[str, array] = defaultdict(_times)
        self.flips: dict[str, list[tuple[float, bool]]] = defaultdict(list)
        """Each channel's (time, lost) at every change between lost (or stale) and ok: the gaps."""
        self.events: list[dict[str, Any]] = []
        self.strikes: list[dict[str, Any]] = []
        self.flags: list[dict[str, Any]] = []
        self.fills: list[dict[str, Any]] = []

    def add(self, r: dict[str, Any]) -> None:
        self.records += 1
        t = r.get("t_unix")
        if t is not None:
            self.start = t if self.start is None else min(self.start, t)
            self.end = t if self.end is None else max(self.end, t)
        kind = r.get("kind")
        if kind == "reading":
            ch = r.get("channel", "?")
            status = r.get("status", "?")
            self.per[ch][status] += 1
            if t is None or status not in ("ok", "lost", "stale"):
                return
            lost = status != "ok"
            flips = self.flips[ch]
            if not flips or flips[-1][1] != lost:
                flips.append((t, lost))
            if not lost:
                self.ok_times[ch].append(t)
        elif kind == "session" and not self.header:
            self.header = r
        elif kind == "event":
            self.events.append(r)
        elif kind == "strike":
            self.strikes.append(r)
        elif kind == "flag":
            self.flags.append(r)
        elif kind == "fill":
            self.fills.append(r)

    def merge(self, later: Summary) -> None:
        """Add the sums of the records that follow this summary's (a logbook read in parts)."""
        self.records += later.records
        for t in (later.start, later.end):
            if t is not None:
                self.start = t if self.start is None else min(self.start, t)
                self.end = t if self.end is None else max(self.end, t)
        self.header = self.header or later.header
        for ch, counts in later.per.items():
            self.per[ch].update(counts)
        for ch, ts in later.ok_times.items():
            self.ok_times[ch].extend(ts)
        for ch, flips in later.flips.items():
            mine = self.flips[ch]
            mine.extend(flips[1:] if mine and flips and mine[-1][1] == flips[0][1] else flips)
        self.events += later.events
        self.strikes += later.strikes
        self.flags += later.flags
        self.fills += later.fills

    def result(self, log: LogRead) -> dict[str, Any]:
        """The summary, with what ``log`` skipped."""
        gaps = []
        for ch, flips in self.flips.items():
            since = None
            for t, lost in flips:
                if lost and since is None:
                    since = t
                elif not lost and since is not None:
                    gaps.append({"channel": ch, "from": since, "to": t, "why": "lost"})
                    since = None
            if since is not None:
                gaps.append({"channel": ch, "from": since, "to": None, "why": "lost until the end"})
        for ch, ts in self.ok_times.items():
            if len(ts) < 3:
                continue
            step = statistics.median(b - a for a, b in zip(ts, ts[1:], strict=False))
            limit = max(5 * step, 2.0)
            for a, b in zip(ts, ts[1:], strict=False):
                if b - a > limit and not any(
                    g["channel"] == ch and g["from"] <= b and (g["to"] or b) >= a for g in gaps
                ):
                    gaps.append({"channel": ch, "from": a, "to": b, "why": f"no reading for {b - a:.1f} s"})
        events = self.events
        return {
            "bench": self.header.get("bench"),
            "start": self.start,
            "end": self.end,
            "span_s": 0.0 if self.start is None else self.end - self.start,
            "records": self.records,
            "readings": {ch: dict(c) for ch, c in sorted(self.per.items())},
            "gaps": sorted(gaps, key=lambda g: g["from"]),
            "faults": [e for e in events if e.get("event") not in ("connected", "counts", *_STRIKE_EVENTS)],
            "proposed_strikes": [e for e in events if e.get("event") in _STRIKE_EVENTS],
            "port_counts": [e for e in events if e.get("event") == "counts"],
            "connections": sum(1 for e in events if e.get("event") == "connected"),
            "strikes": self.strikes,
            "flag_changes": self.flags,
            "fills": _fill_changes(self.header, self.fills),
            "skipped": [{"line": line, "why": why} for line, why in log.skipped],
            "torn_tail": log.torn_tail,
        }


def _times() -> array:
    return array("d")


def _overlaps(gap: dict[str, Any], channel: str, a: float, b: float) -> bool:
    return gap["channel"] == channel and gap["from"] <= b and (gap["to"] or b) >= a


def _fill_changes(header: dict[str, Any], recs: list[dict[str, Any]]) -> list[dict[str, Any]]:
    """The gas fill at the start and every change of it (typed, or from the flow meters)."""
    out = []
    if header.get("gas"):
        out.append({"t": header.get("t"), "composition": header["gas"], "source": "profile", "flows_Pa_m3_s": {}})
    for r in recs:
        if r.get("kind") == "fill":  # (given only the fill records, or all)
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
