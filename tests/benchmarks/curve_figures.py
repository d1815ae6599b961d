"""Figures of the breakdown curve: a 1e6-point curve of argon's default law against one np.log pass and
against root finding, and a two-gas mixture's and an RF curve against the pure gas's."""

from __future__ import annotations

import math

import numpy as np
from timing import best_of, best_of_each

FIGURES = (
    "curve_1e6_ms",
    "log_1e6_ms",
    "curve_vs_log",
    "curve_vs_rootfind",
    "mixture_curve_1e6_ms",
    "mixture_vs_pure",
    "rf_curve_1e6_ms",
    "rf_vs_dc",
)
BUDGETS = {
    "rf_vs_dc": ("<=", 4.0),  # "no more than a few DC curves"
    "curve_vs_log": ("<=", 2.0),
    "curve_vs_rootfind": (">=", 100.0),
    "mixture_vs_pure": ("<=", 2.0),  # no more than the number of components (two) times a pure curve
}


def measure(quick: bool = False) -> dict[str, float]:
    """Time of an n-point breakdown curve against one np.log and against root finding (argon's law, its
    table traced beforehand as a running session holds it); the mixture and RF curves against the
    pure gas's, each law built from scratch inside the timing (its traced tables are the price of a
    new fill)."""
    from scipy.optimize import brentq

    n, repeats, sample_n = (100_000, 3, 200) if quick else (1_000_000, 15, 2000)
    pd0 = _law("argon").minimum()[0]
    pd = np.geomspace(pd0 / 20, pd0 * 1e3, n)  # far up the left branch to the high-pd right branch
    law = _law("argon", cached=True)
    law.voltage(pd[:2])  # its table traced once, as the screen's law is (laws are kept per fill)
    t_log, t_curve, t_new, t_mix, t_rf = best_of_each(
        [
            lambda: np.log(pd),
            lambda: law.voltage(pd)[0],
            lambda: _law("argon").voltage(pd)[0],
            lambda: _law("argon:80,oxygen:20").voltage(pd)[0],
            lambda: _rf_curve(pd),
        ],
        repeats,
    )

    # The same curve by solving the Townsend criterion alpha d = ln(1 + 1/gamma) for the field at each
    # point with scipy's brentq (the law's alpha/p and its E/N-dependent gamma), on a sample of the points.
    sample = pd[:: max(n // sample_n, 1)]

    def criterion(lny, x):
        y = math.exp(lny)
        return x * float(law.a(y)) - math.log1p(1 / float(law.g(y)))

    def rootfind():
        out = np.empty_like(sample)
        for i, x in enumerate(sample):
            out[i] = math.exp(brentq(criterion, math.log(1e-2), math.log(1e7), args=(x,), xtol=1e-12)) * x
        return out

    t_root = best_of(rootfind, 1 if quick else 3) * (n / len(sample))
    check = law.voltage(sample)[0]
    assert np.allclose(rootfind(), check, rtol=1e-5), "root finding disagrees with the traced law"  # traced: ~1e-6
    scale = 1e6 / n  # quoted per million points
    return {
        "curve_1e6_ms": t_curve * 1e3 * scale,
        "log_1e6_ms": t_log * 1e3 * scale,
        "curve_vs_log": t_curve / t_log,
        "curve_vs_rootfind": t_root / t_curve,
        "mixture_curve_1e6_ms": t_mix * 1e3 * scale,
        "mixture_vs_pure": t_mix / t_new,
        "rf_curve_1e6_ms": t_rf * 1e3 * scale,
        "rf_vs_dc": t_rf / t_new,
    }


def _law(fill_text: str, cached: bool = False):
    """The default law of ``fill_text`` on copper; a new one (nothing of its table traced yet) unless
    ``cached``."""
    from strikeline.model.breakdown import Law, law_for
    from strikeline.profiles.fill import read_fill
    from strikeline.profiles.gasdata import find_cathode

    fill = read_fill(fill_text).composition
    cu = find_cathode("Cu")
    yields = tuple(cu.yield_for(c.gas) for c in fill.components)
    if cached:
        return law_for(fill, yields)
    uniform = fill.main.law if fill.pure else None
    return Law(fill, yields, uniform, (1.0, 1.0, 1.0), "value")


def _rf_curve(pd):
    """Argon at 13.56 MHz across 2 cm over ``pd``, from scratch: both traced tables (volume breakdown
    and the DC mechanism with fewer ions) are built inside the timing, then the curve is read off."""
    from strikeline.model.alternating import AlternatingLaw

    dc = _law("argon")
    return AlternatingLaw(dc.fill, 13.56e6, 0.02, dc).voltage(pd)[0]
