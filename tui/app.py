"""The live tuning screen (Textual), built by one factory: :func:`make_app`.

Reader threads hand each reading to the Session (which logs it) and post a small
:class:`Fresh` message; a burst of them collapses to one, so the screen never backs up.
The readouts update per message; the curve redraws on its own slow timer and only when
what it shows has moved by at least a character cell.
"""

from __future__ import annotations

import math
import time
from collections import deque
from collections.abc import Callable
from dataclasses import replace
from pathlib import Path
from typing import Any

from rich.text import Text
from textual.app import App, ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.css.query import NoMatches
from textual.message import Message
from textual.screen import ModalScreen
from textual.widgets import Static

from ..drivers.logbook import Logbook, ReplaySource, iso_utc
from ..drivers.reading import Reading
from ..profiles.loader import BenchProfile
from .plot import LEGEND, CurveInputs
from .readouts import NUDGE_FIELDS, channel_line, flag_lines, pd_display, readout_lines, sparkline
from .session import Session, StrikeMark
from .text import UNIT_SYSTEMS

__all__ = ["CAUTION", "StrikelineApp", "make_app"]

CAUTION = (
    "HIGH VOLTAGE CAN KILL. strikeline is advisory: it reads instruments and controls nothing, "
    "and a forecast of 'no strike' does not make a chamber safe to touch. Keep the interlocks "
    "working. Switch off, discharge and ground the supply and cathode before opening the chamber. "
    "Near live parts work one-handed and never alone. Local electrical codes, your lab's safety "
    "officer and licensed practice come first."
)

_STYLE = {"bad": "bold reverse", "warn": "bold", "good": "", "": ""}
_LEVEL_STYLE = {"DANGER": "bold reverse red", "WATCH": "bold yellow", "ok": "green"}
_FINE, _COARSE = 1.02, 1.25
_READOUT_LINES = 11
_FLAG_TEXT_INTERVAL = 1.0  # s: numbers inside flag reasons refresh this often; levels at once
_PROMPTS = {
    "pressure": "pressure (true), e.g. 20 Pa, 150 mTorr, 0.2 mbar",
    "gap": "gap, e.g. 30 mm, 3 cm",
    "voltage": "supply voltage, e.g. 600 V, 1.2 kV",
    "temperature": "gas temperature, e.g. 293 K, 20 C",
    "gas": "gas, e.g. argon, Ar, N2, air, He",
    "cathode": "cathode, e.g. Cu, Al, stainless, Ti, Mo, W",
}


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


class LogbookNote(Message):
    """The logbook started or stopped failing (text None: writing again)."""

    def __init__(self, text: str | None):
        super().__init__()
        self.text = text


class CautionScreen(ModalScreen[None]):
    """The high-voltage cautions, shown on first start and on request."""

    BINDINGS = [Binding("enter,escape,space", "dismiss", "continue")]

    def compose(self) -> ComposeResult:
        with Vertical(id="caution-box"):
            yield Static("strikeline: before you start", id="caution-title")
            yield Static(CAUTION, id="caution-text")
            yield Static("Press Enter to continue.", id="caution-hint")


KEY_HINTS = "p g v type  arrows nudge  u units  s strike  d flags  k calib  ? help  q quit"
"""The bottom line: the keys a technician needs most (every key is in the help screen)."""

HELP_KEYS = [
    ("p g v t", "type pressure, gap, supply voltage, gas temperature"),
    ("G  C", "switch gas, switch cathode"),
    ("left right", "choose which value the arrows nudge (marked >)"),
    ("up down", f"nudge it by {(_FINE - 1):.0%}"),
    ("PgUp PgDn", f"nudge it by {(_COARSE - 1):.0%}"),
    ("f", "follow the gauge again after typing a pressure"),
    ("u", "units: SI (Pa, mm) / mbar / Torr"),
    ("space", "pause / resume the live view (readings are still logged)"),
    ("s", "mark a strike: you saw ignition at this point"),
    ("d", "all flags with their full reasons"),
    ("k", "calibration: fit this bench's curve to its strike marks"),
    ("escape", "cancel typing"),
    ("?", "this help"),
    ("q", "quit"),
]


class HelpScreen(ModalScreen[None]):
    """Cautions first (they must always be whole), then every key; scrolls on small terminals."""

    BINDINGS = [Binding("escape,q,question_mark,enter", "dismiss", "close")]

    def compose(self) -> ComposeResult:
        from textual.containers import VerticalScroll

        lines = Text()
        lines.append(CAUTION + "\n\n", style="bold")
        lines.append("keys (values take units, e.g. 20 Pa, 30 mm, 600 V)\n")
        for k, what in HELP_KEYS:
            lines.append(f"  {k:<11} {what}\n")
        with VerticalScroll(id="help-box"):
            yield Static(lines)
            yield Static("Escape closes.", id="caution-hint")


class FlagsScreen(ModalScreen[None]):
    BINDINGS = [Binding("escape,q,d,enter", "dismiss", "close")]

    def __init__(self, rows: list[tuple[str, str, str]]):
        super().__init__()
        self.rows = rows

    def compose(self) -> ComposeResult:
        t = Text()
        for level, code, reason in self.rows or [("ok", "none", "no flags")]:
            t.append(f"{level:<6} {code}\n", style=_LEVEL_STYLE.get(level, ""))
            t.append(f"       {reason}\n")
        with Vertical(id="help-box"):
            yield Static(t)
            yield Static("Escape closes.", id="caution-hint")


class CalibrationScreen(ModalScreen[None]):
    """Fit this bench's curve to the session's strike marks; accept, save or discard."""

    BINDINGS = [
        Binding("1", "free('A,B')", "fit A,B"),
        Binding("2", "free('B,gamma')", "fit B,gamma"),
        Binding("3", "free('gamma')", "fit gamma"),
        Binding("a", "accept", "accept"),
        Binding("w", "write", "save to bench file"),
        Binding("escape,k", "dismiss", "discard"),
    ]

    def __init__(self, main: StrikelineApp):
        super().__init__()
        self.main = main
        self.free = "A,B"
        self.cal = None

    def compose(self) -> ComposeResult:
        with Vertical(id="calib-box"):
            yield Static(id="calib-text")
            yield Static(id="calib-plot")
            yield Static(
                "1 fit A,B  2 fit B,gamma  3 fit gamma  a accept  w save to bench  Esc discard", id="calib-hint"
            )

    def on_mount(self) -> None:
        self.refit()
        self.call_after_refresh(self.draw)  # the picture needs its laid-out size

    def refit(self) -> None:
        from ..model.calibration import FitRefused
        from .calibrate import calibrate, calibration_summary, parse_free

        s = self.main.session
        marks = s.strikes
        text = self.query_one("#calib-text", Static)
        pts = [(m.pressure, m.gap, m.voltage, m.gas_temperature) for m in marks]
        labels = [f"mark {i + 1}" for i in range(len(marks))]
        try:
            self.cal = calibrate(replace(s.bench, curve=None), pts, labels, parse_free(self.free))
        except FitRefused as e:
            self.cal = None
            text.update(Text(f"{len(marks)} strike marks this session (s marks one).\nfit {self.free}: refused: {e}"))
            return
        text.update(Text(calibration_summary(self.cal), no_wrap=True, overflow="ellipsis"))
        self.draw()

    def draw(self) -> None:
        import numpy as np

        from ..model import paschen
        from ..model.calibration import prediction_band
        from ..model.forecast import curve
        from .plot import curve_picture

        if self.cal is None:
            return
        b = self.main.session.bench
        c = b.gas.constants
        pd_min, v_min = paschen.minimum(c.A, c.B, b.yield_().value)
        lo, hi = min(self.cal.pd) / 3, max(self.cal.pd) * 3
        rpd = np.geomspace(lo, hi, 120)
        vb, _w = curve(rpd, replace(b, curve=None))
        fv, flo, fhi = prediction_band(self.cal.result.curve, rpd)
        size = self.query_one("#calib-plot").size
        w, h = size.width or 70, size.height or 10
        self.query_one("#calib-plot", Static).update(
            Text.from_ansi(
                curve_picture(
                    CurveInputs(
                        pd=tuple(rpd),
                        vb=tuple(vb),
                        point=None,
                        minimum=(pd_min, v_min),
                        supply=None,
                        fitted=(tuple(rpd), tuple(fv), tuple(flo), tuple(fhi)),
                        marks=tuple(zip(self.cal.pd, self.cal.voltage, strict=True)),
                        pd_unit="Pa m (reduced)",
                        width=max(w, 30),
                        height=max(h, 6),
                        colour=not self.main.no_color,
                    )
                )
            )
        )

    def action_free(self, free: str) -> None:
        self.free = free
        self.refit()

    def action_accept(self) -> None:
        if self.cal is None:
            self.main._note("nothing to accept: the fit was refused", error=True)
            return
        self.main.use_curve(self.cal.result.curve)
        self.dismiss()

    def action_write(self) -> None:
        from ..profiles.loader import ProfileError, save_curve

        if self.cal is None:
            self.main._note("nothing to save: the fit was refused", error=True)
            return
        path = self.main.session.profile.path
        if path is None:
            self.main._note(
                "this bench is built in: copy it to a file to save a curve (accepted for this session)", error=True
            )
            self.main.use_curve(self.cal.result.curve)
            self.dismiss()
            return
        try:
            save_curve(path, self.cal.result.curve)
        except ProfileError as e:
            self.main._note(str(e), error=True)
            return
        self.main.use_curve(self.cal.result.curve)
        self.main._note(f"bench curve saved into {path}")
        self.dismiss()


class StrikelineApp(App[None]):
    """The live tuning screen."""

    CSS_PATH = "app.tcss"
    TITLE = "strikeline"
    ENABLE_COMMAND_PALETTE = False
    AUTO_FOCUS = None  # keys belong to the screen; the entry line takes focus only when asked
    HORIZONTAL_BREAKPOINTS = [(0, "-narrow"), (72, "-normal")]
    VERTICAL_BREAKPOINTS = [(0, "-short"), (21, "-normal"), (30, "-tall")]
    BINDINGS = [
        Binding("p", "enter('pressure')", "pressure"),
        Binding("g", "enter('gap')", "gap"),
        Binding("v", "enter('voltage')", "volts"),
        Binding("t", "enter('temperature')", "temp", show=False),
        Binding("G", "enter('gas')", "gas", show=False),
        Binding("C", "enter('cathode')", "cathode", show=False),
        Binding("left", "select(-1)", "choose", show=False),
        Binding("right", "select(1)", "choose", show=False),
        Binding("up", f"nudge({_FINE})", "nudge", show=False),
        Binding("down", f"nudge({1 / _FINE})", "nudge", show=False),
        Binding("pageup", f"nudge({_COARSE})", "coarse", show=False),
        Binding("pagedown", f"nudge({1 / _COARSE})", "coarse", show=False),
        Binding("f", "follow", "gauge", show=False),
        Binding("u", "units", "units"),
        Binding("space", "pause", "pause"),
        Binding("s", "strike", "strike!"),
        Binding("d", "flags", "flags"),
        Binding("k", "calibrate", "calib"),
        Binding("question_mark", "help", "help"),
        Binding("escape", "cancel", "cancel", show=False),
        Binding("q", "quit", "quit"),
    ]

    def __init__(
        self,
        session: Session,
        *,
        make_source: Callable[[], Any] | None = None,
        mode: str = "live",
        show_caution: bool = False,
        caution_marker: Path | None = None,
        clock: Callable[[], float] = time.monotonic,
        plot_interval: float = 0.5,
        units: str = "SI",
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
        self.paused = False
        self.entry_field: str | None = None
        self.view_ = None
        self.events: deque[str] = deque(maxlen=200)
        self.history_p: deque[float | None] = deque(maxlen=600)
        self.history_v: deque[float | None] = deque(maxlen=600)
        self.logbook_trouble: str | None = None
        self.latency_probe: Callable[[float], None] | None = None
        self._shown: dict[str, str] = {}
        self._plot_key: tuple | None = None
        self._plot_dirty = True
        self._flag_levels: tuple | None = None
        self._flags_at = -math.inf

    # -- layout -------------------------------------------------------------------

    def compose(self) -> ComposeResult:
        yield Static(id="title")
        yield Static(id="channels")
        with Horizontal(id="main"):
            # One widget per line: a reading repaints only the lines whose text changed.
            with Vertical(id="readouts"):
                for i in range(_READOUT_LINES):
                    yield Static(id=f"r{i}", classes="readout")
            yield Static(id="plot")
        yield Static(id="flags")
        yield Static(id="history")
        yield Static(id="events")
        yield Static(id="message")
        yield Static(KEY_HINTS, id="keys")

    def on_mount(self) -> None:
        self.query_one("#plot").border_title = "breakdown curve"
        self.query_one("#plot").border_subtitle = LEGEND
        self._note(f"{self.mode} on {self.session.profile.label}; '?' for keys and cautions")
        book = self.session.logbook
        if book is not None and book.error is not None:  # it failed before the screen existed
            self.logbook_trouble = book.error
            self._note(book.error, error=True)
            self._event(book.error)
        self.refresh_view()
        self.set_interval(0.25, self.refresh_view)
        self.set_interval(self.plot_interval, self.redraw_plot)
        self.set_interval(1.0, self.sample_history)
        if self.make_source is not None:
            self.call_after_refresh(self._start_source)  # the first frame does not wait for ports
        if self.show_caution:
            self.push_screen(CautionScreen(), self._caution_seen)

    def _start_source(self) -> None:
        self.source = self.make_source()  # pyserial loads here, after the first frame
        self.source.start()

    def _caution_seen(self, _result=None) -> None:
        if self.caution_marker is not None:
            try:
                self.caution_marker.parent.mkdir(parents=True, exist_ok=True)
                self.caution_marker.write_text(f"cautions shown {iso_utc(time.time())}\n")
            except OSError:
                pass

    async def action_quit(self) -> None:
        self._stop_source()  # no more readings posted into a screen that is closing
        self.exit()

    def _stop_source(self) -> None:
        if self.source is not None:
            self.source.stop()

    def on_unmount(self) -> None:
        self._stop_source()
        if self.session.logbook is not None:
            self.session.logbook.close()

    # -- from the threads ---------------------------------------------------------

    def on_fresh(self, message: Fresh) -> None:
        if not self.paused:
            self.refresh_view()
        if self.latency_probe is not None:
            self.latency_probe(message.t_sent)

    def on_port_note(self, m: PortNote) -> None:
        self._event(f"{m.port}: {m.kind} {m.text}")

    def on_replay_note(self, m: ReplayNote) -> None:
        rec = m.record
        kind = rec.get("kind")
        if kind == "strike":
            self._event(f"(replay) strike mark at {rec.get('pressure_Pa', 0):.4g} Pa, {rec.get('voltage_V', 0):.0f} V")
        elif kind == "event":
            self._event(f"(replay) {rec.get('port')}: {rec.get('event')} {rec.get('message', '')}")
        elif kind == "replay-end":
            self._event("replay finished")

    def on_logbook_note(self, m: LogbookNote) -> None:
        self.logbook_trouble = m.text
        self._note(m.text or "logbook writing again", error=m.text is not None)
        self._event(m.text or "logbook writing again")
        self.refresh_view()

    # -- drawing ------------------------------------------------------------------

    def _set(self, widget_id: str, content: Text) -> None:
        key = content.plain + "|" + "".join(str(s.style) for s in content.spans)
        if self._shown.get(widget_id) != key:
            self._shown[widget_id] = key
            self.query_one(f"#{widget_id}", Static).update(content, layout=False)  # fixed sizes: no relayout

    def _closing(self) -> bool:
        """The screen is being torn down (quit): its widgets may already be gone."""
        return not self.is_running or not self.default_screen.children

    def refresh_view(self) -> None:
        try:
            self._refresh_view()
        except NoMatches:  # a timer or message arriving while the screen is torn down on quit
            if not self._closing():
                raise

    def _refresh_view(self) -> None:
        if self.paused and self.view_ is not None:
            self._draw_title()
            return
        view = self.session.view(self.clock())
        previous = self.view_
        self.view_ = view
        self._draw_title()
        self._draw_channels()
        self._draw_readouts(view)
        self._draw_flags(view, previous)
        self._draw_events()

    def _draw_title(self) -> None:
        b = self.session.bench
        gamma = b.yield_().value
        t = Text()
        t.append("strikeline ", style="bold")
        t.append(f"{self.session.profile.label} | {b.gas.key} / {b.cathode.key} | gamma {gamma:.3g} | {self.units}")
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
            channel_line(readings, self.paused, not self.session.use_gauge, self.mode == "replay")
        ):
            if i:
                t.append(" | ")
            t.append(text, style=_STYLE[style])
        if hasattr(self.source, "stats"):
            from ..drivers.hub import fault_summary

            for text in fault_summary(self.source.stats()):  # counted and shown, never taken for values
                t.append(" | ")
                t.append(text, style="bold")
        self._set("channels", t)

    def _draw_readouts(self, view) -> None:
        rows = readout_lines(
            view, self.units, self.selected, self.session.values["gap"], self.session.values["voltage"]
        )
        for i in range(_READOUT_LINES):
            t = Text(no_wrap=True, overflow="ellipsis")
            if i < len(rows):
                label, value, style = rows[i]
                t.append(f"{label:<12}", style="bold" if label.startswith(">") else "")
                t.append(value, style=_STYLE[style])
            self._set(f"r{i}", t)

    def readouts_text(self) -> str:
        """The readouts as plain text (what the operator sees in that panel)."""
        return "\n".join(self._shown.get(f"r{i}", "").split("|", 1)[0] for i in range(_READOUT_LINES))

    def _draw_flags(self, view, previous) -> None:
        rows = flag_lines(view.forecast)
        levels = (view.withdrawn, tuple((level, code) for level, code, _ in rows))
        now = self.clock()
        if levels == self._flag_levels and now - self._flags_at < _FLAG_TEXT_INTERVAL:
            self._flag_events(view, previous)
            return
        self._flag_levels, self._flags_at = levels, now
        t = Text(no_wrap=True, overflow="ellipsis")
        if view.forecast is None:
            t.append("WITHDRAWN ", style="bold reverse")
            t.append(f"no forecast: {view.withdrawn}")
        for i, (level, code, reason) in enumerate(rows):
            if i or view.forecast is None:
                t.append("\n")
            t.append(f"{level:<6} ", style=_LEVEL_STYLE.get(level, ""))
            t.append(f"{code}: {reason}")
        self._set("flags", t)
        self._flag_events(view, previous)

    def _flag_events(self, view, previous) -> None:
        # The Session works out the changes (and logs them); a withdrawal is one event, not a
        # "cleared" per flag.
        if previous is not None and previous.forecast is not None and view.forecast is not None:
            for change, x in view.flag_changes:
                if x.level != "ok":
                    self._event(f"flag {x.level.upper()} {x.code}" if change == "raised" else f"flag cleared {x.code}")
        if (previous is None or previous.withdrawn is None) and view.withdrawn is not None:
            self._event(f"forecast withdrawn: {view.withdrawn}")
        elif previous is not None and previous.withdrawn is not None and view.withdrawn is None:
            self._event("forecast back")

    def _event(self, text: str) -> None:
        self.events.append(f"{time.strftime('%H:%M:%S')} {text}")
        self._draw_events()

    def _draw_events(self) -> None:
        self._set(
            "events",
            Text("\n".join(list(self.events)[-3:][::-1]) or "no events yet", no_wrap=True, overflow="ellipsis"),
        )

    def sample_history(self) -> None:
        try:
            self._sample_history()
        except NoMatches:
            if not self._closing():
                raise

    def _sample_history(self) -> None:
        v = self.view_
        if v is None or self.paused:
            return
        self.history_p.append(v.pressure.value)
        self.history_v.append(None if v.forecast is None else v.forecast.breakdown_voltage)
        width = max(self.query_one("#history").size.width - 34, 10)
        pu = UNIT_SYSTEMS[self.units][0]
        good = [p for p in self.history_p if p is not None]
        span = ""
        if good:
            from ..model.units import format_value

            span = f" {format_value(min(good), 'pressure', pu)}..{format_value(max(good), 'pressure', pu)}"
        t = Text(no_wrap=True, overflow="ellipsis")
        t.append(f"pressure  {sparkline(list(self.history_p), width)}{span}")
        t.append(f"\nbreakdown {sparkline(list(self.history_v), width)} last {len(self.history_p)} s")
        self._set("history", t)

    def _plot_inputs(self) -> CurveInputs | None:
        # The numeric model loads with the first picture, not on the first frame's path.
        import numpy as np

        from ..model import paschen
        from ..model.forecast import curve

        v = self.view_
        s = self.session
        b = s.bench
        c = b.gas.constants
        gamma = b.yield_().value
        widget = self.query_one("#plot")
        width, height = widget.size.width, widget.size.height
        if width < 20 or height < 6:
            return None
        f = v.forecast if v is not None else None
        T = s.values["temperature"]
        scale = c.reference_temperature / T
        ratio = 1.0
        if f is not None and f.effective_pressure is not None:
            # Magnetised: in 5 % steps, so gauge noise does not redraw an unchanged picture.
            ratio = 10 ** (round(math.log10(f.effective_pressure / f.pressure) * 46) / 46)
        k = scale * ratio  # reduced pd = actual pd * k
        pd0 = paschen.no_breakdown_pd(c.A, gamma)
        pd_min, v_min = paschen.minimum(c.A, c.B, gamma)
        lo = pd0 * 1.01
        hi = pd_min * 300
        if f is not None:  # the operating point is always on the picture, even left of the asymptote
            lo = min(lo, f.reduced_pd / 2)
            hi = max(hi, f.reduced_pd * 3)
        rpd = np.geomspace(lo, hi, max(width * 2, 60))
        vb, _w = curve(rpd, replace(b, curve=None))  # the textbook line; a fit is drawn over it
        to_x = pd_display(1.0, self.units)
        point = None
        if f is not None:
            point = (f.pd * to_x, math.nan if f.breakdown_voltage is None else f.breakdown_voltage)
        cols = max(width - 8, 10)
        bucket = (
            None
            if point is None
            else (
                round(math.log10(point[0]) * cols / math.log10(hi / lo)),
                None if math.isnan(point[1]) else round(math.log10(point[1]) * height / 4),
            )
        )
        key = (
            b.gas.key,
            b.cathode.key,
            gamma,
            s.values["voltage"],
            self.units,
            width,
            height,
            bucket,
            T,
            ratio,
            b.curve,
        )
        if key == self._plot_key and not self._plot_dirty:
            return None
        self._plot_key, self._plot_dirty = key, False
        return CurveInputs(
            pd=tuple(rpd / k * to_x),
            vb=tuple(vb),
            point=point,
            minimum=(pd_min / k * to_x, v_min),
            supply=s.values["voltage"],
            fitted=self._fitted(rpd, k, to_x),
            pd_unit=" ".join(UNIT_SYSTEMS[self.units][2]),
            width=width,  # size is the content area, inside the border
            height=height,
            colour=not self.no_color,
        )

    def _fitted(self, rpd, k, to_x):
        from ..model.calibration import prediction_band

        cv = self.session.bench.curve
        b = self.session.bench
        if cv is None or cv.gas != b.gas.key or cv.cathode != b.cathode.key:
            return None
        v, lo, hi = prediction_band(cv, rpd)
        return tuple(rpd / k * to_x), tuple(v), tuple(lo), tuple(hi)

    def use_curve(self, cv) -> None:
        """Forecast with this bench curve from now on (this session)."""
        self.session.use_curve(cv)
        self._plot_dirty = True
        self._event(f"bench curve in use: {cv.n_points} strikes, rms {cv.rms_residual:.0f} V")
        self.refresh_view()

    def redraw_plot(self) -> None:
        from .plot import curve_picture

        try:
            inputs = self._plot_inputs()
        except NoMatches:
            if not self._closing():
                raise
            return
        if inputs is None:
            return
        self.query_one("#plot", Static).update(Text.from_ansi(curve_picture(inputs)))

    # -- actions ------------------------------------------------------------------

    def _note(self, text: str, error: bool = False) -> None:
        self.query_one("#message", Static).update(Text(text, style="bold reverse" if error else ""))

    def _entry(self):
        """The typing line, mounted the first time it is needed (its import and widget are not on
        the first frame's path)."""
        from textual.widgets import Input

        found = self.query("#entry")
        if found:
            return found.first(Input)
        entry = Input(id="entry")
        self.mount(entry, before=self.query_one("#message"))
        return entry

    def action_enter(self, field: str) -> None:
        self.entry_field = field
        entry = self._entry()
        entry.value = ""
        entry.placeholder = _PROMPTS[field]
        entry.display = True
        entry.focus()
        self._note(f"type the {field} and press Enter (Escape cancels)")

    def on_input_submitted(self, event) -> None:
        if event.input.id != "entry":
            return
        field = self.entry_field
        text = event.value.strip()
        self.action_cancel(quiet=True)
        if field is None or not text:
            return
        if field == "gas":
            err = self.session.set_gas(text)
        elif field == "cathode":
            err = self.session.set_cathode(text)
        else:
            err = self.session.set_value(field, text)
        if err:
            self._note(f"{err} (the old {field} is kept)", error=True)
        else:
            self._note(f"{field} set from {text!r}")
            self._plot_dirty = True
        self.refresh_view()

    def action_cancel(self, quiet: bool = False) -> None:
        found = self.query("#entry")
        if not found:
            return
        entry = found.first()
        if entry.display:
            entry.display = False
            self.entry_field = None
            self.set_focus(None)
            if not quiet:
                self._note("typing cancelled")

    def action_select(self, step: int) -> None:
        i = NUDGE_FIELDS.index(self.selected)
        self.selected = NUDGE_FIELDS[(i + step) % len(NUDGE_FIELDS)]
        self.refresh_view()

    def action_nudge(self, factor: float) -> None:
        if self.selected == "voltage" and self.session.values["voltage"] is None:
            self._note("no supply voltage to nudge: type one with v", error=True)
            return
        self.session.nudge(self.selected, factor)
        self._plot_dirty = True
        self.refresh_view()

    def action_follow(self) -> None:
        if self.session.follow_gauge():
            self._note("pressure follows the gauge again")
        else:
            self._note("no pressure gauge on this bench: pressure stays typed", error=True)
        self.refresh_view()

    def action_units(self) -> None:
        systems = list(UNIT_SYSTEMS)
        self.units = systems[(systems.index(self.units) + 1) % len(systems)]
        self._plot_dirty = True
        self.refresh_view()
        self.sample_history()

    def action_pause(self) -> None:
        self.paused = not self.paused
        self._note("paused: the view is frozen, readings are still logged" if self.paused else "live again")
        self.refresh_view()

    def action_strike(self) -> None:
        mark = self.session.mark_strike()
        if isinstance(mark, StrikeMark):
            pu = UNIT_SYSTEMS[self.units][0]
            from ..model.units import format_value

            where = format_value(mark.pressure, "pressure", pu)
            text = f"strike marked: {where}, gap {mark.gap * 1e3:.3g} mm, {mark.voltage:.0f} V"
            self._event(text)
            self._note(f"{text} ({len(self.session.strikes)} this session)")
        else:
            self._note(mark, error=True)

    def action_flags(self) -> None:
        v = self.view_
        self.push_screen(FlagsScreen(flag_lines(None if v is None else v.forecast)))

    def action_help(self) -> None:
        self.push_screen(HelpScreen())

    def action_calibrate(self) -> None:
        self.push_screen(CalibrationScreen(self))


def _caution_marker() -> Path:
    from platformdirs import user_config_path

    return user_config_path("strikeline", appauthor=False) / "cautions-shown"


def make_app(
    profile: BenchProfile,
    *,
    manual: bool = False,
    replay: list[dict[str, Any]] | None = None,
    speed: float = 1.0,
    log_path: Path | None = None,
    log: bool = True,
    show_caution: bool | None = None,
    clock: Callable[[], float] = time.monotonic,
    start_sources: bool = True,
    units: str = "SI",
) -> StrikelineApp:
    """The one way to build the screen, for the command line and the tests alike.

    ``replay`` plays logbook records back instead of reading instruments; ``manual``
    reads none (typed values only). ``show_caution`` None shows the high-voltage
    cautions on the first start for this user only.
    """
    logbook = None
    app_ref: list[StrikelineApp] = []

    def post(msg: Message) -> None:
        if app_ref:
            app_ref[0].post_message(msg)

    if log and replay is None:
        from .locations import new_logbook_path

        path = log_path or new_logbook_path(profile.bench.name, time.time())
        logbook = Logbook(path, on_error=lambda text: post(LogbookNote(text)))
        logbook.open(
            bench=profile.label,
            gas=profile.bench.gas.key,
            cathode=profile.bench.cathode.key,
            mode="manual" if manual else "live",
        )
    session = Session(profile, logbook=logbook, manual=manual or replay is None and not profile.ports, clock=clock)

    def on_reading(r: Reading) -> None:
        session.handle(r)
        post(Fresh(time.perf_counter()))

    def on_port(port: str, kind: str, text: str) -> None:
        session.event(port, kind, text)
        post(PortNote(port, kind, text))

    make_source = None
    mode = "manual" if session.pressure_channel is None else "live"
    if replay is not None:
        session.use_gauge = session.pressure_channel is not None

        def make_source():
            return ReplaySource(
                replay,
                on_reading,
                lambda rec: post(ReplayNote(rec)),
                speed=speed,
                on_done=lambda: post(ReplayNote({"kind": "replay-end"})),
            )

        mode = "replay"
    elif not manual and profile.ports and start_sources:

        def make_source():
            from ..drivers.hub import Instruments

            return Instruments(profile.ports, on_reading, on_port)

    marker = None
    if show_caution is None:  # first start for this user: show the cautions once
        marker = _caution_marker()
        show_caution = not marker.exists()
    app = StrikelineApp(
        session,
        make_source=make_source,
        mode=mode,
        show_caution=show_caution,
        caution_marker=marker,
        clock=clock,
        units=units,
    )
    app_ref.append(app)
    return app
