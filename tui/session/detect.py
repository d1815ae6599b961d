"""Strikes seen by the instruments: readings that say the gas broke down, proposed as strike marks.

- DC and pulsed DC: the discharge current rises from dark (under ``dark_current``) to lit (over
  ``lit_current``) within ``window`` seconds, while the supply's voltage read-back falls by at least
  ``voltage_fall`` of its recent highest (where a voltage channel exists).
- RF: a DC self-bias appears (from under a fifth of ``bias_on`` to beyond it, either sign), or,
  without a bias channel, the reflected power drops by ``reflected_fall`` of its recent highest while
  the forward power is on.

The voltage proposed is the highest the gap saw just before: the supply's read-back (DC), or half
the electrodes' peak-to-peak voltage (RF, an amplitude). After a detection the detector waits for
the discharge to go dark again before it proposes another. Thresholds: ``[strike_detect]`` in the
bench profile (:mod:`strikeline.profiles.supply`, defaults common practice).
"""

from __future__ import annotations

from collections import deque
from dataclasses import dataclass

from ...drivers.reading import Reading
from ...profiles.supply import StrikeDetection

__all__ = ["Proposal", "StrikeDetector"]

_FORWARD_ON = 1.0
"""W: an RF supply delivering less is taken as off."""


@dataclass(frozen=True)
class Proposal:
    """A strike the instruments saw, waiting for the operator to keep or drop it."""

    t_mono: float
    t_wall: float
    voltage: float | None
    """V across the gap just before ignition (an amplitude for RF); None where no channel reads it."""
    signal: str
    """What showed it, in words with the numbers."""


class StrikeDetector:
    """Feeds on readings; says when they show ignition."""

    def __init__(self, settings: StrikeDetection):
        self.s = settings
        self.recent: dict[str, deque[tuple[float, float]]] = {}
        """(t, value) of each quantity over the last window."""
        self.lit = False

    def _keep(self, r: Reading) -> list[float]:
        """Keep ``r``; the values of its quantity within the window before it."""
        q = self.recent.setdefault(r.quantity, deque())
        while q and q[0][0] < r.t_mono - self.s.window:
            q.popleft()
        earlier = [v for _t, v in q]
        q.append((r.t_mono, r.value))
        return earlier

    def _highest(self, quantity: str, before: float) -> float | None:
        vals = [v for t, v in self.recent.get(quantity, ()) if t <= before]
        return max(vals) if vals else None

    def _latest(self, quantity: str) -> float | None:
        q = self.recent.get(quantity)
        return q[-1][1] if q else None

    def feed(self, r: Reading) -> Proposal | None:
        """Take one reading; a proposal when it completes the signs of ignition."""
        if not r.usable or r.value is None:
            return None
        earlier = self._keep(r)  # only the reading's own quantity is looked back on
        if r.quantity == "current":
            return self._dc(r, earlier)
        if r.quantity == "self_bias":
            return self._bias(r, earlier)
        if r.quantity == "reflected_power" and "self_bias" not in self.recent:
            return self._reflected(r, earlier)
        return None

    def _fire(self, r: Reading, voltage: float | None, signal: str) -> Proposal:
        self.lit = True
        return Proposal(r.t_mono, r.t_wall, voltage, signal)

    def _dc(self, r: Reading, earlier: list[float]) -> Proposal | None:
        i = abs(r.value)
        if i < self.s.dark_current:
            self.lit = False
            return None
        was_dark = any(abs(v) < self.s.dark_current for v in earlier)
        if self.lit or i < self.s.lit_current or not was_dark:
            return None
        peak, now = self._highest("voltage", r.t_mono), self._latest("voltage")
        if peak is not None and now is not None and peak > 0:
            if now > (1.0 - self.s.voltage_fall) * peak:
                return None  # the current rose but the supply held its voltage: not a strike yet
            return self._fire(r, peak, f"current rose to {i * 1e3:.3g} mA, supply fell from {peak:.0f} to {now:.0f} V")
        return self._fire(r, None, f"current rose to {i * 1e3:.3g} mA")

    def _rf_voltage(self, before: float) -> float | None:
        pp = self._highest("rf_voltage", before)
        return None if pp is None else pp / 2.0

    def _bias(self, r: Reading, earlier: list[float]) -> Proposal | None:
        b = abs(r.value)
        if b < self.s.bias_on / 5.0:
            self.lit = False
            return None
        was_dark = any(abs(v) < self.s.bias_on / 5.0 for v in earlier)
        if self.lit or b < self.s.bias_on or not was_dark:
            return None
        return self._fire(r, self._rf_voltage(r.t_mono), f"self-bias appeared: {r.value:.0f} V")

    def _reflected(self, r: Reading, earlier: list[float]) -> Proposal | None:
        forward = self._latest("forward_power")
        if forward is None or forward < _FORWARD_ON:
            self.lit = False
            return None
        peak = max(earlier, default=None)
        if self.lit or peak is None or peak <= 0 or r.value > (1.0 - self.s.reflected_fall) * peak:
            return None
        return self._fire(r, self._rf_voltage(r.t_mono), f"reflected power dropped from {peak:.3g} to {r.value:.3g} W")
