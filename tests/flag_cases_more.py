"""Flag wording cases, part two: afterglow, mixtures, reactive targets, alternating supplies."""

import dataclasses

from flag_cases import (
    _AC_LEAD,
    ARGON,
    FILMED,
    O2,
    REACTIVE,
    REACTIVE_FLOWS,
    RF,
    SCCM,
    N,
    _ac,
    _bench,
    _mixed,
    _point,
)
from scipy import constants
from strikeline.model.bench import Supply
from strikeline.model.composition import pure
from strikeline.profiles.bench import load_bench
from strikeline.profiles.gasdata import find_gas

MORE_CASES = [
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
