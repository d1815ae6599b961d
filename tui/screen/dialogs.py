"""The live screen's modal dialogs: the high-voltage cautions, the help and the flags in full."""

from __future__ import annotations

import time
from pathlib import Path

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical, VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Static

from ...drivers.logbook import iso_utc
from .readouts import LEVEL_STYLE

__all__ = ["CAUTION", "CautionScreen", "FlagsScreen", "HelpScreen", "Notice"]

CAUTION = (
    "HIGH VOLTAGE CAN KILL. strikeline is advisory: it reads instruments and controls nothing, "
    "and a forecast of 'no strike' does not make a chamber safe to touch. Keep the interlocks "
    "working. Switch off, discharge and ground the supply and cathode before opening the chamber. "
    "Near live parts work one-handed and never alone. Local electrical codes, your lab's safety "
    "officer and licensed practice come first."
)


class Notice(ModalScreen[None]):
    """A modal screen of sentences that wrap, over the live screen; its looks load with the first one
    opened, not with the live screen."""

    DEFAULT_CSS = """
    Notice {
        align: center middle;
    }
    Notice #caution-box, Notice #help-box {
        width: 76;
        max-width: 100%;
        height: auto;
        max-height: 100%;
        border: heavy $error;
        padding: 0 1;
        background: $surface;
    }
    Notice #caution-title {
        text-style: bold reverse;
    }
    Notice #caution-hint {
        text-style: bold;
    }
    Notice .flag-reason {
        padding-left: 7;
    }
    Notice .help-row {
        height: auto;
    }
    Notice .help-key {
        width: 14;
        padding-left: 2;
    }
    Notice .help-what {
        width: 1fr;
    }
    """


class CautionScreen(Notice):
    """The high-voltage cautions, shown on first start and on request."""

    BINDINGS = [Binding("enter,escape,space", "dismiss", "continue")]

    def __init__(self, marker: Path | None = None):
        super().__init__()
        self.marker = marker
        """Written once the cautions are seen, so they show on a user's first start only."""

    def on_unmount(self) -> None:
        if self.marker is not None:
            try:
                self.marker.parent.mkdir(parents=True, exist_ok=True)
                self.marker.write_text(f"cautions shown {iso_utc(time.time())}\n")
            except OSError:
                pass

    def compose(self) -> ComposeResult:
        with Vertical(id="caution-box"):
            yield Static("strikeline: before you start", id="caution-title")
            yield Static(CAUTION, id="caution-text")
            yield Static("Press Enter to continue.", id="caution-hint")


class HelpScreen(Notice):
    """Cautions first (they must always be whole), then every key; scrolls on small terminals."""

    BINDINGS = [Binding("escape,q,question_mark,enter", "dismiss", "close")]

    def __init__(self, keys: list[tuple[str, str]], example: str = "20 Pa, 30 mm, 600 V"):
        super().__init__()
        self.keys = keys
        self.example = example
        """Values as the operator's unit system writes them."""

    def compose(self) -> ComposeResult:
        with VerticalScroll(id="help-box"):
            yield Static(Text(CAUTION, style="bold"))
            yield Static(f"\nkeys (values take units, e.g. {self.example})")
            for k, what in self.keys:
                with Horizontal(classes="help-row"):  # the text wraps beside its key
                    yield Static(k, classes="help-key")
                    yield Static(what, classes="help-what")
            yield Static("Escape closes.", id="caution-hint")


class FlagsScreen(Notice):
    """Every flag of the forecast with its full reason, worst first."""

    BINDINGS = [Binding("escape,q,d,enter", "dismiss", "close")]

    def __init__(self, rows: list[tuple[str, str, str]]):
        super().__init__()
        self.rows = rows

    def compose(self) -> ComposeResult:
        with VerticalScroll(id="help-box"):
            for level, code, reason in self.rows or [("ok", "none", "no flags")]:
                yield Static(Text(f"{level:<6} {code}", style=LEVEL_STYLE.get(level, "")))
                yield Static(reason, classes="flag-reason")  # wraps under its code, indented
            yield Static("Escape closes.", id="caution-hint")
