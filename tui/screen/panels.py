"""The live screen's panels as widgets, each owning what it shows and when it repaints.

The app composes them and hands each the facts it draws (:mod:`~strikeline.tui.screen.live`); a
panel keeps its own state (the events it has heard, its history, the picture it last drew) and
repaints only when its text changed. What the text says is worked out in plain functions
(:mod:`~strikeline.tui.screen.readouts`, :mod:`~strikeline.tui.text`).
"""

from __future__ import annotations

import time
from collections import deque
from collections.abc import Callable
from dataclasses import dataclass

from rich.text import Text
from textual.reactive import reactive
from textual.widgets import Static

from ...model.units import SYSTEMS
from .lines_view import LinesView
from .pacing import HEARTBEAT
from .readouts import STYLE, flags_text, readout_lines, sparkline

__all__ = [
    "FLAG_TEXT_INTERVAL",
    "READOUT_LINES",
    "CurvePanel",
    "EventsStrip",
    "FlagsPanel",
    "HistoryStrip",
    "MessageLine",
    "Readouts",
    "TextLine",
    "TitleFacts",
    "channels_text",
    "flag_events",
    "title_facts",
]

READOUT_LINES = 13
FLAG_TEXT_INTERVAL = 1.0
"""s: numbers inside flag reasons refresh this often; levels change at once."""


class TextLine(Static):
    """A one-line panel (the title, the status row) that repaints only when its text changes."""

    def __init__(self, *args, **kwargs) -> None:
        super().__init__(*args, **kwargs)
        self._shown_key: str | None = None

    def set_text(self, content: Text) -> None:
        key = content.plain + "|" + "".join(str(s.style) for s in content.spans)
        if self._shown_key != key:
            self._shown_key = key
            self.update(content, layout=False)  # fixed sizes: no relayout


@dataclass(frozen=True)
class TitleFacts:
    """What the title line says."""

    label: str
    fill: str
    cathode: str
    gamma: float
    supply: str
    units: str
    paused: bool
    logbook_trouble: bool

    def text(self) -> Text:
        t = Text()
        t.append("strikeline ", style="bold")
        t.append(f"{self.label} | {self.fill} / {self.cathode} | γ {self.gamma:.3g}")
        t.append(f" | {self.supply} | {self.units}")
        if self.paused:
            t.append(" | PAUSED", style="bold reverse")
        if self.logbook_trouble:
            t.append(" | LOGBOOK FAILING", style="bold reverse")
        t.append(" | advisory only")
        return t


def title_facts(session, view, convention: str, units: str, paused: bool, trouble: bool) -> TitleFacts:
    """What the title says of this session now."""
    from ..text import fill_label, supply_label

    b = session.bench
    f = None if view is None else view.forecast
    gamma = b.yield_for(b.fill.main).value if f is None else f.gamma  # the forecast's at its field
    label = session.profile.label
    return TitleFacts(
        label, fill_label(b), b.cathode.symbol, gamma, supply_label(b.supply, convention), units, paused, trouble
    )


def channels_text(parts: list[tuple[str, str]], faults: list[str]) -> Text:
    """The status row: each channel's state, then each port's trouble (counted, never taken for values)."""
    t = Text()
    for i, (text, style) in enumerate(parts):
        if i:
            t.append(" | ")
        t.append(text, style=STYLE[style])
    for text in faults:
        t.append(" | ")
        t.append(text, style="bold")
    return t


def flag_events(view, previous) -> list[str]:
    """The events a new view brings: a flag above ok raised or cleared, the forecast withdrawn or back.
    The Session works out the changes (and logs them); a withdrawal is one event, not a "cleared" per
    flag."""
    out = []
    if previous is not None and previous.forecast is not None and view.forecast is not None:
        for change, x in view.flag_changes:
            if x.level != "ok":
                out.append(f"flag {x.level.upper()} {x.code}" if change == "raised" else f"flag cleared {x.code}")
    if (previous is None or previous.withdrawn is None) and view.withdrawn is not None:
        out.append(f"forecast withdrawn: {view.withdrawn}")
    elif previous is not None and previous.withdrawn is not None and view.withdrawn is None:
        out.append("forecast back")
    return out


class MessageLine(Static):
    """The message line: the last thing said to the operator (reversed when it reports an error)."""

    said: reactive[tuple[str, bool]] = reactive(("", False), layout=False)

    def say(self, text: str, error: bool = False) -> None:
        self.said = (text, error)

    def watch_said(self, said: tuple[str, bool]) -> None:
        text, error = said
        self.update(Text(text, style="bold reverse" if error else ""))


class EventsStrip(TextLine):
    """The last few events, newest first; it keeps the last 200."""

    def __init__(self, *args, stamp: Callable[[], str] | None = None, **kwargs) -> None:
        super().__init__(*args, **kwargs)
        self.events: deque[str] = deque(maxlen=200)
        self.stamp: Callable[[], str] = stamp or (lambda: time.strftime("%H:%M:%S"))
        """The time an event line is stamped with."""

    def add(self, text: str) -> None:
        self.events.append(f"{self.stamp()} {text}")
        self.draw()

    def draw(self) -> None:
        text = "\n".join(list(self.events)[-3:][::-1]) or "no events yet"
        self.set_text(Text(text, no_wrap=True, overflow="ellipsis"))


class Readouts(LinesView):
    """The readouts: label and value rows, the selected one marked."""

    def draw(self, view, units: str, selected: str, values: dict, fill: str, convention, wide: bool) -> None:
        rows = readout_lines(view, units, selected, values["gap"], values["voltage"], fill, convention, wide)
        lines = []
        for label, value, style in rows[:READOUT_LINES]:
            t = Text()
            t.append(f"{label:<12}", style="bold" if label.startswith(">") else "")
            t.append(value, style=STYLE[style])
            lines.append(t)
        self.show(lines)


class FlagsPanel(TextLine):
    """The flags, worst first: levels change at once, the numbers in their sentences once a second."""

    def __init__(self, *args, **kwargs) -> None:
        super().__init__(*args, **kwargs)
        self._levels: tuple | None = None
        self._drawn_at = -float("inf")

    def draw(self, rows: list[tuple[str, str, str]], withdrawn: str | None, units: str, now: float) -> None:
        levels = (withdrawn, units, tuple((level, code) for level, code, _ in rows))
        if levels == self._levels and now - self._drawn_at < FLAG_TEXT_INTERVAL:
            return
        self._levels, self._drawn_at = levels, now
        t, wrapped = flags_text(rows, withdrawn, *self.size)
        self.set_class(wrapped, "-wrapped")  # whole sentences where the rows allow, else one line each
        self.set_text(t)


class HistoryStrip(TextLine):
    """Pressure and breakdown voltage over the last minutes, one sample a heartbeat."""

    def __init__(self, *args, interval: float = HEARTBEAT, **kwargs) -> None:
        super().__init__(*args, **kwargs)
        self.interval = interval
        """s between samples."""
        self.pressures: deque[float | None] = deque(maxlen=600)
        self.voltages: deque[float | None] = deque(maxlen=600)

    def sample(self, pressure: float | None, breakdown: float | None, units: str) -> None:
        self.pressures.append(pressure)
        self.voltages.append(breakdown)
        self.draw(units)

    def draw(self, units: str) -> None:
        from ...model.units import format_value

        width = max(self.size.width - 34, 10)
        pu = SYSTEMS[units]["pressure"]
        good = [p for p in self.pressures if p is not None]
        span = f" {format_value(min(good), 'pressure', pu)}..{format_value(max(good), 'pressure', pu)}" if good else ""
        t = Text(no_wrap=True, overflow="ellipsis")
        t.append(f"pressure  {sparkline(list(self.pressures), width)}{span}")
        seconds = len(self.pressures) * self.interval
        t.append(f"\nbreakdown {sparkline(list(self.voltages), width)} last {seconds:.0f} s")
        self.set_text(t)


class CurvePanel(LinesView):
    """The live breakdown curve: redrawn only when what it shows has moved by a character cell."""

    def __init__(self, **kwargs) -> None:
        super().__init__(**kwargs)
        self.stale = True
        """The curve must be redrawn even if its inputs look unchanged."""
        self._key: tuple | None = None

    def draw(self, bench, values: dict, view, units: str, colour: bool, marks) -> str | None:
        """Redraw if the picture changed; the key line for the border (None: nothing drawn)."""
        from .curve_panel import live_curve
        from .plot import curve_picture, legend

        found = live_curve(
            bench,
            values,
            view,
            units,
            self.size.width,  # size is the content area, inside the border
            self.size.height,
            colour=colour,
            marks=marks,
            known=None if self.stale else self._key,
        )
        if found is None or found[1] is None:  # too small, or the picture would not change
            return None
        key, inputs = found
        self._key, self.stale = key, False
        self.show_ansi(curve_picture(inputs))  # only the lines that changed go to the terminal
        return legend(inputs, self.size.width - 4)  # the border keeps a corner, a rule and a space each side
