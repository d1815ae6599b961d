"""What an alternating supply changes in a forecast at one operating point: its frequency, the
regime and both branches, the electrons' swing, and which DC results no longer hold (and why).

Pure and SI: the forecast (:mod:`.forecast`) asks this module, and the law itself lives in
:mod:`.alternating`.
"""

from __future__ import annotations

from .alternating import ALTERNATING_UNCERTAINTY
from .bench import OperatingPoint
from .results import Alternating, finite_or_none
from .sentence import Flag, flag, q

__all__ = ["WAVELENGTH_FRACTION", "ac_result", "not_applicable"]

WAVELENGTH_FRACTION = 0.1
"""A gap longer than this share of the free-space wavelength is no longer a lumped, uniform field
(common practice for lumped circuits)."""
_C_LIGHT = 299792458.0
"""m/s (definition)."""

_REGIME_WORDS = {
    "dc-like": "DC-like: the ions cross the gap within a half period, so each half cycle breaks down as DC",
    "intermediate": "intermediate: fewer ions reach the cathode each half period, so gamma counts for less",
    "rf-volume": "RF volume breakdown: electrons made and lost in the gas, by diffusion",
    "drift-limited": "drift-limited: the electrons' swing spans over half the gap, sweeping many onto the "
    "electrodes each half period",
    "none": "no breakdown at this pd",
}


def ac_result(law, point: OperatingPoint, rpd: float, scale: float, V: float | None) -> tuple[Alternating, list[Flag]]:
    """The alternating supply's part of the forecast at reduced pd ``rpd`` (``scale`` = reduced /
    actual pd), with the applied amplitude ``V`` (V) if any, and its flags."""
    parts = {k: float(v) for k, v in law.parts(rpd).items()}
    regime = str(law.regimes(rpd))
    turning = law.turning()
    swing = e_eff = None
    p_red = point.pressure * scale
    if V is not None:
        swing = law.swing(V / point.gap, p_red)[0]
        e_eff = law._e_eff(V / point.gap, p_red)
    v_dc = finite_or_none(law.dc.voltage(rpd)[0])
    result = Alternating(
        frequency=law.frequency,
        regime=regime,
        volume_voltage=finite_or_none(parts["volume"]),
        upper_voltage=finite_or_none(parts["upper"]),
        dc_like_voltage=finite_or_none(parts["dc_like"]),
        dc_voltage=v_dc,
        turning_reduced_pd=None if turning is None else turning[0],
        turning_pd=None if turning is None else turning[0] / scale,
        turning_pressure=None if turning is None else turning[0] / scale / point.gap,
        turning_voltage=None if turning is None else turning[1],
        ion_swing_ratio=finite_or_none(parts["ions"]),
        electron_swing=swing,
        effective_field=e_eff,
    )
    return result, _flags(result, point, V)


def _flags(r: Alternating, point: OperatingPoint, V: float | None) -> list[Flag]:
    method = (
        "effective field E_rms nu_m/sqrt(nu_m^2 + w^2); volume breakdown nu_i = D_e/Lambda^2 with Lambda = "
        "(d - 2 a_e)/pi ([lisovskiy-yegorenkov-1998], from memory); DC-like where the ions cross within a half "
        f"period; +/-{ALTERNATING_UNCERTAINTY:.0%} for the swarm data"
    )
    f = _hz(r.frequency)
    flags = [Flag("ac_regime", "ok", f"{f}: {_REGIME_WORDS[r.regime]}; voltages are amplitudes (peak)", method)]
    swept = V is not None and r.upper_voltage is not None and V > r.upper_voltage
    if swept and (r.dc_like_voltage is None or V < r.dc_like_voltage):  # nor does the gamma mechanism strike
        flags.append(
            flag(
                "above_upper_branch",
                "watch",
                "{V} is above the upper branch ({upper}) at this pressure: the electrons' swing sweeps them onto the "
                "electrodes each half period, so more voltage does not strike it; raise the pressure or lower the "
                "voltage",
                method,
                V=q(V, "voltage", "V", ".0f", "supply amplitude"),
                upper=q(r.upper_voltage, "voltage", "V", ".0f", "upper branch voltage"),
            )
        )
    if r.turning_pressure is not None and point.pressure < r.turning_pressure and r.regime in ("none", "intermediate"):
        flags.append(
            flag(
                "below_turning_point",
                "watch",
                "the pressure is below the turning point of the RF curve ({turning} at this gap): no volume "
                "breakdown exists here at any voltage; raise the pressure above it",
                method,
                turning=q(r.turning_pressure, "pressure", "Pa", what="turning-point pressure"),
            )
        )
    wavelength = _C_LIGHT / r.frequency
    if point.gap > WAVELENGTH_FRACTION * wavelength:
        flags.append(
            flag(
                "gap_vs_wavelength",
                "watch",
                "the gap ({gap}) is over {share} of the wavelength ({wavelength} at " + f + "): the field is no "
                "longer uniform and this forecast does not hold",
                "lumped-circuit limit (common practice)",
                gap=q(point.gap, "length", "mm", what="gap"),
                share=q(WAVELENGTH_FRACTION, "fraction", "%", ".0%", "largest share of the wavelength"),
                wavelength=q(wavelength, "length", "m", what="free-space wavelength"),
            )
        )
    return flags


def not_applicable(regime: str) -> tuple[tuple[str, str], ...]:
    """The DC results that do not hold for an alternating supply in this regime, with the reason."""
    out = [
        (
            "glow after ignition",
            "the load line and the glow model are for DC supplies; an AC or RF discharge's voltage is set by "
            "its sheaths and the matching network",
        )
    ]
    if regime in ("rf-volume", "drift-limited"):
        out += [
            ("alpha d and avalanche gain", "electrons oscillate in the gas instead of crossing the gap once"),
            ("current growth", "the Townsend (gamma) mechanism plays no part in volume breakdown"),
        ]
    return tuple(out)


def _hz(f: float) -> str:
    for unit, scale in (("MHz", 1e6), ("kHz", 1e3)):
        if f >= scale:
            return f"{f / scale:.4g} {unit}"
    return f"{f:.4g} Hz"
