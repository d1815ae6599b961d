"""The bench's breakdown curve: bench state in, the law and its curve out.

Everything that draws or judges a curve (the forecast, the screen's curve panel, the shift report,
``strikeline curve``, the calibration) asks :func:`curve_of`: it picks the law (the fill's DC law,
the bench's fitted curve where one applies, or the law of an alternating field at the supply's or a
given frequency across the gap) and turns pressure and gap into the reduced pd the law takes (the gas
temperature scales it to the data's reference density; a magnetised cathode's crossed-field effective
pressure is applied for DC). Pure and SI: pressures in Pa, lengths in m, pd in Pa m, voltages in V.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from functools import cached_property, lru_cache
from typing import TYPE_CHECKING

import numpy as np
from numpy.typing import ArrayLike, NDArray

from . import constants as _c
from .bench import Bench, BenchCurve
from .breakdown import Law, law_for
from .composition import pure
from .gas import TownsendConstants, one_segment
from .secondary import Yield

if TYPE_CHECKING:
    from .alternating import AlternatingLaw

__all__ = ["Curve", "curve_of", "dc_law", "effective_pressure", "fitted_curve", "frequency_of"]


def frequency_of(bench: Bench, frequency: float | None = None) -> float | None:
    """The frequency of the applied voltage (Hz): the one given, else an AC supply's; None for DC."""
    if frequency is not None:
        return frequency
    s = bench.supply
    return s.frequency if s is not None and s.mode == "ac" else None


def fitted_curve(bench: Bench) -> BenchCurve | None:
    """The bench's fitted curve where it was fitted for this fill (mole fractions within
    :data:`.composition.SAME_WITHIN`) and cathode; None otherwise."""
    cv = bench.curve
    if cv is None or cv.cathode != bench.cathode.key:
        return None
    from .composition import same_composition

    return cv if same_composition(cv.gas, bench.composition) else None


def dc_law(bench: Bench, *, textbook: bool = False, which: str = "value") -> Law:
    """The bench's DC law: the fill's, each gas's gamma on this cathode (``which`` end of its band), with
    the fitted curve's scales where one applies (unless ``textbook``)."""
    cv = None if textbook else fitted_curve(bench)
    if cv is not None and cv.base is not None:
        return law_for(*_paschen_fill(bench, cv), cv_scales(cv), which)
    yields = [bench.yield_for(c.gas) for c in bench.fill.components]
    return law_for(bench.fill, yields, (1.0, 1.0, 1.0) if cv is None else cv_scales(cv), which)


def cv_scales(cv: BenchCurve) -> tuple[float, float, float]:
    return (cv.alpha_scale, cv.field_scale, cv.gamma_scale)


def _paschen_fill(bench: Bench, cv: BenchCurve):
    """A curve an earlier version fitted as Paschen's closed form (A, B, gamma in ``cv.base``): the fill
    stands in as one gas with that one A, B pair and a constant gamma."""
    A, B, gamma = cv.base
    source = f"bench curve fitted {cv.fitted_on} from {cv.n_points} strikes (Paschen's closed form)"
    c = TownsendConstants(A, B, 0.0, math.inf, bench.fill.main.constants.reference_temperature, source)
    gas = replace(bench.fill.main, constants=c, ionisation=one_segment(c), attachment=None)
    return pure(gas), [Yield(gamma, gamma, gamma, source)]


def effective_pressure(p, T: float, bench: Bench):
    """Effective pressure p sqrt(1 + (omega_ce/nu_m)^2) in crossed E x B fields, and the Hall parameter
    omega_ce/nu_m (Blevin & Haydon's effective-pressure treatment, as in [raizer-1991] sec. 4.6; from
    memory). p in Pa (scalar or array), T in K. Unmagnetised: (p, None).

    >>> from strikeline.profiles.bench import load_bench
    >>> p_eff, hall = effective_pressure(0.5, 293.0, load_bench("demo-magnetron").bench)
    >>> round(float(hall)), round(float(p_eff))
    (285, 142)
    """
    if bench.magnetic_field is None:
        return p, None
    omega = _c.e * bench.magnetic_field / _c.m_e
    p = np.asarray(p, dtype=float)
    nu_per_p = sum(c.fraction * c.gas.electron_collision_per_Pa for c in bench.fill.components)
    nu = nu_per_p * p * bench.fill.main.constants.reference_temperature / T
    hall = omega / nu
    p_eff = p * np.sqrt(1.0 + hall * hall)
    return (float(p_eff), float(hall)) if p_eff.ndim == 0 else (p_eff, hall)


@dataclass(frozen=True)
class Curve:
    """A bench's breakdown curve at one gas temperature (and, for an alternating field, one gap)."""

    bench: Bench
    law: Law | AlternatingLaw
    frequency: float | None
    gap: float
    temperature: float
    fitted: BenchCurve | None

    @property
    def alternating(self) -> bool:
        return self.frequency is not None

    @property
    def dc(self) -> Law:
        """The DC law (an alternating law's own DC law)."""
        return self.law.dc if self.alternating else self.law

    @property
    def reference_temperature(self) -> float:
        return self.law.reference_temperature

    @property
    def scale(self) -> float:
        """Reduced pd per actual pd: the data's reference temperature over the gas temperature."""
        return self.law.reference_temperature / self.temperature

    @property
    def magnetised(self) -> bool:
        """The crossed-field effective pressure applies (a magnetised cathode, DC)."""
        return self.bench.magnetic_field is not None and not self.alternating

    def reduced(self, pressure: ArrayLike, gap: float | None = None):
        """(reduced pd in Pa m, effective pressure in Pa, Hall parameter or None) at ``pressure`` (Pa)
        across ``gap`` (m, default the curve's)."""
        d = self.gap if gap is None else gap
        if self.magnetised:
            p_eff, hall = effective_pressure(pressure, self.temperature, self.bench)
        else:
            p_eff, hall = pressure, None
        return np.asarray(p_eff, dtype=float) * d * self.scale, p_eff, hall

    def at_pressure(self, pressure: ArrayLike, gap: float | None = None) -> NDArray[np.float64]:
        """V_b (V, NaN where none) at each pressure (Pa) across ``gap`` (m)."""
        rpd, _p, _h = self.reduced(pressure, gap)
        return self.law.voltage(rpd)[0]

    def at_pd(self, pd: ArrayLike) -> NDArray[np.float64]:
        """V_b (V, NaN where none) at each actual pd (Pa m, at this gas temperature); a magnetised
        cathode's curve needs the pressure itself, so it is taken at the curve's gap."""
        pd = np.asarray(pd, dtype=float)
        if self.magnetised:
            return self.at_pressure(pd / self.gap)
        return self.law.voltage(pd * self.scale)[0]

    @cached_property
    def minimum(self) -> tuple[float, float]:
        """(actual pd in Pa m, V) of the curve's minimum (unmagnetised; a magnetised cathode's minimum is
        the law's, at the effective pressure)."""
        pd, v = self.law.minimum()
        return pd / self.scale, v

    @property
    def minimum_reduced_pd(self) -> float:
        return self.law.minimum()[0]

    def pressure_for(self, rpd: float, p_eff_over_p: float = 1.0) -> float:
        """The pressure (Pa) that puts this gap at reduced pd ``rpd`` (at the same effective-pressure ratio)."""
        return rpd / self.scale / self.gap / p_eff_over_p


def curve_of(
    bench: Bench,
    *,
    frequency: float | None = None,
    gap: float | None = None,
    temperature: float | None = None,
    textbook: bool = False,
    which: str = "value",
) -> Curve:
    """The curve of ``bench``: at ``frequency`` (default: an AC supply's; DC otherwise), across ``gap``
    (default the bench's), at ``temperature`` (default the bench's gas temperature); ``textbook`` leaves
    the fitted curve out; ``which`` takes an end of the yields' band ("low", "high")."""
    freq = frequency_of(bench, frequency)
    d = bench.gap if gap is None else gap
    T = bench.gas_temperature if temperature is None else temperature
    dc = dc_law(bench, textbook=textbook, which=which)
    fitted = None if textbook else fitted_curve(bench)
    if freq is None:
        return Curve(bench, dc, None, d, T, fitted)
    return Curve(bench, alternating_law(bench, dc, freq, d), freq, d, T, None)


def alternating_law(bench: Bench, dc: Law, frequency: float, gap: float) -> AlternatingLaw:
    """The law of an alternating voltage of ``frequency`` (Hz) across ``gap`` (m) over the DC law ``dc``."""
    return _alternating(dc.fill, float(frequency), float(gap), dc, bench.radius)


@lru_cache(maxsize=64)
def _alternating(fill, frequency: float, gap: float, dc: Law, radius: float | None):
    from .alternating import AlternatingLaw

    return AlternatingLaw(fill, frequency, gap, dc, radius)
