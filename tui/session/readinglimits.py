"""Readings far outside what strikeline accepts: skipped as over or under range, said so once.

A value like that is a wrong unit or scale in a bench profile, or a corrupt replay, never a
reading of the bench; the session keeps it in the logbook with the value in its raw text.
"""

from __future__ import annotations

from dataclasses import replace

from ...drivers.reading import Reading, Status
from ...model.limits import LIMITS
from ...model.units import READINGS, si_unit

__all__ = ["READING_BOUNDS", "ReadingLimits"]

READING_BOUNDS = {
    "pressure": (LIMITS["pressure"].low, LIMITS["pressure"].high),
    "voltage": (-LIMITS["voltage"].high, LIMITS["voltage"].high),  # a read-back may be 0 or negative
    "current": (-LIMITS["current"].high, LIMITS["current"].high),
    "flow": (-LIMITS["flow"].high, LIMITS["flow"].high),  # a controller's offset may read below 0
    "forward_power": (-LIMITS["power"].high, LIMITS["power"].high),
    "reflected_power": (-LIMITS["power"].high, LIMITS["power"].high),
    "self_bias": (-LIMITS["voltage"].high, LIMITS["voltage"].high),  # negative on the powered electrode
    "rf_voltage": (-LIMITS["voltage"].high, LIMITS["voltage"].high),
}
"""A reading outside these (SI) is far out of any instrument's range."""


class ReadingLimits:
    """Which channels are out of the limits now, so each going out and coming back is said once."""

    def __init__(self) -> None:
        self.out: set[str] = set()

    def check(self, r: Reading) -> tuple[Reading, str | None]:
        """The reading (over or under range, value moved to its raw text, when outside), and a line
        to show when its channel goes out of the limits or comes back (None otherwise)."""
        bounds = READING_BOUNDS.get(r.quantity)
        inside = r.value is None or bounds is None or bounds[0] <= r.value <= bounds[1]
        was_out = r.channel in self.out
        if inside:
            if was_out and r.value is not None:
                self.out.discard(r.channel)
                return r, f"{r.channel}: readings back inside what strikeline accepts"
            return r, None
        lo, hi = bounds
        status = Status.OVER_RANGE if r.value > hi else Status.UNDER_RANGE
        unit = si_unit(READINGS[r.quantity][0])
        why = f"{r.value:.3g} {unit} is outside the {lo:g} to {hi:g} {unit} strikeline accepts"
        r = replace(r, value=None, status=status, raw=f"{r.raw} ({why})")
        if was_out:
            return r, None
        self.out.add(r.channel)
        return r, f"{r.channel}: {why}; skipped (check the channel's unit and scale)"
