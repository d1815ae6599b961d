"""What the model knows about a bench: what is in the chamber, its cathode, supply, gaps, chamber, its
fitted curve, and the operating point. SI, frozen.

These are plain data. :mod:`strikeline.profiles` builds them from TOML files; the model never reads a
file itself. Gases and cathodes are :mod:`.gas`'s, a fill is a :class:`~.composition.Composition`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .composition import Composition
from .gas import Cathode, Film, Gas
from .secondary import Yield

__all__ = [
    "Bench",
    "BenchCurve",
    "Chamber",
    "OperatingPoint",
    "StrayGap",
    "Supply",
]


@dataclass(frozen=True)
class Supply:
    """The high-voltage supply as the forecast sees it (it never drives it)."""

    open_circuit_voltage: float
    """V."""
    current_limit: float | None = None
    """A; None where the supply has no limit worth the name."""
    ballast: float = 0.0
    """Series (ballast) resistance between supply and cathode, ohm."""
    mode: str = "dc"
    """"dc", "pulsed" or "ac" (any alternating supply: mid-frequency AC or RF). For "ac" the
    open-circuit voltage is the amplitude (peak) across the electrodes."""
    frequency: float | None = None
    """Pulse repetition frequency (pulsed) or the frequency of the alternating voltage (ac), Hz."""
    off_time: float | None = None
    """Time between pulses with the voltage off, s (pulsed only)."""


@dataclass(frozen=True)
class StrayGap:
    """A gap at cathode potential other than the main one (shield, feedthrough, clamp)."""

    name: str
    length: float
    """m."""


@dataclass(frozen=True)
class Chamber:
    """The plasma volume as a finite cylinder, for diffusion loss."""

    radius: float
    """m."""
    length: float
    """m."""


@dataclass(frozen=True)
class BenchCurve:
    """A breakdown curve fitted to this bench's recorded strikes: the fill's own law with its ionisation
    scaled by ``alpha_scale`` (A), its field axis by ``field_scale`` (B) and its gamma by ``gamma_scale``
    (or, for a curve an earlier version fitted, Paschen's closed form with the constants in ``base``)."""

    alpha_scale: float
    field_scale: float
    gamma_scale: float
    covariance: tuple[tuple[float, float, float], ...]
    """Covariance of (ln alpha_scale, ln field_scale, ln gamma_scale)."""
    rms_residual: float
    """RMS of the fit residuals, V."""
    n_points: int
    pd_low: float
    """Smallest reduced pd among the fitted points, Pa m."""
    pd_high: float
    gas: str
    """The composition key of the fill it was fitted in."""
    cathode: str
    fitted_on: str
    """ISO date of the fit."""
    residual_scale: float = 0.0
    """Scatter of single strikes about the curve, in ln V (a fraction)."""
    t_quantile: float = 1.96
    """Student-t quantile of the stated prediction band (95 %)."""
    free: tuple[str, ...] = ("A", "B")
    """Which of A (alpha scale), B (field scale), gamma were fitted."""
    marks: tuple[tuple[float, float], ...] = ()
    """The strikes it was fitted to: (reduced pd in Pa m, V)."""
    base: tuple[float, float, float] | None = None
    """(A in 1/(Pa m), B in V/(Pa m), gamma): the curve is Paschen's closed form with these constants
    times the scales (a [curve] section of an earlier version); None: the fill's own law."""

    @property
    def sigmas(self) -> tuple[float, float, float]:
        """Relative standard deviations of the three scales (sqrt of the covariance's diagonal)."""
        return tuple(math.sqrt(max(self.covariance[i][i], 0.0)) for i in range(3))  # type: ignore[return-value]


@dataclass(frozen=True)
class Bench:
    """One bench: what is in the chamber, its cathode, gaps, supply and chamber."""

    name: str
    fill: Composition
    """The gas or mixture in the chamber."""
    cathode: Cathode
    gap: float
    """Main electrode gap, m."""
    gas_temperature: float = 293.15
    """K."""
    gamma: float | None = None
    """A constant gamma for every gas of the fill, set by hand (None: the yield model's)."""
    gamma_model: str = "technical"
    """Which yields: "technical" (chosen from measured breakdown) or "clean-metal" (:mod:`.secondary`)."""
    supply: Supply | None = None
    cathode_area: float | None = None
    """m^2."""
    electrode_radius: float | None = None
    """Radius of the electrodes, m (RF diffusion length); None: from the cathode area."""
    magnetic_field: float | None = None
    """Field at the cathode surface, T (magnetron); None for an unmagnetised cathode."""
    stray_gaps: tuple[StrayGap, ...] = ()
    chamber: Chamber | None = None
    curve: BenchCurve | None = None
    pressure: float | None = None
    """A starting pressure (Pa) for manual use, None if the profile gives none."""
    pumping_speed: float | None = None
    """Pumping speed at the chamber, m^3/s, for the expected partial pressures flow / speed."""
    film: Film | None = None
    """The film a reactive process grows on the target (for charging arcs)."""
    racetrack_fraction: float = 1.0
    """Share of the cathode area that carries the discharge current (a magnetron's race track)."""

    @property
    def composition(self) -> str:
        """The fill as text ("argon" or "argon:80,oxygen:20")."""
        return self.fill.key

    def yield_for(self, gas: Gas) -> Yield:
        """The gamma in force for ``gas`` on this bench's cathode: a value set by hand, else the yield
        model's."""
        if self.gamma is not None:
            return Yield(self.gamma, self.gamma, self.gamma, "bench profile")
        return self.cathode.yield_for(gas, self.gamma_model)

    @property
    def radius(self) -> float | None:
        """The electrodes' radius, m: as given, else from the cathode area (a disc), else None."""
        if self.electrode_radius is not None:
            return self.electrode_radius
        return None if self.cathode_area is None else math.sqrt(self.cathode_area / math.pi)


@dataclass(frozen=True)
class OperatingPoint:
    """Where the bench sits: true (gas-corrected) pressure, gap and applied voltage."""

    pressure: float
    """Pa."""
    gap: float
    """m."""
    voltage: float | None = None
    """Applied or available voltage, V (None: breakdown only)."""
    gas_temperature: float = 293.15
    """K."""
    flows: tuple[tuple[Gas, float], ...] = ()
    """Gas flows, Pa m^3/s (for the expected partial pressures and the target mode)."""
    current: float | None = None
    """Measured discharge current, A (None: the load line's is used)."""
    frequency: float | None = None
    """Frequency of an alternating applied voltage, Hz (None: the supply's if it is AC, else DC). With
    a frequency, ``voltage`` is the amplitude (peak) across the electrodes."""
