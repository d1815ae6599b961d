"""Every flag sentence, in every branch, reads as one whole sentence with its numbers.

Each case builds the situation that raises the flag and holds its full reason to a pattern: the
words a technician reads, with the numbers left as patterns. No sentence may carry "None", "nan"
or two clauses glued together (the stray-gap sentence once read "at or below the main gap cannot
break down at all").
"""

import dataclasses
import re

import pytest
from scipy import constants
from strikeline.model.bench import Bench, BenchCurve, Chamber, OperatingPoint, StrayGap, Supply
from strikeline.model.composition import pure
from strikeline.model.forecast import forecast
from strikeline.profiles.bench import load_bench
from strikeline.profiles.fill import find_film, read_fill
from strikeline.profiles.gasdata import find_cathode, find_gas

N = r"-?[\d.]+(?:e[+-]?\d+)?"  # a number as the sentences print them
ARGON, COPPER = find_gas("Ar"), find_cathode("Cu")


def _reason(f, code: str) -> str:
    found = [x.reason for x in f.flags if x.code == code]
    assert len(found) == 1, (code, [x.code for x in f.flags])
    return found[0]


def _bench(**kw) -> Bench:
    return dataclasses.replace(Bench("t", pure(ARGON), COPPER, gap=0.03), **kw)


def _point(p, V=None, d=0.03, T=293.0, flows=(), current=None):
    return OperatingPoint(p, d, V, T, flows, current)


def _ac(p, f, d=0.03, V=None):
    return OperatingPoint(p, d, V, 293.0, frequency=f)


RF = 13.56e6
_AC_LEAD = r"voltages are amplitudes \(peak\)"


def _mixed(text: str, **kw) -> Bench:
    fill = read_fill(text)
    return _bench(fill=fill.composition, **kw)


SCCM = constants.atm * 1e-6 / 60  # Pa m^3/s
O2 = find_gas("O2")
REACTIVE = {"pumping_speed": 0.25}  # 250 l/s: 40 sccm of argon sit at 0.27 Pa, 8 sccm of oxygen at 0.054 Pa
REACTIVE_FLOWS = ((ARGON, 40 * SCCM), (O2, 8 * SCCM))
FILMED = {"film": find_film("Al2O3"), "cathode_area": 44e-4, "racetrack_fraction": 0.3}


SUPPLY = Supply(1200.0, 0.06, 15e3)
FAR_STRAY = (StrayGap("back path", 0.2),)  # long: breaks down where the 30 mm main gap cannot


def _curve(pd_low, pd_high):
    return BenchCurve(
        1.1,
        0.95,
        1.0,
        ((1e-4, 0, 0), (0, 1e-4, 0), (0, 0, 0)),
        5.0,
        8,
        pd_low,
        pd_high,
        "argon",
        "copper",
        "2026-11-30",
    )


NITROGEN = pure(find_gas("N2"))  # its curve has a left end (argon's left branch rises without one)


CASES = [
    # (case id, bench, point, code, pattern of the whole reason)
    (
        "no_breakdown",
        _bench(fill=NITROGEN),
        _point(5.0),
        "no_breakdown",
        rf"reduced pd {N} Pa m is at or left of the curve's left end {N} Pa m: no voltage breaks this gap down; "
        rf"raise the pressure above {N} Pa",
    ),
    (
        "E/N outside the data",
        _bench(),
        _point(0.5),
        "outside_fitted_range",
        rf"breakdown here needs E/N {N} Td, outside the published ionisation data \(argon {N}-{N} Td\): "
        r"extrapolated, the band widened by 25%",
    ),
    (
        "air law blended",
        _bench(fill=pure(find_gas("air")), gap=0.0015),
        _point(constants.atm / 10, d=0.0015),
        "uniform_field_law",
        rf"delta d = {N} cm: the empirical uniform-field law for air is used \(blended with the Townsend law\)",
    ),
    (
        "air law alone",
        _bench(fill=pure(find_gas("air")), gap=0.01),
        _point(constants.atm, d=0.01),
        "uniform_field_law",
        rf"delta d = {N} cm: the empirical uniform-field law for air is used \(alone\)",
    ),
    (
        "air law beyond its range",
        _bench(fill=pure(find_gas("air")), gap=0.5),
        _point(constants.atm, d=0.5),
        "outside_fitted_range",
        rf"delta d = {N} cm is beyond the {N} cm the uniform-field law is used to: breakdown voltage extrapolated",
    ),
    (
        "bench curve",
        _bench(curve=_curve(0.3, 3.0)),
        _point(20.0),
        "bench_curve",
        rf"using this bench's curve \(fitted 2026-11-30 to 8 strikes, rms {N} V\) in place of the default one",
    ),
    (
        "outside bench curve",
        _bench(curve=_curve(1.0, 2.0)),
        _point(200.0),
        "outside_fitted_range",
        rf"reduced pd {N} Pa m is outside the {N} to {N} Pa m the bench curve was fitted over: extrapolated; "
        r"record strikes here",
    ),
    (
        "strikes",
        _bench(),
        _point(20.0, 1200.0),
        "strikes",
        rf"{N} V is {N} V \(\+{N}%\) above the {N} V breakdown voltage, clear of its uncertainty band",
    ),
    (
        "below breakdown",
        _bench(),
        _point(20.0, 50.0),
        "below_breakdown",
        rf"{N} V is {N} V short of the {N} V breakdown voltage, below its whole uncertainty band: "
        r"the gap will not strike",
    ),
    (
        "marginal",
        _bench(),
        _point(20.0, 150.0),
        "marginal",
        rf"{N} V against a {N} V breakdown voltage \((no )?strike expected, margin [+-]{N} V\) sits inside the model's "
        rf"uncertainty band {N}-{N} V: it may or may not strike",
    ),
    (
        "spark by alpha d",
        _bench(fill=pure(find_gas("N2")), gap=0.01),
        _point(6666.0, 6000.0, d=0.01),
        "spark",
        rf"alpha d = {N} at {N} V reaches the Raether-Meek threshold {N} \(gain ~1e8\): a streamer forms and the gap "
        r"sparks rather than glows",
    ),
    (
        "spark by regime",
        _bench(fill=pure(find_gas("air")), gap=0.01),
        _point(constants.atm, 35e3, d=0.01),
        "spark",
        rf"(pd {N} Pa m is in the streamer regime: breakdown here is a spark channel that a low-impedance supply "
        rf"turns into an arc, not a glow|alpha d = {N} at {N} V reaches the Raether-Meek threshold {N} \(gain ~1e8\): "
        r"a streamer forms and the gap sparks rather than glows)",
    ),
    (
        "streamer near",
        _bench(fill=pure(find_gas("N2")), gap=0.01),
        _point(6666.0, 4400.0, d=0.01),
        "streamer_near",
        rf"alpha d = {N} is within 25 % of the Raether-Meek threshold {N}: avalanches approach streamer size",
    ),
    (
        "no current limit",
        _bench(supply=Supply(1200.0, None, 0.0)),
        _point(20.0),
        "unlimited_current",
        r"no ballast resistor and no current limit: nothing holds the current after ignition, so the glow runs away "
        r"into an arc",
    ),
    # krypton on molybdenum: no normal-glow current density known, so nothing holds the density down
    (
        "glow to arc",
        _bench(
            fill=pure(find_gas("Kr")), cathode=find_cathode("Mo"), supply=Supply(1200.0, None, 100.0), cathode_area=1e-6
        ),
        _point(20.0),
        "glow_to_arc",
        rf"{N} (m)?A at {N} V: {N} A/cm\^2 on the cathode approaches the 1 A/cm\^2 where glows turn into arcs",
    ),
    (
        "dark discharge",
        _bench(supply=Supply(1200.0, None, 1e10)),
        _point(20.0),
        "dark_discharge",
        rf"{N} mA at {N} V: below 10 uA the discharge stays dark \(Townsend\); lower the ballast to reach a glow",
    ),
    (
        "glow regime",
        _bench(supply=SUPPLY, cathode_area=19.6e-4),
        _point(20.0),
        "glow_regime",
        rf"{N} mA at {N} V: (normal|abnormal) glow, glow covers {N}% of the cathode, limited by the ballast",
    ),
    (
        "arc sustainable",
        _bench(supply=Supply(700.0, 1.5, 20.0)),
        _point(20.0),
        "arc_sustainable",
        rf"the supply can drive {N} A into a short, above the ~1 A a cathode spot needs: an arc, once started, "
        r"can keep burning; use arc detection or a faster current limit",
    ),
    (
        "stray first, main none, supply reaches",
        _bench(fill=NITROGEN, stray_gaps=FAR_STRAY),
        _point(5.0, 1200.0),
        "stray_gap_first",
        rf"back path \(200 mm\) breaks down at {N} V, while the main gap cannot break down at any voltage, and the "
        rf"supply's {N} V reaches it: the discharge would start there",
    ),
    (
        "stray first, main none, supply short",
        _bench(fill=NITROGEN, stray_gaps=FAR_STRAY),
        _point(5.0, 50.0),
        "stray_gap_first",
        rf"back path \(200 mm\) breaks down at {N} V, while the main gap cannot break down at any voltage; "
        rf"the supply's {N} V does not reach it yet, but a higher voltage would strike there first",
    ),
    (
        "stray first, main none, no voltage",
        _bench(fill=NITROGEN, stray_gaps=FAR_STRAY),
        _point(5.0),
        "stray_gap_first",
        rf"back path \(200 mm\) breaks down at {N} V, while the main gap cannot break down at any voltage: a discharge "
        r"would start there",
    ),
    (
        "stray first, main strikes",
        _bench(stray_gaps=(StrayGap("back path", 0.044),)),
        _point(20.0, 1200.0),
        "stray_gap_first",
        rf"back path \(44 mm\) breaks down at {N} V, at or below the main gap's {N} V, and the supply's {N} V reaches "
        r"it: the discharge would start there",
    ),
    (
        "stray first, supply short",
        _bench(stray_gaps=(StrayGap("back path", 0.044),)),
        _point(20.0, 100.0),
        "stray_gap_first",
        rf"back path \(44 mm\) breaks down at {N} V, at or below the main gap's {N} V; the supply's {N} V does not "
        r"reach it yet, but a higher voltage would strike there first",
    ),
    (
        "stray may strike",
        _bench(stray_gaps=(StrayGap("wide clamp", 0.035),)),
        _point(500.0, 5000.0),
        "stray_gap_may_strike",
        rf"wide clamp \(35 mm\) breaks down at {N} V, within the {N} V across it while the glow runs",
    ),
    (
        "strays hold",
        _bench(stray_gaps=(StrayGap("dark-space shield", 0.002),)),
        _point(20.0, 1200.0),
        "stray_gaps_hold",
        r"no stray gap \(dark-space shield\) breaks down below the main gap or the running voltage",
    ),
    (
        "left branch, chamber",
        _bench(chamber=Chamber(0.15, 0.3)),
        _point(20.0),
        "left_branch_longer_paths",
        rf"the main gap \(30 mm\) is left of the minimum: longer paths at cathode potential, up to {N} mm, break "
        rf"down at lower voltage \(down to {N} V\); the chamber \(150 mm radius\) holds such paths; "
        r"shield the back and sides of the cathode",
    ),
    (
        "left branch, no chamber",
        _bench(),
        _point(20.0),
        "left_branch_longer_paths",
        rf"the main gap \(30 mm\) is left of the minimum: longer paths at cathode potential, up to {N} mm, break "
        rf"down at lower voltage \(down to {N} V\); shield the back and sides of the cathode",
    ),
    (
        "afterglow carries over",
        load_bench("demo").bench,
        _point(20.0),
        "afterglow_carries_over",
        rf"decay time {N} us against a {N} us off-time: {N}% of the charge is left, so each pulse re-ignites easily",
    ),
    (
        "afterglow lost",
        dataclasses.replace(load_bench("demo").bench, supply=Supply(1200.0, 0.06, 15e3, "pulsed", 100.0, 5e-3)),
        _point(20.0),
        "afterglow_lost",
        rf"decay time {N} us against a {N} us off-time: only {N}% of the charge is left, so each pulse must break the "
        r"gap down afresh \(expect ignition delay and jitter\)",
    ),
    (
        "mixture",
        _mixed("argon:80,oxygen:20"),
        _point(20.0),
        "linear_mixing",
        r"argon:80,oxygen:20: coefficients mixed by mole fraction; the breakdown band is widened by 10% for it",
    ),
    (
        "Penning pair",
        _mixed("neon:99,argon:1"),
        _point(200.0),
        "penning",
        rf"neon with argon is a Penning mixture: neon metastables \({N} eV\) ionise argon \({N} eV\), so it breaks "
        r"down well below this forecast; record strikes and fit this bench's own curve \(strikeline fit\)",
    ),
    (
        "attachment limit, far",
        _bench(fill=pure(O2)),
        _point(100.0, d=0.01),
        "attachment_limit",
        rf"electron attachment: below E/N {N} Td \(alpha = eta\) electrons attach faster than they multiply",
    ),
    (
        "attachment limit, near",
        _mixed("nitrogen:78,oxygen:21,argon:1"),
        _point(constants.atm, d=0.1),
        "attachment_limit",
        rf"electron attachment: below E/N {N} Td \(alpha = eta\) electrons attach faster than they multiply; "
        rf"breakdown here needs {N} Td, close to that limit: a long gap breaks down near the limit field whatever "
        r"its length",
    ),
    (
        "mixture outside fitted range",
        _mixed("argon:80,oxygen:20"),
        _point(50.0, d=0.01),
        "outside_fitted_range",
        rf"breakdown here needs E/N {N} Td, outside the published ionisation data \(argon {N}-{N} Td\): "
        r"extrapolated, the band widened by 25%",
    ),
    (
        "target metal",
        _mixed("argon:40,oxygen:8", **REACTIVE),
        _point(0.275, d=0.06, flows=REACTIVE_FLOWS),
        "target_metal",
        rf"metal mode: the target takes {N}% of the oxygen \({N} Pa left of {N} Pa expected\)",
    ),
    (
        "target transition",
        _mixed("argon:40,oxygen:8", **REACTIVE),
        _point(0.30, d=0.06, flows=REACTIVE_FLOWS),
        "target_transition",
        rf"transition mode: the target takes {N}% of the oxygen \({N} Pa left of {N} Pa expected\); where it tips "
        r"into poisoned mode the discharge voltage and the deposition rate jump: hold the reactive flow steady",
    ),
    (
        "target poisoned",
        _mixed("argon:40,oxygen:8", **REACTIVE),
        _point(0.32, d=0.06, flows=REACTIVE_FLOWS),
        "target_poisoned",
        rf"poisoned mode: the target takes {N}% of the oxygen \({N} Pa left of {N} Pa expected\); the target is "
        r"covered with its film \(slower deposition, arcs\): less oxygen flow or more pumping brings it back",
    ),
    (
        "target unresolved",
        _mixed("argon:40,oxygen:1", **REACTIVE),
        _point(0.272, d=0.06, flows=((ARGON, 40 * SCCM), (O2, 1 * SCCM))),
        "target_unresolved",
        rf"the oxygen is {N}% of the expected pressure: a few per cent of error in the gauge or the pumping speed "
        rf"would hide what the target takes; the mode is judged from {N}% up",
    ),
    (
        "gas balance off",
        _mixed("argon:40,oxygen:8", **REACTIVE),
        _point(3.0, d=0.06, flows=REACTIVE_FLOWS),
        "gas_balance_off",
        rf"the gauge reads {N} Pa but the flows over the pumping speed give {N} Pa of inert gas and {N} Pa of oxygen "
        r"at most: check the pumping speed \(a throttle valve\?\), the gauge's gas correction or a leak; the target "
        r"mode is not judged",
    ),
    (
        "charging, DC",
        _mixed("argon:80,oxygen:20", supply=Supply(700.0, 1.5, 20.0), **FILMED),
        _point(20.0, current=1.5),
        "charging_arcs",
        rf"the Al2O3 film on the target charges to breakdown in {N} us under {N} mA/cm\^2 of ions; a DC supply keeps "
        rf"charging it, so it arcs: pulse the supply with on-times under {N} us \(at 50 % duty, above {N} kHz\)",
    ),
    (
        "charging, long pulses",
        _mixed("argon:80,oxygen:20", supply=Supply(700.0, 1.5, 20.0, "pulsed", 5e3, 20e-6), **FILMED),
        _point(20.0, current=1.5),
        "charging_arcs",
        rf"the Al2O3 film on the target charges to breakdown in {N} us under {N} mA/cm\^2 of ions, shorter than the "
        rf"{N} us on-time: expect arcs; keep the on-time under {N} us \(with this off-time, pulse above {N} kHz\)",
    ),
    (
        "charging held",
        _mixed("argon:80,oxygen:20", supply=Supply(700.0, 1.5, 20.0, "pulsed", 100e3, 4e-6), **FILMED),
        _point(20.0, current=1.5),
        "charging_held",
        rf"the Al2O3 film on the target charges to breakdown in {N} us under {N} mA/cm\^2 of ions, longer than the "
        rf"{N} us on-time: each pulse ends first",
    ),
    (
        "AC, DC-like",
        _bench(),
        _ac(20.0, 50.0),
        "ac_regime",
        r"50 Hz: DC-like: the ions cross the gap within a half period, so each half cycle breaks down as DC; "
        + _AC_LEAD,
    ),
    (
        "AC, intermediate",
        _bench(),
        _ac(40.0, 40e3),
        "ac_regime",
        r"40 kHz: intermediate: fewer ions reach the cathode each half period, so gamma counts for less; " + _AC_LEAD,
    ),
    (
        "RF, volume",
        _bench(),
        _ac(60.0, RF),
        "ac_regime",
        r"13.56 MHz: RF volume breakdown: electrons made and lost in the gas, by diffusion; " + _AC_LEAD,
    ),
    (
        "RF, drift-limited",
        _bench(gap=0.01),
        _ac(422.0, RF, d=0.01),
        "ac_regime",
        r"13.56 MHz: drift-limited: the electrons' swing spans over half the gap, sweeping many onto the "
        r"electrodes each half period; " + _AC_LEAD,
    ),
    (
        "RF, none",
        _bench(),
        _ac(20.0, RF),
        "ac_regime",
        r"13.56 MHz: no breakdown at this pd; " + _AC_LEAD,
    ),
    (
        "RF above the upper branch",
        _bench(),
        _ac(40.0, RF, V=500.0),
        "above_upper_branch",
        rf"{N} V is above the upper branch \({N} V\) at this pressure: the electrons' swing sweeps them onto the "
        r"electrodes each half period, so more voltage does not strike it; raise the pressure or lower the voltage",
    ),
    (
        "RF below the turning point",
        _bench(),
        _ac(12.0, RF),
        "below_turning_point",
        rf"the pressure is below the turning point of the RF curve \({N} Pa at this gap\): no volume breakdown "
        r"exists here at any voltage; raise the pressure above it",
    ),
    (
        "RF gap against the wavelength",
        _bench(gap=0.5),
        _ac(20.0, 1e8, d=0.5),
        "gap_vs_wavelength",
        rf"the gap \(500 mm\) is over 10% of the wavelength \({N} m at 100 MHz\): the field is no longer uniform "
        r"and this forecast does not hold",
    ),
    (
        "RF on a magnetron",
        load_bench("demo-magnetron").bench,
        _ac(0.5, RF, d=0.06),
        "crossed_field_not_applied",
        r"magnetised cathode: the crossed-field effective pressure is a DC treatment and is not applied to this "
        r"alternating supply; the magnet confines electrons, so breakdown is likely lower than forecast",
    ),
    (
        "curve unchecked",
        _bench(fill=pure(find_gas("Kr"))),
        _point(100.0),
        "curve_unchecked",
        r"krypton's default curve is not checked against a measured minimum sparking potential here: record "
        r"strikes and fit this bench's own curve \(strikeline fit\)",
    ),
    (
        "attachment not modelled",
        _bench(fill=pure(find_gas("H2O"))),
        _point(100.0),
        "attachment_not_modelled",
        r"water-vapour attaches electrons but no attachment data are held here: at high pd it breaks down above "
        r"this forecast",
    ),
    (
        "crossed field",
        load_bench("demo-magnetron").bench,
        _point(0.5, d=0.06),
        "crossed_field",
        rf"magnetised cathode \(30 mT\): omega_ce/nu_m = {N}, effective pressure {N} Pa for 0.5 Pa; an approximation "
        r"that treats the whole gap as if it sat in the cathode's field",
    ),
]


@pytest.mark.parametrize(("bench", "point", "code", "pattern"), [c[1:] for c in CASES], ids=[c[0] for c in CASES])
def test_flag_sentence(bench, point, code, pattern):
    reason = _reason(forecast(point, bench), code)
    assert re.fullmatch(pattern, reason), reason
    assert not re.search(r"\b(None|nan|inf)\b", reason)


def test_every_flag_code_has_a_wording_case():
    # A new flag must come with its sentence checked here: every code the model can raise (found in
    # its source as Flag("code", ...) or flag("code", ...)) has a case.
    from pathlib import Path

    import strikeline.model

    source = "".join(p.read_text() for p in Path(strikeline.model.__file__).parent.glob("*.py"))
    raised = set(re.findall(r'(?:Flag|flag)\(\s*"([a-z_]+)",', source))
    assert len(raised) >= 30, raised  # the pattern still finds them
    assert {c[3] for c in CASES} == raised


@pytest.mark.parametrize(("bench", "point"), [c[1:3] for c in CASES], ids=[c[0] for c in CASES])
def test_one_flag_per_code(bench, point):
    # The session tracks flags by code (raised/cleared); two flags under one code would hide one.
    codes = [x.code for x in forecast(point, bench).flags]
    assert len(codes) == len(set(codes)), codes


@pytest.mark.parametrize(("bench", "point"), [c[1:3] for c in CASES], ids=[c[0] for c in CASES])
def test_every_number_the_unit_systems_convert_is_a_quantity(bench, point):
    # A pressure, pd, E/p or gap written into the template itself would stay in SI on a Torr screen:
    # each must be a quantity, with its SI unit and what it is, in the JSON as in the flag.
    for x in forecast(point, bench).flags:
        assert not re.search(rf"{N} (Pa|Pa m|mm|V/\(Pa m\))\b", x.template), x.template
        j = x.to_json()
        assert j["reason"] == x.reason and set(j["quantities"]) == {name for name, _ in x.quantities}
        for name, qty in j["quantities"].items():
            assert qty["what"] and qty["unit"] is not None and "{" + name + "}" in x.template


def test_a_flag_sentence_follows_the_operators_units():
    # no_breakdown in Torr: the pds in Torr cm and the pressure in mTorr, converted with scipy's torr.
    from strikeline.tui.text import flag_sentence

    f = forecast(_point(5.0), _bench(fill=NITROGEN))
    (nb,) = [x for x in f.flags if x.code == "no_breakdown"]
    rpd = dict(nb.quantities)["rpd"].value
    text = flag_sentence(nb, "Torr")
    assert f"reduced pd {rpd / (constants.torr * constants.centi):.3g} Torr cm" in text
    assert re.search(rf"raise the pressure above {N} mTorr$", text) and " Pa" not in text
    assert flag_sentence(nb, "SI") == nb.reason
