"""The one entry point: ``forecast(point, bench) -> Forecast``, and the bench's breakdown curve.

It composes the formula modules into everything a technician needs to know about an
operating point: breakdown and its uncertainty band, avalanche, margin, stray gaps, the glow
after ignition, the afterglow, each judgement carried as a :class:`Flag` with its reason and
the method behind it (:mod:`.flags`, :mod:`.regime`, :mod:`.stray`, :mod:`.afterglow`).
Pure: no files, clocks or I/O; SI in and out.
"""

from __future__ import annotations

from dataclasses import replace
from typing import Any

import numpy as np

from . import constants as _c
from . import paschen, townsend
from .afterglow import afterglow_between_pulses
from .bench import Bench, BenchCurve, OperatingPoint, Yield
from .calibration import prediction_band
from .flags import RAETHER_ALPHA_D, STREAMER_CHECK_PD, curve_flags, margin_flags, streamer_flags, validity_flags
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
    "curve",
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
    """Which law a V_b came from, given the uniform-field law's weight: "paschen", "blend" or
    "uniform-field".

    >>> law_name(0.0), law_name(0.3), law_name(1.0)
    ('paschen', 'blend', 'uniform-field')
    """
    return "paschen" if weight == 0 else ("uniform-field" if weight >= 1 else "blend")


def _breakdown(rpd: float, bench: Bench, gamma: float) -> tuple[float | None, float]:
    v, w = paschen.breakdown_voltage_with_law(rpd, bench.gas.constants, gamma, bench.gas.law)
    return finite_or_none(v), float(w)


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
    nu = bench.gas.electron_collision_per_Pa * p * bench.gas.constants.reference_temperature / T
    hall = omega / nu
    p_eff = p * np.sqrt(1.0 + hall * hall)
    return (float(p_eff), float(hall)) if p_eff.ndim == 0 else (p_eff, hall)


def with_bench_curve(bench: Bench) -> tuple[Bench, BenchCurve | None]:
    """The bench with its fitted curve's A, B, gamma in place of the textbook ones, where the
    curve was fitted for this gas and cathode."""
    cv = bench.curve
    if cv is None or cv.gas != bench.gas.key or cv.cathode != bench.cathode.key:
        return bench, None
    source = f"bench curve fitted {cv.fitted_on} from {cv.n_points} strikes (rms {cv.rms_residual:.0f} V)"
    c = replace(bench.gas.constants, A=cv.A, B=cv.B, source=source)
    return replace(bench, gas=replace(bench.gas, constants=c), gamma=cv.gamma), cv


def _band(rpd, bench, y, hall, weight, cv) -> tuple[tuple[float | None, float | None], str, float | None]:
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
    v_lo, _ = _breakdown(rpd, bench, y.high)
    v_hi, _ = _breakdown(rpd, bench, y.low)
    band = (None if v_lo is None else v_lo * (1 - u), None if v_hi is None else v_hi * (1 + u))
    return band, f"gamma range and +/-{u:.0%} for the constants", u


def forecast(point: OperatingPoint, bench: Bench) -> Forecast:
    """Forecast breakdown and its risks for ``point`` on ``bench``.

    The voltage considered is ``point.voltage``, else the bench supply's open-circuit
    voltage, else none (breakdown only). A bench curve fitted for this gas and cathode
    replaces the textbook constants, and its prediction band replaces their uncertainty.
    """
    bench, cv = with_bench_curve(bench)
    gas = bench.gas
    c = gas.constants
    y = bench.yield_()
    if cv is not None:
        spread = cv.t_quantile * cv.gamma_sigma
        y = Yield(cv.gamma, max(cv.gamma - spread, 1e-6), min(cv.gamma + spread, 1.0), c.source)
    gamma = y.value
    T = point.gas_temperature
    scale = c.reference_temperature / T  # reduced pd = pd * scale
    p_eff, hall = effective_pressure(point.pressure, T, bench)
    to_pressure = 1.0 / scale / point.gap * (point.pressure / p_eff)  # reduced pd -> pressure at this gap
    rpd = p_eff * point.gap * scale
    vb, weight = _breakdown(rpd, bench, gamma)
    law = law_name(weight)
    pd_min, v_min = paschen.minimum(c.A, c.B, gamma)
    pd0 = paschen.no_breakdown_pd(c.A, gamma)
    br = str(paschen.branch(rpd, c.A, gamma))
    e_over_p = finite_or_none(paschen.breakdown_E_over_p(rpd, c.A, gamma, c.B))
    flags: list[Flag] = []
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
    # A bench curve has its own fitted range (curve_flags); the textbook E/p range says nothing of it.
    flags += validity_flags(rpd, vb, weight, None if cv else e_over_p, pd0 * to_pressure, pd0, c, gas.law)
    band, band_source, u = _band(rpd, bench, y, hall, weight, cv)
    if u is None:
        flags += curve_flags(cv, rpd)

    result: dict[str, Any] = {}
    V = point.voltage
    if V is None and bench.supply is not None:
        V = bench.supply.open_circuit_voltage
    strays = stray_gaps(bench, lambda x: _breakdown(x, bench, gamma)[0], p_eff, scale, vb)
    load = None
    if V is not None:
        E = V / point.gap
        a = float(townsend.alpha(E, p_eff * scale, c.A, c.B))
        ad = a * point.gap
        N = float(townsend.number_density(point.pressure, T))
        strikes = vb is not None and V >= vb
        result = {
            "voltage": V,
            "E_over_N_Td": float(townsend.reduced_field_Td(E, N)),
            "alpha": a,
            "alpha_d": ad,
            "gain": float(townsend.avalanche_gain(ad)),
            "current_growth": float(townsend.current_growth(ad, gamma)),
            "margin": None if vb is None else V - vb,
            "margin_fraction": None if vb is None else (V - vb) / vb,
            "strikes": strikes,
        }
        flags += margin_flags(V, vb, band, law, u)
        if hall is None and rpd >= STREAMER_CHECK_PD:
            flags += streamer_flags(V, vb, ad, rpd, weight)
        if bench.supply is not None and strikes:
            load, glow_flags = glow_after_ignition(bench, p_eff, v_min, V)
            flags += glow_flags
    flags += stray_flags(strays, vb, V, load)
    flags += left_branch_flags(br, point, bench, pd_min, v_min, scale, p_eff)
    after, after_flags = afterglow_between_pulses(point, bench)
    flags += after_flags

    return Forecast(
        gas=gas.key,
        cathode=bench.cathode.key,
        gamma=gamma,
        gamma_range=(y.low, y.high),
        gamma_source=y.source,
        A=c.A,
        B=c.B,
        constants_source=c.source,
        pressure=point.pressure,
        gap=point.gap,
        gas_temperature=T,
        reference_temperature=c.reference_temperature,
        pd=point.pressure * point.gap,
        reduced_pd=rpd,
        breakdown_voltage=vb,
        law=law,
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
        flags=tuple(flags),
        **result,
    )


def curve(reduced_pd: np.ndarray, bench: Bench) -> tuple[np.ndarray, np.ndarray]:
    """The bench's breakdown curve over ``reduced_pd`` (Pa m): (V_b in V, law weight).

    Like :func:`forecast`, it uses a bench curve fitted for this gas and cathode where the
    bench has one; pass ``replace(bench, curve=None)`` for the textbook curve.
    """
    bench, _cv = with_bench_curve(bench)
    return paschen.breakdown_voltage_with_law(reduced_pd, bench.gas.constants, bench.yield_().value, bench.gas.law)
