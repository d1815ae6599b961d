"""What the model knows about a bench: gas, cathode, supply, gaps, chamber. SI, frozen.

These are plain data. :mod:`strikeline.profiles` builds them from TOML files; the
model never reads a file itself.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field

__all__ = [
    "Attachment",
    "Component",
    "Film",
    "Mixture",
    "TownsendConstants",
    "UniformFieldLaw",
    "Bench",
    "BenchCurve",
    "Cathode",
    "Chamber",
    "Gas",
    "NormalGlow",
    "OperatingPoint",
    "StrayGap",
    "Supply",
    "Yield",
    "secondary_yield_estimate",
]


@dataclass(frozen=True)
class TownsendConstants:
    """A published (or fitted) pair A, B for alpha/p = A exp(-B p/E), in SI."""

    A: float
    """Saturation ionisation coefficient per unit pressure, 1/(Pa m)."""
    B: float
    """Characteristic reduced field, V/(Pa m)."""
    E_over_p_low: float
    """Lower end of the E/p range the pair was fitted over, V/(Pa m)."""
    E_over_p_high: float
    """Upper end of that range, V/(Pa m)."""
    reference_temperature: float
    """Gas temperature, K, at which the tabulated pressures are taken."""
    source: str
    """Where the pair comes from."""


@dataclass(frozen=True)
class UniformFieldLaw:
    """Empirical uniform-field breakdown law for air at high pd.

    V_b = a x + b sqrt(x), x = delta d, delta = (p / p_ref)(T_ref / T)

    With a = 24.22 kV/cm and b = 6.08 kV/cm^0.5 (as usually credited to Kuffel &
    Zaengl, *High Voltage Engineering Fundamentals*). Constant-A, B Paschen curves
    over-predict air breakdown here. Between ``blend_from`` and ``blend_to`` (in x)
    the result moves smoothly from the Paschen value to this law.
    """

    a: float
    """Linear coefficient, V/m."""
    b: float
    """Square-root coefficient, V/m^0.5."""
    reference_pressure: float
    """p_ref of delta, Pa."""
    reference_temperature: float
    """T_ref of delta, K."""
    blend_from: float
    """x (m) below which the Paschen law alone is used."""
    blend_to: float
    """x (m) above which this law alone is used."""
    valid_to: float
    """x (m) beyond which the law itself is not supported."""
    source: str


@dataclass(frozen=True)
class Attachment:
    """Electron attachment of an electronegative gas, eta/p = k1 (E/p) + k0, in two E/p branches.

    SI: eta/p in 1/(Pa m), E/p in V/(Pa m), k1 in 1/V, k0 in 1/(Pa m). Below ``switch`` the low
    branch applies; eta is never negative, and above ``valid_high`` it is held at its value there
    (the fit says nothing beyond its range).
    """

    k1_high: float
    k0_high: float
    k1_low: float
    k0_low: float
    switch: float
    """E/p (V/(Pa m)) where the branches meet."""
    valid_low: float
    valid_high: float
    """E/p range of the fit, V/(Pa m)."""
    source: str


def secondary_yield_estimate(ionisation_energy: float, work_function: float) -> float:
    """Clean-metal estimate of the ion-induced electron yield, gamma ~ 0.016 (E_iz - 2 phi).

    Energies in eV; returns gamma (dimensionless), never below zero. Good for noble-gas
    ions on clean metals at low energy; real, oxidised cathodes differ (Baragiola et al.,
    Surf. Sci. 1979, from memory).

    >>> round(secondary_yield_estimate(24.59, 4.55), 3)   # He+ on tungsten
    0.248
    """
    return max(0.016 * (ionisation_energy - 2.0 * work_function), 0.0)


@dataclass(frozen=True)
class Gas:
    """A working gas and the data the model uses for it."""

    key: str
    """Canonical name, e.g. "argon"."""
    symbol: str
    """Chemical symbol or short name, e.g. "Ar"."""
    constants: TownsendConstants
    law: UniformFieldLaw | None
    """High-pd empirical law where one is known (air)."""
    ionisation_energy: float
    """First ionisation energy, eV."""
    molar_mass: float
    """kg/mol."""
    ion_mobility: float
    """Reduced mobility K0 of the gas's own ion at 273.15 K, 101325 Pa, m^2/(V s)."""
    ion_mobility_source: str
    electron_collision_per_Pa: float
    """Electron momentum-transfer collision frequency per pressure, nu_m/p, 1/(s Pa)."""
    noble: bool
    low_field: TownsendConstants | None = None
    """A second A, B pair that applies below ``constants.E_over_p_low`` (a two-branch fit)."""
    attachment: Attachment | None = None
    """Electron attachment, for an electronegative gas (None: none)."""
    metastable_energy: float | None = None
    """Lowest metastable level, eV (noble gases: the energy that makes Penning mixtures)."""
    reactive: bool = False
    """Reacts with a sputter target to form a film (oxygen, nitrogen)."""
    electron_mobility_p: float | None = None
    """Reduced electron mobility mu_e p, m^2 Pa/(V s), at the fields of RF breakdown."""
    characteristic_energy: float | None = None
    """D_e/mu_e of the electrons, V (eV per unit charge), at those fields."""


@dataclass(frozen=True)
class Component:
    """One gas of a mixture and its mole fraction."""

    gas: Gas
    fraction: float


@dataclass(frozen=True)
class Mixture:
    """A gas mixture: components with mole fractions that add up to 1, largest first.

    A one-component mixture is never built: a pure gas is just its :class:`Gas` (so it keeps its
    own numbers exactly).
    """

    components: tuple[Component, ...]

    @property
    def key(self) -> str:
        """The composition as text, e.g. "argon:80,oxygen:20" (percent, largest first)."""
        return ",".join(f"{c.gas.key}:{_percent(c.fraction)}" for c in self.components)

    @property
    def main(self) -> Gas:
        """The largest component."""
        return self.components[0].gas


def _percent(x: float) -> str:
    return f"{100 * x:.4g}"


@dataclass(frozen=True)
class Film:
    """An insulating film a reactive process grows on the target (oxide, nitride)."""

    name: str
    eps_r: tuple[float, float]
    """Relative permittivity, thin film (low, high)."""
    strength: tuple[float, float]
    """Dielectric strength, thin film, V/m (low, high)."""
    source: str


@dataclass(frozen=True)
class Yield:
    """A secondary-electron yield gamma with its plausible range and source."""

    value: float
    low: float
    high: float
    source: str


@dataclass(frozen=True)
class NormalGlow:
    """Normal-glow data of one gas-cathode pair (SI)."""

    cathode_fall: float
    """Normal cathode fall V_n, V."""
    current_density_per_p2: float | None
    """j_n / p^2, A m^-2 Pa^-2 (None where not tabulated)."""
    pd_n: float | None
    """Normal cathode dark space times pressure, Pa m (None where not tabulated)."""
    source: str


@dataclass(frozen=True)
class Cathode:
    """A cathode material."""

    key: str
    symbol: str
    work_function: float
    """eV."""
    default_yield: Yield
    yields: Mapping[str, Yield] = field(default_factory=dict)
    """Measured or published gamma by gas key."""
    normal_glow: Mapping[str, NormalGlow] = field(default_factory=dict)
    """Normal-glow data by gas key."""
    note: str = ""

    def yield_for(self, gas: Gas) -> Yield:
        """gamma for ``gas``: a listed value, else the noble-gas estimate, else the default."""
        if gas.key in self.yields:
            return self.yields[gas.key]
        if gas.noble:
            g = secondary_yield_estimate(gas.ionisation_energy, self.work_function)
            if g > 0:
                return Yield(
                    g,
                    0.3 * g,
                    1.5 * g,
                    f"clean-metal estimate 0.016 (E_iz - 2 phi) = 0.016 ({gas.ionisation_energy:g} - "
                    f"2 x {self.work_function:g}) eV (Baragiola et al. 1979, from memory)",
                )
        return self.default_yield


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
    """A breakdown curve fitted to this bench's recorded strikes."""

    A: float
    """1/(Pa m), same density convention as the gas's constants."""
    B: float
    """V/(Pa m)."""
    gamma: float
    A_sigma: float
    B_sigma: float
    gamma_sigma: float
    covariance: tuple[tuple[float, float, float], ...]
    """Covariance of (ln A, ln B, ln gamma)."""
    rms_residual: float
    """RMS of the fit residuals, V."""
    n_points: int
    pd_low: float
    """Smallest reduced pd among the fitted points, Pa m."""
    pd_high: float
    gas: str
    cathode: str
    fitted_on: str
    """ISO date of the fit."""
    residual_scale: float = 0.0
    """Scatter of single strikes about the curve, in ln V (a fraction)."""
    t_quantile: float = 1.96
    """Student-t quantile of the stated prediction band (95 %)."""
    free: tuple[str, ...] = ("A", "B")
    """Which of A, B, gamma were fitted."""
    marks: tuple[tuple[float, float], ...] = ()
    """The strikes it was fitted to: (reduced pd in Pa m, V)."""


@dataclass(frozen=True)
class Bench:
    """One bench: its gas, cathode, gaps, supply and chamber."""

    name: str
    gas: Gas
    cathode: Cathode
    gap: float
    """Main electrode gap, m."""
    gas_temperature: float = 293.15
    """K."""
    gamma: float | None = None
    """Override of the cathode's gamma for this gas (None: use the cathode data)."""
    supply: Supply | None = None
    cathode_area: float | None = None
    """m^2."""
    magnetic_field: float | None = None
    """Field at the cathode surface, T (magnetron); None for an unmagnetised cathode."""
    stray_gaps: tuple[StrayGap, ...] = ()
    chamber: Chamber | None = None
    curve: BenchCurve | None = None
    pressure: float | None = None
    """A starting pressure (Pa) for manual use, None if the profile gives none."""
    mixture: Mixture | None = None
    """The gas mixture in the chamber (None: the pure gas ``gas``); ``gas`` is then its largest
    component, whose data stand for the mixture where no mixing rule exists (glow, afterglow)."""
    pumping_speed: float | None = None
    """Pumping speed at the chamber, m^3/s, for the expected partial pressures flow / speed."""
    film: Film | None = None
    """The film a reactive process grows on the target (for charging arcs)."""
    racetrack_fraction: float = 1.0
    """Share of the cathode area that carries the discharge current (a magnetron's race track)."""

    @property
    def composition(self) -> str:
        """The gas or mixture as text ("argon" or "argon:80,oxygen:20")."""
        return self.gas.key if self.mixture is None else self.mixture.key

    def yield_(self) -> Yield:
        """The gamma in force: the bench override, else the cathode's for this gas."""
        if self.gamma is not None:
            return Yield(self.gamma, self.gamma, self.gamma, "bench profile")
        return self.cathode.yield_for(self.gas)


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
