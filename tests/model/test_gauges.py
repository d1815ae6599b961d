"""Gas correction of gauge readings against the published factors, and the gauge verb."""

import json

import pytest
from strikeline.model.composition import pure
from strikeline.model.gauges import GaugeCorrection, correct
from strikeline.profiles.gasdata import find_gas
from strikeline.profiles.gauges import gauge_correction
from strikeline.tui import cli

# Ionisation-gauge relative sensitivity, N2 = 1, true = indicated / S: CRC Handbook of Chemistry
# and Physics, section 15, after Redhead (found; +/-15 % gauge to gauge). Two quoted digits.
IONISATION = {"He": 0.18, "Ne": 0.31, "Ar": 1.4, "Kr": 1.9, "Xe": 2.7, "H2": 0.43, "CO2": 1.4, "H2O": 0.93, "N2": 1.0}

# N2-calibrated thermal-conductivity gauge, linear range, true = C x indicated (common practice;
# ranges as quoted in check-values.md: Ar 1.6-1.7).
THERMAL = {"Ar": (1.6, 1.7), "He": (0.8, 0.8), "H2": (0.5, 0.5), "Ne": (1.4, 1.4), "CO2": (0.9, 0.9), "N2": (1.0, 1.0)}


@pytest.mark.parametrize(("gas", "s"), IONISATION.items())
def test_ionisation_correction_is_one_over_the_relative_sensitivity(gas, s):
    c = gauge_correction("ionisation", pure(find_gas(gas)))
    assert c.factor == pytest.approx(1 / s, rel=0.005)
    assert correct(1e-4, c)[0] == pytest.approx(1e-4 / s, rel=0.005)


@pytest.mark.parametrize(("gas", "band"), THERMAL.items())
def test_thermal_gauge_factors_in_their_linear_range(gas, band):
    c = gauge_correction("thermal", pure(find_gas(gas)))
    assert band[0] - 1e-9 <= c.factor <= band[1] + 1e-9
    true, approx = correct(10.0, c)
    assert true == pytest.approx(10.0 * c.factor) and not approx


def test_thermal_gauge_outside_its_linear_range_is_approximate():
    c = gauge_correction("thermal", pure(find_gas("Ar")))
    assert correct(500.0, c)[1] is True


def test_capacitance_gauges_need_no_correction():
    for gas in ("Ar", "He", "air", "Xe"):
        assert correct(3.0, gauge_correction("capacitance", pure(find_gas(gas)))) == (3.0, False)


def test_profile_override_and_missing_factor():
    assert gauge_correction("thermal", pure(find_gas("Ar")), override=1.7).factor == 1.7
    missing = gauge_correction("thermal", pure(find_gas("Xe")))
    assert missing.factor is None and correct(2.0, missing) == (2.0, True)
    assert correct(2.0, GaugeCorrection("ionisation", 0.5, None, "")) == (1.0, False)


def test_gauge_verb_reads_the_demo_headless(capsys):
    assert cli.main(["gauge", "--bench", "demo", "--samples", "4", "--json"]) == 0
    every = [json.loads(x) for x in capsys.readouterr().out.strip().splitlines()]
    rows = [r for r in every if r["kind"] == "reading"]
    assert len(rows) == 4
    assert [r["port"] for r in every if r["kind"] == "counts"] == ["controller"]  # the port's counts come last
    assert {"channel", "quantity", "value_si", "indicated", "status", "t"} <= rows[0].keys()
    chamber = next(r for r in rows if r["channel"] == "chamber")
    assert chamber["value_si"] == pytest.approx(chamber["indicated"] * 1.6)  # thermal gauge in argon
    assert chamber["t"].endswith("Z")


def test_gauge_verb_text_and_errors(capsys):
    assert cli.main(["gauge", "--bench", "demo", "--samples", "3"]) == 0
    out = capsys.readouterr().out
    assert "chamber" in out and "indicated" in out
    assert cli.main(["gauge", "--bench", "demo-magnetron"]) == 2
    assert "no [[port]]" in capsys.readouterr().err
    assert cli.main(["gauge", "--bench", "demo", "--samples", "0"]) == 2
