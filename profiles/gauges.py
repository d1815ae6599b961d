"""Gauge kinds and their gas correction (``profiles/data/gauges.toml``): true = factor x indicated."""

from __future__ import annotations

from functools import cache
from typing import Any

from ..model.bench import Gas
from ..model.gauges import GaugeCorrection
from .fields import read_toml
from .gasdata import data_text

__all__ = ["gauge_correction"]


@cache
def _gauge_data() -> dict[str, Any]:
    return read_toml(data_text("gauges.toml"), "gauges.toml")


def gauge_correction(kind: str, gas: Gas, override: float | None = None) -> GaugeCorrection:
    """The correction of a ``kind`` gauge's reading in ``gas`` (``override``: true = f x indicated)."""
    d = _gauge_data()[kind]
    limit = d.get("linear_below_Pa")
    if override is not None:
        return GaugeCorrection(kind, override, limit, "bench profile gauge_factor", overridden=True)
    if kind == "capacitance":
        return GaugeCorrection(kind, 1.0, None, d["source"])
    if kind == "thermal":
        f = d["factor"].get(gas.key)
        return GaugeCorrection(kind, f, limit, d["source"] if f else f"no thermal-gauge factor for {gas.key}")
    s = d["sensitivity"].get(gas.key)
    return GaugeCorrection(
        kind,
        None if s is None else 1.0 / s,
        limit,
        d["source"] if s else f"no ionisation-gauge sensitivity for {gas.key}",
    )
