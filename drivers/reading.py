"""The one reading type every instrument source yields."""

from __future__ import annotations

from dataclasses import dataclass, replace
from enum import StrEnum

__all__ = ["QUANTITIES", "Reading", "Status"]

QUANTITIES = (
    "pressure",
    "voltage",
    "current",
    "flow",
    "state",
    "forward_power",
    "reflected_power",
    "self_bias",
    "rf_voltage",
)
"""What a channel reads. An RF supply's forward and reflected power (W); a matching network's DC
self-bias (V) and the electrodes' peak-to-peak voltage (``rf_voltage``, V)."""
"""What a channel can measure; the value is in Pa, V, A, Pa m^3/s (a gas flow) or, for a state
such as an interlock bit, the number the instrument gave (its words come from the profile)."""


class Status(StrEnum):
    """How far a reading can be trusted."""

    OK = "ok"
    OVER_RANGE = "over_range"
    UNDER_RANGE = "under_range"
    SENSOR_ERROR = "sensor_error"
    GARBLED = "garbled"
    LOST = "lost"
    STALE = "stale"


@dataclass(frozen=True)
class Reading:
    """One value from one channel, in SI, with where and when it came from."""

    channel: str
    """The channel's name in the bench profile."""
    quantity: str
    """One of :data:`QUANTITIES`."""
    value: float | None
    """SI value as the instrument indicated it (Pa, V, A); None when there is none to trust."""
    status: Status
    raw: str
    """The text it came from (or a description of the fault)."""
    t_mono: float
    """Monotonic clock time it became available, s."""
    t_wall: float
    """Wall-clock time (Unix seconds, UTC) it became available."""
    source: str = "serial"
    """"serial", "simulated", "replay" or "manual"."""

    @property
    def answered(self) -> bool:
        """Whether the instrument answered meaningfully (a value, or its own range or sensor status),
        as opposed to a lost port, a garbled answer or an aged one."""
        return self.status in (Status.OK, Status.OVER_RANGE, Status.UNDER_RANGE, Status.SENSOR_ERROR)

    @property
    def usable(self) -> bool:
        """Whether a forecast may be built on it."""
        return self.status is Status.OK and self.value is not None

    def aged(self, now_mono: float, stale_after: float | None) -> Reading:
        """This reading, marked stale if it is older than ``stale_after`` seconds at ``now_mono``."""
        if stale_after is None or self.status in (Status.LOST, Status.STALE):
            return self
        if now_mono - self.t_mono > stale_after:
            return replace(self, status=Status.STALE)
        return self
