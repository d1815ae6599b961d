"""All of a bench's instrument sources, and the latest reading of every channel.

The latest store applies each channel's stale limit against a clock the caller passes in,
so a reading that stops arriving turns ``stale`` and anything built on it can be withdrawn.
"""

from __future__ import annotations

import threading
import time
from collections.abc import Callable, Sequence
from typing import TYPE_CHECKING

from .reading import Reading
from .stats import PortStats, trouble_text

if TYPE_CHECKING:  # pyserial, pymodbus and pyvisa load only when instruments are started
    from .reader import Emit, Event
    from .specs import PortSpec

__all__ = ["Instruments", "Latest", "fault_summary", "reader_for"]


class Latest:
    """The newest reading per channel, aged by each channel's stale limit. Thread-safe."""

    def __init__(self, stale_after: dict[str, float | None] | None = None):
        self.stale_after = dict(stale_after or {})
        self._latest: dict[str, Reading] = {}
        self._lock = threading.Lock()

    def update(self, r: Reading) -> None:
        with self._lock:
            prev = self._latest.get(r.channel)
            # The newest report wins, good or bad: a lost or garbled channel must show as such.
            # One stamped earlier (threads can interleave) never replaces a newer one.
            self._latest[r.channel] = r if prev is None or r.t_mono >= prev.t_mono else prev

    def get(self, channel: str, now: float) -> Reading | None:
        with self._lock:
            r = self._latest.get(channel)
        return None if r is None else r.aged(now, self.stale_after.get(channel))

    def all(self, now: float) -> dict[str, Reading]:
        with self._lock:
            items = list(self._latest.items())
        return {k: r.aged(now, self.stale_after.get(k)) for k, r in items}

    def next_stale(self, now: float) -> float | None:
        """The earliest moment after ``now`` at which a usable reading goes stale (None: none will)."""
        with self._lock:
            items = list(self._latest.items())
        moments = [
            r.t_mono + limit
            for k, r in items
            if r.usable and (limit := self.stale_after.get(k)) is not None and r.t_mono + limit > now
        ]
        return min(moments, default=None)


class Instruments:
    """Start, stop and watch every port of a bench profile."""

    def __init__(
        self,
        ports: Sequence[PortSpec],
        emit: Emit,
        on_event: Event | None = None,
        *,
        clock: Callable[[], float] = time.monotonic,
        wall: Callable[[], float] = time.time,
    ):
        self.readers = [reader_for(p)(p, emit, on_event, clock=clock, wall=wall) for p in ports]

    def start(self) -> None:
        for r in self.readers:
            r.start()

    def stop(self) -> None:
        for r in self.readers:
            r.request_stop()
        for r in self.readers:
            r.stop()

    def stats(self) -> dict[str, PortStats]:
        """What each port delivered and what went wrong, by port name."""
        return {r.spec.name: r.stats for r in self.readers}


def reader_for(spec) -> type:
    """The reader class for a port spec (the port libraries load here, when instruments start)."""
    from .specs import ModbusPortSpec, ScpiPortSpec

    if isinstance(spec, ModbusPortSpec):
        from .modbus import ModbusReader

        return ModbusReader
    if isinstance(spec, ScpiPortSpec):
        from .visa import ScpiReader

        return ScpiReader
    from .port import PortReader

    return PortReader


def fault_summary(stats: dict[str, PortStats]) -> list[str]:
    """One short text per port that has had trouble, e.g. "controller: 3 garbled, 1 unanswered"."""
    return [text for port, st in stats.items() if (text := trouble_text(port, st)) is not None]
