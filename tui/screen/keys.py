"""What each key does on the live screen: the bindings, their help text and their actions.

:class:`KeyActions` is mixed into :class:`~strikeline.tui.screen.live.StrikelineApp`; the actions
change the Session (typed values, nudges, gas, marks) and ask the screen to look again.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

from textual.binding import Binding

from ...model.units import SYSTEMS, format_value
from ..session.marks import StrikeMark
from ..text import pressure_text
from .readouts import NUDGE_FIELDS, flag_lines

if TYPE_CHECKING:
    from textual.widgets import Input

__all__ = ["BINDINGS", "COARSE", "FINE", "HELP_KEYS", "KEYS", "KEY_HINTS", "KeyActions", "KeyRow"]

FINE, COARSE = 1.02, 1.25
"""Factors of one nudge with up/down and with PgUp/PgDn."""


@dataclass(frozen=True)
class KeyRow:
    """One row of the help: the keys and the actions they bind, how the help writes them, what they do,
    and (keys, word) on the bottom line if they are there."""

    binds: tuple[tuple[str, str], ...]
    """(Textual key name, action) pairs."""
    shown: str
    help: str
    hint: tuple[str, str] | None = None


KEYS = (
    KeyRow(
        (("p", "enter('pressure')"), ("g", "enter('gap')"), ("v", "enter('voltage')"), ("t", "enter('temperature')")),
        "p g v t",
        "type pressure, gap, supply voltage, gas temperature",
        ("p g v", "type"),
    ),
    KeyRow(
        (("G", "enter('gas')"), ("C", "enter('cathode')")),
        "G  C",
        "gas or mixture (argon:80,oxygen:20; flows argon:40sccm,...; 'flows' follows the meters), cathode",
    ),
    KeyRow(
        (("left", "select(-1)"), ("right", "select(1)")),
        "left right",
        "choose which value the arrows nudge (marked >)",
        ("arrows", "nudge"),
    ),
    KeyRow((("up", f"nudge({FINE})"), ("down", f"nudge({1 / FINE})")), "up down", f"nudge it by {(FINE - 1):.0%}"),
    KeyRow(
        (("pageup", f"nudge({COARSE})"), ("pagedown", f"nudge({1 / COARSE})")),
        "PgUp PgDn",
        f"nudge it by {(COARSE - 1):.0%}",
    ),
    KeyRow((("f", "follow"),), "f", "follow the gauge again after typing a pressure"),
    KeyRow((("u", "units"),), "u", "units: SI (Pa, mm) / mbar / Torr", ("u", "units")),
    KeyRow((("space", "pause"),), "space", "pause / resume the live view (readings are still logged)"),
    KeyRow((("s", "strike"),), "s", "mark a strike: you saw ignition at this point", ("s", "strike")),
    KeyRow(
        (("y", "keep"), ("n", "drop")),
        "y  n",
        "keep or drop a strike the instruments saw (proposed on the message line)",
    ),
    KeyRow((("o", "convention"),), "o", "an AC or RF supply's voltages as peak / rms / peak-to-peak"),
    KeyRow((("d", "flags"),), "d", "all flags with their full reasons", ("d", "flags")),
    KeyRow((("k", "calibrate"),), "k", "calibration: fit this bench's curve to its strike marks", ("k", "calib")),
    KeyRow(
        (("r", "report"),),
        "r",
        "write the shift report of this session's logbook so far (HTML, beside the logbook)",
    ),
    KeyRow((("escape", "cancel"),), "escape", "cancel typing"),
    KeyRow((("question_mark", "help"),), "?", "this help", ("?", "help")),
    KeyRow((("q", "quit"),), "q", "quit", ("q", "quit")),
)
"""Every key of the live screen, once: the bindings, the bottom line and the help are made from it."""

BINDINGS = [Binding(key, action, row.help, show=False) for row in KEYS for key, action in row.binds]
KEY_HINTS = "  ".join(f"{keys} {word}" for row in KEYS if row.hint for keys, word in [row.hint])
"""The bottom line: the keys a technician needs most (every key is in the help screen)."""
HELP_KEYS = [(row.shown, row.help) for row in KEYS]

PROMPTS = {
    "pressure": "pressure (true), e.g. 20 Pa, 150 mTorr, 0.2 mbar",
    "gap": "gap, e.g. 30 mm, 3 cm",
    "voltage": "supply voltage, e.g. 600 V, 1.2 kV",
    "temperature": "gas temperature, e.g. 293 K, 20 C",
    "gas": "gas or mixture, e.g. argon, argon:80,oxygen:20, argon:40sccm,oxygen:8sccm, or flows",
    "cathode": "cathode, e.g. Cu, Al, stainless, Ti, Mo, W",
}


class KeyActions:
    """The live screen's key actions (mixed into the App; they use its Session and drawing)."""

    def _entry(self) -> Input:
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
        entry.placeholder = PROMPTS[field]
        entry.display = True
        entry.focus()
        self.note(f"type the {field} and press Enter (Escape cancels)")

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
            err = self.session.set_value(field, text, self.convention)
        if err:
            self.note(f"{err} (the old {field} is kept)", error=True)
            self.record_event(f"refused: {err}")
        else:
            self.note(f"{field} set from {text!r}")
            self.plot_stale = True
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
                self.note("typing cancelled")

    def action_select(self, step: int) -> None:
        i = NUDGE_FIELDS.index(self.selected)
        self.selected = NUDGE_FIELDS[(i + step) % len(NUDGE_FIELDS)]
        self.refresh_view()

    def action_nudge(self, factor: float) -> None:
        if self.selected == "voltage" and self.session.values["voltage"] is None:
            self.note("no supply voltage to nudge: type one with v", error=True)
            return
        self.session.nudge(self.selected, factor)
        self.plot_stale = True
        self.refresh_view()

    def action_follow(self) -> None:
        if self.session.follow_gauge():
            self.note("pressure follows the gauge again")
        else:
            self.note("no pressure gauge on this bench: pressure stays typed", error=True)
        self.refresh_view()

    def action_units(self) -> None:
        systems = list(SYSTEMS)
        self.units = systems[(systems.index(self.units) + 1) % len(systems)]
        self.plot_stale = True
        self.refresh_view()
        self.sample_history()

    def action_pause(self) -> None:
        self.paused = not self.paused
        self.note("paused: the view is frozen, readings are still logged" if self.paused else "live again")
        self.refresh_view()

    def action_strike(self) -> None:
        mark = self.session.mark_strike()
        if isinstance(mark, StrikeMark):
            where = format_value(mark.pressure, "pressure", SYSTEMS[self.units]["pressure"])
            text = f"strike marked: {where}, gap {mark.gap * 1e3:.3g} mm, {mark.voltage:.0f} V"
            self.record_event(text)
            self.note(f"{text} ({len(self.session.strikes)} this session)")
        else:
            self.note(mark, error=True)

    def action_keep(self) -> None:
        mark = self.session.marks.keep()
        if mark is None:
            self.note("no strike proposed to keep")
            return
        text = f"strike kept: {pressure_text(mark.pressure, self.units)}, {mark.voltage:.0f} V ({mark.note})"
        self.record_event(text)
        self.note(f"{text}; {len(self.session.strikes)} marks this session")

    def action_drop(self) -> None:
        gone = self.session.marks.drop()
        if gone is None:
            self.note("no strike proposed to drop")
            return
        self.record_event(f"strike dropped ({gone.proposal.signal})")
        self.note("proposed strike dropped")

    def action_convention(self) -> None:
        order = ("peak", "rms", "pp")
        self.convention = order[(order.index(self.convention) + 1) % len(order)]
        ac = self.session.alternating
        self.note(f"voltages as {self.convention}" + ("" if ac else " (for an AC or RF supply; this one is not)"))
        self.refresh_view()

    def action_flags(self) -> None:
        from .dialogs import FlagsScreen

        v = self.view_
        self.push_screen(FlagsScreen(flag_lines(None if v is None else v.forecast, self.units)))

    def action_help(self) -> None:
        from .dialogs import HelpScreen

        examples = {"SI": "20 Pa, 30 mm, 600 V", "mbar": "0.2 mbar, 30 mm, 600 V", "Torr": "150 mTorr, 3 cm, 600 V"}
        self.push_screen(HelpScreen(HELP_KEYS, examples[self.units]))

    def action_calibrate(self) -> None:
        from .calibration import CalibrationScreen

        self.push_screen(CalibrationScreen(self.session, self.note), self._curve_chosen)

    def _curve_chosen(self, curve) -> None:
        if curve is not None:
            self.use_curve(curve)

    def action_report(self) -> None:
        book = self.session.logbook
        if book is None:
            self.note("no logbook in this session (a replay, or --no-log): no report to write", error=True)
            return
        out = book.path.with_suffix(".html")
        self.note(f"writing the report of {book.path.name} (the screen goes on)...")
        bench = self.session.bench  # the gas fill and the bench curve in use now
        self.run_worker(lambda: self._write_report(book.path, out, bench), thread=True, group="report")

    def _write_report(self, log, out, bench) -> None:
        """In a worker thread (matplotlib takes a moment); says where, or why not, on the screen."""
        from ..outputs import OutputError
        from ..report.write import check_report_target, write_report
        from ..verbs.parser import SAFETY

        try:
            target = check_report_target(str(out), "report")
            rep = write_report(log, target, bench=bench, caution=SAFETY, cores=1)  # no fork beside our threads
            where = f"{rep.path.name} ({rep.readings} readings, {rep.strikes} marks) in {rep.path.parent}"
            text, error = f"report written: {where}", False  # the name first: a narrow screen cuts the end
        except (OSError, OutputError) as e:
            text, error = f"report not written: {e}", True
        if self.live():
            self.call_from_thread(self._said, text, error)

    def _said(self, text: str, error: bool) -> None:
        self.record_event(text)
        self.note(text, error=error)

    async def action_quit(self) -> None:
        self.leave()
        self.exit()
