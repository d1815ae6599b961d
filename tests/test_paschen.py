"""Paschen's law against numerical solutions, handbook values and its own invariants."""

import math

import numpy as np
import pytest
from hypothesis import assume, given
from hypothesis import strategies as st
from scipy import constants, optimize
from strikeline.model import paschen, townsend
from strikeline.model.bench import Bench, OperatingPoint
from strikeline.model.forecast import forecast
from strikeline.profiles.loader import find_cathode, find_gas

TORR_CM = constants.torr * constants.centi  # 1 Torr cm in Pa m
PER_CM_TORR = 1.0 / TORR_CM

gas_names = st.sampled_from(["air", "N2", "Ar", "He", "Ne", "Kr", "Xe", "H2", "CO2", "H2O"])
gammas = st.floats(min_value=1e-4, max_value=0.5)


def _abg(name, gamma):
    c = find_gas(name).constants
    return c.A, c.B, gamma


@pytest.mark.parametrize("name", ["air", "N2", "Ar", "He", "H2"])
@pytest.mark.parametrize("gamma", [0.001, 0.01, 0.07, 0.3])
def test_closed_form_minimum_matches_numerical_minimisation(name, gamma):
    # Reference: scipy.optimize.minimize_scalar on V_b(pd), independent of the closed form.
    A, B, g = _abg(name, gamma)
    pd_min, v_min = paschen.minimum(A, B, g)
    pd0 = paschen.no_breakdown_pd(A, g)
    res = optimize.minimize_scalar(
        lambda lx: float(paschen.breakdown_voltage(math.exp(lx), A, B, g)),
        bounds=(math.log(pd0 * 1.01), math.log(pd0 * 1e4)),
        method="bounded",
        options={"xatol": 1e-10},
    )
    assert math.exp(res.x) == pytest.approx(pd_min, rel=1e-4)
    assert res.fun == pytest.approx(v_min, rel=1e-9)


def test_air_minimum_derived_from_raizer_constants():
    # check-values.md, "derived": air 15/365 (Raizer Table 4.1), gamma 0.01 ->
    # (pd)_min 0.836 Torr cm, V_min 305 V. Three quoted digits: 0.06 % and 0.2 %.
    A, B, g = _abg("air", 0.01)
    pd_min, v_min = paschen.minimum(A, B, g)
    assert pd_min / TORR_CM == pytest.approx(0.836, abs=0.0005)
    assert v_min == pytest.approx(305, abs=0.5)


def test_air_minimum_against_measured_handbook_minimum():
    # Measured minimum sparking potential of air: about 327 V near pd = 0.57 Torr cm
    # (handbook tables of minimum sparking potentials, e.g. Naidu & Kamaraju, High Voltage
    # Engineering; check-values.md, found). Constant A, B with one gamma cannot match both:
    # V_min lands within 10 %, (pd)_min about 45 % high, so each has its own tolerance.
    A, B, g = _abg("air", 0.01)
    pd_min, v_min = paschen.minimum(A, B, g)
    assert v_min == pytest.approx(327, rel=0.10)
    assert 0.57 / 1.6 < pd_min / TORR_CM < 0.57 * 1.6


def _air_bench():
    return Bench("t", find_gas("air"), find_cathode("Cu"), gap=0.01)


def test_air_one_atmosphere_one_centimetre_near_30_kV():
    # 1 cm of air at 1 atm, 20 C: about 30 kV (empirical uniform-field law, usually credited
    # to Kuffel & Zaengl; check-values.md, found). The law itself gives 30.3 kV for x = 1 cm.
    f = forecast(OperatingPoint(constants.atm, 0.01, None, 293.0), _air_bench())
    assert f.law == "uniform-field"
    assert f.breakdown_voltage == pytest.approx(30.3e3, rel=0.005)
    assert f.breakdown_voltage == pytest.approx(30e3, rel=0.03)


def test_air_dielectric_strength_about_3_MV_per_m():
    # Dry air holds about 3.0 MV/m (AMS Glossary of Meteorology, "dielectric strength",
    # found); quoted to two figures and for centimetre gaps, so 10 %.
    f = forecast(OperatingPoint(constants.atm, 0.01, None, 293.15), _air_bench())
    assert f.breakdown_voltage / 0.01 == pytest.approx(3.0e6, rel=0.10)


def test_constant_AB_over_predict_air_at_high_pd():
    # The reason the empirical law exists: Paschen with constant A, B is above it at 1 atm, 1 cm.
    A, B, g = _abg("air", 0.01)
    rpd = constants.atm * 0.01 * 273.15 / 293.0
    assert float(paschen.breakdown_voltage(rpd, A, B, g)) > 1.1 * 30.3e3


@given(gas_names, gammas, st.floats(min_value=-3, max_value=3), st.floats(min_value=-2, max_value=2))
def test_similarity_law_vb_depends_on_pd_only(name, gamma, log_pd, log_k):
    # Paschen's similarity law: scaling p up and d down by the same factor keeps V_b.
    b = Bench("t", find_gas(name), find_cathode("Cu"), gap=0.01, gamma=gamma)
    pd = 10.0**log_pd
    k = 10.0**log_k
    d = 0.01
    f1 = forecast(OperatingPoint(pd / d, d), b)
    f2 = forecast(OperatingPoint(pd / d * k, d / k), b)
    if f1.breakdown_voltage is None:
        assert f2.breakdown_voltage is None
    else:
        assert f2.breakdown_voltage == pytest.approx(f1.breakdown_voltage, rel=1e-9)


@given(gas_names, gammas, st.lists(st.floats(min_value=-4, max_value=4), min_size=1, max_size=50))
def test_vb_never_below_the_minimum_and_never_negative(name, gamma, log_pds):
    A, B, g = _abg(name, gamma)
    _, v_min = paschen.minimum(A, B, g)
    v = paschen.breakdown_voltage(10.0 ** np.array(log_pds), A, B, g)
    finite = v[np.isfinite(v)]
    assert np.all(finite >= v_min * (1 - 1e-12))
    # where there is no breakdown the answer is NaN, never a negative or infinite number
    assert not np.any(np.isinf(v))


@given(gas_names, gammas, st.floats(min_value=1.0001, max_value=1e4))
def test_inverse_branches_map_back(name, gamma, ratio):
    A, B, g = _abg(name, gamma)
    pd_min, v_min = paschen.minimum(A, B, g)
    V = v_min * ratio
    left, right = paschen.inverse_pd(V, A, B, g)
    assert left < pd_min < right
    assert float(paschen.breakdown_voltage(left, A, B, g)) == pytest.approx(V, rel=1e-7)
    assert float(paschen.breakdown_voltage(right, A, B, g)) == pytest.approx(V, rel=1e-7)
    assert paschen.branch(left * (1 + 1e-9), A, g) == "left"
    assert paschen.branch(right, A, g) == "right"


def test_inverse_below_minimum_is_nan():
    A, B, g = _abg("Ar", 0.07)
    _, v_min = paschen.minimum(A, B, g)
    left, right = paschen.inverse_pd(0.9 * v_min, A, B, g)
    assert math.isnan(left) and math.isnan(right)


@given(gas_names, gammas)
def test_branches_are_monotonic(name, gamma):
    A, B, g = _abg(name, gamma)
    pd_min, _ = paschen.minimum(A, B, g)
    pd0 = paschen.no_breakdown_pd(A, g)
    left = np.geomspace(pd0 * 1.0001, pd_min, 400)
    right = np.geomspace(pd_min, pd_min * 1e5, 400)
    assert np.all(np.diff(paschen.breakdown_voltage(left, A, B, g)) < 0)
    assert np.all(np.diff(paschen.breakdown_voltage(right, A, B, g)) > 0)


@given(gammas)
def test_air_with_the_empirical_law_stays_monotonic_and_inverts(gamma):
    air = find_gas("air")
    c = air.constants
    pd_min, v_min = paschen.minimum(c.A, c.B, gamma)
    right = np.geomspace(pd_min, 1e4, 2000)
    v, w = paschen.breakdown_voltage_with_law(right, c, gamma, air.law)
    assert np.all(np.diff(v) > 0)
    assert w[0] == 0 and w[-1] == 1
    for V in (v_min * 1.5, 600.0, 900.0, 3e3, 3e4, 3e5):
        if V <= v_min:
            continue
        _, r = paschen.inverse_pd_with_law(V, c, gamma, air.law)
        vr, _ = paschen.breakdown_voltage_with_law(r, c, gamma, air.law)
        assert float(vr) == pytest.approx(V, rel=1e-8)


@pytest.mark.parametrize("shape", [(), (1,), (7,), (3, 4), (2, 3, 5)])
def test_array_shape_in_is_shape_out(shape):
    A, B, g = _abg("Ar", 0.07)
    pd = np.full(shape, 1.0)
    assert np.shape(paschen.breakdown_voltage(pd, A, B, g)) == shape
    assert np.shape(paschen.branch(pd, A, g)) == shape
    assert np.shape(paschen.breakdown_E_over_p(pd, A, g, B)) == shape
    left, right = paschen.inverse_pd(np.full(shape, 500.0), A, B, g)
    assert np.shape(left) == shape and np.shape(right) == shape
    assert np.shape(townsend.alpha(np.full(shape, 1e4), pd, A, B)) == shape


@given(gas_names, gammas, st.floats(min_value=-2, max_value=3))
def test_townsend_criterion_holds_on_the_curve(name, gamma, log_pd):
    # At V = V_b, alpha d equals ln(1 + 1/gamma): the curve is the criterion solved for V.
    A, B, g = _abg(name, gamma)
    pd = 10.0**log_pd
    v = float(paschen.breakdown_voltage(pd, A, B, g))
    assume(math.isfinite(v))
    d = 0.01
    ad = float(townsend.alpha(v / d, pd / d, A, B)) * d
    assert ad == pytest.approx(math.log1p(1 / g), rel=1e-9)


def test_no_breakdown_left_of_asymptote_reported_as_none():
    b = Bench("t", find_gas("Ar"), find_cathode("Cu"), gap=0.03)
    f = forecast(OperatingPoint(5.0, 0.03, 1000.0), b)
    assert f.breakdown_voltage is None
    assert f.branch == "none"
    assert f.strikes is False
    assert f.to_json()["breakdown_V"] is None
    assert any(fl.code == "no_breakdown" for fl in f.flags)


def test_gas_temperature_scales_pd_to_reference_density():
    # At twice the reference temperature the same pressure holds half the molecules.
    b = Bench("t", find_gas("N2"), find_cathode("Cu"), gap=0.01)
    T_ref = b.gas.constants.reference_temperature
    hot = forecast(OperatingPoint(200.0, 0.01, None, 2 * T_ref), b)
    cold = forecast(OperatingPoint(100.0, 0.01, None, T_ref), b)
    assert hot.reduced_pd == pytest.approx(cold.reduced_pd)
    assert hot.breakdown_voltage == pytest.approx(cold.breakdown_voltage)


def test_outside_fitted_range_is_flagged():
    # Far right of the minimum E/p falls below argon's 100 V/(cm Torr) lower limit.
    b = Bench("t", find_gas("Ar"), find_cathode("Cu"), gap=0.01)
    f = forecast(OperatingPoint(1e5, 0.01), b)
    assert f.breakdown_E_over_p * TORR_CM < 100
    assert any(fl.code == "outside_fitted_range" for fl in f.flags)
    # E/p at breakdown is B / ln(A pd / K): pick pd where that is 150 V/(cm Torr).
    c, K = b.gas.constants, math.log1p(1 / b.yield_().value)
    pd_inside = K * math.exp(c.B / (150 * PER_CM_TORR)) / c.A * 293.15 / c.reference_temperature
    inside = forecast(OperatingPoint(pd_inside / 0.01, 0.01), b)
    assert inside.breakdown_E_over_p / PER_CM_TORR == pytest.approx(150)
    assert not any(fl.code == "outside_fitted_range" for fl in inside.flags)
