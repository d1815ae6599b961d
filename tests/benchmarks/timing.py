"""Small timing helpers shared by the figure groups."""

from __future__ import annotations

import math
import time
from collections.abc import Callable

__all__ = ["best_of"]


def best_of(fn: Callable[[], object], repeats: int) -> float:
    """The shortest of ``repeats`` timed calls, s: scheduler noise on a shared machine only adds."""
    best = math.inf
    for _ in range(repeats):
        t0 = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t0)
    return best
