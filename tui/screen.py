"""The live tuning screen (Textual): layout, what reaches it from threads, and its drawing.

Reader threads hand each reading to the Session (which logs it, every one) and post a small
:class:`~strikeline.tui.messages.Fresh` message only when it changes what is shown
(:mod:`~strikeline.tui.pacing`); a burst becomes one frame of the latest values. Only the widgets
whose text changed repaint; the curve redraws on its own slow timer and only when what it shows has
moved by at least a character cell. Built only by :func:`strikeline.tui.app.make_app`.
"""

from __future__ import annotations

import math
import time
from collections import deque
from collections.abc import Callable
from pathlib import Path
from typing import Any

from rich.text import Text
from textual.app import App, ComposeResult
from textual.containers import Horizontal
from textual.widgets import Static

from ..drivers.logbook import iso_utc
from .keys import BINDINGS, KEY_HINTS, KeyActions
from .lines_view import LinesView
from .messages import Fresh, LogbookNote, PortNote, ReplayNote, Skipped
from .pacing import HEARTBEAT, Pacer
from .readouts import STYLE, channel_line, flag_lines, flags_text, readout_lines, sparkline
from .session import Session
from .text import UNIT_SYSTEMS, fill_label, supply_label
from .unitwords import in_units

__all__ = ["StrikelineApp"]

READOUT_LINES = 13
FLAG_TEXT_INTERVAL = 1.0
"""s: numbers inside flag reasons refresh this often; levels change at once."""
_PANELS = ("title", "channels", "readouts", "plot", "flags", "history", "events", "message", "keys")


class StrikelineApp(KeyActions, App[None]):
    """The live tuning screen."""

    CSS_PATH = "app.tcss"
    TITLE = "strikeline"
    ENABLE_COMMAND_PALETTE = False
    AUTO_FOCUS = None  # keys belong to the screen; the entry line takes focus only when asked
    HORIZONTAL_BREAKPOINTS = [(0, "-narrow"), (72, "-normal"), (120, "-wide")]
    VERTICAL_BREAKPOINTS = [(0, "-short"), (21, "-normal"), (30, "-tall")]
    BINDINGS = BINDINGS

    def __init__(
        self,
        session: Session,
        *,
        make_source: Callable[[], Any] | None = None,
        mode: str = "live",
        show_caution: bool = False,
        caution_marker: Path | None = None,
        clock: Callable[[], float] = time.monotonic,
        plot_interval: float = 1.0,
        units: str = "SI",
        notes: tuple[str, ...] = (),
    ):
        super().__init__()
        self.session = session
        self.make_source = make_source
        """Builds the readings' source (instruments or a replay) once the first frame is out."""
        self.source: Any = None
        self.mode = mode
        self.show_caution = show_caution
        self.caution_marker = caution_marker
        self.clock = clock
        self.plot_interval = plot_interval
        self.units = units
        self.selected = "pressure"
        self.convention = "peak"
        """How an alternating supply's voltages are shown and typed: peak, rms or pp."""
        self.paused = False
        self.leaving = False
        """Set once the screen is quitting: nothing more is drawn and no source runs."""
        self.entry_field: str | None = None
        self.view_ = None
        self.events: deque[str] = deque(maxlen=200)
        self.history_p: deque[float | None] = deque(maxlen=600)
        self.history_v: deque[float | None] = deque(maxlen=600)
        self.logbook_trouble: str | None = None
        self.latency_probe: Callable[[float], None] | None = None
        self.start_notes = notes
        """Said as the first events (e.g. the lines a replayed logbook skipped)."""
        self.panels: dict[str, Any] = {}
        """The screen's fixed widgets by id, looked up once when mounted."""
        self.plot_stale = True
        """The curve must be redrawn even if its inputs look unchanged."""
        self.stamp: Callable[[], str] = lambda: time.strftime("%H:%M:%S")
        """The time an event line is stamped with."""
        self.history_interval = HEARTBEAT
        """s between the history strip's samples."""
        self._shown: dict[str, str] = {}
        self._plot_key: tuple | None = None
        self._flag_levels: tuple | None = None
        self.pacer = Pacer()
        self._soon = None
        """The frame a burst of readings is waiting for."""
        self._stale = None
        """The frame due when the next reading goes stale."""
        self._flags_at = -math.inf

    # -- layout and life cycle ----------------------------------------------------------

    def compose(self) -> ComposeResult:
        yield Static(id="title")
        yield Static(id="channels")
        with Horizontal(id="main"):
            # Line panels: a reading repaints only the lines whose text changed.
            yield LinesView(id="readouts")
            yield LinesView(id="plot")
        yield Static(id="flags")
        yield Static(id="history")
        yield Static(id="events")
        yield Static(id="message")
        yield Static(KEY_HINTS, id="keys")

    def on_mount(self) -> None:
        self.panels = {name: self.query_one(f"#{name}") for name in _PANELS}
        self.panels["plot"].border_title = "breakdown curve"
        about = f" | {self.session.profile.description}" if self.session.profile.description else ""
        self.note(f"{self.mode} on {self.session.profile.label}; '?' for keys and cautions{about}")
        for text in self.start_notes:
            self.record_event(text)
        book = self.session.logbook
        if book is not None and book.error is not None:  # it failed before the screen existed
            self.logbook_trouble = book.error
            self.note(book.error, error=True)
            self.record_event(book.error)
        self._draw_title()
        self._draw_channels()
        self.panels["readouts"].show([Text("working out the forecast...")])
        self.call_after_refresh(self._fill_in)  # the first frame waits for neither the model nor the ports
        if self.show_caution:
            from .dialogs import CautionScreen

            self.push_screen(CautionScreen(), self._caution_seen)

    def _fill_in(self) -> None:
        """After the first frame: the forecast (numpy loads here), the curve (plotext), the timers and
        then the readings (pyserial)."""
        if not self.live():
            return
        self.refresh_view()
        self.redraw_plot()
        self.set_interval(HEARTBEAT, self.refresh_view)  # readings that matter draw at once (on_fresh)
        self.set_interval(self.plot_interval, self.redraw_plot)
        self.set_interval(self.history_interval, self.sample_history)
        if self.make_source is not None:
            self.source = self.make_source()
            self.source.start()

    def _caution_seen(self, _result=None) -> None:
        if self.caution_marker is not None:
            try:
                self.caution_marker.parent.mkdir(parents=True, exist_ok=True)
                self.caution_marker.write_text(f"cautions shown {iso_utc(time.time())}\n")
            except OSError:
                pass

    def leave(self) -> None:
        """Stop drawing and stop the readings' source: the screen is going away."""
        self.leaving = True
        if self.source is not None:
            self.source.stop()

    def live(self) -> bool:
        """Whether the screen should draw: it is running and not on its way out. A timer or a
        reading can arrive while the screen is torn down (quit, or the terminal gone)."""
        return self.is_running and not self.leaving

    def on_unmount(self) -> None:
        self.leave()
        if hasattr(self.source, "stats"):
            self.session.log_counts(self.source.stats())
        if self.session.logbook is not None:
            self.session.logbook.close()

    # -- from the threads ---------------------------------------------------------

    def wants(self, reading) -> bool:
        """Whether a reading just handled (any thread) changes what the screen shows: a strike the
        instruments showed, a change of state, or a shown value moving by more than noise. Paused or
        going away, nothing does."""
        if self.paused or not self.live():
            return False
        return bool(self.session.marks.seen) or self.pacer.worth_a_frame(self.session.latest.all(self.clock()))

    def on_fresh(self, message: Fresh) -> None:
        if self.latency_probe is not None:
            self.latency_probe(message.t_sent)
        if not self.paused and self.live() and self.wants(None):
            wait = self.pacer.wait(self.clock())
            if not wait:
                self._frame_due()
            elif self._soon is None:  # a burst: one frame of the latest values, MIN_FRAME after the last
                self._soon = self.set_timer(wait, self._frame_due)

    def on_port_note(self, m: PortNote) -> None:
        self.record_event(f"{m.port}: {m.kind} {m.text}")

    def on_skipped(self, m: Skipped) -> None:
        self.record_event(m.text)

    def on_replay_note(self, m: ReplayNote) -> None:
        rec = m.record
        kind = rec.get("kind")
        if kind == "strike":
            self.record_event(
                f"(replay) strike mark at {rec.get('pressure_Pa', 0):.4g} Pa, {rec.get('voltage_V', 0):.0f} V"
            )
        elif kind == "event":
            self.record_event(f"(replay) {rec.get('port')}: {rec.get('event')} {rec.get('message', '')}")
        elif kind == "replay-end":
            self.record_event("replay finished")

    def on_logbook_note(self, m: LogbookNote) -> None:
        self.logbook_trouble = m.text
        self.note(m.text or "logbook writing again", error=m.text is not None)
        self.record_event(m.text or "logbook writing again")
        self.refresh_view()

    # -- drawing ------------------------------------------------------------------

    def _set(self, widget_id: str, content: Text) -> None:
        key = content.plain + "|" + "".join(str(s.style) for s in content.spans)
        if self._shown.get(widget_id) != key:
            self._shown[widget_id] = key
            self.panels[widget_id].update(content, layout=False)  # fixed sizes: no relayout

    def note(self, text: str, error: bool = False) -> None:
        """Say ``text`` on the message line (reversed when it reports an error)."""
        self.panels["message"].update(Text(text, style="bold reverse" if error else ""))

    def record_event(self, text: str) -> None:
        """Add a timestamped line to the events strip."""
        self.events.append(f"{self.stamp()} {text}")
        self._draw_events()

    def _frame_due(self) -> None:
        self._soon = None
        self.pacer.paced(self.clock())
        self.refresh_view()

    def _arm_stale(self, now: float) -> None:
        # a reading about to go stale brings its own frame: the screen never shows it live past its limit
        if self._stale is not None:
            self._stale.stop()
        at = self.session.latest.next_stale(now)
        self._stale = None if at is None else self.set_timer(at - now + 0.005, self._stale_due)

    def _stale_due(self) -> None:
        self._stale = None
        if not self.live():
            return
        now = self.clock()
        if self.pacer.worth_a_frame(self.session.latest.all(now)):  # a channel went stale
            self.refresh_view()
        else:  # a newer reading arrived in time: wait for its own limit
            self._arm_stale(now)

    def refresh_view(self) -> None:
        """Ask the Session for the forecast now and redraw what changed."""
        if not self.live():
            return
        now = self.clock()
        self.pacer.drawn(self.session.latest.all(now))
        self._arm_stale(now)
        if self.paused and self.view_ is not None:
            self._draw_title()
            return
        fill_before = self.session.bench.composition
        view = self.session.view(self.clock())
        previous = self.view_
        self.view_ = view
        for pending in view.proposed:
            m = pending.mark
            text = in_units(
                f"strike seen: {m.voltage:.0f} V at {m.pressure:.4g} Pa ({pending.proposal.signal})", self.units
            )
            self.record_event(text)
            self.note(f"{text}: y keeps it as a mark, n drops it", error=True)
        if self.session.bench.composition != fill_before and view.fill_source == "flows":
            self.plot_stale = True
            self.record_event(
                f"gas from the flows: {fill_label(self.session.bench)} (steady state, every gas pumped alike)"
            )
        self._draw_title()
        self._draw_channels()
        self._draw_readouts(view)
        self._draw_flags(view, previous)
        self._draw_events()

    def _draw_title(self) -> None:
        b = self.session.bench
        f = None if self.view_ is None else self.view_.forecast
        gamma = b.yield_().value if f is None else f.gamma  # a mixture's is the forecast's
        t = Text()
        t.append("strikeline ", style="bold")
        t.append(f"{self.session.profile.label} | {fill_label(b)} / {b.cathode.symbol} | γ {gamma:.3g}")
        t.append(f" | {supply_label(b.supply, self.convention)} | {self.units}")
        if self.paused:
            t.append(" | PAUSED", style="bold reverse")
        if self.logbook_trouble:
            t.append(" | LOGBOOK FAILING", style="bold reverse")
        t.append(" | advisory only")
        self._set("title", t)

    def _draw_channels(self) -> None:
        readings = self.session.latest.all(self.clock())
        t = Text()
        for i, (text, style) in enumerate(
            channel_line(readings, self.paused, not self.session.use_gauge, self.mode == "replay", self.session.labels)
        ):
            if i:
                t.append(" | ")
            t.append(text, style=STYLE[style])
        if hasattr(self.source, "stats"):
            from ..drivers.hub import fault_summary

            for text in fault_summary(self.source.stats()):  # counted and shown, never taken for values
                t.append(" | ")
                t.append(text, style="bold")
        self._set("channels", t)

    def _draw_readouts(self, view) -> None:
        v = self.session.values
        convention = self.convention if self.session.alternating else None
        fill = fill_label(self.session.bench)
        wide = self.size.width >= 120
        rows = readout_lines(view, self.units, self.selected, v["gap"], v["voltage"], fill, convention, wide)
        lines = []
        for label, value, style in rows[:READOUT_LINES]:
            t = Text()
            t.append(f"{label:<12}", style="bold" if label.startswith(">") else "")
            t.append(value, style=STYLE[style])
            lines.append(t)
        self.panels["readouts"].show(lines)

    def readouts_text(self) -> str:
        """The readouts as plain text (what the operator sees in that panel)."""
        return self.panels["readouts"].plain

    def _draw_flags(self, view, previous) -> None:
        rows = flag_lines(view.forecast, self.units)
        levels = (view.withdrawn, self.units, tuple((level, code) for level, code, _ in rows))
        now = self.clock()
        if levels == self._flag_levels and now - self._flags_at < FLAG_TEXT_INTERVAL:
            self._flag_events(view, previous)
            return
        self._flag_levels, self._flags_at = levels, now
        panel = self.panels["flags"]
        t, wrapped = flags_text(rows, view.withdrawn if view.forecast is None else None, *panel.size)
        panel.set_class(wrapped, "-wrapped")  # whole sentences where the rows allow, else one line each
        self._set("flags", t)
        self._flag_events(view, previous)

    def _flag_events(self, view, previous) -> None:
        # The Session works out the changes (and logs them); a withdrawal is one event, not a
        # "cleared" per flag.
        if previous is not None and previous.forecast is not None and view.forecast is not None:
            for change, x in view.flag_changes:
                if x.level != "ok":
                    self.record_event(
                        f"flag {x.level.upper()} {x.code}" if change == "raised" else f"flag cleared {x.code}"
                    )
        if (previous is None or previous.withdrawn is None) and view.withdrawn is not None:
            self.record_event(f"forecast withdrawn: {view.withdrawn}")
        elif previous is not None and previous.withdrawn is not None and view.withdrawn is None:
            self.record_event("forecast back")

    def _draw_events(self) -> None:
        text = "\n".join(list(self.events)[-3:][::-1]) or "no events yet"
        self._set("events", Text(text, no_wrap=True, overflow="ellipsis"))

    def sample_history(self) -> None:
        """Add the latest pressure and breakdown voltage to the history strip (every heartbeat)."""
        v = self.view_
        if v is None or self.paused or not self.live():
            return
        self.history_p.append(v.pressure.value)
        self.history_v.append(None if v.forecast is None else v.forecast.breakdown_voltage)
        width = max(self.panels["history"].size.width - 34, 10)
        pu = UNIT_SYSTEMS[self.units][0]
        good = [p for p in self.history_p if p is not None]
        span = ""
        if good:
            from ..model.units import format_value

            span = f" {format_value(min(good), 'pressure', pu)}..{format_value(max(good), 'pressure', pu)}"
        t = Text(no_wrap=True, overflow="ellipsis")
        t.append(f"pressure  {sparkline(list(self.history_p), width)}{span}")
        seconds = len(self.history_p) * self.history_interval
        t.append(f"\nbreakdown {sparkline(list(self.history_v), width)} last {seconds:.0f} s")
        self._set("history", t)

    def use_curve(self, cv) -> None:
        """Forecast with this bench curve from now on (this session)."""
        self.session.use_curve(cv)
        self.plot_stale = True
        self.record_event(f"bench curve in use: {cv.n_points} strikes, rms {cv.rms_residual:.0f} V")
        self.refresh_view()

    def _marks_here(self) -> tuple[tuple[float, float], ...]:
        """This session's strikes in the gas fill in use, as (pd, V) for the live curve."""
        fill = self.session.bench.composition
        return tuple((m.pressure * m.gap, m.voltage) for m in self.session.strikes if not m.gas or m.gas == fill)

    def redraw_plot(self) -> None:
        """Redraw the curve if what it shows has moved by a character cell (on its own timer)."""
        from .curve_panel import live_curve
        from .plot import curve_picture, legend

        if not self.live():
            return
        plot = self.panels["plot"]
        found = live_curve(
            self.session.bench,
            self.session.values,
            self.view_,
            self.units,
            plot.size.width,  # size is the content area, inside the border
            plot.size.height,
            colour=not self.no_color,
            marks=self._marks_here(),
            known=None if self.plot_stale else self._plot_key,
        )
        if found is None:
            return
        key, inputs = found
        if inputs is None or (key == self._plot_key and not self.plot_stale):
            return
        self._plot_key, self.plot_stale = key, False
        plot.show_ansi(curve_picture(inputs))  # only the lines that changed go to the terminal
        key_line = legend(inputs, plot.size.width - 2)
        if plot.border_subtitle != key_line:
            plot.border_subtitle = key_line
