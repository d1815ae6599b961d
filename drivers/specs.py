"""What a bench profile says about an instrument port and its channels: plain, frozen data.

:mod:`strikeline.profiles` builds these from TOML and the port drivers read them. This module
imports no I/O library, so the profile loader can use it without loading pyserial.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field

from .reading import Status

__all__ = ["Analog", "ChannelSpec", "ModbusPortSpec", "PortSpec", "Register", "ScpiPortSpec"]

REGISTER_TABLES = ("holding", "input", "coil", "discrete")
"""Modbus tables: holding and input registers (16-bit words), coils and discrete inputs (bits)."""
DATA_TYPES = {
    "int16": 1,
    "uint16": 1,
    "int32": 2,
    "uint32": 2,
    "float32": 2,
    "int64": 4,
    "uint64": 4,
    "float64": 4,
    "bit": 1,
}
"""Register data types and how many 16-bit registers (or bits) each takes."""


@dataclass(frozen=True)
class Analog:
    """A gauge's log-linear voltage characteristic, p = 10^((U - c) / k) in ``unit``."""

    c: float
    k: float
    unit_factor: float
    """SI value of one ``unit`` (e.g. 100 for mbar)."""
    unit: str


@dataclass(frozen=True)
class Register:
    """Where a Modbus channel's value sits, and how its words are laid out."""

    table: str
    """"holding", "input", "coil" or "discrete"."""
    address: int
    """Zero-based protocol address (0-65535), as the device's register map gives it."""
    dtype: str = "uint16"
    """One of :data:`DATA_TYPES` ("bit" for coils and discrete inputs)."""
    word_order: str = "big"
    """Multi-register values: "big" (first register most significant) or "little"."""
    byte_order: str = "big"
    """Within each register: "big" (high byte first, the Modbus standard) or "little" (swapped)."""

    @property
    def count(self) -> int:
        """How many registers (or bits) the value takes."""
        return DATA_TYPES[self.dtype]

    @property
    def bits(self) -> bool:
        """Whether it lives in a bit table (coils, discrete inputs)."""
        return self.table in ("coil", "discrete")


@dataclass(frozen=True)
class ChannelSpec:
    """How one channel's answers look (built from a bench profile), whatever the port's protocol.

    Line and SCPI channels have a ``pattern`` (and a ``query`` when polled); Modbus channels a
    ``register`` (and an optional ``status_register``). The conversion that follows (status map,
    scale and offset, analog characteristic or unit, range limits) is the same for all.
    """

    name: str
    quantity: str
    pattern: re.Pattern[str] | None = None
    """Must have a group ``value``; may have ``unit`` and ``status`` (line and SCPI channels)."""
    query: bytes | None = None
    """What to send to poll this channel (None: the device streams)."""
    register: Register | None = None
    """Where a Modbus channel's value is."""
    status_register: Register | None = None
    """A Modbus register or bit whose value (as a decimal text) is looked up in ``status_map``."""
    labels: dict[int, str] = field(default_factory=dict)
    """Words for the values of a "state" channel (an interlock bit: 0 "open", 1 "closed")."""
    unit_factor: float | None = None
    """SI value of one unit where the answer carries none."""
    units: dict[str, float] = field(default_factory=dict)
    """Accepted unit texts (case-folded) and their SI factors, for a ``unit`` group."""
    status_map: dict[str, Status] = field(default_factory=dict)
    scale: float = 1.0
    offset: float = 0.0
    over_above: float | None = None
    """SI value at or above which the reading is over range."""
    under_below: float | None = None
    analog: Analog | None = None
    stale_after: float | None = None
    """Seconds after which a reading is stale."""
    encoding: str = "ascii"


@dataclass(frozen=True)
class PortSpec:
    """One port and the channels read through it (built from a bench profile)."""

    name: str
    url: str
    channels: tuple[ChannelSpec, ...]
    mode: str = "polled"
    """"polled" (send each channel's query, read the answer) or "streaming"."""
    baudrate: int = 9600
    bytesize: int = 8
    parity: str = "N"
    stopbits: float = 1
    terminator: bytes = b"\r\n"
    poll_interval: float = 0.5
    """s between polling rounds."""
    timeout: float = 0.5
    """s to wait for an answer."""
    lost_after: int = 3
    """Consecutive unanswered polls after which a channel is reported lost."""
    max_line: int = 256
    source: str = "serial"
    """How readings from this port are labelled ("serial" or "simulated")."""

    @property
    def where(self) -> str:
        """The connection in words, for messages."""
        return self.url


@dataclass(frozen=True)
class ModbusPortSpec:
    """A Modbus device read over TCP or serial RTU (read only: nothing is ever written to it)."""

    name: str
    transport: str
    """"tcp" or "rtu"."""
    unit_id: int
    """The device (unit) id on the bus or behind the gateway, 1-247 (TCP devices may use 0-255)."""
    channels: tuple[ChannelSpec, ...]
    host: str = ""
    tcp_port: int = 502
    device: str = ""
    """The serial port of an RTU bus: a device path or any pyserial URL (socket:// for a gateway)."""
    baudrate: int = 19200
    bytesize: int = 8
    parity: str = "E"
    stopbits: float = 1
    poll_interval: float = 0.5
    timeout: float = 0.5
    lost_after: int = 3
    source: str = "modbus"

    @property
    def where(self) -> str:
        """The connection in words, for messages."""
        link = f"tcp {self.host}:{self.tcp_port}" if self.transport == "tcp" else f"rtu {self.device}"
        return f"{link} unit {self.unit_id}"


@dataclass(frozen=True)
class ScpiPortSpec:
    """An instrument answering SCPI queries through a VISA resource (read only)."""

    name: str
    resource: str
    """The VISA resource string, e.g. "TCPIP::192.0.2.7::5025::SOCKET" or "ASRL/dev/ttyUSB0::INSTR"."""
    channels: tuple[ChannelSpec, ...]
    backend: str = "@py"
    """The VISA library: "@py" (pyvisa-py, pure Python), "@ivi" (an installed vendor VISA) or a
    simulation definition "file.yaml@sim"."""
    read_termination: str = "\n"
    write_termination: str = "\n"
    poll_interval: float = 0.5
    timeout: float = 0.5
    lost_after: int = 3
    identify: bool = True
    """Ask *IDN? on connect and log the answer."""
    source: str = "visa"

    @property
    def where(self) -> str:
        return self.resource
