"""Strikes seen by the instruments: the detector, the simulator's own ignitions, keeping and dropping
proposals, and what the logbook says of each mark.

The outside check is the simulator's truth: it ignites at its own invented curve
(drivers/simstrikes.py), and the detector, fed the readings a logbook holds, must find each ignition
within one reading and nothing else.
"""

import json
import math
from dataclasses import replace

import pytest
from strikeline.drivers.logbook import Logbook, read_logbook, reading_from_record
from strikeline.drivers.reading import Reading, Status
from strikeline.drivers.sim import Scenario
from strikeline.drivers.simstrikes import Cycle, cycle_pressure, dc_at, ignitions, rf_at
from strikeline.profiles.bench import load_bench
from strikeline.profiles.supply import DETECT_DEFAULTS, StrikeDetection
from strikeline.tui import cli
from strikeline.tui.session.detect import StrikeDetector
from strikeline.tui.session.session import Session

DT = 0.1  # s between readings of one channel, as the demo's poll interval


def r(quantity, value, t, channel=None):
    return Reading(channel or quantity, quantity, value, Status.OK, str(value), t, 1.8e9 + t, "simulated")


# -- the detector on its own ---------------------------------------------------------------


def test_dc_ignition_current_rises_while_the_supply_falls():
    d = StrikeDetector(DETECT_DEFAULTS)
    feed = [r("voltage", 300.0, 0.0), r("current", 1e-7, 0.0), r("voltage", 420.0, 0.1), r("current", 2e-7, 0.1)]
    assert [d.feed(x) for x in feed] == [None] * 4
    assert d.feed(r("voltage", 315.0, 0.2)) is None
    p = d.feed(r("current", 0.02, 0.2))
    assert p is not None and p.voltage == 420.0 and "20 mA" in p.signal and p.t_mono == 0.2
    assert d.feed(r("current", 0.021, 0.3)) is None  # still lit: no second proposal
    d.feed(r("current", 1e-7, 0.4))  # dark again: armed
    d.feed(r("voltage", 500.0, 0.5))
    d.feed(r("voltage", 300.0, 0.6))
    assert d.feed(r("current", 0.02, 0.6)).voltage == 500.0


def test_a_current_rise_with_the_supply_holding_its_voltage_is_not_a_strike():
    d = StrikeDetector(DETECT_DEFAULTS)
    for x in (r("voltage", 400.0, 0.0), r("current", 0.0, 0.0), r("voltage", 395.0, 0.1)):
        d.feed(x)
    assert d.feed(r("current", 0.01, 0.1)) is None  # a load switched in, the supply held: no mark


def test_rf_ignition_by_self_bias_and_by_reflected_power():
    d = StrikeDetector(DETECT_DEFAULTS)
    for x in (r("rf_voltage", 300.0, 0.0), r("self_bias", -0.5, 0.0), r("rf_voltage", 340.0, 0.1)):
        d.feed(x)
    p = d.feed(r("self_bias", -60.0, 0.1))
    assert p.voltage == 170.0 and "-60 V" in p.signal  # half the peak-to-peak: an amplitude
    e = StrikeDetector(DETECT_DEFAULTS)  # no bias channel: the reflected power
    for x in (r("forward_power", 100.0, 0.0), r("reflected_power", 30.0, 0.0), r("forward_power", 110.0, 0.1)):
        e.feed(x)
    assert e.feed(r("reflected_power", 5.0, 0.1)) is not None


def test_unusable_readings_and_slow_changes_do_not_propose():
    d = StrikeDetector(StrikeDetection(window=1.0))
    d.feed(r("current", 0.0, 0.0))
    assert d.feed(r("current", 0.02, 5.0)) is None  # the dark reading is older than the window
    lost = Reading("current", "current", None, Status.LOST, "", 6.0, 1.8e9, "serial")
    assert d.feed(lost) is None


# -- against the simulator's own ignitions, through a logbook --------------------------------


def _record(tmp_path, kind, cycle, seconds):
    """A logbook recorded on the simulated bench (its readings every DT, in scenario time)."""
    sc = Scenario(setpoint=20.0, supply_on_at=2.0, let_in_at=0.5, pump_time=0.5, noise=0.002)
    profile = load_bench("demo" if kind == "dc" else "demo-rf")
    clock = {"t": 0.0}
    book = Logbook(tmp_path / f"{kind}.jsonl", clock=lambda: clock["t"], wall=lambda: 1.8e9 + clock["t"])
    book.open(bench=profile.label, gas="argon")
    s = Session(profile, logbook=book, clock=lambda: clock["t"], wall=lambda: 1.8e9 + clock["t"])
    for k in range(int(seconds / DT)):
        t = clock["t"] = k * DT
        s.handle(r("pressure", cycle_pressure(t, sc, cycle), t, "chamber"))
        if kind == "dc":
            v, i = dc_at(t, sc, cycle)
            s.handle(r("voltage", v, t, "supply-voltage"))
            s.handle(r("current", i, t, "supply-current"))
        else:
            fwd, refl, bias, vpp = rf_at(t, sc, cycle)
            for q, ch, x in (("forward_power", "forward", fwd), ("reflected_power", "reflected", refl),
                             ("self_bias", "self-bias", bias), ("rf_voltage", "electrode-vpp", vpp)):  # fmt: skip
                s.handle(r(q, x, t, ch))
        if k % 10 == 0:
            s.update(t)  # as record does: what was seen is logged as proposed
    book.close()
    return book.path, ignitions(sc, cycle, seconds)


@pytest.mark.parametrize(
    ("kind", "cycle"),
    [("dc", Cycle("dc", v_min=250.0, p_min=15.0, ramp_rate=200.0)), ("rf", Cycle("rf", v_min=110.0, p_min=20.0))],
)
def test_detected_strikes_fall_within_one_reading_of_the_simulated_ignitions(tmp_path, kind, cycle):
    path, truth = _record(tmp_path, kind, cycle, 60.0)
    assert len(truth) >= 4
    profile = load_bench("demo" if kind == "dc" else "demo-rf")
    clock = {"t": 0.0}
    s = Session(profile, clock=lambda: clock["t"])
    seen = []
    for n, rec in enumerate(read_logbook(path).records):  # the logbook's readings, in its own time
        reading = reading_from_record(rec, rec.get("mono", 0.0))
        if reading is not None:
            clock["t"] = reading.t_mono
            s.handle(reading)
        if n % 20 == 0:  # a view now and then, as the screen's timer: proposals carry their own time
            seen += [p.proposal.t_mono for p in s.update(clock["t"]).proposed]
    seen += [p.proposal.t_mono for p in s.update(clock["t"]).proposed]
    assert len(seen) == len(truth)
    for t_seen, ign in zip(seen, truth, strict=True):
        first_after = math.ceil(ign.t / DT - 1e-9) * DT  # the first reading to see it
        assert first_after - 1e-9 <= t_seen <= first_after + DT + 1e-9, (t_seen, ign.t)


def test_no_strike_is_proposed_while_nothing_ignites(tmp_path):
    cycle = Cycle("dc", v_min=5000.0, p_min=15.0, ramp_rate=50.0)  # never reaches its curve in 30 s
    path, truth = _record(tmp_path, "dc", cycle, 30.0)
    events = [x for x in read_logbook(path).records if x["kind"] == "event" and "strike" in x["event"]]
    assert truth == [] and events == []


# -- keeping and dropping, and what the logbook says -------------------------------------------


def test_kept_and_dropped_proposals_and_how_each_mark_was_made(tmp_path, capsys):
    cycle = Cycle("dc", v_min=250.0, p_min=15.0, ramp_rate=200.0)
    path, truth = _record(tmp_path, "dc", cycle, 40.0)
    proposed = [x for x in read_logbook(path).records if x["kind"] == "event" and x["event"] == "strike proposed"]
    assert len(proposed) == len(truth)  # a headless recording logs what it saw
    profile = load_bench("demo")
    s = Session(profile, clock=lambda: 100.0, wall=lambda: 1.8e9, logbook=Logbook(tmp_path / "k.jsonl"))
    s.logbook.open(bench="demo", gas="argon")
    s.handle(r("pressure", 12.5, 100.0, "chamber"))
    for t, (v, i) in ((99.8, (400.0, 1e-7)), (99.9, (450.0, 2e-7)), (100.0, (330.0, 0.02))):
        s.handle(r("voltage", v, t, "supply-voltage"))
        s.handle(r("current", i, t, "supply-current"))
    view = s.update(100.0)
    assert len(view.proposed) == 1 and view.proposed[0].mark.voltage == 450.0
    kept = s.marks.keep()
    assert kept.made_by == "detected" and s.strikes == [kept] and s.marks.keep() is None
    assert s.mark_strike().made_by == "key"
    s.logbook.close()
    marks = [x for x in read_logbook(s.logbook.path).records if x["kind"] == "strike"]
    assert [m["made_by"] for m in marks] == ["detected", "key"]
    assert cli.main(["log", str(s.logbook.path), "--json"]) == 0
    summary = json.loads(capsys.readouterr().out)
    assert [e["event"] for e in summary["proposed_strikes"]] == ["strike proposed"] and summary["faults"] == []


def test_profile_thresholds_change_what_is_detected():
    strict = replace(DETECT_DEFAULTS, lit_current=0.05)  # 50 mA before it counts
    d = StrikeDetector(strict)
    for x in (r("voltage", 450.0, 0.0), r("current", 0.0, 0.0), r("voltage", 330.0, 0.1)):
        d.feed(x)
    assert d.feed(r("current", 0.02, 0.1)) is None
    p = load_bench("demo-rf").detection
    assert p.bias_on == 10.0 and p.reflected_fall == 0.5
