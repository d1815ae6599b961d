"""Paschen's law in its closed form (the textbook view, model/paschen.py) against numerical solutions,
derived values and its own invariants."""

import math

import numpy as np
import pytest
from hypothesis import assume, given
from hypothesis import strategies as st
from scipy import constants, optimize
from strikeline.model import paschen, townsend
from strikeline.profiles.gasdata import find_gas

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


def test_constant_AB_over_predict_air_at_high_pd():
    # The reason the empirical law exists: Paschen with constant A, B is above it at 1 atm, 1 cm.
    A, B, g = _abg("air", 0.01)
    rpd = constants.atm * 0.01 * 273.15 / 293.0
    assert float(paschen.breakdown_voltage(rpd, A, B, g)) > 1.1 * 30.3e3


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
