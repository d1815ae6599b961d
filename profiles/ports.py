"""Instrument port sections of a bench profile ([[port]] and [[port.channel]]) into port specs.

A line-protocol port is any pyserial URL; each channel says how its answers look. The result
is :mod:`strikeline.drivers.specs` data and the gas correction of each pressure channel.
"""

from __future__ import annotations

import re
from typing import Any

from ..drivers.reading import QUANTITIES, Status
from ..drivers.specs import Analog, ChannelSpec, PortSpec
from ..model import units
from ..model.bench import Gas
from ..model.gauges import GAUGE_KINDS, GaugeCorrection
from ..model.limits import Limit
from .fields import ProfileError, Table
from .gauges import gauge_correction

__all__ = ["port_sections"]

_PORT_FIELDS = (
    "name",
    "url",
    "mode",
    "baudrate",
    "bytesize",
    "parity",
    "stopbits",
    "terminator",
    "poll_interval",
    "timeout",
    "lost_after",
    "encoding",
    "channel",
)
_CHANNEL_FIELDS = (
    "name",
    "quantity",
    "query",
    "pattern",
    "unit",
    "units",
    "status",
    "scale",
    "offset",
    "over_range_above",
    "under_range_below",
    "analog",
    "stale_after",
    "gauge",
    "gauge_factor",
)
_POLL = Limit("time", 1e-3, 3600.0, "a millisecond to an hour")
_TIMEOUT = Limit("time", 1e-3, 60.0, "a millisecond to a minute")
_STALE = Limit("time", 1e-3, 3600.0, "a millisecond to an hour")
_OWN = "the instrument's own range"
_QUANTITY_KIND = {"pressure": "pressure", "voltage": "voltage", "current": "current"}


def _ascii(t: Table, key: str) -> bytes:
    """A field taken byte for byte (no stripping: a query keeps its line ending)."""
    raw = t.data[key]
    if not isinstance(raw, str) or not raw or not raw.isascii():
        raise t.fail(key, f'{raw!r} is not a non-empty ASCII text such as "MEAS P1\\r\\n"')
    return raw.encode("ascii")


def port_sections(raw: dict[str, Any], label: str, gas: Gas) -> tuple[tuple[PortSpec, ...], dict[str, GaugeCorrection]]:
    """The [[port]] sections of a parsed bench file: port specs, and gas corrections by channel."""
    items = raw.get("port", [])
    if not isinstance(items, list):
        raise ProfileError(f"{label}: [[port]] must be a list of tables ([[port]] blocks)")
    ports: list[PortSpec] = []
    gauges: dict[str, GaugeCorrection] = {}
    names: set[str] = set()
    for i, item in enumerate(items, 1):
        t = Table(label, f"port #{i}", item)
        t.only(_PORT_FIELDS)
        mode = t.string("mode", default="polled", choices=("polled", "streaming")).casefold()
        url = t.string("url")
        parity = t.string("parity", default="N", choices=("n", "e", "o", "m", "s")).upper()
        term = _ascii(t, "terminator") if t.has("terminator") else b"\r\n"
        channels: list[ChannelSpec] = []
        chan_items = t.data.get("channel", [])
        if not isinstance(chan_items, list) or not chan_items:
            raise t.fail("channel", "give at least one [[port.channel]] block")
        for j, citem in enumerate(chan_items, 1):
            c = Table(label, f"port #{i} channel #{j}", citem)
            spec, corr = _channel(c, mode, gas, t.string("encoding", default="ascii"))
            if spec.name in names:
                raise c.fail("name", f"{spec.name!r} is used by another channel")
            names.add(spec.name)
            channels.append(spec)
            if corr is not None:
                gauges[spec.name] = corr
        ports.append(
            PortSpec(
                name=t.string("name", default=f"port{i}"),
                url=url,
                channels=tuple(channels),
                mode=mode,
                baudrate=int(t.number("baudrate", 50, 4_000_000, default=9600)),
                bytesize=int(t.number("bytesize", 5, 8, default=8)),
                parity=parity,
                stopbits=t.number("stopbits", 1, 2, default=1),
                terminator=term,
                poll_interval=t.quantity("poll_interval", _POLL, required=False) or 0.5,
                timeout=t.quantity("timeout", _TIMEOUT, required=False) or 0.5,
                lost_after=int(t.number("lost_after", 1, 1000, default=3)),
                source="simulated" if url.lower().startswith("simbench://") else "serial",
            )
        )
    return tuple(ports), gauges


def _channel(c: Table, mode: str, gas: Gas, encoding: str) -> tuple[ChannelSpec, GaugeCorrection | None]:
    c.only(_CHANNEL_FIELDS)
    name = c.string("name")
    quantity = c.string("quantity", choices=QUANTITIES).casefold()
    kind = _QUANTITY_KIND[quantity]
    try:
        pattern = re.compile(c.string("pattern"))
    except re.error as e:
        raise c.fail("pattern", f"not a valid regular expression ({e})") from None
    if "value" not in pattern.groupindex:
        raise c.fail("pattern", "needs a named group (?P<value>...) for the number")
    query = None
    if mode == "polled":
        if "query" not in c.data:
            raise c.fail("query", "missing; a polled port sends it to ask for this channel")
        query = _ascii(c, "query")
    analog = None
    unit_factor = None
    if (a := c.sub("analog")) is not None:
        a.only(("c", "k", "unit"))
        unit = a.string("unit")
        try:
            f = units.parse(f"1 {unit}", kind)
        except units.QuantityError:
            raise a.fail("unit", f"{unit!r} is not a {kind} unit ({', '.join(units.units_of(kind))})") from None
        k = a.number("k", -1e6, 1e6)
        if k == 0:
            raise a.fail("k", "must not be zero")
        analog = Analog(a.number("c", -1e6, 1e6), k, f, unit)
    elif "unit" in c.data:
        unit = c.string("unit")
        try:
            unit_factor = units.parse(f"1 {unit}", kind)
        except units.QuantityError:
            raise c.fail("unit", f"{unit!r} is not a {kind} unit ({', '.join(units.units_of(kind))})") from None
    elif "unit" not in pattern.groupindex:
        raise c.fail("unit", "missing; give the unit of the answers or a (?P<unit>...) group in the pattern")
    accepted = c.data.get("units", list(units.units_of(kind)))
    if not isinstance(accepted, list) or not all(isinstance(u, str) for u in accepted):
        raise c.fail("units", f"{accepted!r} is not a list of unit names")
    unit_map: dict[str, float] = {}
    for u in accepted:
        try:
            unit_map[u.casefold()] = units.parse(f"1 {u}", kind)
        except units.QuantityError:
            raise c.fail("units", f"{u!r} is not a {kind} unit") from None
    status_map: dict[str, Status] = {}
    if (st := c.sub("status")) is not None:
        for text, ours in st.data.items():
            if not isinstance(ours, str) or ours not in [s.value for s in Status]:
                raise st.fail(text, f"{ours!r} is not one of {', '.join(s.value for s in Status)}")
            status_map[text.casefold()] = Status(ours)
    corr = None
    if "gauge" in c.data:
        if quantity != "pressure":
            raise c.fail("gauge", "only a pressure channel has a gauge kind")
        corr = gauge_correction(
            c.string("gauge", choices=GAUGE_KINDS).casefold(), gas, c.number("gauge_factor", 1e-3, 1e3, required=False)
        )
    elif "gauge_factor" in c.data:
        raise c.fail("gauge_factor", "needs gauge = capacitance, thermal or ionisation beside it")
    spec = ChannelSpec(
        name=name,
        quantity=quantity,
        pattern=pattern,
        query=query,
        unit_factor=unit_factor,
        units=unit_map,
        status_map=status_map,
        scale=c.number("scale", -1e12, 1e12, default=1.0),
        offset=c.number("offset", -1e12, 1e12, default=0.0),
        over_above=c.quantity("over_range_above", Limit(kind, 1e-12, 1e12, "the channel's own range"), required=False),
        under_below=c.quantity(
            "under_range_below", Limit(kind, 1e-15, 1e12, "the channel's own range"), required=False
        ),
        analog=analog,
        stale_after=c.quantity("stale_after", _STALE, required=False) or 2.0,
        encoding=encoding,
    )
    return spec, corr
