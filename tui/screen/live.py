"""The live tuning screen (Textual): layout, life cycle, what reaches it from threads, when it draws,
and what each key does.

The consumer of the instruments' readings hands each to the Session (which logs it, every one) and
posts a small :class:`~strikeline.tui.screen.messages.Fresh` message only when it changes what is
shown (:mod:`~strikeline.tui.screen.pacing`); a burst becomes one frame of the latest values. The
panels are widgets that own what they show and repaint only when it changed
(:mod:`~strikeline.tui.screen.panels`); the keys are declared once in
:mod:`~strikeline.tui.screen.keys`. Built only by :func:`strikeline.tui.screen.build.make_app`.
"""

from __future__ import annotations

import time
from collections import deque
from collections.abc import Callable
from pathlib import Path
from typing import Any

from rich.text import Text
from textual.app import App, ComposeResult
from textual.containers import Horizontal
from textual.widgets import Static

from ..session.session import Session
from ..text import fill_label, pressure_text
from .keys import KEY_HINTS
from .main import MainScreen
from .messages import Fresh, LogbookNote, PortNote, ReplayNote, Skipped
from .pacing import HEARTBEAT, Pacer
from .panels import (
    CurvePanel,
    EventsStrip,
    FlagsPanel,
    HistoryStrip,
    MessageLine,
    Readouts,
    TextLine,
    channels_text,
    flag_events,
    title_facts,
)
from .readouts import channel_line, flag_lines

__all__ = ["StrikelineApp"]


class StrikelineApp(App[None]):
    """The live tuning screen."""

    CSS_PATH = "app.tcss"
    TITLE = "strikeline"
    ENABLE_COMMAND_PALETTE = False
    AUTO_FOCUS = None  # keys belong to the screen; the entry line takes focus only when asked
    HORIZONTAL_BREAKPOINTS = [(0, "-narrow"), (72, "-normal"), (120, "-wide")]
    VERTICAL_BREAKPOINTS = [(0, "-short"), (21, "-normal"), (30, "-tall")]

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
        self.view_ = None
        self.logbook_trouble: str | None = None
        self.latency_probe: Callable[[float], None] | None = None
        self.start_notes = notes
        """Said as the first events (e.g. the lines a replayed logbook skipped)."""
        self.stamp: Callable[[], str] = lambda: time.strftime("%H:%M:%S")
        """The time an event line is stamped with (set before the screen is composed)."""
        self.history_interval = HEARTBEAT
        """s between the history strip's samples (set before the screen is composed)."""
        self.pacer = Pacer()
        self.panels: dict[str, Any] = {}
        """The panels by id, looked up once when mounted (a panel removed under a reading is drawn to, harmlessly)."""
        self.main: MainScreen | None = None
        """The screen the panels sit on and the keys act on (made with the app's first screen)."""
        self._soon = None
        """The frame a burst of readings is waiting for."""
        self._stale = None
        """The frame due when the next reading goes stale."""

    # -- layout and life cycle ----------------------------------------------------------

    def get_default_screen(self) -> MainScreen:
        self.main = MainScreen(id="_default")  # its panels are queried directly, even under a dialog
        return self.main

    def compose(self) -> ComposeResult:
        yield TextLine(id="title")
        yield TextLine(id="channels")
        with Horizontal(id="main"):
            yield Readouts(id="readouts")
            yield CurvePanel(id="plot")
        yield FlagsPanel(id="flags")
        yield HistoryStrip(id="history", interval=self.history_interval)
        yield EventsStrip(id="events", stamp=self.stamp)
        yield MessageLine(id="message")
        yield Static(KEY_HINTS, id="keys")

    def on_mount(self) -> None:
        self.started()

    def started(self) -> None:
        """The main screen is composed: say hello, draw what needs no model, and fill in after the frame."""
        self.panels = {
            w.id: w for w in self.main.query("#title, #channels, #readouts, #plot, #flags, #history, #events, #message")
        }
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
        self.panels["events"].draw()
        self._draw_title()
        self._draw_channels()
        self.panels["readouts"].show([Text("working out the forecast...")])
        self.call_after_refresh(self._fill_in)  # the first frame waits for neither the model nor the ports
        if self.show_caution:
            from .dialogs import CautionScreen

            self.push_screen(CautionScreen(self.caution_marker))

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

    def wants(self) -> bool:
        """Whether the readings just handled (any thread) change what the screen shows: a strike the
        instruments showed, a change of state, or a shown value moving by more than noise. Paused or
        going away, nothing does."""
        if self.paused or not self.live():
            return False
        return bool(self.session.marks.seen) or self.pacer.worth_a_frame(self.session.latest.all(self.clock()))

    def on_fresh(self, message: Fresh) -> None:
        if self.latency_probe is not None:
            self.latency_probe(message.t_sent)
        if self.wants():
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
        if (text := m.text()) is not None:
            self.record_event(text)

    def on_logbook_note(self, m: LogbookNote) -> None:
        self.logbook_trouble = m.text
        self.note(m.text or "logbook writing again", error=m.text is not None)
        self.record_event(m.text or "logbook writing again")
        self.refresh_view()

    # -- when the screen draws ------------------------------------------------------

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
        view = self.session.update(self.clock())
        previous = self.view_
        self.view_ = view
        for pending in view.proposed:
            m = pending.mark
            at = pressure_text(m.pressure, self.units)
            text = f"strike seen: {m.voltage:.0f} V at {at} ({pending.proposal.signal})"
            self.record_event(text)
            self.note(f"{text}: y keeps it as a mark, n drops it", error=True)
        if self.session.bench.composition != fill_before and view.fill_source == "flows":
            self.panels["plot"].stale = True
            self.record_event(
                f"gas from the flows: {fill_label(self.session.bench)} (steady state, every gas pumped alike)"
            )
        self._draw_title()
        self._draw_channels()
        v = self.session.values
        convention = self.convention if self.session.alternating else None
        wide = self.size.width >= 120
        fill = fill_label(self.session.bench)
        self.panels["readouts"].draw(view, self.units, self.selected, v, fill, convention, wide)
        rows = flag_lines(view.forecast, self.units)
        self.panels["flags"].draw(rows, view.withdrawn if view.forecast is None else None, self.units, now)
        for text in flag_events(view, previous):
            self.record_event(text)

    # -- what the panels are told ---------------------------------------------------------

    def note(self, text: str, error: bool = False) -> None:
        """Say ``text`` on the message line (reversed when it reports an error)."""
        self.panels["message"].say(text, error)

    def record_event(self, text: str) -> None:
        """Add a timestamped line to the events strip."""
        self.panels["events"].add(text)

    @property
    def events(self) -> deque[str]:
        """The events said so far (the strip keeps the last 200)."""
        return self.panels["events"].events

    def readouts_text(self) -> str:
        """The readouts as plain text (what the operator sees in that panel)."""
        return self.panels["readouts"].plain

    def _draw_title(self) -> None:
        facts = title_facts(
            self.session, self.view_, self.convention, self.units, self.paused, bool(self.logbook_trouble)
        )
        self.panels["title"].set_text(facts.text())

    def _draw_channels(self) -> None:
        s = self.session
        parts = channel_line(s.latest.all(self.clock()), self.paused, not s.use_gauge, self.mode == "replay", s.labels)
        faults = []
        if hasattr(self.source, "stats"):
            from ...drivers.hub import fault_summary

            faults = fault_summary(self.source.stats())
        self.panels["channels"].set_text(channels_text(parts, faults))

    def sample_history(self) -> None:
        """Add the latest pressure and breakdown voltage to the history strip (every heartbeat)."""
        v = self.view_
        if v is None or self.paused or not self.live():
            return
        f = v.forecast
        self.panels["history"].sample(v.pressure.value, None if f is None else f.breakdown_voltage, self.units)

    def use_curve(self, cv) -> None:
        """Forecast with this bench curve from now on (this session)."""
        self.session.use_curve(cv)
        self.panels["plot"].stale = True
        self.record_event(f"bench curve in use: {cv.n_points} strikes, rms {cv.rms_residual:.0f} V")
        self.refresh_view()

    def redraw_plot(self) -> None:
        """Redraw the curve if what it shows has moved by a character cell (on its own timer)."""
        if not self.live():
            return
        fill = self.session.bench.composition
        marks = tuple((m.pressure * m.gap, m.voltage) for m in self.session.strikes if not m.gas or m.gas == fill)
        s = self.session
        panel = self.panels["plot"]
        key_line = panel.draw(s.bench, s.values, self.view_, self.units, not self.no_color, marks)
        if key_line is not None and panel.border_subtitle != key_line:
            panel.border_subtitle = key_line

    def said(self, text: str, error: bool) -> None:
        """Say ``text`` as an event and on the message line (from a worker, through call_from_thread)."""
        self.record_event(text)
        self.note(text, error=error)
