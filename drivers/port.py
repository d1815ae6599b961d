"""Read one instrument port over a pyserial URL, in a thread, through the framing classes.

Every port is a URL (``/dev/ttyUSB0``, ``socket://host:port``, ``rfc2217://host:port``,
``loop://``, and our ``simbench://`` simulated bench), opened with
``serial.serial_for_url``, so the same code runs against hardware, a terminal server or a
test double. The loop is thin: open, poll or listen, feed bytes to
:class:`~strikeline.drivers.framing.LineFramer`, parse lines with
:class:`~strikeline.drivers.framing.ChannelParser`, emit readings. A missing or pulled
port is reported as ``lost`` and reopened with backoff; every read has a finite timeout, so
the thread stops promptly (the life cycle is :class:`~strikeline.drivers.reader.ReaderThread`'s).
"""

from __future__ import annotations

import serial

from .framing import ChannelParser, LineFramer, RejectedLine
from .reader import Emit, Event, ReaderThread
from .specs import PortSpec

__all__ = ["Emit", "Event", "PortReader", "PortSpec", "register_url_handlers"]

_HANDLERS = "strikeline.drivers.urlhandler"

try:  # a pty or USB adapter pulled mid-call can raise termios.error, which is not an OSError
    import termios

    _TERMIOS_ERROR: type[Exception] = termios.error
except ImportError:  # not POSIX
    _TERMIOS_ERROR = OSError

# What a dying or missing port raises (pyserial's own, the OS's, termios'). A port closed under a
# read by stop() may raise anything from inside pyserial: the reader ignores that while stopping.
_PORT_ERRORS = (serial.SerialException, OSError, _TERMIOS_ERROR)


def register_url_handlers() -> None:
    """Let ``serial_for_url`` open our own URL schemes (``simbench://``)."""
    if _HANDLERS not in serial.protocol_handler_packages:
        serial.protocol_handler_packages.append(_HANDLERS)


class PortReader(ReaderThread):
    """A thread that reads one line-protocol :class:`PortSpec` and emits readings.

    ``emit`` and ``on_event`` are called from the reader thread; the screen wraps them as
    messages. ``clock`` and ``wall`` give the monotonic and wall-clock times stamped on
    readings (replaceable in tests).
    """

    PORT_ERRORS = _PORT_ERRORS

    def __init__(self, spec: PortSpec, emit: Emit, on_event: Event | None = None, **kw):
        register_url_handlers()
        super().__init__(spec, emit, on_event, **kw)
        self.framer = LineFramer(spec.terminator, spec.max_line, self.stats)
        self.parsers = [ChannelParser(c, spec.source) for c in spec.channels]
        self._port: serial.SerialBase | None = None

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
        port.close()

    def _wake(self) -> None:
        port = self._port
        if port is not None and hasattr(port, "cancel_read"):
            port.cancel_read()

    def _serve(self, port: serial.SerialBase) -> None:
        if self.spec.mode == "polled":
            while not self.stopping:
                started = self.clock()
                for parser in self.parsers:
                    if self.stopping:
                        return
                    self._poll_one(port, parser)
                self.pace(started)
        else:
            while not self.stopping:
                data = port.read(max(1, min(port.in_waiting, 4096)))
                if data:
                    for line in self.framer.feed(data):
                        self._deliver(line, self.parsers, attribute_to=None)

    def _poll_one(self, port: serial.SerialBase, parser: ChannelParser) -> None:
        port.reset_input_buffer()
        self.framer.reset()
        port.write(parser.spec.query or b"")
        lines = self.framer.feed(self._answer(port))
        if not lines:
            # Nothing, or a partial line at timeout: never parsed as a value.
            self.framer.reset()
            self.miss(parser.spec)
            return
        self._deliver(lines[-1], [parser], attribute_to=parser)

    def _answer(self, port: serial.SerialBase) -> bytes:
        """The answer to a query: up to its terminator, a full line or the port's timeout.

        Reads what has arrived in one call rather than a byte per call (pyserial's ``read_until``):
        a 20-byte answer is then one or two reads, not twenty."""
        term = self.spec.terminator
        limit = self.spec.max_line + len(term)
        answer = bytearray()
        timeout = serial.Timeout(port.timeout)
        while len(answer) < limit:
            chunk = port.read(min(max(1, port.in_waiting), limit - len(answer)))
            if not chunk:
                break
            answer += chunk
            if term in answer[-len(chunk) - len(term) :] or timeout.expired():
                break
        return bytes(answer)

    def _deliver(self, line: bytes, parsers: list[ChannelParser], attribute_to: ChannelParser | None) -> None:
        now, wall = self.clock(), self.wall()
        for parser in parsers:
            try:
                reading = parser.parse(line, now, wall)
            except RejectedLine:
                continue
            self.deliver(reading)
            return
        if attribute_to is not None:
            self.garbled(attribute_to.spec, line.decode("ascii", "replace"))
        else:
            self.stats.garbled += 1  # a streamed line no channel claims: counted, not attributed
