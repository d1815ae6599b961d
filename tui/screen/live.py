"""The live tuning screen (Textual): layout, life cycle, what reaches it from threads, and when it draws.

Reader threads hand each reading to the Session (which logs it, every one) and post a small
:class:`~strikeline.tui.screen.messages.Fresh` message only when it changes what is shown
(:mod:`~strikeline.tui.screen.pacing`); a burst becomes one frame of the latest values. Only the widgets
whose text changed repaint (what each panel shows: :mod:`~strikeline.tui.screen.panels`). Built only by
:func:`strikeline.tui.screen.build.make_app`.
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

from ...drivers.logbook import iso_utc
from ..session.session import Session
from ..text import fill_label, pressure_text
from .keys import BINDINGS, KEY_HINTS, KeyActions
from .lines_view import LinesView
from .messages import Fresh, LogbookNote, PortNote, ReplayNote, Skipped
from .pacing import HEARTBEAT, Pacer
from .panels import PanelDrawing

__all__ = ["StrikelineApp"]

_PANELS = ("title", "channels", "readouts", "plot", "flags", "history", "events", "message", "keys")


class StrikelineApp(KeyActions, PanelDrawing, App[None]):
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
            text = (
                f"strike seen: {m.voltage:.0f} V at {pressure_text(m.pressure, self.units)} ({pending.proposal.signal})"
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
