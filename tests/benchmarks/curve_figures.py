"""Figures of the breakdown curve: a 1e6-point curve against one np.log pass and against root finding,
and a two-gas mixture's curve against the pure gas's."""

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
    """Time of an n-point breakdown curve against one np.log and against root finding."""
    from scipy.optimize import brentq
    from strikeline.model import paschen, townsend
    from strikeline.profiles.loader import find_gas

    n, repeats, sample_n = (100_000, 3, 200) if quick else (1_000_000, 15, 2000)
    c = find_gas("argon").constants
    gamma = 0.07
    pd0 = paschen.no_breakdown_pd(c.A, gamma)
    pd = np.geomspace(pd0 * 1.001, pd0 * 1e4, n)
    t_log, t_curve, t_mix, t_rf = best_of_each(
        [
            lambda: np.log(pd),
            lambda: paschen.breakdown_voltage(pd, c.A, c.B, gamma),
            lambda: _mixture_curve(pd),
            lambda: _rf_curve(pd),
        ],
        repeats,
    )

    # The same curve by solving the Townsend criterion alpha(V/d) d = ln(1 + 1/gamma) for V at
    # each point with scipy's brentq (d = 1 m, so p = pd), on a sample of the points.
    K = math.log1p(1 / gamma)
    sample = pd[:: max(n // sample_n, 1)]

    def rootfind():
        out = np.empty_like(sample)
        for i, p in enumerate(sample):
            out[i] = brentq(lambda V, p=p: float(townsend.alpha(V, p, c.A, c.B)) - K, 1e-3, 1e9, xtol=1e-9, rtol=1e-12)
        return out

    t_root = best_of(rootfind, 1 if quick else 3) * (n / len(sample))
    check = paschen.breakdown_voltage(sample, c.A, c.B, gamma)
    assert np.allclose(rootfind(), check, rtol=1e-8), "root finding disagrees with the closed form"
    scale = 1e6 / n  # quoted per million points
    return {
        "curve_1e6_ms": t_curve * 1e3 * scale,
        "log_1e6_ms": t_log * 1e3 * scale,
        "curve_vs_log": t_curve / t_log,
        "curve_vs_rootfind": t_root / t_curve,
        "mixture_curve_1e6_ms": t_mix * 1e3 * scale,
        "mixture_vs_pure": t_mix / t_curve,
        "rf_curve_1e6_ms": t_rf * 1e3 * scale,
        "rf_vs_dc": t_rf / t_curve,
    }


def _rf_curve(pd):
    """Argon at 13.56 MHz across 2 cm over ``pd``, from scratch: both traced tables (volume breakdown
    and the DC mechanism with fewer ions) are built inside the timing, then the curve is read off."""
    from strikeline.model.alternating import AlternatingLaw
    from strikeline.model.bench import Component, Mixture
    from strikeline.model.breakdown import PaschenLaw
    from strikeline.profiles.loader import find_gas

    ar = find_gas("argon")
    law = AlternatingLaw(Mixture((Component(ar, 1.0),)), 13.56e6, 0.02, PaschenLaw(ar.constants, 0.07))
    return law.voltage(pd)[0]


def _mixture_curve(pd):
    """Argon with 20 % oxygen over ``pd``, from scratch: the law's traced table is built inside the
    timing (a new mixture each call), then the curve is read off it."""
    from strikeline.model.breakdown import MixtureLaw
    from strikeline.profiles.fill import read_fill

    law = MixtureLaw(read_fill("argon:80,oxygen:20").mixture, (0.07, 0.01))
    return law.voltage(pd)[0]
