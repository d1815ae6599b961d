"""Gas mixtures and attachment against the outside world, and the mixture law's own promises.

Outside sources: [raizer-1991] Table 4.1 (air's A, B, in gases.toml); the uniform-field air law
[kuffel-zaengl-2000] (found quoted); the critical reduced field of dry air, about 120 Td (common
practice, from memory: ../shared/reference/check-values.md); [morrow-lowke-1997] (their fits, found
reproduced in public code); scipy.constants.
"""

import itertools
import math

import numpy as np
import pytest
from scipy import constants
from strikeline.model import mixture as mx
from strikeline.model.bench import Bench, OperatingPoint
from strikeline.model.composition import make, pure
from strikeline.model.curve import dc_law
from strikeline.model.forecast import forecast
from strikeline.model.ionisation import TD_PER_V_PER_PA_M
from strikeline.profiles.bench import load_bench
from strikeline.profiles.fill import read_fill
from strikeline.profiles.gasdata import PER_CM_TORR, find_cathode, find_gas, gases

COPPER = find_cathode("Cu")
G = gases()
N_PER_P = 1.0 / (constants.k * constants.zero_Celsius) * constants.torr * 1e-6  # molecules per cm^3 per Torr, 0 C


def _bench(text: str, **kw) -> Bench:
    return Bench("t", read_fill(text).composition, COPPER, 0.03, **kw)


def _law(text: str, **kw):
    return dc_law(_bench(text, **kw))


# -- a one-gas mixture is the gas ---------------------------------------------------------


@pytest.mark.parametrize("text", ["argon:1", "Ar:100", "argon:0.25"])
def test_one_gas_mixture_is_the_pure_gas_bit_for_bit(text):
    fill = read_fill(text).composition
    assert fill.pure and fill.main is find_gas("argon")
    demo = load_bench("demo").bench
    one = forecast(OperatingPoint(20.0, 0.03, 600.0), Bench("t", fill, COPPER, 0.03))
    alone = forecast(OperatingPoint(20.0, 0.03, 600.0), Bench("t", demo.fill, COPPER, 0.03))
    assert one.to_json() == alone.to_json()


def test_a_gas_with_no_parts_left_is_dropped_from_the_mixture():
    ar, o2 = find_gas("argon"), find_gas("oxygen")
    assert make([(ar, 3.0), (o2, 0.0)]) == pure(ar)


@pytest.mark.parametrize("other", ["neon", "nitrogen", "oxygen"])
def test_mixture_is_continuous_as_a_component_goes_to_zero(other):
    # V_b of argon with x of another gas tends to argon's own as x -> 0, about in proportion to x.
    rpd = np.array([0.5, 1.0, 3.0, 30.0])  # Pa m, around argon's minimum
    alone, _ = dc_law(Bench("t", pure(G["argon"]), COPPER, 0.03)).voltage(rpd)
    misses = []
    for x in (1e-2, 1e-4, 1e-6):
        v, _ = _law(f"argon:{1 - x},{other}:{x}").voltage(rpd)
        misses.append(float(np.max(np.abs(v / alone - 1))))
    assert misses[2] < 1e-5
    assert misses[0] > misses[1] > misses[2]


# -- air rebuilt from its gases --------------------------------------------------------------

AIR_REBUILT = "nitrogen:79,oxygen:21"
"""Dry air from its two main gases. Its 1 % of argon is left out: linear mixing credits a noble trace with
the ionisation it has in its own electron energy distribution, far more than in nitrogen's (ASSUMPTIONS),
and at low E/N that alone would move the critical field by 20 Td."""


@pytest.mark.parametrize("e_over_p", [100.0, 150.0, 200.0, 300.0, 500.0, 800.0])  # V/(cm Torr)
def test_rebuilt_air_ionisation_within_30_percent_of_raizers_air(e_over_p):
    # [raizer-1991]'s A = 15, B = 365 per cm Torr over 100-800 V/(cm Torr) (Table 4.1) are effective
    # ionisation, alpha - eta. Tolerance 30 %: the constant-A, B form itself is a 10-25 % fit (common
    # practice), and oxygen's law and attachment are ours (gases.toml says how).
    m = read_fill(AIR_REBUILT).composition
    y = e_over_p * PER_CM_TORR
    net = float(mx.ionisation_per_p(m, y) - mx.attachment_per_p(m, y))
    raizer = 15.0 * PER_CM_TORR * math.exp(-365.0 / e_over_p)
    assert net == pytest.approx(raizer, rel=0.30)


@pytest.mark.parametrize("gap_cm", [0.1, 0.3, 1.0, 3.0, 10.0])
def test_rebuilt_air_breakdown_within_30_percent_of_the_uniform_field_law(gap_cm):
    # V = 24.22 delta d + 6.08 sqrt(delta d) kV (d in cm, delta = 1 at 760 Torr and 293 K; Kuffel &
    # Zaengl, found quoted). Tolerance 30 %: the mixture's attachment limit sits near 127 Td where the
    # law's long-gap field is about 97 Td, so the model reads high on long gaps (+22 % at 10 cm).
    b = _bench(AIR_REBUILT, gamma=0.01)
    f = forecast(OperatingPoint(constants.atm, gap_cm / 100, None, 293.0), b)
    law = (24.22 * gap_cm + 6.08 * math.sqrt(gap_cm)) * 1e3
    assert f.breakdown_voltage == pytest.approx(law, rel=0.30)


def test_critical_reduced_field_of_rebuilt_air_near_120_td():
    # Dry air's alpha = eta at about 120 Td (common practice, from memory: tolerance 15 %).
    crit = mx.critical_E_over_p(read_fill(AIR_REBUILT).composition) * TD_PER_V_PER_PA_M
    assert crit == pytest.approx(120.0, rel=0.15)


def test_td_per_e_over_p_from_scipy_constants():
    # E/N in Td = (E/p) k T / 1e-21 at 0 C (scipy.constants).
    assert TD_PER_V_PER_PA_M == pytest.approx(constants.k * constants.zero_Celsius / 1e-21, rel=1e-15)


# -- air's data are Morrow & Lowke's fits, converted exactly --------------------------------------


def test_air_coefficients_are_morrow_and_lowke_converted():
    # [morrow-lowke-1997]: alpha/N = 2.0e-16 exp(-7.248e-15/(E/N)) cm^2 above 1.5e-15 V cm^2 and
    # 6.619e-17 exp(-5.593e-15/(E/N)) below; two-body attachment eta/N = 8.889e-5 (E/N) + 2.567e-19
    # above 1.05e-15 V cm^2 and 6.089e-4 (E/N) - 2.893e-19 below (cm^2, E/N in V cm^2); oxygen's
    # attachment is the same divided by air's O2 fraction 0.21 (gases.toml says so). N/p from
    # scipy.constants.
    air, o2 = find_gas("air"), find_gas("oxygen")
    lo, hi = air.ionisation.segments[0], air.ionisation.segments[1]
    assert hi.A / PER_CM_TORR == pytest.approx(2.0e-16 * N_PER_P, rel=1e-4)
    assert hi.B / PER_CM_TORR == pytest.approx(7.248e-15 * N_PER_P, rel=1e-4)
    assert lo.A / PER_CM_TORR == pytest.approx(6.619e-17 * N_PER_P, rel=1e-4)
    assert lo.B / PER_CM_TORR == pytest.approx(5.593e-15 * N_PER_P, rel=1e-4)
    assert lo.high / PER_CM_TORR == pytest.approx(1.5e-15 * N_PER_P, rel=1e-3)
    for gas, share in ((air, 1.0), (o2, 0.21)):
        at = gas.attachment
        assert at.switch / PER_CM_TORR == pytest.approx(1.05e-15 * N_PER_P, rel=1e-3)
        assert at.k1_high == pytest.approx(8.889e-5 / share, rel=1e-4)
        assert at.k0_high / PER_CM_TORR == pytest.approx(2.567e-19 * N_PER_P / share, rel=1e-4)
        assert at.k1_low == pytest.approx(6.089e-4 / share, rel=1e-4)
        assert at.k0_low / PER_CM_TORR == pytest.approx(-2.893e-19 * N_PER_P / share, rel=1e-4)


# -- attachment: a limit, never a negative or infinite voltage ------------------------------


@pytest.mark.parametrize("text", ["oxygen", AIR_REBUILT, "argon:80,oxygen:20"])
def test_breakdown_is_a_finite_positive_voltage_or_none(text):
    law = _law(text)
    rpd = np.geomspace(1e-4, 1e6, 4001)  # Pa m: from far left of the asymptote to kilometre-bar gaps
    v, _ = law.voltage(rpd)
    assert not np.any(np.isinf(v)) and np.all(v[np.isfinite(v)] > 0)
    assert np.all(np.isnan(v[rpd <= law.no_breakdown_pd()])) and np.all(np.isfinite(v[rpd > law.no_breakdown_pd()]))


@pytest.mark.parametrize("text", ["oxygen", AIR_REBUILT])
def test_long_gaps_break_down_at_the_attachment_limit_field(text):
    # Below E/p where eta = alpha (1 + gamma) nothing breaks down, however long the gap: a long gap's
    # breakdown field sinks to that limit, just under the critical alpha = eta field, never below it.
    law = _law(text)
    crit = law.critical_E_over_p
    y = law.e_over_p(np.array([1e3, 1e4, 1e5]))
    assert np.all(y >= law.y_range[0] * (1 - 1e-9))
    assert np.all(np.diff(y) <= 0) and y[-1] == pytest.approx(crit, rel=0.05)


@pytest.mark.parametrize("text", ["argon:80,oxygen:20", AIR_REBUILT, "neon:99,argon:1", "oxygen"])
def test_breakdown_satisfies_townsends_criterion_with_attachment(text):
    # gamma alpha/(alpha - eta) (exp((alpha - eta) d) - 1) = 1 at the solved field, d = 1 m.
    law = _law(text)
    for rpd in (law.no_breakdown_pd() * 1.5, 2.0, 20.0, 300.0):
        y = float(law.e_over_p(rpd))
        a, e, g = float(law.a(y)) * rpd, float(law.e(y)) * rpd, float(law.g(y))
        assert g * a / (a - e) * math.expm1(a - e) == pytest.approx(1.0, rel=1e-9)


@pytest.mark.parametrize("text", ["argon:80,oxygen:20", AIR_REBUILT, "argon:80,nitrogen:20", "oxygen"])
def test_a_long_table_and_a_few_points_agree(text):
    # Many points are read off the traced curve; a few are solved exactly. They agree to 2e-4: the
    # worst is where [morrow-lowke-1997]'s two alpha branches meet with a 0.2 % step (at 53 V/(cm Torr)).
    law = _law(text)
    rpd = np.geomspace(law.no_breakdown_pd() * 1.01, 1e7, 20000)
    v_table, _ = law.voltage(rpd)
    v_exact = np.concatenate([law.voltage(chunk)[0] for chunk in np.array_split(rpd, 400)])
    assert np.allclose(v_table, v_exact, rtol=2e-4, atol=0)


# -- the minimum of a mixture ----------------------------------------------------------------


def _non_penning_pairs():
    for a, b in itertools.combinations(G, 2):
        if "air" in (a, b) and {a, b} & {"nitrogen", "oxygen"}:
            continue
        for x in (10, 50, 90):
            m = read_fill(f"{a}:{x},{b}:{100 - x}").composition
            if not mx.penning_pairs(m) and not any(c.gas.attachment for c in m.components):
                yield a, b, x


@pytest.mark.parametrize(("a", "b", "x"), list(_non_penning_pairs()))
def test_mixture_minimum_bounded_as_linear_mixing_requires(a, b, x):
    # At one gamma, V_min = ln(1 + 1/gamma) min_y y/alpha(y). Linear mixing puts alpha_mix between the
    # two gases' alpha at every E/p, so V_min(mix) is no lower than the lower of the two minima, and no
    # higher than ln(1 + 1/gamma) min_y max(y/alpha_1, y/alpha_2). It is NOT always below the higher
    # minimum: where the two alpha(E/p) curves cross far from either minimum (argon with xenon,
    # nitrogen with hydrogen) the mixture's minimum sits above both.
    g = 0.05
    _, v = _law(f"{a}:{x},{b}:{100 - x}", gamma=g).minimum()
    va = dc_law(Bench("t", pure(G[a]), COPPER, 0.03, gamma=g)).minimum()[1]
    vb = dc_law(Bench("t", pure(G[b]), COPPER, 0.03, gamma=g)).minimum()[1]
    y = np.geomspace(1.0, 1e5, 200001)  # V/(Pa m)
    upper = math.log1p(1 / g) * float(np.min(np.maximum(y / G[a].ionisation.per_p(y), y / G[b].ionisation.per_p(y))))
    assert min(va, vb) * (1 - 1e-9) <= v <= upper * (1 + 1e-6)


@pytest.mark.parametrize("text", ["argon:50,nitrogen:50", "argon:90,nitrogen:10", "argon:50,krypton:50"])
def test_common_sputter_mixtures_have_their_minimum_between_the_gases(text):
    parts = list(read_fill(text).composition.components)
    _, v = _law(text, gamma=0.05).minimum()
    vs = [dc_law(Bench("t", pure(c.gas), COPPER, 0.03, gamma=0.05)).minimum()[1] for c in parts]
    assert min(vs) <= v <= max(vs)


@pytest.mark.parametrize(
    ("text", "pair"),
    [("neon:99,argon:1", ("neon", "argon")), ("helium:90,nitrogen:10", ("helium", "nitrogen"))],
)
def test_penning_pairs_are_flagged(text, pair):
    # Neon with a little argon is the classic Penning fill (common practice): neon's metastable level
    # (16.62 eV) lies above argon's ionisation energy (15.76 eV).
    f = forecast(OperatingPoint(300.0, 0.01, None), _bench(text))
    flags = [x for x in f.flags if x.code == "penning"]
    assert [(pair[0] in x.reason and pair[1] in x.reason) for x in flags] == [True]
    assert "fit" in flags[0].reason


def test_no_penning_flag_where_no_level_reaches():
    f = forecast(OperatingPoint(300.0, 0.01, None), _bench("argon:90,nitrogen:10"))
    assert "penning" not in [x.code for x in f.flags]


# -- the forecast of a mixture says what it assumed -------------------------------------------


def test_mixture_forecast_states_its_rules_and_widens_its_band():
    mixed = forecast(OperatingPoint(20.0, 0.03, None), _bench("argon:80,nitrogen:20"))
    assert mixed.A is None and mixed.law == "mixture" and mixed.mixing == mx.ASSUMPTIONS
    assert [g for g, _ in mixed.composition] == ["argon", "nitrogen"]
    assert "+/-35%" in mixed.band_source and "mixing" in mixed.band_source
    assert any(x.code == "linear_mixing" and "10%" in x.reason for x in mixed.flags)
    j = mixed.to_json()
    assert j["constants"]["A_per_Pa_m"] is None and j["composition"][0] == {"gas": "argon", "fraction": 0.8}


def test_a_pure_gas_shows_its_textbook_pair():
    # A pure fill's A, B view is the table's pair; a mixture's is worked out near its minimum.
    ar = G["argon"]
    c = dc_law(Bench("t", pure(ar), COPPER, 0.03)).effective_constants
    assert (c.A, c.B) == (ar.constants.A, ar.constants.B)
    m = _law("argon:80,nitrogen:20").effective_constants
    assert ar.constants.B < m.B < G["nitrogen"].constants.B * 1.5
