"""The ``strikeline`` command line.

Every verb prints readable text by default and JSON with ``--json``. A bad value ends
with one line on stderr naming the value and the accepted form, and exit status 2; an
unexpected failure prints one line and leaves the traceback in the log file.
"""

from __future__ import annotations

import argparse
import json
import logging
import sys
from collections.abc import Sequence
from dataclasses import replace
from pathlib import Path

from ..model import units
from ..model.units import QuantityError
from ..profiles.loader import ProfileError

log = logging.getLogger("strikeline")

SAFETY = (
    "High voltage can kill. strikeline is advisory: it reads instruments and controls nothing. "
    "Keep the interlocks working, discharge and ground the supply before touching the chamber, "
    "work one-handed near live parts, and follow local codes, your lab's safety officer and "
    "licensed practice first."
)


class UsageError(Exception):
    """A bad command line; the message is the one line shown to the user."""


class _Parser(argparse.ArgumentParser):
    def error(self, message: str):  # one line, never the usage block
        raise UsageError(f"{self.prog}: {message} (see {self.prog} --help)")


def _quantity(kind: str):
    def read(text: str) -> float:
        try:
            return units.parse(text, kind)
        except QuantityError as e:  # argparse shows ArgumentTypeError text as it is
            raise argparse.ArgumentTypeError(str(e)) from None

    read.__name__ = kind
    return read


def build_parser() -> argparse.ArgumentParser:
    p = _Parser(
        prog="strikeline",
        description=(
            "Where a glow-discharge or DC sputter bench sits on its gas's breakdown (Paschen) curve, "
            "whether the supply can strike it, and what risks come with that operating point. "
            "Quantities take units: --pressure '0.5 Pa', --gap 40mm, --voltage 600V."
        ),
        epilog=SAFETY,
    )
    sub = p.add_subparsers(dest="verb", metavar="VERB", parser_class=_Parser)

    def common_point(s: argparse.ArgumentParser) -> None:
        s.add_argument("--bench", metavar="FILE", help="bench profile (.toml), or 'demo' / 'demo-magnetron'")
        s.add_argument("--gas", help="gas name or symbol, e.g. argon, Ar, N2, air (default: the bench's)")
        s.add_argument("--cathode", help="cathode metal, e.g. Cu, Al, stainless (default: the bench's)")
        s.add_argument("--gamma", type=float, help="secondary-electron yield to use instead of the cathode data")
        s.add_argument(
            "--temperature",
            type=_quantity("temperature"),
            metavar="T",
            help="gas temperature, e.g. '300 K' or '20 C'",
        )

    lv = sub.add_parser(
        "live",
        help="the live tuning screen",
        description=(
            "The live tuning screen: where the bench sits on its breakdown curve as pressure and gap change, "
            "read from the bench's instruments, typed by hand (--manual), simulated (--sim) or replayed from a "
            "logbook (--replay). Every session is logged. Press ? on the screen for the keys."
        ),
        epilog=SAFETY,
    )
    lv.add_argument("--bench", metavar="FILE", default="demo", help="bench profile (.toml), or 'demo' (default)")
    lv.add_argument("--manual", action="store_true", help="no instruments: type pressure, gap and voltage")
    lv.add_argument("--sim", action="store_true", help="read the simulated bench instead of the profile's ports")
    lv.add_argument("--replay", metavar="PATH", help="play a logbook back through the screen")
    lv.add_argument("--speed", type=float, default=1.0, help="replay speed: 1 its own pace, 10 ten times faster")
    lv.add_argument("--log", metavar="PATH", help="logbook file (default: a new file in the user data folder)")
    lv.add_argument("--no-log", action="store_true", help="keep no logbook for this session")
    lv.add_argument("--units", choices=("SI", "mbar", "Torr"), default="SI", help="units shown at start")

    s = sub.add_parser(
        "strike",
        help="forecast one operating point",
        description="Forecast one operating point.",
        epilog=SAFETY,
    )
    common_point(s)
    s.add_argument(
        "--pressure",
        type=_quantity("pressure"),
        metavar="P",
        help="true gas pressure, e.g. '0.5 Pa', '20 mTorr'",
    )
    s.add_argument(
        "--gap", type=_quantity("length"), metavar="D", help="electrode gap, e.g. 40mm (default: the bench's)"
    )
    s.add_argument(
        "--voltage",
        type=_quantity("voltage"),
        metavar="V",
        help="applied voltage, e.g. 600V (default: the bench supply's)",
    )
    s.add_argument("--units", choices=("SI", "mbar", "Torr"), default="SI", help="units of the text output")
    s.add_argument("--json", action="store_true", help="print the forecast as JSON (SI units)")

    c = sub.add_parser(
        "curve",
        help="the breakdown curve as CSV",
        description=(
            "Print the breakdown curve as CSV. With --gap, --from/--to are pressures; without it they are pd "
            "values such as '0.1 Torr cm'. A magnetised bench is swept in pressure at its gap (the crossed-field "
            "effective pressure depends on p), and its reduced_pd column includes that effective pressure. "
            "Default: two decades either side of the minimum."
        ),
        epilog=SAFETY,
    )
    common_point(c)
    c.add_argument("--gap", type=_quantity("length"), metavar="D", help="fix the gap and sweep pressure")
    c.add_argument("--from", dest="start", metavar="X", help="start of the sweep (pd, or pressure with --gap)")
    c.add_argument("--to", dest="stop", metavar="X", help="end of the sweep")
    c.add_argument("--points", type=int, default=200, help="number of points, log-spaced (default 200)")

    ga = sub.add_parser(
        "gauge",
        help="read the bench's instruments headless",
        description=(
            "Read the bench profile's instrument channels and print one line per reading (gas-corrected "
            "pressure beside the indicated value), to check the wiring before opening the screen."
        ),
        epilog=SAFETY,
    )
    ga.add_argument("--bench", metavar="FILE", required=True, help="bench profile (.toml), or 'demo'")
    ga.add_argument("--samples", type=int, default=10, help="stop after this many readings (default 10)")
    ga.add_argument(
        "--seconds", type=_quantity("time"), metavar="S", default=None, help="stop after this long, e.g. '30 s'"
    )
    ga.add_argument("--json", action="store_true", help="one JSON object per line")

    r = sub.add_parser(
        "record",
        help="log the bench's instruments headless",
        description=(
            "Log the bench's instruments and forecasts to a logbook without the screen, for unattended runs. "
            "The logbook is flushed per record and synced every second: a crash loses at most the last second."
        ),
        epilog=SAFETY,
    )
    r.add_argument("--bench", metavar="FILE", required=True, help="bench profile (.toml), or 'demo'")
    r.add_argument(
        "--seconds", type=_quantity("time"), metavar="S", required=True, help="how long, e.g. '8 h', '600 s'"
    )
    r.add_argument("--log", metavar="PATH", help="logbook file (default: a new file in the user data folder)")

    ft = sub.add_parser(
        "fit",
        help="fit this bench's breakdown curve to recorded strikes",
        description=(
            "Fit Paschen's law to strikes recorded on this bench (CSV with pressure, gap and voltage columns; "
            "units in the header or the cells). A and gamma only appear together in the law, so fit A,B "
            "(default) or B,gamma. --save writes the curve into a bench profile; strike and the screen then use it."
        ),
        epilog=SAFETY,
    )
    ft.add_argument("points", metavar="POINTS.csv", help="strike points (strikeline log --strikes writes one)")
    ft.add_argument("--bench", metavar="FILE", help="take gas, cathode and gas temperature from this bench")
    ft.add_argument("--gas", help="gas name or symbol (default: the bench's)")
    ft.add_argument("--cathode", help="cathode metal (default: the bench's)")
    ft.add_argument("--free", default="A,B", help="which of A, B, gamma to fit (default A,B)")
    ft.add_argument("--save", metavar="BENCH", help="write the fitted curve into this bench profile")
    ft.add_argument("--json", action="store_true", help="print the fit as JSON (SI units)")

    lg = sub.add_parser(
        "log",
        help="summarise a logbook",
        description="Summarise a logbook: span, readings per channel, gaps and faults, strike marks, flag changes.",
        epilog=SAFETY,
    )
    lg.add_argument("path", metavar="PATH", help="a logbook (.jsonl)")
    lg.add_argument("--strikes", metavar="CSV", help="also write the strike marks as a calibration CSV")
    lg.add_argument("--json", action="store_true", help="print the summary as JSON")

    g = sub.add_parser(
        "gases",
        help="gas and cathode data with sources",
        description="List gas and cathode data with sources.",
        epilog=SAFETY,
    )
    g.add_argument("--json", action="store_true", help="print as JSON (SI units)")
    return p


def _bench_for(args: argparse.Namespace, *, need_gap: bool):
    """The bench the verb works on: a profile, or one built from --gas/--cathode."""
    from ..model.bench import Bench
    from ..profiles.loader import find_cathode, find_gas, load_bench

    if args.bench is not None:
        bench = load_bench(args.bench).bench
        if args.gas is not None:
            bench = replace(bench, gas=find_gas(args.gas), curve=None)
        if args.cathode is not None:
            bench = replace(bench, cathode=find_cathode(args.cathode), gamma=None, curve=None)
    else:
        if args.gas is None or args.cathode is None:
            missing = " and ".join(o for o, v in (("--gas", args.gas), ("--cathode", args.cathode)) if v is None)
            raise UsageError(f"strikeline {args.verb}: {missing} needed (or --bench FILE / --bench demo)")
        gap = getattr(args, "gap", None)
        if need_gap and gap is None:
            raise UsageError(f"strikeline {args.verb}: --gap needed without --bench, e.g. --gap 40mm")
        bench = Bench(name="command line", gas=find_gas(args.gas), cathode=find_cathode(args.cathode), gap=gap or 1.0)
    gamma = getattr(args, "gamma", None)  # verbs without the option (fit) simply have none
    if gamma is not None:
        if not 0 < gamma <= 1:
            raise UsageError(
                f"strikeline {args.verb}: --gamma {gamma!r}: give a yield above 0 and at most 1, e.g. 0.07"
            )
        bench = replace(bench, gamma=gamma)
    temperature = getattr(args, "temperature", None)
    if temperature is not None:
        if not 20 <= temperature <= 3000:
            raise UsageError(f"strikeline {args.verb}: --temperature {temperature:g} K: give 20 K to 3000 K")
        bench = replace(bench, gas_temperature=temperature)
    return bench


def _sim_ports(profile):
    """The built-in simulated controller, aimed at this bench's setpoint, supply and gas: its
    thermal gauge under-reads by the bench gas's own factor, and is corrected by it."""
    from urllib.parse import quote

    from ..profiles.loader import gauge_correction, load_bench

    b = profile.bench
    corr = gauge_correction("thermal", b.gas)
    if corr.factor is None:  # no thermal factor known for this gas: simulate a diaphragm gauge
        corr = gauge_correction("capacitance", b.gas)
    volts = b.supply.open_circuit_voltage if b.supply else 1200.0
    url = (
        f"simbench://{quote(b.name)}?seed=1&gauge_factor={corr.factor:g}&setpoint={b.pressure or 20.0:g}"
        f"&voltage={volts:g}"
    )
    ports = tuple(replace(port, url=url) for port in load_bench("demo").ports)
    gauges = {c.name: corr for port in ports for c in port.channels if c.quantity == "pressure"}
    return replace(profile, ports=ports, gauges=gauges)


def cmd_live(args: argparse.Namespace) -> int:
    from ..drivers.logbook import read_logbook
    from ..profiles.loader import load_bench
    from .app import make_app

    if not sys.stdout.isatty():
        raise UsageError("strikeline live: needs a terminal (for scripts use strike, gauge or record)")
    if args.speed < 0:
        raise UsageError(f"strikeline live: --speed {args.speed:g}: give 0 (as fast as possible) or more")
    profile = load_bench(args.bench)
    replay = None
    if args.replay:
        try:
            log = read_logbook(args.replay)
        except OSError as e:
            raise UsageError(f"strikeline live: --replay {args.replay!r}: cannot be read ({e.strerror or e})") from None
        replay = log.records
        if not any(r.get("kind") == "reading" for r in replay):
            raise UsageError(f"strikeline live: --replay {args.replay!r}: no readings in this logbook")
    if args.sim:
        profile = _sim_ports(profile)
    app = make_app(
        profile,
        manual=args.manual,
        replay=replay,
        speed=args.speed,
        log_path=Path(args.log) if args.log else None,
        log=not args.no_log,
        units=args.units,
    )
    app.run()
    if app.session.logbook is not None:
        print(f"strikeline: logbook {app.session.logbook.path}", file=sys.stderr)
    return 0


def cmd_strike(args: argparse.Namespace) -> int:
    from ..model.bench import OperatingPoint
    from ..model.forecast import forecast
    from .text import forecast_text

    bench = _bench_for(args, need_gap=True)
    pressure = args.pressure if args.pressure is not None else bench.pressure
    if pressure is None:
        raise UsageError("strikeline strike: --pressure needed, e.g. --pressure '0.5 Pa'")
    gap = args.gap if args.gap is not None else bench.gap
    point = OperatingPoint(pressure, gap, args.voltage, bench.gas_temperature)
    f = forecast(point, bench)
    if args.json:
        print(json.dumps(f.to_json(), indent=2))
    else:
        print(forecast_text(f, args.units))
    return 0


def cmd_curve(args: argparse.Namespace) -> int:
    import numpy as np

    from ..model import paschen
    from ..model.forecast import with_bench_curve

    bench, fitted = with_bench_curve(_bench_for(args, need_gap=False))
    if args.points < 2 or args.points > 1_000_000:
        raise UsageError(f"strikeline curve: --points {args.points}: give 2 to 1000000")
    c = bench.gas.constants
    gamma = bench.yield_().value
    scale = c.reference_temperature / bench.gas_temperature
    pd_min, _ = paschen.minimum(c.A, c.B, gamma)
    gap = args.gap  # a pd sweep unless --gap is given, even with a bench...
    if gap is None and bench.magnetic_field is not None:
        gap = bench.gap  # ...but a magnetised cathode's effective pressure needs p itself
    what = "pressure" if gap is not None else "pd"

    def read(text: str | None, default: float, option: str) -> float:
        if text is None:
            return default
        try:
            if gap is not None:
                return units.parse(text, "pressure", name=option)
            return units.parse_pd(text, name=option)
        except QuantityError as e:
            hint = "" if gap is not None else " (without --gap the sweep is in pd; add --gap to sweep pressure)"
            raise QuantityError(f"{e}{hint}") from None

    # Defaults span two decades either side of the minimum, in actual (not reduced) units.
    lo_default = pd_min / scale / 100
    hi_default = pd_min / scale * 100
    if gap is not None:
        lo_default, hi_default = lo_default / gap, hi_default / gap
    lo = read(args.start, lo_default, "--from")
    hi = read(args.stop, hi_default, "--to")
    if not lo < hi:
        raise UsageError(
            f"strikeline curve: --from must be below --to (got {lo:g} and {hi:g} {'Pa' if gap else 'Pa m'})"
        )
    from ..model.forecast import curve, effective_pressure, law_name

    xs = np.geomspace(lo, hi, args.points)
    pd = xs * gap if gap is not None else xs
    rpd = pd * scale
    if bench.magnetic_field is not None:
        p_eff, _hall = effective_pressure(xs, bench.gas_temperature, bench)
        rpd = p_eff * gap * scale
    vb, w = curve(rpd, bench)
    br = paschen.branch(rpd, c.A, gamma)
    out = sys.stdout
    cols = (["pressure_Pa", "gap_m"] if what == "pressure" else []) + [
        "pd_Pa_m",
        "reduced_pd_Pa_m",
        "breakdown_V",
        "branch",
        "law",
        "constants",
    ]
    source = "bench-curve" if fitted is not None else "textbook"
    out.write(",".join(cols) + "\n")
    for i in range(len(xs)):
        v = "" if not np.isfinite(vb[i]) else f"{vb[i]:.10g}"
        row = ([f"{xs[i]:.10g}", f"{gap:.10g}"] if what == "pressure" else []) + [
            f"{pd[i]:.10g}",
            f"{rpd[i]:.10g}",
            v,
            str(br[i]),
            law_name(w[i]),
            source,
        ]
        out.write(",".join(row) + "\n")
    return 0


def cmd_gases(args: argparse.Namespace) -> int:
    from .text import gases_json, gases_text

    if args.json:
        print(json.dumps(gases_json(), indent=2))
    else:
        print(gases_text())
    return 0


def cmd_gauge(args: argparse.Namespace) -> int:
    import queue
    import time

    from ..drivers.hub import Instruments
    from ..profiles.loader import load_bench
    from .text import reading_json, reading_text

    profile = load_bench(args.bench)
    if not profile.ports:
        raise UsageError(f"strikeline gauge: bench {profile.label!r} has no [[port]] section: nothing to read")
    if args.samples < 1:
        raise UsageError(f"strikeline gauge: --samples {args.samples}: give 1 or more")
    q: queue.Queue = queue.Queue()
    events: queue.Queue = queue.Queue()
    inst = Instruments(profile.ports, q.put, lambda port, kind, msg: events.put((port, kind, msg)))
    deadline = None if args.seconds is None else time.monotonic() + args.seconds
    count = 0
    inst.start()
    try:
        while count < args.samples and (deadline is None or time.monotonic() < deadline):
            while not events.empty():
                port, kind, msg = events.get()
                print(f"# {port}: {kind} {msg}", file=sys.stderr)
            try:
                r = q.get(timeout=0.2)
            except queue.Empty:
                continue
            count += 1
            corr = profile.gauges.get(r.channel)
            print(json.dumps(reading_json(r, corr)) if args.json else reading_text(r, corr), flush=True)
    finally:
        inst.stop()
    _print_port_counts(inst)
    return 0 if count else 1


def _print_port_counts(inst) -> None:
    for port, st in inst.stats().items():
        print(
            f"# {port}: {st.readings} readings, {st.garbled} garbled, {st.timeouts} unanswered, "
            f"{st.overflow} overlong, {st.faults} faults, {st.reconnects} reconnects",
            file=sys.stderr,
        )


def cmd_record(args: argparse.Namespace) -> int:
    import queue
    import time

    from ..drivers.hub import Instruments
    from ..drivers.logbook import Logbook
    from ..profiles.loader import load_bench
    from .locations import new_logbook_path
    from .session import Session

    profile = load_bench(args.bench)
    if not profile.ports:
        raise UsageError(f"strikeline record: bench {profile.label!r} has no [[port]] section: nothing to record")
    path = Path(args.log) if args.log else new_logbook_path(profile.bench.name, time.time())
    errors: list[str | None] = []
    book = Logbook(path, on_error=errors.append)
    book.open(bench=profile.label, gas=profile.bench.gas.key, cathode=profile.bench.cathode.key, mode="record")
    session = Session(profile, logbook=book)
    q: queue.Queue = queue.Queue()
    inst = Instruments(profile.ports, q.put, lambda port, kind, msg: q.put((port, kind, msg)))
    print(f"strikeline record: logging {profile.label} to {path} for {args.seconds:g} s", file=sys.stderr)
    end = time.monotonic() + args.seconds
    next_view = 0.0
    shown_error = None
    inst.start()
    try:
        while time.monotonic() < end:
            try:
                item = q.get(timeout=0.1)
            except queue.Empty:
                item = None
            if isinstance(item, tuple):
                session.event(*item)
            elif item is not None:
                session.handle(item)
            if time.monotonic() >= next_view:
                session.view()
                next_view = time.monotonic() + 0.5
            if errors and errors[-1] != shown_error:
                shown_error = errors[-1]
                print(f"strikeline record: {shown_error or 'logbook writing again'}", file=sys.stderr)
    finally:
        inst.stop()
        for port, st in inst.stats().items():
            book.write(
                "event",
                port=port,
                event="counts",
                message="",
                readings=st.readings,
                garbled=st.garbled,
                unanswered=st.timeouts,
                overlong=st.overflow,
                faults=st.faults,
                reconnects=st.reconnects,
            )
        book.close()
    _print_port_counts(inst)
    print(f"strikeline record: {book.written} records in {path}", file=sys.stderr)
    return 0 if book.error is None else 1


def cmd_fit(args: argparse.Namespace) -> int:
    from ..model.calibration import FitRefused
    from ..profiles.loader import save_curve
    from ..profiles.strikes import read_strike_csv
    from .calibrate import calibrate, calibration_json, calibration_text, parse_free

    bench = _bench_for(args, need_gap=False)
    try:
        free = parse_free(args.free)
        table = read_strike_csv(args.points)
    except ValueError as e:
        raise UsageError(f"strikeline fit: {e}") from None
    if not table.points:
        raise UsageError(f"strikeline fit: {args.points!r}: no usable rows ({'; '.join(table.problems) or 'empty'})")
    pts = [(p.pressure, p.gap, p.voltage, p.temperature) for p in table.points]
    labels = [f"line {p.line}" for p in table.points]
    try:
        cal = calibrate(bench, pts, labels, free)
    except FitRefused as e:
        raise UsageError(f"strikeline fit: refused: {e}") from None
    print(
        json.dumps(calibration_json(cal, table.problems), indent=2)
        if args.json
        else calibration_text(cal, table.problems)
    )
    if args.save:
        save_curve(args.save, cal.result.curve)
        print(f"strikeline fit: bench curve saved into {args.save}", file=sys.stderr)
    return 0


def cmd_log(args: argparse.Namespace) -> int:
    import csv

    from ..drivers.logbook import read_logbook
    from .logsummary import STRIKE_COLUMNS, strike_rows, summarise
    from .text import log_summary_text

    try:
        log = read_logbook(args.path)
    except FileNotFoundError:
        raise UsageError(f"strikeline log: {args.path!r}: no such file; give a logbook (.jsonl)") from None
    except (OSError, UnicodeDecodeError) as e:
        raise UsageError(f"strikeline log: {args.path!r}: cannot be read ({e})") from None
    if not log.records:
        raise UsageError(f"strikeline log: {args.path!r}: no logbook records in it")
    summary = summarise(log)
    if args.strikes:
        rows = strike_rows(log)
        with open(args.strikes, "w", newline="", encoding="utf-8") as f:
            w = csv.DictWriter(f, fieldnames=STRIKE_COLUMNS)
            w.writeheader()
            w.writerows(rows)
        print(f"strikeline log: {len(rows)} strike marks written to {args.strikes}", file=sys.stderr)
    print(json.dumps(summary, indent=2) if args.json else log_summary_text(summary))
    return 0


VERBS = {
    "live": cmd_live,
    "strike": cmd_strike,
    "curve": cmd_curve,
    "gauge": cmd_gauge,
    "record": cmd_record,
    "fit": cmd_fit,
    "log": cmd_log,
    "gases": cmd_gases,
}


def _join_negative_values(argv: list[str]) -> list[str]:
    """Let "--gap -1mm" reach the unit parser (and its message) instead of argparse
    taking "-1mm" for an option."""
    out: list[str] = []
    i = 0
    while i < len(argv):
        tok = argv[i]
        nxt = argv[i + 1] if i + 1 < len(argv) else ""
        if (
            tok.startswith("--")
            and "=" not in tok
            and len(nxt) > 1
            and nxt[0] == "-"
            and (nxt[1].isdigit() or nxt[1] == ".")
        ):
            out.append(f"{tok}={nxt}")
            i += 2
            continue
        out.append(tok)
        i += 1
    return out


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; returns the exit status (0 fine, 2 bad input, 1 internal)."""
    argv = _join_negative_values(list(sys.argv[1:] if argv is None else argv))
    verb = next((a for a in argv if a in VERBS), None)
    try:
        # With no arguments strikeline opens the screen on the built-in demo bench, so a new
        # user sees the whole job at once (or prints its forecast when not on a terminal).
        if not argv:
            argv = ["live"] if sys.stdout.isatty() and sys.stdin.isatty() else ["strike", "--bench", "demo"]
        args = build_parser().parse_args(argv)
        if args.verb is None:
            raise UsageError("strikeline: name a verb: strike, curve or gases (see strikeline --help)")
        return VERBS[args.verb](args)
    except (UsageError, QuantityError, ProfileError) as e:
        msg = _one_line(str(e))
        if not msg.startswith("strikeline"):
            msg = f"strikeline {verb}: {msg}" if verb else f"strikeline: {msg}"
        print(msg, file=sys.stderr)
        return 2
    except BrokenPipeError:  # `strikeline curve | head` is fine
        return 0
    except KeyboardInterrupt:
        return 130
    except Exception as e:  # noqa: BLE001 - the entry point shows one line and logs the rest
        where = "the log"
        try:
            from .locations import error_log_path

            path = error_log_path()
            handler = logging.FileHandler(path, encoding="utf-8")
            log.addHandler(handler)
            log.exception("internal error running %r", argv)
            handler.close()
            where = str(path)
        except OSError:
            pass
        print(
            f"strikeline: internal error: {e.__class__.__name__}: {_one_line(str(e))} (details in {where})",
            file=sys.stderr,
        )
        return 1


def _one_line(text: str) -> str:
    return " ".join(text.split())


if __name__ == "__main__":
    sys.exit(main())
