"""When the live screen draws: at once for what the operator must see now, seldom for noise.

A reading redraws the screen at once (at most every :data:`MIN_FRAME`) when it changes what is shown:
a channel's state, or a value by more than :data:`NOISE`. Smaller wobbles wait for the heartbeat
(:data:`HEARTBEAT`), and a reading about to go stale brings its own frame at that moment, so the
screen never shows a stale value as live and a steady gauge costs a frame every two seconds. Nothing here
touches the logbook: every reading is logged as it arrives.
"""

from __future__ import annotations

import math

from ...drivers.reading import Reading

__all__ = ["HEARTBEAT", "MIN_FRAME", "NOISE", "SHOWN", "Pacer"]

MIN_FRAME = 0.1
"""s: frames come no closer than this (a burst of readings becomes one frame of the latest)."""
HEARTBEAT = 2.0
"""s: the longest a small change waits to be shown."""
NOISE = 0.02
"""A value moving by less than this share of itself is noise until the heartbeat (ours)."""
SHOWN = frozenset({"pressure", "state", "flow"})
"""Quantities whose values the screen shows or builds on (the forecast's pressure, an interlock's
word, the gas fill); of the others only a change of state counts (their values feed the logbook and
the strike detection, which asks for its own frame)."""


class Pacer:
    """Remembers what the last frame showed and says whether new readings change it enough."""

    def __init__(self) -> None:
        self.shown: dict[str, tuple[str, float | None]] = {}
        self.last_paced = -math.inf
        """When readings last brought a frame (the heartbeat's frames do not count: a change just
        after one is shown at once)."""
        self.frames = 0
        """Frames drawn so far."""

    def drawn(self, readings: dict[str, Reading]) -> None:
        """A frame showed these readings."""
        self.shown = {ch: (str(r.status), r.value) for ch, r in readings.items()}
        self.frames += 1

    def wait(self, now: float) -> float:
        """How long readings that matter wait for their frame: none unless one came within
        :data:`MIN_FRAME` (then the rest of it, and the burst becomes one frame).

        >>> p = Pacer()
        >>> p.wait(5.0), p.paced(5.0), p.wait(5.04) > 0, p.wait(5.2)
        (0.0, None, True, 0.0)
        """
        return max(MIN_FRAME - (now - self.last_paced), 0.0)

    def paced(self, now: float) -> None:
        """Readings brought a frame at ``now``."""
        self.last_paced = now

    def worth_a_frame(self, readings: dict[str, Reading]) -> bool:
        """Whether the readings differ from the last frame by more than noise.

        >>> from strikeline.drivers.reading import Reading, Status
        >>> p = Pacer()
        >>> r = lambda v: {"gauge": Reading("gauge", "pressure", v, Status.OK, "", 0.0, 0.0)}
        >>> p.drawn(r(20.0))
        >>> p.worth_a_frame(r(20.3)), p.worth_a_frame(r(20.5)), p.worth_a_frame({})
        (False, True, True)
        """
        if readings.keys() != self.shown.keys():
            return True
        for ch, r in readings.items():
            status, value = self.shown[ch]
            if str(r.status) != status or (r.value is None) != (value is None):
                return True
            if r.quantity not in SHOWN or r.value is None:
                continue
            if abs(r.value - value) > NOISE * max(abs(value), 1e-300):
                return True
        return False
