"""What every port reader shares: its thread, reconnecting with backoff, losing and finding channels.

A reader opens its port, serves it (polls or listens) until the port fails, then closes it and
tries again after a backoff of 50 ms doubling to 1 s. A port that cannot be opened or dies marks
every channel ``lost`` once; a channel that stops answering is ``lost`` after ``lost_after``
unanswered polls. Every read has a finite timeout, so the thread stops promptly. Subclasses give
``_open``, ``_serve`` and ``_close`` (and ``PORT_ERRORS``, what their library raises when the port
fails); readings and events go out through ``emit`` and ``on_event`` from the reader thread.
"""

from __future__ import annotations

import threading
import time
from collections.abc import Callable
from typing import Any

from .reading import Reading, Status
from .specs import ChannelSpec
from .stats import PortStats

__all__ = ["Emit", "Event", "ReaderThread"]

Emit = Callable[[Reading], None]
Event = Callable[[str, str, str], None]  # (port, kind, message)


class ReaderThread:
    """A thread that reads one port spec and emits readings (see the module text)."""

    PORT_ERRORS: tuple[type[BaseException], ...] = (OSError,)
    """Exceptions that mean the port failed (the reader reconnects); anything else is a bug."""

    def __init__(
        self,
        spec: Any,
        emit: Emit,
        on_event: Event | None = None,
        *,
        clock: Callable[[], float] = time.monotonic,
        wall: Callable[[], float] = time.time,
        backoff: tuple[float, float] = (0.05, 1.0),
    ):
        self.spec = spec
        self.emit = emit
        self.on_event = on_event or (lambda port, kind, msg: None)
        self.clock, self.wall = clock, wall
        self.backoff = backoff
        self.stats = PortStats()
        self._stop = threading.Event()
        self._thread: threading.Thread | None = None
        self._lost = False
        self._misses = {c.name: 0 for c in spec.channels}

    # -- life cycle ---------------------------------------------------------------

    def start(self) -> None:
        self._thread = threading.Thread(target=self._run, name=f"port:{self.spec.name}", daemon=True)
        self._thread.start()

    def request_stop(self) -> None:
        """Ask the thread to stop without waiting for it."""
        self._stop.set()

    def stop(self, timeout: float = 2.0) -> None:
        """Stop the thread and wait for it (at most ``timeout`` s)."""
        self._stop.set()
        try:
            self._wake()
        except Exception:  # noqa: BLE001 - best effort to wake a blocked read
            pass
        if self._thread is not None:
            self._thread.join(timeout)

    @property
    def alive(self) -> bool:
        return self._thread is not None and self._thread.is_alive()

    @property
    def stopping(self) -> bool:
        return self._stop.is_set()

    # -- the loop -----------------------------------------------------------------

    def _run(self) -> None:
        delay = self.backoff[0]
        while not self._stop.is_set():
            try:
                handle = self._open()
            except self.PORT_ERRORS as e:
                self.mark_lost(f"cannot open {self.spec.where}: {_one_line(e)}")
                self._stop.wait(delay)
                delay = min(delay * 2, self.backoff[1])
                continue
            delay = self.backoff[0]
            if self._lost:
                self.stats.reconnects += 1
            self._lost = False
            self.on_event(self.spec.name, "connected", self.spec.where)
            try:
                self._connected(handle)
                self._serve(handle)
            except self.PORT_ERRORS as e:
                if not self._stop.is_set():
                    self.mark_lost(f"{self.spec.where}: {_one_line(e)}")
            except Exception:
                if not self._stop.is_set():  # a bug in this reader, not a port fault: it ends the thread, loudly
                    raise
                # stop() closed the port under a read: the library may raise anything; we are leaving
            finally:
                try:
                    self._close(handle)
                except Exception:  # noqa: BLE001 - closing a dead port may fail any way it likes
                    pass
            if not self._stop.is_set():
                self._stop.wait(delay)

    def pace(self, started: float) -> None:
        """Wait out the rest of a polling round that began at ``started``."""
        rest = self.spec.poll_interval - (self.clock() - started)
        if rest > 0:
            self._stop.wait(rest)

    # -- what subclasses give -----------------------------------------------------

    def _open(self) -> Any:
        raise NotImplementedError

    def _connected(self, handle: Any) -> None:
        """Called once the port is open (identify the instrument, say so)."""

    def _serve(self, handle: Any) -> None:
        raise NotImplementedError

    def _close(self, handle: Any) -> None:
        raise NotImplementedError

    def _wake(self) -> None:
        """Wake a read blocked in the port library (called by :meth:`stop`)."""

    # -- readings and faults ------------------------------------------------------

    def reading(self, c: ChannelSpec, value: float | None, status: Status, raw: str) -> Reading:
        return Reading(c.name, c.quantity, value, status, raw, self.clock(), self.wall(), self.spec.source)

    def deliver(self, r: Reading) -> None:
        """Hand on a reading the instrument answered with (the channel is heard from again)."""
        self._misses[r.channel] = 0
        self.stats.readings += 1
        self.emit(r)

    def garbled(self, c: ChannelSpec, raw: str) -> None:
        """The channel answered with something that is not a reading: counted, shown, never a value."""
        self._misses[c.name] = 0
        self.stats.garbled += 1
        self.emit(self.reading(c, None, Status.GARBLED, raw[:80]))

    def miss(self, c: ChannelSpec) -> None:
        """The channel did not answer a poll; after ``lost_after`` in a row it is lost (said once)."""
        self.stats.timeouts += 1
        self._misses[c.name] += 1
        if self._misses[c.name] == self.spec.lost_after:
            self.emit(self.reading(c, None, Status.LOST, f"no answer to {self.spec.lost_after} polls"))
            self.on_event(self.spec.name, "no answer", c.name)

    def mark_lost(self, why: str) -> None:
        """The whole port failed: every channel is lost (said once until it is back)."""
        self.stats.faults += 1
        if not self._lost:
            self._lost = True
            for c in self.spec.channels:
                self.emit(self.reading(c, None, Status.LOST, why))
            self.on_event(self.spec.name, "lost", why)


def _one_line(e: BaseException) -> str:
    return " ".join(str(e).split()) or e.__class__.__name__
