"""Breakdown in an alternating field against the outside world.

Outside sources: scipy.constants (e, m_e, torr) and scipy.special (the zero of J0); the DC law (the
low-frequency limit, itself checked against the published tables in test_breakdown.py); the RF
similarity law U_rf = psi(pL, L/R, fL) of [lisovskiy-2008] (found: two curves coincide in U(pL) only
at equal fL); argon's 13.56 MHz curve, a minimum of about 100-200 V rms at a few tenths of a Torr for
2-3 cm gaps and a turning point below it ([lisovskiy-yegorenkov-1998], from memory, as the issue and
../shared/reference/check-values.md quote it); the effective-field formula ([raizer-1991];
[macdonald-1966], from memory) checked by hand with the gas data's own nu_m and mobility.
"""

import math

import numpy as np
import pytest
from scipy import constants, special
from strikeline.model.alternating import IONS_COUNTED, drift_amplitude, effective_field
from strikeline.model.bench import Bench, OperatingPoint
from strikeline.model.curve import curve_of, dc_law
from strikeline.model.forecast import forecast
from strikeline.profiles.fill import read_fill
from strikeline.profiles.gasdata import find_cathode, find_gas
from strikeline.tui import cli

COPPER = find_cathode("Cu")
ARGON = find_gas("argon")
TORR = constants.torr
RF = 13.56e6


def _bench(fill="argon", gap=0.02, **kw):
    return Bench("t", read_fill(fill).composition, COPPER, gap, **kw)


def alternating_law(bench, frequency, gap):
    return curve_of(bench, frequency=frequency, gap=gap).law


def breakdown_law(bench):
    return dc_law(bench)


# -- the low-frequency limit -----------------------------------------------------------------


@pytest.mark.parametrize("fill", ["argon", "nitrogen", "argon:80,nitrogen:20", "oxygen"])
@pytest.mark.parametrize("f", [50.0, 60.0, 1e3])
def test_low_frequency_peak_breakdown_is_the_dc_voltage_within_1_percent(fill, f):
    # When the half period is far longer than the ions' transit, each half cycle is a DC breakdown
    # at the peak voltage (the check). Paschen's law is the DC curve.
    bench = _bench(fill)
    dc = breakdown_law(bench)
    ac = alternating_law(bench, f, bench.gap)
    rpd = np.geomspace(dc.no_breakdown_pd() * 1.05, 1e3, 200)
    v_dc, v_ac = dc.voltage(rpd)[0], ac.voltage(rpd)[0]
    assert np.allclose(v_ac, v_dc, rtol=0.01)
    assert set(ac.regimes(rpd)) == {"dc-like"}


def test_the_dc_mechanism_goes_over_to_its_rf_form_without_a_step():
    # As the ions stop reaching the cathode within a half period, the DC (gamma) mechanism's voltage at
    # one pd rises smoothly from the DC value: neighbouring frequencies on a fine grid never differ by
    # more than 2 %, until fewer than IONS_COUNTED of the gap's ions arrive and it is no longer counted.
    # (Where the volume mechanism's turning point passes this pressure, the breakdown voltage does jump
    # down to its lower branch: the curve is double-valued, not broken.)
    bench = _bench()
    rpd = 0.3 * TORR * 0.02 * (273.15 / 293.15)
    freqs = np.geomspace(1e3, 3e7, 600)
    laws = [alternating_law(bench, f, 0.02) for f in freqs]
    v = np.array([float(law.parts(rpd)["dc_like"]) for law in laws])
    ions = np.array([float(law.parts(rpd)["ions"]) for law in laws])
    counted = np.isfinite(v)
    assert v[0] == pytest.approx(float(breakdown_law(bench).voltage(rpd)[0]))
    assert np.all(counted[: np.argmax(~counted)]) and not counted[-1]  # counted, then not, never back
    kept = v[counted]
    assert np.max(np.abs(np.diff(kept) / kept[:-1])) < 0.02 and kept[-1] > 2 * kept[0]
    regimes = [str(law.regimes(rpd)) for law in (laws[0], laws[300], laws[-1])]
    assert regimes == ["dc-like", "intermediate", "rf-volume"]
    assert ions[-1] < IONS_COUNTED * 5


# -- the effective field and the swing, by hand ------------------------------------------------


def test_effective_field_by_hand_with_the_gas_data():
    # Argon, nu_m/p = 5.3e9 /(s Torr) (gases.toml, from memory), 10 Pa, 13.56 MHz, E_rms = 1 kV/m:
    # E_eff = E_rms nu/sqrt(nu^2 + w^2).
    nu = 5.3e9 / TORR * 10.0
    w = 2 * math.pi * RF
    hand = 1000.0 * nu / math.sqrt(nu**2 + w**2)
    assert hand == pytest.approx(977.8, rel=1e-3)
    assert float(effective_field(1000.0, ARGON.electron_collision_per_Pa * 10.0, w)) == pytest.approx(hand, rel=1e-12)
    law = alternating_law(_bench(), RF, 0.02)
    assert law._e_eff(1000.0 * math.sqrt(2), 10.0) == pytest.approx(hand, rel=1e-12)


def test_electron_swing_by_hand_with_the_gas_data():
    # mu_e p = 3e5 cm^2 Torr/(V s) for argon (gases.toml, from memory): at 10 Pa mu_e = 3e5 cm^2 Torr
    # / (V s) / 10 Pa; the swing in E_0 = 1 kV/m at 13.56 MHz is mu_e E_0 nu / (w sqrt(nu^2 + w^2)).
    mu = 3e5 * 1e-4 * TORR / 10.0
    nu = 5.3e9 / TORR * 10.0
    w = 2 * math.pi * RF
    hand = mu * 1000.0 * nu / (w * math.sqrt(nu**2 + w**2))
    assert hand == pytest.approx(4.60e-3, rel=1e-2)
    law = alternating_law(_bench(), RF, 0.02)
    assert law.swing(1000.0, 10.0)[0] == pytest.approx(hand, rel=1e-12)
    assert float(drift_amplitude(1000.0, mu, nu, w)) == pytest.approx(hand, rel=1e-12)


def test_drude_swing_without_collisions_is_e_over_m_w_squared():
    # nu -> 0: a free electron swings e E_0 / (m w^2) (scipy.constants): with mu = e/(m nu), the
    # formula's limit.
    w, E0, nu = 2 * math.pi * RF, 1000.0, 1.0
    mu = constants.e / (constants.m_e * nu)
    free = constants.e * E0 / (constants.m_e * w**2)
    assert float(drift_amplitude(E0, mu, nu, w)) == pytest.approx(free, rel=1e-9)


# -- argon's RF curve: its level, its shape ----------------------------------------------------


@pytest.mark.parametrize("gap", [0.02, 0.025, 0.03])
def test_argon_at_13_56_mhz_lands_in_the_published_range(gap):
    # [lisovskiy-yegorenkov-1998] (from memory, as quoted): the minimum of argon's 13.56 MHz breakdown
    # curve lies at about 100-200 V rms for 2-3 cm gaps; "about" read as 10 % either side. Electrodes of
    # 100 mm diameter, so the radial diffusion loss counts.
    law = alternating_law(_bench(gap=gap, electrode_radius=0.05), RF, gap)
    _pd, v_min = law.minimum()
    assert 90.0 <= v_min / math.sqrt(2) <= 220.0


def test_the_electrodes_radius_shortens_the_diffusion_length_by_hand():
    # 1/Lambda^2 = (pi/d)^2 + (j01/R)^2 (j01 from scipy.special): with the same electron swing the
    # volume criterion's pd grows by sqrt(1 + (j01 d / (pi R))^2).
    j01 = special.jn_zeros(0, 1)[0]
    d, R = 0.025, 0.05
    wide = alternating_law(_bench(gap=d), RF, d)
    narrow = alternating_law(_bench(gap=d, electrode_radius=R), RF, d)
    u = np.array([50.0, 150.0]) * (1 / 1.3332236842105263)  # V/(Pa m)
    with np.errstate(invalid="ignore"):
        ratio = narrow._pd(u) / wide._pd(u)
    rho = u / wide.u_max
    hand = np.sqrt((math.pi / (1 - rho)) ** 2 + (j01 * d / R) ** 2) / (math.pi / (1 - rho))
    assert ratio == pytest.approx(hand, rel=1e-12)


def test_no_breakdown_voltage_where_no_mechanism_breaks_the_gap_down():
    # Below the turning point at 13.56 MHz no volume breakdown exists, and too few ions reach the cathode
    # for the gamma mechanism: the forecast gives no breakdown voltage, and says why.
    f = forecast(OperatingPoint(0.1 * TORR, 0.03, 300.0, 293.0, frequency=RF), _bench(gap=0.03))
    assert f.alternating.regime == "none" and f.breakdown_voltage is None and f.to_json()["breakdown_V"] is None
    assert "below_turning_point" in {x.code for x in f.flags} and f.strikes is False


# -- the shape of argon's RF curve ---------------------------------------------------------


@pytest.mark.parametrize("gap", [0.02, 0.03])
def test_argon_at_13_56_mhz_has_a_minimum_and_a_turning_point_below_it(gap):
    # From memory (check-values.md): gaps of 1-3 cm, a minimum at a few tenths of a Torr and a turning
    # point at lower pressure where the curve becomes double-valued. Tolerance: the minimum between
    # 0.1 and 1 Torr.
    law = alternating_law(_bench(gap=gap), RF, gap)
    scale = 273.15 / 293.15
    pd_min, v_min = law.minimum()
    pd_turn, v_turn = law.turning()
    p_min, p_turn = pd_min / gap / scale / TORR, pd_turn / gap / scale / TORR
    assert 0.1 < p_min < 1.0 and p_turn < p_min and v_turn > v_min
    above = np.geomspace(pd_turn * 1.01, pd_turn * 20, 50)
    low, up = law.parts(above)["volume"], law.upper(above)
    assert np.all(np.isfinite(low) & np.isfinite(up)) and np.all(up > low)  # double-valued above the turn
    assert np.all(np.isnan(law.parts(np.geomspace(pd_turn / 5, pd_turn * 0.99, 20))["volume"]))


def test_a_larger_gap_has_a_lower_minimum_at_a_lower_pressure():
    # From memory ([lisovskiy-yegorenkov-1998]): with a wider gap the argon RF curve's minimum falls and
    # moves to lower pressure.
    mins = []
    for gap in (0.01, 0.02, 0.03):
        pd, v = alternating_law(_bench(gap=gap), RF, gap).minimum()
        mins.append((pd / gap, v))
    assert mins[0][0] > mins[1][0] > mins[2][0] and mins[0][1] > mins[1][1] > mins[2][1]


def test_rf_similarity_law_curves_coincide_only_at_equal_f_times_l():
    # U_rf = psi(pL, fL) ([lisovskiy-2008], found): double the gap and halve the
    # frequency and U(pL) is the same curve; double the gap alone and it is not.
    base = alternating_law(_bench(gap=0.02), RF, 0.02)
    same_fl = alternating_law(_bench(gap=0.04), RF / 2, 0.04)
    other_fl = alternating_law(_bench(gap=0.04), RF, 0.04)
    rpd = np.geomspace(base.turning()[0] * 1.05, base.turning()[0] * 50, 40)
    v = base.parts(rpd)["volume"]
    assert np.allclose(same_fl.parts(rpd)["volume"], v, rtol=1e-4)
    assert not np.allclose(other_fl.parts(rpd)["volume"], v, rtol=0.05)


# -- the forecast of an AC point -------------------------------------------------------------


def test_forecast_names_the_regime_both_branches_and_what_does_not_apply():
    f = forecast(OperatingPoint(0.9 * TORR, 0.02, 200.0, 293.15, frequency=RF), _bench())
    a = f.alternating
    assert a.regime == "rf-volume" and a.upper_voltage > f.breakdown_voltage
    assert f.law == "alternating" and f.alpha_d is None and f.gain is None and f.load_line is None
    assert {w for w, _ in f.not_applicable} >= {"glow after ignition", "alpha d and avalanche gain"}
    j = f.to_json()
    assert j["alternating"]["regime"] == "rf-volume" and "peak" in j["alternating"]["voltages_are"]


def test_above_the_upper_branch_the_supply_does_not_strike():
    bench = _bench()
    f0 = forecast(OperatingPoint(0.9 * TORR, 0.02, None, 293.15, frequency=RF), bench)
    V = f0.alternating.upper_voltage * 1.2
    f = forecast(OperatingPoint(0.9 * TORR, 0.02, V, 293.15, frequency=RF), bench)
    assert f.strikes is False and "above_upper_branch" in [x.code for x in f.flags]


def test_strike_and_curve_take_a_frequency_and_say_which_voltage(capsys):
    code = cli.main(
        ["strike", "--gas", "Ar", "--cathode", "Cu", "--gap", "2cm", "--pressure", "0.9 Torr", "--frequency",
         "13.56 MHz", "--voltage", "100V", "--voltage-is", "rms"]
    )  # fmt: skip
    out = capsys.readouterr().out
    assert code == 0 and "141 V peak (100 V rms, 283 V pp)" in out and "rf-volume" in out
    code = cli.main(
        ["curve", "--gas", "Ar", "--cathode", "Cu", "--gap", "2cm", "--frequency", "13.56 MHz", "--from", "100 Pa",
         "--to", "200 Pa", "--points", "4"]
    )  # fmt: skip
    rows = capsys.readouterr().out.splitlines()
    assert code == 0 and rows[0].endswith("regime,upper_V")
    assert all(",alternating," in r and (",rf-volume," in r or ",drift-limited," in r) for r in rows[1:])


@pytest.mark.parametrize(
    ("argv", "needle"),
    [
        (["--frequency", "13.56"], "needs a unit"),
        (["--frequency", "0 Hz"], "above zero"),
        (["--frequency", "-5 kHz"], "above zero"),
        (["--frequency", "2 GHz"], "outside 1 to 1e+08 Hz"),
        (["--frequency", "13.56 MHz", "--voltage-is", "rms"], "give --voltage and --frequency"),
        (["--voltage", "100V", "--voltage-is", "rms"], "give --voltage and --frequency"),
        (["--frequency", "13.56 MHz", "--voltage", "100V", "--voltage-is", "avg"], "invalid choice"),
    ],
)
def test_bad_frequencies_are_one_line(capsys, argv, needle):
    code = cli.main(["strike", "--gas", "Ar", "--cathode", "Cu", "--gap", "2cm", "--pressure", "30 Pa", *argv])
    err = capsys.readouterr().err
    assert code == 2 and needle in err and err.count("\n") == 1
