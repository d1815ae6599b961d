"""Figures of the calibration: the time to fit a bench curve to 200 strike marks."""

from __future__ import annotations

import numpy as np
from timing import best_of

FIGURES = ("fit_200_points_s",)
BUDGETS = {"fit_200_points_s": ("<=", 0.2)}


def measure(quick: bool = False) -> dict[str, float]:
    """Time to fit the ionisation and field scales of argon's law to 200 strike marks (scipy imported
    beforehand, as in a running session; the law's table traced once, as a session holds it)."""
    import scipy.optimize  # noqa: F401 - import cost is start-up's, not the fit's
    import scipy.stats  # noqa: F401
    from strikeline.model.bench import Bench
    from strikeline.model.calibration import ScaledLaw, fit_curve
    from strikeline.model.composition import pure
    from strikeline.model.curve import dc_law
    from strikeline.profiles.gasdata import find_cathode, find_gas

    law = dc_law(Bench("t", pure(find_gas("argon")), find_cathode("Cu"), 0.03))
    rng = np.random.default_rng(0)
    pd = np.geomspace(0.45, 20, 200)
    v = ScaledLaw(law).voltage(pd, np.log([1.3, 0.9, 1.0])) * np.exp(rng.normal(0, 0.03, 200))  # an invented bench
    t = best_of(lambda: fit_curve(pd, v, law, free=("A", "B")), 1 if quick else 5)
    return {"fit_200_points_s": t}
