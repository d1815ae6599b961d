"""Judgements on the breakdown itself: validity of the law, the bench curve, margin, streamers.

Each function returns a list of :class:`~strikeline.model.results.Flag`, every one with its
level, a one-line reason carrying the numbers, and the method behind it. SI in.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

from . import constants as _c
from .bench import BenchCurve, Component, Gas, TownsendConstants, UniformFieldLaw
from .results import Flag

__all__ = [
    "MIXTURE_UNCERTAINTY",
    "RAETHER_ALPHA_D",
    "STREAMER_CHECK_PD",
    "STREAMER_PD",
    "curve_flags",
    "margin_flags",
    "mixture_flags",
    "no_breakdown_flag",
    "streamer_flags",
    "validity_flags",
]

TORR_CM = _c.torr * _c.centi
"""1 Torr cm in Pa m."""

RAETHER_ALPHA_D = math.log(1e8)
"""alpha d at which an avalanche of ~1e8 electrons turns into a streamer (Raether-Meek)."""
STREAMER_PD = 200 * TORR_CM
"""Above about 200 Torr cm breakdown proceeds by streamers, not Townsend generations
(Raizer 1991, ch. 12, from memory)."""
STREAMER_CHECK_PD = STREAMER_PD / 10
"""Below this (20 Torr cm, our choice: a tenth of the streamer regime) the Townsend picture
holds and alpha d at the applied voltage says nothing about streamers: no flag is raised."""

_CURVE_METHOD = "least-squares fit of Paschen's law to the bench's strike marks"
MIXTURE_UNCERTAINTY = 0.10
"""Added to the constants' relative uncertainty for a mixture or an attaching gas: linear mixing
ignores the electron energy distribution the mixture sets, and the attachment data are borrowed
from air (our judgement)."""
TD_PER_V_PER_PA_M = 1.380649e-23 * 273.15 / 1e-21
"""E/N in Td per E/p in V/(Pa m) at 0 C (N = p / k T)."""


def mixture_flags(
    composition: str,
    components: Sequence[Component],
    e_over_p: float | None,
    critical: float | None,
    penning: Sequence[tuple[Gas, Gas]],
    assumptions: Sequence[str],
) -> list[Flag]:
    """What a mixture (or an attaching gas) adds: the mixing rule in use, Penning pairs, the
    attachment limit, and gases whose data are used outside their fitted E/p range."""
    flags: list[Flag] = []
    if len(components) > 1:
        flags.append(
            Flag(
                "linear_mixing",
                "ok",
                f"{composition}: coefficients mixed by mole fraction; the breakdown band is widened by "
                f"{MIXTURE_UNCERTAINTY:.0%} for it",
                "; ".join(assumptions),
            )
        )
    for big, small in penning:
        flags.append(
            Flag(
                "penning",
                "watch",
                f"{big.key} with {small.key} is a Penning mixture: {big.key} metastables "
                f"({big.metastable_energy:g} eV) ionise {small.key} ({small.ionisation_energy:g} eV), so it breaks "
                "down well below this forecast; record strikes and fit this bench's own curve (strikeline fit)",
                "Penning ionisation: a metastable level above the other gas's ionisation energy "
                "(NIST levels, from memory)",
            )
        )
    if critical is not None:
        td = critical * TD_PER_V_PER_PA_M
        near = e_over_p is not None and e_over_p < 1.3 * critical
        flags.append(
            Flag(
                "attachment_limit",
                "watch" if near else "ok",
                f"electron attachment: below E/N {td:.0f} Td (alpha = eta) electrons attach faster than they multiply"
                + (
                    f"; breakdown here needs {e_over_p * TD_PER_V_PER_PA_M:.0f} Td, close to that limit: a long gap "
                    "breaks down near the limit field whatever its length"
                    if near
                    else ""
                ),
                "Townsend criterion with attachment, gamma alpha/(alpha - eta) (exp((alpha - eta) d) - 1) = 1",
            )
        )
    if e_over_p is not None:
        outside = [c.gas for c in components if c.fraction >= 0.05 and not _inside(c.gas, e_over_p)]
        if outside:
            flags.append(
                Flag(
                    "outside_fitted_range",
                    "watch",
                    f"E/p at breakdown {e_over_p:.3g} V/(Pa m) is outside the range fitted for "
                    f"{', '.join(g.key for g in outside)}: breakdown voltage extrapolated",
                    "; ".join(g.constants.source for g in outside),
                )
            )
    return flags


def _inside(gas: Gas, y: float) -> bool:
    low = gas.low_field.E_over_p_low if gas.low_field is not None else gas.constants.E_over_p_low
    return low <= y <= gas.constants.E_over_p_high


def no_breakdown_flag(rpd: float, pd0: float, raise_to: float) -> Flag:
    """No voltage breaks the gap down: ``rpd`` (Pa m) is at or left of the asymptote ``pd0``;
    ``raise_to`` is the pressure (Pa) above which this gap can break down."""
    return Flag(
        "no_breakdown",
        "watch",
        f"pd {rpd:.3g} Pa m is at or left of the asymptote {pd0:.3g} Pa m: "
        f"no voltage breaks this gap down; raise the pressure above {raise_to:.3g} Pa",
        "Paschen's law, Townsend criterion",
    )


def validity_flags(
    rpd: float,
    vb: float | None,
    weight: float,
    e_over_p: float | None,
    raise_to: float,
    pd0: float,
    c: TownsendConstants,
    law: UniformFieldLaw | None,
) -> list[Flag]:
    """Whether the law behind V_b holds at reduced pd ``rpd`` (Pa m): no breakdown at all, E/p
    outside the constants' fitted range, or the empirical air law in use or beyond its range.

    ``raise_to`` is the pressure (Pa) above which this gap can break down, ``pd0`` the
    asymptote (Pa m), ``weight`` the uniform-field law's share of V_b.
    """
    flags: list[Flag] = []
    if vb is None:
        flags.append(no_breakdown_flag(rpd, pd0, raise_to))
    elif weight < 1 and e_over_p is not None and not (c.E_over_p_low <= e_over_p <= c.E_over_p_high):
        flags.append(
            Flag(
                "outside_fitted_range",
                "watch",
                f"E/p at breakdown {e_over_p:.3g} V/(Pa m) is outside the "
                f"{c.E_over_p_low:.3g} to {c.E_over_p_high:.3g} V/(Pa m) "
                "the A, B pair was fitted over: breakdown voltage extrapolated",
                c.source,
            )
        )
    if law is not None and weight > 0:
        x = rpd * (law.reference_temperature / c.reference_temperature) / law.reference_pressure
        if x > law.valid_to:
            flags.append(
                Flag(
                    "outside_fitted_range",
                    "watch",
                    f"delta d = {x / _c.centi:.3g} cm is beyond the {law.valid_to / _c.centi:.3g} cm "
                    "the uniform-field law is used to: breakdown voltage extrapolated",
                    law.source,
                )
            )
        else:
            flags.append(
                Flag(
                    "uniform_field_law",
                    "ok",
                    f"delta d = {x / _c.centi:.3g} cm: the empirical uniform-field law for air is used "
                    f"({'blended with Paschen' if weight < 1 else 'constant A, B over-predict here'})",
                    law.source,
                )
            )
    return flags


def curve_flags(cv: BenchCurve, rpd: float) -> list[Flag]:
    """The fitted bench curve is in use, and whether ``rpd`` (Pa m) lies where it was fitted."""
    flags = [
        Flag(
            "bench_curve",
            "ok",
            f"using this bench's curve (fitted {cv.fitted_on} to {cv.n_points} strikes, rms {cv.rms_residual:.0f} V) "
            "in place of the textbook constants",
            _CURVE_METHOD,
        )
    ]
    if not cv.pd_low / 1.5 <= rpd <= cv.pd_high * 1.5:
        flags.append(
            Flag(
                "outside_fitted_range",
                "watch",
                f"pd {rpd:.3g} Pa m is outside the {cv.pd_low:.3g} to {cv.pd_high:.3g} Pa m the bench curve was fitted "
                "over: extrapolated; record strikes here",
                _CURVE_METHOD,
            )
        )
    return flags


def margin_flags(
    V: float, vb: float | None, band: tuple[float | None, float | None], law: str, u: float | None
) -> list[Flag]:
    """Whether ``V`` (V) strikes, fails to, or sits inside V_b's uncertainty ``band`` (V).

    ``u`` is the constants' relative uncertainty (None: the band is a bench curve's).
    """
    if vb is None:
        return []
    if u is None:
        method = "bench curve and its 95 % prediction band"
    elif law == "paschen":
        method = f"Paschen's law; V_b band from the gamma range and +/-{u:.0%} for the constants"
    elif law == "alternating":
        method = f"breakdown in an alternating field (model/alternating.py); V_b band +/-{u:.0%}"
    elif law == "mixture":
        method = (
            f"Townsend criterion with attachment, linear mixing; V_b band from the gamma range and +/-{u:.0%} "
            "for the constants and the mixing"
        )
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


def streamer_flags(V: float, vb: float | None, ad: float, rpd: float, weight: float) -> list[Flag]:
    """Spark or streamer risk at high pd: the Raether-Meek criterion on alpha d at ``V``."""
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
                f"pd {rpd:.3g} Pa m is in the streamer regime: breakdown "
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
