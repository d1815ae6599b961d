"""The ignition forecast: glow data, load line, stray gaps, streamers, afterglow, demo cases."""

import dataclasses
import math
import tomllib
from pathlib import Path

import pytest
from scipy import constants, special
from strikeline.model import afterglow, glow
from strikeline.model.bench import Bench, Chamber, OperatingPoint, StrayGap, Supply
from strikeline.model.composition import pure
from strikeline.model.forecast import forecast
from strikeline.profiles.bench import load_bench
from strikeline.profiles.gasdata import find_cathode, find_gas

REF = tomllib.loads((Path(__file__).resolve().parents[1] / "reference" / "normal_glow.toml").read_text())
TORR = constants.torr
J_UNIT = 1e-6 / constants.centi**2 / TORR**2  # uA cm^-2 Torr^-2 in A m^-2 Pa^-2


@pytest.mark.parametrize("gas", ["argon", "nitrogen", "air", "helium", "neon"])
def test_normal_glow_on_iron_matches_the_handbook_table(gas):
    # Raizer (1991) Tables 8.1-8.2 after von Engel, from memory (tests/reference/normal_glow.toml).
    row = REF[gas]
    g = find_cathode("Fe").normal_glow[gas]
    assert g.cathode_fall == pytest.approx(row["V_n"], abs=0.5)
    assert g.current_density_per_p2 / J_UNIT == pytest.approx(row["j"], rel=0.03)
    assert g.pd_n / (TORR * constants.centi) == pytest.approx(row["pd"], abs=0.005)


@pytest.mark.parametrize("gas", ["argon", "air", "nitrogen"])
def test_normal_cathode_falls_on_copper(gas):
    assert find_cathode("Cu").normal_glow[gas].cathode_fall == pytest.approx(REF["copper"][gas], abs=0.5)


def test_every_cathode_fall_exceeds_the_least_a_glow_needs():
    # A glow needs a cathode drop of at least ~50-70 V (common practice).
    from strikeline.profiles.gasdata import cathodes

    for c in cathodes().values():
        for row in c.normal_glow.values():
            assert row.cathode_fall > 70


def test_borrowed_iron_values_say_so():
    g = find_cathode("Cu").normal_glow["argon"]
    assert g.cathode_fall == 130 and "from iron" in g.source and g.current_density_per_p2 is not None


def _voltage_for_alpha_d(gas, p, d, ad):
    # alpha = A p exp(-B p / E) solved for E at alpha = ad / d (Townsend's form; SI constants).
    c = gas.constants
    return c.B * p / math.log(c.A * p * d / ad) * d


@pytest.mark.parametrize(("ad", "spark"), [(20.0, True), (19.0, True), (17.5, False), (12.0, False)])
def test_spark_flag_follows_the_published_raether_meek_criterion(ad, spark):
    # Raether-Meek: an avalanche of ~1e8 electrons, alpha x about 18-20, becomes a streamer
    # (Raether, Electron Avalanches and Breakdown in Gases, 1964; Meek & Craggs 1953; found). At
    # the top of the published range the forecast must say spark; below its bottom it must not.
    # Nitrogen at 50 Torr across 1 cm (50 Torr cm: Townsend constants alone, no empirical law).
    n2 = find_gas("N2")
    p, d = 50 * TORR, 0.01
    b = Bench("n2 gap", pure(n2), find_cathode("Cu"), gap=d)
    V = _voltage_for_alpha_d(n2, p * 273.15 / 293.0, d, ad)
    f = forecast(OperatingPoint(p, d, V, 293.0), b)
    assert f.alpha_d == pytest.approx(ad, rel=1e-9)
    assert ("spark" in _codes(f, "danger")) is spark
    if not spark and ad >= 0.75 * 18.4:
        assert "streamer_near" in _codes(f, "watch")


def test_bessel_zero_matches_scipy_special():
    assert afterglow.BESSEL_J0_FIRST_ZERO == pytest.approx(special.jn_zeros(0, 1)[0], rel=1e-15)


def test_ambipolar_limit_matches_the_full_textbook_form():
    # D_a = (mu_i D_e + mu_e D_i) / (mu_i + mu_e), Einstein D = mu kT/e ([lieberman-lichtenberg-2005]
    # sec. 5.2, from memory); with mu_e = 1e3 mu_i the limit mu_i (T_e + T_i) holds to 0.1 %.
    mu_i, te, ti = 0.5, 2.0, 0.03
    mu_e = 1e3 * mu_i
    full = (mu_i * mu_e * te + mu_e * mu_i * ti) / (mu_i + mu_e)
    assert afterglow.ambipolar_diffusion(mu_i, te, ti) == pytest.approx(full, rel=1e-3)


def test_ion_mobility_scales_with_density():
    # mu = K0 (760 Torr / p)(T / 273.15 K) (check-values.md).
    assert afterglow.ion_mobility(1.6e-4, TORR, 273.15) == pytest.approx(1.6e-4 * 760)


def test_cylinder_diffusion_length_limits():
    # Long cylinder: Lambda = R / j01; flat slab of length L: Lambda = L / pi.
    assert afterglow.cylinder_diffusion_length(0.1, 1e9) == pytest.approx(0.1 / special.jn_zeros(0, 1)[0])
    assert afterglow.cylinder_diffusion_length(1e9, 0.1) == pytest.approx(0.1 / math.pi)


# Load-line cases solved by hand in the test.


def test_load_line_normal_glow_by_hand():
    # V0 500 V, R 100 kohm, V_n 200 V, full cover at 10 mA: I = (500 - 200)/1e5 = 3 mA, 30 % covered.
    ll = glow.load_line(500.0, 1e5, None, 200.0, 10.0, 1e-3)
    assert ll.current == pytest.approx(3e-3, rel=1e-9)
    assert ll.voltage == 200.0 and ll.regime == "normal_glow"
    assert ll.covered_fraction == pytest.approx(0.3)


def test_load_line_abnormal_glow_by_hand():
    # V0 1000 V, R 10 kohm, V_n 200 V, full cover at 1 mA, V = 200 x with x^3 = I / 1 mA:
    # 200 x = 1000 - 10 x^3, i.e. x^3 + 20 x - 100 = 0, solved by Cardano's formula.
    q, p = -100.0, 20.0
    r = math.sqrt((q / 2) ** 2 + (p / 3) ** 3)
    x = math.cbrt(-q / 2 + r) + math.cbrt(-q / 2 - r)
    ll = glow.load_line(1000.0, 1e4, None, 200.0, 1.0, 1e-3)
    assert ll.regime == "abnormal_glow"
    assert ll.current == pytest.approx(x**3 * 1e-3, rel=1e-9)
    assert ll.voltage == pytest.approx(200 * x, rel=1e-9)


def test_load_line_current_limit_by_hand():
    # R alone would pass (1000 - 200)/100 = 8 A; the 50 mA limit holds it.
    ll = glow.load_line(1000.0, 100.0, 0.05, 200.0, None, None)
    assert ll.current == 0.05 and ll.limited_by == "current_limit" and ll.short_circuit_current == 0.05


def test_load_line_dark_discharge_and_unlimited_supply():
    assert glow.load_line(1000.0, 1e9, None, 200.0, None, None).regime == "townsend_dark"  # 0.8 uA
    ll = glow.load_line(1000.0, 0.0, None, 200.0, None, None)
    assert ll.regime == "arc_risk" and ll.limited_by == "nothing"


def test_load_line_arc_risk_at_high_current_density():
    # j_n unknown, so the fall stays at V_n: I = (1000 - 200)/1000 = 0.8 A on 0.1 cm^2 is
    # 8 A/cm^2, well past 1 A/cm^2.
    ll = glow.load_line(1000.0, 1000.0, None, 200.0, None, 1e-5)
    assert ll.current == pytest.approx(0.8) and ll.current_density == pytest.approx(8e4)
    assert ll.regime == "arc_risk"
    # With j_n known the abnormal glow's rising fall holds the current near a milliampere.
    assert glow.load_line(1000.0, 1000.0, None, 200.0, 1.0, 1e-5).regime == "abnormal_glow"


def _diode(**kw):
    base = load_bench("demo").bench
    return dataclasses.replace(base, **kw)


def _codes(f, level=None):
    return {x.code for x in f.flags if level is None or x.level == level}


@pytest.mark.parametrize("ref", ["demo", "demo-magnetron"])
def test_demo_benches_raise_no_false_danger(ref):
    b = load_bench(ref).bench
    f = forecast(OperatingPoint(b.pressure, b.gap, None, b.gas_temperature), b)
    assert f.strikes is True
    assert _codes(f, "danger") == set()
    assert f.load_line is not None and f.load_line.regime in ("normal_glow", "abnormal_glow")
    assert f.afterglow is not None


def test_magnetron_strikes_only_with_its_field():
    # Without the crossed-field treatment a magnetron at 0.5 Pa would need kilovolts its supply has not.
    b = load_bench("demo-magnetron").bench
    point = OperatingPoint(0.5, b.gap, None, 293.0)
    bare = forecast(point, dataclasses.replace(b, magnetic_field=None))
    assert not bare.strikes and bare.breakdown_voltage > b.supply.open_circuit_voltage
    f = forecast(point, b)
    assert f.breakdown_voltage is not None and f.strikes
    # omega_ce / nu_m with omega_ce = e B / m_e (scipy.constants) and nu_m = (nu_m/p) p.
    omega = constants.e * 0.03 / constants.m_e
    nu = b.fill.main.electron_collision_per_Pa * 0.5 * b.fill.main.constants.reference_temperature / 293.0
    assert f.hall_parameter == pytest.approx(omega / nu)
    assert f.effective_pressure == pytest.approx(0.5 * math.sqrt(1 + (omega / nu) ** 2))
    assert "crossed_field" in _codes(f)


def test_stray_gap_that_breaks_down_first_is_danger_naming_it():
    # Left of the minimum a longer path breaks down first: a 44 mm path behind the cathode
    # strikes below the 30 mm main gap at 20 Pa argon.
    b = _diode(stray_gaps=(StrayGap("dark-space shield", 0.002), StrayGap("path behind cathode", 0.044)))
    f = forecast(OperatingPoint(20.0, 0.03, None, 293.0), b)
    behind = next(g for g in f.stray_gaps if g.name == "path behind cathode")
    shield = next(g for g in f.stray_gaps if g.name == "dark-space shield")
    assert behind.first and behind.breakdown_voltage < f.breakdown_voltage
    assert not shield.first and shield.breakdown_voltage > f.breakdown_voltage
    danger = [x for x in f.flags if x.code == "stray_gap_first"]
    assert len(danger) == 1 and danger[0].level == "danger" and "path behind cathode" in danger[0].reason
    assert "left_branch_longer_paths" in _codes(f)


def test_stray_gaps_ordered_on_the_right_branch():
    # Right of the minimum the shorter gap needs the lower voltage... unless it is left of it.
    b = _diode(stray_gaps=(StrayGap("wide clamp", 0.06),))
    f = forecast(OperatingPoint(500.0, 0.03, None, 293.0), b)
    assert f.branch == "right"
    assert f.stray_gaps[0].breakdown_voltage > f.breakdown_voltage and not f.stray_gaps[0].first
    assert "left_branch_longer_paths" not in _codes(f)


def test_high_pd_air_gap_raises_the_spark_flag():
    b = Bench("air gap", pure(find_gas("air")), find_cathode("Cu"), gap=0.01)
    f = forecast(OperatingPoint(constants.atm, 0.01, 35e3, 293.0), b)
    spark = [x for x in f.flags if x.code == "spark"]
    assert spark and spark[0].level == "danger" and "Raether" in spark[0].method


def test_low_pd_glow_raises_no_streamer_flag():
    f = forecast(OperatingPoint(20.0, 0.03, 5e3, 293.0), _diode())
    assert not {"spark", "streamer_near"} & _codes(f)


def test_marginal_when_the_supply_sits_inside_the_uncertainty():
    b = _diode(supply=None)
    base = forecast(OperatingPoint(100.0, 0.03, None, 293.0), b)
    vb = base.breakdown_voltage
    lo, hi = base.breakdown_band
    assert lo < vb < hi
    f = forecast(OperatingPoint(100.0, 0.03, vb * 1.05, 293.0), b)
    assert "marginal" in _codes(f) and f.margin_fraction == pytest.approx(0.05)
    assert "strikes" in _codes(forecast(OperatingPoint(100.0, 0.03, hi * 1.01, 293.0), b))
    assert "below_breakdown" in _codes(forecast(OperatingPoint(100.0, 0.03, lo * 0.99, 293.0), b))


def test_unballasted_supply_is_danger():
    b = _diode(supply=Supply(1200.0, None, 0.0))
    f = forecast(OperatingPoint(20.0, 0.03, None, 293.0), b)
    assert "unlimited_current" in _codes(f, "danger")


def test_afterglow_residual_after_the_off_time():
    b = _diode(chamber=Chamber(0.15, 0.30))
    f = forecast(OperatingPoint(20.0, 0.03, None, 293.0), b)
    a = f.afterglow
    assert a.residual_fraction == pytest.approx(math.exp(-b.supply.off_time / a.decay_time))
    assert a.decay_time == pytest.approx(a.diffusion_length**2 / a.ambipolar_diffusion)
    long_off = _diode(supply=dataclasses.replace(b.supply, frequency=100.0, off_time=5e-3))
    assert "afterglow_lost" in _codes(forecast(OperatingPoint(20.0, 0.03, None, 293.0), long_off))


def test_strike_json_gains_load_line_and_afterglow_for_the_demo(capsys):
    import json

    from strikeline.tui import cli

    assert cli.main(["strike", "--bench", "demo", "--json"]) == 0
    d = json.loads(capsys.readouterr().out)
    assert {"current_A", "voltage_V", "regime", "covered_fraction"} <= d["load_line"].keys()
    assert {"ambipolar_D_m2_per_s", "diffusion_length_m", "decay_time_s", "residual_fraction"} <= d["afterglow"].keys()
    assert all(f["method"] for f in d["flags"])


def test_curve_verb_applies_the_crossed_field_pressure_like_strike(capsys):
    import csv
    import io
    import json

    from strikeline.tui import cli

    assert cli.main(["curve", "--bench", "demo-magnetron", "--from", "0.5 Pa", "--to", "0.6 Pa", "--points", "2"]) == 0
    rows = list(csv.DictReader(io.StringIO(capsys.readouterr().out)))
    assert float(rows[0]["pressure_Pa"]) == pytest.approx(0.5) and float(rows[0]["gap_m"]) == pytest.approx(0.06)
    assert cli.main(["strike", "--bench", "demo-magnetron", "--pressure", "0.5 Pa", "--json"]) == 0
    d = json.loads(capsys.readouterr().out)
    assert float(rows[0]["breakdown_V"]) == pytest.approx(d["breakdown_V"], rel=1e-9)
