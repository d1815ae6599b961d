"""The one entry point: ``forecast(point, bench) -> Forecast``, and the bench's breakdown curve.

It composes the formula modules into everything a technician needs to know about an
operating point: breakdown and its uncertainty band, avalanche, margin, stray gaps, the glow
after ignition, the afterglow, each judgement carried as a :class:`Flag` with its reason and
the method behind it (:mod:`.flags`, :mod:`.regime`, :mod:`.stray`, :mod:`.afterglow`).
Pure: no files, clocks or I/O; SI in and out.
"""

from __future__ import annotations

import math
from dataclasses import replace
from typing import Any

import numpy as np

from . import constants as _c
from . import mixture as mx
from . import townsend
from .ac_point import ac_frequency, ac_result, not_applicable
from .afterglow import afterglow_between_pulses
from .alternating import ALTERNATING_UNCERTAINTY
from .bench import Bench, BenchCurve, OperatingPoint, Yield
from .breakdown import alternating_law, breakdown_law, solved_mixture
from .calibration import prediction_band
from .composition import same_composition
from .flags import (
    MIXTURE_UNCERTAINTY,
    RAETHER_ALPHA_D,
    STREAMER_CHECK_PD,
    TD_PER_V_PER_PA_M,
    curve_flags,
    margin_flags,
    mixture_flags,
    no_breakdown_flag,
    streamer_flags,
    validity_flags,
)
from .reactive import charging_flags, target_flags, target_mode
from .regime import glow_after_ignition
from .results import LEVELS, Afterglow, Flag, Forecast, StrayResult, finite_or_none
from .stray import left_branch_flags, stray_flags, stray_gaps

__all__ = [
    "LEVELS",
    "MAGNETISED_UNCERTAINTY",
    "RAETHER_ALPHA_D",
    "TEXTBOOK_UNCERTAINTY",
    "UNIFORM_FIELD_UNCERTAINTY",
    "Afterglow",
    "Flag",
    "Forecast",
    "StrayResult",
    "effective_pressure",
    "forecast",
    "law_name",
    "with_bench_curve",
]

TEXTBOOK_UNCERTAINTY = 0.25
"""Relative uncertainty of V_b from tabulated constant A, B: Paschen's law with constant A, B is a
10-25 % model (common practice)."""
MAGNETISED_UNCERTAINTY = 0.5
"""Relative uncertainty under the crossed-field approximation (our judgement: it treats the
whole gap as if it sat in the cathode's field)."""
UNIFORM_FIELD_UNCERTAINTY = 0.05
"""Relative uncertainty of the empirical uniform-field air law (a few per cent, from memory)."""


def law_name(weight: float) -> str:
    """Which law a pure gas's V_b came from, given the uniform-field law's weight: "paschen", "blend"
    or "uniform-field" (a mixture or an attaching gas: "mixture").

    >>> law_name(0.0), law_name(0.3), law_name(1.0)
    ('paschen', 'blend', 'uniform-field')
    """
    return "paschen" if weight == 0 else ("uniform-field" if weight >= 1 else "blend")


def effective_pressure(p, T: float, bench: Bench):
    """Effective pressure p sqrt(1 + (omega_ce/nu_m)^2) in crossed E x B fields, and the Hall
    parameter omega_ce/nu_m (Blevin & Haydon's effective-pressure treatment, as in Raizer 1991,
    sec. 4.6; from memory). p in Pa (scalar or array), T in K. Unmagnetised: (p, None).

    >>> from strikeline.profiles.loader import load_bench
    >>> p_eff, hall = effective_pressure(0.5, 293.0, load_bench("demo-magnetron").bench)
    >>> round(float(hall)), round(float(p_eff))
    (285, 142)
    """
    if bench.magnetic_field is None:
        return p, None
    omega = _c.e * bench.magnetic_field / _c.m_e
    p = np.asarray(p, dtype=float)
    parts = [(c.fraction, c.gas) for c in bench.mixture.components] if bench.mixture else [(1.0, bench.gas)]
    nu_per_p = sum(x * g.electron_collision_per_Pa for x, g in parts)  # collision frequencies add by fraction
    nu = nu_per_p * p * bench.gas.constants.reference_temperature / T
    hall = omega / nu
    p_eff = p * np.sqrt(1.0 + hall * hall)
    return (float(p_eff), float(hall)) if p_eff.ndim == 0 else (p_eff, hall)


def with_bench_curve(bench: Bench) -> tuple[Bench, BenchCurve | None]:
    """The bench with its fitted curve's A, B, gamma in place of the textbook ones, where the
    curve was fitted for this gas (or a mixture of the same gases within
    :data:`.composition.SAME_WITHIN`) and cathode: Paschen's law with the fitted constants then stands
    for the whole gas fill."""
    cv = bench.curve
    if cv is None or cv.cathode != bench.cathode.key or not same_composition(cv.gas, bench.composition):
        return bench, None
    source = f"bench curve fitted {cv.fitted_on} from {cv.n_points} strikes (rms {cv.rms_residual:.0f} V)"
    c = replace(bench.gas.constants, A=cv.A, B=cv.B, source=source)
    gas = replace(bench.gas, constants=c, low_field=None, attachment=None)
    return replace(bench, gas=gas, mixture=None, gamma=cv.gamma), cv


def _band(rpd, bench, law, y, hall, weight, cv, mixed) -> tuple[tuple[float | None, float | None], str, float | None]:
    """V_b's uncertainty band (V), what it is made of, and the constants' relative uncertainty (None
    where a bench curve's prediction band stands in)."""
    if cv is not None and weight < 0.5:
        _v, lo_b, hi_b = prediction_band(cv, rpd)
        return (finite_or_none(lo_b[0]), finite_or_none(hi_b[0])), "bench curve's 95 % prediction band", None
    if hall is not None:
        u = MAGNETISED_UNCERTAINTY
    elif weight >= 0.5:
        u = UNIFORM_FIELD_UNCERTAINTY
    else:
        u = TEXTBOOK_UNCERTAINTY
    if mixed:
        u += MIXTURE_UNCERTAINTY
        v_lo = finite_or_none(breakdown_law(bench, which="high").voltage(rpd)[0])
        v_hi = finite_or_none(breakdown_law(bench, which="low").voltage(rpd)[0])
    else:
        v_lo = finite_or_none(law.with_gamma(y.high).voltage(rpd)[0])
        v_hi = finite_or_none(law.with_gamma(y.low).voltage(rpd)[0])
    band = (None if v_lo is None else v_lo * (1 - u), None if v_hi is None else v_hi * (1 + u))
    return band, f"gamma range and +/-{u:.0%} for the constants" + (" and mixing" if mixed else ""), u


def _yield(bench: Bench, law, cv: BenchCurve | None, mix) -> Yield:
    if cv is not None:
        spread = cv.t_quantile * cv.gamma_sigma
        return Yield(cv.gamma, max(cv.gamma - spread, 1e-6), min(cv.gamma + spread, 1.0), law.constants.source)
    if mix is None or len(mix.components) == 1:
        return bench.yield_()
    lows = breakdown_law(bench, which="low").gammas
    highs = breakdown_law(bench, which="high").gammas
    return Yield(
        law.gamma, min(lows), max(highs), "each gas's gamma on this cathode, weighted by its share of the ionisation"
    )


def forecast(point: OperatingPoint, bench: Bench) -> Forecast:
    """Forecast breakdown and its risks for ``point`` on ``bench``.

    The voltage considered is ``point.voltage``, else the bench supply's open-circuit
    voltage, else none (breakdown only). A bench curve fitted for this gas and cathode
    replaces the textbook constants, and its prediction band replaces their uncertainty.
    A mixture (or an attaching gas) is solved by linear mixing with attachment.
    """
    bench, cv = with_bench_curve(bench)
    gas = bench.gas
    mix = solved_mixture(bench)
    freq = ac_frequency(point, bench)
    law = breakdown_law(bench) if freq is None else alternating_law(bench, freq, point.gap)
    y = _yield(bench, law if freq is None else law.dc, cv, mix)
    gamma = y.value
    T = point.gas_temperature
    scale = law.reference_temperature / T  # reduced pd = pd * scale
    p_eff, hall = effective_pressure(point.pressure, T, bench) if freq is None else (point.pressure, None)
    to_pressure = 1.0 / scale / point.gap * (point.pressure / p_eff)  # reduced pd -> pressure at this gap
    rpd = p_eff * point.gap * scale
    v, w = law.voltage(rpd)
    vb, weight = finite_or_none(v), float(w)
    law_used = "alternating" if freq is not None else law_name(weight) if mix is None else "mixture"
    pd_min, v_min = law.minimum()
    pd0 = law.no_breakdown_pd()
    br = str(law.branch(rpd))
    e_over_p = finite_or_none(law.e_over_p(rpd))
    flags: list[Flag] = []
    if freq is not None and bench.magnetic_field is not None:
        flags.append(
            Flag(
                "crossed_field_not_applied",
                "watch",
                "magnetised cathode: the crossed-field effective pressure is a DC treatment and is not applied to "
                "this alternating supply; the magnet confines electrons, so breakdown is likely lower than forecast",
                "effective-pressure treatment of crossed E x B fields, DC only (our choice)",
            )
        )
    if hall is not None:
        flags.append(
            Flag(
                "crossed_field",
                "ok",
                f"magnetised cathode ({bench.magnetic_field * 1e3:.3g} mT): omega_ce/nu_m = {hall:.3g}, effective "
                f"pressure {p_eff:.3g} Pa for {point.pressure:.3g} Pa; an approximation that treats the whole gap "
                "as if it sat in the cathode's field",
                "effective-pressure treatment of crossed E x B fields (Blevin & Haydon; Raizer 1991, from memory)",
            )
        )
    critical = None
    if mix is None:
        # A bench curve has its own fitted range (curve_flags); the textbook E/p range says nothing of it.
        flags += validity_flags(
            rpd, vb, weight, None if cv else e_over_p, pd0 * to_pressure, pd0, gas.constants, gas.law
        )
    else:
        critical = law.critical_E_over_p
        if vb is None:
            flags.append(no_breakdown_flag(rpd, pd0, pd0 * to_pressure))
        flags += mixture_flags(
            bench.composition, mix.components, e_over_p, critical, mx.penning_pairs(mix), mx.ASSUMPTIONS
        )
    V = point.voltage
    if V is None and bench.supply is not None:
        V = bench.supply.open_circuit_voltage
    alt = None
    if freq is not None:
        alt, ac_flags = ac_result(law, point, rpd, scale, V)
        flags += ac_flags
        band, band_source, u = _ac_band(vb, alt.regime, mix is not None)
    else:
        band, band_source, u = _band(rpd, bench, law, y, hall, weight, cv, mix is not None)
    if u is None:
        flags += curve_flags(cv, rpd)

    result: dict[str, Any] = {}
    strays = stray_gaps(bench, _stray_breakdown(bench, law, freq), p_eff, scale, vb)
    load = None
    if V is not None:
        E = V / point.gap
        a = law.alpha(E, p_eff * scale)
        eta = law.eta(E, p_eff * scale)
        ad, net = a * point.gap, (a - eta) * point.gap
        N = float(townsend.number_density(point.pressure, T))
        swept = alt is not None and alt.upper_voltage is not None and V > alt.upper_voltage
        swept = swept and (alt.dc_like_voltage is None or V < alt.dc_like_voltage)  # no gamma strike either
        strikes = vb is not None and V >= vb and not swept
        volume = alt is not None and alt.regime in ("rf-volume", "drift-limited")
        E_shown = E if alt is None else alt.effective_field  # an alternating field: E_eff
        result = {
            "voltage": V,
            "E_over_N_Td": float(townsend.reduced_field_Td(E_shown, N)),
            "alpha": a,
            "eta": eta if mix is not None else None,
            "alpha_d": None if volume else ad,
            "gain": None if volume else float(townsend.avalanche_gain(net)),
            "current_growth": None if volume else float(townsend.current_growth(ad, gamma, eta * point.gap)),
            "margin": None if vb is None else V - vb,
            "margin_fraction": None if vb is None else (V - vb) / vb,
            "strikes": strikes,
        }
        if not swept:  # above the upper branch the alternating flags say why it does not strike
            flags += margin_flags(V, vb, band, law_used, u)
        if hall is None and rpd >= STREAMER_CHECK_PD and (alt is None or alt.regime == "dc-like"):
            flags += streamer_flags(V, vb, net, rpd, weight)
        if bench.supply is not None and strikes and alt is None:
            load, glow_flags = glow_after_ignition(bench, p_eff, v_min, V)
            flags += glow_flags
    flags += stray_flags(strays, vb, V, load)
    flags += left_branch_flags(br, point, bench, pd_min, v_min, scale, p_eff)
    after, after_flags = afterglow_between_pulses(point, bench) if freq is None else (None, [])
    flags += after_flags
    partial = _partial_pressures(point, bench)
    target, charging, reactive_flags = _reactive(point, bench, mix, gamma, load, freq)
    flags += reactive_flags

    c = law.constants if mix is None and freq is None else law.dc.constants if mix is None else None
    return Forecast(
        gas=bench.composition,
        cathode=bench.cathode.key,
        gamma=gamma,
        gamma_range=(y.low, y.high),
        gamma_source=y.source,
        A=None if c is None else c.A,
        B=None if c is None else c.B,
        constants_source=c.source if c is not None else _mixed_sources(mix),
        pressure=point.pressure,
        gap=point.gap,
        gas_temperature=T,
        reference_temperature=law.reference_temperature,
        pd=point.pressure * point.gap,
        reduced_pd=rpd,
        breakdown_voltage=vb,
        law=law_used,
        minimum_pd=pd_min,
        minimum_voltage=v_min,
        minimum_pressure=pd_min * to_pressure,
        no_breakdown_pressure=pd0 * to_pressure,
        branch=br,
        breakdown_E_over_p=e_over_p,
        effective_pressure=None if hall is None else p_eff,
        hall_parameter=hall,
        breakdown_band=band,
        band_source=band_source,
        stray_gaps=strays,
        load_line=load,
        afterglow=after,
        composition=() if mix is None else tuple((c.gas.key, c.fraction) for c in mix.components),
        mixing=mx.ASSUMPTIONS if mix is not None and len(mix.components) > 1 else (),
        critical_E_over_N_Td=None if critical is None else critical * TD_PER_V_PER_PA_M,
        partial_pressures=partial,
        target=target,
        charging=charging,
        alternating=alt,
        not_applicable=() if alt is None else not_applicable(alt.regime),
        flags=tuple(flags),
        **result,
    )


def _ac_band(vb, regime: str, mixed: bool):
    """An alternating supply's band: the swarm data's uncertainty for volume breakdown, the
    constants' for the DC-like mechanisms (and the mixing's on top for a mixture)."""
    volume = regime in ("rf-volume", "drift-limited")
    u = (ALTERNATING_UNCERTAINTY if volume else TEXTBOOK_UNCERTAINTY) + (MIXTURE_UNCERTAINTY if mixed else 0.0)
    band = (None, None) if vb is None else (vb * (1 - u), vb * (1 + u))
    what = "the swarm data (nu_m, mobility, eps_k)" if volume else "the constants"
    return band, f"+/-{u:.0%} for {what}" + (" and mixing" if mixed else ""), u


def _stray_breakdown(bench, law, freq):
    """V_b of a stray gap from its reduced pd and its length: the main law for DC, the gap's own
    alternating law for AC (the curve depends on w d)."""
    if freq is None:
        return lambda rpd, length: finite_or_none(law.voltage(rpd)[0])
    return lambda rpd, length: finite_or_none(alternating_law(bench, freq, length).voltage(rpd)[0])


def _mixed_sources(mix) -> str:
    if len(mix.components) == 1:
        g = mix.main
        return f"{g.constants.source}; attachment: {g.attachment.source}"
    return "mixed from " + "; ".join(f"{c.gas.key}: {c.gas.constants.source}" for c in mix.components)


def _partial_pressures(point: OperatingPoint, bench: Bench) -> tuple[tuple[str, float], ...]:
    """Each gas's expected partial pressure flow / speed (steady state, every gas pumped alike)."""
    if bench.pumping_speed is None:
        return ()
    return tuple((g.key, q / bench.pumping_speed) for g, q in point.flows)


def _reactive(point, bench, mix, gamma, load, freq):
    """Target mode from the gas balance, and charging arcs on the target's film."""
    flags: list[Flag] = []
    target = None
    gases = [c.gas for c in mix.components] if mix is not None else [bench.gas]
    if bench.pumping_speed is not None and point.flows:
        target = target_mode(point.pressure, dict(point.flows), bench.pumping_speed)
        if target is not None:
            flags += target_flags(target)
    charging = None
    reactive_fill = any(g.reactive for g in gases)
    film_there = target.mode not in ("metal", "unresolved") if target is not None else reactive_fill
    current = point.current if point.current is not None else (load.current if load is not None else None)
    s = bench.supply
    if bench.film is not None and film_there and s is not None and bench.cathode_area and current:
        if math.isfinite(current) and current > 0:
            if freq is not None:  # each half period reverses the field and discharges the film
                on = off = 0.5 / freq
            else:
                on = None if s.mode != "pulsed" else 1.0 / s.frequency - s.off_time
                off = s.off_time
            area = bench.cathode_area * bench.racetrack_fraction
            charging, more = charging_flags(bench.film, current, area, gamma, on, off)
            flags += more
    return target, charging, flags
