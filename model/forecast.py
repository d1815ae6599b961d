"""The one entry point: ``forecast(point, bench) -> Forecast``.

It composes the formula modules into everything a technician needs to know about an operating
point: breakdown and its uncertainty band, avalanche, margin, stray gaps, the glow after ignition,
the afterglow, each judgement carried as a :class:`Flag` with its reason and the method behind it
(:mod:`.flags`, :mod:`.regime`, :mod:`.stray`, :mod:`.afterglow`, :mod:`.reactive`). The curve and
its law come from :func:`.curve.curve_of`. Pure: no files, clocks or I/O; SI in and out.
"""

from __future__ import annotations

from typing import Any

from . import mixture as mx
from . import townsend
from .ac_point import ac_result, not_applicable
from .afterglow import afterglow_between_pulses
from .alternating import ALTERNATING_UNCERTAINTY
from .bench import Bench, OperatingPoint
from .calibration import prediction_band
from .curve import Curve, curve_of
from .flags import (
    MIXTURE_UNCERTAINTY,
    OUTSIDE_DATA_UNCERTAINTY,
    STREAMER_CHECK_PD,
    TD_PER_V_PER_PA_M,
    curve_flags,
    data_flags,
    field_flags,
    margin_flags,
    mixture_flags,
    streamer_flags,
    validity_flags,
)
from .reactive import reactive_results
from .regime import glow_after_ignition
from .results import Forecast, finite_or_none
from .sentence import Flag
from .stray import left_branch_flags, stray_flags, stray_gaps

__all__ = [
    "MAGNETISED_UNCERTAINTY",
    "TEXTBOOK_UNCERTAINTY",
    "UNIFORM_FIELD_UNCERTAINTY",
    "forecast",
    "law_name",
]

TEXTBOOK_UNCERTAINTY = 0.25
"""Relative uncertainty of V_b from published ionisation data and an effective gamma: a 10-25 % model
(common practice)."""
MAGNETISED_UNCERTAINTY = 0.5
"""Relative uncertainty under the crossed-field approximation (our judgement: it treats the
whole gap as if it sat in the cathode's field)."""
UNIFORM_FIELD_UNCERTAINTY = 0.05
"""Relative uncertainty of the empirical uniform-field air law (a few per cent, from memory)."""


def law_name(weight: float, pure: bool = True) -> str:
    """Which law V_b came from, given the uniform-field law's weight: "paschen" (Townsend's criterion
    with the gas's own ionisation and gamma: the Paschen curve), "blend" or "uniform-field"; a mixture's
    "mixture".

    >>> law_name(0.0), law_name(0.3), law_name(1.0), law_name(0.0, pure=False)
    ('paschen', 'blend', 'uniform-field', 'mixture')
    """
    if not pure:
        return "mixture"
    return "paschen" if weight == 0 else ("uniform-field" if weight >= 1 else "blend")


def _band(c: Curve, rpd: float, p_red: float, hall, weight: float, extrapolated: bool):
    """V_b's uncertainty band (V), what it is made of, and the data's relative uncertainty (None where a
    bench curve's prediction band stands in)."""
    if c.fitted is not None and weight < 0.5:
        _v, lo_b, hi_b = prediction_band(c.fitted, c.dc.unscaled(), rpd)
        return (finite_or_none(lo_b[0]), finite_or_none(hi_b[0])), "bench curve's 95 % prediction band", None
    mixed = not c.bench.fill.pure
    u = (
        MAGNETISED_UNCERTAINTY
        if hall is not None
        else UNIFORM_FIELD_UNCERTAINTY
        if weight >= 0.5
        else TEXTBOOK_UNCERTAINTY
    )
    u += (MIXTURE_UNCERTAINTY if mixed else 0.0) + (OUTSIDE_DATA_UNCERTAINTY if extrapolated else 0.0)
    v_lo = finite_or_none(c.dc.at("high").voltage(rpd, p_red)[0][()])
    v_hi = finite_or_none(c.dc.at("low").voltage(rpd, p_red)[0][()])
    band = (None if v_lo is None else v_lo * (1 - u), None if v_hi is None else v_hi * (1 + u))
    what = "gamma range and +/-" + f"{u:.0%} for the ionisation data"
    what += " and mixing" if mixed else ""
    what += ", extrapolated" if extrapolated else ""
    return band, what, u


def _ac_band(vb, regime: str, mixed: bool):
    """An alternating supply's band: the swarm data's uncertainty for volume breakdown, the ionisation
    data's for the DC-like mechanisms (and the mixing's on top for a mixture)."""
    volume = regime in ("rf-volume", "drift-limited")
    u = (ALTERNATING_UNCERTAINTY if volume else TEXTBOOK_UNCERTAINTY) + (MIXTURE_UNCERTAINTY if mixed else 0.0)
    band = (None, None) if vb is None else (vb * (1 - u), vb * (1 + u))
    what = "the swarm data (nu_m, mobility, eps_k)" if volume else "the ionisation data"
    return band, f"+/-{u:.0%} for {what}" + (" and mixing" if mixed else ""), u


def forecast(point: OperatingPoint, bench: Bench) -> Forecast:
    """Forecast breakdown and its risks for ``point`` on ``bench``.

    The voltage considered is ``point.voltage``, else the bench supply's open-circuit voltage, else
    none (breakdown only). A bench curve fitted for this fill and cathode scales the fill's law, and
    its prediction band replaces the data's uncertainty.
    """
    c = curve_of(bench, frequency=point.frequency, gap=point.gap, temperature=point.gas_temperature)
    law, dc, fill = c.law, c.dc, bench.fill
    rpd_a, p_eff, hall = c.reduced(point.pressure)
    rpd, p_eff = float(rpd_a), float(p_eff)
    p_red = point.pressure * c.scale  # the gas's density, for three-body attachment
    to_pressure = 1.0 / c.scale / point.gap * (point.pressure / p_eff)  # reduced pd -> pressure at this gap
    v, w = law.voltage(rpd) if c.alternating else law.voltage(rpd, p_red)
    vb, weight = finite_or_none(v[()]), float(w[()])
    law_used = "alternating" if c.alternating else law_name(weight, fill.pure)
    pd_min, v_min = law.minimum()
    pd0 = law.no_breakdown_pd()
    br = str(law.branch(rpd))
    if c.alternating:
        e_over_p = finite_or_none(law.e_over_p(rpd))
    else:
        e_over_p = None if vb is None else vb / rpd
    y_dc = e_over_p if not c.alternating else finite_or_none(dc.e_over_p(rpd))
    uncovered = [] if y_dc is None or c.fitted is not None else dc.uncovered(y_dc)
    flags: list[Flag] = field_flags(bench, c.alternating, hall, p_eff, point.pressure)
    flags += data_flags(fill, uncovered, y_dc, dc.ionisation_sources(y_dc) if y_dc else "")
    flags += validity_flags(rpd, vb, weight, pd0, pd0 * to_pressure, dc.uniform, c.reference_temperature)
    critical = dc.critical_E_over_p
    flags += mixture_flags(bench.composition, fill, e_over_p, critical, mx.penning_pairs(fill), mx.ASSUMPTIONS)
    V = point.voltage
    if V is None and bench.supply is not None:
        V = bench.supply.open_circuit_voltage
    alt = None
    if c.alternating:
        alt, ac_flags = ac_result(law, point, rpd, c.scale, V)
        flags += ac_flags
        band, band_source, u = _ac_band(vb, alt.regime, not fill.pure)
    else:
        band, band_source, u = _band(c, rpd, p_red, hall, weight, bool(uncovered))
    if u is None:
        flags += curve_flags(c.fitted, rpd)

    result: dict[str, Any] = {}
    strays = stray_gaps(bench, _stray_breakdown(c, point), p_eff, c.scale, vb)
    load = None
    gamma_y = y_dc if y_dc is not None else dc.y_at_minimum
    gamma = float(dc.g(gamma_y))
    if V is not None:
        E = V / point.gap
        a = law.alpha(E, p_eff * c.scale)
        eta = law.eta(E, p_eff * c.scale)
        ad, net = a * point.gap, (a - eta) * point.gap
        N = float(townsend.number_density(point.pressure, point.gas_temperature))
        swept = alt is not None and alt.upper_voltage is not None and V > alt.upper_voltage
        swept = swept and (alt.dc_like_voltage is None or V < alt.dc_like_voltage)  # no gamma strike either
        strikes = vb is not None and V >= vb and not swept
        volume = alt is not None and alt.regime in ("rf-volume", "drift-limited")
        E_shown = E if alt is None else alt.effective_field  # an alternating field: E_eff
        g_applied = float(dc.g(E / (p_eff * c.scale)))
        result = {
            "voltage": V,
            "E_over_N_Td": float(townsend.reduced_field_Td(E_shown, N)),
            "alpha": a,
            "eta": eta if dc.attaches else None,
            "alpha_d": None if volume else ad,
            "gain": None if volume else float(townsend.avalanche_gain(net)),
            "current_growth": None if volume else float(townsend.current_growth(ad, g_applied, eta * point.gap)),
            "margin": None if vb is None else V - vb,
            "margin_fraction": None if vb is None else (V - vb) / vb,
            "strikes": strikes,
        }
        if not swept:  # above the upper branch the alternating flags say why it does not strike
            flags += margin_flags(V, vb, band, law_used, u)
        if hall is None and rpd >= STREAMER_CHECK_PD and (alt is None or alt.regime == "dc-like"):
            flags += streamer_flags(V, vb, ad, rpd, weight)
        if bench.supply is not None and strikes and alt is None:
            load, glow_flags = glow_after_ignition(bench, p_eff, v_min, V)
            flags += glow_flags
    flags += stray_flags(strays, vb, V, load)
    flags += left_branch_flags(br, point, bench, pd_min, v_min, c.scale, p_eff)
    after, after_flags = afterglow_between_pulses(point, bench) if not c.alternating else (None, [])
    flags += after_flags
    target, charging, partial, reactive_flags = reactive_results(point, bench, gamma, load, c.frequency)
    flags += reactive_flags

    constants = dc.effective_constants
    return Forecast(
        gas=bench.composition,
        cathode=bench.cathode.key,
        gamma=gamma,
        gamma_range=(float(dc.at("low").g(gamma_y)), float(dc.at("high").g(gamma_y))),
        gamma_source=_gamma_source(c),
        A=constants.A if fill.pure and c.fitted is None else None,
        B=constants.B if fill.pure and c.fitted is None else None,
        constants_source=_constants_source(c, dc.ionisation_sources(y_dc if y_dc else dc.y_at_minimum)),
        pressure=point.pressure,
        gap=point.gap,
        gas_temperature=point.gas_temperature,
        reference_temperature=c.reference_temperature,
        pd=point.pressure * point.gap,
        reduced_pd=rpd,
        breakdown_voltage=vb,
        law=law_used,
        minimum_pd=pd_min / c.scale,
        minimum_reduced_pd=pd_min,
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
        composition=() if fill.pure else tuple((x.gas.key, x.fraction) for x in fill.components),
        mixing=() if fill.pure else mx.ASSUMPTIONS,
        critical_E_over_N_Td=None if critical is None else critical * TD_PER_V_PER_PA_M,
        partial_pressures=partial,
        target=target,
        charging=charging,
        alternating=alt,
        not_applicable=() if alt is None else not_applicable(alt.regime),
        flags=tuple(flags),
        **result,
    )


def _constants_source(c: Curve, law_sources: str) -> str:
    if c.fitted is None:
        return law_sources
    cv = c.fitted
    return (
        f"bench curve fitted {cv.fitted_on} from {cv.n_points} strikes: ionisation x{cv.alpha_scale:.3g}, field "
        f"x{cv.field_scale:.3g} of {law_sources}"
    )


def _gamma_source(c: Curve) -> str:
    if c.fitted is not None:
        cv = c.fitted
        return f"bench curve fitted {cv.fitted_on} from {cv.n_points} strikes"
    ys = c.dc.yields
    if len(ys) == 1:
        return ys[0].source
    return "each gas's gamma on this cathode, weighted by its share of the ionisation (ours)"


def _stray_breakdown(c: Curve, point: OperatingPoint):
    """V_b of a stray gap from its reduced pd and its length: the main law for DC, the gap's own
    alternating law for AC (the curve depends on w d)."""
    if not c.alternating:
        return lambda rpd, length: finite_or_none(c.law.voltage(rpd)[0][()])

    def alternating(rpd: float, length: float) -> float | None:
        gap_law = curve_of(c.bench, frequency=c.frequency, gap=length, temperature=point.gas_temperature).law
        return finite_or_none(gap_law.voltage(rpd)[0][()])

    return alternating
