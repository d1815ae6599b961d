"""The one entry point: ``forecast(point, bench) -> Forecast``.

It composes the formula modules into everything a technician needs to know about an
operating point, each judgement carried as a :class:`Flag` with its reason and the
method behind it. Pure: no files, clocks or I/O; SI in and out.
"""

from __future__ import annotations

import math
from dataclasses import asdict, dataclass, field
from typing import Any

import numpy as np
from scipy import constants as _c

from . import paschen, townsend
from .bench import Bench, OperatingPoint

__all__ = ["LEVELS", "Flag", "Forecast", "forecast"]

LEVELS = ("ok", "watch", "danger")
"""Flag levels, mildest first."""

_PER_CM_TORR = 1.0 / (_c.centi * _c.torr)  # 1 V/(cm Torr) in V/(Pa m)


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
                "strikes": self.strikes,
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


def forecast(point: OperatingPoint, bench: Bench) -> Forecast:
    """Forecast breakdown and its risks for ``point`` on ``bench``.

    The voltage considered is ``point.voltage``, else the bench supply's open-circuit
    voltage, else none (breakdown only).
    """
    gas = bench.gas
    c = gas.constants
    y = bench.yield_()
    gamma = y.value
    T = point.gas_temperature
    scale = c.reference_temperature / T  # reduced pd = pd * scale
    pd = point.pressure * point.gap
    rpd = pd * scale
    vb_arr, w = paschen.breakdown_voltage_with_law(rpd, c, gamma, gas.law)
    vb = _opt(vb_arr)
    weight = float(w)
    law = "paschen" if weight == 0 else ("uniform-field" if weight >= 1 else "blend")
    pd_min, v_min = paschen.minimum(c.A, c.B, gamma)
    pd0 = paschen.no_breakdown_pd(c.A, gamma)
    br = str(paschen.branch(rpd, c.A, gamma))
    e_over_p = _opt(paschen.breakdown_E_over_p(rpd, c.A, gamma, c.B))
    flags: list[Flag] = []

    if vb is None:
        flags.append(
            Flag(
                "no_breakdown",
                "watch",
                f"pd {rpd / (_c.torr * _c.centi):.3g} Torr cm is at or left of the asymptote "
                f"{pd0 / (_c.torr * _c.centi):.3g} Torr cm: no voltage breaks this gap down; "
                f"raise the pressure above {pd0 / scale / point.gap:.3g} Pa",
                "Paschen's law, Townsend criterion",
            )
        )
    elif law != "uniform-field" and e_over_p is not None and not (c.E_over_p_low <= e_over_p <= c.E_over_p_high):
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
    if gas.law is not None and weight > 0:
        x = rpd * (gas.law.reference_temperature / c.reference_temperature) / gas.law.reference_pressure
        if x > gas.law.valid_to:
            flags.append(
                Flag(
                    "outside_fitted_range",
                    "watch",
                    f"delta d = {x / _c.centi:.3g} cm is beyond the {gas.law.valid_to / _c.centi:.3g} cm "
                    "the uniform-field law is used to: breakdown voltage extrapolated",
                    gas.law.source,
                )
            )
        else:
            flags.append(
                Flag(
                    "uniform_field_law",
                    "ok",
                    f"delta d = {x / _c.centi:.3g} cm: the empirical uniform-field law for air is used "
                    f"({'blended with Paschen' if law == 'blend' else 'constant A, B over-predict here'})",
                    gas.law.source,
                )
            )

    result: dict[str, Any] = {}
    V = point.voltage
    if V is None and bench.supply is not None:
        V = bench.supply.open_circuit_voltage
    if V is not None:
        E = V / point.gap
        p_r = point.pressure * scale
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
            "strikes": strikes,
        }
        if vb is not None:
            if strikes:
                flags.append(
                    Flag(
                        "strikes",
                        "ok",
                        f"{V:.0f} V is {V - vb:.0f} V above the {vb:.0f} V breakdown voltage",
                        "Paschen's law" if law == "paschen" else "uniform-field law for air",
                    )
                )
            else:
                flags.append(
                    Flag(
                        "below_breakdown",
                        "watch",
                        f"{V:.0f} V is {vb - V:.0f} V short of the {vb:.0f} V breakdown voltage: "
                        "the gap will not strike",
                        "Paschen's law" if law == "paschen" else "uniform-field law for air",
                    )
                )

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
        minimum_pressure=pd_min / scale / point.gap,
        no_breakdown_pressure=pd0 / scale / point.gap,
        branch=br,
        breakdown_E_over_p=e_over_p,
        flags=tuple(flags),
        **result,
    )


def curve(reduced_pd: np.ndarray, bench: Bench) -> tuple[np.ndarray, np.ndarray]:
    """The bench's breakdown curve over ``reduced_pd`` (Pa m): (V_b in V, law weight)."""
    return paschen.breakdown_voltage_with_law(reduced_pd, bench.gas.constants, bench.yield_().value, bench.gas.law)
