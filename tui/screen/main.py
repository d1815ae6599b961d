"""The main screen of the live view (the app's default screen, holding the panels the app composes):
what each key does.

The keys are declared once in :mod:`~strikeline.tui.screen.keys`; the actions change the Session
(typed values, nudges, gas, marks) through the app's public methods and ask it to look again. The
app (:mod:`~strikeline.tui.screen.live`) owns the session, the readings' source and when to draw.
"""

from __future__ import annotations

from textual.screen import Screen

from ...model.units import SYSTEMS, format_value
from ..session.marks import StrikeMark
from ..text import pressure_text
from .keys import BINDINGS, PROMPTS
from .readouts import NUDGE_FIELDS, flag_lines

__all__ = ["MainScreen"]


class MainScreen(Screen[None]):
    """The panels of the live view and its keys."""

    BINDINGS = BINDINGS

    def __init__(self, **kwargs) -> None:
        super().__init__(**kwargs)
        self.asked: str | None = None
        """The value the typing line asks for (None: it is closed)."""

    def action_enter(self, field: str) -> None:
        from textual.widgets import Input  # the typing line is not on the first frame's path

        found = self.query("#entry")
        entry = found.first(Input) if found else Input(id="entry")
        if not found:
            self.mount(entry, before=self.app.panels["message"])
        self.asked = field
        entry.value = ""
        entry.placeholder = PROMPTS[field]
        entry.display = True
        entry.focus()
        self.app.note(f"type the {field} and press Enter (Escape cancels)")

    def on_input_submitted(self, event) -> None:
        if event.input.id != "entry":
            return
        field, text = self.asked, event.value.strip()
        self._close_entry()
        if field is None or not text:
            return
        if field == "gas":
            err = self.app.session.set_gas(text)
        elif field == "cathode":
            err = self.app.session.set_cathode(text)
        else:
            err = self.app.session.set_value(field, text, self.app.convention)
        if err:
            self.app.note(f"{err} (the old {field} is kept)", error=True)
            self.app.record_event(f"refused: {err}")
        else:
            self.app.note(f"{field} set from {text!r}")
            self.app.panels["plot"].stale = True
        self.app.refresh_view()

    def action_cancel(self) -> None:
        if self._close_entry():
            self.app.note("typing cancelled")

    def _close_entry(self) -> bool:
        """Close the typing line; whether it was open."""
        found = self.query("#entry")
        if not found or not found.first().display:
            return False
        found.first().display = False
        self.asked = None
        self.set_focus(None)
        return True

    def action_select(self, step: int) -> None:
        i = NUDGE_FIELDS.index(self.app.selected)
        self.app.selected = NUDGE_FIELDS[(i + step) % len(NUDGE_FIELDS)]
        self.app.refresh_view()

    def action_nudge(self, factor: float) -> None:
        if self.app.selected == "voltage" and self.app.session.values["voltage"] is None:
            self.app.note("no supply voltage to nudge: type one with v", error=True)
            return
        self.app.session.nudge(self.app.selected, factor)
        self.app.panels["plot"].stale = True
        self.app.refresh_view()

    def action_follow(self) -> None:
        if self.app.session.follow_gauge():
            self.app.note("pressure follows the gauge again")
        else:
            self.app.note("no pressure gauge on this bench: pressure stays typed", error=True)
        self.app.refresh_view()

    def action_units(self) -> None:
        systems = list(SYSTEMS)
        self.app.units = systems[(systems.index(self.app.units) + 1) % len(systems)]
        self.app.panels["plot"].stale = True
        self.app.refresh_view()
        self.app.panels["history"].draw(self.app.units)

    def action_pause(self) -> None:
        self.app.paused = not self.app.paused
        self.app.note("paused: the view is frozen, readings are still logged" if self.app.paused else "live again")
        self.app.refresh_view()

    def action_strike(self) -> None:
        mark = self.app.session.mark_strike()
        if isinstance(mark, StrikeMark):
            where = format_value(mark.pressure, "pressure", SYSTEMS[self.app.units]["pressure"])
            text = f"strike marked: {where}, gap {mark.gap * 1e3:.3g} mm, {mark.voltage:.0f} V"
            self.app.record_event(text)
            self.app.note(f"{text} ({len(self.app.session.strikes)} this session)")
        else:
            self.app.note(mark, error=True)

    def action_keep(self) -> None:
        mark = self.app.session.marks.keep()
        if mark is None:
            self.app.note("no strike proposed to keep")
            return
        text = f"strike kept: {pressure_text(mark.pressure, self.app.units)}, {mark.voltage:.0f} V ({mark.note})"
        self.app.record_event(text)
        self.app.note(f"{text}; {len(self.app.session.strikes)} marks this session")

    def action_drop(self) -> None:
        gone = self.app.session.marks.drop()
        if gone is None:
            self.app.note("no strike proposed to drop")
            return
        self.app.record_event(f"strike dropped ({gone.proposal.signal})")
        self.app.note("proposed strike dropped")

    def action_convention(self) -> None:
        order = ("peak", "rms", "pp")
        self.app.convention = order[(order.index(self.app.convention) + 1) % len(order)]
        ac = self.app.session.alternating
        self.app.note(
            f"voltages as {self.app.convention}" + ("" if ac else " (for an AC or RF supply; this one is not)")
        )
        self.app.refresh_view()

    def action_flags(self) -> None:
        from .dialogs import FlagsScreen

        v = self.app.view_
        self.app.push_screen(FlagsScreen(flag_lines(None if v is None else v.forecast, self.app.units)))

    def action_help(self) -> None:
        from .dialogs import HelpScreen
        from .keys import EXAMPLES, HELP_KEYS

        self.app.push_screen(HelpScreen(HELP_KEYS, EXAMPLES[self.app.units]))

    def action_calibrate(self) -> None:
        from .calibration import CalibrationScreen

        self.app.push_screen(CalibrationScreen(self.app.session, self.app.note), self._curve_chosen)

    def _curve_chosen(self, curve) -> None:
        if curve is not None:
            self.app.use_curve(curve)

    def action_report(self) -> None:
        book = self.app.session.logbook
        if book is None:
            self.app.note("no logbook in this session (a replay, or --no-log): no report to write", error=True)
            return
        self.app.note(f"writing the report of {book.path.name} (the screen goes on)...")
        bench = self.app.session.bench  # the gas fill and the bench curve in use now

        def write() -> None:  # in a worker thread: matplotlib takes a moment
            from ..report.write import report_beside

            text, error = report_beside(book.path, bench)
            if self.app.live():
                self.app.call_from_thread(self.app.said, text, error)

        self.app.run_worker(write, thread=True, group="report")

    async def action_quit(self) -> None:
        self.app.leave()
        self.app.exit()
