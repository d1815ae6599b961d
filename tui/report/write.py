"""The shift report: a logbook in, one file out (the HTML report, or its main figure alone).

Used by ``strikeline report`` and by the live screen's report key. The bench whose curve is drawn is
the one given, else the one the logbook names (a built-in bench or a profile file that still
exists), else one made from the gas and cathode the logbook recorded.
"""

from __future__ import annotations

import os
import time
from dataclasses import dataclass
from pathlib import Path

from ...model.bench import Bench
from ...profiles.fields import ProfileError
from ..outputs import OutputError

__all__ = ["MARK", "Report", "bench_of_log", "check_report_target", "parse_when", "report_beside", "write_report"]

MARK = "<!DOCTYPE html><!-- strikeline shift report -->"
"""The report's first line: a file that starts with it may be replaced by a new report."""
_SIGNED = b"strikeline"
"""What a figure we wrote holds in its first or last bytes (its metadata), so it may be replaced."""


@dataclass
class Report:
    """What was written, and what the reader should know about it."""

    path: Path
    figures: int
    readings: int
    strikes: int
    skipped: str | None
    """The logbook lines that could not be read, in one line (None: none)."""


def check_report_target(out: str, option: str = "--out") -> Path:
    """``out`` checked before any work: a .html, .png, .svg or .pdf file that is new or one we wrote."""
    from ..outputs import check_output_file
    from .figures import FIGURE_FORMATS

    suffix = Path(out).suffix.lower()
    if suffix not in (".html", ".htm", *FIGURE_FORMATS):
        raise OutputError(f"{option} {out!r}: give a .html file (the report) or .png, .svg or .pdf (its main figure)")
    p = check_output_file(
        out, option, ours=(lambda first: first.startswith(MARK)) if suffix in (".html", ".htm") else None
    )
    if suffix not in (".html", ".htm") and p.is_file() and p.stat().st_size:
        with open(p, "rb") as f:
            head = f.read(4096)
            f.seek(max(p.stat().st_size - 4096, 0))
            if _SIGNED not in head + f.read(4096):  # a PDF keeps its metadata at the end
                raise OutputError(f"{option} {out!r}: exists and was not written by strikeline; it is left untouched")
    return p


def parse_when(text: str, start: float | None, option: str) -> float:
    """A moment of the log: an ISO date and time (UTC unless a zone is given, e.g. 2026-12-02T09:30 or
    2026-12-02T10:30+01:00), or a time since the log's start with its unit ("90 min", "2 h")."""
    import datetime as dt

    from ...model.units import QuantityError, parse

    try:
        when = dt.datetime.fromisoformat(text.strip())
    except ValueError:
        pass
    else:
        if when.tzinfo is None:
            when = when.replace(tzinfo=dt.UTC)
        return when.timestamp()
    try:
        offset = parse(text, "time", name=option, allow_zero=True)
    except QuantityError:
        raise OutputError(
            f"{option} {text!r}: give a date and time (2026-12-02T09:30, UTC unless a zone is given) "
            "or a time since the log's start ('90 min', '2 h')"
        ) from None
    if start is None:
        raise OutputError(f"{option} {text!r}: the logbook has no timed record to count from")
    return start + offset


def bench_of_log(header: dict, given: Bench | None) -> tuple[Bench, list[str]]:
    """The bench to draw, and what the reader should know about the choice."""
    from ...profiles.bench import BUILTIN_BENCHES, load_bench
    from ...profiles.fill import read_fill, with_fill
    from ...profiles.gasdata import find_cathode

    notes = []
    bench = given
    label = str(header.get("bench") or "")
    if bench is None and (label in BUILTIN_BENCHES or os.path.isfile(label)):
        try:
            bench = load_bench(label).bench
            notes.append(f"the bench profile is {label!r}, as the logbook names it")
        except ProfileError:
            bench = None
    gas, cathode = header.get("gas"), header.get("cathode")
    if bench is None:
        if not gas or not cathode:
            raise OutputError("the logbook names no bench profile, gas and cathode: give --bench FILE")
        try:
            fill = read_fill(str(gas))
            bench = Bench(name=label or "logbook", fill=fill.composition, cathode=find_cathode(str(cathode)), gap=1.0)
        except (ValueError, ProfileError) as e:
            raise OutputError(f"the logbook's gas {gas!r} or cathode {cathode!r}: {e}; give --bench FILE") from None
        notes.append(f"no bench profile found for {label!r}: the curve is the textbook one of its gas and cathode")
    elif gas and str(gas) != bench.composition:
        try:
            bench = with_fill(bench, read_fill(str(gas)))
            notes.append(f"the gas fill at the start of the log, {gas}, is drawn")
        except (ValueError, ProfileError):
            notes.append(f"the logbook's gas {gas!r} is not known here: the profile's {bench.composition} is drawn")
    return bench, notes


def write_report(
    log: str | os.PathLike[str],
    out: Path,
    *,
    bench: Bench | None = None,
    t_from: str | None = None,
    t_to: str | None = None,
    caution: str = "",
    cores: int | None = None,
) -> Report:
    """Read ``log`` and write the report (or its main figure, by ``out``'s suffix) to ``out``.
    Raises OSError when the logbook cannot be read and OutputError for a bad request. ``cores``: see
    :func:`~strikeline.tui.report.data.collect`."""
    from ...profiles.bench import write_atomic
    from ..logread import skipped_text
    from ..text import fill_label, supply_label
    from . import figures as rf
    from .data import collect, constant_sources, curve_data
    from .page import page

    start = _first_time(log) if (t_from or t_to) else None
    lo = None if t_from is None else parse_when(t_from, start, "--from")
    hi = None if t_to is None else parse_when(t_to, start, "--to")
    if lo is not None and hi is not None and hi <= lo:
        raise OutputError(f"--to {t_to!r} is not after --from {t_from!r}")
    data = collect(str(log), lo, hi, cores)
    if not data.summary["records"]:
        why = skipped_text(data.skipped) or "it is empty"
        raise OutputError(f"{str(log)!r}: no readable logbook records{' in that span' if lo or hi else ''} ({why})")
    drawn, notes = bench_of_log(data.header, bench)
    import numpy as np

    seen = np.concatenate([data.path[0], [m["pressure_Pa"] * m["gap_m"] for m in data.strikes]])
    curve = curve_data(drawn, seen)
    title = f"{data.header.get('bench', drawn.name)}: {fill_label(drawn)} on {drawn.cathode.key}"
    main = rf.curve_figure(curve, data, title)
    skipped = skipped_text(data.skipped)
    if out.suffix.lower() in rf.FIGURE_FORMATS:
        rf.save(main, out)
        return Report(out, 1, data.readings, len(data.strikes), skipped)
    figures = {
        "curve": rf.svg_text(main),
        "series": rf.svg_text(rf.series_figure(data)),
        "flags": rf.svg_text(rf.flags_figure(data)),
    }
    about = {
        "bench": str(data.header.get("bench") or drawn.name),
        "gas": fill_label(drawn) + f" ({drawn.composition})",
        "cathode": drawn.cathode.key,
        "supply": supply_label(drawn.supply)
        + ("" if drawn.supply is None else f", {drawn.supply.open_circuit_voltage:.0f} V open circuit"),
        "written": f"{time.strftime('%Y-%m-%d %H:%M', time.gmtime())} UTC by strikeline {_version()}",
        "notes": "; ".join(notes + curve.notes) or "none",
    }
    text = page(data, about, figures, constant_sources(drawn), caution, skipped)
    write_atomic(out, MARK + "\n" + text.removeprefix("<!DOCTYPE html>\n"))
    return Report(out, 3, data.readings, len(data.strikes), skipped)


def _first_time(log) -> float | None:
    from ...drivers.logbook_read import LogRead, iter_logbook
    from ..logread import RANGES

    for r in iter_logbook(log, RANGES, LogRead()):
        if r.get("t_unix") is not None:
            return float(r["t_unix"])
    return None


def _version() -> str:
    from importlib.metadata import PackageNotFoundError, version

    try:
        return version("strikeline")
    except PackageNotFoundError:
        return "(version unknown)"


def report_beside(log: Path, bench) -> tuple[str, bool]:
    """Write the shift report of logbook ``log`` beside it (the screen's ``r``, in a worker thread);
    (what to say, whether it is an error)."""
    from ..outputs import OutputError
    from ..verbs.parser import SAFETY

    try:
        target = check_report_target(str(log.with_suffix(".html")), "report")
        rep = write_report(log, target, bench=bench, caution=SAFETY, cores=1)  # no fork beside our threads
        where = f"{rep.path.name} ({rep.readings} readings, {rep.strikes} marks) in {rep.path.parent}"
        return f"report written: {where}", False  # the name first: a narrow screen cuts the end
    except (OSError, OutputError) as e:
        return f"report not written: {e}", True
