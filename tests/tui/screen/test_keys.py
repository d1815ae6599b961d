"""The keys and the operator's units on the live screen: one table makes every binding, the bottom line
and the help; a unit switch reaches every pressure the flags speak of."""

from strikeline.profiles.bench import load_bench
from strikeline.tui.screen.build import make_app


def test_the_key_line_fits_80_columns():
    from strikeline.tui.screen.keys import KEY_HINTS

    assert len(KEY_HINTS) <= 80


async def test_a_unit_switch_changes_every_pressure_in_the_flags():
    import re

    from screen_text import screen_rows

    app = make_app(load_bench("demo"), manual=True, log=False, show_caution=False)
    async with app.run_test(size=(80, 24)) as pilot:
        app.session.set_gas("N2")
        app.session.set_value("pressure", "3 Pa")  # left of nitrogen's curve: a pressure and pds in the flag
        app.refresh_view()
        await pilot.pause()
        assert any(re.search(r"\d Pa\b", row) for row in screen_rows(app))
        await pilot.press("u")  # mbar
        await pilot.pause()
        await pilot.press("d")
        await pilot.pause()
        rows = " ".join(screen_rows(app))
        assert "mbar mm" in rows and "mbar" in rows and not re.search(r"\d Pa\b|Pa m\b|Torr", rows)


def test_keys_are_declared_once_and_the_help_and_bottom_line_follow():
    # One table (tui/screen/keys.py KEYS) makes the bindings, the bottom line and the help: every
    # binding has an action the main screen defines, every bound key is in a help row, every hint is a row's.
    from strikeline.tui.screen.keys import BINDINGS, HELP_KEYS, KEY_HINTS, KEYS
    from strikeline.tui.screen.main import MainScreen

    assert len(BINDINGS) == sum(len(row.binds) for row in KEYS) and len(HELP_KEYS) == len(KEYS)
    for b in BINDINGS:
        assert hasattr(MainScreen, "action_" + b.action.split("(")[0]), b.action
    keys = [b.key for b in BINDINGS]
    assert len(keys) == len(set(keys))  # no key bound twice
    for row in KEYS:
        assert (row.shown, row.help) in HELP_KEYS
        if row.hint:
            assert f"{row.hint[0]} {row.hint[1]}" in KEY_HINTS
