"""All of a bench's instrument sources, and the latest reading of every channel.

The latest store applies each channel's stale limit against a clock the caller passes in,
so a reading that stops arriving turns ``stale`` and anything built on it can be withdrawn.
"""

from __future__ import annotations

import threading
import time
from collections.abc import Callable, Iterable, Sequence
from typing import TYPE_CHECKING

from .reading import Reading, Status

if TYPE_CHECKING:  # pyserial loads only when instruments are started
    from .framing import PortSpec
    from .port import Emit, Event

__all__ = ["Instruments", "Latest", "manual_reading"]


class Latest:
    """The newest reading per channel, aged by each channel's stale limit. Thread-safe."""

    def __init__(self, stale_after: dict[str, float | None] | None = None):
        self.stale_after = dict(stale_after or {})
        self._latest: dict[str, Reading] = {}
        self._lock = threading.Lock()

    def update(self, r: Reading) -> None:
        with self._lock:
            prev = self._latest.get(r.channel)
            # A lost/garbled report does not erase when the last good value came, but the
            # channel's status is what the operator must see.
            self._latest[r.channel] = r if prev is None or r.t_mono >= prev.t_mono else prev

    def get(self, channel: str, now: float) -> Reading | None:
        with self._lock:
            r = self._latest.get(channel)
        return None if r is None else r.aged(now, self.stale_after.get(channel))

    def all(self, now: float) -> dict[str, Reading]:
        with self._lock:
            items = list(self._latest.items())
        return {k: r.aged(now, self.stale_after.get(k)) for k, r in items}


def manual_reading(channel: str, quantity: str, value: float, raw: str, now: float, wall: float) -> Reading:
    """A value the operator typed, as a Reading (never stale: the operator owns it)."""
    return Reading(channel, quantity, value, Status.OK, raw, now, wall, "manual")


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
        from .port import PortReader

        self.readers = [PortReader(p, emit, on_event, clock=clock, wall=wall) for p in ports]

    @property
    def channels(self) -> Iterable:
        for r in self.readers:
            yield from r.spec.channels

    def start(self) -> None:
        for r in self.readers:
            r.start()

    def stop(self) -> None:
        for r in self.readers:
            r.request_stop()
        for r in self.readers:
            r.stop()

    def stats(self) -> dict[str, object]:
        return {r.spec.name: r.stats for r in self.readers}
