"""The live screen, headless through the one app factory (Textual run_test + Pilot)."""

import math

import pytest
from fakes import next_frame
from strikeline.drivers.reading import Reading, Status
from strikeline.model.bench import OperatingPoint
from strikeline.model.forecast import forecast
from strikeline.profiles.bench import load_bench
from strikeline.tui.screen.build import Fresh, make_app

pytestmark = pytest.mark.timeout(60)


class Clock:
    def __init__(self, t=100.0):
        self.t = t

    def __call__(self):
        return self.t


def text_of(app, widget_id: str) -> str:
    if widget_id == "readouts":
        return app.readouts_text()
    if widget_id == "plot":
        return app.query_one("#plot").plain
    content = app.query_one(f"#{widget_id}").content
    return content.plain if hasattr(content, "plain") else str(content)


def reading(value, t, status=Status.OK, channel="chamber", quantity="pressure"):
    return Reading(channel, quantity, value, status, str(value), t, 1.8e9 + t, "simulated")


async def test_demo_start_shows_live_simulated_values(tmp_path):
    app = make_app(load_bench("demo"), log_path=tmp_path / "s.jsonl", show_caution=False)
    async with app.run_test(size=(80, 24)) as pilot:
        for _ in range(100):
            await pilot.pause(0.05)
            if "SIM" in text_of(app, "channels") and "Pa" in text_of(app, "readouts"):
                break
        assert "chamber SIM" in text_of(app, "channels")
        assert "indicated" in text_of(app, "readouts")
    assert (tmp_path / "s.jsonl").read_text().count('"kind":"reading"') > 0  # the session was logged


async def test_typing_a_pressure_gives_the_models_breakdown_voltage():
    profile = load_bench("demo")
    app = make_app(profile, manual=True, log=False, show_caution=False)
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press("p")
        await pilot.press(*"25 Pa", "enter")
        await pilot.pause()
        b = profile.bench
        expected = forecast(OperatingPoint(25.0, b.gap, b.supply.open_circuit_voltage, b.gas_temperature), b)
        assert f"{expected.breakdown_voltage:.0f} V" in text_of(app, "readouts")
        assert "25.0 Pa" in text_of(app, "readouts")
        assert app.session.values["pressure"] == 25.0


async def test_nudge_keys_move_the_selected_value():
    app = make_app(load_bench("demo"), manual=True, log=False, show_caution=False)
    async with app.run_test(size=(80, 24)) as pilot:
        p0 = app.session.values["pressure"]
        await pilot.press("up")
        assert app.session.values["pressure"] == pytest.approx(p0 * 1.02)
        await pilot.press("pagedown")
        assert app.session.values["pressure"] == pytest.approx(p0 * 1.02 / 1.25)
        await pilot.press("right", "up")  # now the gap
        assert app.session.values["gap"] == pytest.approx(0.03 * 1.02)
        assert ">gap" in text_of(app, "readouts")


async def test_a_reading_reaches_the_readout_and_stale_or_lost_withdraws_it():
    clock = Clock(100.0)
    app = make_app(load_bench("demo"), log=False, show_caution=False, clock=clock, start_sources=False)
    async with app.run_test(size=(80, 24)) as pilot:
        app.session.handle(reading(12.5, 100.0))  # indicated 12.5 Pa of argon on a thermal gauge
        app.post_message(Fresh(0.0))
        await next_frame(pilot)
        assert "20.0 Pa gas-corr." in text_of(app, "readouts") and "12.5 Pa" in text_of(app, "readouts")
        clock.t = 101.5  # the demo's channel goes stale after 1 s
        app.refresh_view()
        await pilot.pause()
        assert "WITHDRAWN" in text_of(app, "readouts") and "stale" in text_of(app, "readouts")
        assert "chamber STALE" in text_of(app, "channels")
        assert "breakdown" in text_of(app, "readouts") and " V (" not in text_of(app, "readouts")
        app.session.handle(reading(None, 101.6, Status.LOST))
        app.post_message(Fresh(0.0))
        await next_frame(pilot)
        assert "gauge lost" in text_of(app, "readouts") and "chamber LOST" in text_of(app, "channels")
        app.session.handle(reading(12.5, 101.7))
        app.post_message(Fresh(0.0))
        await next_frame(pilot)
        assert "WITHDRAWN" not in text_of(app, "readouts")


async def test_mark_strike_records_a_point(tmp_path):
    app = make_app(load_bench("demo"), manual=True, log_path=tmp_path / "m.jsonl", show_caution=False)
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press("s")
        await pilot.pause()
        assert len(app.session.strikes) == 1
        assert "strike marked" in text_of(app, "message")
    assert '"kind":"strike"' in (tmp_path / "m.jsonl").read_text()


async def test_bad_input_keeps_the_old_value_and_explains():
    app = make_app(load_bench("demo"), manual=True, log=False, show_caution=False)
    async with app.run_test(size=(80, 24)) as pilot:
        before = app.session.values["gap"]
        await pilot.press("g", *"25", "enter")
        await pilot.pause()
        msg = text_of(app, "message")
        assert "the old gap is kept" in msg and "needs a unit" in msg and "e.g." in msg
        assert app.session.values["gap"] == before
        await pilot.press("G", *"unobtainium", "enter")
        await pilot.pause()
        assert "unknown" in text_of(app, "message") and app.session.bench.fill.main.key == "argon"


@pytest.mark.parametrize("size", [(80, 24), (72, 21), (60, 20), (120, 40)])
async def test_every_readout_label_is_shown_whole(size):
    app = make_app(load_bench("demo"), manual=True, log=False, show_caution=False)
    async with app.run_test(size=size) as pilot:
        await pilot.pause()
        text = text_of(app, "readouts")
        for label in ("pressure", "gap", "supply", "pd", "breakdown", "margin", "gain", "E/N", "branch", "glow"):
            assert label in text
        region = app.query_one("#readouts").region
        assert region.right <= size[0] and region.bottom <= size[1] and region.height >= 11
        assert app.query_one("#channels").region.bottom <= size[1]
        footer = app.query_one("#keys").region
        assert footer.bottom == size[1]  # nothing pushed off the screen


async def test_units_help_and_cautions():
    app = make_app(load_bench("demo"), manual=True, log=False, show_caution=True)
    async with app.run_test(size=(80, 24)) as pilot:
        assert app.screen.__class__.__name__ == "CautionScreen"
        await pilot.press("enter")
        await pilot.press("u")
        assert "mbar" in text_of(app, "readouts")
        await pilot.press("u")
        assert "mTorr" in text_of(app, "readouts") and "Torr cm" in text_of(app, "readouts")
        await pilot.press("question_mark")
        assert app.screen.__class__.__name__ == "HelpScreen"
        await pilot.press("escape")
        await pilot.press("space")
        assert "PAUSED" in text_of(app, "title")


async def test_the_curve_is_drawn():
    app = make_app(load_bench("demo"), manual=True, log=False, show_caution=False)
    async with app.run_test(size=(100, 30)) as pilot:
        app.query_one("#plot").stale = True
        app.redraw_plot()
        await pilot.pause()
        plot = text_of(app, "plot")
        assert "pd [Pa m]" in plot and "@" in plot and "m" in plot


def test_nothing_is_nan_on_screen_for_a_no_breakdown_point():
    from strikeline.tui.screen.readouts import readout_lines
    from strikeline.tui.session.session import Session

    s = Session(load_bench("demo"), manual=True)
    s.set_gas("N2")  # nitrogen's curve has a left end (argon's left branch rises without one)
    s.set_value("pressure", "1 Pa")
    v = s.update(0.0)
    text = " ".join(value for _, value, _ in readout_lines(v, "SI", "pressure", s.values["gap"], s.values["voltage"]))
    assert "nan" not in text.lower() and "none at any voltage" in text
    assert math.isfinite(s.values["pressure"])


async def test_replay_plays_a_logbook_back_through_the_screen(tmp_path):
    from strikeline.drivers.logbook import Logbook, read_logbook
    from strikeline.tui.session.session import Session

    clock = Clock(0.0)
    path = tmp_path / "shift.jsonl"
    book = Logbook(path, clock=clock)
    book.open(bench="demo")
    recorded = Session(load_bench("demo"), logbook=book, clock=clock)
    for i in range(5):
        clock.t = i * 0.1
        recorded.handle(reading(12.5 + i, clock.t))
    book.close()
    app = make_app(load_bench("demo"), replay=read_logbook(path).records, speed=0, show_caution=False)
    async with app.run_test(size=(80, 24)) as pilot:
        for _ in range(100):  # until the replay ends and its last reading's frame (paced) is drawn
            await pilot.pause(0.02)
            if "replay finished" in text_of(app, "events") and "16.5 Pa" in text_of(app, "readouts"):
                break
        assert "REPLAY" in text_of(app, "channels")
        assert "16.5 Pa" in text_of(app, "readouts")  # the last recorded indicated value
        assert "replay finished" in text_of(app, "events")
        assert app.session.logbook is None  # a replay does not write a new logbook


async def test_a_failing_logbook_is_said_at_once_and_the_screen_goes_on():
    from pathlib import Path

    app = make_app(load_bench("demo"), manual=True, log_path=Path("/proc/strikeline-no/x.jsonl"), show_caution=False)
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause(0.2)
        assert "LOGBOOK FAILING" in text_of(app, "title")
        assert "cannot write" in text_of(app, "message")
        await pilot.press("p", *"25 Pa", "enter")
        await pilot.pause()
        assert "25.0 Pa" in text_of(app, "readouts")


async def test_port_faults_are_counted_on_the_status_line():
    from dataclasses import replace

    from fakes import PtyInstrument

    dev = PtyInstrument(lambda line: b"#garbage#\r\n")
    profile = load_bench("demo")
    port = replace(profile.ports[0], url=dev.path, poll_interval=0.02)
    app = make_app(replace(profile, ports=(port,)), log=False, show_caution=False)
    try:
        async with app.run_test(size=(120, 30)) as pilot:
            for _ in range(150):
                await pilot.pause(0.02)
                if "garbled" in text_of(app, "channels"):
                    break
            line = text_of(app, "channels")
            assert "controller:" in line and "garbled" in line and "chamber GARBLED" in line
            assert "WITHDRAWN" in text_of(app, "readouts")
    finally:
        dev.close()


def test_a_point_left_of_the_curves_end_stays_on_the_curve():
    # The panel's maths are plain functions: no screen needed.
    from strikeline.tui.screen.curve_panel import live_curve
    from strikeline.tui.session.session import Session

    s = Session(load_bench("demo"), manual=True)
    s.set_gas("N2")
    s.set_value("pressure", "3 Pa")  # far left of nitrogen's left end at 30 mm
    view = s.update(0.0)
    assert view.forecast.breakdown_voltage is None
    _key, inputs = live_curve(s.bench, s.values, view, "SI", 60, 20, colour=False)
    assert inputs.point is not None and inputs.pd[0] <= inputs.point[0] <= inputs.pd[-1]
    assert live_curve(s.bench, s.values, view, "SI", 19, 20, colour=False) is None  # too narrow to draw


async def test_a_malformed_replayed_logbook_is_said_and_the_screen_goes_on(tmp_path):
    # The record that once crashed the screen: a strike mark with text where a number belongs.
    from strikeline.tui.logread import read_log, skipped_text

    path = tmp_path / "bad.jsonl"
    path.write_text(
        '{"kind":"session","t_unix":1.8e9,"mono":0,"format":"strikeline-logbook/1"}\n'
        '{"kind":"strike","t_unix":1.8e9,"mono":0.1,"pressure_Pa":"lots","gap_m":0.03,"voltage_V":400}\n'
        '{"kind":"reading","t_unix":1.8e9,"mono":0.2,"channel":"chamber","quantity":"pressure",'
        '"status":"ok","indicated":12.5}\n'
    )
    log = read_log(path)
    note = skipped_text(log)
    assert note == "skipped 1 line: 2 (strike field 'pressure_Pa' is 'lots', not a number above zero)"
    app = make_app(load_bench("demo"), replay=log.records, speed=0, show_caution=False, notes=[f"replay: {note}"])
    async with app.run_test(size=(80, 24)) as pilot:
        for _ in range(100):
            await pilot.pause(0.02)
            if "replay finished" in "\n".join(app.events) and "12.5 Pa" in text_of(app, "readouts"):
                break
        events = "\n".join(app.events)
        assert "replay: skipped 1 line: 2" in events and "replay finished" in events
        assert "12.5 Pa" in text_of(app, "readouts")


async def test_a_typed_value_out_of_range_is_an_event_and_kept_out():
    app = make_app(load_bench("demo"), manual=True, log=False, show_caution=False)
    async with app.run_test(size=(80, 24)) as pilot:
        before = app.session.values["pressure"]
        await pilot.press("p", *"1e30 Pa", "enter")
        await pilot.pause()
        assert app.session.values["pressure"] == before
        assert "outside 1e-06 to 1e+06 Pa" in text_of(app, "message")
        assert any("refused: pressure '1e30 Pa'" in e for e in app.events)


async def test_a_gauge_reading_far_out_of_range_is_an_event_and_never_forecast(tmp_path):
    from dataclasses import replace

    from fakes import PtyInstrument

    dev = PtyInstrument(lambda line: b"P1,OK,1.0E+28\r\n" if line == b"MEAS P1" else b"")  # 1e30 Pa
    profile = load_bench("demo")
    port = replace(profile.ports[0], url=dev.path, poll_interval=0.02, channels=profile.ports[0].channels[:1])
    app = make_app(replace(profile, ports=(port,)), log_path=tmp_path / "l.jsonl", show_caution=False)
    try:
        async with app.run_test(size=(100, 30)) as pilot:
            for _ in range(150):
                await pilot.pause(0.02)
                if any("outside" in e for e in app.events):
                    break
            events = [e for e in app.events if "chamber:" in e and "outside" in e]
            assert len(events) == 1 and "1e+30 Pa is outside the 1e-06 to 1e+06 Pa strikeline accepts" in events[0]
            assert "WITHDRAWN" in text_of(app, "readouts") and "over range" in text_of(app, "readouts")
    finally:
        dev.close()
    logged = [r for r in (tmp_path / "l.jsonl").read_text().splitlines() if '"kind":"reading"' in r]
    assert logged and all('"status":"over_range"' in r and "1e+30 Pa is outside" in r for r in logged)


async def test_a_reactive_bench_shows_its_fill_target_and_the_change_from_the_flows():
    sccm = 101325 * 1e-6 / 60
    clock = Clock(100.0)
    app = make_app(load_bench("demo-reactive"), log=False, show_caution=False, clock=clock, start_sources=False)
    async with app.run_test(size=(80, 24)) as pilot:
        for channel, quantity, value in (
            ("ar-flow", "flow", 40 * sccm),
            ("o2-flow", "flow", 8 * sccm),
            ("chamber", "pressure", 0.30),
            ("supply-current", "current", 1.5),
        ):
            app.session.handle(reading(value, 100.0, channel=channel, quantity=quantity))
        app.post_message(Fresh(0.0))
        await next_frame(pilot)
        shown = text_of(app, "readouts")
        assert "gas         Ar 83%+O2 17% (flows)" in shown and "target      transition, " in shown
        assert "Ar 83%+O2 17% / Al" in text_of(app, "title")
        assert any("gas from the flows: Ar 83%+O2 17% (steady state" in e for e in app.events)


async def test_an_rf_bench_names_its_supply_and_a_seen_strike_is_kept_with_one_key():
    clock = Clock(100.0)
    app = make_app(load_bench("demo-rf"), log=False, show_caution=False, clock=clock, start_sources=False)
    async with app.run_test(size=(80, 24)) as pilot:
        feed = [
            ("chamber", "pressure", 40.0, 99.8),
            ("electrode-vpp", "rf_voltage", 180.0, 99.8),
            ("self-bias", "self_bias", -0.3, 99.8),
            ("electrode-vpp", "rf_voltage", 220.0, 99.9),
            ("self-bias", "self_bias", -0.2, 99.9),
            ("electrode-vpp", "rf_voltage", 170.0, 100.0),
            ("self-bias", "self_bias", -45.0, 100.0),
        ]
        for channel, quantity, value, t in feed:
            app.session.handle(reading(value, t, channel=channel, quantity=quantity))
        app.post_message(Fresh(0.0))
        await next_frame(pilot)
        assert "AC 13.56 MHz pk" in text_of(app, "title") and "regime" in text_of(app, "readouts")
        assert "strike seen: 110 V at 40 Pa" in text_of(app, "message") and "y keeps it" in text_of(app, "message")
        await pilot.press("y")
        await pilot.pause()
        (mark,) = app.session.strikes
        assert mark.made_by == "detected" and mark.voltage == 110.0  # half the 220 V peak-to-peak
        await pilot.press("o")
        await pilot.pause()
        assert "AC 13.56 MHz rms" in text_of(app, "title") and " V rms" in text_of(app, "readouts")


async def test_the_fits_refusal_is_read_whole_at_80x24():
    from screen_text import visible
    from strikeline.model.calibration import FitRefused
    from strikeline.tui.calibrate import calibrate

    app = make_app(load_bench("demo"), manual=True, log=False, show_caution=False)
    async with app.run_test(size=(80, 24)) as pilot:
        app.session.mark_strike()
        await pilot.press("k")
        await pilot.pause()
        m = app.session.strikes[0]
        with pytest.raises(FitRefused) as e:
            calibrate(app.session.bench, [(m.pressure, m.gap, m.voltage, m.gas_temperature)], ["mark 1"])
        assert visible(app, f"refused: {e.value}", frame="┃") and visible(app, "Esc discard", frame="┃")


@pytest.mark.parametrize("bench", ["demo", "demo-rf", "demo-reactive"])
async def test_every_flag_sentence_is_read_whole_at_80x24(bench):
    from screen_text import visible

    app = make_app(load_bench(bench), manual=True, log=False, show_caution=False)
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        flags = app.view_.forecast.flags
        assert len(flags) >= 3
        await pilot.press("d")
        await pilot.pause()
        for f in flags:  # the flags screen scrolls: bring each flag into view and read it whole
            widget = next(w for w in app.screen.query(".flag-reason") if str(w.content) == f.reason)
            app.screen.query_one("#help-box").scroll_to_widget(widget, animate=False)
            await pilot.pause()
            assert visible(app, f.reason, frame="┃"), f.code
