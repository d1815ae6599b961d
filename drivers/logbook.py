"""The shift logbook: append-only JSON lines that survive a crash (read back and replayed by
:mod:`~strikeline.drivers.logbook_read`, whose names this module also gives).

Format ("strikeline-logbook/1"): one JSON object per line, UTF-8. Every record has

    t       ISO-8601 UTC time, e.g. "2026-12-01T09:30:00.123456Z"
    t_unix  the same as Unix seconds
    mono    seconds since the session started (monotonic clock)
    kind    "session" (first line), "reading", "strike", "forecast", "flag", "event", "entry", "fill"

and the fields of its kind (SI units, named with them: pressure_Pa, gap_m, voltage_V...).
``pandas.read_json(path, lines=True)`` opens it directly.

Durability: each record is written and flushed at once, and the file is fsync'd at least
once a second; a killed process loses at most the last second, and a torn last line is
skipped on reading. A failing disk (full, read-only) does not stop the session: the error
is reported once and records wait in a bounded backlog until writing works again.
"""

from __future__ import annotations

import datetime as _dt
import json
import math
import os
import stat
import threading
import time
from collections import deque
from collections.abc import Callable
from pathlib import Path
from typing import Any

from .logbook_read import LogRead, ReplaySource, iter_logbook, line_spans, read_logbook, reading_from_record

__all__ = [
    "FORMAT",
    "LogRead",
    "Logbook",
    "LogbookRefused",
    "ReplaySource",
    "iso_utc",
    "iter_logbook",
    "line_spans",
    "read_logbook",
    "reading_from_record",
    "refuse_foreign",
]

FORMAT = "strikeline-logbook/1"


def iso_utc(t_wall: float) -> str:
    """Unix seconds as an ISO-8601 UTC time with microseconds, e.g. "2026-12-01T09:30:00.123456Z"."""
    return _dt.datetime.fromtimestamp(t_wall, _dt.UTC).isoformat(timespec="microseconds").replace("+00:00", "Z")


def _clean(x: Any) -> Any:
    if isinstance(x, float) and not math.isfinite(x):
        return None
    if isinstance(x, dict):
        return {k: _clean(v) for k, v in x.items()}
    if isinstance(x, list | tuple):
        return [_clean(v) for v in x]
    return x


class LogbookRefused(ValueError):
    """This path cannot hold a logbook (the message is one line saying why)."""


def refuse_foreign(path: Path) -> None:
    """Raise :class:`LogbookRefused` unless ``path`` is absent, empty, or already a strikeline logbook:
    appending to someone's CSV, a folder or a device would damage it."""
    if str(path) in ("", "."):
        raise LogbookRefused("logbook path is empty; give a file name, e.g. shift.jsonl")
    try:
        st = path.stat()
    except FileNotFoundError:
        return
    except OSError as e:
        raise LogbookRefused(f"logbook {path}: cannot be checked ({e.strerror or e})") from None
    if stat.S_ISDIR(st.st_mode):
        raise LogbookRefused(f"logbook {path}: is a folder; give a file name inside it")
    if not stat.S_ISREG(st.st_mode):
        raise LogbookRefused(f"logbook {path}: is not a regular file; give a file name")
    if st.st_size == 0:
        return
    try:
        with open(path, encoding="utf-8", errors="replace") as f:
            first = f.readline(4096)
        header = json.loads(first)
        ok = isinstance(header, dict) and str(header.get("format", "")).startswith("strikeline-logbook/")
    except (OSError, ValueError):
        ok = False
    if not ok:
        raise LogbookRefused(
            f"logbook {path}: exists and is not a strikeline logbook; it is left untouched: give a new file name"
        )


class Logbook:
    """Append records to one logbook file.

    ``opener`` (default :func:`open`) and the clocks are replaceable for tests. ``on_error``
    is called (from the writing thread) with a one-line message when writing starts or
    stops failing.
    """

    def __init__(
        self,
        path: str | os.PathLike[str],
        *,
        clock: Callable[[], float] = time.monotonic,
        wall: Callable[[], float] = time.time,
        sync_interval: float = 1.0,
        on_error: Callable[[str | None], None] | None = None,
        opener: Callable[..., Any] = open,
        backlog: int = 100_000,
    ):
        self.path = Path(path)
        self.clock, self.wall = clock, wall
        self.sync_interval = sync_interval
        self.on_error = on_error or (lambda msg: None)
        self.opener = opener
        self.error: str | None = None
        self.written = 0
        self.dropped = 0
        self._backlog: deque[str] = deque(maxlen=backlog)
        self._lock = threading.Lock()
        self._f = None
        self._dirty = False
        self._t0 = clock()
        self._stop = threading.Event()
        self._syncer: threading.Thread | None = None
        self._last_retry = -math.inf

    def open(self, *, strict: bool = False, **header: Any) -> None:
        """Open (append) and write the session header; start the once-a-second sync.

        A file that exists and is not a strikeline logbook is never written to: :class:`LogbookRefused`.
        With ``strict`` a logbook that cannot be written now (no folder, read-only, full device)
        raises :class:`LogbookRefused` at once, before any work starts; otherwise the failure is
        reported through ``on_error`` and records wait in the backlog.
        """
        refuse_foreign(self.path)
        try:
            self.path.parent.mkdir(parents=True, exist_ok=True)
        except OSError as e:
            if strict:
                raise LogbookRefused(f"logbook {self.path}: its folder cannot be made ({e.strerror or e})") from None
        self._try_open()
        self.write("session", format=FORMAT, **header)
        if strict and self.error is not None:
            self.close()
            raise LogbookRefused(self.error.split("; records kept")[0])
        self._syncer = threading.Thread(target=self._sync_loop, name="logbook-sync", daemon=True)
        self._syncer.start()

    def _try_open(self) -> bool:
        if self._f is not None:
            return True
        try:
            self._f = self.opener(self.path, "a", encoding="utf-8")
            return True
        except OSError as e:
            self._fail(e)
            return False

    def _fail(self, e: OSError) -> None:
        msg = f"logbook {self.path}: cannot write ({e.strerror or e}); records kept in memory and retried"
        if self.error != msg:
            self.error = msg
            self.on_error(msg)
        self._close_file()

    def _close_file(self) -> None:
        if self._f is not None:
            try:
                self._f.close()
            except OSError:
                pass
            self._f = None

    def write(self, kind: str, **fields: Any) -> None:
        """Append one record now (flushed before returning when the disk allows)."""
        wall = self.wall()
        rec = {"t": iso_utc(wall), "t_unix": wall, "mono": round(self.clock() - self._t0, 6), "kind": kind}
        rec.update(fields)
        line = json.dumps(_clean(rec), ensure_ascii=False, separators=(",", ":")) + "\n"
        with self._lock:
            if len(self._backlog) == self._backlog.maxlen:
                self.dropped += 1
            self._backlog.append(line)
            if self.error is not None and self.clock() - self._last_retry < self.sync_interval:
                return  # failing: retry at most once per sync interval
            self._drain()

    def _drain(self) -> None:
        self._last_retry = self.clock()
        if not self._try_open():
            return
        try:
            while self._backlog:
                self._f.write(self._backlog[0])
                self._f.flush()
                self._backlog.popleft()
                self.written += 1
            self._dirty = True
        except OSError as e:
            self._fail(e)
            return
        if self.error is not None:
            self.error = None
            self.on_error(None)

    def sync(self) -> None:
        """fsync what has been written (the sync thread does this once a second)."""
        with self._lock:
            if self.error is not None and self._backlog:
                self._drain()
            if self._f is not None and self._dirty:
                try:
                    os.fsync(self._f.fileno())
                    self._dirty = False
                except (OSError, ValueError, AttributeError) as e:
                    if isinstance(e, OSError):
                        self._fail(e)

    def _sync_loop(self) -> None:
        while not self._stop.wait(self.sync_interval):
            self.sync()

    def close(self) -> None:
        """Write what is pending, sync and close."""
        self._stop.set()
        if self._syncer is not None:
            self._syncer.join(2)
        self.sync()
        with self._lock:
            self._close_file()

    @property
    def pending(self) -> int:
        """Records waiting for the disk."""
        return len(self._backlog)
