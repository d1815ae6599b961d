"""The calibration screen: fit this bench's curve to the session's strike marks; accept, save or discard."""

from __future__ import annotations

from dataclasses import replace
from typing import TYPE_CHECKING

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.screen import ModalScreen
from textual.widgets import Static

if TYPE_CHECKING:
    from collections.abc import Callable

    from ..calibrate import Calibration
    from ..session.session import Session

__all__ = ["CalibrationScreen"]


class CalibrationScreen(ModalScreen["BenchCurve | None"]):
    """Fit this bench's curve to the session's strike marks; accept, save or discard. It is dismissed
    with the curve to use from now on (None: discarded); ``say`` puts a line on the main screen."""

    DEFAULT_CSS = """
    CalibrationScreen {
        align: center middle;
    }
    CalibrationScreen #calib-box {
        width: 100%;
        height: 100%;
        border: heavy $primary;
        padding: 0 1;
        background: $surface;
    }
    CalibrationScreen #calib-text {
        height: auto;
    }
    CalibrationScreen #calib-hint {
        height: auto;
        text-style: bold;
    }
    CalibrationScreen #calib-plot {
        height: 1fr;
    }
    """

    BINDINGS = [
        Binding("1", "free('A,B')", "fit A,B"),
        Binding("2", "free('B,gamma')", "fit B,gamma"),
        Binding("3", "free('gamma')", "fit gamma"),
        Binding("a", "accept", "accept"),
        Binding("w", "write", "save to bench file"),
        Binding("escape,k", "dismiss", "discard"),
    ]

    def __init__(self, session: Session, say: Callable[..., None]):
        super().__init__()
        self.session = session
        self.say = say
        self.free = "A,B"
        self.cal: Calibration | None = None
        self.marks: tuple[tuple[float, float], ...] = ()
        """The marks as (reduced pd, V), for the picture when the fit is refused."""

    def compose(self) -> ComposeResult:
        with Vertical(id="calib-box"):
            yield Static(id="calib-text")
            yield Static(id="calib-plot")
            yield Static("fit 1 A,B  2 B,gamma  3 gamma  |  a accept  w save to bench  Esc discard", id="calib-hint")

    def on_mount(self) -> None:
        self.refit()
        self.call_after_refresh(self.draw)  # the picture needs its laid-out size

    def refit(self) -> None:
        from ...model.calibration import FitRefused
        from ...model.composition import same_composition
        from ..calibrate import calibrate, calibration_summary, dc_like, parse_free

        s = self.session
        fill = s.bench.composition
        marks = [m for m in s.strikes if not m.gas or same_composition(m.gas, fill)]  # in this gas fill only
        text = self.query_one("#calib-text", Static)
        pts = [(m.pressure, m.gap, m.voltage, m.gas_temperature) for m in marks]
        labels = [f"mark {i + 1}" for i in range(len(marks))]
        pts, labels, _left_out = dc_like(s.bench, pts, labels)
        try:
            self.cal = calibrate(replace(s.bench, curve=None), pts, labels, parse_free(self.free))
        except FitRefused as e:
            self.cal = None
            other = len(s.strikes) - len(marks)
            more = f" ({other} more in another gas fill)" if other else ""
            head = f"{len(marks)} strike marks in {fill} this session{more} (s marks one)."
            text.update(Text(f"{head}\nfit {self.free}: refused: {e}"))
            scale = s.bench.fill.main.constants.reference_temperature
            self.marks = tuple((p * d * scale / t, v) for p, d, v, t in pts)
            self.draw()
            return
        text.update(Text(calibration_summary(self.cal)))
        self.draw()

    def draw(self) -> None:
        from .curve_panel import calibration_curve
        from .plot import curve_picture

        plot = self.query_one("#calib-plot", Static)
        w, h = plot.size.width or 70, plot.size.height or 10
        bench = self.session.bench
        inputs = calibration_curve(self.cal, bench, w, h, colour=not self.app.no_color, marks=self.marks)
        plot.update(Text.from_ansi(curve_picture(inputs)))

    def action_free(self, free: str) -> None:
        self.free = free
        self.refit()

    def action_accept(self) -> None:
        if self.cal is None:
            self.say("nothing to accept: the fit was refused", error=True)
            return
        self.dismiss(self.cal.result.curve)

    def action_write(self) -> None:
        from ...profiles.bench import save_curve
        from ...profiles.fields import ProfileError

        if self.cal is None:
            self.say("nothing to save: the fit was refused", error=True)
            return
        path = self.session.profile.path
        if path is None:
            self.say(
                "this bench is built in: copy it to a file to save a curve (accepted for this session)", error=True
            )
            self.dismiss(self.cal.result.curve)
            return
        try:
            save_curve(path, self.cal.result.curve)
        except ProfileError as e:
            self.say(str(e), error=True)
            return
        self.say(f"bench curve saved into {path}")
        self.dismiss(self.cal.result.curve)
