"""Messages that reach the live screen from reader threads, the logbook and replay.

Each is small; :class:`Fresh` collapses under bursts (``can_replace``), so a flood of readings
becomes one redraw and never backs up the screen.
"""

from __future__ import annotations

from typing import Any

from textual.message import Message

__all__ = ["Fresh", "LogbookNote", "PortNote", "ReplayNote", "Skipped"]


class Fresh(Message):
    """New readings are in the Session; the screen should look again. Bursts collapse."""

    def __init__(self, t_sent: float):
        super().__init__()
        self.t_sent = t_sent

    def can_replace(self, message: Message) -> bool:
        return isinstance(message, Fresh)


class PortNote(Message):
    """A port connected, was lost, or stopped answering."""

    def __init__(self, port: str, kind: str, text: str):
        super().__init__()
        self.port, self.kind, self.text = port, kind, text


class ReplayNote(Message):
    """A non-reading record met during replay (strike mark, flag change, event)."""

    def __init__(self, record: dict[str, Any]):
        super().__init__()
        self.record = record

    def text(self) -> str | None:
        """The event line it makes (None: nothing to say)."""
        rec = self.record
        kind = rec.get("kind")
        if kind == "strike":
            return f"(replay) strike mark at {rec.get('pressure_Pa', 0):.4g} Pa, {rec.get('voltage_V', 0):.0f} V"
        if kind == "event":
            return f"(replay) {rec.get('port')}: {rec.get('event')} {rec.get('message', '')}"
        if kind == "replay-end":
            return "replay finished"
        return None


class LogbookNote(Message):
    """The logbook started or stopped failing (text None: writing again)."""

    def __init__(self, text: str | None):
        super().__init__()
        self.text = text


class Skipped(Message):
    """A reading far outside what strikeline accepts was skipped, or came back inside (the text says)."""

    def __init__(self, text: str):
        super().__init__()
        self.text = text
