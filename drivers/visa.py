"""Read an instrument that answers SCPI queries through a VISA resource, in a thread. Read only.

pyvisa opens the resource with the pure-Python pyvisa-py backend by default ("@py"; a vendor VISA
library, "@ivi", may be named instead, and a "file.yaml@sim" definition simulates one). On
connect the instrument is asked ``*IDN?`` and its answer logged as an event. Each channel's query
(the instrument's own command, written in the bench profile) is sent in turn and its answer parsed
exactly as a line channel's: an answer that does not parse is refused (``garbled``) with the raw
answer kept; a timeout counts as unanswered and, after ``lost_after`` in a row, the channel is
lost. Only queries are sent; nothing on the instrument is set.
"""

from __future__ import annotations

import warnings
from typing import Any

from .framing import ChannelParser, RejectedLine
from .reader import Emit, Event, ReaderThread
from .specs import ScpiPortSpec

__all__ = ["ScpiReader"]


class ScpiReader(ReaderThread):
    """A thread that polls one :class:`ScpiPortSpec` and emits readings."""

    def __init__(self, spec: ScpiPortSpec, emit: Emit, on_event: Event | None = None, **kw):
        from pyvisa.errors import InvalidSession, VisaIOError  # loads with the port

        self.PORT_ERRORS = (VisaIOError, InvalidSession, OSError)
        # An answer cut short (a timeout mid-line) is parsed or refused as garbled here; pyvisa's own
        # warning about it would be printed across the live screen.
        warnings.filterwarnings("ignore", "read string doesn't end with termination characters", UserWarning)
        super().__init__(spec, emit, on_event, **kw)
        self.parsers = [ChannelParser(c, spec.source) for c in spec.channels]
        self.identity: str | None = None
        """The instrument's answer to *IDN? at the last connect."""
        self._rm: Any = None
        self._res: Any = None

    def _open(self) -> Any:
        import pyvisa

        s = self.spec
        if self._rm is None:
            self._rm = pyvisa.ResourceManager(s.backend)
        res = self._rm.open_resource(s.resource)
        res.timeout = max(int(s.timeout * 1000), 1)  # pyvisa counts in milliseconds
        res.read_termination = s.read_termination
        res.write_termination = s.write_termination
        self._res = res
        if s.identify:
            # Some backends open a socket only at the first exchange: the port counts as open once
            # the instrument has been asked who it is (a refused connection raises here).
            try:
                answer = self._query(res, "*IDN?")
            except BaseException:
                self._close(res)
                raise
            self.identity = None if answer is None else " ".join(answer.split())
        return res

    def _connected(self, res: Any) -> None:
        if self.spec.identify:
            self.on_event(self.spec.name, "identified", self.identity or "no answer to *IDN?")

    def _query(self, res: Any, command: str) -> str | None:
        """The instrument's answer, or None when it timed out (any other VISA error is the port failing)."""
        from pyvisa.constants import StatusCode
        from pyvisa.errors import VisaIOError

        try:
            return res.query(command)
        except VisaIOError as e:
            if e.error_code == StatusCode.error_timeout:
                return None
            raise

    def _close(self, res: Any) -> None:
        self._res = None
        res.close()

    def _serve(self, res: Any) -> None:
        while not self.stopping:
            started = self.clock()
            for parser in self.parsers:
                if self.stopping:
                    return
                self._poll_one(res, parser)
            self.pace(started)

    def _poll_one(self, res: Any, parser: ChannelParser) -> None:
        c = parser.spec
        answer = self._query(res, c.query.decode("ascii").rstrip("\r\n"))
        if answer is None:
            self.miss(c)
            return
        try:
            r = parser.parse(answer.encode("ascii", "replace"), self.clock(), self.wall())
        except RejectedLine as e:
            self.garbled(c, f"{answer.strip()} ({e})")
            return
        self.deliver(r)
