"""The instrument verbs: ``live`` (the screen), ``gauge`` (read headless), ``record`` (log headless)."""

from __future__ import annotations

import argparse
import json
import sys
from dataclasses import replace
from pathlib import Path

from .forecast import UNIT_CHOICES
from .parser import UsageError, add_verb, quantity

__all__ = ["add_gauge", "add_live", "add_record", "sim_ports"]


def add_live(sub) -> None:
    lv = add_verb(
        sub,
        "live",
        "the live tuning screen",
        "The live tuning screen: where the bench sits on its breakdown curve as pressure and gap change, "
        "read from the bench's instruments, typed by hand (--manual), simulated (--sim) or replayed from a "
        "logbook (--replay). Every session is logged. Press ? on the screen for the keys.",
    )
    lv.add_argument("--bench", metavar="FILE", default="demo", help="bench profile (.toml), or 'demo' (default)")
    lv.add_argument("--manual", action="store_true", help="no instruments: type pressure, gap and voltage")
    lv.add_argument("--sim", action="store_true", help="read the simulated bench instead of the profile's ports")
    lv.add_argument("--replay", metavar="PATH", help="play a logbook back through the screen")
    lv.add_argument("--speed", type=float, default=1.0, help="replay speed: 1 its own pace, 10 ten times faster")
    lv.add_argument("--log", metavar="PATH", help="logbook file (default: a new file in the user data folder)")
    lv.add_argument("--no-log", action="store_true", help="keep no logbook for this session")
    lv.add_argument("--units", choices=UNIT_CHOICES, default="SI", help="units shown at start")
    lv.set_defaults(run=cmd_live)


def add_gauge(sub) -> None:
    ga = add_verb(
        sub,
        "gauge",
        "read the bench's instruments headless",
        "Read the bench profile's instrument channels and print one line per reading (gas-corrected "
        "pressure beside the indicated value), to check the wiring before opening the screen.",
    )
    ga.add_argument("--bench", metavar="FILE", required=True, help="bench profile (.toml), or 'demo'")
    ga.add_argument("--samples", type=int, default=10, help="stop after this many readings (default 10)")
    ga.add_argument(
        "--seconds",
        type=quantity("time", bare_unit="s"),
        metavar="S",
        default=None,
        help="stop after this long: seconds, or a time with its unit, e.g. 30 or '2 min'",
    )
    ga.add_argument("--json", action="store_true", help="one JSON object per line")
    ga.set_defaults(run=cmd_gauge)


def add_record(sub) -> None:
    r = add_verb(
        sub,
        "record",
        "log the bench's instruments headless",
        "Log the bench's instruments and forecasts to a logbook without the screen, for unattended runs. "
        "The logbook is flushed per record and synced every second: a crash loses at most the last second.",
    )
    r.add_argument("--bench", metavar="FILE", required=True, help="bench profile (.toml), or 'demo'")
    r.add_argument(
        "--seconds",
        type=quantity("time", bare_unit="s"),
        metavar="S",
        required=True,
        help="how long: seconds, or a time with its unit, e.g. 600, '8 h'",
    )
    r.add_argument("--log", metavar="PATH", help="logbook file (default: a new file in the user data folder)")
    r.set_defaults(run=cmd_record)


def _print_counts(inst) -> None:
    from ...drivers.stats import counts_text

    for port, st in inst.stats().items():
        print(f"# {counts_text(port, st)}", file=sys.stderr)


def sim_ports(profile):
    """The built-in simulated controller, aimed at this bench's setpoint, supply and gas: its
    thermal gauge under-reads by the bench gas's own factor, and is corrected by it."""
    from urllib.parse import quote

    from ...profiles.loader import gauge_correction, load_bench

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
    from ...drivers.logbook import read_logbook
    from ...profiles.loader import load_bench
    from ..app import make_app

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
        profile = sim_ports(profile)
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


def cmd_gauge(args: argparse.Namespace) -> int:
    import queue
    import time

    from ...drivers.hub import Instruments
    from ...profiles.loader import load_bench
    from ..text import reading_json, reading_text

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
    _print_counts(inst)
    return 0 if count else 1


def cmd_record(args: argparse.Namespace) -> int:
    import queue
    import time

    from ...drivers.hub import Instruments
    from ...drivers.logbook import Logbook
    from ...profiles.loader import load_bench
    from ..locations import new_logbook_path
    from ..session import Session

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
            book.write("event", port=port, event="counts", message="", **st.counts())
        book.close()
    _print_counts(inst)
    print(f"strikeline record: {book.written} records in {path}", file=sys.stderr)
    return 0 if book.error is None else 1
