"""The logbook and calibration verbs: ``log`` (summarise a logbook) and ``fit`` (this bench's curve)."""

from __future__ import annotations

import argparse
import sys

from ..outputs import check_output_file, print_json, write_file
from .forecast import bench_for
from .parser import UsageError, add_gas, add_verb

__all__ = ["add_fit", "add_log"]


def add_fit(sub) -> None:
    ft = add_verb(
        sub,
        "fit",
        "fit this bench's breakdown curve to recorded strikes",
        "Fit Paschen's law to strikes recorded on this bench (CSV with pressure, gap and voltage columns; "
        "units in the header or the cells). A and gamma only appear together in the law, so fit A,B "
        "(default) or B,gamma. A mixture is fitted as one gas fill: its fitted A, B, gamma stand for the whole "
        "mixture at that composition, and a gas column leaves out strikes made in another fill. --save writes "
        "the curve into a bench profile; strike and the screen then use it.",
    )
    ft.add_argument("points", metavar="POINTS.csv", help="strike points (strikeline log --strikes writes one)")
    ft.add_argument("--bench", metavar="FILE", help="take gas, cathode and gas temperature from this bench")
    add_gas(ft)
    ft.add_argument("--cathode", help="cathode metal (default: the bench's)")
    ft.add_argument("--free", default="A,B", help="which of A, B, gamma to fit (default A,B)")
    ft.add_argument("--save", metavar="BENCH", help="write the fitted curve into this bench profile")
    ft.add_argument("--json", action="store_true", help="print the fit as JSON (SI units)")
    ft.set_defaults(run=cmd_fit)


def add_log(sub) -> None:
    lg = add_verb(
        sub,
        "log",
        "summarise a logbook",
        "Summarise a logbook: span, readings per channel, gaps and faults, strike marks, flag changes.",
    )
    lg.add_argument("path", metavar="PATH", help="a logbook (.jsonl)")
    lg.add_argument("--strikes", metavar="CSV", help="also write the strike marks as a calibration CSV")
    lg.add_argument("--json", action="store_true", help="print the summary as JSON")
    lg.set_defaults(run=cmd_log)


def cmd_fit(args: argparse.Namespace) -> int:
    from ...model.calibration import FitRefused
    from ...model.composition import same_composition
    from ...profiles.loader import save_curve
    from ...profiles.strikes import read_strike_csv
    from ..calibrate import calibrate, calibration_json, calibration_text, dc_like, parse_free

    bench = bench_for(args, need_gap=False)
    if args.save is not None:
        _check_bench_to_save(args.save)  # before any work: the file must load and its folder be writable
    try:
        free = parse_free(args.free)
        table = read_strike_csv(args.points)
    except ValueError as e:
        raise UsageError(f"strikeline fit: {e}") from None
    problems = list(table.problems)
    points = []
    for p in table.points:  # a strike made in another gas fill says nothing of this one's curve
        if p.gas is not None and not same_composition(p.gas, bench.composition):
            problems.append(f"line {p.line}: made in {p.gas}, not {bench.composition}; row skipped")
        else:
            points.append(p)
    if not points:
        raise UsageError(f"strikeline fit: {args.points!r}: no usable rows ({'; '.join(problems) or 'empty'})")
    pts = [(p.pressure, p.gap, p.voltage, p.temperature) for p in points]
    labels = [f"line {p.line}" for p in points]
    pts, labels, left_out = dc_like(bench, pts, labels)  # an AC bench's RF strikes are not Paschen's
    problems += left_out
    if not pts:
        raise UsageError(f"strikeline fit: {args.points!r}: no strike Paschen's law describes ({problems[0]}...)")
    try:
        cal = calibrate(bench, pts, labels, free)
    except FitRefused as e:
        skipped = f" ({len(problems)} rows skipped: {problems[0]}...)" if problems else ""
        raise UsageError(f"strikeline fit: refused: {e}{skipped}") from None
    if args.json:
        print_json(calibration_json(cal, tuple(problems)))
    else:
        print(calibration_text(cal, tuple(problems)))
    if args.save is not None:
        save_curve(args.save, cal.result.curve)
        print(f"strikeline fit: bench curve saved into {args.save}", file=sys.stderr)
    return 0


def _check_bench_to_save(path: str) -> None:
    from ...profiles.loader import BUILTIN_BENCHES, load_bench

    if path in BUILTIN_BENCHES:
        raise UsageError(f"--save {path!r}: a built-in bench cannot be changed; copy it to a file and save there")
    load_bench(path)  # exists, is UTF-8, and loads: a broken file is refused before the fit
    check_output_file(path, "--save")


def cmd_log(args: argparse.Namespace) -> int:
    import csv
    import io

    from ..logread import read_log, skipped_text
    from ..logsummary import STRIKE_COLUMNS, strike_rows, summarise
    from ..text import log_summary_text

    header = ",".join(STRIKE_COLUMNS)
    target = None
    if args.strikes is not None:  # checked before the logbook is read: nothing is half-written
        old = ",".join(STRIKE_COLUMNS[:3])  # what earlier versions wrote
        target = check_output_file(args.strikes, "--strikes", ours=lambda first: first in (header, old))
    try:
        log = read_log(args.path)
    except FileNotFoundError:
        raise UsageError(f"strikeline log: {args.path!r}: no such file; give a logbook (.jsonl)") from None
    except OSError as e:
        raise UsageError(f"strikeline log: {args.path!r}: cannot be read ({e.strerror or e})") from None
    if not log.records:
        why = skipped_text(log) or "it is empty"
        raise UsageError(f"strikeline log: {args.path!r}: no readable logbook records ({why})")
    summary = summarise(log)
    if target is not None:
        rows = strike_rows(log)
        buf = io.StringIO(newline="")
        w = csv.DictWriter(buf, fieldnames=STRIKE_COLUMNS, lineterminator="\n")
        w.writeheader()
        w.writerows(rows)
        write_file(target, buf.getvalue(), "--strikes")
        print(f"strikeline log: {len(rows)} strike marks written to {args.strikes}", file=sys.stderr)
    if args.json:
        print_json(summary)
    else:
        print(log_summary_text(summary))
    return 0
