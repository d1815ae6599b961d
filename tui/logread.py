"""Reading a logbook for the verbs and the screen: the one reader, with this tool's physical limits.

Every consumer (``log``, ``live --replay``, the shift report) reads through :func:`read_log`, so a
malformed or nonsensical record is skipped and reported the same way everywhere.
"""

from __future__ import annotations

import os

from ..drivers.logbook_read import LogRead, read_logbook
from ..model.limits import LIMITS

__all__ = ["RANGES", "read_log", "skipped_text"]

RANGES = {
    field: (LIMITS[name].low, LIMITS[name].high)
    for field, name in (
        ("pressure_Pa", "pressure"),
        ("gap_m", "gap"),
        ("voltage_V", "voltage"),
        ("gas_temperature_K", "temperature"),
    )
}
"""Accepted ranges of a strike mark's numbers: the same limits as typed values (model/limits.py)."""


def read_log(path: str | os.PathLike[str]) -> LogRead:
    """The logbook at ``path`` with every unreadable line skipped and reported (OSError if unreadable)."""
    return read_logbook(path, RANGES)


def skipped_text(log: LogRead, most: int = 5) -> str | None:
    """One line naming the skipped lines and why, e.g. "skipped 2 lines: 3 (not JSON), 7 (...)"; None
    when nothing was skipped."""
    parts = [f"{line} ({why})" for line, why in log.skipped[:most]]
    if len(log.skipped) > most:
        parts.append(f"and {len(log.skipped) - most} more")
    if log.torn_tail:
        parts.append("the torn last line")
    if not parts:
        return None
    n = len(log.skipped) + log.torn_tail
    return f"skipped {n} line{'s' if n != 1 else ''}: {', '.join(parts)}"
