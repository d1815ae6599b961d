"""What a shift report shows, gathered from a logbook in one streaming pass (no drawing here).

The logbook is read record by record (:func:`~strikeline.drivers.logbook_read.iter_logbook`), so an 8 h
logbook at 10 Hz never sits in memory as dicts: the time series go into compact arrays, the counts
into :class:`~strikeline.tui.report.summary.Summary` (the same sums ``strikeline log`` prints), and the
drawn series are decimated afterwards (each bin keeps its lowest and highest value, so a spike
survives); the tables' counts are never decimated.
"""

from __future__ import annotations

from array import array
from collections import defaultdict
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from ...drivers.logbook_read import LogRead, iter_logbook
from ...model.bench import Bench
from ...model.results import LEVELS
from ..logread import RANGES
from .summary import Summary

__all__ = ["CurveData", "FlagSpan", "ReportData", "Series", "collect", "constant_sources", "curve_data", "decimate"]

DRAWN_POINTS = 1500
"""Bins per drawn time series (each keeps its lowest and highest value: up to 3000 points)."""
PATH_POINTS = 1000
"""Points of the operating point's path drawn on the curve (every n-th forecast)."""


@dataclass
class Series:
    """One quantity against time (Unix s), as recorded or decimated for drawing."""

    t: np.ndarray
    v: np.ndarray


@dataclass
class FlagSpan:
    """One flag's spans raised, its worst level and its last full sentence."""

    code: str
    level: str
    reason: str
    spans: list[tuple[float, float | None]]
    """(raised, cleared) Unix times; cleared None: still raised at the end of the log."""


@dataclass
class ReportData:
    """Everything the report shows, SI inside."""

    summary: dict[str, Any]
    header: dict[str, Any]
    series: dict[str, Series]
    """pressure, pressure_indicated, voltage, current, breakdown, margin (decimated)."""
    path: tuple[np.ndarray, np.ndarray]
    """The operating point through the shift: (pd in Pa m, supply voltage in V), decimated."""
    flags: list[FlagSpan]
    strikes: list[dict[str, Any]]
    readings: int
    skipped: LogRead
    t_from: float | None = None
    t_to: float | None = None


BIG = 16_000_000
"""Bytes of logbook above which the report reads it on every core (in parts, one process each)."""


def collect(path: str, t_from: float | None = None, t_to: float | None = None, cores: int | None = None) -> ReportData:
    """Read the logbook at ``path`` (between Unix times ``t_from`` and ``t_to``) for the report, on up
    to ``cores`` processes (default: every core, for a logbook over :data:`BIG`; 1 from a program with
    threads of its own, such as the live screen). Raises OSError when it cannot be read."""
    import os

    from ...drivers.logbook_read import line_spans

    cores = (os.cpu_count() or 1) if cores is None else cores
    spans = line_spans(path, cores) if cores > 1 and os.path.getsize(path) > BIG else [(0, None, 0)]
    if len(spans) > 1:
        import multiprocessing as mp

        ctx = mp.get_context("fork" if "fork" in mp.get_all_start_methods() else None)
        with ctx.Pool(len(spans)) as pool:
            parts = pool.starmap(_part, [(path, span, t_from, t_to) for span in spans])
    else:
        parts = [_part(path, spans[0], t_from, t_to)]
    first = parts[0]
    read = LogRead(torn_tail=parts[-1].read.torn_tail)
    for part, (_start, _end, lines_before) in zip(parts, spans, strict=True):
        read.skipped += [(line + lines_before, why) for line, why in part.read.skipped]
        if part is not first:
            first.summary.merge(part.summary)
            for name, (ts, vs) in part.raw.items():
                first.raw[name][0].extend(ts)
                first.raw[name][1].extend(vs)
            first.path_pd.extend(part.path_pd)
            first.path_v.extend(part.path_v)
            first.flag_records += part.flag_records
            first.readings += part.readings
    flags: dict[str, dict[str, Any]] = {}
    for t, r in first.flag_records:
        _flag(flags, r, t)
    s = first.summary.result(read)
    series = {name: decimate(np.frombuffer(ts), np.frombuffer(vs)) for name, (ts, vs) in first.raw.items()}
    pd, v = np.frombuffer(first.path_pd), np.frombuffer(first.path_v)
    step = max(len(pd) // PATH_POINTS, 1)
    spans_raised = sorted(
        (FlagSpan(code, f["level"], f["reason"], f["spans"]) for code, f in flags.items() if f["spans"]),
        key=lambda x: (-LEVELS.index(x.level) if x.level in LEVELS else 0, x.code),
    )
    return ReportData(
        summary=s,
        header=first.summary.header,
        series=series,
        path=(pd[::step].copy(), v[::step].copy()),
        flags=spans_raised,
        strikes=s["strikes"],
        readings=first.readings,
        skipped=read,
        t_from=t_from,
        t_to=t_to,
    )


@dataclass
class _Part:
    """What one part of a logbook holds, in sums and arrays (small to send between processes)."""

    read: LogRead
    summary: Summary
    raw: dict[str, tuple[array, array]]
    path_pd: array
    path_v: array
    flag_records: list[tuple[float, dict[str, Any]]]
    readings: int


def _pair() -> tuple[array, array]:
    return array("d"), array("d")


def _part(path: str, span: tuple[int, int | None, int], t_from: float | None, t_to: float | None) -> _Part:
    read = LogRead()
    part = _Part(read, Summary(), defaultdict(_pair), array("d"), array("d"), [], 0)
    raw = part.raw
    for r in iter_logbook(path, RANGES, read, span[:2]):
        t = r.get("t_unix")
        kind = r.get("kind")
        outside = t is not None and (t_from is not None and t < t_from or t_to is not None and t > t_to)
        if outside and kind != "session":
            continue
        part.summary.add(r)
        if t is None:
            continue
        if kind == "reading":
            part.readings += 1
            _reading(raw, r, t)
        elif kind == "forecast":
            for name, key in (("breakdown", "breakdown_V"), ("margin", "margin_V")):
                v = r.get(key)
                _add(raw[name], t, float("nan") if v is None else v)  # a withdrawn forecast breaks the line
            p, d, v = r.get("pressure_Pa"), r.get("gap_m"), r.get("voltage_V")
            if p is not None and d is not None and v is not None:
                part.path_pd.append(p * d)
                part.path_v.append(v)
        elif kind == "flag":
            part.flag_records.append((t, r))
    return part


def _add(pair: tuple[array, array], t: float, v: float) -> None:
    pair[0].append(t)
    pair[1].append(v)


def _reading(raw: dict[str, tuple[array, array]], r: dict[str, Any], t: float) -> None:
    name = r.get("quantity")
    if name not in ("pressure", "voltage", "current"):  # the quantities the time series draw
        return
    ok = r.get("status") == "ok"
    value = r.get("value") if ok else None
    _add(raw[name], t, float("nan") if value is None else float(value))  # a fault breaks the line
    if name == "pressure":
        indicated = r.get("indicated") if ok else None
        _add(raw["pressure_indicated"], t, float("nan") if indicated is None else float(indicated))


def _flag(flags: dict[str, dict[str, Any]], r: dict[str, Any], t: float) -> None:
    code = str(r.get("code", "?"))
    f = flags.setdefault(code, {"level": "ok", "reason": "", "spans": []})
    if r.get("change") == "cleared":
        if f["spans"] and f["spans"][-1][1] is None:
            f["spans"][-1] = (f["spans"][-1][0], t)
        return
    level = str(r.get("level", "ok"))
    if level == "ok":
        return  # an ok flag is a statement, not a warning: it gets no span
    if level in LEVELS and LEVELS.index(level) > LEVELS.index(f["level"]):
        f["level"] = level
    f["reason"] = str(r.get("reason", ""))
    if not f["spans"] or f["spans"][-1][1] is not None:
        f["spans"].append((t, None))


def decimate(t: np.ndarray, v: np.ndarray, bins: int = DRAWN_POINTS) -> Series:
    """``(t, v)`` for drawing: at most two points per bin of equal time (its lowest and highest, in
    their order), a NaN where a bin holds only faults (the line breaks). Short series are kept whole.

    >>> s = decimate(np.arange(10.0), np.array([0, 5, 1, 1, 1, 1, 1, 1, -3, 1.0]), bins=2)
    >>> s.v.tolist()
    [0.0, 5.0, 1.0, -3.0]
    """
    if len(t) <= 2 * bins:
        return Series(t.copy(), v.copy())
    edges = np.linspace(t[0], t[-1], bins + 1)
    which = np.clip(np.searchsorted(edges, t, side="right") - 1, 0, bins - 1)
    starts = np.searchsorted(which, np.arange(bins), side="left")
    ends = np.searchsorted(which, np.arange(bins), side="right")
    keep: list[int] = []
    for a, b in zip(starts, ends, strict=True):
        if a == b:
            continue
        chunk = v[a:b]
        if np.all(np.isnan(chunk)):
            keep.append(a)
            continue
        lo, hi = a + int(np.nanargmin(chunk)), a + int(np.nanargmax(chunk))
        keep.extend(sorted({lo, hi}))
    idx = np.array(keep, dtype=int)
    return Series(t[idx], v[idx])


@dataclass
class CurveData:
    """The breakdown curve of the report's first figure, in actual pd at the bench's gas temperature."""

    pd: np.ndarray
    """Pa m."""
    textbook: np.ndarray
    """V: the textbook law (gas, cathode, gamma of the bench)."""
    fitted: tuple[np.ndarray, np.ndarray, np.ndarray] | None = None
    """(V, low, high): the bench's fitted curve and the band the next strike should fall in."""
    minimum: tuple[float, float] = (float("nan"), float("nan"))
    supply: float | None = None
    """V: the supply's open-circuit voltage (None: no supply in the profile; an amplitude for AC)."""
    notes: list[str] = field(default_factory=list)
    upper: np.ndarray | None = None
    """V: an alternating supply's upper branch (NaN where the curve is single-valued)."""


def curve_data(bench: Bench, pd_seen: np.ndarray, points: int = 400) -> CurveData:
    """The curve over a pd range that holds the minimum and every pd in ``pd_seen`` (Pa m)."""
    from ...model.calibration import prediction_band
    from ...model.curve import curve_of

    c = curve_of(bench, textbook=True)  # the default curve; a fit is drawn over it
    fitted_curve = curve_of(bench).fitted
    law = c.law
    pd0 = law.no_breakdown_pd() / c.scale
    pd_min, v_min = c.minimum
    seen = pd_seen[np.isfinite(pd_seen) & (pd_seen > 0)]
    lo = max(pd0 * 1.01, np.min(seen / 2, initial=pd_min / 3))
    hi = np.max(seen * 2, initial=pd_min * 300)
    pd = np.geomspace(lo, hi, points)
    vb = c.at_pd(pd)
    notes, upper = [], None
    if c.alternating:
        upper = np.asarray(law.upper(pd * c.scale))
        notes.append(
            f"the curve is the alternating supply's at its {bench.gap * 1e3:.3g} mm gap; voltages are amplitudes"
        )
    fitted = None
    if fitted_curve is not None and not c.alternating:  # a fit is of the DC law
        v, band_lo, band_hi = prediction_band(fitted_curve, curve_of(bench).dc.unscaled(), pd * c.scale)
        fitted = (np.asarray(v), np.asarray(band_lo), np.asarray(band_hi))
    supply = None if bench.supply is None else bench.supply.open_circuit_voltage
    return CurveData(pd, np.asarray(vb), fitted, (pd_min, v_min), supply, notes, upper)


def constant_sources(bench: Bench) -> list[tuple[str, str, str]]:
    """(what, value, source) of every constant the report's curve uses, as ``strikeline gases`` cites them."""
    from ...model import mixture as mx
    from ...model.ionisation import TD_PER_V_PER_PA_M

    rows = []
    for g in bench.fill.gases:
        for seg in g.ionisation.segments:
            span = f"{seg.low * TD_PER_V_PER_PA_M:.0f}-{seg.high * TD_PER_V_PER_PA_M:.0f} Td"
            form = "A exp(-B/y)" if seg.power == 1.0 else "A exp(-sqrt(B/y))"
            rows.append((f"{g.key}: alpha/p, {span}", f"{form}, A {seg.A:.4g} 1/(Pa m), B {seg.B:.4g} V/(Pa m)",
                         seg.source))  # fmt: skip
        if g.attachment is not None:
            rows.append((f"{g.key}: attachment", "eta/N", g.attachment.source))
        if g.law is not None:
            rows.append((f"{g.key}: high pd", "uniform-field law", g.law.source))
        y = bench.cathode.yield_for(g, bench.gamma_model) if bench.gamma is None else None
        if y is not None:
            rows.append(
                (f"{bench.cathode.key} in {g.key}: gamma", f"{y.value:.3g} ({y.low:.2g}-{y.high:.2g})", y.source)
            )
    if bench.gamma is not None:
        rows.append(("gamma", f"{bench.gamma:.3g}", "bench profile"))
    if not bench.fill.pure:
        rows += [("mixing", rule, "stated assumption") for rule in mx.ASSUMPTIONS]
    cv = bench.curve
    if cv is not None:
        value = f"scales: ionisation {cv.alpha_scale:.3g}, field {cv.field_scale:.3g}, gamma {cv.gamma_scale:.3g}"
        rows.append(("bench curve", value, f"fitted {cv.fitted_on} from {cv.n_points} strikes"))
    return rows
