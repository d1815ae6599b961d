"""Gas correction of vacuum-gauge readings.

A gauge reads true pressure only for the gas it was calibrated on (nitrogen, for most).
strikeline writes every correction as true = factor x indicated (Pa in, Pa out):

- capacitance diaphragm: factor 1, the gauge measures force per area, whatever the gas;
- thermal conductivity (Pirani-type), N2-calibrated: factor C of the gas, valid in the
  gauge's linear range only (low pressure); above it the response bends and the corrected
  value is approximate;
- ionisation: factor 1/S with S the gas's relative sensitivity (N2 = 1); in a mixture S is the
  mole-fraction sum of its gases' (common practice).
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass

__all__ = ["GAUGE_KINDS", "GaugeCorrection", "correct", "sensitivity"]

GAUGE_KINDS = ("capacitance", "thermal", "ionisation")


@dataclass(frozen=True)
class GaugeCorrection:
    """How one gauge's reading is corrected for the bench's gas."""

    kind: str
    factor: float | None
    """true = factor x indicated; None where no factor is known for this gas."""
    valid_below: float | None
    """Pa: above this indicated pressure the correction is approximate (None: no limit)."""
    source: str
    overridden: bool = False
    """The factor was set by hand in the bench profile (it does not follow a change of gas)."""


def correct(indicated: float, c: GaugeCorrection) -> tuple[float, bool]:
    """(true pressure in Pa, approximate?) for an ``indicated`` reading in Pa.

    >>> correct(10.0, GaugeCorrection("thermal", 1.6, 100.0, ""))
    (16.0, False)
    >>> correct(1000.0, GaugeCorrection("thermal", 1.6, 100.0, ""))
    (1600.0, True)
    >>> correct(10.0, GaugeCorrection("thermal", None, 100.0, ""))
    (10.0, True)
    """
    if c.factor is None:
        return indicated, True
    approximate = c.valid_below is not None and indicated > c.valid_below
    return indicated * c.factor, approximate


def sensitivity(parts: Sequence[tuple[float, str]], table: Mapping[str, float]) -> float | None:
    """An ionisation gauge's relative sensitivity to a fill of ``parts`` (mole fraction, gas key):
    the mole-fraction sum of the gases' S in ``table`` (common practice); None when one is missing.

    >>> round(sensitivity([(0.8, "argon"), (0.2, "oxygen")], {"argon": 1.4, "oxygen": 0.96}), 12)
    1.312
    """
    if any(key not in table for _, key in parts):
        return None
    return math.fsum(x * table[key] for x, key in parts)
