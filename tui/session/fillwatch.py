"""The gas fill as the flow meters make it, for a Session whose bench profile names flow channels.

In steady state, with every gas pumped alike, a gas's mole fraction is its share of the total flow.
The fill in use changes only when some fraction moves by more than :data:`HOLD_WITHIN`, so a flow
meter's noise does not re-solve the mixture (or redraw its curve) at every reading.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

from ...drivers.hub import Latest
from ...model.composition import same_composition
from ...model.gas import Gas
from ...profiles.fill import Fill, fill_from_flows
from ...profiles.gasdata import find_gas

__all__ = ["HOLD_WITHIN", "FillWatch", "FlowsNow"]

HOLD_WITHIN = 0.005
"""The fill in use is kept while every mole fraction from the flows stays within this (absolute)."""

STEADY_STATE = "mole fractions from the flows: steady state, every gas pumped alike"


@dataclass(frozen=True)
class FlowsNow:
    """What the flow meters say now."""

    flows: tuple[tuple[Gas, float], ...]
    """Every gas's flow, Pa m^3/s (empty when a meter has no usable reading)."""
    fill: Fill | None
    """The fill they make (None: nothing flows, or a meter is silent)."""
    why_not: str | None
    """Why the flows cannot set the fill now (None: they can)."""


class FillWatch:
    """Reads the flow channels of a bench profile and settles the fill they make."""

    def __init__(self, channels: Mapping[str, str]):
        self.channels = {find_gas(key): name for key, name in channels.items()}
        """Flow channel by gas."""
        self.held: Fill | None = None

    def __bool__(self) -> bool:
        return bool(self.channels)

    def now(self, latest: Latest, t: float) -> FlowsNow:
        """The flows and the fill they make at time ``t`` (a monotonic time, as ``latest`` keeps)."""
        flows: dict[Gas, float] = {}
        for gas, name in self.channels.items():
            r = latest.get(name, t)
            if r is None or not r.usable:
                state = "no reading yet" if r is None else str(r.status)
                return FlowsNow((), None, f"flow {name} ({gas.key}): {state}")
            flows[gas] = max(r.value, 0.0)  # a controller's small negative offset is no flow
        fill = fill_from_flows(flows)
        if fill is None:
            return FlowsNow(tuple(flows.items()), None, "no gas flowing")
        return FlowsNow(tuple(flows.items()), self.settle(fill), None)

    def settle(self, fill: Fill) -> Fill:
        """``fill``, or the one held before when every fraction is within :data:`HOLD_WITHIN` of it."""
        if self.held is not None and same_composition(self.held.key, fill.key, HOLD_WITHIN):
            return self.held
        self.held = fill
        return fill
