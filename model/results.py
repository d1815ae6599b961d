"""What a forecast returns: flags, stray-gap and afterglow results, the Forecast and its JSON.

Plain frozen data in SI units; :mod:`strikeline.model.forecast` fills them in.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from .glow import LoadLine

from .sentence import Flag

__all__ = [
    "LEVELS",
    "Afterglow",
    "Alternating",
    "Charging",
    "Forecast",
    "StrayResult",
    "TargetMode",
    "finite_or_none",
    "json_safe",
]

LEVELS = ("ok", "watch", "danger")
"""Flag levels, mildest first."""


@dataclass(frozen=True)
class TargetMode:
    """Where a reactive process stands, from its gas balance."""

    reactive: tuple[str, ...]
    """The reactive gases let in."""
    expected: float
    """Their partial pressure if nothing consumed them, sum of Q/S, Pa."""
    measured: float
    """Their partial pressure now: total pressure minus the inert gases' Q/S, Pa."""
    consumed: float
    """Fraction of the reactive gas the target takes, 0 to 1."""
    mode: str
    """"metal", "transition", "poisoned"; "unclear" when the gauge and the flows disagree, "unresolved"
    when the reactive gas is too small a share of the pressure to judge."""
    inert: float = 0.0
    """The inert gases' partial pressure Q/S, Pa."""


@dataclass(frozen=True)
class Charging:
    """How fast a film on the target charges to breakdown, and whether the supply lets it."""

    film: str
    current_density: float
    """Ion current density on the film, A/m^2."""
    time: float
    """Shortest charging time (the film's low eps_r and strength), s."""
    on_time: float | None
    """The supply's on-time per pulse, s (None: DC, always on)."""


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
class Alternating:
    """What an alternating (AC or RF) supply adds: the regime, both branches, the swings. Voltages
    are amplitudes (peak) across the gap; rms = peak / sqrt(2), peak-to-peak = 2 peak."""

    frequency: float
    """Hz."""
    regime: str
    """One of :data:`strikeline.model.alternating.REGIMES`."""
    volume_voltage: float | None
    """The volume (diffusion-controlled) breakdown's lower branch here, V (None: none at this pd)."""
    upper_voltage: float | None
    """The upper branch, V: above it electrons are swept onto the electrodes (None: single-valued)."""
    dc_like_voltage: float | None
    """The DC (gamma) mechanism with gamma reduced by the ions' reach, V."""
    dc_voltage: float | None
    """The plain DC breakdown voltage of the same gap, V (for comparison)."""
    turning_reduced_pd: float | None
    """Reduced pd of the turning point, Pa m (None: no volume breakdown at this frequency and gap)."""
    turning_pd: float | None
    """The turning point's actual pd at the gas temperature, Pa m."""
    turning_pressure: float | None
    """The pressure of the turning point at this gap, Pa."""
    turning_voltage: float | None
    ion_swing_ratio: float | None
    """2 a_i / d at the DC breakdown voltage: 1 and above, the ions cross within a half period."""
    electron_swing: float | None = None
    """Electron oscillation amplitude at the applied voltage, m."""
    effective_field: float | None = None
    """E_eff at the applied voltage, V/m."""


@dataclass(frozen=True)
class Forecast:
    """What the model says about one operating point on one bench (SI units)."""

    gas: str
    cathode: str
    gamma: float
    gamma_range: tuple[float, float]
    gamma_source: str
    A: float | None
    """Townsend's A, 1/(Pa m) (None for a mixture: no single pair describes it)."""
    B: float | None
    """Townsend's B, V/(Pa m) (None for a mixture)."""
    constants_source: str
    pressure: float
    gap: float
    gas_temperature: float
    reference_temperature: float
    pd: float
    reduced_pd: float
    breakdown_voltage: float | None
    law: str
    """"paschen", "uniform-field", "blend" (the two laws mixed near their meeting point), "mixture"
    (Townsend's criterion with attachment, for a mixture or an attaching gas) or "alternating" (an
    AC or RF voltage, :mod:`.alternating`)."""
    minimum_pd: float
    """The minimum's actual pd at this gas temperature, Pa m."""
    minimum_reduced_pd: float
    """The same, reduced to the data's reference density, Pa m."""
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
    eta: float | None = None
    """Attachment coefficient at the applied field, 1/m (None: the gas does not attach)."""
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
    load_line: LoadLine | None = None
    afterglow: Afterglow | None = None
    composition: tuple[tuple[str, float], ...] = ()
    """The mixture solved, (gas, mole fraction) largest first (empty: a pure gas, Paschen's law)."""
    mixing: tuple[str, ...] = ()
    """The mixing rules assumed, in words (empty: none)."""
    critical_E_over_N_Td: float | None = None
    """E/N where alpha = eta, Td (None: nothing attaches)."""
    partial_pressures: tuple[tuple[str, float], ...] = ()
    """Each flowing gas's expected partial pressure, flow / pumping speed, Pa (empty: flows or speed unknown)."""
    target: TargetMode | None = None
    charging: Charging | None = None
    alternating: Alternating | None = None
    not_applicable: tuple[tuple[str, str], ...] = ()
    """(what, why) of the results that do not hold for this supply (an RF discharge has no load line)."""
    flags: tuple[Flag, ...] = field(default_factory=tuple)

    @property
    def worst(self) -> str:
        """The most severe flag level present ("ok" when there is none)."""
        return max((f.level for f in self.flags), key=LEVELS.index, default="ok")

    def to_json(self) -> dict[str, Any]:
        """The ``strike --json`` contract: SI units, keys as in ARCHITECTURE.md."""
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
            "composition": [{"gas": g, "fraction": x} for g, x in self.composition],
            "mixing": list(self.mixing),
            "critical_E_over_N_Td": self.critical_E_over_N_Td,
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
                "reduced_pd_Pa_m": self.minimum_reduced_pd,
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
                "eta_per_m": self.eta,
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
        if self.partial_pressures:
            out["expected_partial_pressures_Pa"] = dict(self.partial_pressures)
        if self.target is not None:
            t = self.target
            out["target"] = {
                "reactive": list(t.reactive),
                "expected_Pa": t.expected,
                "measured_Pa": t.measured,
                "consumed_fraction": t.consumed,
                "mode": t.mode,
            }
        if self.charging is not None:
            c = self.charging
            out["charging"] = {
                "film": c.film,
                "ion_current_density_A_per_m2": c.current_density,
                "time_s": c.time,
                "on_time_s": c.on_time,
            }
        if self.alternating is not None:
            out["alternating"] = {
                "frequency_Hz": self.alternating.frequency,
                "voltages_are": "amplitude (peak) across the gap; rms = peak/sqrt(2), peak-to-peak = 2 peak",
                **{
                    name: getattr(self.alternating, key)
                    for name, key in (
                        ("regime", "regime"),
                        ("volume_breakdown_V", "volume_voltage"),
                        ("upper_branch_V", "upper_voltage"),
                        ("dc_like_breakdown_V", "dc_like_voltage"),
                        ("dc_breakdown_V", "dc_voltage"),
                        ("turning_pd_Pa_m", "turning_pd"),
                        ("turning_reduced_pd_Pa_m", "turning_reduced_pd"),
                        ("turning_pressure_Pa", "turning_pressure"),
                        ("turning_V", "turning_voltage"),
                        ("ion_swing_ratio", "ion_swing_ratio"),
                        ("electron_swing_m", "electron_swing"),
                        ("effective_field_V_per_m", "effective_field"),
                    )
                },
            }
        out["not_applicable"] = [{"what": w, "why": why} for w, why in self.not_applicable]
        out["flags"] = [f.to_json() for f in self.flags]
        return json_safe(out)


def json_safe(x: Any) -> Any:
    """``x`` with every non-finite float replaced by None, so JSON never carries NaN or Infinity.

    >>> json_safe({"a": [1.0, float("nan")], "b": float("inf")})
    {'a': [1.0, None], 'b': None}
    """
    if isinstance(x, dict):
        return {k: json_safe(v) for k, v in x.items()}
    if isinstance(x, list | tuple):
        return [json_safe(v) for v in x]
    if isinstance(x, float) and not math.isfinite(x):
        return None
    return x


def finite_or_none(x: float) -> float | None:
    """``x`` as a float, or None where it is NaN or infinite (a missing result, never a number).

    >>> finite_or_none(2), finite_or_none(float("nan"))
    (2.0, None)
    """
    x = float(x)
    return x if math.isfinite(x) else None
