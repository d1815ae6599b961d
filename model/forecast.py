"""The one entry point: ``forecast(point, bench) -> Forecast``.

It composes the formula modules into everything a technician needs to know about an
operating point, each judgement carried as a :class:`Flag` with its reason and the
method behind it. Pure: no files, clocks or I/O; SI in and out.
"""

from __future__ import annotations

import math
from dataclasses import asdict, dataclass, field, replace
from typing import Any

import numpy as np

from . import afterglow, glow, paschen, townsend
from . import constants as _c
from .bench import Bench, BenchCurve, OperatingPoint, Yield
from .calibration import prediction_band

__all__ = [
    "LEVELS",
    "Afterglow",
    "Flag",
    "Forecast",
    "StrayResult",
    "curve",
    "effective_pressure",
    "forecast",
    "with_bench_curve",
]

LEVELS = ("ok", "watch", "danger")
"""Flag levels, mildest first."""

_PER_CM_TORR = 1.0 / (_c.centi * _c.torr)  # 1 V/(cm Torr) in V/(Pa m)
_TORR_CM = _c.torr * _c.centi  # 1 Torr cm in Pa m

TEXTBOOK_UNCERTAINTY = 0.25
"""Relative uncertainty of V_b from tabulated constant A, B: a 10-25 % model (check-values.md)."""
MAGNETISED_UNCERTAINTY = 0.5
"""Relative uncertainty under the crossed-field approximation (our judgement: it treats the
whole gap as if it sat in the cathode's field)."""
UNIFORM_FIELD_UNCERTAINTY = 0.05
"""Relative uncertainty of the empirical uniform-field air law (a few per cent, from memory)."""
RAETHER_ALPHA_D = math.log(1e8)
"""alpha d at which an avalanche of ~1e8 electrons turns into a streamer (Raether-Meek)."""
STREAMER_PD = 200 * _TORR_CM
"""Above about 200 Torr cm breakdown proceeds by streamers, not Townsend generations
(Raizer 1991, ch. 12, from memory)."""
STREAMER_CHECK_PD = STREAMER_PD / 10
"""Below this (20 Torr cm, our choice: a tenth of the streamer regime) the Townsend picture
holds and alpha d at the applied voltage says nothing about streamers: no flag is raised."""
ARC_SPOT_CURRENT = 1.0
"""A: about the least current a metal cathode spot needs to keep an arc burning (from memory)."""
GLOW_TE_EV = 2.0
"""Electron temperature of a glow's bulk, eV (1-5 eV: common practice)."""
GLOW_TI_EV = 0.03
"""Ion temperature, eV (about room temperature: common practice)."""


@dataclass(frozen=True)
class Flag:
    """One judgement on the operating point."""

    code: str
    """Short stable identifier, e.g. "outside_fitted_range"."""
    level: str
    """"ok", "watch" or "danger"."""
    reason: str
    """One line with the numbers behind it."""
    method: str = ""
    """Where the method comes from."""


@dataclass(frozen=True)
class StrayResult:
    """One stray gap checked at the operating pressure."""

    name: str
    length: float
    """m."""
    breakdown_voltage: float | None
    """V, None where no voltage breaks it down."""
    first: bool
    """Breaks down at or below the main gap's voltage."""


@dataclass(frozen=True)
class Afterglow:
    """Free decay of the plasma by ambipolar diffusion to the chamber walls."""

    ambipolar_diffusion: float
    """D_a, m^2/s."""
    diffusion_length: float
    """Lambda, m."""
    decay_time: float
    """tau = Lambda^2 / D_a, s."""
    residual_fraction: float | None
    """exp(-t_off / tau) after the supply's off-time (None for a DC supply)."""
    off_time: float | None
    electron_temperature_eV: float
    ion_temperature_eV: float


@dataclass(frozen=True)
class Forecast:
    """What the model says about one operating point on one bench (SI units)."""

    gas: str
    cathode: str
    gamma: float
    gamma_range: tuple[float, float]
    gamma_source: str
    A: float
    B: float
    constants_source: str
    pressure: float
    gap: float
    gas_temperature: float
    reference_temperature: float
    pd: float
    reduced_pd: float
    breakdown_voltage: float | None
    law: str
    """"paschen", "uniform-field" or "blend" (the two laws mixed near their meeting point)."""
    minimum_pd: float
    minimum_voltage: float
    minimum_pressure: float
    """The pressure at which this gap sits at the minimum, Pa (at this gas temperature)."""
    no_breakdown_pressure: float
    """Below this pressure (at this gap) no voltage breaks the gap down, Pa."""
    branch: str
    breakdown_E_over_p: float | None
    voltage: float | None = None
    E_over_N_Td: float | None = None
    alpha: float | None = None
    alpha_d: float | None = None
    gain: float | None = None
    current_growth: float | None = None
    margin: float | None = None
    strikes: bool | None = None
    effective_pressure: float | None = None
    """Crossed-field effective pressure for a magnetised cathode, Pa (None: unmagnetised)."""
    hall_parameter: float | None = None
    """omega_ce / nu_m at the cathode (None: unmagnetised)."""
    breakdown_band: tuple[float | None, float | None] = (None, None)
    """V_b's plausible range (V): the gamma range and the constants' own uncertainty, or the
    bench curve's 95 % prediction band."""
    band_source: str = ""
    """What the band is made of, in words."""
    margin_fraction: float | None = None
    """(V - V_b) / V_b."""
    stray_gaps: tuple[StrayResult, ...] = ()
    load_line: glow.LoadLine | None = None
    afterglow: Afterglow | None = None
    flags: tuple[Flag, ...] = field(default_factory=tuple)

    @property
    def worst(self) -> str:
        """The most severe flag level present ("ok" when there is none)."""
        return max((f.level for f in self.flags), key=LEVELS.index, default="ok")

    def to_json(self) -> dict[str, Any]:
        """The ``strike --json`` contract: SI units, keys as in DESIGN.md."""
        out: dict[str, Any] = {
            "gas": self.gas,
            "cathode": self.cathode,
            "gamma": self.gamma,
            "gamma_range": list(self.gamma_range),
            "gamma_source": self.gamma_source,
            "constants": {
                "A_per_Pa_m": self.A,
                "B_V_per_Pa_m": self.B,
                "source": self.constants_source,
            },
            "law": self.law,
            "pressure_Pa": self.pressure,
            "gap_m": self.gap,
            "gas_temperature_K": self.gas_temperature,
            "reference_temperature_K": self.reference_temperature,
            "pd_Pa_m": self.pd,
            "reduced_pd_Pa_m": self.reduced_pd,
            "breakdown_V": self.breakdown_voltage,
            "breakdown_E_over_p_V_per_Pa_m": self.breakdown_E_over_p,
            "minimum": {
                "pd_Pa_m": self.minimum_pd,
                "voltage_V": self.minimum_voltage,
                "pressure_Pa": self.minimum_pressure,
            },
            "no_breakdown_below_Pa": self.no_breakdown_pressure,
            "branch": self.branch,
        }
        if self.voltage is not None:
            out |= {
                "voltage_V": self.voltage,
                "E_over_N_Td": self.E_over_N_Td,
                "alpha_per_m": self.alpha,
                "alpha_d": self.alpha_d,
                "gain": self.gain,
                "current_growth": self.current_growth,
                "margin_V": self.margin,
                "margin_fraction": self.margin_fraction,
                "strikes": self.strikes,
            }
        out["breakdown_band_V"] = list(self.breakdown_band)
        out["breakdown_band_source"] = self.band_source
        if self.effective_pressure is not None:
            out["magnetised"] = {
                "effective_pressure_Pa": self.effective_pressure,
                "hall_parameter": self.hall_parameter,
            }
        out["stray_gaps"] = [
            {"name": g.name, "length_m": g.length, "breakdown_V": g.breakdown_voltage, "first": g.first}
            for g in self.stray_gaps
        ]
        if self.load_line is not None:
            ll = self.load_line
            out["load_line"] = {
                "current_A": ll.current,
                "voltage_V": ll.voltage,
                "regime": ll.regime,
                "covered_fraction": ll.covered_fraction,
                "limited_by": ll.limited_by,
                "current_density_A_per_m2": ll.current_density,
                "short_circuit_current_A": ll.short_circuit_current,
            }
        if self.afterglow is not None:
            a = self.afterglow
            out["afterglow"] = {
                "ambipolar_D_m2_per_s": a.ambipolar_diffusion,
                "diffusion_length_m": a.diffusion_length,
                "decay_time_s": a.decay_time,
                "residual_fraction": a.residual_fraction,
                "off_time_s": a.off_time,
                "electron_temperature_eV": a.electron_temperature_eV,
                "ion_temperature_eV": a.ion_temperature_eV,
            }
        out["flags"] = [asdict(f) for f in self.flags]
        return _finite(out)


def _finite(x: Any) -> Any:
    """Replace non-finite floats by None so JSON never carries NaN or Infinity."""
    if isinstance(x, dict):
        return {k: _finite(v) for k, v in x.items()}
    if isinstance(x, list | tuple):
        return [_finite(v) for v in x]
    if isinstance(x, float) and not math.isfinite(x):
        return None
    return x


def _opt(x: float) -> float | None:
    x = float(x)
    return x if math.isfinite(x) else None


def law_name(weight: float) -> str:
    """Which law a V_b came from, given the uniform-field law's weight: "paschen", "blend" or
    "uniform-field"."""
    return "paschen" if weight == 0 else ("uniform-field" if weight >= 1 else "blend")


def _breakdown(rpd: float, bench: Bench, gamma: float) -> tuple[float | None, float]:
    v, w = paschen.breakdown_voltage_with_law(rpd, bench.gas.constants, gamma, bench.gas.law)
    return _opt(v), float(w)


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
    pd = point.pressure * point.gap
    rpd = p_eff * point.gap * scale
    vb, weight = _breakdown(rpd, bench, gamma)
    law = law_name(weight)
    pd_min, v_min = paschen.minimum(c.A, c.B, gamma)
    pd0 = paschen.no_breakdown_pd(c.A, gamma)
    br = str(paschen.branch(rpd, c.A, gamma))
    e_over_p = _opt(paschen.breakdown_E_over_p(rpd, c.A, gamma, c.B))
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
    flags += _validity_flags(rpd, vb, weight, e_over_p, pd0, scale, p_eff, point, bench)

    # Uncertainty band of V_b: the gamma range, widened by the constants' own uncertainty.
    if hall is not None:
        u = MAGNETISED_UNCERTAINTY
    elif weight >= 0.5:
        u = UNIFORM_FIELD_UNCERTAINTY
    else:
        u = TEXTBOOK_UNCERTAINTY
    v_lo, _ = _breakdown(rpd, bench, y.high)
    v_hi, _ = _breakdown(rpd, bench, y.low)
    band = (None if v_lo is None else v_lo * (1 - u), None if v_hi is None else v_hi * (1 + u))
    band_source = f"gamma range and +/-{u:.0%} for the constants"
    if cv is not None and weight < 0.5:
        band_source = "bench curve's 95 % prediction band"
        _v, lo_b, hi_b = prediction_band(cv, rpd)
        band = (_opt(lo_b[0]), _opt(hi_b[0]))
        u = None
        flags += _curve_flags(cv, rpd)

    result: dict[str, Any] = {}
    V = point.voltage
    if V is None and bench.supply is not None:
        V = bench.supply.open_circuit_voltage
    strays = _stray_gaps(bench, gamma, p_eff, scale, vb)
    load = None
    if V is not None:
        E = V / point.gap
        p_r = p_eff * scale
        a = float(townsend.alpha(E, p_r, c.A, c.B))
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
        flags += _margin_flags(V, vb, band, law, u)
        if hall is None and rpd >= STREAMER_CHECK_PD:
            flags += _streamer_flags(V, vb, ad, rpd, weight)
        if bench.supply is not None and strikes:
            load, glow_flags = _load_line(bench, p_eff, v_min, V)
            flags += glow_flags
    flags += _stray_flags(strays, vb, V, load)
    flags += _left_branch_flags(br, point, bench, pd_min, v_min, scale, p_eff)
    after, after_flags = _afterglow(point, bench)
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
        pd=pd,
        reduced_pd=rpd,
        breakdown_voltage=vb,
        law=law,
        minimum_pd=pd_min,
        minimum_voltage=v_min,
        minimum_pressure=pd_min / scale / point.gap * (point.pressure / p_eff),
        no_breakdown_pressure=pd0 / scale / point.gap * (point.pressure / p_eff),
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


def _validity_flags(rpd, vb, weight, e_over_p, pd0, scale, p_eff, point, bench) -> list[Flag]:
    c, law_data = bench.gas.constants, bench.gas.law
    flags: list[Flag] = []
    if vb is None:
        raise_to = pd0 / scale / point.gap * (point.pressure / p_eff)
        flags.append(
            Flag(
                "no_breakdown",
                "watch",
                f"pd {rpd / _TORR_CM:.3g} Torr cm is at or left of the asymptote {pd0 / _TORR_CM:.3g} Torr cm: "
                f"no voltage breaks this gap down; raise the pressure above {raise_to:.3g} Pa",
                "Paschen's law, Townsend criterion",
            )
        )
    elif weight < 1 and e_over_p is not None and not (c.E_over_p_low <= e_over_p <= c.E_over_p_high):
        flags.append(
            Flag(
                "outside_fitted_range",
                "watch",
                f"E/p at breakdown {e_over_p / _PER_CM_TORR:.0f} V/(cm Torr) is outside the "
                f"{c.E_over_p_low / _PER_CM_TORR:.0f}-{c.E_over_p_high / _PER_CM_TORR:.0f} V/(cm Torr) "
                "the A, B pair was fitted over: breakdown voltage extrapolated",
                c.source,
            )
        )
    if law_data is not None and weight > 0:
        x = rpd * (law_data.reference_temperature / c.reference_temperature) / law_data.reference_pressure
        if x > law_data.valid_to:
            flags.append(
                Flag(
                    "outside_fitted_range",
                    "watch",
                    f"delta d = {x / _c.centi:.3g} cm is beyond the {law_data.valid_to / _c.centi:.3g} cm "
                    "the uniform-field law is used to: breakdown voltage extrapolated",
                    law_data.source,
                )
            )
        else:
            flags.append(
                Flag(
                    "uniform_field_law",
                    "ok",
                    f"delta d = {x / _c.centi:.3g} cm: the empirical uniform-field law for air is used "
                    f"({'blended with Paschen' if weight < 1 else 'constant A, B over-predict here'})",
                    law_data.source,
                )
            )
    return flags


def _curve_flags(cv: BenchCurve, rpd: float) -> list[Flag]:
    flags = [
        Flag(
            "bench_curve",
            "ok",
            f"using this bench's curve (fitted {cv.fitted_on} to {cv.n_points} strikes, rms {cv.rms_residual:.0f} V) "
            "in place of the textbook constants",
            "least-squares fit of Paschen's law to the bench's strike marks",
        )
    ]
    if not cv.pd_low / 1.5 <= rpd <= cv.pd_high * 1.5:
        flags.append(
            Flag(
                "outside_fitted_range",
                "watch",
                f"pd {rpd:.3g} Pa m is outside the {cv.pd_low:.3g}-{cv.pd_high:.3g} Pa m the bench curve was fitted "
                "over: extrapolated; record strikes here",
                "least-squares fit of Paschen's law to the bench's strike marks",
            )
        )
    return flags


def _margin_flags(V, vb, band, law, u) -> list[Flag]:
    if vb is None:
        return []
    if u is None:
        method = "bench curve and its 95 % prediction band"
    elif law == "paschen":
        method = f"Paschen's law; V_b band from the gamma range and +/-{u:.0%} for the constants"
    else:
        method = f"uniform-field law for air, +/-{u:.0%}"
    lo, hi = band
    if V >= vb and (hi is None or V >= hi):
        return [
            Flag(
                "strikes",
                "ok",
                f"{V:.0f} V is {V - vb:.0f} V ({(V - vb) / vb:+.0%}) above the {vb:.0f} V "
                f"breakdown voltage, clear of its uncertainty band",
                method,
            )
        ]
    if lo is not None and V < lo:
        return [
            Flag(
                "below_breakdown",
                "watch",
                f"{V:.0f} V is {vb - V:.0f} V short of the {vb:.0f} V breakdown "
                "voltage, below its whole uncertainty band: the gap will not strike",
                method,
            )
        ]
    band_text = f"{'?' if lo is None else f'{lo:.0f}'}-{'?' if hi is None else f'{hi:.0f}'} V"
    verdict = "strike expected" if V >= vb else "no strike expected"
    return [
        Flag(
            "marginal",
            "watch",
            f"{V:.0f} V against a {vb:.0f} V breakdown voltage ({verdict}, margin "
            f"{V - vb:+.0f} V) sits inside the model's uncertainty band {band_text}: it may or may not strike",
            method,
        )
    ]


def _streamer_flags(V, vb, ad, rpd, weight) -> list[Flag]:
    method = "Raether-Meek criterion: an avalanche of ~1e8 electrons (alpha d ~ 18-20) becomes a streamer"
    if ad >= RAETHER_ALPHA_D:
        return [
            Flag(
                "spark",
                "danger",
                f"alpha d = {ad:.1f} at {V:.0f} V reaches the Raether-Meek threshold "
                f"{RAETHER_ALPHA_D:.1f} (gain ~1e8): a streamer forms and the gap sparks rather than glows",
                method,
            )
        ]
    if vb is not None and V >= vb and (rpd >= STREAMER_PD or weight >= 0.5):
        return [
            Flag(
                "spark",
                "danger",
                f"pd {rpd / _TORR_CM:.0f} Torr cm is in the streamer regime: breakdown "
                "here is a spark channel that a low-impedance supply turns into an arc, not a glow",
                method + "; streamer regime above ~200 Torr cm (from memory)",
            )
        ]
    if ad >= 0.75 * RAETHER_ALPHA_D:
        return [
            Flag(
                "streamer_near",
                "watch",
                f"alpha d = {ad:.1f} is within 25 % of the Raether-Meek threshold "
                f"{RAETHER_ALPHA_D:.1f}: avalanches approach streamer size",
                method,
            )
        ]
    return []


def _normal_glow_data(bench: Bench, v_min: float) -> tuple[float, float | None, float | None, str]:
    """(V_n, j_n/p^2, pd_n, source) for the bench's gas-cathode pair."""
    row = bench.cathode.normal_glow.get(bench.gas.key)
    if row is None:
        return v_min, None, None, "V_n taken as the Paschen minimum V_min, no normal-glow data for this pair"
    return row.cathode_fall, row.current_density_per_p2, row.pd_n, row.source


def _load_line(bench, p_eff, v_min, V) -> tuple[glow.LoadLine, list[Flag]]:
    s = bench.supply
    v_n, j_p2, _pdn, source = _normal_glow_data(bench, v_min)
    j_n = None if j_p2 is None else glow.normal_current_density(j_p2, p_eff)
    ll = glow.load_line(V, s.ballast, s.current_limit, v_n, j_n, bench.cathode_area)
    method = (
        f"load line V0 - I R against the glow curve: normal glow at V_n = {v_n:.0f} V ({source}), "
        f"abnormal glow V_n (j/j_n)^(1/{glow.ABNORMAL_EXPONENT:g}) (our assumption); cathode fall only"
    )
    flags: list[Flag] = []
    if ll.limited_by == "nothing":
        flags.append(
            Flag(
                "unlimited_current",
                "danger",
                "no ballast resistor and no current limit: nothing holds "
                "the current after ignition, so the glow runs away into an arc",
                method,
            )
        )
        return ll, flags
    amps = f"{_amps(ll.current)} at {ll.voltage:.0f} V"
    if ll.regime == "arc_risk":
        flags.append(
            Flag(
                "glow_to_arc",
                "danger",
                f"{amps}: {ll.current_density / 1e4:.3g} A/cm^2 on the cathode "
                f"approaches the {glow.ARC_CURRENT_DENSITY / 1e4:g} A/cm^2 where glows turn into arcs",
                method,
            )
        )
    elif ll.regime == "townsend_dark":
        flags.append(
            Flag(
                "dark_discharge",
                "watch",
                f"{amps}: below {glow.TOWNSEND_DARK_MAX_CURRENT * 1e6:g} uA the "
                "discharge stays dark (Townsend); lower the ballast to reach a glow",
                method,
            )
        )
    else:
        cover = "" if ll.covered_fraction is None else f", glow covers {ll.covered_fraction:.0%} of the cathode"
        flags.append(
            Flag(
                "glow_regime",
                "ok",
                f"{amps}: {ll.regime.replace('_', ' ')}{cover}, limited by the {ll.limited_by.replace('_', ' ')}",
                method,
            )
        )
    if ll.short_circuit_current is not None and ll.short_circuit_current >= ARC_SPOT_CURRENT:
        flags.append(
            Flag(
                "arc_sustainable",
                "watch",
                f"the supply can drive {ll.short_circuit_current:.3g} A into a "
                f"short, above the ~{ARC_SPOT_CURRENT:g} A a cathode spot needs: an arc, once started, "
                "can keep burning; use arc detection or a faster current limit",
                "cathode-spot threshold current of metals (from memory)",
            )
        )
    return ll, flags


def _amps(i: float) -> str:
    return f"{i:.3g} A" if i >= 1 else f"{i * 1e3:.3g} mA"


def _stray_gaps(bench, gamma, p_eff, scale, vb) -> tuple[StrayResult, ...]:
    out = []
    for g in bench.stray_gaps:
        v, _w = _breakdown(p_eff * g.length * scale, bench, gamma)
        first = v is not None and (vb is None or v <= vb)
        out.append(StrayResult(g.name, g.length, v, first))
    return tuple(out)


def _stray_flags(strays, vb, V, load) -> list[Flag]:
    method = "Paschen's law at each gap's own pd"
    flags: list[Flag] = []
    running = load.voltage if load is not None else V
    for g in strays:
        where = f"{g.name} ({g.length * 1e3:.3g} mm)"
        if g.first:
            main = "the main gap cannot break down at all" if vb is None else f"the main gap's {vb:.0f} V"
            reach = "" if V is None else (" and the supply reaches it" if V >= g.breakdown_voltage else "")
            flags.append(
                Flag(
                    "stray_gap_first",
                    "danger",
                    f"{where} breaks down at {g.breakdown_voltage:.0f} V, at "
                    f"or below {main}{reach}: the discharge would start there",
                    method,
                )
            )
        elif g.breakdown_voltage is not None and running is not None and running >= g.breakdown_voltage:
            flags.append(
                Flag(
                    "stray_gap_may_strike",
                    "watch",
                    f"{where} breaks down at {g.breakdown_voltage:.0f} V, "
                    f"within the {running:.0f} V across it while the glow runs",
                    method,
                )
            )
    if strays and not flags:
        names = ", ".join(g.name for g in strays)
        flags.append(
            Flag(
                "stray_gaps_hold",
                "ok",
                f"no stray gap ({names}) breaks down below the main gap or the running voltage",
                method,
            )
        )
    return flags


def _left_branch_flags(br, point, bench, pd_min, v_min, scale, p_eff) -> list[Flag]:
    if br != "left":
        return []
    l_min = pd_min / scale / p_eff  # the length that sits at the minimum at this pressure
    chamber = ""
    if bench.chamber is not None and max(bench.chamber.radius, bench.chamber.length / 2) > point.gap:
        chamber = f"; the chamber ({bench.chamber.radius * 1e3:.0f} mm radius) holds such paths"
    return [
        Flag(
            "left_branch_longer_paths",
            "watch",
            f"the main gap ({point.gap * 1e3:.3g} mm) is left of the "
            f"minimum: longer paths at cathode potential, up to {l_min * 1e3:.3g} mm, break down at lower "
            f"voltage (down to {v_min:.0f} V){chamber}; shield the back and sides of the cathode",
            "Paschen's law, left branch",
        )
    ]


def _afterglow(point, bench) -> tuple[Afterglow | None, list[Flag]]:
    if bench.chamber is None:
        return None, []
    gas = bench.gas
    mu = afterglow.ion_mobility(gas.ion_mobility, point.pressure, point.gas_temperature)
    D_a = afterglow.ambipolar_diffusion(mu, GLOW_TE_EV, GLOW_TI_EV)
    lam = afterglow.cylinder_diffusion_length(bench.chamber.radius, bench.chamber.length)
    tau = afterglow.decay_time(lam, D_a)
    s = bench.supply
    off = s.off_time if s is not None and s.mode == "pulsed" else None
    resid = None if off is None else afterglow.residual_fraction(off, tau)
    result = Afterglow(D_a, lam, tau, resid, off, GLOW_TE_EV, GLOW_TI_EV)
    flags: list[Flag] = []
    method = (
        f"ambipolar diffusion D_a = mu_i k (T_e + T_i)/e at T_e {GLOW_TE_EV:g} eV, T_i {GLOW_TI_EV:g} eV "
        f"({gas.ion_mobility_source}); cylinder diffusion length"
    )
    if resid is not None:
        if resid >= 0.1:
            flags.append(
                Flag(
                    "afterglow_carries_over",
                    "ok",
                    f"decay time {tau * 1e6:.3g} us against a "
                    f"{off * 1e6:.3g} us off-time: {resid:.0%} of the charge is left, so each pulse "
                    "re-ignites easily",
                    method,
                )
            )
        else:
            flags.append(
                Flag(
                    "afterglow_lost",
                    "watch",
                    f"decay time {tau * 1e6:.3g} us against a {off * 1e6:.3g} us "
                    f"off-time: only {resid:.1%} of the charge is left, so each pulse must break the gap "
                    "down afresh (expect ignition delay and jitter)",
                    method,
                )
            )
    return result, flags


def curve(reduced_pd: np.ndarray, bench: Bench) -> tuple[np.ndarray, np.ndarray]:
    """The bench's breakdown curve over ``reduced_pd`` (Pa m): (V_b in V, law weight).

    Like :func:`forecast`, it uses a bench curve fitted for this gas and cathode where the
    bench has one; pass ``replace(bench, curve=None)`` for the textbook curve.
    """
    bench, _cv = with_bench_curve(bench)
    return paschen.breakdown_voltage_with_law(reduced_pd, bench.gas.constants, bench.yield_().value, bench.gas.law)
