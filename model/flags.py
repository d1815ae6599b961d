"""Judgements on the breakdown itself: the field, the data behind the law, the bench curve, margin,
streamers, mixtures.

Each function returns a list of :class:`~strikeline.model.results.Flag`, every one with its
level, a one-line reason carrying the numbers, and the method behind it (sources as [keys] of the
bibliography). SI in.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

from . import constants as _c
from .bench import Bench, BenchCurve
from .composition import Composition
from .gas import Gas, UniformFieldLaw
from .ionisation import TD_PER_V_PER_PA_M
from .sentence import Flag, flag, q

__all__ = [
    "MIXTURE_UNCERTAINTY",
    "OUTSIDE_DATA_UNCERTAINTY",
    "RAETHER_ALPHA_D",
    "STREAMER_CHECK_PD",
    "STREAMER_PD",
    "TD_PER_V_PER_PA_M",
    "curve_flags",
    "data_flags",
    "field_flags",
    "margin_flags",
    "mixture_flags",
    "no_breakdown_flag",
    "streamer_flags",
    "validity_flags",
]

TORR_CM = _c.torr * _c.centi
"""1 Torr cm in Pa m."""

RAETHER_ALPHA_D = math.log(1e8)
"""alpha d at which an avalanche of ~1e8 electrons turns into a streamer ([raether-1964], [meek-craggs-1953])."""
STREAMER_PD = 200 * TORR_CM
"""Above about 200 Torr cm breakdown proceeds by streamers, not Townsend generations
([raizer-1991] ch. 12, from memory)."""
STREAMER_CHECK_PD = STREAMER_PD / 10
"""Below this (20 Torr cm, our choice: a tenth of the streamer regime) the Townsend picture
holds and alpha d at the applied voltage says nothing about streamers: no flag is raised."""

_CURVE_METHOD = (
    "least-squares fit of the fill's own law (ionisation, field and gamma scaled) to the bench's strike marks"
)
MIXTURE_UNCERTAINTY = 0.10
"""Added to the data's relative uncertainty for a mixture: linear mixing ignores the electron energy
distribution the mixture sets (our judgement)."""
OUTSIDE_DATA_UNCERTAINTY = 0.25
"""Added where the breakdown field lies outside every published segment of a gas's ionisation law:
the law is extrapolated there (our judgement)."""


def field_flags(bench: Bench, alternating: bool, hall: float | None, p_eff: float, pressure: float) -> list[Flag]:
    """A magnetised cathode: the crossed-field effective pressure applied (DC), or not (AC)."""
    if alternating and bench.magnetic_field is not None:
        return [
            Flag(
                "crossed_field_not_applied",
                "watch",
                "magnetised cathode: the crossed-field effective pressure is a DC treatment and is not applied to "
                "this alternating supply; the magnet confines electrons, so breakdown is likely lower than forecast",
                "effective-pressure treatment of crossed E x B fields, DC only (our choice)",
            )
        ]
    if hall is None:
        return []
    return [
        flag(
            "crossed_field",
            "ok",
            "magnetised cathode ({B}): omega_ce/nu_m = {hall}, effective pressure {p_eff} for {p}; an "
            "approximation that treats the whole gap as if it sat in the cathode's field",
            "effective-pressure treatment of crossed E x B fields ([blevin-haydon-1958]; [raizer-1991] sec. 4.6, "
            "from memory)",
            B=q(bench.magnetic_field, "field", "mT", what="magnetic field at the cathode"),
            hall=q(hall, "number", "", what="omega_ce/nu_m"),
            p_eff=q(p_eff, "pressure", "Pa", what="effective pressure"),
            p=q(pressure, "pressure", "Pa", what="pressure"),
        )
    ]


def data_flags(fill: Composition, uncovered: Sequence[Gas], y: float | None, sources: str) -> list[Flag]:
    """What the law rests on here: ionisation data extrapolated beyond every published segment, a default
    curve not checked against a measured minimum, a gas that attaches without attachment data."""
    flags: list[Flag] = []
    if uncovered and y is not None:
        ranges = ", ".join(
            f"{g.key} {g.ionisation.low * TD_PER_V_PER_PA_M:.0f}-{g.ionisation.high * TD_PER_V_PER_PA_M:.0f} Td"
            for g in uncovered
        )
        flags.append(
            flag(
                "outside_fitted_range",
                "watch",
                "breakdown here needs E/N {en}, outside the published ionisation data (" + ranges + "): "
                "extrapolated, the band widened by {widened}",
                sources,
                en=q(y * TD_PER_V_PER_PA_M * 1e-21, "reduced_field", "Td", what="E/N at breakdown"),
                widened=q(OUTSIDE_DATA_UNCERTAINTY, "fraction", "%", ".0%", what="band widened by"),
            )
        )
    for g in fill.gases:
        if not g.minimum_checked:
            flags.append(
                Flag(
                    "curve_unchecked",
                    "ok",
                    f"{g.key}'s default curve is not checked against a measured minimum sparking potential here: "
                    "record strikes and fit this bench's own curve (strikeline fit)",
                    g.yield_.source,
                )
            )
        if g.attaches_unmodelled:
            flags.append(
                Flag(
                    "attachment_not_modelled",
                    "watch",
                    f"{g.key} attaches electrons but no attachment data are held here: at high pd it breaks down "
                    "above this forecast",
                    "electron attachment left out for lack of data (our statement)",
                )
            )
    return flags


def mixture_flags(
    composition: str,
    fill: Composition,
    e_over_p: float | None,
    critical: float | None,
    penning: Sequence[tuple[Gas, Gas]],
    assumptions: Sequence[str],
) -> list[Flag]:
    """What a mixture or an attaching gas adds: the mixing rule in use, Penning pairs, the attachment
    limit."""
    flags: list[Flag] = []
    if not fill.pure:
        flags.append(
            flag(
                "linear_mixing",
                "ok",
                composition + ": coefficients mixed by mole fraction; the breakdown band is widened by {widened} "
                "for it",
                "; ".join(assumptions),
                widened=q(MIXTURE_UNCERTAINTY, "fraction", "%", ".0%", what="band widened by"),
            )
        )
    for big, small in penning:
        flags.append(
            flag(
                "penning",
                "watch",
                f"{big.key} with {small.key} is a Penning mixture: {big.key} metastables "
                "({metastable}) ionise " + small.key + " ({ionisation}), so it breaks "
                "down well below this forecast; record strikes and fit this bench's own curve (strikeline fit)",
                "Penning ionisation: a metastable level above the other gas's ionisation energy ([nist-asd], from "
                "memory)",
                metastable=q(big.metastable_energy * _c.e, "energy", "eV", "g", what="metastable level"),
                ionisation=q(small.ionisation_energy * _c.e, "energy", "eV", "g", what="ionisation energy"),
            )
        )
    if critical is not None:
        td = critical * TD_PER_V_PER_PA_M
        near = e_over_p is not None and e_over_p < 1.3 * critical
        extra = {}
        if near:
            extra["needs"] = q(e_over_p * TD_PER_V_PER_PA_M * 1e-21, "reduced_field", "Td", ".0f", "E/N at breakdown")
        flags.append(
            flag(
                "attachment_limit",
                "watch" if near else "ok",
                "electron attachment: below E/N {limit} (alpha = eta) electrons attach faster than they multiply"
                + (
                    "; breakdown here needs {needs}, close to that limit: a long gap breaks down near the limit "
                    "field whatever its length"
                    if near
                    else ""
                ),
                "Townsend criterion with attachment, gamma alpha/(alpha - eta) (exp((alpha - eta) d) - 1) = 1",
                limit=q(td * 1e-21, "reduced_field", "Td", ".0f", "critical E/N (alpha = eta)"),
                **extra,
            )
        )
    return flags


def no_breakdown_flag(rpd: float, pd0: float, raise_to: float) -> Flag:
    """No voltage breaks the gap down: reduced pd ``rpd`` (Pa m) is at or left of the curve's end
    ``pd0``; ``raise_to`` is the pressure (Pa) above which this gap can break down."""
    return flag(
        "no_breakdown",
        "watch",
        "reduced pd {rpd} is at or left of the curve's left end {pd0}: no voltage breaks this gap down; raise "
        "the pressure above {raise_to}",
        "Townsend criterion with the gas's ionisation and gamma",
        rpd=q(rpd, "pd", "Pa m", what="reduced pd"),
        pd0=q(pd0, "pd", "Pa m", what="reduced pd of the curve's left end"),
        raise_to=q(raise_to, "pressure", "Pa", what="least pressure that breaks this gap down"),
    )


def validity_flags(
    rpd: float,
    vb: float | None,
    weight: float,
    pd0: float,
    raise_to: float,
    law: UniformFieldLaw | None,
    T_ref: float,
) -> list[Flag]:
    """Whether anything breaks the gap down at reduced pd ``rpd`` (Pa m), and whether the empirical air
    law is in use or beyond its range (``weight`` its share of V_b)."""
    flags: list[Flag] = []
    if vb is None:
        flags.append(no_breakdown_flag(rpd, pd0, raise_to))
    if law is not None and weight > 0:
        x = rpd * (law.reference_temperature / T_ref) / law.reference_pressure
        if x > law.valid_to:
            flags.append(
                flag(
                    "outside_fitted_range",
                    "watch",
                    "delta d = {x} is beyond the {valid_to} the uniform-field law is used to: breakdown voltage "
                    "extrapolated",
                    law.source,
                    x=q(x, "length", "cm", what="relative density times gap"),
                    valid_to=q(law.valid_to, "length", "cm", what="end of the law's range"),
                )
            )
        else:
            flags.append(
                flag(
                    "uniform_field_law",
                    "ok",
                    "delta d = {x}: the empirical uniform-field law for air is used "
                    f"({'blended with the Townsend law' if weight < 1 else 'alone'})",
                    law.source,
                    x=q(x, "length", "cm", what="relative density times gap"),
                )
            )
    return flags


def curve_flags(cv: BenchCurve, rpd: float) -> list[Flag]:
    """The fitted bench curve is in use, and whether ``rpd`` (Pa m) lies where it was fitted."""
    flags = [
        flag(
            "bench_curve",
            "ok",
            f"using this bench's curve (fitted {cv.fitted_on} to {cv.n_points} strikes, rms {{rms}}) in place of the "
            "default one",
            _CURVE_METHOD,
            rms=q(cv.rms_residual, "voltage", "V", ".0f", "rms residual of the fit"),
        )
    ]
    if not cv.pd_low / 1.5 <= rpd <= cv.pd_high * 1.5:
        flags.append(
            flag(
                "outside_fitted_range",
                "watch",
                "reduced pd {rpd} is outside the {low} to {high} the bench curve was fitted over: extrapolated; "
                "record strikes here",
                _CURVE_METHOD,
                rpd=q(rpd, "pd", "Pa m", what="reduced pd"),
                low=q(cv.pd_low, "pd", "Pa m", what="least reduced pd fitted", bare=True),
                high=q(cv.pd_high, "pd", "Pa m", what="greatest reduced pd fitted"),
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
        method = f"Townsend criterion with the gas's ionisation and gamma; V_b band from the gamma range and +/-{u:.0%}"
    elif law == "alternating":
        method = f"breakdown in an alternating field (model/alternating.py); V_b band +/-{u:.0%}"
    elif law == "mixture":
        method = f"Townsend criterion with attachment, linear mixing; V_b band from the gamma range and +/-{u:.0%}"
    else:
        method = f"uniform-field law for air, +/-{u:.0%}"
    lo, hi = band
    if V >= vb and (hi is None or V >= hi):
        return [
            flag(
                "strikes",
                "ok",
                "{V} is {excess} ({share}) above the {vb} breakdown voltage, clear of its uncertainty band",
                method,
                V=q(V, "voltage", "V", ".0f", "supply voltage"),
                excess=q(V - vb, "voltage", "V", ".0f", "margin"),
                share=q((V - vb) / vb, "fraction", "%", "+.0%", "margin over the breakdown voltage"),
                vb=q(vb, "voltage", "V", ".0f", "breakdown voltage"),
            )
        ]
    if lo is not None and V < lo:
        return [
            flag(
                "below_breakdown",
                "watch",
                "{V} is {short} short of the {vb} breakdown voltage, below its whole uncertainty band: the gap "
                "will not strike",
                method,
                V=q(V, "voltage", "V", ".0f", "supply voltage"),
                short=q(vb - V, "voltage", "V", ".0f", "shortfall"),
                vb=q(vb, "voltage", "V", ".0f", "breakdown voltage"),
            )
        ]
    band_text = f"{'?' if lo is None else f'{lo:.0f}'}-{'?' if hi is None else f'{hi:.0f}'} V"
    verdict = "strike expected" if V >= vb else "no strike expected"
    return [
        flag(
            "marginal",
            "watch",
            "{V} against a {vb} breakdown voltage (" + verdict + ", margin {margin}) sits inside the model's "
            "uncertainty band " + band_text + ": it may or may not strike",
            method,
            V=q(V, "voltage", "V", ".0f", "supply voltage"),
            vb=q(vb, "voltage", "V", ".0f", "breakdown voltage"),
            margin=q(V - vb, "voltage", "V", "+.0f", "margin"),
        )
    ]


def streamer_flags(V: float, vb: float | None, ad: float, rpd: float, weight: float) -> list[Flag]:
    """Spark or streamer risk at high pd: the Raether-Meek criterion on alpha d (ionisation, before
    attachment) at ``V``."""
    method = (
        "Raether-Meek criterion: an avalanche of ~1e8 electrons (alpha d ~ 18-20) becomes a streamer "
        "([raether-1964], [meek-craggs-1953])"
    )
    if ad >= RAETHER_ALPHA_D:
        return [
            flag(
                "spark",
                "danger",
                "alpha d = {ad} at {V} reaches the Raether-Meek threshold {limit} (gain ~1e8): a streamer forms "
                "and the gap sparks rather than glows",
                method,
                ad=q(ad, "number", "", ".1f", "alpha d"),
                V=q(V, "voltage", "V", ".0f", "supply voltage"),
                limit=q(RAETHER_ALPHA_D, "number", "", ".1f", "Raether-Meek alpha d"),
            )
        ]
    if vb is not None and V >= vb and (rpd >= STREAMER_PD or weight >= 0.5):
        return [
            flag(
                "spark",
                "danger",
                "reduced pd {rpd} is in the streamer regime: breakdown here is a spark channel that a "
                "low-impedance supply turns into an arc, not a glow",
                method + "; streamer regime above ~200 Torr cm ([raizer-1991], from memory)",
                rpd=q(rpd, "pd", "Pa m", what="reduced pd"),
            )
        ]
    if ad >= 0.75 * RAETHER_ALPHA_D:
        return [
            flag(
                "streamer_near",
                "watch",
                "alpha d = {ad} is within 25 % of the Raether-Meek threshold {limit}: avalanches approach streamer "
                "size",
                method,
                ad=q(ad, "number", "", ".1f", "alpha d"),
                limit=q(RAETHER_ALPHA_D, "number", "", ".1f", "Raether-Meek alpha d"),
            )
        ]
    return []
