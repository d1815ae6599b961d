"""Fake instruments for the real serial stack: a pty pair and a TCP 'terminal server'.

Each runs a responder (line in -> bytes out) in a thread on the far side of the link, so
the driver under test uses pyserial exactly as on a bench. Nothing here sleeps: waits are
bounded waits on conditions.
"""

from __future__ import annotations

import os
import select
import socket
import threading
import time
import tty
from collections.abc import Callable

Responder = Callable[[bytes], bytes]


def wait_for(pred: Callable[[], bool], timeout: float = 5.0) -> bool:
    """Wait (without sleeping blindly) until ``pred()`` holds or ``timeout`` passes."""
    end = time.monotonic() + timeout
    ev = threading.Event()
    while time.monotonic() < end:
        if pred():
            return True
        ev.wait(0.005)
    return pred()


async def next_frame(pilot, timeout: float = 2.0) -> None:
    """Wait until the live screen has drawn a frame after now (a reading that changes what is shown
    may wait up to the pacing's MIN_FRAME for its frame)."""
    app = pilot.app
    before = app.pacer.frames
    end = time.monotonic() + timeout
    while app.pacer.frames == before and time.monotonic() < end:
        await pilot.pause(0.01)
    await pilot.pause()


class PtyInstrument:
    """A device on the master side of a pseudo-terminal; the driver opens ``self.path``."""

    def __init__(self, responder: Responder, terminator: bytes = b"\r\n"):
        self.master, self.slave = os.openpty()
        tty.setraw(self.slave)
        tty.setraw(self.master)
        self.path = os.ttyname(self.slave)
        self.responder = responder
        self.terminator = terminator
        self.received: list[bytes] = []
        self._stop = threading.Event()
        self._thread = threading.Thread(target=self._run, daemon=True)
        self._thread.start()

    def _run(self) -> None:
        buf = b""
        while not self._stop.is_set():
            try:
                ready, _, _ = select.select([self.master], [], [], 0.05)
                if not ready:
                    continue
                data = os.read(self.master, 4096)
            except OSError:
                return
            if not data:
                return
            buf += data
            while self.terminator in buf:
                line, buf = buf.split(self.terminator, 1)
                self.received.append(line)
                reply = self.responder(line)
                if reply:
                    try:
                        os.write(self.master, reply)
                    except OSError:
                        return

    def write(self, data: bytes) -> None:
        os.write(self.master, data)

    def unplug(self) -> None:
        """Close both ends under the driver, as a pulled USB adapter does."""
        self._stop.set()
        self._thread.join(2)
        for fd in (self.master, self.slave):
            try:
                os.close(fd)
            except OSError:
                pass

    close = unplug


class TcpInstrument:
    """A terminal server on 127.0.0.1: a responder per line, or a stream pushed on connect."""

    def __init__(
        self,
        responder: Responder | None = None,
        push: bytes = b"",
        terminator: bytes = b"\n",
        port: int = 0,
        every: float | None = None,
    ):
        """``push`` is sent 0.1 s after a client connects (pyserial flushes input on open, so
        earlier bytes would be lost, as with real hardware), and again every ``every`` s."""
        self.responder, self.push, self.terminator, self.every = responder, push, terminator, every
        self.server = socket.create_server(("127.0.0.1", port), reuse_port=False)
        self.server.settimeout(0.05)
        self.port = self.server.getsockname()[1]
        self.url = f"socket://127.0.0.1:{self.port}"
        self.connections = 0
        self._stop = threading.Event()
        self._conns: list[socket.socket] = []
        self._thread = threading.Thread(target=self._serve, daemon=True)
        self._thread.start()

    def _serve(self) -> None:
        while not self._stop.is_set():
            try:
                conn, _ = self.server.accept()
            except (TimeoutError, OSError):
                continue
            self.connections += 1
            self._conns.append(conn)
            threading.Thread(target=self._handle, args=(conn,), daemon=True).start()

    def _handle(self, conn: socket.socket) -> None:
        conn.settimeout(0.05)
        try:
            buf = b""
            next_push = time.monotonic() + 0.1 if self.push else None
            while not self._stop.is_set():
                if next_push is not None and time.monotonic() >= next_push:
                    conn.sendall(self.push)
                    next_push = None if self.every is None else next_push + self.every
                try:
                    data = conn.recv(4096)
                except TimeoutError:
                    continue
                if not data:
                    return
                buf += data
                while self.terminator in buf and self.responder:
                    line, buf = buf.split(self.terminator, 1)
                    conn.sendall(self.responder(line))
        except OSError:
            return

    def stop(self) -> None:
        """The terminal server goes away: listener and every connection closed."""
        self._stop.set()
        self._thread.join(2)
        for c in self._conns:
            try:
                c.shutdown(socket.SHUT_RDWR)
            except OSError:
                pass
            c.close()
        self.server.close()


class NullModem:
    """Two pseudo-terminals wired to each other, like two serial ports and a null-modem cable:
    bytes written to ``a`` arrive at ``b`` and back. Each side has a device path to open."""

    def __init__(self):
        self._fds = []
        self.paths = []
        for _ in range(2):
            master, slave = os.openpty()
            tty.setraw(master)
            tty.setraw(slave)
            self._fds.append((master, slave))
            self.paths.append(os.ttyname(slave))
        self.a, self.b = self.paths
        self._stop = threading.Event()
        self._thread = threading.Thread(target=self._run, daemon=True)
        self._thread.start()

    def _run(self) -> None:
        (ma, _), (mb, _) = self._fds
        peer = {ma: mb, mb: ma}
        while not self._stop.is_set():
            try:
                ready, _, _ = select.select([ma, mb], [], [], 0.05)
                for fd in ready:
                    os.write(peer[fd], os.read(fd, 4096))
            except OSError:
                return

    def close(self) -> None:
        self._stop.set()
        self._thread.join(2)
        for pair in self._fds:
            for fd in pair:
                try:
                    os.close(fd)
                except OSError:
                    pass


class Sink:
    """What instruments emit, kept for a test: readings and port events (thread-safe)."""

    def __init__(self):
        self.readings: list = []
        self.events: list[tuple] = []
        self.lock = threading.Lock()

    def emit(self, r):
        with self.lock:
            self.readings.append(r)

    def event(self, *a):
        with self.lock:
            self.events.append(a)

    def of(self, channel, status=None):
        """The readings of ``channel`` (with ``status`` if given), oldest first."""
        with self.lock:
            return [r for r in self.readings if r.channel == channel and (status is None or r.status is status)]

    def last(self, channel):
        """The newest reading of ``channel`` (None: none yet)."""
        with self.lock:
            return next((r for r in reversed(self.readings) if r.channel == channel), None)
