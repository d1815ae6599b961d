"""Every key of the live screen, declared once: the bindings, the bottom line and the help are made
from :data:`KEYS`; the actions are the main screen's (:mod:`~strikeline.tui.screen.main`).
"""

from __future__ import annotations

from dataclasses import dataclass

from textual.binding import Binding

__all__ = ["BINDINGS", "COARSE", "EXAMPLES", "FINE", "HELP_KEYS", "KEYS", "KEY_HINTS", "PROMPTS", "KeyRow"]

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

EXAMPLES = {"SI": "20 Pa, 30 mm, 600 V", "mbar": "0.2 mbar, 30 mm, 600 V", "Torr": "150 mTorr, 3 cm, 600 V"}
"""Values as each unit system writes them, for the help."""

PROMPTS = {
    "pressure": "pressure (true), e.g. 20 Pa, 150 mTorr, 0.2 mbar",
    "gap": "gap, e.g. 30 mm, 3 cm",
    "voltage": "supply voltage, e.g. 600 V, 1.2 kV",
    "temperature": "gas temperature, e.g. 293 K, 20 C",
    "gas": "gas or mixture, e.g. argon, argon:80,oxygen:20, argon:40sccm,oxygen:8sccm, or flows",
    "cathode": "cathode, e.g. Cu, Al, stainless, Ti, Mo, W",
}
"""What the typing line asks for each value."""
