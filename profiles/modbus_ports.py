"""Modbus port sections (``protocol = "modbus"``): the connection, the unit id, and each channel's register.

A port is TCP (``transport = "tcp"``, ``host``, ``tcp_port``) or serial RTU (``transport = "rtu"``,
``device`` and its line settings); ``unit_id`` is the device's id on the bus. Each channel names its
table (holding, input, coil, discrete), zero-based address, data type with word and byte order,
and optionally a status register or bit whose value is looked up in ``status``. strikeline only
ever reads: no field here can make it write a register or a coil.
"""

from __future__ import annotations

from ..drivers.specs import DATA_TYPES, REGISTER_TABLES, ChannelSpec, ModbusPortSpec, Register
from ..model.composition import Composition
from ..model.gauges import GaugeCorrection
from .channels import CHANNEL_FIELDS, PORT_FIELDS, channel_fields, channels_of, port_timing
from .fields import Table

__all__ = ["modbus_port"]

_PORT_FIELDS = PORT_FIELDS + (
    "transport",
    "host",
    "tcp_port",
    "device",
    "baudrate",
    "bytesize",
    "parity",
    "stopbits",
    "unit_id",
)
_CHANNEL_FIELDS = CHANNEL_FIELDS + (
    "table",
    "address",
    "type",
    "registers",
    "word_order",
    "byte_order",
    "status_table",
    "status_address",
    "status_type",
)
_WORD_TYPES = tuple(t for t in DATA_TYPES if t != "bit")


def modbus_port(
    t: Table, label: str, i: int, fill: Composition, names: set[str], gauges: dict[str, GaugeCorrection]
) -> ModbusPortSpec:
    """A ``protocol = "modbus"`` port section."""
    t.only(_PORT_FIELDS)
    transport = t.string("transport", choices=("tcp", "rtu")).casefold()
    if not t.has("unit_id"):
        raise t.fail("unit_id", "missing; give the device's id on the bus (1 to 247; TCP devices often 1 or 255)")
    unit_id = int(t.number("unit_id", 0, 255))
    if t.data["unit_id"] != unit_id:
        raise t.fail("unit_id", f"{t.data['unit_id']!r} is not a whole number from 0 to 255")
    where: dict = {}
    if transport == "tcp":
        for key in ("device", "baudrate", "bytesize", "parity", "stopbits"):
            if t.has(key):
                raise t.fail(key, 'belongs to a serial RTU port (transport = "rtu"), not TCP')
        where = {"host": t.string("host"), "tcp_port": int(t.number("tcp_port", 1, 65535, default=502))}
    else:
        for key in ("host", "tcp_port"):
            if t.has(key):
                raise t.fail(key, 'belongs to a TCP port (transport = "tcp"), not serial RTU')
        where = {
            "device": t.string("device"),
            "baudrate": int(t.number("baudrate", 50, 4_000_000, default=19200)),
            "bytesize": int(t.number("bytesize", 7, 8, default=8)),
            "parity": t.string("parity", default="E", choices=("n", "e", "o")).upper(),
            "stopbits": t.number("stopbits", 1, 2, default=1),
        }

    def channel(c: Table) -> tuple[ChannelSpec, GaugeCorrection | None]:
        c.only(_CHANNEL_FIELDS)
        fields, corr = channel_fields(c, fill)
        reg = _register(c, "table", "address", "type")
        if reg.bits and fields["quantity"] != "state":
            raise c.fail("table", f'a {reg.table} holds one bit: give quantity = "state" (with labels) to read it')
        status = None
        if c.has("status_address") or c.has("status_table"):
            status = _register(c, "status_table", "status_address", "status_type", default_table=reg.table)
            if not fields["status_map"]:
                raise c.fail("status", 'give the status words for the status register, e.g. { "0" = "ok" }')
        return ChannelSpec(register=reg, status_register=status, **fields), corr

    return ModbusPortSpec(
        name=t.string("name", default=f"port{i}"),
        transport=transport,
        unit_id=unit_id,
        channels=channels_of(t, label, i, channel, names, gauges),
        **where,
        **port_timing(t),
    )


def _register(c: Table, table_key: str, address_key: str, type_key: str, default_table: str | None = None) -> Register:
    table = c.string(table_key, default=default_table, choices=REGISTER_TABLES).casefold()
    bits = table in ("coil", "discrete")
    dtype = c.string(type_key, default="bit" if bits else "uint16", choices=tuple(DATA_TYPES)).casefold()
    if bits and dtype != "bit":
        raise c.fail(type_key, f'{dtype!r}: a {table} holds one bit; its type is "bit"')
    if not bits and dtype == "bit":
        raise c.fail(type_key, f'"bit" is for coils and discrete inputs; a {table} register is one of '
                     f"{', '.join(_WORD_TYPES)}")  # fmt: skip
    if address_key not in c.data:
        raise c.fail(address_key, "missing; give the zero-based address from the device's register map, 0 to 65535")
    address = c.data[address_key]
    count = DATA_TYPES[dtype]
    if isinstance(address, bool) or not isinstance(address, int) or not 0 <= address <= 65536 - count:
        raise c.fail(address_key, f"{address!r} is not a whole number from 0 to {65536 - count} (a {dtype} "
                     f"takes {count} register{'s' if count > 1 else ''})")  # fmt: skip
    if type_key == "type" and c.has("registers"):
        given = c.data["registers"]
        if given != count:
            raise c.fail("registers", f"{given!r}: a {dtype} takes {count} register{'s' if count > 1 else ''}; "
                         "check the type against the device's register map")  # fmt: skip
    orders = ("big", "little")
    word_order = c.string("word_order", default="big", choices=orders).casefold() if type_key == "type" else "big"
    byte_order = c.string("byte_order", default="big", choices=orders).casefold() if type_key == "type" else "big"
    return Register(table, address, dtype, word_order, byte_order)
