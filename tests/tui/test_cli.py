"""The command line: text and JSON output, the JSON contract, and every error path."""

import csv
import io
import json
import subprocess
import sys

import pytest
from scipy import constants
from strikeline.tui import cli

CONTRACT = {
    "gas",
    "cathode",
    "gamma",
    "constants",
    "pressure_Pa",
    "gap_m",
    "gas_temperature_K",
    "reference_temperature_K",
    "pd_Pa_m",
    "reduced_pd_Pa_m",
    "breakdown_V",
    "minimum",
    "branch",
    "flags",
}
WITH_VOLTAGE = {"voltage_V", "E_over_N_Td", "alpha_per_m", "alpha_d", "gain", "margin_V", "strikes"}


def run(capsys, *argv):
    code = cli.main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def test_strike_json_carries_the_contract_keys(capsys):
    code, out, err = run(
        capsys,
        "strike",
        "--gas",
        "argon",
        "--cathode",
        "copper",
        "--pressure",
        "20 Pa",
        "--gap",
        "30mm",
        "--voltage",
        "600V",
        "--json",
    )
    assert code == 0 and err == ""
    d = json.loads(out)
    assert CONTRACT | WITH_VOLTAGE <= d.keys()
    assert set(d["constants"]) >= {"A_per_Pa_m", "B_V_per_Pa_m", "source"}
    assert set(d["minimum"]) >= {"pd_Pa_m", "voltage_V"}
    assert d["branch"] in ("left", "right", "none")
    assert d["pressure_Pa"] == pytest.approx(20.0) and d["gap_m"] == pytest.approx(0.03)
    assert d["margin_V"] == pytest.approx(600.0 - d["breakdown_V"])
    assert d["strikes"] is True
    for f in d["flags"]:
        assert set(f) >= {"code", "level", "reason"} and f["level"] in ("ok", "watch", "danger")
    # E/N against its definition: (V/d) / (p / k T), in units of 1e-21 V m^2.
    n = 20.0 / (constants.k * d["gas_temperature_K"])
    assert d["E_over_N_Td"] == pytest.approx(600.0 / 0.03 / n / 1e-21)


def test_strike_without_voltage_leaves_voltage_keys_out(capsys):
    code, out, _ = run(
        capsys, "strike", "--gas", "N2", "--cathode", "Al", "--pressure", "1 Torr", "--gap", "1 cm", "--json"
    )
    d = json.loads(out)
    assert code == 0 and CONTRACT <= d.keys() and not (WITH_VOLTAGE & d.keys())


def test_strike_no_breakdown_is_null_not_a_number(capsys):
    code, out, _ = run(
        capsys,
        "strike",
        "--gas",
        "N2",
        "--cathode",
        "Cu",
        "--pressure",
        "1 Pa",
        "--gap",
        "1 mm",
        "--voltage",
        "5 kV",
        "--json",
    )
    d = json.loads(out)
    assert d["breakdown_V"] is None and d["branch"] == "none" and d["strikes"] is False
    assert "NaN" not in out and "Infinity" not in out


def test_strike_on_the_demo_bench_text(capsys):
    code, out, err = run(capsys, "strike", "--bench", "demo")
    assert code == 0
    for label in ("breakdown voltage", "strike margin", "alpha d", "E/N", "branch", "Paschen minimum"):
        assert label in out
    assert "controls nothing" in out


def test_no_arguments_shows_the_demo_bench(capsys):
    code, out, _ = run(capsys)
    assert code == 0 and "argon / copper" in out and "breakdown voltage" in out


def test_strike_text_in_torr_units(capsys):
    code, out, _ = run(
        capsys,
        "strike",
        "--gas",
        "air",
        "--cathode",
        "Cu",
        "--pressure",
        "1 atm",
        "--gap",
        "1cm",
        "--voltage",
        "25kV",
        "--units",
        "Torr",
    )
    assert code == 0 and "Torr cm" in out and "uniform-field" in out


@pytest.mark.parametrize(
    ("argv", "needle"),
    [
        (
            ["strike", "--gas", "bananium", "--cathode", "Cu", "--pressure", "1 Pa", "--gap", "1mm"],
            "gas 'bananium': unknown",
        ),
        (
            ["strike", "--gas", "Ar", "--cathode", "Cu", "--pressure", "5 bananas", "--gap", "1mm"],
            "unknown unit 'bananas'",
        ),
        (
            ["strike", "--gas", "Ar", "--cathode", "Cu", "--pressure", "5", "--gap", "1mm"],
            "pressure '5': needs a unit",
        ),
        (
            ["strike", "--gas", "Ar", "--cathode", "Cu", "--pressure", "5 Pa", "--gap", "-1mm"],
            "length '-1mm': must be above zero",
        ),
        (["strike", "--gas", "argon:80,argon:20", "--cathode", "Cu", "--pressure", "5 Pa", "--gap", "1cm"], "twice"),
        (["strike", "--gas", "Ar", "--cathode", "Cu", "--gap", "1mm"], "--pressure needed"),
        (["strike", "--gas", "Ar", "--pressure", "1 Pa", "--gap", "1mm"], "--cathode needed"),
        (["strike", "--gas", "Ar", "--cathode", "Cu", "--pressure", "1 Pa"], "--gap needed"),
        (["strike", "--bench", "no-such-bench.toml"], "no such file"),
        (["strike", "--bench", "demo", "--gamma", "3"], "--gamma: '3' is not a secondary-electron yield"),
        (["strike", "--bench", "demo", "--temperature", "5 K"], "temperature '5 K': outside 20 to 3000 K"),
        (["strike", "--bogus"], "unrecognized arguments: --bogus"),
        (["frobnicate"], "invalid choice: 'frobnicate'"),
        (["--units", "SI"], "invalid choice: 'SI'"),
        (["curve", "--gas", "Ar", "--cathode", "Cu", "--from", "1 Pa"], "add --gap to sweep pressure"),
        (
            ["curve", "--gas", "Ar", "--cathode", "Cu", "--gap", "1cm", "--from", "10 Pa", "--to", "1 Pa"],
            "--from must be below --to",
        ),
        (["curve", "--bench", "demo", "--points", "1"], "--points: '1' is not a number of points"),
    ],
)
def test_bad_input_is_one_line_on_stderr_with_status_2(capsys, argv, needle):
    code, out, err = run(capsys, *argv)
    assert code == 2
    assert out == ""
    assert err.count("\n") == 1 and err.startswith("strikeline")
    assert needle in err
    assert "Traceback" not in err


def test_curve_csv_over_pressure_with_a_gap(capsys):
    code, out, _ = run(
        capsys,
        "curve",
        "--gas",
        "Ar",
        "--cathode",
        "Cu",
        "--gap",
        "3 cm",
        "--from",
        "1 Pa",
        "--to",
        "1 kPa",
        "--points",
        "50",
    )
    rows = list(csv.DictReader(io.StringIO(out)))
    assert code == 0 and len(rows) == 50
    assert set(rows[0]) == {
        "pressure_Pa",
        "gap_m",
        "pd_Pa_m",
        "reduced_pd_Pa_m",
        "breakdown_V",
        "branch",
        "law",
        "constants",
        "gas",
        "regime",
        "upper_V",
    }
    assert {r["constants"] for r in rows} == {"textbook"} and {r["gas"] for r in rows} == {"argon"}
    assert {r["regime"] for r in rows} == {"dc"} and {r["upper_V"] for r in rows} == {""}
    assert float(rows[0]["pressure_Pa"]) == pytest.approx(1.0) and float(rows[-1]["pressure_Pa"]) == pytest.approx(
        1000.0
    )
    # argon's left branch rises steeply but finitely (test_breakdown.py): no "none" row on this range
    assert (
        float(rows[0]["breakdown_V"]) > 10 * min(float(r["breakdown_V"]) for r in rows) and rows[0]["branch"] == "left"
    )
    assert {r["branch"] for r in rows} == {"left", "right"}


def test_curve_csv_over_pd_by_default(capsys):
    code, out, _ = run(
        capsys, "curve", "--bench", "demo", "--from", "0.01 Torr cm", "--to", "100 Torr cm", "--points", "20"
    )
    rows = list(csv.DictReader(io.StringIO(out)))
    assert code == 0 and len(rows) == 20 and "pressure_Pa" not in rows[0]
    assert float(rows[0]["pd_Pa_m"]) == pytest.approx(constants.torr * constants.centi * 0.01)


def test_gases_text_and_json(capsys):
    code, out, _ = run(capsys, "gases")
    assert code == 0 and "[raizer-1991]" in out and "Penning (flagged): neon with" in out and "Cu copper" in out
    code, out, _ = run(capsys, "gases", "--json")
    d = json.loads(out)
    assert {g["symbol"] for g in d["gases"]} >= {
        "air",
        "N2",
        "Ar",
        "He",
        "Ne",
        "Kr",
        "Xe",
        "H2",
        "CO2",
        "H2O",
    }
    assert {"buffer": "neon", "admixture": "argon"}.items() <= next(
        p for p in d["mixing"]["penning"] if p["admixture"] == "argon" and p["buffer"] == "neon"
    ).items()
    assert [r["gases"] for r in d["mixing"]["refused"]] == [["air", "nitrogen"], ["air", "oxygen"]]
    assert {f["film"] for f in d["films"]} >= {"Al2O3", "SiO2", "TiO2", "Ta2O5", "AlN", "Si3N4"}
    assert all(g["source"] for g in d["gases"])


def test_help_carries_the_safety_cautions(capsys):
    with pytest.raises(SystemExit) as e:
        cli.main(["--help"])
    out = capsys.readouterr().out
    assert e.value.code == 0
    assert "controls nothing" in out and "discharge" in out and "one-handed" in out


def test_installed_entry_point_runs():
    # The console script as a technician runs it (a separate process, the installed package).
    r = subprocess.run(
        [sys.executable, "-m", "strikeline.tui.cli", "strike", "--bench", "demo", "--json"],
        capture_output=True,
        text=True,
        timeout=60,
    )
    assert r.returncode == 0, r.stderr
    assert json.loads(r.stdout)["gas"] == "argon"
    r = subprocess.run(
        [sys.executable, "-m", "strikeline.tui.cli", "strike", "--gap", "x"],
        capture_output=True,
        text=True,
        timeout=60,
    )
    assert r.returncode == 2 and r.stderr.count("\n") == 1 and "Traceback" not in r.stderr


def test_sim_ports_follow_the_bench_gas(tmp_path):
    # --sim on a helium bench: the simulated thermal gauge under-reads by helium's factor (0.8,
    # common practice) and is corrected by the same, not by the demo's argon factor.
    bench = tmp_path / "he.toml"
    bench.write_text('[bench]\ngas = "He"\ncathode = "Cu"\ngap = "30 mm"\npressure = "50 Pa"\n')
    from strikeline.profiles.bench import load_bench
    from strikeline.tui.verbs.instruments import sim_ports

    sim = sim_ports(load_bench(bench))
    assert "gauge_factor=0.8" in sim.ports[0].url and "setpoint=50" in sim.ports[0].url
    assert sim.gauges["chamber"].factor == pytest.approx(0.8)


def test_an_option_named_for_its_unit_takes_a_bare_number(tmp_path, capsys):
    # --seconds carries its unit in its name: "1" is 1 s; "0.02 min" is read as written.
    from strikeline.tui.verbs.parser import quantity

    read = quantity("duration", bare_unit="s")
    assert read("30") == 30.0 and read("2 min") == 120.0 and read("8 h") == 8 * 3600.0
    assert cli.main(["record", "--bench", "demo", "--seconds", "1", "--log", str(tmp_path / "a.jsonl")]) == 0
    assert "for 1 s" in capsys.readouterr().err
    code, out, err = run(capsys, "record", "--bench", "demo", "--seconds", "30 parsecs")
    assert code == 2 and "unknown unit 'parsecs'" in err and err.count("\n") == 1


def test_every_help_example_is_accepted(capsys):
    # The examples a verb's help gives must parse: "8 h" once was refused as a unit.
    from strikeline.tui.verbs.parser import quantity

    with pytest.raises(SystemExit):
        cli.main(["record", "--help"])
    text = capsys.readouterr().out
    assert "'8 h'" in text
    assert quantity("duration", bare_unit="s")("8 h") == 28800.0
