"""One tuning session: readings and typed values in, forecasts out, everything logged.

The command line's ``record`` verb and the live screen both drive a :class:`Session`; it
owns no thread and no terminal, and takes its clocks from the caller so tests can freeze
time. A reading that is lost or older than its channel's stale limit withdraws the
forecast built on it: the :class:`View` then says why instead of giving numbers.

:meth:`Session.view` is a pure function of the session's state: it changes nothing and logs
nothing. Changes go through named methods: :meth:`Session.handle` (a reading), the ``set_...``
methods (what the operator types), and :meth:`Session.update`, which takes in what the readings
imply (a gas fill from the flow meters, strikes the instruments showed), logs the forecast and its
flag changes, and returns the view.
"""

from __future__ import annotations

import time
from collections.abc import Callable
from dataclasses import dataclass, replace
from typing import TYPE_CHECKING

from ...drivers.hub import Latest
from ...drivers.logbook import Logbook
from ...drivers.reading import Reading, Status
from ...model import units
from ...model.bench import OperatingPoint
from ...model.gauges import correct
from ...model.limits import LIMITS, parse_within
from ...profiles.bench import BenchProfile
from ...profiles.fill import Fill, read_fill, with_fill
from ...profiles.gasdata import find_cathode
from ...profiles.gauges import gauge_correction
from .detect import StrikeDetector
from .fillwatch import STEADY_STATE, FillWatch
from .marks import Pending, StrikeMark, StrikeMarks
from .readinglimits import ReadingLimits

if TYPE_CHECKING:  # the numeric model loads with the first forecast, not with the screen
    from ...model.results import Forecast
    from ...model.sentence import Flag

__all__ = ["FIELDS", "PressureNow", "Session", "View"]

FIELDS = ("pressure", "gap", "voltage", "temperature")
"""What the operator may type; each is read inside its physical limit (model/limits.py)."""


@dataclass(frozen=True)
class PressureNow:
    """The pressure the forecast would use now, and whether it may."""

    value: float | None
    """True (gas-corrected) pressure, Pa; None when withdrawn."""
    indicated: float | None
    status: str
    """A reading status, or "manual"."""
    approximate: bool
    source: str
    withdrawn: str | None
    """Why no forecast may be built on it (None: it may)."""


@dataclass(frozen=True)
class View:
    """What the session says now."""

    pressure: PressureNow
    forecast: Forecast | None
    withdrawn: str | None
    flag_changes: tuple[tuple[str, Flag], ...] = ()
    """("raised" or "cleared", flag) since the previous view; a level change counts as raised."""
    fill_note: str | None = None
    """Why the flow meters do not set the gas fill now (None: they do, or none are named)."""
    fill_source: str = "profile"
    """Where the gas fill in use came from: "profile", "typed" or "flows"."""
    proposed: tuple[Pending, ...] = ()
    """Strikes the instruments showed since the previous view, waiting to be kept or dropped."""


class Session:
    """A bench, its latest readings, the operator's values, the forecast and the logbook."""

    def __init__(
        self,
        profile: BenchProfile,
        *,
        logbook: Logbook | None = None,
        manual: bool = False,
        clock: Callable[[], float] = time.monotonic,
        wall: Callable[[], float] = time.time,
        heartbeat: float = 10.0,
    ):
        self.profile = profile
        self.bench = profile.bench
        self.logbook = logbook
        self.clock, self.wall = clock, wall
        self.heartbeat = heartbeat
        channels = [c for p in profile.ports for c in p.channels]
        self.latest = Latest({c.name: c.stale_after for c in channels})
        self.channels = {c.name: c for c in channels}
        self.labels = {c.name: c.labels for c in channels if c.labels}
        """Words of each state channel's values (an interlock: open, closed)."""
        self.pressure_channel = None if manual else next((c.name for c in channels if c.quantity == "pressure"), None)
        self.use_gauge = self.pressure_channel is not None
        self.values: dict[str, float | None] = {
            "pressure": self.bench.pressure,
            "gap": self.bench.gap,
            "voltage": None if self.bench.supply is None else self.bench.supply.open_circuit_voltage,
            "temperature": self.bench.gas_temperature,
        }
        self.gauges = dict(profile.gauges)
        """Gas correction by channel, for the gas in use (it follows a change of gas)."""
        self.fills = FillWatch({} if manual else profile.flows)
        self.follow_flows = bool(self.fills)
        """The gas fill follows the flow meters (until the operator types one)."""
        self.typed_flows: tuple = ()
        """Flows the operator typed with the gas fill ("argon:40 sccm,oxygen:8 sccm")."""
        self.fill_note: str | None = None
        """Why the flow meters cannot set the fill now (None: they do, or the fill is typed)."""
        self.fill_source = "profile"
        watched = {c.quantity for c in channels} & {"current", "self_bias", "reflected_power"}
        self.marks = StrikeMarks(self, StrikeDetector(profile.detection) if watched and not manual else None)
        """Strike marks, and the ones the instruments propose (a current, self-bias or reflected power)."""
        self.limits = ReadingLimits()
        self._flags: dict[str, Flag] = {}
        self._summary: tuple | None = None
        self._summary_at = -float("inf")

    # -- inputs -------------------------------------------------------------------

    def handle(self, r: Reading) -> str | None:
        """Take one reading from any source and log it. A value far outside what strikeline accepts
        (a wrong scale in the profile, a corrupt replay) is stored and logged as over or under range
        with the value in its raw text; the return is a line saying so when a channel goes out of
        those limits or comes back (None otherwise)."""
        r, note = self.limits.check(r)
        self.latest.update(r)
        self.marks.watch(r)
        if self.logbook is not None:
            value, approx = self.corrected(r)
            self.logbook.write(
                "reading",
                channel=r.channel,
                quantity=r.quantity,
                value=value,
                indicated=r.value,
                status=str(r.status),
                approximate=approx,
                source=r.source,
                raw=r.raw,
            )
        return note

    def corrected(self, r: Reading) -> tuple[float | None, bool]:
        corr = self.gauges.get(r.channel)
        if r.value is None or corr is None:
            return r.value, False
        return correct(r.value, corr)

    def event(self, port: str, kind: str, message: str) -> None:
        """A connection or fault on a port."""
        if self.logbook is not None:
            self.logbook.write("event", port=port, event=kind, message=message)

    def log_counts(self, stats: dict) -> None:
        """Each port's counts (readings and every kind of fault) as a ``counts`` event, at the end."""
        if self.logbook is not None:
            for port, st in stats.items():
                self.logbook.write("event", port=port, event="counts", message="", **st.counts())

    def set_value(self, name: str, text: str, convention: str = "peak") -> str | None:
        """Set ``name`` from typed ``text``; on bad input keep the old value and return why. An
        alternating supply's voltage is typed as ``convention`` (peak, rms or pp) and kept as its
        amplitude."""
        try:
            v = parse_within(text, name)
        except units.QuantityError as e:
            self._entry(name, text, False, str(e))
            return str(e)
        if name == "voltage" and self.alternating:
            v = units.to_amplitude(v, convention)
        self.values[name] = v
        if name == "pressure":
            self.use_gauge = False  # a typed pressure overrides the gauge until asked back
        self._entry(name, text, True, "")
        return None

    def nudge(self, name: str, factor: float) -> None:
        """Scale ``name`` by ``factor`` (pressure, gap, voltage), within its limits."""
        if name == "pressure" and self.use_gauge:
            now = self.pressure_now(self.clock())
            if now.value is not None:
                self.values["pressure"] = now.value
            self.use_gauge = False
        v = self.values.get(name)
        if v is None:
            return
        self.values[name] = min(max(v * factor, LIMITS[name].low), LIMITS[name].high)
        self._entry(name, f"x{factor:g}", True, "")

    def follow_gauge(self) -> bool:
        """Go back to the live gauge for pressure (False if there is none)."""
        if self.pressure_channel is None:
            return False
        self.use_gauge = True
        self._entry("pressure", "gauge", True, "")
        return True

    def set_gas(self, text: str) -> str | None:
        """Switch the gas fill to a typed gas or mixture, or back to the flow meters ("flows"); the
        gauges' corrections follow it (a factor set by hand stays)."""
        if text.strip().casefold() == "flows":
            if not self.fills:
                err = "this bench profile names no flow channels ([flows] channels); type a gas or a mixture"
                self._entry("gas", text, False, err)
                return err
            self.follow_flows, self.typed_flows = True, ()
            self._entry("gas", text, True, "")
            return None
        try:
            fill = read_fill(text)
        except ValueError as e:
            self._entry("gas", text, False, str(e))
            return str(e)
        self.follow_flows, self.typed_flows = False, fill.flows
        self._entry("gas", text, True, "")
        self._use_fill(fill, "typed")
        return None

    def _use_fill(self, fill: Fill, source: str) -> None:
        self.bench = with_fill(self.bench, fill)
        self.fill_source = source
        self.gauges = {
            ch: c if c.overridden else gauge_correction(c.kind, fill.composition) for ch, c in self.gauges.items()
        }
        if self.logbook is not None:
            flows = {g.key: q for g, q in fill.flows}
            note = STEADY_STATE if source == "flows" else ""
            self.logbook.write("fill", composition=fill.key, source=source, flows_Pa_m3_s=flows, note=note)

    def flows_now(self, now: float) -> tuple:
        """The gas flows for the forecast (the typed ones, or the flow meters' now)."""
        if not self.follow_flows:
            return self.typed_flows
        return self.fills.now(self.latest, now).flows

    def take_flows(self, now: float) -> None:
        """Take in a change of gas fill the flow meters show, and keep in :attr:`fill_note` why they
        cannot set it (None: they do, or the fill is typed)."""
        self.fill_note = None
        if not self.follow_flows:
            return
        f = self.fills.now(self.latest, now)
        if f.fill is not None and f.fill.key != self.bench.composition:
            self._use_fill(f.fill, "flows")
        self.fill_note = f.why_not

    def set_cathode(self, name: str) -> str | None:
        try:
            cathode = find_cathode(name)
        except ValueError as e:
            self._entry("cathode", name, False, str(e))
            return str(e)
        self.bench = replace(self.bench, cathode=cathode, gamma=None, curve=None)
        self._entry("cathode", name, True, "")
        return None

    def use_curve(self, curve) -> None:
        """Forecast with a fitted bench curve from now on (None: the textbook constants)."""
        self.bench = replace(self.bench, curve=curve)
        text = "textbook" if curve is None else f"fitted {curve.fitted_on}, {curve.n_points} strikes"
        self._entry("bench curve", text, True, "")

    def _entry(self, name: str, text: str, accepted: bool, message: str) -> None:
        if self.logbook is not None:
            self.logbook.write("entry", field=name, text=text, accepted=accepted, message=message)

    # -- outputs ------------------------------------------------------------------

    def pressure_now(self, now: float) -> PressureNow:
        if not self.use_gauge:
            p = self.values["pressure"]
            return PressureNow(p, p, "manual", False, "manual", None if p is not None else "no pressure typed")
        r = self.latest.get(self.pressure_channel, now)
        if r is None:
            return PressureNow(None, None, "waiting", False, self.pressure_channel, "no reading from the gauge yet")
        if not r.usable:
            why = {
                Status.STALE: f"gauge reading is stale (older than {self.latest.stale_after.get(r.channel):g} s)",
                Status.LOST: "gauge lost",
                Status.OVER_RANGE: "gauge over range",
                Status.UNDER_RANGE: "gauge under range",
                Status.SENSOR_ERROR: "gauge reports a sensor error",
                Status.GARBLED: "gauge answer garbled",
            }.get(r.status, str(r.status))
            return PressureNow(None, r.value, str(r.status), False, r.channel, why)
        value, approx = self.corrected(r)
        return PressureNow(value, r.value, str(r.status), approx, r.channel, None)

    def point(self, now: float) -> tuple[OperatingPoint | None, PressureNow]:
        flows = self.flows_now(now)
        p = self.pressure_now(now)
        if p.value is None:
            return None, p
        v = self.values
        return OperatingPoint(p.value, v["gap"], v["voltage"], v["temperature"], flows, self._current(now)), p

    def _current(self, now: float) -> float | None:
        """The discharge current a current channel reads now (None: none, or not usable)."""
        ch = next((c for c in self.channels.values() if c.quantity == "current"), None)
        r = None if ch is None else self.latest.get(ch.name, now)
        return r.value if r is not None and r.usable and r.value > 0 else None

    def view(self, now: float | None = None, proposed: tuple[Pending, ...] = ()) -> View:
        """The forecast now, or why it is withdrawn, and its flags' changes since the last
        :meth:`update`: a pure function of the session's state (nothing changes, nothing is logged)."""
        now = self.clock() if now is None else now
        point, p = self.point(now)
        f = None
        if point is not None:
            from ...model.forecast import forecast

            f = forecast(point, self.bench)
        flags = {} if f is None else {x.code: x for x in f.flags}
        changes = [
            ("raised", x) for code, x in flags.items() if (old := self._flags.get(code)) is None or old.level != x.level
        ]
        changes += [("cleared", x) for code, x in self._flags.items() if code not in flags]
        return View(p, f, p.withdrawn, tuple(changes), self.fill_note, self.fill_source, proposed)

    def update(self, now: float | None = None) -> View:
        """Take in what the readings imply (a gas fill from the flow meters, strikes the instruments
        showed), log the forecast and its flag changes, and return the view."""
        now = self.clock() if now is None else now
        self.take_flows(now)
        v = self.view(now, tuple(self.marks.settle()))
        self._log_changes(now, v.forecast, v.withdrawn, v.flag_changes)
        return v

    def _log_changes(self, now: float, f: Forecast | None, withdrawn: str | None, changes) -> None:
        if self.logbook is not None:
            for change, x in changes:
                self.logbook.write("flag", code=x.code, level=x.level, reason=x.reason, change=change)
        self._flags = {} if f is None else {x.code: x for x in f.flags}
        ll = None if f is None else f.load_line
        key = (
            withdrawn,
            None if f is None or f.breakdown_voltage is None else round(f.breakdown_voltage),
            None if f is None else f.worst,
            None if ll is None else ll.regime,
        )
        if self.logbook is not None and (key != self._summary or now - self._summary_at >= self.heartbeat):
            self._summary, self._summary_at = key, now
            rec = {"withdrawn": withdrawn, "gas": self.bench.composition}
            if f is not None:
                rec |= {
                    "pressure_Pa": f.pressure,
                    "gap_m": f.gap,
                    "voltage_V": f.voltage,
                    "breakdown_V": f.breakdown_voltage,
                    "margin_V": f.margin,
                    "strikes": f.strikes,
                    "branch": f.branch,
                    "regime": None if ll is None else ll.regime,
                    "worst": f.worst,
                }
            self.logbook.write("forecast", **rec)

    @property
    def alternating(self) -> bool:
        """The bench's supply is AC or RF (voltages are amplitudes)."""
        return self.bench.supply is not None and self.bench.supply.mode == "ac"

    def mark_strike(self, note: str = "") -> StrikeMark | str:
        """Record that the operator saw ignition now; returns the mark or why it cannot."""
        return self.marks.mark(note)

    @property
    def strikes(self) -> list[StrikeMark]:
        """The session's marks, typed and kept."""
        return self.marks.kept
