"""pymodbus's own Modbus server as a test instrument: a device whose registers the test fills.

The server runs on 127.0.0.1 in a thread with its own event loop. A test sets register and bit
values, makes the device answer with an exception, fall silent (answer too late), or go away and
come back on the same port, and the driver under test reads it exactly as it reads a bench.
"""

from __future__ import annotations

import asyncio
import socket
import struct
import threading
from collections.abc import Sequence

from pymodbus import FramerType
from pymodbus.constants import ExcCodes
from pymodbus.server import ModbusSerialServer, ModbusTcpServer
from pymodbus.simulator import DataType, SimData, SimDevice

_TABLE = {1: "coil", 2: "discrete", 3: "holding", 4: "input"}
SIZE = 1000
"""Addresses 0..SIZE-1 exist in every table."""


def free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


class ModbusDevice:
    """A Modbus device served over TCP (framer SOCKET) or with RTU framing over TCP (as an RTU
    gateway or terminal server carries it)."""

    def __init__(self, unit: int = 1, *, rtu: bool = False, port: int | None = None, serial: str | None = None):
        """TCP on a free port (``rtu``: RTU framing over it), or with ``serial`` an RTU device on that
        serial port (a pty path)."""
        self.unit = unit
        self.framer = FramerType.RTU if rtu or serial else FramerType.SOCKET
        self.serial = serial
        self.port = port or free_port()
        self.exception: ExcCodes | None = None
        """Answer every read with this exception code."""
        self.silent = False
        """Answer nothing (in time): each request waits ``silence`` s first."""
        self.silence = 1.0
        self.reads = 0
        self._pending: dict[tuple[str, int], int] = {}
        self._lock = threading.Lock()
        self._loop = asyncio.new_event_loop()
        self._thread = threading.Thread(target=self._loop.run_forever, daemon=True)
        self._thread.start()
        self._server = None
        self.start()

    # -- what the test does -------------------------------------------------------

    def set(self, table: str, address: int, words: Sequence[int]) -> None:
        """Put ``words`` (16-bit registers, or 0/1 bits) at ``address`` of ``table``."""
        with self._lock:
            for i, w in enumerate(words):
                self._pending[(table, address + i)] = int(w)

    def start(self) -> None:
        blocks = (
            [SimData(0, values=[False] * SIZE * 16, datatype=DataType.BITS)],
            [SimData(0, values=[False] * SIZE * 16, datatype=DataType.BITS)],
            [SimData(0, values=[0] * SIZE, datatype=DataType.REGISTERS)],
            [SimData(0, values=[0] * SIZE, datatype=DataType.REGISTERS)],
        )
        device = SimDevice(self.unit, simdata=blocks, action=self._action, use_bit_addressing=True)

        async def serve():
            if self.serial is not None:
                self._server = ModbusSerialServer(device, framer=self.framer, port=self.serial, baudrate=19200)
            else:
                self._server = ModbusTcpServer(device, framer=self.framer, address=("127.0.0.1", self.port))
            await self._server.listen()

        asyncio.run_coroutine_threadsafe(serve(), self._loop).result(5)

    def stop(self) -> None:
        """The device goes away: the listener and every connection are closed."""
        if self._server is not None:
            asyncio.run_coroutine_threadsafe(self._server.shutdown(), self._loop).result(5)
            self._server = None

    def close(self) -> None:
        self.stop()

        async def finish():  # let the server's own tasks end before the loop does
            tasks = [t for t in asyncio.all_tasks() if t is not asyncio.current_task()]
            for t in tasks:
                t.cancel()
            await asyncio.gather(*tasks, return_exceptions=True)

        asyncio.run_coroutine_threadsafe(finish(), self._loop).result(5)
        self._loop.call_soon_threadsafe(self._loop.stop)
        self._thread.join(2)
        self._loop.close()

    # -- the device ---------------------------------------------------------------

    async def _action(self, function_code, start_address, address, count, registers, set_values):
        assert set_values is None, "strikeline wrote to the device"  # read only, always
        self.reads += 1
        table = _TABLE[function_code]
        with self._lock:
            for (t, a), w in list(self._pending.items()):
                if t != table:
                    continue
                if table in ("coil", "discrete"):  # bit a is bit a % 16 of register a // 16
                    i, mask = a // 16 - start_address, 1 << (a % 16)
                    if 0 <= i < len(registers):
                        registers[i] = (registers[i] | mask) if w else (registers[i] & ~mask)
                elif 0 <= a - start_address < len(registers):
                    registers[a - start_address] = w
        if self.silent:
            await asyncio.sleep(self.silence)
        return self.exception


def words(fmt: str, value, word_order="big", byte_order="big") -> list[int]:
    """Registers holding ``value`` packed as struct ``fmt``, laid out as a device with these orders
    sends them (the layout the Modbus convention and the profile fields describe)."""
    raw = struct.pack(">" + fmt, value)
    regs = [raw[i : i + 2] for i in range(0, len(raw), 2)]
    if word_order == "little":
        regs.reverse()
    return [int.from_bytes(r, "big" if byte_order == "big" else "little") for r in regs]
