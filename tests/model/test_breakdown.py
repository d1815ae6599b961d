"""Every gas's default breakdown curve against published measurements, and the law against independent
solutions of its own criterion (Paschen's closed form, scipy's root finding).

Published values live in tests/reference/breakdown.toml, each with its source and how far it was
checked; the tolerances follow the issue that asked for them (a cathode's spread).
"""

import math
import tomllib
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st
from scipy import constants, optimize
from strikeline.model import paschen
from strikeline.model.bench import Bench, OperatingPoint
from strikeline.model.breakdown import law_for
from strikeline.model.composition import pure
from strikeline.model.forecast import forecast
from strikeline.model.gas import TownsendConstants, one_segment
from strikeline.model.ionisation import TD_PER_V_PER_PA_M
from strikeline.model.secondary import Yield
from strikeline.profiles.gasdata import find_cathode, find_gas, gases

TORR_CM = constants.torr * constants.centi  # 1 Torr cm in Pa m
REF = tomllib.loads((Path(__file__).parent.parent / "reference" / "breakdown.toml").read_text())
COPPER = find_cathode("Cu")
ALL_GASES = sorted(gases())


def _law(name):
    g = find_gas(name)
    return law_for(pure(g), [g.yield_])


def _bench(name, gap=0.01, **kw):
    return Bench("t", pure(find_gas(name)), COPPER, gap, **kw)


# -- the published tables ---------------------------------------------------------------------------


def _minimum_cases():
    for gas, row in REF["minimum"].items():
        marks = [pytest.mark.xfail(reason=row["xfail"], strict=True)] if "xfail" in row else []
        yield pytest.param(gas, row, id=gas, marks=marks)


@pytest.mark.parametrize(("gas", "row"), list(_minimum_cases()))
def test_default_curve_meets_the_published_minimum(gas, row):
    # [raizer-1991] Table 7.1 after [von-engel-1965]: V_min within 15 %, (pd)_min within a factor 1.4.
    pd_min, v_min = _law(gas).minimum()
    assert v_min == pytest.approx(row["V"], rel=0.15), row["source"]
    ratio = pd_min / TORR_CM / row["pd_Torr_cm"]
    assert 1 / 1.4 <= ratio <= 1.4, f"(pd)_min {pd_min / TORR_CM:.3g} Torr cm against {row['pd_Torr_cm']}"


@pytest.mark.parametrize("gas", [g for g, row in REF["minimum"].items() if "xfail" not in row])
def test_the_forecast_band_holds_the_published_minimum(gas):
    # The uncertainty band at the published (pd)_min contains the published V_min.
    row = REF["minimum"][gas]
    T_ref = find_gas(gas).constants.reference_temperature
    p = row["pd_Torr_cm"] * TORR_CM / 0.01  # a 1 cm gap at the reference temperature
    f = forecast(OperatingPoint(p, 0.01, None, T_ref), _bench(gas))
    lo, hi = f.breakdown_band
    assert lo <= row["V"] <= hi


@pytest.mark.parametrize("row", REF["point"], ids=lambda r: f"{r['gas']}-{r['gap_m'] * 1e3:g}mm")
def test_default_curve_meets_published_points_off_the_minimum(row):
    f = forecast(
        OperatingPoint(row["pressure_Pa"], row["gap_m"], None, row["temperature_K"]), _bench(row["gas"], row["gap_m"])
    )
    assert f.breakdown_voltage == pytest.approx(row["V"], rel=row["tolerance"]), row["source"]


def test_air_at_one_atmosphere_breaks_down_near_the_streamer_avalanche():
    # Raether-Meek: a streamer forms when an avalanche reaches ~1e8 electrons, alpha d ~ 18-20
    # ([raether-1964], [meek-craggs-1953]; check-values.md, found); uniform-field air at 1 atm and 1 cm
    # breaks down near it. alpha here is air's own [morrow-lowke-1997] (found), at the breakdown voltage.
    f = forecast(OperatingPoint(constants.atm, 0.01, None, 293.0), _bench("air"))
    g = forecast(OperatingPoint(constants.atm, 0.01, f.breakdown_voltage, 293.0), _bench("air"))
    assert 15.0 <= g.alpha_d <= 22.0
    assert {"spark", "streamer_near"} & {x.code for x in g.flags}


@pytest.mark.parametrize("gas", ["air", "oxygen"])
def test_critical_field_of_air_and_oxygen(gas):
    # Where ionisation equals attachment: about 110-120 Td for oxygen and dry air (common practice;
    # [raizer-1991]); [morrow-lowke-1997]'s dry-air fits cross at about 107 Td.
    crit = _law(gas).critical_E_over_p * TD_PER_V_PER_PA_M
    assert 100 <= crit <= 130


@pytest.mark.parametrize("gas", ALL_GASES)
def test_every_gas_reports_its_critical_field_or_why_it_has_none(gas):
    g = find_gas(gas)
    f = forecast(OperatingPoint(100.0, 0.01, 1000.0), _bench(gas))
    if g.attachment is not None:
        assert f.critical_E_over_N_Td is not None and f.to_json()["critical_E_over_N_Td"] > 0
    else:
        assert f.critical_E_over_N_Td is None
        assert ("attachment_not_modelled" in {x.code for x in f.flags}) is g.attaches_unmodelled


def test_argon_left_branch_rises_steeply_but_stays_finite():
    # On technical cathodes gamma grows with E/N ([phelps-petrovic-1999]), so argon's left branch
    # climbs without the vertical asymptote of a constant gamma: finite, monotonic, and steep (more
    # than five-fold over the decade of pd below the minimum).
    law = _law("argon")
    pd_min, v_min = law.minimum()
    pd = np.geomspace(pd_min / 100, pd_min, 400)
    v = law.voltage(pd)[0]
    assert np.all(np.isfinite(v)) and np.all(np.diff(v) < 0)
    assert law.voltage(pd_min / 10)[0] > 5 * v_min
    assert law.no_breakdown_pd() < pd_min / 1000


# -- the law against independent solutions ------------------------------------------------------------


@pytest.mark.parametrize("gamma", [0.001, 0.01, 0.07, 0.3])
@pytest.mark.parametrize("gas", ["air", "nitrogen", "argon", "helium", "hydrogen"])
def test_one_segment_constant_gamma_law_is_paschens_closed_form(gas, gamma):
    # The traced law, given one A, B pair and a constant gamma, is Paschen's law (the closed form of
    # [raizer-1991] eq. 7.4), over the table and at the exact points.
    c = find_gas(gas).constants
    c = TownsendConstants(c.A, c.B, 0.0, math.inf, c.reference_temperature, "")
    base = find_gas(gas)
    g = type(base)(**{**base.__dict__, "ionisation": one_segment(c), "attachment": None, "law": None})
    law = law_for(pure(g), [Yield(gamma, gamma, gamma, "")])
    pd_min, v_min = paschen.minimum(c.A, c.B, gamma)
    assert law.minimum()[1] == pytest.approx(v_min, rel=1e-6)
    assert law.minimum()[0] == pytest.approx(pd_min, rel=1e-3)
    pd = np.geomspace(paschen.no_breakdown_pd(c.A, gamma) * 1.05, pd_min * 1e4, 5000)
    assert law.voltage(pd)[0] == pytest.approx(paschen.breakdown_voltage(pd, c.A, c.B, gamma), rel=2e-4)
    few = pd[::250]
    assert law.voltage(few)[0] == pytest.approx(paschen.breakdown_voltage(few, c.A, c.B, gamma), rel=1e-9)


@pytest.mark.parametrize("gas", ALL_GASES)
def test_curve_points_solve_the_townsend_criterion_by_root_finding(gas):
    # scipy's brentq on the criterion gamma alpha/(alpha - eta)(exp((alpha - eta) d) - 1) = 1 in the
    # voltage, with the law's own alpha, eta and gamma at each trial field, gives the curve's voltage.
    law = _law(gas)
    pd_min, _ = law.minimum()
    for rpd in pd_min * np.array([0.5, 1.0, 3.0, 30.0]):
        v = float(law.townsend_voltage(rpd))
        if not math.isfinite(v):
            continue

        def criterion(V, rpd=rpd):
            y = V / rpd
            a, e, g = float(law.a(y)) * rpd, float(law.e(y)) * rpd, float(law.g(y))
            net = a - e
            return g * a / net * math.expm1(net) - 1.0 if abs(net) > 1e-12 else g * a - 1.0

        root = optimize.brentq(criterion, v * 0.5, v * 2.0, xtol=1e-9, rtol=1e-12)
        assert root == pytest.approx(v, rel=1e-6)


@given(st.sampled_from(ALL_GASES), st.floats(min_value=-2, max_value=3), st.floats(min_value=-2, max_value=2))
def test_similarity_law_vb_depends_on_pd_only(name, log_pd, log_k):
    # Paschen's similarity law: scaling p up and d down by the same factor keeps V_b. Three-body
    # attachment grows with p alone and breaks it, so an attaching gas is held to it only where that is
    # small (below a kilopascal).
    b = _bench(name)
    pd = 10.0**log_pd
    k = 10.0**log_k
    f1 = forecast(OperatingPoint(pd / 0.01, 0.01), b)
    f2 = forecast(OperatingPoint(pd / 0.01 * k, 0.01 / k), b)
    attaches = find_gas(name).attachment is not None
    if f1.breakdown_voltage is None:
        assert f2.breakdown_voltage is None
    elif not attaches:
        assert f2.breakdown_voltage == pytest.approx(f1.breakdown_voltage, rel=1e-7)
    elif max(pd / 0.01, pd / 0.01 * k) < 1e3:
        assert f2.breakdown_voltage == pytest.approx(f1.breakdown_voltage, rel=1e-3)


@given(st.sampled_from(ALL_GASES), st.lists(st.floats(min_value=-4, max_value=4), min_size=1, max_size=50))
def test_vb_never_below_the_minimum_and_never_negative(name, log_pds):
    law = _law(name)
    _, v_min = law.minimum()
    v = law.voltage(10.0 ** np.array(log_pds))[0]
    finite = v[np.isfinite(v)]
    assert np.all(finite >= v_min * (1 - 1e-6))
    assert not np.any(np.isinf(v))


@pytest.mark.parametrize("gas", ALL_GASES)
def test_branches_are_monotonic(gas):
    law = _law(gas)
    pd_min, _ = law.minimum()
    left = np.geomspace(max(law.no_breakdown_pd() * 1.001, pd_min / 1e3), pd_min * 0.99, 400)
    right = np.geomspace(pd_min * 1.01, pd_min * 1e5, 400)
    vl, vr = law.voltage(left)[0], law.voltage(right)[0]
    assert np.all(np.diff(vl[np.isfinite(vl)]) < 0)
    assert np.all(np.diff(vr) > 0)


@pytest.mark.parametrize("gas", ALL_GASES)
def test_a_long_table_and_a_few_points_agree(gas):
    # Long arrays are read off the traced table; up to 64 points are polished to the exact root.
    law = _law(gas)
    pd_min, _ = law.minimum()
    pd = np.geomspace(pd_min / 3, pd_min * 1e3, 1000)
    assert law.voltage(pd)[0][::50] == pytest.approx(law.voltage(pd[::50])[0], rel=1e-4, nan_ok=True)


@pytest.mark.parametrize("shape", [(), (1,), (7,), (3, 4), (2, 3, 5)])
def test_array_shape_in_is_shape_out(shape):
    law = _law("argon")
    pd = np.full(shape, 1.0)
    assert np.shape(law.voltage(pd)[0]) == shape
    assert np.shape(law.branch(pd)) == shape
    assert np.shape(law.e_over_p(pd)) == shape


def test_three_body_attachment_by_hand_in_morrow_and_lowkes_units():
    # eta3/N = 4.7778e-59 (E/N)^-1.2749 N cm^2 (E/N in V cm^2, N in cm^-3) [morrow-lowke-1997], by hand
    # at 120 Td and one atmosphere of air at 0 C (N = Loschmidt, scipy.constants).
    air = find_gas("air")
    N_cm3 = constants.physical_constants["Loschmidt constant (273.15 K, 101.325 kPa)"][0] * 1e-6
    x = 120e-17  # V cm^2
    eta3_per_cm = 4.7778e-59 * x**-1.2749 * N_cm3 * N_cm3
    y = 120.0 / TD_PER_V_PER_PA_M  # V/(Pa m)
    total = float(air.attachment.per_p(y, constants.atm)) * constants.atm  # 1/m
    two = float(air.attachment.per_p(y)) * constants.atm
    assert (total - two) / 100 == pytest.approx(eta3_per_cm, rel=1e-9)


def test_no_breakdown_left_of_a_constant_gammas_asymptote():
    # Nitrogen's gamma is constant: left of its asymptote nothing breaks the gap down.
    b = _bench("nitrogen", 0.03)
    law = _law("nitrogen")
    p = law.no_breakdown_pd() * 0.5 / 0.03
    f = forecast(OperatingPoint(p, 0.03, 1000.0, find_gas("nitrogen").constants.reference_temperature), b)
    assert f.breakdown_voltage is None and f.branch == "none" and f.strikes is False
    assert f.to_json()["breakdown_V"] is None
    assert any(fl.code == "no_breakdown" for fl in f.flags)


def test_gas_temperature_scales_pd_to_reference_density():
    # At twice the reference temperature the same pressure holds half the molecules.
    b = _bench("nitrogen")
    T_ref = find_gas("nitrogen").constants.reference_temperature
    hot = forecast(OperatingPoint(200.0, 0.01, None, 2 * T_ref), b)
    cold = forecast(OperatingPoint(100.0, 0.01, None, T_ref), b)
    assert hot.reduced_pd == pytest.approx(cold.reduced_pd)
    assert hot.breakdown_voltage == pytest.approx(cold.breakdown_voltage)
    assert hot.minimum_reduced_pd == pytest.approx(cold.minimum_reduced_pd)
    assert hot.minimum_pd == pytest.approx(2 * cold.minimum_pd)  # true pd: twice the pressure at the minimum


def test_extrapolated_data_are_flagged_and_widen_the_band():
    # Helium at one atmosphere breaks down below the 20 V/(cm Torr) its published pair starts at.
    b = _bench("helium")
    far = forecast(OperatingPoint(1e5, 0.01), b)
    assert far.breakdown_E_over_p * TORR_CM < 20
    flag = next(fl for fl in far.flags if fl.code == "outside_fitted_range")
    assert "extrapolated" in flag.reason and "[raizer-1991]" in flag.method
    inside = forecast(OperatingPoint(400.0, 0.01), b)
    assert not any(fl.code == "outside_fitted_range" for fl in inside.flags)
    # the band: the data's 25 % and 25 % more for the extrapolation, on top of the gamma range
    assert "extrapolated" in far.band_source and "extrapolated" not in inside.band_source
    assert far.breakdown_band[1] >= 1.5 * far.breakdown_voltage


def test_reduced_pd_says_so_in_the_json():
    f = forecast(OperatingPoint(20.0, 0.03, 600.0, 350.0), _bench("argon", 0.03))
    j = f.to_json()
    assert j["minimum"]["reduced_pd_Pa_m"] == pytest.approx(j["minimum"]["pd_Pa_m"] * 273.15 / 350.0)
    assert j["reduced_pd_Pa_m"] == pytest.approx(j["pd_Pa_m"] * 273.15 / 350.0)
