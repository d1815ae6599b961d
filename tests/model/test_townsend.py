"""Townsend avalanche relations against definitions and reference constants."""

import math

import numpy as np
import pytest
from hypothesis import assume, given
from hypothesis import strategies as st
from scipy import constants
from strikeline.model import townsend


def test_townsend_unit_definition():
    # 1 Td = 1e-21 V m^2 (definition).
    assert townsend.TOWNSEND == 1e-21
    assert townsend.reduced_field_Td(1e-21 * 1e25, 1e25) == pytest.approx(1.0)


def test_number_density_matches_loschmidt_constant():
    # scipy.constants: Loschmidt constant (273.15 K, 101.325 kPa).
    n0 = constants.physical_constants["Loschmidt constant (273.15 K, 101.325 kPa)"][0]
    assert townsend.number_density(101325.0, 273.15) == pytest.approx(n0, rel=1e-9)


@pytest.mark.parametrize("ad", [0.0, 1.0, 4.6, 18.4, 20.0])
def test_avalanche_gain_is_exp_alpha_d(ad):
    # Townsend's avalanche: n(d) / n(0) = exp(alpha d) (definition), against math.exp.
    assert townsend.avalanche_gain(ad) == pytest.approx(math.exp(ad), rel=1e-15)


@given(st.floats(min_value=0, max_value=4), st.floats(min_value=1e-3, max_value=0.5))
def test_current_growth_is_the_sum_over_ion_generations(ad, gamma):
    # Derivation check: each generation of ions frees gamma (e^{ad} - 1) new electrons per
    # electron, so I/I0 = e^{ad} sum_n q^n with q = gamma (e^{ad} - 1), summed directly here.
    q = gamma * (math.exp(ad) - 1)
    assume(q < 0.95)  # the series converges (below self-sustainment): other draws are rejected, not passed
    series = math.exp(ad) * sum(q**n for n in range(2000))
    assert townsend.current_growth(ad, gamma) == pytest.approx(series, rel=1e-9)


def test_current_growth_diverges_at_self_sustainment():
    gamma = 0.05
    k = math.log1p(1 / gamma)
    assert math.isinf(townsend.current_growth(k, gamma))
    assert math.isinf(townsend.current_growth(k + 1, gamma))
    assert math.isfinite(townsend.current_growth(k * 0.999, gamma))
    assert bool(townsend.self_sustained(k, gamma))
    assert not bool(townsend.self_sustained(k * 0.999, gamma))


def test_alpha_is_vectorised_and_zero_at_zero_field():
    a = townsend.alpha(np.array([0.0, 1e4, 1e6]), 100.0, 9.0, 135.0)
    assert a[0] == 0.0 and np.all(np.diff(a) > 0)


def test_gain_overflow_is_inf_not_an_error():
    assert math.isinf(townsend.avalanche_gain(1e4))
