"""The instrument verbs: ``live`` (the screen), ``gauge`` (read headless), ``record`` (log headless)."""

from __future__ import annotations

import argparse
import sys
from dataclasses import replace
from pathlib import Path

from ..outputs import print_json
from .forecast import UNIT_CHOICES
from .parser import UsageError, add_gas, add_verb, count, number, quantity

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
    add_gas(lv)
    lv.add_argument("--manual", action="store_true", help="no instruments: type pressure, gap and voltage")
    lv.add_argument("--sim", action="store_true", help="read the simulated bench instead of the profile's ports")
    lv.add_argument("--replay", metavar="PATH", help="play a logbook back through the screen")
    lv.add_argument(
        "--speed",
        type=number(0.0, 1e6, "a replay speed"),
        default=1.0,
        help="replay speed: 1 its own pace, 10 ten times faster, 0 as fast as it goes",
    )
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
    add_gas(ga)
    ga.add_argument(
        "--samples", type=count(1, 10**9, "a number of readings"), default=10, help="stop after this many readings"
    )
    ga.add_argument(
        "--seconds",
        type=quantity("duration", bare_unit="s"),
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
    add_gas(r)
    r.add_argument(
        "--seconds",
        type=quantity("duration", bare_unit="s"),
        metavar="S",
        required=True,
        help="how long: seconds, or a time with its unit, e.g. 600, '8 h'",
    )
    r.add_argument("--log", metavar="PATH", help="logbook file (default: a new file in the user data folder)")
    r.set_defaults(run=cmd_record)


SILENCE_LIMIT = 10.0
"""s: without --seconds, ``gauge`` gives up after this long without an answer."""


def _nothing_answered(verb: str, answered: int, seconds: float) -> int:
    """Exit status 1, with one line saying so, when no instrument answered (a script must be able to tell)."""
    if answered:
        return 0
    print(f"strikeline {verb}: no instrument answered in {seconds:.3g} s (see the port lines above)", file=sys.stderr)
    return 1


def _print_counts(inst) -> None:
    from ...drivers.stats import counts_text

    for port, st in inst.stats().items():
        print(f"# {counts_text(port, st)}", file=sys.stderr)


def sim_ports(profile):
    """The built-in simulated controller, aimed at this bench's setpoint, supply and gas: its
    thermal gauge under-reads by the bench gas's own factor, and is corrected by it."""
    from urllib.parse import quote

    from ...profiles.bench import load_bench
    from ...profiles.gauges import gauge_correction

    b = profile.bench
    corr = gauge_correction("thermal", b.fill)
    if corr.factor is None:  # no thermal factor known for this gas: simulate a diaphragm gauge
        corr = gauge_correction("capacitance", b.fill)
    volts = b.supply.open_circuit_voltage if b.supply else 1200.0
    url = (
        f"simbench://{quote(b.name)}?seed=1&gauge_factor={corr.factor:g}&setpoint={b.pressure or 20.0:g}"
        f"&voltage={volts:g}"
    )
    ports = tuple(replace(port, url=url) for port in load_bench("demo").ports)
    gauges = {c.name: corr for port in ports for c in port.channels if c.quantity == "pressure"}
    return replace(profile, ports=ports, gauges=gauges)


def _profile(args: argparse.Namespace):
    """The bench profile, with the gas fill of --gas if given (the gauges' corrections follow it)."""
    from ...profiles.bench import load_bench, with_profile_fill
    from ...profiles.fill import read_fill

    profile = load_bench(args.bench)
    return profile if args.gas is None else with_profile_fill(profile, read_fill(args.gas))


def cmd_live(args: argparse.Namespace) -> int:
    from ...drivers.logbook import refuse_foreign
    from ..screen.build import make_app

    profile = _profile(args)
    replay = None
    notes: list[str] = []
    if args.replay is not None:
        from ..logread import read_log, skipped_text

        try:
            log = read_log(args.replay)
        except OSError as e:
            raise UsageError(f"strikeline live: --replay {args.replay!r}: cannot be read ({e.strerror or e})") from None
        replay = log.records
        if not any(r.get("kind") == "reading" for r in replay):
            raise UsageError(f"strikeline live: --replay {args.replay!r}: no readings in this logbook")
        notes += [f"replay: {text}" for text in [skipped_text(log)] if text]
    if args.sim:
        profile = sim_ports(profile)
    if args.log is not None and not args.no_log:
        refuse_foreign(Path(args.log))  # a folder, a device or someone's file: said before the terminal check
    if not sys.stdout.isatty():  # the inputs above are checked first: their errors say more
        raise UsageError("strikeline live: needs a terminal (for scripts use strike, gauge or record)")
    app = make_app(
        profile,
        manual=args.manual,
        replay=replay,
        speed=args.speed,
        log_path=None if args.log is None else Path(args.log),
        log=not args.no_log,
        strict_log=True,  # a logbook that cannot be written stops the start, in one line
        units=args.units,
        notes=notes,
    )
    if args.gas is not None:
        app.session.set_gas(args.gas)  # typed: it holds against the flow meters until "flows" is typed
    app.run()
    if app.session.logbook is not None:
        print(f"strikeline: logbook {app.session.logbook.path}", file=sys.stderr)
    return app.return_code or 0  # non-zero if the screen itself failed


def cmd_gauge(args: argparse.Namespace) -> int:
    import time

    from ...drivers.hub import Instruments, PortEvent
    from ..text import reading_json, reading_text

    profile = _profile(args)
    if not profile.ports:
        raise UsageError(f"strikeline gauge: bench {profile.label!r} has no [[port]] section: nothing to read")
    labels = {c.name: c.labels for p in profile.ports for c in p.channels}
    inst = Instruments(profile.ports)  # taken off its one queue here, on this thread
    start = time.monotonic()
    deadline = start + (args.seconds if args.seconds is not None else SILENCE_LIMIT)
    shown = answered = 0
    fill = profile.bench.composition
    if args.json:  # the gas fill the pressures are corrected for, as the first line
        print_json({"kind": "fill", "composition": fill}, indent=None, flush=True)
    else:
        print(f"# gas fill {fill}: pressure channels corrected for it", file=sys.stderr)
    inst.start()
    try:
        while shown < args.samples and time.monotonic() < deadline:
            r = inst.take(0.2)
            if r is None:
                continue
            if isinstance(r, PortEvent):
                print(f"# {r.port}: {r.kind} {r.message}", file=sys.stderr)
                continue
            shown += 1
            if r.answered:
                answered += 1
                if args.seconds is None:  # without --seconds, give up only after a silence
                    deadline = time.monotonic() + SILENCE_LIMIT
            corr = profile.gauges.get(r.channel)
            if args.json:
                print_json(reading_json(r, corr, labels.get(r.channel)), indent=None, flush=True)
            else:
                print(reading_text(r, corr, labels.get(r.channel)), flush=True)
    finally:
        inst.stop()
    _print_counts(inst)
    if args.json:  # the fault counts of each port, as the last lines
        for port, st in inst.stats().items():
            print_json({"kind": "counts", "port": port, **st.counts()}, indent=None)
    return _nothing_answered("gauge", answered, time.monotonic() - start)


def cmd_record(args: argparse.Namespace) -> int:
    import time

    from ...drivers.hub import Instruments, PortEvent
    from ...drivers.logbook import Logbook
    from ..locations import new_logbook_path
    from ..session.session import Session

    profile = _profile(args)
    if not profile.ports:
        raise UsageError(f"strikeline record: bench {profile.label!r} has no [[port]] section: nothing to record")
    path = Path(args.log) if args.log is not None else new_logbook_path(profile.bench.name, time.time())
    errors: list[str | None] = []
    book = Logbook(path, on_error=errors.append)
    # Checked before anything starts: a logbook that cannot be written ends here, in one line.
    book.open(
        strict=True,
        bench=profile.label,
        gas=profile.bench.composition,
        cathode=profile.bench.cathode.key,
        mode="record",
    )
    session = Session(profile, logbook=book)
    if args.gas is not None:
        session.set_gas(args.gas)
    inst = Instruments(profile.ports)  # taken off its one queue here, on this thread
    fill = session.bench.composition
    print(f"strikeline record: logging {profile.label} in {fill} to {path} for {args.seconds:g} s", file=sys.stderr)
    end = time.monotonic() + args.seconds
    answered = 0
    next_view = 0.0
    shown_error = None
    inst.start()
    try:
        while time.monotonic() < end:
            item = inst.take(0.1)
            if isinstance(item, PortEvent):
                session.event(item.port, item.kind, item.message)
            elif item is not None:
                answered += item.answered
                session.handle(item)
            if time.monotonic() >= next_view:
                session.update()
                next_view = time.monotonic() + 0.5
            if errors and errors[-1] != shown_error:
                shown_error = errors[-1]
                print(f"strikeline record: {shown_error or 'logbook writing again'}", file=sys.stderr)
    finally:
        inst.stop()
        session.log_counts(inst.stats())
        book.close()
    _print_counts(inst)
    print(f"strikeline record: {book.written} records in {path}", file=sys.stderr)
    if book.error is not None:
        return 1
    return _nothing_answered("record", answered, args.seconds)
