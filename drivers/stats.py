"""What a port delivered and what went wrong: the counts, and the one way they are worded.

The screen's status line, ``gauge``, ``record`` and the logbook all describe port trouble
through :meth:`PortStats.counts` and :func:`trouble_text`, so the words never drift apart.
"""

from __future__ import annotations

from dataclasses import dataclass, fields

__all__ = ["PortStats", "counts_text", "trouble_text"]


@dataclass
class PortStats:
    """Counts of what a port delivered, shown to the operator (field order is display order)."""

    readings: int = 0
    lines: int = 0
    """Complete lines framed (line protocols only)."""
    garbled: int = 0
    """Answers that matched no channel or did not decode."""
    timeouts: int = 0
    """Queries with no complete answer in time."""
    overflow: int = 0
    """Runs of bytes longer than a line may be, dropped."""
    exceptions: int = 0
    """Exception responses: the device refused a request (Modbus)."""
    faults: int = 0
    """Port errors (lost, missing, closed)."""
    reconnects: int = 0

    def counts(self) -> dict[str, int]:
        """The counts by the words the operator reads (``lines`` is bookkeeping, left out).

        >>> PortStats(readings=5, timeouts=2).counts()
        {'readings': 5, 'garbled': 0, 'unanswered': 2, 'overlong': 0, 'exceptions': 0, 'faults': 0, 'reconnects': 0}
        """
        return {_WORDS.get(f.name, f.name): getattr(self, f.name) for f in fields(self) if f.name != "lines"}


_WORDS = {"timeouts": "unanswered", "overflow": "overlong"}


def counts_text(port: str, stats: PortStats) -> str:
    """Every count of one port, e.g. "controller: 40 readings, 0 garbled, 1 unanswered, ...".

    >>> counts_text("ctl", PortStats(readings=3))
    'ctl: 3 readings, 0 garbled, 0 unanswered, 0 overlong, 0 exceptions, 0 faults, 0 reconnects'
    """
    return f"{port}: " + ", ".join(f"{n} {word}" for word, n in stats.counts().items())


def trouble_text(port: str, stats: PortStats) -> str | None:
    """Only what went wrong on one port, e.g. "controller: 3 garbled, 1 unanswered"; None if nothing.

    >>> trouble_text("ctl", PortStats(readings=3, garbled=2)), trouble_text("ctl", PortStats(readings=3))
    ('ctl: 2 garbled', None)
    """
    parts = [f"{n} {word}" for word, n in stats.counts().items() if n and word != "readings"]
    return f"{port}: {', '.join(parts)}" if parts else None
