"""Figures of the calibration: the time to fit a bench curve to 200 strike marks."""

from __future__ import annotations

import numpy as np
from timing import best_of

FIGURES = ("fit_200_points_s",)
BUDGETS = {"fit_200_points_s": ("<=", 0.2)}


def measure(quick: bool = False) -> dict[str, float]:
    """Time to fit A, B to 200 strike marks (scipy imported beforehand, as in a running session)."""
    import scipy.optimize  # noqa: F401 - import cost is start-up's, not the fit's
    import scipy.stats  # noqa: F401
    from strikeline.model import paschen
    from strikeline.model.calibration import fit_curve

    rng = np.random.default_rng(0)
    pd = np.geomspace(0.45, 20, 200)
    v = paschen.breakdown_voltage(pd, 7.0, 150.0, 0.07) * np.exp(rng.normal(0, 0.03, 200))
    t = best_of(lambda: fit_curve(pd, v, A=9.0, B=135.0, gamma=0.07, free=("A", "B")), 1 if quick else 5)
    return {"fit_200_points_s": t}
