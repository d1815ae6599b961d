"""The shift report: one self-contained file from a logbook recorded on the simulated bench.

Outside checks: the curve drawn is Paschen's law in its textbook form, V_b = B pd / ln(A pd /
ln(1 + 1/gamma)) (with the gas data's A, B and the cathode's gamma); the strike table and the marks
drawn are the logbook's own records; the simulator's strikes come from its own invented curve.
"""

import html
import json
import math
import re

import numpy as np
import pytest
from strikeline.drivers.logbook import Logbook
from strikeline.drivers.reading import Reading, Status
from strikeline.drivers.sim import Scenario
from strikeline.drivers.simstrikes import Cycle, cycle_pressure, dc_at
from strikeline.model.curve import dc_law
from strikeline.profiles.bench import load_bench
from strikeline.tui import cli
from strikeline.tui.report.data import collect, curve_data
from strikeline.tui.report.figures import curve_figure
from strikeline.tui.session.session import Session

DT = 0.1


def _r(q, v, t, ch, st=Status.OK):
    return Reading(ch, q, v, st, str(v), t, 1.8e9 + t, "simulated")


def record_shift(path, seconds=60.0):
    """The demo bench striking again and again (drivers/simstrikes.py), every proposal kept, one
    strike marked by key, and the gauge lost from 30 to 33 s."""
    sc = Scenario(setpoint=20.0, supply_on_at=2.0, let_in_at=0.5, pump_time=0.5, noise=0.002)
    cycle = Cycle("dc", v_min=250.0, p_min=15.0, ramp_rate=200.0)
    profile = load_bench("demo")
    clock = {"t": 0.0}
    book = Logbook(path, clock=lambda: clock["t"], wall=lambda: 1.8e9 + clock["t"])
    book.open(bench=profile.label, gas="argon", cathode="copper", mode="live")
    s = Session(profile, logbook=book, clock=lambda: clock["t"], wall=lambda: 1.8e9 + clock["t"])
    for k in range(int(seconds / DT)):
        t = clock["t"] = k * DT
        lost = 30.0 <= t < 33.0
        p = None if lost else cycle_pressure(t, sc, cycle)
        s.handle(_r("pressure", p, t, "chamber", Status.LOST if lost else Status.OK))
        v, i = dc_at(t, sc, cycle)
        s.handle(_r("voltage", v, t, "supply-voltage"))
        s.handle(_r("current", i, t, "supply-current"))
        if k % 10 == 0:
            for _ in s.update(t).proposed:
                s.marks.keep()
        if k == 250:
            s.mark_strike()
    book.close()
    return path


@pytest.fixture(scope="module")
def shift(tmp_path_factory):
    return record_shift(tmp_path_factory.mktemp("shift") / "shift.jsonl")


def records(path):
    with open(path, encoding="utf-8") as f:
        return [json.loads(line) for line in f if line.strip()]


def test_the_report_is_one_self_contained_file_with_every_part(shift, tmp_path, capsys):
    out = tmp_path / "report.html"
    assert cli.main(["report", str(shift), "--out", str(out)]) == 0
    assert list(tmp_path.iterdir()) == [out]  # one file, nothing beside it
    text = out.read_text(encoding="utf-8")
    marks = [r for r in records(shift) if r["kind"] == "strike"]
    assert len(marks) >= 5 and {m["made_by"] for m in marks} == {"key", "detected"}
    assert f"{len(marks)} strike marks written to {out}" in capsys.readouterr().err
    # nothing fetched, nothing run: no script, no link, no external href or src, no @import
    assert not re.search(r"<script|<link|<img|<iframe|@import|src=|url\((?!#)", text, re.I)
    assert all(h.startswith("#") for h in re.findall(r'href="([^"]*)"', text))
    assert text.count("<svg") == 3 and text.count("<figure>") == 3
    for heading in ("1. The breakdown curve", "2. Through the shift", "3. Flags", "4. Tables"):
        assert heading in text
    assert "High voltage can kill" in text and "advisory" in text  # the caution line
    about = dict(_tables(text)["about"])
    assert about["bench"] == "demo" and about["cathode"] == "copper" and about["supply"].startswith("pulsed 10 kHz")
    assert about["log"].startswith("2027-01-15T08:00:00") and about["gas"] == "Ar (argon)"
    assert text.index("1. The breakdown curve") < text.index("2. Through") < text.index("3. Flags")
    tables = _tables(text)
    readings = tables["channel"]
    assert [row[0] for row in readings] == ["chamber", "supply-current", "supply-voltage"]
    assert sum(int(row[1]) for row in readings) == sum(1 for r in records(shift) if r["kind"] == "reading")
    strikes = tables["time (UTC)|pressure (Pa)"]
    assert [(float(r[1]), float(r[2]), float(r[4])) for r in strikes] == [
        (float(f"{m['pressure_Pa']:.4g}"), float(f"{m['gap_m'] * 1e3:.4g}"), float(f"{m['voltage_V']:.4g}"))
        for m in marks
    ]
    bench = load_bench("demo").bench
    sources = {r[0]: r[2] for r in tables["what"]}
    segments = [v for k, v in sources.items() if k.startswith("argon: alpha/p")]
    assert segments == [seg.source for seg in bench.fill.main.ionisation.segments]  # the same sources `gases` prints
    assert sources["copper in argon: gamma"] == bench.cathode.yield_for(bench.fill.main).source
    # the dropout from 30 to 33 s is a row of the faults table (and a shaded span of the figure)
    assert any(r[2] == "gap" for r in tables["time (UTC)|port or channel"])


def _tables(text):
    """Each table's body rows, keyed by its first header cell (or the first two, joined by |)."""
    out = {}
    for table in re.findall(r"<table>(.*?)</table>", text, re.S):
        heads = [html.unescape(h) for h in re.findall(r"<th>(.*?)</th>", table)]
        rows = [
            [html.unescape(c) for c in re.findall(r"<td[^>]*>(.*?)</td>", row)]
            for row in re.findall(r"<tr>(.*?)</tr>", table.split("<tbody>")[1])
        ]
        key = "about" if not heads else heads[0] if heads[0] in ("channel", "what") else "|".join(heads[:2])
        out[key] = rows
    return out


def test_the_curve_drawn_is_the_benchs_law_and_the_marks_are_the_logbooks(shift):
    data = collect(str(shift))
    bench = load_bench("demo").bench
    seen = np.array([m["pressure_Pa"] * m["gap_m"] for m in data.strikes])
    fig = curve_figure(curve_data(bench, seen), data)
    lines = {ln.get_gid(): ln for ln in fig.axes[0].get_lines()}
    pd, v = lines["textbook"].get_xdata(), lines["textbook"].get_ydata()
    # The bench's own default law (argon on copper), its pd reduced by T_ref / T (the demo runs at
    # 293 K); near the minimum, where argon's table pair holds, Paschen's closed form with that pair and
    # the law's gamma there agrees within 3 %.
    law = dc_law(bench)
    rpd = pd * law.reference_temperature / bench.gas_temperature
    assert np.allclose(v, law.voltage(rpd)[0], rtol=1e-9, equal_nan=True)
    c = bench.fill.main.constants
    near = (rpd > 0.8 * law.minimum()[0]) & (rpd < 1.5 * law.minimum()[0])
    closed = c.B * rpd / np.log(c.A * rpd / math.log(1 + 1 / law.gamma))
    assert near.any() and np.allclose(v[near], closed[near], rtol=0.03)
    assert min(pd) < min(seen) and max(pd) > max(seen)  # every mark is on the picture
    for made_by, gid in (("key", "marks-key"), ("detected", "marks-detected")):
        mine = [(m["pressure_Pa"] * m["gap_m"], m["voltage_V"]) for m in data.strikes if m["made_by"] == made_by]
        assert list(zip(lines[gid].get_xdata(), lines[gid].get_ydata(), strict=True)) == pytest.approx(mine)
    forecasts = [r for r in records(shift) if r["kind"] == "forecast" and r.get("voltage_V") is not None]
    assert list(lines["path"].get_xdata()) == pytest.approx([r["pressure_Pa"] * r["gap_m"] for r in forecasts])
    assert data.readings == sum(1 for r in records(shift) if r["kind"] == "reading")


def test_a_fitted_bench_curve_is_drawn_with_its_band():
    from dataclasses import replace

    from strikeline.tui.calibrate import calibrate

    bench = load_bench("demo").bench
    pts = [(p, 0.03, v, None) for p, v in ((10.0, 260.0), (20.0, 300.0), (40.0, 430.0), (80.0, 640.0), (30.0, 350.0))]
    cal = calibrate(bench, pts, [f"p{i}" for i in range(len(pts))])
    data = curve_data(replace(bench, curve=cal.result.curve), np.array([0.3, 2.4]))
    assert data.fitted is not None
    v, lo, hi = data.fitted
    assert np.all(lo < v) and np.all(v < hi)
    fig = curve_figure(data)
    assert {ln.get_gid() for ln in fig.axes[0].get_lines()} >= {"textbook", "fitted", "supply", "minimum"}


def test_an_rf_benchs_curve_is_its_alternating_law_with_both_branches():
    from dataclasses import replace

    from strikeline.model.curve import curve_of

    bench = load_bench("demo-rf").bench
    fig = curve_figure(curve_data(bench, np.array([])))
    lines = {ln.get_gid(): ln for ln in fig.axes[0].get_lines()}
    law = curve_of(replace(bench, curve=None), frequency=bench.supply.frequency, gap=bench.gap).law
    rpd = lines["textbook"].get_xdata() * law.reference_temperature / bench.gas_temperature
    assert np.allclose(lines["textbook"].get_ydata(), law.voltage(rpd)[0], rtol=1e-12, equal_nan=True)
    assert np.allclose(lines["upper"].get_ydata(), law.upper(rpd), rtol=1e-12, equal_nan=True)
    assert np.isfinite(lines["upper"].get_ydata()).any()  # the curve turns back: two branches drawn
    assert "amplitude" in lines["supply"].get_label()


@pytest.mark.parametrize("suffix", [".svg", ".png", ".pdf"])
def test_out_with_a_figure_suffix_writes_the_main_figure_alone(shift, tmp_path, suffix):
    out = tmp_path / f"curve{suffix}"
    assert cli.main(["report", str(shift), "--out", str(out)]) == 0
    head = out.read_bytes()[:8]
    assert head.startswith({".svg": b"<?xml", ".png": b"\x89PNG", ".pdf": b"%PDF"}[suffix])
    assert cli.main(["report", str(shift), "--out", str(out)]) == 0  # ours: replaced
    foreign = tmp_path / f"theirs{suffix}"
    foreign.write_bytes(b"someone's picture")
    assert cli.main(["report", str(shift), "--out", str(foreign)]) == 2
    assert foreign.read_bytes() == b"someone's picture"


def test_a_corrupt_logbook_is_reported_and_its_bad_lines_named(shift, tmp_path, capsys):
    lines = shift.read_text(encoding="utf-8").splitlines(keepends=True)
    bad = tmp_path / "bad.jsonl"
    bad.write_text("".join(lines[:40]) + "this is not JSON\n" + "".join(lines[40:200]) + lines[200][:25], "utf-8")
    out = tmp_path / "bad.html"
    assert cli.main(["report", str(bad), "--out", str(out)]) == 0
    err = capsys.readouterr().err
    assert "skipped 2 lines: 41 (not JSON (Expecting value)), the torn last line" in err
    assert "41 (not JSON (Expecting value))" in html.unescape(out.read_text(encoding="utf-8"))


@pytest.mark.parametrize(
    ("content", "needle"),
    [("", "no readable logbook records (it is empty)"), ("garbage\n", "no readable logbook records (skipped 1 line")],
)
def test_an_empty_logbook_is_one_clear_line_and_exit_2(tmp_path, capsys, content, needle):
    log = tmp_path / "empty.jsonl"
    log.write_text(content)
    assert cli.main(["report", str(log), "--out", str(tmp_path / "x.html")]) == 2
    err = capsys.readouterr().err
    assert needle in err and len(err.strip().splitlines()) == 1 and not (tmp_path / "x.html").exists()


def test_from_and_to_take_part_of_the_log(shift, tmp_path, capsys):
    out = tmp_path / "part.html"
    marks = [r for r in records(shift) if r["kind"] == "strike"]
    assert cli.main(["report", str(shift), "--out", str(out), "--from", "20 s", "--to", "2027-01-15T08:00:40"]) == 0
    inside = [m for m in marks if 1.8e9 + 20 <= m["t_unix"] <= 1.8e9 + 40]
    assert 0 < len(inside) < len(marks)
    assert f"and {len(inside)} strike marks" in capsys.readouterr().err
    assert "the part asked for with --from/--to" in out.read_text(encoding="utf-8")
    assert cli.main(["report", str(shift), "--out", str(out), "--from", "soon"]) == 2
    assert "--from 'soon': give a date and time" in capsys.readouterr().err
    assert cli.main(["report", str(shift), "--out", str(out), "--from", "40 s", "--to", "20 s"]) == 2
    assert "is not after" in capsys.readouterr().err


def test_bad_targets_are_refused_before_any_work(shift, tmp_path, capsys):
    assert cli.main(["report", str(shift), "--out", str(tmp_path / "x.txt")]) == 2
    assert "give a .html file (the report) or .png, .svg or .pdf" in capsys.readouterr().err
    theirs = tmp_path / "notes.html"
    theirs.write_text("<html>my notes</html>\n")
    assert cli.main(["report", str(shift), "--out", str(theirs)]) == 2
    assert theirs.read_text() == "<html>my notes</html>\n"
    assert cli.main(["report", str(tmp_path / "none.jsonl"), "--out", str(tmp_path / "y.html")]) == 2
    assert "no such file" in capsys.readouterr().err


def test_fit_draws_its_figure_on_request(shift, tmp_path, capsys):
    csv = tmp_path / "s.csv"
    assert cli.main(["log", str(shift), "--strikes", str(csv)]) == 0
    fig = tmp_path / "fit.svg"
    assert cli.main(["fit", str(csv), "--bench", "demo", "--figure", str(fig)]) == 0
    svg = fig.read_text(encoding="utf-8")
    assert "strikes fitted" in svg and "this bench" in svg
    assert cli.main(["fit", str(csv), "--bench", "demo", "--figure"]) == 2
    assert "--figure needs a FILE, or --save BENCH" in capsys.readouterr().err
    bench = tmp_path / "bench.toml"
    bench.write_text(_demo_text())
    assert cli.main(["fit", str(csv), "--bench", str(bench), "--save", str(bench), "--figure"]) == 0
    assert (tmp_path / "bench-fit.svg").is_file()


def _demo_text():
    from pathlib import Path

    import strikeline.profiles.bench as pb

    return (Path(pb.__file__).with_name("benches") / "demo.toml").read_text(encoding="utf-8")


async def test_the_report_key_writes_the_running_logbook_so_far(tmp_path):
    from fakes import next_frame
    from strikeline.tui.screen.build import make_app

    app = make_app(load_bench("demo"), log_path=tmp_path / "live.jsonl", show_caution=False)
    async with app.run_test(size=(80, 24)) as pilot:
        await next_frame(pilot)
        await pilot.press("s")  # a strike marked by key, so the report has one
        await pilot.press("r")
        for _ in range(1000):
            await pilot.pause(0.02)
            if any("report written" in e or "report not written" in e for e in app.events):
                break
        said = "\n".join(app.events)
        assert "report written: live.html (" in said and f"marks) in {tmp_path}" in said, said
    text = (tmp_path / "live.html").read_text(encoding="utf-8")
    assert text.count("<svg") == 3 and "marked by key" in text
