"""Instrument port sections of a bench profile ([[port]] and [[port.channel]]) into port specs.

``protocol`` picks the kind: "lines" (the default: ASCII lines over any pyserial URL),
"modbus" (TCP or serial RTU, :mod:`.modbus_ports`) or "scpi" (queries through a VISA resource,
:mod:`.scpi_ports`). Every kind yields :mod:`strikeline.drivers.specs` data and the gas correction
of each pressure channel.
"""

from __future__ import annotations

from typing import Any

from ..drivers.specs import ChannelSpec, ModbusPortSpec, PortSpec, ScpiPortSpec
from ..model.composition import Composition
from ..model.gauges import GaugeCorrection
from .channels import (
    CHANNEL_FIELDS,
    PORT_FIELDS,
    ascii_field,
    channel_fields,
    channels_of,
    pattern_field,
    port_timing,
    unit_map,
)
from .fields import ProfileError, Table
from .modbus_ports import modbus_port
from .scpi_ports import scpi_port

__all__ = ["PROTOCOLS", "port_sections"]

PROTOCOLS = ("lines", "modbus", "scpi")

_LINE_PORT_FIELDS = PORT_FIELDS + (
    "url",
    "mode",
    "baudrate",
    "bytesize",
    "parity",
    "stopbits",
    "terminator",
    "encoding",
)
_LINE_CHANNEL_FIELDS = CHANNEL_FIELDS + ("query", "pattern", "units")

AnyPort = PortSpec | ModbusPortSpec | ScpiPortSpec


def port_sections(
    raw: dict[str, Any], label: str, fill: Composition
) -> tuple[tuple[AnyPort, ...], dict[str, GaugeCorrection]]:
    """The [[port]] sections of a parsed bench file: port specs, and gas corrections by channel."""
    items = raw.get("port", [])
    if not isinstance(items, list):
        raise ProfileError(f"{label}: [[port]] must be a list of tables ([[port]] blocks)")
    ports: list[AnyPort] = []
    gauges: dict[str, GaugeCorrection] = {}
    names: set[str] = set()
    for i, item in enumerate(items, 1):
        t = Table(label, f"port #{i}", item)
        protocol = t.string("protocol", default="lines", choices=PROTOCOLS).casefold()
        build = {"lines": _line_port, "modbus": modbus_port, "scpi": scpi_port}[protocol]
        ports.append(build(t, label, i, fill, names, gauges))
    return tuple(ports), gauges


def _line_port(
    t: Table, label: str, i: int, fill: Composition, names: set[str], gauges: dict[str, GaugeCorrection]
) -> PortSpec:
    t.only(_LINE_PORT_FIELDS)
    mode = t.string("mode", default="polled", choices=("polled", "streaming")).casefold()
    url = t.string("url")
    encoding = t.string("encoding", default="ascii")

    def channel(c: Table) -> tuple[ChannelSpec, GaugeCorrection | None]:
        c.only(_LINE_CHANNEL_FIELDS)
        pattern = pattern_field(c)
        fields, corr = channel_fields(c, fill, unit_in_answer="unit" in pattern.groupindex)
        query = None
        if mode == "polled":
            if "query" not in c.data:
                raise c.fail("query", "missing; a polled port sends it to ask for this channel")
            query = ascii_field(c, "query")
        units_ = unit_map(c, fields["quantity"])
        return ChannelSpec(pattern=pattern, query=query, units=units_, encoding=encoding, **fields), corr

    return PortSpec(
        name=t.string("name", default=f"port{i}"),
        url=url,
        channels=channels_of(t, label, i, channel, names, gauges),
        mode=mode,
        baudrate=int(t.number("baudrate", 50, 4_000_000, default=9600)),
        bytesize=int(t.number("bytesize", 5, 8, default=8)),
        parity=t.string("parity", default="N", choices=("n", "e", "o", "m", "s")).upper(),
        stopbits=t.number("stopbits", 1, 2, default=1),
        terminator=ascii_field(t, "terminator") if t.has("terminator") else b"\r\n",
        source="simulated" if url.lower().startswith("simbench://") else "serial",
        **port_timing(t),
    )
