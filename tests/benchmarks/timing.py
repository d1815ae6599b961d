"""Small timing helpers shared by the figure groups."""

from __future__ import annotations

import math
import time
from collections.abc import Callable

__all__ = ["best_of", "best_of_each"]


def best_of(fn: Callable[[], object], repeats: int) -> float:
    """The shortest of ``repeats`` timed calls, s: scheduler noise on a shared machine only adds."""
    best = math.inf
    for _ in range(repeats):
        t0 = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t0)
    return best


def best_of_each(fns: list[Callable[[], object]], repeats: int) -> list[float]:
    """The shortest timed call of each of ``fns``, s, their calls taken in turn: a figure that is a
    ratio of two then compares them under the same load (a shared machine's speed wanders)."""
    best = [math.inf] * len(fns)
    for _ in range(repeats):
        for i, fn in enumerate(fns):
            t0 = time.perf_counter()
            fn()
            best[i] = min(best[i], time.perf_counter() - t0)
    return best
