"""Modbus values without the wire: decoding registers of each data type and word/byte order, and
grouping a port's channels into as few read requests as possible. Pure functions, no I/O.

Registers are 16-bit words as a device returns them. A 32- or 64-bit value spans 2 or 4 registers:
word order "big" puts the most significant register first (the usual Modbus convention), "little"
the least significant first; byte order "little" means each register's two bytes arrive swapped.
Devices differ, so a bench profile states both.
"""

from __future__ import annotations

import struct
from collections.abc import Sequence
from dataclasses import dataclass

from .specs import DATA_TYPES, ChannelSpec, Register

__all__ = ["MAX_BITS", "MAX_REGISTERS", "Block", "decode", "plan_reads"]

MAX_REGISTERS = 125
"""Registers one read request may carry (the Modbus application protocol's limit for functions 3 and 4)."""
MAX_BITS = 2000
"""Bits one read request may carry (functions 1 and 2)."""

_FORMATS = {"int16": "h", "uint16": "H", "int32": "i", "uint32": "I", "float32": "f", "int64": "q",
            "uint64": "Q", "float64": "d"}  # fmt: skip


def decode(words: Sequence[int], dtype: str, word_order: str = "big", byte_order: str = "big") -> float:
    """The value of ``dtype`` held in ``words`` (16-bit registers, or 0/1 for "bit").

    >>> decode([0x4148, 0x0000], "float32")            # 12.5 as IEEE 754, high word first
    12.5
    >>> decode([0x0000, 0x4148], "float32", word_order="little")
    12.5
    >>> decode([0xFFFE], "int16"), decode([0xFFFE], "uint16")
    (-2.0, 65534.0)
    >>> decode([0x3412], "uint16", byte_order="little")
    4660.0
    """
    if dtype == "bit":
        return float(bool(words[0]))
    n = DATA_TYPES[dtype]
    if len(words) != n or not all(0 <= w <= 0xFFFF for w in words):
        raise ValueError(f"{dtype} needs {n} registers of 0-65535, got {list(words)}")
    ordered = list(words) if word_order == "big" else list(reversed(words))
    raw = b"".join(w.to_bytes(2, "big" if byte_order == "big" else "little") for w in ordered)
    return float(struct.unpack(">" + _FORMATS[dtype], raw)[0])


@dataclass(frozen=True)
class Block:
    """One read request: a run of contiguous addresses in one table, and the registers it serves."""

    table: str
    start: int
    count: int
    members: tuple[Register, ...]

    def words(self, data: Sequence[int], reg: Register) -> list[int]:
        """The part of a response's ``data`` (registers or bits of this block) that ``reg`` takes."""
        i = reg.address - self.start
        return list(data[i : i + reg.count])


def plan_reads(channels: Sequence[ChannelSpec]) -> list[Block]:
    """The fewest read requests that cover every register (and status register) of ``channels``:
    registers of one table at contiguous or overlapping addresses share a request, up to the
    protocol's limit per request. Gaps are never read across (a device may refuse an address that
    is not on its map).

    >>> from strikeline.drivers.specs import ChannelSpec
    >>> chans = [ChannelSpec("a", "pressure", register=Register("input", 0, "float32")),
    ...          ChannelSpec("b", "voltage", register=Register("input", 2, "uint16")),
    ...          ChannelSpec("c", "current", register=Register("input", 10, "uint16"))]
    >>> [(b.table, b.start, b.count) for b in plan_reads(chans)]
    [('input', 0, 3), ('input', 10, 1)]
    """
    regs = {r for c in channels for r in (c.register, c.status_register) if r is not None}
    blocks: list[Block] = []
    for table in ("holding", "input", "coil", "discrete"):
        limit = MAX_BITS if table in ("coil", "discrete") else MAX_REGISTERS
        group: list[Register] = []
        start = end = 0
        for reg in sorted((r for r in regs if r.table == table), key=lambda r: (r.address, r.count)):
            r_end = reg.address + reg.count
            if group and reg.address <= end and max(end, r_end) - start <= limit:
                group.append(reg)
                end = max(end, r_end)
                continue
            if group:
                blocks.append(Block(table, start, end - start, tuple(group)))
            group, start, end = [reg], reg.address, r_end
        if group:
            blocks.append(Block(table, start, end - start, tuple(group)))
    return blocks
