"""Reading a logbook back: its checked records, whole or streamed (in parts, for several cores),
and played back as readings.

Every line goes through :func:`~strikeline.drivers.records.record_problem`; a line that is not a
readable record is skipped and named, and a torn last line (a crash mid-write) is tolerated. The
writing side and the format are :mod:`~strikeline.drivers.logbook`'s.
"""

from __future__ import annotations

import json
import os
import threading
import time
from collections.abc import Callable, Iterator, Mapping
from dataclasses import dataclass, field
from typing import Any

from .reading import Reading, Status
from .records import record_problem

__all__ = ["LogRead", "ReplaySource", "iter_logbook", "line_spans", "read_logbook", "reading_from_record"]


@dataclass
class LogRead:
    """A logbook as read back: the records that passed :func:`record_problem`, and what did not."""

    records: list[dict[str, Any]] = field(default_factory=list)
    skipped: list[tuple[int, str]] = field(default_factory=list)
    """(line number, reason) of every line that is not a readable record, torn tail excluded."""
    torn_tail: bool = False
    """The last line was cut short (a crash mid-write) and was skipped."""

    @property
    def bad_lines(self) -> list[int]:
        """The line numbers (1-based) that were skipped."""
        return [line for line, _why in self.skipped]


def _no_constants(name: str) -> Any:
    raise ValueError(f"{name} is not a number JSON allows")


def read_logbook(path: str | os.PathLike[str], ranges: Mapping[str, tuple[float, float]] | None = None) -> LogRead:
    """Read a logbook: every line is checked (:func:`~strikeline.drivers.records.record_problem`,
    with the caller's physical ``ranges`` of numeric fields); a line that is not a readable record is
    skipped and reported by number with its reason, and a torn last line (a crash mid-write) is
    tolerated. Raises OSError when the file cannot be read at all."""
    out = LogRead()
    out.records.extend(iter_logbook(path, ranges, out))
    return out


_DECODER = json.JSONDecoder(parse_constant=_no_constants)
"""One decoder for every line (``json.loads`` with an option builds a new one per call)."""


def iter_logbook(
    path: str | os.PathLike[str],
    ranges: Mapping[str, tuple[float, float]] | None,
    read: LogRead,
    span: tuple[int, int | None] = (0, None),
) -> Iterator[dict[str, Any]]:
    """The readable records of a logbook one at a time, checked as :func:`read_logbook` checks them;
    what is skipped (and a torn last line) is noted in ``read`` (its ``records`` stay empty), so a
    long logbook never has to be in memory at once. ``span`` (first byte, end byte or None) reads a
    part that starts at a line's start (see :func:`line_spans`); its skipped lines are numbered from
    that part's first line. Raises OSError when the file cannot be read."""
    first, end = span
    with open(path, "rb") as f:  # JSON lines end in LF (a CR before it is tolerated), nothing else
        f.seek(first)
        at = first
        for i, raw in enumerate(f, 1):
            if end is not None and at >= end:
                break
            at += len(raw)
            line = raw.decode("utf-8", "replace")
            if len(line) < 3 and not line.strip():
                continue
            try:
                rec = _DECODER.decode(line)  # the LF (and a CR before it) is whitespace to JSON
            except ValueError as e:
                if not line.endswith("\n"):  # the last line, no newline after it: cut short by a crash
                    read.torn_tail = True
                else:
                    read.skipped.append((i, f"not JSON ({str(e).split(':')[0]})"))
                continue
            problem = record_problem(rec, ranges)
            if problem is not None:
                read.skipped.append((i, problem))
                continue
            yield rec


def line_spans(path: str | os.PathLike[str], parts: int) -> list[tuple[int, int | None, int]]:
    """``parts`` spans of about equal size that each start at a line's start: (first byte, end byte
    or None for the end of the file, lines before it), for reading a long logbook on several cores."""
    size = os.path.getsize(path)
    cuts = [0]
    with open(path, "rb") as f:
        for k in range(1, parts):
            f.seek(max(size * k // parts, cuts[-1]))
            f.readline()  # to the start of the next line
            cuts.append(min(f.tell(), size))
        spans = []
        lines_before = 0
        for k, first in enumerate(cuts):
            end = cuts[k + 1] if k + 1 < len(cuts) else None
            spans.append((first, end, lines_before))
            if end is not None:
                f.seek(first)
                lines_before += _count_lines(f, end - first)
    return spans


def _count_lines(f, n: int) -> int:
    count = 0
    while n > 0:
        block = f.read(min(n, 1 << 20))
        if not block:
            break
        count += block.count(b"\n")
        n -= len(block)
    return count


def reading_from_record(rec: dict[str, Any], t_mono: float) -> Reading | None:
    """The Reading a "reading" record holds (its indicated value), stamped ``t_mono``."""
    if rec.get("kind") != "reading":
        return None
    try:
        status = Status(rec.get("status", "ok"))
        value = rec.get("indicated")
        value = None if value is None else float(value)
        return Reading(
            str(rec["channel"]),
            str(rec["quantity"]),
            value,
            status,
            str(rec.get("raw", "")),
            t_mono,
            float(rec.get("t_unix", 0.0)),
            "replay",
        )
    except (KeyError, ValueError, TypeError):
        return None


class ReplaySource:
    """Feed a logbook's readings back, at their own pace (``speed`` 1), faster, or at once (0).

    Readings go to ``emit`` and every other record to ``on_record``; each reading is
    stamped with the replay's own clock so staleness works as it did live.
    """

    def __init__(
        self,
        records: list[dict[str, Any]],
        emit: Callable[[Reading], None],
        on_record: Callable[[dict[str, Any]], None] | None = None,
        *,
        speed: float = 1.0,
        clock: Callable[[], float] = time.monotonic,
        on_done: Callable[[], None] | None = None,
    ):
        self.records = records
        self.emit, self.on_record = emit, on_record or (lambda rec: None)
        self.speed, self.clock = speed, clock
        self.on_done = on_done or (lambda: None)
        self.emitted = 0
        self._stop = threading.Event()
        self._thread: threading.Thread | None = None

    def run(self) -> None:
        """Replay in the calling thread (returns when done or stopped)."""
        start_clock = self.clock()
        start_mono = next((float(r.get("mono", 0.0)) for r in self.records), 0.0)
        for rec in self.records:
            if self._stop.is_set():
                return
            if self.speed > 0:
                due = start_clock + (float(rec.get("mono", start_mono)) - start_mono) / self.speed
                wait = due - self.clock()
                if wait > 0 and self._stop.wait(wait):
                    return
            r = reading_from_record(rec, self.clock())
            if r is not None:
                self.emitted += 1
                self.emit(r)
            else:
                self.on_record(rec)
        self.on_done()

    def start(self) -> None:
        self._thread = threading.Thread(target=self.run, name="replay", daemon=True)
        self._thread.start()

    def stop(self) -> None:
        self._stop.set()
        if self._thread is not None:
            self._thread.join(2)
