"""The logbook and calibration verbs: ``log`` (summarise a logbook), ``report`` (the shift report) and
``fit`` (this bench's curve)."""

from __future__ import annotations

import argparse
import sys

from ..outputs import check_output_file, print_json, write_file
from .forecast import bench_for
from .parser import UsageError, add_gas, add_verb

__all__ = ["add_fit", "add_log", "add_report"]


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
    ft.add_argument(
        "--figure",
        nargs="?",
        const="",
        metavar="FILE",
        help="also draw the fit: the curves, the band and the strikes (.svg, .png or .pdf); without FILE, "
        "beside the --save profile as <profile>-fit.svg",
    )
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


def add_report(sub) -> None:
    rp = add_verb(
        sub,
        "report",
        "write a shift report of a logbook (HTML, or its main figure)",
        "Write one self-contained HTML file for the lab notebook: the bench, the breakdown curve with every "
        "strike mark and the path the operating point took, pressure, supply and margin through the shift with "
        "gaps and faults shaded, the flags' timeline and sentences, and tables of readings, faults, strike marks "
        "and the sources of every constant. With --out x.png, x.svg or x.pdf: the curve figure alone. Nothing "
        "in the file is fetched from a network or needs a script; it prints on A4.",
    )
    rp.add_argument("path", metavar="LOG", help="a logbook (.jsonl)")
    rp.add_argument(
        "--out",
        metavar="FILE",
        help="the report (.html) or the main figure (.png/.svg/.pdf); "
        "default: the logbook's name with .html, beside it",
    )
    rp.add_argument(
        "--from",
        dest="t_from",
        metavar="T",
        help="only from this moment: 2026-12-02T09:30 (UTC "
        "unless a zone is given) or a time since the log's start, '90 min'",
    )
    rp.add_argument("--to", dest="t_to", metavar="T", help="only up to this moment (the same forms)")
    rp.add_argument("--bench", metavar="FILE", help="draw this bench's curve (default: the one the logbook names)")
    rp.set_defaults(run=cmd_report)


def cmd_report(args: argparse.Namespace) -> int:
    from pathlib import Path

    from ...profiles.bench import load_bench
    from ..report.write import check_report_target, write_report
    from .parser import SAFETY

    out = args.out if args.out is not None else str(Path(args.path).with_suffix(".html"))
    target = check_report_target(out)  # before the logbook is read: nothing is half-done
    bench = None if args.bench is None else load_bench(args.bench).bench
    try:
        rep = write_report(args.path, target, bench=bench, t_from=args.t_from, t_to=args.t_to, caution=SAFETY)
    except FileNotFoundError:
        raise UsageError(f"strikeline report: {args.path!r}: no such file; give a logbook (.jsonl)") from None
    except IsADirectoryError:
        raise UsageError(f"strikeline report: {args.path!r}: is a folder; give a logbook (.jsonl)") from None
    except OSError as e:
        raise UsageError(f"strikeline report: {args.path!r}: cannot be read or written ({e.strerror or e})") from None
    what = "report" if rep.figures > 1 else "main figure"
    print(
        f"strikeline report: {what} of {rep.readings} readings and {rep.strikes} strike marks written to {rep.path}",
        file=sys.stderr,
    )
    if rep.skipped:
        print(f"strikeline report: {args.path}: {rep.skipped}", file=sys.stderr)
    return 0


def cmd_fit(args: argparse.Namespace) -> int:
    from ...model.calibration import FitRefused
    from ...model.composition import same_composition
    from ...profiles.bench import save_curve
    from ...profiles.strikes import read_strike_csv
    from ..calibrate import calibrate, calibration_json, calibration_text, dc_like, parse_free

    bench = bench_for(args, need_gap=False)
    if args.save is not None:
        _check_bench_to_save(args.save)  # before any work: the file must load and its folder be writable
    figure = None if args.figure is None else _figure_target(args.figure, args.save)
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
    if figure is not None:
        _draw_fit(bench, cal, pts, figure)
        print(f"strikeline fit: figure written to {figure}", file=sys.stderr)
    return 0


def _figure_target(given: str, save: str | None):
    from pathlib import Path

    from ..report.figures import FIGURE_FORMATS
    from ..report.write import check_report_target

    if not given:
        if save is None:
            raise UsageError("strikeline fit: --figure needs a FILE, or --save BENCH to draw it beside")
        given = str(Path(save).with_name(Path(save).stem + "-fit.svg"))
    if Path(given).suffix.lower() not in FIGURE_FORMATS:
        raise UsageError(f"strikeline fit: --figure {given!r}: give a .svg, .png or .pdf file")
    return check_report_target(given, "--figure")


def _draw_fit(bench, cal, pts, path) -> None:
    from dataclasses import replace

    import numpy as np

    from ..report.data import curve_data
    from ..report.figures import fit_figure, save

    marks = [(p * d, v) for p, d, v, _t in pts]
    fitted = replace(bench, curve=cal.result.curve)
    curve = curve_data(fitted, np.array([pd for pd, _v in marks]))
    curve.supply = None  # the fit says nothing of a supply
    save(fit_figure(curve, marks, f"{bench.composition} on {bench.cathode.key}: {len(marks)} strikes fitted"), path)


def _check_bench_to_save(path: str) -> None:
    from ...profiles.bench import BUILTIN_BENCHES, load_bench

    if path in BUILTIN_BENCHES:
        raise UsageError(f"--save {path!r}: a built-in bench cannot be changed; copy it to a file and save there")
    load_bench(path)  # exists, is UTF-8, and loads: a broken file is refused before the fit
    check_output_file(path, "--save")


def cmd_log(args: argparse.Namespace) -> int:
    import csv
    import io

    from ..logread import read_log, skipped_text
    from ..report.summary import STRIKE_COLUMNS, strike_rows, summarise
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
