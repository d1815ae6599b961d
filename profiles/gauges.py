"""Gauge kinds and their gas correction (``profiles/data/gauges.toml``): true = factor x indicated.

For a mixture, an ionisation gauge's relative sensitivity is the mole-fraction sum of its gases'
(common practice). A thermal gauge's response to a mixture is no such sum (heat conduction of a
mixture is not linear in its composition), so no factor is made up: the reading is shown as it
is and marked approximate. A capacitance gauge reads any gas truly.
"""

from __future__ import annotations

from functools import cache
from typing import Any

from ..model.composition import Composition
from ..model.gauges import GaugeCorrection, sensitivity
from .fields import read_toml
from .gasdata import data_text

__all__ = ["gauge_correction"]


@cache
def _gauge_data() -> dict[str, Any]:
    return read_toml(data_text("gauges.toml"), "gauges.toml")


def gauge_correction(kind: str, fill: Composition, override: float | None = None) -> GaugeCorrection:
    """The correction of a ``kind`` gauge's reading in ``fill`` (``override``: true = f x indicated, set
    by hand)."""
    d = _gauge_data()[kind]
    limit = d.get("linear_below_Pa")
    if override is not None:
        return GaugeCorrection(kind, override, limit, "bench profile gauge_factor", overridden=True)
    if kind == "capacitance":
        return GaugeCorrection(kind, 1.0, None, d["source"])
    if kind == "thermal":
        if not fill.pure:
            why = f"no thermal-gauge factor for a mixture ({fill.key}): reading shown uncorrected, approximate"
            return GaugeCorrection(kind, None, limit, why)
        f = d["factor"].get(fill.key)
        return GaugeCorrection(kind, f, limit, d["source"] if f else f"no thermal-gauge factor for {fill.key}")
    table = d["sensitivity"]
    parts = [(c.fraction, c.gas.key) for c in fill.components]
    s = sensitivity(parts, table)
    if s is None:
        missing = ", ".join(key for _, key in parts if key not in table)
        return GaugeCorrection(kind, None, limit, f"no ionisation-gauge sensitivity for {missing}")
    source = d["source"] if fill.pure else f"{d['source']}; mole-fraction sum (common practice)"
    return GaugeCorrection(kind, 1.0 / s, limit, source)
