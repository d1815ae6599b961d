"""Quitting while readings stream in never ends in a traceback.

A timer or a reading can arrive while the screen is torn down. Textual's run_test re-raises any
exception the app met, so each run below fails loudly if one did.
"""

from dataclasses import replace

import pytest
from fakes import next_frame, wait_for
from strikeline.profiles.bench import load_bench
from strikeline.tui.screen.build import Fresh, make_app

pytestmark = pytest.mark.timeout(90)


def fast_gauge():
    """The demo bench with its simulated controller polled as fast as it answers (well over 20 Hz)."""
    profile = load_bench("demo")
    url = "simbench://demo?seed=1&speed=50&gauge_factor=1.6&setpoint=20"
    return replace(profile, ports=(replace(profile.ports[0], url=url, poll_interval=0.01),))


async def _stream_then_close(by_key: bool) -> int:
    app = make_app(fast_gauge(), log=False, show_caution=False)
    async with app.run_test(size=(80, 24)) as pilot:
        for _ in range(300):  # until readings stream in
            await pilot.pause(0.01)
            if app.source is not None and app.source.stats()["controller"].readings >= 3:
                break
        seen = app.source.stats()["controller"].readings
        if by_key:
            await pilot.press("q")
        # else: the block ends under the streaming gauge, as when the terminal goes away
    assert not any(r.alive for r in app.source.readers)  # every reader thread stopped
    return seen


async def test_quit_twenty_times_while_a_fast_gauge_streams():
    # Alternately with q and by the screen being closed under it (the path that crashed: timers
    # still ran while the widgets were removed). run_test re-raises what the app met.
    for i in range(20):
        assert await _stream_then_close(by_key=i % 2 == 0) >= 3


async def test_a_reading_after_a_panel_is_removed_does_not_crash():
    app = make_app(load_bench("demo"), manual=True, log=False, show_caution=False)
    async with app.run_test(size=(80, 24)) as pilot:
        await app.query_one("#flags").remove()
        app.session.set_gas("N2")  # nitrogen's curve has a left end (argon's left branch has none)
        app.session.set_value("pressure", "5 Pa")  # the flags change, so their panel is drawn again
        app.post_message(Fresh(0.0))
        await next_frame(pilot)
        assert "none at any voltage" in app.readouts_text()


async def test_nothing_is_drawn_once_leaving():
    app = make_app(load_bench("demo"), manual=True, log=False, show_caution=False)
    async with app.run_test(size=(80, 24)) as pilot:
        app.leave()
        before = app.readouts_text()
        app.session.set_value("pressure", "33 Pa")
        app.refresh_view()
        await pilot.pause()
        assert app.readouts_text() == before and "33.0 Pa" not in before
    assert wait_for(lambda: not app.is_running)
