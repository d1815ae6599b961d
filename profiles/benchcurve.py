"""A bench curve fitted to this bench's strikes, as the [curve] section of its bench file.

``strikeline fit --save`` writes it with :func:`with_curve_section`: the scales of the fill's own law
(``alpha_scale``, ``field_scale``, ``gamma_scale``) and their covariance. The loader reads it back with
:func:`curve_section`, refusing a curve fitted for another gas fill or cathode (a mixture's fractions
may differ by :data:`strikeline.model.composition.SAME_WITHIN`). A section an earlier version wrote
(Paschen's closed form: ``A_per_Pa_m``, ``B_V_per_Pa_m``, ``gamma``) is read as that curve still.
"""

from __future__ import annotations

import math

from ..model.bench import BenchCurve, Cathode
from ..model.composition import same_composition
from .fields import Table
from .fill import read_fill
from .gasdata import find_cathode

__all__ = ["curve_section", "curve_toml", "with_curve_section"]

_CURVE_FIELDS = (
    "gas",
    "cathode",
    "fitted_on",
    "n_points",
    "free",
    "alpha_scale",
    "field_scale",
    "gamma_scale",
    "A_per_Pa_m",
    "B_V_per_Pa_m",
    "gamma",
    "A_sigma",
    "B_sigma",
    "gamma_sigma",
    "covariance_ln",
    "residual_scale",
    "t_quantile",
    "rms_residual_V",
    "pd_low_Pa_m",
    "pd_high_Pa_m",
    "marks",
)


def curve_section(t: Table | None, composition: str, cathode: Cathode) -> BenchCurve | None:
    """The fitted bench curve, as ``strikeline fit --save`` writes it, for the bench's gas fill
    ``composition`` (a composition key) on ``cathode``."""
    if t is None:
        return None
    t.only(_CURVE_FIELDS)
    fitted_fill, fitted_cathode = t.lookup("gas", read_fill), t.lookup("cathode", find_cathode)
    if fitted_fill.flows:
        raise t.fail("gas", f"{t.data['gas']!r} gives flows; a curve names its fill by parts")
    if not same_composition(fitted_fill.key, composition) or fitted_cathode.key != cathode.key:
        raise t.fail(
            "gas",
            f"the curve was fitted for {fitted_fill.key} on {fitted_cathode.key}, but the bench is {composition} on "
            f"{cathode.key}: refit it, or delete the [curve] section",
        )
    cov = t.data.get("covariance_ln")
    ok = (
        isinstance(cov, list)
        and len(cov) == 3
        and all(
            isinstance(r, list) and len(r) == 3 and all(isinstance(x, int | float) and math.isfinite(x) for x in r)
            for r in cov
        )
    )
    if not ok:
        raise t.fail("covariance_ln", "is not a 3 x 3 list of numbers")
    free = t.data.get("free", ["A", "B"])
    if not isinstance(free, list) or not set(free) <= {"A", "B", "gamma"}:
        raise t.fail("free", f"{free!r} is not a list drawn from A, B, gamma")
    pd_low, pd_high = t.number("pd_low_Pa_m", 1e-9, 1e6), t.number("pd_high_Pa_m", 1e-9, 1e6)
    if not pd_low < pd_high:
        raise t.fail("pd_high_Pa_m", f"{pd_high!r} is not above pd_low_Pa_m {pd_low!r}: the fitted range is inverted")
    if t.has("alpha_scale"):
        scales = tuple(t.number(k, 1e-3, 1e3) for k in ("alpha_scale", "field_scale", "gamma_scale"))
        base = None
    else:  # written by an earlier version: Paschen's closed form with its own constants
        scales = (1.0, 1.0, 1.0)
        base = (t.number("A_per_Pa_m", 1e-3, 1e4), t.number("B_V_per_Pa_m", 1e-1, 1e5), t.number("gamma", 1e-6, 1.0))
    return BenchCurve(
        alpha_scale=scales[0],
        field_scale=scales[1],
        gamma_scale=scales[2],
        covariance=tuple(tuple(float(x) for x in r) for r in cov),
        rms_residual=t.number("rms_residual_V", 0, 1e6),
        n_points=int(t.number("n_points", 1, 1e6)),
        pd_low=pd_low,
        pd_high=pd_high,
        gas=fitted_fill.key,
        cathode=cathode.key,
        fitted_on=t.string("fitted_on"),
        residual_scale=t.number("residual_scale", 0, 10),
        t_quantile=t.number("t_quantile", 0.5, 1000),
        free=tuple(free),
        marks=_marks(t),
        base=base,
    )


def _marks(t: Table) -> tuple[tuple[float, float], ...]:
    """The fitted strikes, [[reduced pd Pa m, V], ...] (optional: curves saved before kept none)."""
    raw = t.data.get("marks", [])
    ok = isinstance(raw, list) and all(
        isinstance(m, list)
        and len(m) == 2
        and all(isinstance(x, int | float) and not isinstance(x, bool) and math.isfinite(x) and x > 0 for x in m)
        for m in raw
    )
    if not ok:
        raise t.fail("marks", "is not a list of [reduced pd in Pa m, V] pairs of numbers above zero")
    return tuple((float(a), float(b)) for a, b in raw)


def curve_toml(c: BenchCurve) -> str:
    """The ``[curve]`` section for a fitted bench curve."""
    cov = ", ".join("[" + ", ".join(repr(x) for x in row) + "]" for row in c.covariance)
    if c.base is None:
        law = f"alpha_scale = {c.alpha_scale!r}\nfield_scale = {c.field_scale!r}\ngamma_scale = {c.gamma_scale!r}\n"
    else:
        A, B, gamma = c.base
        law = f"A_per_Pa_m = {A!r}\nB_V_per_Pa_m = {B!r}\ngamma = {gamma!r}\n"
    return (
        "[curve]\n"
        "# Fitted by strikeline fit: the fill's own law, its ionisation, field and gamma scaled to this bench's\n"
        "# strike marks. Do not edit by hand.\n"
        f'gas = "{c.gas}"\ncathode = "{c.cathode}"\nfitted_on = "{c.fitted_on}"\nn_points = {c.n_points}\n'
        f"free = [{', '.join(repr(p).replace(chr(39), chr(34)) for p in c.free)}]\n"
        f"{law}"
        f"covariance_ln = [{cov}]\nresidual_scale = {c.residual_scale!r}\nt_quantile = {c.t_quantile!r}\n"
        f"rms_residual_V = {c.rms_residual!r}\npd_low_Pa_m = {c.pd_low!r}\npd_high_Pa_m = {c.pd_high!r}\n"
        f"marks = [{', '.join(f'[{a!r}, {b!r}]' for a, b in c.marks)}]\n"
    )


def with_curve_section(text: str, curve: BenchCurve) -> str:
    """Bench-file ``text`` with its [curve] section (if any) replaced by ``curve``'s; every other
    line is kept as the user wrote it."""
    kept: list[str] = []
    skipping = False
    for line in text.splitlines():
        stripped = line.strip()
        if stripped.startswith("["):
            skipping = stripped.replace(" ", "") == "[curve]"
        if not skipping:
            kept.append(line)
    return "\n".join(kept).rstrip() + "\n\n" + curve_toml(curve)
