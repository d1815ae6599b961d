"""The session: stale and lost readings withdraw the forecast; typed values; strike marks."""

import pytest
from strikeline.drivers.reading import Reading, Status
from strikeline.profiles.bench import load_bench
from strikeline.tui.session.marks import StrikeMark
from strikeline.tui.session.session import Session


class Clock:
    def __init__(self, t=0.0):
        self.t = t

    def __call__(self):
        return self.t


def reading(value, t, status=Status.OK, channel="chamber", quantity="pressure"):
    return Reading(channel, quantity, value, status, str(value), t, 1.8e9 + t, "simulated")


@pytest.fixture
def session():
    clock = Clock()
    s = Session(load_bench("demo"), clock=clock, wall=Clock(1.8e9))
    s.clock_ = clock
    return s


def test_a_fresh_reading_gives_a_corrected_forecast(session):
    session.handle(reading(12.5, 0.0))
    v = session.update(0.5)
    assert v.withdrawn is None and v.forecast is not None
    assert v.pressure.indicated == 12.5 and v.pressure.value == pytest.approx(20.0)  # thermal gauge, argon 1.6
    assert v.forecast.pressure == pytest.approx(20.0)


def test_stale_and_lost_readings_withdraw_the_forecast(session):
    session.handle(reading(12.5, 0.0))
    stale = session.update(1.5)  # the demo's chamber channel goes stale after 1 s
    assert stale.forecast is None and "stale" in stale.withdrawn
    session.handle(reading(None, 1.6, Status.LOST))
    lost = session.update(1.7)
    assert lost.forecast is None and lost.withdrawn == "gauge lost"
    session.handle(reading(12.5, 2.0))
    assert session.update(2.1).forecast is not None
    session.handle(reading(None, 2.2, Status.OVER_RANGE))
    assert session.update(2.3).withdrawn == "gauge over range"


def test_bad_typed_input_keeps_the_old_value_and_says_why(session):
    assert session.set_value("gap", "25 mm") is None
    assert session.values["gap"] == pytest.approx(0.025)
    msg = session.set_value("gap", "25")
    assert "needs a unit" in msg and "\n" not in msg
    assert session.values["gap"] == pytest.approx(0.025)
    assert "outside" in session.set_value("voltage", "5000 kV")
    assert "gas 'xenonium': unknown" in session.set_gas("xenonium")
    assert session.bench.fill.main.key == "argon"


def test_typed_pressure_overrides_the_gauge_until_asked_back(session):
    session.handle(reading(12.5, 0.0))
    session.set_value("pressure", "30 Pa")
    assert session.update(0.1).pressure.value == 30.0 and session.update(0.1).pressure.source == "manual"
    assert session.follow_gauge()
    assert session.update(0.2).pressure.value == pytest.approx(20.0)


def test_nudge_steps_within_limits(session):
    session.set_value("pressure", "10 Pa")
    session.nudge("pressure", 1.1)
    assert session.values["pressure"] == pytest.approx(11.0)
    session.set_value("gap", "1 um")
    session.nudge("gap", 0.1)
    assert session.values["gap"] == pytest.approx(1e-6)


def test_mark_strike_records_the_point(session):
    session.handle(reading(12.5, 0.0))
    session.handle(reading(640.0, 0.0, channel="supply-voltage", quantity="voltage"))
    mark = session.mark_strike("first light")
    assert isinstance(mark, StrikeMark)
    assert mark.pressure == pytest.approx(20.0) and mark.gap == 0.03 and mark.voltage == 640.0  # read-back voltage
    assert session.strikes == [mark]
    session.clock_.t = 5.0  # everything stale now
    assert "cannot mark a strike" in session.mark_strike()


def test_view_reports_flag_changes_once(session):
    session.set_value("pressure", "20 Pa")
    first = session.update(0.0)
    assert ("raised", next(x for x in first.forecast.flags if x.code == "strikes")) in first.flag_changes
    assert session.update(0.1).flag_changes == ()  # nothing changed
    session.set_value("pressure", "5 Pa")  # far up the left branch: beyond argon's ionisation data
    changes = {(c, x.code) for c, x in session.update(0.2).flag_changes}
    assert ("cleared", "strikes") in changes and ("raised", "outside_fitted_range") in changes


def test_switching_gas_moves_the_gauge_correction_with_it(session):
    # The demo's thermal gauge: argon factor 1.6, helium 0.8 (common practice; test_gauges.py).
    session.handle(reading(10.0, 0.0))
    assert session.update(0.1).pressure.value == pytest.approx(16.0)
    assert session.set_gas("He") is None
    assert session.update(0.2).pressure.value == pytest.approx(8.0)
    assert "unknown" in session.set_gas("unobtainium")


def test_view_changes_nothing_and_logs_nothing(tmp_path):
    # The view is a pure function of the session's state: asked twice it says the same, and neither
    # the bench, the logbook nor the flags it compares against move until update() is called.
    from strikeline.drivers.logbook import Logbook

    book = Logbook(tmp_path / "s.jsonl")
    book.open(bench="demo", gas="argon", cathode="copper", mode="manual")
    s = Session(load_bench("demo"), logbook=book, manual=True, clock=Clock(), wall=Clock(1.8e9))
    s.set_value("pressure", "20 Pa")
    bench, written = s.bench, book.written
    a, b = s.view(0.0), s.view(0.0)
    assert a.flag_changes == b.flag_changes and a.flag_changes  # raised, but not taken in
    assert s.bench is bench and book.written == written
    s.update(0.0)
    assert book.written > written and s.view(0.1).flag_changes == ()
    book.close()
