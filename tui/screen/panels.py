"""What each panel of the live screen shows, drawn: title, status line, readouts, flags, events,
history and the curve; each widget is updated only when its text changed.

:class:`PanelDrawing` is mixed into :class:`~strikeline.tui.screen.live.StrikelineApp` (it uses the
screen's Session, panels and settings); when to draw is the screen's (:mod:`~strikeline.tui.screen.pacing`).
"""

from __future__ import annotations

from rich.text import Text

from ...model.units import SYSTEMS
from ..text import fill_label, supply_label
from .readouts import STYLE, channel_line, flag_lines, flags_text, readout_lines, sparkline

__all__ = ["FLAG_TEXT_INTERVAL", "READOUT_LINES", "PanelDrawing"]

READOUT_LINES = 13
FLAG_TEXT_INTERVAL = 1.0
"""s: numbers inside flag reasons refresh this often; levels change at once."""


class PanelDrawing:
    """The live screen's panels, drawn from the Session and the forecast view."""

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

    def _draw_title(self) -> None:
        b = self.session.bench
        f = None if self.view_ is None else self.view_.forecast
        gamma = b.yield_for(b.gas).value if f is None else f.gamma  # the forecast's at its field
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
            from ...drivers.hub import fault_summary

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
        pu = SYSTEMS[self.units]["pressure"]
        good = [p for p in self.history_p if p is not None]
        span = ""
        if good:
            from ...model.units import format_value

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
        if found is None or found[1] is None:  # too small, or the picture would not change
            return
        key, inputs = found
        self._plot_key, self.plot_stale = key, False
        plot.show_ansi(curve_picture(inputs))  # only the lines that changed go to the terminal
        key_line = legend(inputs, plot.size.width - 4)  # the border keeps a corner, a rule and a space each side
        if plot.border_subtitle != key_line:
            plot.border_subtitle = key_line
