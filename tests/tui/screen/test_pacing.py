"""When the live screen draws: bursts become one frame, stale values never look live, a paused
screen wakes for nothing, and a moving marker repaints a few rows of the curve, not the panel.

The gauge is a real pty read by the real driver (streaming lines), so the readings take the path a
bench's do: reader thread, Session (logged, every one), then the screen only if it must draw.
"""

import json

import pytest
from fakes import PtyInstrument, next_frame, wait_for
from rich.text import Text
from strikeline.drivers.hub import Latest
from strikeline.drivers.reading import Reading, Status
from strikeline.profiles.bench import parse_bench
from strikeline.tui.screen.build import make_app
from strikeline.tui.screen.pacing import MIN_FRAME, NOISE, Pacer

GAUGE = """
[bench]
gas = "argon"
cathode = "copper"
gap = "30 mm"

[[port]]
name = "gauge"
url = "{url}"
mode = "streaming"
terminator = "\\n"
timeout = "50 ms"

[[port.channel]]
name = "chamber"
quantity = "pressure"
pattern = '^P=(?P<value>\\S+)$'
unit = "Pa"
gauge = "capacitance"
stale_after = "{stale}"
"""


def gauge_bench(dev: PtyInstrument, stale: str = "1 s"):
    return parse_bench(GAUGE.format(url=dev.path, stale=stale), "pacing-test.toml", None)


def logged_readings(path) -> list[dict]:
    with open(path, encoding="utf-8") as f:
        return [r for r in map(json.loads, f) if r.get("kind") == "reading"]


def reading(value, t, status=Status.OK):
    return Reading("chamber", "pressure", value, status, str(value), t, 1.8e9 + t, "gauge")


async def test_a_burst_is_one_frame_of_the_latest_values_and_every_reading_is_logged(tmp_path):
    dev = PtyInstrument(lambda line: b"", terminator=b"\n")
    app = make_app(gauge_bench(dev), log_path=tmp_path / "burst.jsonl", show_caution=False)
    try:
        async with app.run_test(size=(80, 24)) as pilot:
            await _showing_ten_pascal(pilot, app, dev)
            frames = app.pacer.frames
            # 300 readings in one write, 10.1 to 40.0 Pa: far faster than a terminal can show them
            burst = [round(10.0 + 0.1 * k, 1) for k in range(1, 301)]
            dev.write("".join(f"P={v}\n" for v in burst).encode())
            last = "40.0 Pa"
            assert await _until(pilot, lambda: last in app.readouts_text())
            assert app.pacer.frames - frames <= 4  # the burst took a few tens of ms: a frame or two
            await pilot.pause()
            book = app.session.logbook
            assert wait_for(lambda: len(logged_readings(book.path)) == 301)  # nothing dropped
            assert [r["indicated"] for r in logged_readings(book.path)][1:] == burst
    finally:
        dev.close()


async def _showing_ten_pascal(pilot, app, dev) -> None:
    """Wait until the gauge's port is open, then send 10.0 Pa and wait until the readouts show it."""
    assert await _until(pilot, lambda: any("connected" in e for e in app.events))
    dev.write(b"P=10.0\n")
    assert await _until(pilot, lambda: "10.0 Pa" in app.readouts_text())


async def _until(pilot, condition, timeout: float = 5.0) -> bool:
    for _ in range(int(timeout / 0.01)):
        if condition():
            return True
        await pilot.pause(0.01)
    return condition()


class Clock:
    def __init__(self, t=100.0):
        self.t = t

    def __call__(self):
        return self.t


async def test_a_reading_brings_its_own_frame_when_it_goes_stale():
    # No reading follows and no heartbeat is waited for: the frame that shows the value sets a timer
    # for the moment it goes stale, and that timer's frame withdraws it.
    clock = Clock()
    dev = PtyInstrument(lambda line: b"", terminator=b"\n")
    app = make_app(gauge_bench(dev), log=False, show_caution=False, clock=clock, start_sources=False)
    try:
        async with app.run_test(size=(80, 24)) as pilot:
            await next_frame(pilot)
            app.session.handle(reading(12.5, 100.0))
            app.refresh_view()
            assert "12.5 Pa" in app.readouts_text()
            assert app._stale is not None  # armed for 101.0 (the channel's limit is 1 s)
            clock.t = 101.01
            app._stale_due()
            assert "12.5 Pa STALE" in app.readouts_text() and "WITHDRAWN" in app.readouts_text()
            app.session.handle(reading(12.6, 101.02))  # a newer reading: the timer follows it
            app.refresh_view()
            clock.t = 101.5
            app._stale_due()  # not stale yet (101.02 + 1 s): no frame, the timer is armed again
            assert "STALE" not in app.readouts_text() and "12.6 Pa" in app.readouts_text()
            assert app._stale is not None
    finally:
        dev.close()


def test_the_next_stale_moment_is_the_earliest_usable_readings_limit():
    latest = Latest({"chamber": 1.0, "supply": 0.5})
    assert latest.next_stale(100.0) is None
    latest.update(reading(12.5, 100.0))
    latest.update(Reading("supply", "voltage", 600.0, Status.OK, "600", 100.2, 1.8e9, "gauge"))
    assert latest.next_stale(100.3) == 100.2 + 0.5
    assert latest.next_stale(100.8) == 101.0  # the supply is stale already; the gauge goes next
    latest.update(reading(None, 100.9, Status.LOST))
    assert latest.next_stale(100.9) is None  # nothing usable is left to go stale


async def test_a_paused_screen_is_woken_by_no_reading(tmp_path):
    dev = PtyInstrument(lambda line: b"", terminator=b"\n")
    app = make_app(gauge_bench(dev), log_path=tmp_path / "paused.jsonl", show_caution=False)
    try:
        async with app.run_test(size=(80, 24)) as pilot:
            await _showing_ten_pascal(pilot, app, dev)
            await pilot.press("space")
            shown = app.readouts_text()
            dev.write(b"P=20.0\nP=30.0\nP=40.0\n")
            book = app.session.logbook
            assert wait_for(lambda: len(logged_readings(book.path)) == 4)  # still logged
            assert not app.wants()  # paused: no reading asks for a frame
            await pilot.pause()
            assert app.readouts_text() == shown and "PAUSED" in app.query_one("#title").content.plain
            await pilot.press("space")
            await next_frame(pilot)
            assert "40.0 Pa" in app.readouts_text()
    finally:
        dev.close()


def test_small_wobbles_wait_and_changes_of_state_do_not():
    p = Pacer()
    p.drawn({"chamber": reading(20.0, 0.0)})
    assert not p.worth_a_frame({"chamber": reading(20.0 * (1 + NOISE / 2), 0.1)})
    assert p.worth_a_frame({"chamber": reading(20.0 * (1 + 2 * NOISE), 0.1)})
    assert p.worth_a_frame({"chamber": reading(20.0, 0.1, Status.STALE)})
    assert p.wait(5.0) == 0.0
    p.paced(5.0)
    assert p.wait(5.0 + MIN_FRAME / 2) == pytest.approx(MIN_FRAME / 2) and p.wait(5.0 + 2 * MIN_FRAME) == 0.0


async def test_a_moving_marker_repaints_a_few_rows_of_the_curve():
    from strikeline.profiles.bench import load_bench

    app = make_app(load_bench("demo"), manual=True, log=False, show_caution=False)
    async with app.run_test(size=(80, 24)) as pilot:
        await next_frame(pilot)  # the forecast and the curve fill in after the first frame
        app.session.set_value("pressure", "40 Pa")  # well inside the axes: they stay put below
        app.refresh_view()
        app.redraw_plot()
        plot = app.query_one("#plot")
        rows = len(plot.lines)
        painted = []
        show = plot.show_ansi
        plot.show_ansi = lambda picture: painted.append(show(picture)) or painted[-1]
        app.session.set_value("pressure", "100 Pa")  # the marker moves along the curve
        app.refresh_view()
        app.redraw_plot()
        assert len(painted) == 1 and 0 < painted[0] <= rows // 3, (painted, rows)
        app.redraw_plot()
        assert len(painted) == 1  # nothing moved: the curve is not even worked out again
        assert plot.show([Text("x")] * 2) == rows  # a new picture of two rows: every row changes
