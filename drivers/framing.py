"""Line framing and parsing for ASCII instruments: pure classes fed bytes.

A :class:`LineFramer` cuts a byte stream into lines (split frames, several frames per
chunk, floods without a terminator); a :class:`ChannelParser` turns one line into a
:class:`~strikeline.drivers.reading.Reading` as a bench profile configures it (regular
expression with named groups, unit, status map, scale and offset, range limits, or an
analog log-linear gauge characteristic). Nothing here touches a port or a clock: the
caller passes times in.
"""

from __future__ import annotations

import math

from .reading import Reading, Status
from .specs import Analog, ChannelSpec, PortSpec
from .stats import PortStats

__all__ = [
    "Analog",
    "ChannelParser",
    "ChannelSpec",
    "LineFramer",
    "PortSpec",
    "RejectedLine",
    "channel_reading",
]


class LineFramer:
    """Split bytes into lines on ``terminator``; drop (and count) runs over ``max_line``.

    >>> f = LineFramer(b"\\r\\n")
    >>> f.feed(b"12.5\\r\\n3.")
    [b'12.5']
    >>> f.feed(b"0\\r\\n")
    [b'3.0']
    """

    def __init__(self, terminator: bytes, max_line: int = 256, stats: PortStats | None = None):
        if not terminator:
            raise ValueError("terminator must not be empty")
        self.terminator = terminator
        self.max_line = max_line
        self.stats = stats if stats is not None else PortStats()
        self._buf = bytearray()
        self._discarding = False

    def feed(self, data: bytes) -> list[bytes]:
        """Add ``data``; return every complete line it finishes, terminators removed."""
        self._buf += data
        out: list[bytes] = []
        term = self.terminator
        while True:
            i = self._buf.find(term)
            if i < 0:
                break
            line = bytes(self._buf[:i])
            del self._buf[: i + len(term)]
            if self._discarding:  # the tail of an overlong run: not a frame
                self._discarding = False
                continue
            if len(line) > self.max_line:
                self.stats.overflow += 1
                continue
            self.stats.lines += 1
            out.append(line)
        if len(self._buf) > self.max_line + len(term):
            # Keep a possible partial terminator; drop the rest as one overflow run.
            keep = len(term) - 1
            del self._buf[: len(self._buf) - keep]
            if not self._discarding:
                self.stats.overflow += 1
            self._discarding = True
        return out

    def reset(self) -> None:
        """Forget a partial line (after a timeout or a reconnect)."""
        self._buf.clear()
        self._discarding = False


class RejectedLine(Exception):
    """A line that is not a reading of this channel (the reason is the message)."""


class ChannelParser:
    """Turn a line into a Reading for one channel, or raise :class:`RejectedLine`."""

    def __init__(self, spec: ChannelSpec, source: str = "serial"):
        self.spec = spec
        self.source = source

    def parse(self, line: bytes, t_mono: float, t_wall: float) -> Reading:
        s = self.spec
        try:
            text = line.decode(s.encoding).strip()
        except (UnicodeDecodeError, LookupError):
            raise RejectedLine(f"not {s.encoding} text") from None
        m = s.pattern.search(text)
        if m is None:
            raise RejectedLine("does not match the channel's pattern")
        groups = m.groupdict()
        try:
            number = float(groups["value"])
        except (TypeError, ValueError):
            number = None
        return channel_reading(s, number, groups.get("status"), groups.get("unit"), text, t_mono, t_wall, self.source)


def channel_reading(
    s: ChannelSpec,
    number: float | None,
    status: str | None,
    unit: str | None,
    raw: str,
    t_mono: float,
    t_wall: float,
    source: str,
) -> Reading:
    """The Reading a channel's answer makes, whatever the protocol it came by: the status text
    looked up in the channel's status map (a status other than ok needs no number), then scale
    and offset, the analog characteristic or the unit, and the range limits. ``number`` None means
    the answer held no number. Raises :class:`RejectedLine` for what is not a reading."""

    def reading(value: float | None, st: Status) -> Reading:
        return Reading(s.name, s.quantity, value, st, raw, t_mono, t_wall, source)

    if status is not None and s.status_map:
        st = s.status_map.get(status.strip().casefold())
        if st is None:
            raise RejectedLine(f"unknown status {status!r}")
        if st is not Status.OK:
            return reading(None, st)
    if number is None:
        raise RejectedLine("value is not a number")
    if not math.isfinite(number):
        raise RejectedLine("value is not finite")
    number = number * s.scale + s.offset
    if s.quantity == "state":
        return reading(number, Status.OK)  # a state is its own word (the channel's labels)
    if s.analog is not None:
        exponent = (number - s.analog.c) / s.analog.k
        if not -30 < exponent < 30:
            raise RejectedLine("analog voltage outside the characteristic")
        value = 10.0**exponent * s.analog.unit_factor
    else:
        factor = s.unit_factor
        if unit is not None:
            factor = s.units.get(unit.strip().casefold())
            if factor is None:
                raise RejectedLine(f"unknown unit {unit!r}")
        if factor is None:
            raise RejectedLine("no unit")
        value = number * factor
    if s.over_above is not None and value >= s.over_above:
        return reading(None, Status.OVER_RANGE)
    if s.under_below is not None and value <= s.under_below:
        return reading(None, Status.UNDER_RANGE)
    if s.quantity == "pressure" and value <= 0:
        raise RejectedLine("pressure is not above zero")
    return reading(value, Status.OK)
