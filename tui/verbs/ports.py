"""The ``ports`` verb: each instrument port of a bench, its kind, whether it connects, and its channels."""

from __future__ import annotations

import argparse
import sys
import time
from typing import Any

from ..outputs import print_json
from .parser import UsageError, add_verb, quantity

__all__ = ["add_ports", "channel_where", "port_kind"]


def add_ports(sub) -> None:
    p = add_verb(
        sub,
        "ports",
        "list the bench's instrument ports and try each",
        "List every instrument port of a bench profile (line protocol, Modbus or SCPI over VISA): where it "
        "is, whether it connects within --seconds, what an SCPI instrument calls itself, and each channel "
        "with the register or query it reads. Nothing is written to any instrument.",
    )
    p.add_argument("--bench", metavar="FILE", required=True, help="bench profile (.toml), or 'demo'")
    p.add_argument(
        "--seconds",
        type=quantity("duration", bare_unit="s"),
        default=3.0,
        metavar="S",
        help="how long to wait for the ports to answer (default 3 s)",
    )
    p.add_argument("--json", action="store_true", help="print as JSON")
    p.set_defaults(run=cmd_ports)


def port_kind(spec: Any) -> str:
    """ "lines", "modbus" or "scpi"."""
    from ...drivers.specs import ModbusPortSpec, ScpiPortSpec

    return "modbus" if isinstance(spec, ModbusPortSpec) else "scpi" if isinstance(spec, ScpiPortSpec) else "lines"


def channel_where(c: Any) -> str:
    """What a channel reads, in the profile's own terms: a register, or a query."""
    if c.register is not None:
        r = c.register
        text = f"{r.table} {r.address} {r.dtype}"
        if r.count > 1:
            text += f" words {r.word_order} bytes {r.byte_order}"
        if c.status_register is not None:
            text += f", status {c.status_register.table} {c.status_register.address}"
        return text
    if c.query is not None:
        return f"query {c.query.decode('ascii').strip()!r}"
    return "streamed"


def cmd_ports(args: argparse.Namespace) -> int:
    from ...drivers.hub import Instruments
    from ...profiles.bench import load_bench

    profile = load_bench(args.bench)
    if not profile.ports:
        raise UsageError(f"strikeline ports: bench {profile.label!r} has no [[port]] section")
    state: dict[str, dict[str, Any]] = {p.name: {"state": "not answered", "detail": ""} for p in profile.ports}
    latest: dict[str, Any] = {}

    def on_event(port: str, kind: str, msg: str) -> None:
        if kind == "connected":
            state[port].update(state="connected", detail=msg)
        elif kind == "lost":
            state[port].update(state="lost", detail=msg)
        elif kind == "identified":
            state[port]["identity"] = msg

    inst = Instruments(profile.ports, lambda r: latest.__setitem__(r.channel, r), on_event)
    names = [c.name for p in profile.ports for c in p.channels]
    end = time.monotonic() + args.seconds
    inst.start()
    try:
        while time.monotonic() < end and not all(n in latest for n in names):
            time.sleep(0.05)
    finally:
        inst.stop()
    out = []
    for p in profile.ports:
        out.append(
            {
                "name": p.name,
                "kind": port_kind(p),
                "where": p.where,
                **state[p.name],
                "channels": [
                    {
                        "name": c.name,
                        "quantity": c.quantity,
                        "reads": channel_where(c),
                        "status": str(latest[c.name].status) if c.name in latest else "no reading",
                    }
                    for c in p.channels
                ],
            }
        )
    if args.json:
        print_json(out)
    else:
        for p in out:
            who = f" ({p['identity']})" if p.get("identity") else ""
            print(f"{p['name']}: {p['kind']} at {p['where']}: {p['state']}{who}")
            if p["state"] == "lost":
                print(f"  {p['detail']}")
            for c in p["channels"]:
                print(f"  {c['name']:<18} {c['quantity']:<9} {c['reads']:<40} {c['status']}")
    missing = [p["name"] for p in out if p["state"] != "connected"]
    if missing:
        print(f"strikeline ports: not connected: {', '.join(missing)}", file=sys.stderr)
        return 1
    return 0
