"""Breakdown in an alternating field (mid-frequency AC and RF), from the same gas data as DC.

SI throughout; p is the pressure reduced to the constants' reference density, w = 2 pi f, and a
voltage is the amplitude (peak) across the gap unless a name says otherwise.

- Effective field: an electron in an alternating field gains energy as in a DC field of
  E_eff = E_rms nu_m / sqrt(nu_m^2 + w^2), nu_m = c p (Raizer, Gas Discharge Physics (1991),
  high-frequency breakdown; MacDonald, Microwave Breakdown in Gases; from memory).
- Oscillation: a charge of DC mobility mu and collision frequency nu swings with amplitude
  a = mu nu E_0 / (w sqrt(nu^2 + w^2)) (Drude's complex mobility), E_0 = sqrt(2) E_rms.
- Volume breakdown: ionisation balances diffusion, (alpha - eta)(E_eff) mu_e E_eff = D_e / Lambda^2
  with D_e = mu_e eps_k, over the diffusion length of a cylinder of the electrodes' radius R whose
  height the electrons' swing shrinks, 1/Lambda^2 = (pi/(d - 2 a_e))^2 + (j01/R)^2
  ([lisovskiy-yegorenkov-1998], from memory; j01 = 2.405, the first zero of J0). mu_e cancels from
  the balance but sets the swing. In the reduced effective field u = E_eff/p it is explicit:
      pd(u) = sqrt(eps_k / ((a - e)(u) u)) sqrt((pi/(1 - rho))^2 + (j01 d/R)^2),
      rho = 2 a_e / d = 2 sqrt(2) mu_e p u / (w d),   V_0(u) = sqrt(2) u sqrt((c pd)^2 + (w d)^2) / c
  (a, e = alpha/p, eta/p). Traced over u, pd falls to a turning point and rises again as rho -> 1:
  the lower branch is breakdown, the upper branch the voltage above which electrons are swept onto
  the electrodes each half period. Below the turning point's pressure no volume breakdown exists.
  gamma plays no part here: the electrons are made and lost in the volume (our statement of the
  model's reach; at low pressure secondary electrons do take part in practice).
- DC-like limit: where the ions swing across the gap within a half period (2 a_i >= d, ion mobility
  mu_i = K0 p0 / p), every half cycle is a DC breakdown: the DC law with gamma, at the peak
  voltage. Where fewer ions reach the cathode we take gamma times w = 2 a_i/d (our assumption). At
  the breakdown field y = E/p the ions' reach is w = y/k, k = w d/(2 K0 p0), so the criterion with
  gamma w stays explicit in y and the model goes over to DC without a step. Where fewer than
  :data:`IONS_COUNTED` of the gap's ions reach the cathode each half period, the gamma mechanism is
  not counted (ours): its voltage would rest on ions that never arrive. The breakdown voltage is the lower of the
  two mechanisms, and the regime says which one: "dc-like", "intermediate" (gamma reduced),
  "rf-volume", "drift-limited" (volume breakdown with the swing over half the gap), "none".

A fill's alpha, eta and gamma are its DC law's (:class:`strikeline.model.breakdown.Law`); its nu_m/p
and eps_k by mole fraction and its electron mobility by Blanc's law (1/mu = sum x_i/mu_i, common
practice); its ions are the largest component's (our assumption).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import cached_property

import numpy as np
from numpy.typing import ArrayLike, NDArray

from . import constants as _c
from . import mixture as mx
from .composition import Composition

__all__ = [
    "ALTERNATING_UNCERTAINTY",
    "IONS_COUNTED",
    "REGIMES",
    "AlternatingLaw",
    "drift_amplitude",
    "effective_field",
]

ALTERNATING_UNCERTAINTY = 0.5
"""Relative uncertainty of a volume-breakdown voltage: nu_m, the electron mobility and eps_k are
each good to about a factor of two (gases.toml), and the voltage goes as their square roots or
less (our judgement)."""
REGIMES = ("dc-like", "intermediate", "rf-volume", "drift-limited", "none")
DRIFT_LIMITED = 0.5
"""rho = 2 a_e / d above which volume breakdown is called drift-limited (ours)."""
IONS_COUNTED = 0.1
"""The least share of the gap the ions must cross in a half period for the gamma (DC-like) mechanism to
count (ours)."""
BESSEL_J01 = 2.404825557695773
"""First zero of J0: the radial part of a cylinder's diffusion length (scipy.special.jn_zeros(0, 1))."""
_P0 = 760.0 * _c.torr
"""Pa: the pressure reduced ion mobilities K0 are quoted at."""
_GRID = 1024


def effective_field(E_rms: ArrayLike, nu_m: ArrayLike, omega: float) -> NDArray[np.float64]:
    """E_eff = E_rms nu_m / sqrt(nu_m^2 + w^2), V/m.

    >>> float(effective_field(100.0, 1e9, 0.0)), round(float(effective_field(100.0, 1e9, 1e9)), 4)
    (100.0, 70.7107)
    """
    nu = np.asarray(nu_m, dtype=float)
    return np.asarray(E_rms, dtype=float) * nu / np.sqrt(nu * nu + omega * omega)


def drift_amplitude(E_0: ArrayLike, mobility: ArrayLike, nu: ArrayLike, omega: float) -> NDArray[np.float64]:
    """Swing of a charge in a field of amplitude E_0 (V/m): mu nu E_0 / (w sqrt(nu^2 + w^2)), m.

    >>> round(float(drift_amplitude(1e3, 10.0, 1e12, 1e8)), 9)   # nu >> w: mu E_0 / w
    0.0001
    """
    nu = np.asarray(nu, dtype=float)
    return (
        np.asarray(mobility, dtype=float)
        * nu
        * np.asarray(E_0, dtype=float)
        / (omega * np.sqrt(nu * nu + omega * omega))
    )


@dataclass(frozen=True)
class AlternatingLaw:
    """Breakdown of one gas fill across one gap at one frequency (the curve depends on w d)."""

    fill: Composition
    frequency: float
    """Hz."""
    gap: float
    """m."""
    dc: object
    """The same fill's DC law (:class:`strikeline.model.breakdown.Law`)."""
    radius: float | None = None
    """The electrodes' radius, m (None: no radial loss, electrodes much wider than the gap)."""

    @property
    def reference_temperature(self) -> float:
        return self.dc.reference_temperature

    @property
    def gamma(self) -> float:
        return self.dc.gamma

    @property
    def effective_constants(self):
        return self.dc.effective_constants

    @cached_property
    def omega(self) -> float:
        return 2.0 * math.pi * self.frequency

    @cached_property
    def gas_data(self) -> tuple[float, float, float, float]:
        """(nu_m/p in 1/(s Pa), mu_e p in m^2 Pa/(V s), eps_k in V, ion K0 in m^2/(V s)) of the fill."""
        parts = self.fill.components
        for c in parts:
            if c.gas.electron_mobility_p is None or c.gas.characteristic_energy is None:
                raise ValueError(f"{c.gas.key} has no electron mobility or characteristic energy for an AC forecast")
        c_m = math.fsum(c.fraction * c.gas.electron_collision_per_Pa for c in parts)
        mu_p = 1.0 / math.fsum(c.fraction / c.gas.electron_mobility_p for c in parts)
        eps = math.fsum(c.fraction * c.gas.characteristic_energy for c in parts)
        return c_m, mu_p, eps, self.fill.main.ion_mobility

    # -- the volume-breakdown curve, traced over the reduced effective field u -----------

    @cached_property
    def u_max(self) -> float:
        """u where the electrons' swing spans the gap (rho = 1): no volume breakdown above it."""
        _c_m, mu_p, _eps, _k0 = self.gas_data
        return self.omega * self.gap / (2.0 * math.sqrt(2.0) * mu_p)

    def _rho(self, u):
        return np.asarray(u) / self.u_max

    def _pd(self, u):
        """pd (Pa m) of the volume criterion at reduced effective field u; NaN where it has none."""
        u = np.asarray(u, dtype=float)
        _c_m, _mu, eps, _k0 = self.gas_data
        net = self.dc.a(u) - self.dc.e(u)
        rho = self._rho(u)
        radial = 0.0 if self.radius is None else (BESSEL_J01 * self.gap / self.radius) ** 2
        with np.errstate(divide="ignore", invalid="ignore"):
            pd = np.sqrt(eps / (net * u)) * np.sqrt((math.pi / (1.0 - rho)) ** 2 + radial)
        return np.where((net > 0) & (rho < 1.0), pd, np.nan)

    def _v(self, u, pd):
        c_m = self.gas_data[0]
        return math.sqrt(2.0) * u * np.sqrt((c_m * pd) ** 2 + (self.omega * self.gap) ** 2) / c_m

    @cached_property
    def volume(self) -> tuple | None:
        """The traced curve: (turning u, pd, V), lower branch (pd, V, u) and upper branch (pd, V, u),
        each with pd ascending; None where the frequency is too low for any volume breakdown."""
        from .breakdown import trace

        lo, hi = self.dc.y_range[0], min(self.dc.y_range[1], self.u_max * (1 - 1e-12))
        if not lo < hi:
            return None
        a, b = lo, hi
        u = np.geomspace(a, b, _GRID)
        pd = self._pd(u)
        if not np.isfinite(pd).any():
            return None
        for _ in range(3):  # the turning point: least pd, on grids each _GRID times finer
            k = int(np.nanargmin(pd))
            a, b = u[max(k - 1, 0)], u[min(k + 1, _GRID - 1)]
            u = np.geomspace(a, b, _GRID)
            pd = self._pd(u)
        k = int(np.nanargmin(pd))
        u_t, pd_t = float(u[k]), float(pd[k])
        lower_u, lower_pd = trace(math.log(u_t), math.log(lo), self._pd)
        upper_u, upper_pd = trace(math.log(u_t), math.log(hi), self._pd)
        return (
            (u_t, pd_t, float(self._v(u_t, pd_t))),
            (lower_pd, self._v(lower_u, lower_pd), lower_u),
            (upper_pd, self._v(upper_u, upper_pd), upper_u),
        )

    def turning(self) -> tuple[float, float] | None:
        """(pd, V) of the turning point, below whose pd no volume breakdown exists; None: no volume
        breakdown at this frequency and gap."""
        return None if self.volume is None else self.volume[0][1:]

    def _branch(self, which: int, rpd) -> tuple[NDArray, NDArray]:
        rpd = np.asarray(rpd, dtype=float)
        if self.volume is None:
            nan = np.full(rpd.shape, np.nan)
            return nan, nan
        pd, v, u = self.volume[which]
        return np.interp(rpd, pd, v, left=np.nan, right=np.nan), np.interp(rpd, pd, u, left=np.nan, right=np.nan)

    def upper(self, rpd: ArrayLike) -> NDArray:
        """The upper branch's voltage (V; NaN where the curve is single-valued or has no volume part):
        above it electrons are swept onto the electrodes each half period."""
        return self._branch(2, rpd)[0]

    # -- the DC-like mechanism and the two together -----------------------------------

    @cached_property
    def _k(self) -> float:
        """V/(Pa m): the ions' swing spans the gap (2 a_i = d) at V = k rpd."""
        return self.omega * self.gap / (2.0 * self.gas_data[3] * _P0)

    @cached_property
    def _gamma_table(self) -> tuple[NDArray, NDArray]:
        """(rpd ascending, V) of the DC mechanism where fewer ions reach the cathode: the DC criterion
        with gamma times the ions' reach w = y/k, traced from w = 1 (where the ions just cross, and it
        meets the DC law) down to w = :data:`IONS_COUNTED`."""
        from .breakdown import trace

        dc, k = self.dc, self._k

        def rpd_of(y):
            return mx.pd_at(dc.a(y), dc.e(y), dc.g(y) * (y / k))

        y, rpd = trace(math.log(k), math.log(IONS_COUNTED * k), rpd_of)
        return rpd, y * rpd

    def _dc_like(self, rpd: NDArray) -> NDArray:
        """V of the DC mechanism with gamma reduced by the ions' reach. The ions cross within a half
        period left of the reduced branch's start (the DC breakdown field E/p falls as pd grows, so the
        ions' swing at it does too): the DC law there, the reduced branch beyond, nothing past it."""
        shape = np.shape(rpd)
        rpd = np.atleast_1d(np.asarray(rpd, dtype=float))
        pd, v = self._gamma_table
        start = pd[0] if pd.size else np.inf
        out = np.interp(rpd, pd, v, left=np.nan, right=np.nan) if pd.size else np.full(rpd.shape, np.nan)
        dc = rpd < start
        if dc.any():
            out[dc] = self.dc.voltage(rpd[dc])[0]
        return out.reshape(shape)

    def _ions(self, rpd: NDArray) -> NDArray:
        """2 a_i / d at the DC breakdown voltage (1 and above: the ions cross within a half period)."""
        with np.errstate(divide="ignore", invalid="ignore"):
            return np.asarray(self.dc.voltage(rpd)[0], dtype=float) / (self._k * rpd)

    def parts(self, rpd: ArrayLike) -> dict[str, NDArray]:
        """Every piece of the curve at ``rpd`` (reduced pd, Pa m): "volume" and "upper" branch
        voltages, "u" (reduced effective field on the lower branch), "dc_like" and "ions" (2 a_i/d)."""
        rpd = np.asarray(rpd, dtype=float)
        v_low, u = self._branch(1, rpd)
        return {
            "volume": v_low,
            "upper": self.upper(rpd),
            "u": u,
            "dc_like": self._dc_like(rpd),
            "ions": self._ions(rpd),
        }

    def voltage(self, rpd: ArrayLike) -> tuple[NDArray, NDArray]:
        """(breakdown amplitude V_0 in V, the lower of the two mechanisms, NaN where neither; zeros)."""
        rpd = np.asarray(rpd, dtype=float)
        if self.volume is None:
            volume = np.full(rpd.shape, np.nan)
        else:
            pd, v, _u = self.volume[1]
            volume = np.interp(rpd, pd, v, left=np.nan, right=np.nan)
        with np.errstate(invalid="ignore"):
            v = np.fmin(volume, self._dc_like(rpd))
        return v, np.zeros(np.shape(v))

    def regimes(self, rpd: ArrayLike) -> NDArray:
        """Which mechanism breaks each reduced pd down (:data:`REGIMES`)."""
        p = self.parts(rpd)
        volume_wins = np.isfinite(p["volume"]) & ~(p["dc_like"] < p["volume"])
        rho = self._rho(np.nan_to_num(p["u"]))
        dc_name = np.where(p["ions"] >= 1.0, "dc-like", "intermediate")
        out = np.where(volume_wins, np.where(rho >= DRIFT_LIMITED, "drift-limited", "rf-volume"), dc_name)
        return np.where(np.isfinite(p["volume"]) | np.isfinite(p["dc_like"]), out, "none")

    @cached_property
    def _grid(self) -> tuple[NDArray, NDArray]:
        starts = [self.dc.no_breakdown_pd()]
        if self.volume is not None:
            starts.append(self.volume[0][1])
        rpd = np.geomspace(min(starts) * 0.5, min(starts) * 1e7, 4 * _GRID)
        return rpd, self.voltage(rpd)[0]

    def minimum(self) -> tuple[float, float]:
        """(pd, V) of the curve's lowest point."""
        rpd, v = self._grid
        for _ in range(2):
            k = int(np.nanargmin(v))
            rpd = np.geomspace(rpd[max(k - 1, 0)], rpd[min(k + 1, rpd.size - 1)], _GRID)
            v = self.voltage(rpd)[0]
        k = int(np.nanargmin(v))
        return float(rpd[k]), float(v[k])

    def no_breakdown_pd(self) -> float:
        """Reduced pd (Pa m) below which nothing breaks the gap down."""
        rpd, v = self._grid
        k = int(np.argmax(np.isfinite(v)))
        if k == 0:
            return float(rpd[0])
        fine = np.geomspace(rpd[k - 1], rpd[k], _GRID)
        return float(fine[int(np.argmax(np.isfinite(self.voltage(fine)[0])))])

    def branch(self, rpd: ArrayLike) -> NDArray:
        rpd = np.asarray(rpd, dtype=float)
        pd_min, _ = self.minimum()
        v = self.voltage(rpd)[0]
        return np.where(~np.isfinite(v), "none", np.where(rpd < pd_min, "left", "right"))

    def e_over_p(self, rpd: ArrayLike) -> NDArray:
        """The reduced effective field at breakdown, V/(Pa m) (DC-like: the DC law's E/p)."""
        p = self.parts(rpd)
        volume_wins = np.isfinite(p["volume"]) & ~(p["dc_like"] < p["volume"])
        out = np.where(volume_wins, p["u"], self.dc.e_over_p(rpd))
        return out if np.ndim(out) else out[()]

    # -- at the operating point -----------------------------------------------------

    def _e_eff(self, E_0: float, p: float) -> float:
        return float(effective_field(E_0 / math.sqrt(2.0), self.gas_data[0] * p, self.omega))

    def alpha(self, E_0: float, p: float) -> float:
        """alpha (1/m) at the effective field of an amplitude E_0 (V/m) and reduced pressure p (Pa)."""
        return float(p * self.dc.a(self._e_eff(E_0, p) / p))

    def eta(self, E_0: float, p: float) -> float:
        y = self._e_eff(E_0, p) / p
        return float(p * self.dc.e(y, p))

    def swing(self, E_0: float, p: float) -> tuple[float, float]:
        """(electron swing, ion swing) in m for an amplitude E_0 (V/m) at reduced pressure p (Pa)."""
        c_m, mu_p, _eps, k0 = self.gas_data
        a_e = float(drift_amplitude(E_0, mu_p / p, c_m * p, self.omega))
        a_i = k0 * _P0 / p * E_0 / self.omega  # ions: collisions far faster than the field
        return a_e, a_i
