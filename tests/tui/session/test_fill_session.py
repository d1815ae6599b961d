"""The live gas fill: the composition follows the flow meters, a typed fill holds against them,
every change is in the logbook, and ``log`` lists them."""

import json

import pytest
from scipy import constants
from strikeline.drivers.logbook import Logbook, read_logbook
from strikeline.drivers.reading import Reading, Status
from strikeline.profiles.bench import load_bench
from strikeline.tui import cli
from strikeline.tui.session.fillwatch import HOLD_WITHIN
from strikeline.tui.session.session import Session

SCCM = constants.atm * constants.centi**3 / 60.0  # Pa m^3/s (0 C, 1 atm; common practice)


def _r(channel, quantity, value, t, status=Status.OK):
    return Reading(channel, quantity, value, status, str(value), t, 1.8e9 + t, "simulated")


@pytest.fixture
def session(tmp_path):
    book = Logbook(tmp_path / "l.jsonl")
    book.open(bench="demo-reactive", gas="argon:90.91,oxygen:9.091")
    s = Session(load_bench("demo-reactive"), logbook=book, clock=lambda: 0.0, wall=lambda: 1.8e9)
    yield s
    book.close()


def _feed(s, t, ar_sccm, o2_sccm, p=0.30, current=1.5):
    s.handle(_r("ar-flow", "flow", ar_sccm * SCCM, t))
    s.handle(_r("o2-flow", "flow", o2_sccm * SCCM, t))
    s.handle(_r("chamber", "pressure", p, t))
    s.handle(_r("supply-current", "current", current, t))


def test_composition_follows_the_flows_with_partial_pressures_and_target(session):
    _feed(session, 0.0, 40.0, 8.0)
    v = session.update(0.1)
    assert session.bench.composition == "argon:83.33,oxygen:16.67" and v.fill_note is None
    f = v.forecast
    assert dict(f.partial_pressures)["oxygen"] == pytest.approx(8 * SCCM / 0.25, rel=1e-12)  # 250 l/s
    assert f.target.mode == "transition" and f.charging is not None  # 1.5 A on the Al2O3 film


def test_small_drifts_of_the_flows_keep_the_fill_in_use(session):
    _feed(session, 0.0, 40.0, 8.0)
    session.update(0.1)
    held = session.bench.fill
    _feed(session, 0.2, 40.0, 8.02)  # oxygen share moves by 0.03 %: held
    session.update(0.3)
    assert session.bench.fill is held
    _feed(session, 0.4, 40.0, 12.0)  # 16.7 % -> 23.1 %: a new fill
    session.update(0.5)
    assert session.bench.composition == "argon:76.92,oxygen:23.08"
    assert HOLD_WITHIN < 0.23 - 0.167


def test_a_silent_flow_meter_holds_the_fill_and_says_why(session):
    _feed(session, 0.0, 40.0, 8.0)
    session.update(0.1)
    session.handle(_r("o2-flow", "flow", None, 0.2, Status.LOST))
    v = session.update(0.3)
    assert session.bench.composition == "argon:83.33,oxygen:16.67"
    assert "o2-flow" in v.fill_note and "lost" in v.fill_note
    assert v.forecast.target is None  # no flows, no gas balance


def test_a_typed_fill_holds_against_the_meters_until_flows_is_typed(session):
    _feed(session, 0.0, 40.0, 8.0)
    session.update(0.1)
    assert session.set_gas("argon:50,nitrogen:50") is None
    _feed(session, 0.2, 40.0, 8.0)
    assert session.update(0.3).forecast.gas == "argon:50,nitrogen:50"
    assert session.set_gas("flows") is None
    session.update(0.4)
    assert session.bench.composition == "argon:83.33,oxygen:16.67"


def test_typed_flows_give_the_target_mode_without_meters(tmp_path):
    s = Session(load_bench("demo-reactive"), manual=True, clock=lambda: 0.0)
    assert s.set_gas("argon:40 sccm,oxygen:8 sccm") is None
    assert s.set_value("pressure", "0.30 Pa") is None
    f = s.update(0.0).forecast
    assert f.gas == "argon:83.33,oxygen:16.67" and f.target.mode == "transition"


def test_bad_typed_fills_keep_the_old_one(session):
    before = session.bench.composition
    for bad in ("argon:80,oxygen:-20", "argon:1,argon:2", "air:1,oxygen:1", "argon:40 sccm,oxygen:5"):
        assert "\n" not in session.set_gas(bad)
    assert session.bench.composition == before
    manual = Session(load_bench("demo"), manual=True)
    assert "names no flow channels" in manual.set_gas("flows")


def test_fill_changes_are_logged_and_summarised(session, tmp_path, capsys):
    _feed(session, 0.0, 40.0, 8.0)
    session.update(0.1)
    session.set_gas("argon:50,nitrogen:50")
    session.logbook.close()
    recs = read_logbook(session.logbook.path).records
    fills = [(r["composition"], r["source"]) for r in recs if r["kind"] == "fill"]
    assert fills == [("argon:83.33,oxygen:16.67", "flows"), ("argon:50,nitrogen:50", "typed")]
    flows = next(r for r in recs if r["kind"] == "fill")["flows_Pa_m3_s"]
    assert flows == pytest.approx({"argon": 40 * SCCM, "oxygen": 8 * SCCM})
    assert all(r["gas"] for r in recs if r["kind"] == "forecast")
    assert cli.main(["log", str(session.logbook.path), "--json"]) == 0
    summary = json.loads(capsys.readouterr().out)
    assert [f["composition"] for f in summary["fills"]] == [
        "argon:90.91,oxygen:9.091",
        "argon:83.33,oxygen:16.67",
        "argon:50,nitrogen:50",
    ]


def test_strike_marks_carry_their_fill_and_fit_leaves_out_other_fills(tmp_path, capsys):
    csv = tmp_path / "s.csv"
    rows = ["pressure_Pa,gap_m,voltage_V,gas"]
    for i, p in enumerate((20, 40, 80, 160, 320, 640)):
        rows.append(f"{p},0.03,{300 + 20 * i},argon")
    rows.append('50,0.03,900,"argon:80,oxygen:20"')
    csv.write_text("\n".join(rows) + "\n")
    assert cli.main(["fit", str(csv), "--bench", "demo", "--json"]) == 0
    j = json.loads(capsys.readouterr().out)
    assert j["n_points"] == 6 and any("made in argon:80,oxygen:20, not argon" in w for w in j["warnings"])


def test_fit_of_a_mixture_names_the_mixture(tmp_path, capsys):
    csv = tmp_path / "s.csv"
    rows = ["pressure_Pa,gap_m,voltage_V"] + [
        f"{p},0.03,{v}" for p, v in ((20, 330), (40, 300), (80, 320), (160, 380), (320, 480), (640, 650))
    ]
    csv.write_text("\n".join(rows) + "\n")
    assert cli.main(["fit", str(csv), "--bench", "demo", "--gas", "argon:80,oxygen:20", "--json"]) == 0
    j = json.loads(capsys.readouterr().out)
    assert j["gas"] == "argon:80,oxygen:20" and j["textbook"]["A_per_Pa_m"] > 0


def test_record_takes_a_gas_fill(tmp_path, capsys):
    path = tmp_path / "rec.jsonl"
    code = cli.main(["record", "--bench", "demo", "--gas", "argon:95,nitrogen:5", "--seconds", "1", "--log", str(path)])
    assert code == 0
    recs = read_logbook(path).records
    assert recs[0]["gas"] == "argon:95,nitrogen:5"
    assert any(r["kind"] == "fill" and r["source"] == "typed" for r in recs)


def test_gauge_names_the_fill_it_corrects_for(capsys):
    code = cli.main(["gauge", "--bench", "demo", "--gas", "argon:80,oxygen:20", "--samples", "2", "--json"])
    lines = [json.loads(x) for x in capsys.readouterr().out.splitlines()]
    assert code == 0 and lines[0] == {"kind": "fill", "composition": "argon:80,oxygen:20"}
    (thermal,) = {r["approximate"] for r in lines if r["kind"] == "reading" and r["channel"] == "chamber"}
    assert thermal is True  # a thermal gauge in a mixture: shown uncorrected, approximate
