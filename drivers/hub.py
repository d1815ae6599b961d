"""All of a bench's instrument sources, and the latest reading of every channel.

One reading path: every port's reader thread puts its readings and port events on one queue (a put
cannot fail, so nothing the consumer does runs inside a driver's handling of its port). The
consumer takes them off on one thread of the app's choosing: :meth:`Instruments.take` on its own
thread (the command line's loops), or the one consumer thread :meth:`Instruments.start` runs when
handlers are given (the screen). A consumer that raises is a bug, not an instrument fault: its
traceback goes to the ``strikeline`` log, ``on_error`` gets one line, and the ports stay up.

The latest store applies each channel's stale limit against a clock the caller passes in,
so a reading that stops arriving turns ``stale`` and anything built on it can be withdrawn.
"""

from __future__ import annotations

import logging
import queue
import threading
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING

from .reading import Reading
from .stats import PortStats, trouble_text

if TYPE_CHECKING:  # pyserial, pymodbus and pyvisa load only when instruments are started
    from .reader import Emit, Event
    from .specs import PortSpec

__all__ = ["Instruments", "Latest", "PortEvent", "fault_summary", "reader_for"]

log = logging.getLogger("strikeline")


@dataclass(frozen=True)
class PortEvent:
    """A connection or fault on a port, as the readers report it."""

    port: str
    kind: str
    message: str


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
    """Start, stop and watch every port of a bench profile (the module text says how readings flow)."""

    def __init__(
        self,
        ports: Sequence[PortSpec],
        on_reading: Emit | None = None,
        on_event: Event | None = None,
        *,
        on_error: Callable[[str], None] | None = None,
        clock: Callable[[], float] = time.monotonic,
        wall: Callable[[], float] = time.time,
    ):
        self.queue: queue.SimpleQueue[Reading | PortEvent] = queue.SimpleQueue()
        put = self.queue.put
        self.readers = [
            reader_for(p)(p, put, lambda port, kind, msg: put(PortEvent(port, kind, msg)), clock=clock, wall=wall)
            for p in ports
        ]
        self.on_reading, self.on_event, self.on_error = on_reading, on_event, on_error
        self.consumer_errors = 0
        """How often the consumer raised (each one logged with its traceback)."""
        self._stop = threading.Event()
        self._consumer: threading.Thread | None = None

    def start(self) -> None:
        """Start every reader, and the consumer thread when handlers were given."""
        for r in self.readers:
            r.start()
        if self.on_reading is not None:
            self._consumer = threading.Thread(target=self._consume, name="readings", daemon=True)
            self._consumer.start()

    def take(self, timeout: float) -> Reading | PortEvent | None:
        """The next reading or port event, waiting at most ``timeout`` s (None: nothing came)."""
        try:
            return self.queue.get(timeout=timeout)
        except queue.Empty:
            return None

    def _consume(self) -> None:
        while not self._stop.is_set():
            item = self.take(0.1)
            if item is not None:
                self.handle(item)

    def handle(self, item: Reading | PortEvent) -> None:
        """Give one item to the handlers; a handler that raises is reported, never a port fault."""
        try:
            if isinstance(item, PortEvent):
                if self.on_event is not None:
                    self.on_event(item.port, item.kind, item.message)
            elif self.on_reading is not None:
                self.on_reading(item)
        except Exception as e:  # noqa: BLE001 - a consumer bug: reported, and the readings go on
            self.consumer_errors += 1
            log.exception("handling %r failed", item)
            if self.on_error is not None:
                self.on_error(f"internal error handling a reading: {type(e).__name__}: {e} (details in the log)")

    def stop(self) -> None:
        for r in self.readers:
            r.request_stop()
        for r in self.readers:
            r.stop()
        self._stop.set()
        if self._consumer is not None:
            self._consumer.join(2.0)

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
