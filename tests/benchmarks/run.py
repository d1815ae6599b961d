"""strikeline's performance figures, printed as one JSON object with --json.

Budgets (DESIGN.md) are checked here, never in timed tests. Each figure is the best of
several repeats, to keep scheduler noise on a shared 2-core machine out of the ratio.

    python tests/benchmarks/run.py --json
"""

from __future__ import annotations

import argparse
import json
import math
import sys
import time

import numpy as np

BUDGETS = {
    "curve_vs_log": ("<=", 4.0),
    "curve_vs_rootfind": (">=", 100.0),
}


def _best(fn, repeats: int) -> float:
    best = math.inf
    for _ in range(repeats):
        t0 = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t0)
    return best


def curve_figures(n: int = 1_000_000, repeats: int = 15) -> dict[str, float]:
    """Time of an n-point breakdown curve against one np.log and against root finding."""
    from scipy.optimize import brentq
    from strikeline.model import paschen, townsend
    from strikeline.profiles.loader import find_gas

    c = find_gas("argon").constants
    gamma = 0.07
    pd0 = paschen.no_breakdown_pd(c.A, gamma)
    pd = np.geomspace(pd0 * 1.001, pd0 * 1e4, n)
    t_log = _best(lambda: np.log(pd), repeats)
    t_curve = _best(lambda: paschen.breakdown_voltage(pd, c.A, c.B, gamma), repeats)

    # The same curve by solving the Townsend criterion alpha(V/d) d = ln(1 + 1/gamma) for V at
    # each point with scipy's brentq (d = 1 m, so p = pd), on a sample of the points.
    K = math.log1p(1 / gamma)
    sample = pd[:: max(n // 2000, 1)]

    def rootfind():
        out = np.empty_like(sample)
        for i, p in enumerate(sample):
            out[i] = brentq(lambda V, p=p: float(townsend.alpha(V, p, c.A, c.B)) - K, 1e-3, 1e9, xtol=1e-9, rtol=1e-12)
        return out

    t_root = _best(rootfind, 3) * (n / len(sample))
    check = paschen.breakdown_voltage(sample, c.A, c.B, gamma)
    assert np.allclose(rootfind(), check, rtol=1e-8), "root finding disagrees with the closed form"
    return {
        "curve_1e6_ms": t_curve * 1e3,
        "log_1e6_ms": t_log * 1e3,
        "curve_vs_log": t_curve / t_log,
        "curve_vs_rootfind": t_root / t_curve,
    }


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--json", action="store_true", help="print one JSON object of figures")
    args = ap.parse_args(argv)
    figures: dict[str, float] = {}
    figures |= curve_figures()
    verdicts = {}
    for key, (op, budget) in BUDGETS.items():
        if key in figures:
            v = figures[key]
            verdicts[key] = (v <= budget) if op == "<=" else (v >= budget)
    if args.json:
        print(
            json.dumps(
                {
                    "figures": figures,
                    "budgets": {k: f"{o} {b}" for k, (o, b) in BUDGETS.items()},
                    "within_budget": verdicts,
                },
                indent=2,
            )
        )
    else:
        for k, v in figures.items():
            b = BUDGETS.get(k)
            mark = "" if b is None else f"   budget {b[0]} {b[1]}: {'ok' if verdicts[k] else 'OVER'}"
            print(f"{k:<24} {v:10.3f}{mark}")
    return 0 if all(verdicts.values()) else 1


if __name__ == "__main__":
    sys.exit(main())
