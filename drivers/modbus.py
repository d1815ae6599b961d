"""Read a Modbus device (TCP, or RTU on a serial line) with pymodbus, in a thread. Read only.

Each polling round sends the fewest read requests that cover the port's registers
(:func:`~strikeline.drivers.modbus_codec.plan_reads`) and turns each channel's words into a
Reading through the same conversion line channels use. The faults a bench meets each become a
channel state and a count: a request that times out (``unanswered``, then ``lost``), an exception
response (``exceptions``; the channels read ``sensor error`` with the exception named), a dropped
TCP connection or a vanished serial adapter (``faults``; ``lost``, reconnected with backoff).

strikeline never writes a register or a coil: only the read functions (1-4) are ever sent.
"""

from __future__ import annotations

import logging
from typing import Any

from .framing import RejectedLine, channel_reading
from .modbus_codec import Block, decode, plan_reads
from .reader import Emit, Event, ReaderThread
from .reading import Status
from .specs import ChannelSpec, ModbusPortSpec

__all__ = ["EXCEPTION_NAMES", "ModbusReader"]

EXCEPTION_NAMES = {
    1: "illegal function",
    2: "illegal data address",
    3: "illegal data value",
    4: "device failure",
    5: "acknowledge",
    6: "device busy",
    10: "gateway path unavailable",
    11: "gateway target did not respond",
}
"""Modbus exception codes and their names (Modbus application protocol specification)."""

_READ = {
    "holding": "read_holding_registers",
    "input": "read_input_registers",
    "coil": "read_coils",
    "discrete": "read_discrete_inputs",
}


class ModbusReader(ReaderThread):
    """A thread that polls one :class:`ModbusPortSpec` and emits readings."""

    def __init__(self, spec: ModbusPortSpec, emit: Emit, on_event: Event | None = None, **kw):
        from pymodbus.exceptions import ConnectionException, ModbusException, ModbusIOException  # loads with it

        _quiet_library_log()
        # What a failing link raises; a client closed under a read by stop() may raise anything from
        # inside pymodbus or pyserial: the reader ignores that while stopping.
        self.PORT_ERRORS = (ConnectionException, ModbusException, OSError)
        self._io_error = ModbusIOException
        super().__init__(spec, emit, on_event, **kw)
        self.blocks = plan_reads(spec.channels)
        self._client: Any = None

    def _open(self) -> Any:
        from pymodbus.client import ModbusSerialClient, ModbusTcpClient
        from pymodbus.exceptions import ConnectionException

        s = self.spec
        if s.transport == "tcp":
            client = ModbusTcpClient(s.host, port=s.tcp_port, timeout=s.timeout, retries=0)
        else:
            client = ModbusSerialClient(
                s.device,
                baudrate=s.baudrate,
                bytesize=s.bytesize,
                parity=s.parity,
                stopbits=int(s.stopbits),
                timeout=s.timeout,
                retries=0,
            )
        if not client.connect():
            client.close()
            raise ConnectionException("no connection")
        self._client = client
        return client

    def _close(self, client: Any) -> None:
        self._client = None
        client.close()

    def _wake(self) -> None:
        client = self._client
        if client is not None:
            client.close()

    def _serve(self, client: Any) -> None:
        while not self.stopping:
            started = self.clock()
            self._values = {}  # this round's words only: a status never pairs with an old value
            for block in self.blocks:
                if self.stopping:
                    return
                self._read(client, block)
            self.pace(started)

    def _read(self, client: Any, block: Block) -> None:
        s = self.spec
        channels = [c for c in s.channels if c.register in block.members or c.status_register in block.members]
        try:
            response = getattr(client, _READ[block.table])(block.start, count=block.count, device_id=s.unit_id)
        except ValueError as e:  # pyserial's socket closed under the read: select() on descriptor -1
            raise ConnectionError(f"connection closed under a read ({e})") from e
        except self._io_error:  # no (complete) answer in time
            for c in channels:
                self.miss(c)
            return
        if not client.connected:  # the read found the connection gone
            raise ConnectionError("connection closed")
        if response.isError():
            self._exception(block, channels, getattr(response, "exception_code", 0))
            return
        data = list(response.bits if block.table in ("coil", "discrete") else response.registers)
        if len(data) < block.count:  # a short or stray answer (a late reply to an earlier request):
            self.stats.garbled += 1  # counted, and this request is still unanswered
            for c in channels:
                self.miss(c)
            return
        self._values[block] = data
        for c in channels:
            if self._ready(c):
                self._deliver(c)

    def _exception(self, block: Block, channels: list[ChannelSpec], code: int) -> None:
        self.stats.exceptions += 1
        name = EXCEPTION_NAMES.get(code, "unknown exception")
        raw = f"modbus exception {code} ({name}) reading {block.table} {block.start}-{block.start + block.count - 1}"
        for c in channels:
            self.deliver(self.reading(c, None, Status.SENSOR_ERROR, raw))
        self.on_event(self.spec.name, "exception", raw)

    # Values of this round by block; a channel whose value and status sit in different blocks is
    # delivered once both are in.
    _values: dict[Block, list[int]]

    def _connected(self, handle: Any) -> None:
        self._values = {}

    def _ready(self, c: ChannelSpec) -> bool:
        return all(self._block_of(r) in self._values for r in (c.register, c.status_register) if r is not None)

    def _block_of(self, reg) -> Block:
        return next(b for b in self.blocks if reg in b.members and b.table == reg.table)

    def _words(self, reg) -> list[int]:
        b = self._block_of(reg)
        return b.words(self._values[b], reg)

    def _deliver(self, c: ChannelSpec) -> None:
        reg = c.register
        words = self._words(reg)
        status = None
        if c.status_register is not None:
            sr = c.status_register
            status = f"{decode(self._words(sr), sr.dtype, sr.word_order, sr.byte_order):g}"
        number = decode(words, reg.dtype, reg.word_order, reg.byte_order)
        raw = f"{reg.table} {reg.address}: " + " ".join(f"{w:04X}" if not reg.bits else str(int(w)) for w in words)
        if status is not None:
            raw += f" status {status}"
        try:
            r = channel_reading(c, number, status, None, raw, self.clock(), self.wall(), self.spec.source)
        except RejectedLine as e:
            self.garbled(c, f"{raw} ({e})")
            return
        self.deliver(r)


def _quiet_library_log() -> None:
    """pymodbus logs timeouts and dropped connections (with packet dumps) to stderr, which would
    tear the live screen; strikeline counts and shows those faults itself."""
    log = logging.getLogger("pymodbus")
    if not log.handlers:
        log.addHandler(logging.NullHandler())
    log.propagate = False
    log.setLevel(logging.CRITICAL)
