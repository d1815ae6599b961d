"""Reactive sputtering: gas balance and target mode, charging of the target's film, gauges in a
mixture, and the profile sections and options that feed them.

Outside sources: scipy.constants (epsilon_0, atm); [robertson-2004] Table 1 (eps_r, found quoted);
[mcpherson-2016] (SiO2 about 10 MV/cm at 50 nm, found); the [crc-handbook]'s ionisation-gauge
sensitivities (gauges.toml, found); ../shared/reference/check-values.md for the charging-time hand calculations.
"""

import csv
import io
import json
import math

import pytest
from scipy import constants
from strikeline.model.bench import Bench, OperatingPoint, Supply
from strikeline.model.forecast import forecast
from strikeline.model.gauges import correct
from strikeline.model.reactive import charging_flags, charging_time, target_mode
from strikeline.profiles.bench import load_bench, parse_bench
from strikeline.profiles.fields import ProfileError
from strikeline.profiles.fill import films, find_film, read_fill
from strikeline.profiles.gasdata import find_cathode, find_gas
from strikeline.profiles.gauges import gauge_correction
from strikeline.tui import cli

SCCM = constants.atm * constants.centi**3 / 60.0  # Pa m^3/s at 0 C, 1 atm (common practice)
AR, O2, N2 = find_gas("argon"), find_gas("oxygen"), find_gas("nitrogen")


# -- charging time against hand calculations -----------------------------------------------


def test_charging_time_of_silicon_dioxide_by_hand():
    # eps_r 3.9 (Robertson 2004), E_bd 1e9 V/m (McPherson 2016: 10 MV/cm at 50 nm), j = 10 A/m^2
    # (1 mA/cm^2): t = eps0 eps_r E_bd / j = 3.45e-3 s (check-values.md works the same sum).
    hand = constants.epsilon_0 * 3.9 * 1e9 / 10.0
    assert hand == pytest.approx(3.4531e-3, rel=1e-4)
    assert charging_time(3.9, 1e9, 10.0) == pytest.approx(hand, rel=1e-12)


def test_charging_time_of_alumina_in_a_race_track_by_hand():
    # eps_r 9 (Robertson 2004), E_bd 5e8 V/m (thin film, from memory), j = 1000 A/m^2 (100 mA/cm^2,
    # a magnetron race track): about 4e-5 s (check-values.md).
    hand = constants.epsilon_0 * 9.0 * 5e8 / 1000.0
    assert hand == pytest.approx(3.984e-5, rel=1e-3)
    assert charging_time(9.0, 5e8, 1000.0) == pytest.approx(hand, rel=1e-12)


def test_film_data_carry_the_published_permittivities():
    # Robertson 2004, Table 1 (found quoted): SiO2 3.9, Si3N4 7, Al2O3 9, Ta2O5 22; TiO2 from 30 up.
    f = films()
    assert set(f) >= {"SiO2", "Al2O3", "TiO2", "Ta2O5", "AlN", "Si3N4"}
    assert f["SiO2"].eps_r[0] == 3.9 and f["Si3N4"].eps_r[0] == 7.0 and f["Al2O3"].eps_r[0] == 9.0
    assert f["Ta2O5"].eps_r[0] == 22.0 and f["TiO2"].eps_r[0] == 30.0
    assert f["SiO2"].strength[0] == 1e9  # McPherson 2016, 50 nm
    assert all(x.source for x in f.values())


def test_film_strength_falls_with_permittivity():
    # Breakdown strength falls as permittivity rises, about as k^-1/2 (McPherson et al., Appl. Phys.
    # Lett. 82, 2121 (2003), abstract, found): the film with the highest eps_r has the lowest strength.
    f = sorted(films().values(), key=lambda x: x.eps_r[0])
    assert f[0].name == "SiO2" and f[-1].name == "TiO2"
    assert f[-1].strength[1] < f[0].strength[0]


def test_charging_uses_the_ion_share_and_the_race_track():
    # j = I / (1 + gamma) / (A x race-track share): 1.5 A, gamma 0.1, 44 cm^2 x 0.3.
    film = find_film("Al2O3")
    c, _flags = charging_flags(film, 1.5, 44e-4 * 0.3, 0.1, None, None)
    j = 1.5 / 1.1 / (44e-4 * 0.3)
    assert c.current_density == pytest.approx(j, rel=1e-12)
    assert c.time == pytest.approx(constants.epsilon_0 * 9.0 * 3e8 / j, rel=1e-12)


def test_a_pulse_shorter_than_the_charging_time_holds_a_longer_one_arcs():
    film = find_film("SiO2")
    t = charging_time(3.9, 1e9, 1000.0)  # 34.5 us at 100 mA/cm^2 on 1 m^2 with gamma 0
    _c, short = charging_flags(film, 1000.0, 1.0, 0.0, 0.5 * t, 1e-6)
    _c, long_ = charging_flags(film, 1000.0, 1.0, 0.0, 2.0 * t, 1e-6)
    _c, dc = charging_flags(film, 1000.0, 1.0, 0.0, None, None)
    assert [x.code for x in short] == ["charging_held"] and [x.level for x in long_] == ["watch"]
    assert [(x.code, x.level) for x in dc] == [("charging_arcs", "danger")]
    assert f"under {t * 1e6:.3g} us" in dc[0].reason


# -- gas balance and target mode -------------------------------------------------------------


def test_target_mode_from_the_gas_balance_by_hand():
    # 40 sccm Ar and 8 sccm O2 at 250 l/s: expected Ar 0.2702 Pa, O2 0.0540 Pa. The gauge reads 0.30 Pa:
    # O2 left = 0.30 - 0.2702 = 0.0298 Pa, so the target takes 1 - 0.0298/0.0540 = 45 %.
    m = target_mode(0.30, {AR: 40 * SCCM, O2: 8 * SCCM}, 0.25)
    assert m.expected == pytest.approx(8 * SCCM / 0.25, rel=1e-12)
    assert m.measured == pytest.approx(0.30 - 40 * SCCM / 0.25, rel=1e-12)
    assert m.consumed == pytest.approx(1 - (0.30 - 40 * SCCM / 0.25) / (8 * SCCM / 0.25), rel=1e-12)
    assert m.mode == "transition"


@pytest.mark.parametrize(
    ("pressure", "mode"),
    [(0.272, "metal"), (0.30, "transition"), (0.322, "poisoned"), (3.0, "unclear"), (0.1, "unclear")],
)
def test_target_modes(pressure, mode):
    assert target_mode(pressure, {AR: 40 * SCCM, O2: 8 * SCCM}, 0.25).mode == mode


def test_too_little_reactive_gas_is_not_judged():
    # 1 sccm of oxygen in 40 of argon is 2.4 % of the pressure: under the 5 % the balance can resolve.
    m = target_mode(0.272, {AR: 40 * SCCM, O2: 1 * SCCM}, 0.25)
    assert m.mode == "unresolved"


def test_no_target_mode_without_a_reactive_flow():
    assert target_mode(0.3, {AR: 40 * SCCM, N2: 0.0}, 0.25) is None
    assert target_mode(0.3, {AR: 40 * SCCM}, 0.25) is None


def test_forecast_gives_partial_pressures_target_and_charging():
    fill = read_fill("argon:40 sccm,oxygen:8 sccm")
    bench = Bench(
        "t",
        fill.composition,
        find_cathode("Al"),
        0.06,
        supply=Supply(650.0, 2.0, 5.0, "pulsed", 50e3, 4e-6),
        cathode_area=44e-4,
        pumping_speed=0.25,
        film=find_film("Al2O3"),
        racetrack_fraction=0.3,
    )
    f = forecast(OperatingPoint(0.30, 0.06, None, 293.0, fill.flows, 1.5), bench)
    assert dict(f.partial_pressures) == pytest.approx({"argon": 40 * SCCM / 0.25, "oxygen": 8 * SCCM / 0.25})
    assert f.target.mode == "transition" and f.charging.film == "Al2O3"
    j = f.to_json()
    assert j["target"]["mode"] == "transition" and j["charging"]["on_time_s"] == pytest.approx(16e-6)
    assert j["expected_partial_pressures_Pa"]["oxygen"] == pytest.approx(8 * SCCM / 0.25)


# -- gauges in a mixture ---------------------------------------------------------------------


def test_ionisation_gauge_in_argon_oxygen_by_hand():
    # S = 0.8 x 1.4 (Ar) + 0.2 x 0.96 (O2) = 1.312 (CRC Handbook sensitivities, gauges.toml; mole-
    # fraction weighting, common practice): true = indicated / 1.312.
    corr = gauge_correction("ionisation", read_fill("argon:80,oxygen:20").composition)
    assert corr.factor == pytest.approx(1 / (0.8 * 1.4 + 0.2 * 0.96), rel=1e-12)
    assert correct(1e-2, corr) == (pytest.approx(1e-2 / 1.312, rel=1e-12), False)


def test_thermal_gauge_in_a_mixture_is_shown_uncorrected_and_approximate():
    corr = gauge_correction("thermal", read_fill("argon:80,oxygen:20").composition)
    assert corr.factor is None and "mixture" in corr.source
    assert correct(10.0, corr) == (10.0, True)


def test_capacitance_gauge_reads_any_mixture_truly():
    assert gauge_correction("capacitance", read_fill("argon:80,oxygen:20").composition).factor == 1.0


# -- profile sections ------------------------------------------------------------------------

PROFILE = """
[bench]
gas = {gas}
cathode = "Al"
gap = "60 mm"
[[port]]
url = "loop://"
[[port.channel]]
name = "p"
quantity = "pressure"
query = "P?\\r\\n"
pattern = '^(?P<value>\\S+)$'
unit = "Pa"
gauge = "ionisation"
[[port.channel]]
name = "ar"
quantity = "flow"
query = "F1?\\r\\n"
pattern = '^(?P<value>\\S+)$'
unit = "sccm"
{rest}
"""


def _profile(gas="{ argon = 80, oxygen = 20 }", rest=""):
    return parse_bench(PROFILE.format(gas=gas, rest=rest), "b.toml", None)


def test_profile_gas_as_a_table_of_parts_and_its_gauge_follows():
    p = _profile()
    assert p.bench.composition == "argon:80,oxygen:20"
    assert p.gauges["p"].factor == pytest.approx(1 / 1.312, rel=1e-12)


def test_profile_flows_and_target_sections():
    p = _profile(rest='[flows]\npumping_speed = "250 l/s"\nchannels = { argon = "ar" }\n[target]\nfilm = "Al2O3"\n')
    assert p.flows == {"argon": "ar"} and p.bench.pumping_speed == pytest.approx(0.25)
    assert p.bench.film.name == "Al2O3" and p.bench.racetrack_fraction == 1.0


@pytest.mark.parametrize(
    ("gas", "rest", "needle"),
    [
        ("{ argon = 80, oxygen = -20 }", "", "above zero"),
        ("{ argon = 80, oxygen = true }", "", "parts of 'oxygen'"),
        ("{}", "", "an empty table"),
        ('"argon:80,argon:20"', "", "listed twice"),
        ('"argon"', '[flows]\nchannels = { argon = "p" }\n', "'p' is not a flow channel"),
        ('"argon"', '[flows]\nchannels = { unobtainium = "ar" }\n', "unobtainium"),
        ('"argon"', '[flows]\npumping_speed = "250 sccm"\n', "unknown unit"),
        ('"argon"', '[flows]\npumping_speed = "1e6 l/s"\n', "outside"),
        ('"argon"', '[flows]\nspeed = "250 l/s"\n', "unknown field"),
        ('"argon"', '[target]\nfilm = "gold leaf"\n', "film 'gold leaf'"),
        ('"argon"', '[target]\nfilm = "SiO2"\nracetrack_fraction = 2\n', "racetrack_fraction"),
    ],
)
def test_bad_mixture_profiles_are_one_line(gas, rest, needle):
    with pytest.raises(ProfileError) as e:
        _profile(gas, rest)
    assert needle in str(e.value) and "\n" not in str(e.value) and "b.toml" in str(e.value)


def test_reactive_demo_loads_with_flows_film_and_a_mixture():
    p = load_bench("demo-reactive")
    assert not p.bench.fill.pure and set(p.flows) == {"argon", "oxygen"}
    assert p.bench.film.name == "Al2O3" and p.bench.pumping_speed == pytest.approx(0.25)


# -- the command line ------------------------------------------------------------------------


def test_strike_takes_flows_speed_film_and_current(capsys):
    code = cli.main(
        [
            "strike",
            "--bench",
            "demo-reactive",
            "--gas",
            "argon:40sccm,oxygen:8sccm",
            "--pumping-speed",
            "250 l/s",
            "--pressure",
            "0.30 Pa",
            "--current",
            "1.5 A",
            "--json",
        ]
    )
    j = json.loads(capsys.readouterr().out)
    assert code == 0 and j["gas"] == "argon:83.33,oxygen:16.67" and j["law"] == "mixture"
    assert j["target"]["mode"] == "transition" and j["charging"]["film"] == "Al2O3"
    assert {x["code"] for x in j["flags"]} >= {"linear_mixing", "target_transition"}


def test_curve_of_a_mixture_says_it_is_mixed(capsys):
    assert cli.main(["curve", "--bench", "demo", "--gas", "argon:80,oxygen:20", "--points", "5"]) == 0
    rows = list(csv.DictReader(io.StringIO(capsys.readouterr().out)))
    assert len(rows) == 5 and all(r["constants"] == "mixed" and r["law"] == "mixture" for r in rows)
    assert all(r["gas"] == "argon:80,oxygen:20" for r in rows)
    assert all(math.isfinite(float(r["breakdown_V"])) for r in rows if r["breakdown_V"])
