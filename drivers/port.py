"""Read one instrument port over a pyserial URL, in a thread, through the framing classes.

Every port is a URL (``/dev/ttyUSB0``, ``socket://host:port``, ``rfc2217://host:port``,
``loop://``, and our ``simbench://`` simulated bench), opened with
``serial.serial_for_url``, so the same code runs against hardware, a terminal server or a
test double. The loop is thin: open, poll or listen, feed bytes to
:class:`~strikeline.drivers.framing.LineFramer`, parse lines with
:class:`~strikeline.drivers.framing.ChannelParser`, emit readings. A missing or pulled
port is reported as ``lost`` and reopened with backoff; every read has a finite timeout, so
the thread stops promptly.
"""

from __future__ import annotations

import threading
import time
from collections.abc import Callable

import serial

from .framing import ChannelParser, LineFramer, RejectedLine
from .reading import Reading, Status
from .specs import PortSpec
from .stats import PortStats

__all__ = ["PortReader", "PortSpec", "register_url_handlers"]

_HANDLERS = "strikeline.drivers.urlhandler"

try:  # a pty or USB adapter pulled mid-call can raise termios.error, which is not an OSError
    import termios

    _TERMIOS_ERROR: type[Exception] = termios.error
except ImportError:  # not POSIX
    _TERMIOS_ERROR = OSError

# Everything a dying or missing port raises; pyserial also raises TypeError/AttributeError from
# a port closed under a read. None of these may end the reader thread.
_PORT_ERRORS = (serial.SerialException, OSError, _TERMIOS_ERROR, ValueError, TypeError, AttributeError)


def register_url_handlers() -> None:
    """Let ``serial_for_url`` open our own URL schemes (``simbench://``)."""
    if _HANDLERS not in serial.protocol_handler_packages:
        serial.protocol_handler_packages.append(_HANDLERS)


Emit = Callable[[Reading], None]
Event = Callable[[str, str, str], None]  # (port, kind, message)


class PortReader:
    """A thread that reads one :class:`PortSpec` and emits readings.

    ``emit`` and ``on_event`` are called from the reader thread; the screen wraps them as
    messages. ``clock`` and ``wall`` give the monotonic and wall-clock times stamped on
    readings (replaceable in tests).
    """

    def __init__(
        self,
        spec: PortSpec,
        emit: Emit,
        on_event: Event | None = None,
        *,
        clock: Callable[[], float] = time.monotonic,
        wall: Callable[[], float] = time.time,
        backoff: tuple[float, float] = (0.05, 1.0),
    ):
        register_url_handlers()
        self.spec = spec
        self.emit = emit
        self.on_event = on_event or (lambda port, kind, msg: None)
        self.clock, self.wall = clock, wall
        self.backoff = backoff
        self.stats = PortStats()
        self.framer = LineFramer(spec.terminator, spec.max_line, self.stats)
        self.parsers = [ChannelParser(c, spec.source) for c in spec.channels]
        self._stop = threading.Event()
        self._thread: threading.Thread | None = None
        self._port: serial.SerialBase | None = None
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
        port = self._port
        if port is not None and hasattr(port, "cancel_read"):
            try:
                port.cancel_read()
            except Exception:  # noqa: BLE001 - best effort to wake a blocked read
                pass
        if self._thread is not None:
            self._thread.join(timeout)

    @property
    def alive(self) -> bool:
        return self._thread is not None and self._thread.is_alive()

    # -- the loop -----------------------------------------------------------------

    def _run(self) -> None:
        delay = self.backoff[0]
        while not self._stop.is_set():
            try:
                port = self._open()
            except _PORT_ERRORS as e:
                self._mark_lost(f"cannot open {self.spec.url}: {e}")
                self._stop.wait(delay)
                delay = min(delay * 2, self.backoff[1])
                continue
            delay = self.backoff[0]
            if self._lost:
                self.stats.reconnects += 1
            self._lost = False
            self.on_event(self.spec.name, "connected", self.spec.url)
            try:
                if self.spec.mode == "polled":
                    self._poll(port)
                else:
                    self._listen(port)
            except _PORT_ERRORS as e:
                if not self._stop.is_set():
                    self._mark_lost(f"{self.spec.url}: {e}")
            finally:
                self._close(port)
            if not self._stop.is_set():
                self._stop.wait(delay)

    def _open(self) -> serial.SerialBase:
        s = self.spec
        port = serial.serial_for_url(s.url, do_not_open=True)
        port.baudrate = s.baudrate
        port.bytesize = s.bytesize
        port.parity = s.parity
        port.stopbits = s.stopbits
        port.timeout = s.timeout
        port.write_timeout = s.timeout
        port.open()
        self._port = port
        self.framer.reset()
        return port

    def _close(self, port: serial.SerialBase) -> None:
        self._port = None
        try:
            port.close()
        except Exception:  # noqa: BLE001 - closing a dead port may fail any way it likes
            pass

    def _mark_lost(self, why: str) -> None:
        self.stats.faults += 1
        if not self._lost:
            self._lost = True
            now, wall = self.clock(), self.wall()
            for c in self.spec.channels:
                self.emit(Reading(c.name, c.quantity, None, Status.LOST, why, now, wall, self.spec.source))
            self.on_event(self.spec.name, "lost", why)

    def _poll(self, port: serial.SerialBase) -> None:
        s = self.spec
        while not self._stop.is_set():
            started = self.clock()
            for parser in self.parsers:
                if self._stop.is_set():
                    return
                self._poll_one(port, parser)
            rest = s.poll_interval - (self.clock() - started)
            if rest > 0:
                self._stop.wait(rest)

    def _poll_one(self, port: serial.SerialBase, parser: ChannelParser) -> None:
        c = parser.spec
        port.reset_input_buffer()
        self.framer.reset()
        port.write(c.query or b"")
        answer = port.read_until(self.spec.terminator, size=self.spec.max_line + len(self.spec.terminator))
        lines = self.framer.feed(answer)
        if not lines:
            # Nothing, or a partial line at timeout: never parsed as a value.
            self.framer.reset()
            self.stats.timeouts += 1
            self._misses[c.name] += 1
            if self._misses[c.name] == self.spec.lost_after:
                self.emit(
                    Reading(
                        c.name,
                        c.quantity,
                        None,
                        Status.LOST,
                        f"no answer to {self.spec.lost_after} polls",
                        self.clock(),
                        self.wall(),
                        self.spec.source,
                    )
                )
                self.on_event(self.spec.name, "no answer", c.name)
            return
        self._misses[c.name] = 0
        self._deliver(lines[-1], [parser], attribute_to=parser)

    def _listen(self, port: serial.SerialBase) -> None:
        while not self._stop.is_set():
            waiting = port.in_waiting
            data = port.read(max(1, min(waiting, 4096)))
            if data:
                for line in self.framer.feed(data):
                    self._deliver(line, self.parsers, attribute_to=None)

    def _deliver(self, line: bytes, parsers: list[ChannelParser], attribute_to: ChannelParser | None) -> None:
        now, wall = self.clock(), self.wall()
        for parser in parsers:
            try:
                reading = parser.parse(line, now, wall)
            except RejectedLine:
                continue
            self.stats.readings += 1
            self.emit(reading)
            return
        self.stats.garbled += 1
        if attribute_to is not None:
            c = attribute_to.spec
            text = line.decode("ascii", "replace")[:80]
            self.emit(Reading(c.name, c.quantity, None, Status.GARBLED, text, now, wall, self.spec.source))
