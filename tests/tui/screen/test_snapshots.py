"""Whole screens, as pictures: Textual's own snapshot testing (pytest-textual-snapshot).

Each screen is drawn at 80x24 and at 150x45, in colour and with NO_COLOR, on a fixed bench, clock
and event stamp. A snapshot is a reviewed picture: after a change to a screen, run
``pytest tests/test_snapshots.py --snapshot-update``, look at every changed SVG in
``tests/__snapshots__/`` before committing it (DEVELOPERS.md, "The screen").
"""

import pytest
from strikeline.profiles.bench import load_bench
from strikeline.tui.screen.build import make_app

SIZES = [(80, 24), (150, 45)]
COLOURS = ["colour", "no-colour"]
STRIKES = [(12.0, 450.0), (20.0, 330.0), (40.0, 260.0), (80.0, 290.0), (160.0, 420.0), (320.0, 640.0)]
"""(pressure Pa, volts) of the strike marks the calibration fits: an invented session."""


def _app(monkeypatch, colour: str):
    if colour == "no-colour":
        monkeypatch.setenv("NO_COLOR", "1")
    else:
        monkeypatch.delenv("NO_COLOR", raising=False)
    app = make_app(load_bench("demo"), manual=True, log=False, show_caution=False, clock=lambda: 100.0)
    app.stamp = lambda: "09:30:00"
    app.history_interval = 3600.0  # the history strip stays empty: nothing in the picture moves
    return app


async def _marks(pilot, strikes, *keys):
    """Mark ``strikes``, settle every panel (the curve too), then press ``keys``."""
    app = pilot.app
    for p, v in strikes:
        app.session.set_value("pressure", f"{p} Pa")
        app.session.set_value("voltage", f"{v} V")
        app.session.mark_strike()
    app.session.set_value("pressure", "20 Pa")
    app.session.set_value("voltage", "1.2 kV")
    app.refresh_view()
    await pilot.pause()
    app.redraw_plot()
    await pilot.pause()
    for key in keys:
        await pilot.press(key)
        await pilot.pause()
    await pilot.wait_for_scheduled_animations()


@pytest.mark.parametrize("size", SIZES, ids=["80x24", "150x45"])
@pytest.mark.parametrize("colour", COLOURS)
def test_main_screen(snap_compare, monkeypatch, size, colour):
    async def run_before(pilot):
        await _marks(pilot, STRIKES[:2])

    assert snap_compare(_app(monkeypatch, colour), terminal_size=size, run_before=run_before)


@pytest.mark.parametrize("size", SIZES, ids=["80x24", "150x45"])
@pytest.mark.parametrize("colour", COLOURS)
def test_calibration_refused(snap_compare, monkeypatch, size, colour):
    async def run_before(pilot):
        await _marks(pilot, STRIKES[:1], "k")

    assert snap_compare(_app(monkeypatch, colour), terminal_size=size, run_before=run_before)


@pytest.mark.parametrize("size", SIZES, ids=["80x24", "150x45"])
@pytest.mark.parametrize("colour", COLOURS)
def test_calibration_fitted(snap_compare, monkeypatch, size, colour):
    async def run_before(pilot):
        await _marks(pilot, STRIKES, "k")

    assert snap_compare(_app(monkeypatch, colour), terminal_size=size, run_before=run_before)


@pytest.mark.parametrize("size", SIZES, ids=["80x24", "150x45"])
@pytest.mark.parametrize("colour", COLOURS)
def test_flags_screen(snap_compare, monkeypatch, size, colour):
    async def run_before(pilot):
        await _marks(pilot, (), "d")

    assert snap_compare(_app(monkeypatch, colour), terminal_size=size, run_before=run_before)


@pytest.mark.parametrize("size", SIZES, ids=["80x24", "150x45"])
@pytest.mark.parametrize("colour", COLOURS)
def test_help_screen(snap_compare, monkeypatch, size, colour):
    async def run_before(pilot):
        await _marks(pilot, (), "question_mark")

    assert snap_compare(_app(monkeypatch, colour), terminal_size=size, run_before=run_before)
