"""The physical limits strikeline accepts: one table for every entry point.

The command line, bench profiles, values typed on the screen, strike CSVs and logbooks all read
quantities through :func:`parse_within` or :func:`check`, so a value refused in one place is
refused in all of them, with the same one-line message naming the accepted range and why.

>>> parse_within("20 Pa", "pressure")
20.0
>>> parse_within("1e30 Pa", "pressure")  # doctest: +ELLIPSIS
Traceback (most recent call last):
...
strikeline.model.units.QuantityError: pressure '1e30 Pa': outside 1e-06 to 1e+06 Pa (high vacuum to ...)
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from . import units
from .units import QuantityError

__all__ = ["LIMITS", "Limit", "check", "parse_within"]


@dataclass(frozen=True)
class Limit:
    """An accepted range of one kind of quantity, in SI, with the reason for it."""

    kind: str
    """The unit kind (:data:`strikeline.model.units.KINDS`) the quantity is read as."""
    low: float
    high: float
    why: str
    allow_zero: bool = False
    """Zero is accepted although below ``low`` (a ballast resistor that is not fitted)."""
    unit: str = ""
    """The SI unit shown, where it is not the kind's own (pd: Pa m)."""

    def describe(self) -> str:
        """The range in words, e.g. "1e-06 to 1e+06 Pa (why)"."""
        return f"{self.low:g} to {self.high:g} {self.unit or units.units_of(self.kind)[0]} ({self.why})"


LIMITS: dict[str, Limit] = {
    "pressure": Limit("pressure", 1e-6, 1e6, "high vacuum to 10 bar: every glow and sputter bench runs inside it"),
    "gap": Limit("length", 1e-6, 10.0, "from micro-gaps to the largest chambers"),
    "length": Limit("length", 1e-6, 10.0, "from micro-gaps to the largest chambers"),
    "chamber": Limit("length", 1e-3, 10.0, "from a small cell to a large vessel"),
    "pd": Limit("pressure", 1e-12, 1e7, "the pressure range times the gap range", unit="Pa m"),
    "voltage": Limit("voltage", 1.0, 1e6, "glow and sputter supplies stay far below a megavolt"),
    "current": Limit("current", 1e-9, 1e4, "from a dark discharge to an arc supply"),
    "resistance": Limit("resistance", 1e-3, 1e10, "or 0 where no ballast is fitted", allow_zero=True),
    "temperature": Limit("temperature", 20.0, 3000.0, "where the ideal-gas density scaling holds"),
    "frequency": Limit(
        "frequency",
        1.0,
        1e8,
        "pulsed, AC and RF supplies; above 100 MHz a bench-sized gap is no longer a small part of the "
        "wavelength and the uniform-field model fails",
    ),
    "power": Limit("power", 1e-3, 1e6, "from a milliwatt probe to a megawatt generator"),
    "off_time": Limit("time", 1e-9, 10.0, "pulsed supplies"),
    "duration": Limit("time", 1e-3, 7 * 86400.0, "up to a week of unattended logging"),
    "area": Limit("area", 1e-8, 10.0, "from a pin to a large target"),
    "field": Limit("field", 1e-6, 10.0, "magnetron fields are tens of millitesla"),
    "flow": Limit("flow", 1e-8, 10.0, "from a trickle to about 6000 slm"),
    "pumping_speed": Limit("speed", 1e-4, 100.0, "from a small turbo pump's 0.1 l/s to the largest cryo pumps"),
}
"""Accepted ranges by the name of what is given (SI units)."""


def check(value: float, name: str | Limit, *, label: str | None = None, text: str | None = None) -> float:
    """``value`` (SI) if it lies inside the limit ``name`` (a key of :data:`LIMITS`, or a :class:`Limit`),
    else :class:`QuantityError` naming ``label`` (the option or field), the value as given (``text``)
    and the accepted range.

    >>> check(0.03, "gap")
    0.03
    """
    lim = LIMITS[name] if isinstance(name, str) else name
    label = label or (name if isinstance(name, str) else lim.kind)
    shown = repr(text) if text is not None else f"{value:g} {lim.unit or units.units_of(lim.kind)[0]}"
    if isinstance(value, bool) or not isinstance(value, int | float) or not math.isfinite(value):
        raise QuantityError(f"{label} {shown}: not a finite number; give {lim.describe()}")
    if (value == 0 and lim.allow_zero) or lim.low <= value <= lim.high:
        return float(value)
    raise QuantityError(f"{label} {shown}: outside {lim.describe()}")


def parse_within(text: str, name: str | Limit, *, label: str | None = None) -> float:
    """Read ``text`` as the quantity ``name`` (a key of :data:`LIMITS`, or a :class:`Limit`) and check
    its range; SI out."""
    lim = LIMITS[name] if isinstance(name, str) else name
    label = label or (name if isinstance(name, str) else lim.kind)
    value = units.parse(text, lim.kind, name=label, allow_zero=lim.allow_zero)
    return check(value, lim, label=label, text=text)
