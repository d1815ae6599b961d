"""What the model knows about gases and cathodes: their laws and data, SI, frozen.

These are plain data; :mod:`strikeline.profiles.gasdata` builds them from the data files (every
number with its source there) and the model never reads a file itself.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field

from .ionisation import Attachment, Ionisation, Segment, ionisation
from .secondary import Yield, clean_metal_yield

__all__ = [
    "Cathode",
    "Film",
    "Gas",
    "NormalGlow",
    "TownsendConstants",
    "UniformFieldLaw",
    "Yield",
    "one_segment",
]


@dataclass(frozen=True)
class TownsendConstants:
    """A pair A, B for alpha/p = A exp(-B p/E), in SI: the textbook view of a gas's law."""

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


def one_segment(c: TownsendConstants) -> Ionisation:
    """The ionisation law that is exactly this A, B pair (a fitted Paschen curve, a test's gas).

    >>> law = one_segment(TownsendConstants(10.0, 200.0, 100.0, 1e4, 273.15, ""))
    >>> round(float(law.per_p(200.0)), 6)
    3.678794
    """
    return ionisation([Segment(c.A, c.B, c.E_over_p_low, c.E_over_p_high, c.source)])


@dataclass(frozen=True)
class UniformFieldLaw:
    """Empirical uniform-field breakdown law for air at high pd.

    V_b = a x + b sqrt(x), x = delta d, delta = (p / p_ref)(T_ref / T)

    With a = 24.22 kV/cm and b = 6.08 kV/cm^0.5 ([kuffel-zaengl-2000]). Between ``blend_from`` and
    ``blend_to`` (in x) the breakdown voltage moves smoothly from the Townsend law's to this law's.
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
    """x (m) below which the Townsend law alone is used."""
    blend_to: float
    """x (m) above which this law alone is used."""
    valid_to: float
    """x (m) beyond which the law itself is not supported."""
    source: str


@dataclass(frozen=True)
class Gas:
    """A working gas and the data the model uses for it."""

    key: str
    """Canonical name, e.g. "argon"."""
    symbol: str
    """Chemical symbol or short name, e.g. "Ar"."""
    constants: TownsendConstants
    """The textbook A, B view of the ionisation law (the segment the tables give)."""
    ionisation: Ionisation
    """alpha/p over the whole E/p range the tool forecasts (:mod:`.ionisation`)."""
    yield_: Yield
    """The effective gamma on a technical cathode, chosen from measured breakdown (:mod:`.secondary`)."""
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
    attachment: Attachment | None = None
    """Electron attachment, for an electronegative gas (None: none known)."""
    attaches_unmodelled: bool = False
    """The gas attaches electrons but no attachment data are held here (said with its forecasts)."""
    minimum_checked: bool = True
    """Its default curve was chosen from, and is tested against, a measured minimum sparking potential."""
    metastable_energy: float | None = None
    """Lowest metastable level, eV (noble gases: the energy that makes Penning mixtures)."""
    reactive: bool = False
    """Reacts with a sputter target to form a film (oxygen, nitrogen)."""
    electron_mobility_p: float | None = None
    """Reduced electron mobility mu_e p, m^2 Pa/(V s), at the fields of RF breakdown."""
    characteristic_energy: float | None = None
    """D_e/mu_e of the electrons, V (eV per unit charge), at those fields."""


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
    yields: Mapping[str, Yield] = field(default_factory=dict)
    """gamma of this cathode by gas key, where a source gives one for it."""
    normal_glow: Mapping[str, NormalGlow] = field(default_factory=dict)
    """Normal-glow data by gas key."""
    note: str = ""

    def yield_for(self, gas: Gas, model: str = "technical") -> Yield:
        """gamma for ``gas``: this cathode's own where a source gives one, else the gas's technical-surface
        yield; with ``model`` "clean-metal", the clean-metal estimate where it gives one."""
        if model == "clean-metal":
            clean = clean_metal_yield(gas.ionisation_energy, self.work_function)
            if clean is not None:
                return clean
        return self.yields.get(gas.key, gas.yield_)
