"""Flag wording cases, part one: breakdown, margin, streamers, glow, stray gaps (with the helpers both
parts use). Each case: (id, bench, point, code, pattern of the whole reason); tests/model/test_flag_wording.py
holds them."""

import dataclasses

from scipy import constants
from strikeline.model.bench import Bench, BenchCurve, Chamber, OperatingPoint, StrayGap, Supply
from strikeline.model.composition import pure
from strikeline.profiles.fill import find_film, read_fill
from strikeline.profiles.gasdata import find_cathode, find_gas

N = r"-?[\d.]+(?:e[+-]?\d+)?"  # a number as the sentences print them
ARGON, COPPER = find_gas("Ar"), find_cathode("Cu")


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


DC_CASES = [
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
]
