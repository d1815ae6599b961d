"""Strike marks: made with a key, or proposed by the instruments and kept or dropped by the operator.

Every mark feeds the calibration (`fit`, the screen's `k`) the same way, and the logbook says how
it was made (``made_by``: "key" or "detected"). A proposal and the operator's answer to it are
logbook events of their own.
"""

from __future__ import annotations

from collections import deque
from collections.abc import Callable, Mapping
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any, Protocol

from .detect import Proposal, StrikeDetector

if TYPE_CHECKING:
    from ...drivers.hub import Latest
    from ...drivers.logbook import Logbook
    from ...drivers.reading import Reading
    from ...model.bench import Bench

__all__ = ["Host", "Pending", "StrikeMark", "StrikeMarks"]


@dataclass(frozen=True)
class StrikeMark:
    """The bench struck here."""

    t_wall: float
    pressure: float
    """True pressure, Pa."""
    gap: float
    voltage: float
    """V across the gap (an amplitude for an alternating supply)."""
    gas_temperature: float
    source: str
    """Where the pressure came from: a channel name or "manual"."""
    note: str = ""
    gas: str = ""
    """The gas fill's composition key when the mark was made."""
    made_by: str = "key"
    """"key" (the operator saw it) or "detected" (the instruments showed it, the operator kept it)."""


@dataclass(frozen=True)
class Pending:
    """A proposed mark, with the pressure and voltage it would carry."""

    proposal: Proposal
    mark: StrikeMark


class Host(Protocol):
    """What the marks need of the session that holds them (:class:`~strikeline.tui.session.session.Session`)."""

    bench: Bench
    channels: Mapping[str, Any]
    latest: Latest
    logbook: Logbook | None
    clock: Callable[[], float]
    wall: Callable[[], float]

    def point(self, now: float) -> tuple[Any, Any]: ...

    def event(self, port: str, kind: str, message: str) -> None: ...


class StrikeMarks:
    """A session's marks and the proposals waiting for the operator."""

    def __init__(self, session: Host, detector: StrikeDetector | None):
        self.session = session
        self.detector = detector
        self.kept: list[StrikeMark] = []
        self.pending: deque[Pending] = deque(maxlen=10)
        self.seen: deque[Proposal] = deque(maxlen=10)
        """Proposals from the readers' threads, not yet turned into pending marks (:meth:`settle`)."""

    def mark(self, note: str = "") -> StrikeMark | str:
        """Record that the operator saw ignition now; the mark, or why it cannot be made."""
        s = self.session
        now = s.clock()
        point, p = s.point(now)
        if point is None:
            return f"cannot mark a strike: {p.withdrawn}"
        voltage = self._read_back(now)
        voltage = point.voltage if voltage is None else voltage
        if voltage is None:
            return "cannot mark a strike: no voltage set (type one, e.g. 600V)"
        mark = StrikeMark(
            s.wall(), point.pressure, point.gap, voltage, point.gas_temperature, p.source, note, s.bench.composition
        )
        self._keep(mark)
        return mark

    def _read_back(self, now: float) -> float | None:
        """The voltage across the gap a channel reads now: the supply's read-back, or half the
        electrodes' peak-to-peak voltage (an amplitude)."""
        s = self.session
        for quantity, share in (("voltage", 1.0), ("rf_voltage", 0.5)):
            ch = next((c for c in s.channels.values() if c.quantity == quantity), None)
            r = None if ch is None else s.latest.get(ch.name, now)
            if r is not None and r.usable and r.value > 0:
                return r.value * share
        return None

    def watch(self, r: Reading) -> None:
        """Feed a reading to the detector (any thread); what it shows waits for :meth:`settle`."""
        if self.detector is not None:
            proposal = self.detector.feed(r)
            if proposal is not None:
                self.seen.append(proposal)

    def settle(self) -> list[Pending]:
        """Turn what the detector saw into pending marks with this moment's pressure (the Session's
        own thread, on every view), each proposal logged."""
        out = []
        while self.seen:
            pending = self._propose(self.seen.popleft())
            if pending is not None:
                out.append(pending)
        return out

    def _propose(self, proposal: Proposal) -> Pending | None:
        s = self.session
        point, p = s.point(s.clock())
        voltage = proposal.voltage if proposal.voltage is not None else None if point is None else point.voltage
        if point is None or voltage is None:
            why = p.withdrawn if point is None else "no voltage read back or set"
            s.event("", "strike unproposed", f"{proposal.signal}; no mark: {why}")
            return None
        mark = StrikeMark(
            proposal.t_wall, point.pressure, point.gap, voltage, point.gas_temperature, p.source,
            proposal.signal, s.bench.composition, "detected",
        )  # fmt: skip
        pending = Pending(proposal, mark)
        self.pending.append(pending)
        s.event("", "strike proposed", f"{proposal.signal}: {voltage:.0f} V at {point.pressure:.4g} Pa")
        return pending

    def keep(self) -> StrikeMark | None:
        """The operator keeps the oldest proposal: it becomes a mark."""
        if not self.pending:
            return None
        mark = self.pending.popleft().mark
        self._keep(mark)
        return mark

    def drop(self) -> Pending | None:
        """The operator drops the oldest proposal."""
        if not self.pending:
            return None
        gone = self.pending.popleft()
        self.session.event("", "strike dropped", gone.proposal.signal)
        return gone

    def _keep(self, mark: StrikeMark) -> None:
        self.kept.append(mark)
        s = self.session
        if s.logbook is not None:
            s.logbook.write(
                "strike",
                pressure_Pa=mark.pressure,
                gap_m=mark.gap,
                voltage_V=mark.voltage,
                gas_temperature_K=mark.gas_temperature,
                pressure_source=mark.source,
                gas=mark.gas,
                cathode=s.bench.cathode.key,
                note=mark.note,
                made_by=mark.made_by,
            )
