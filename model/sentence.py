"""A flag and the quantities its sentence speaks of: each number's SI value, kind, the unit the model's
sentence shows it in and what it is (the screen writes them in the operator's units instead)."""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

from . import units

__all__ = ["Flag", "Quantity", "flag", "q"]


@dataclass(frozen=True)
class Quantity:
    """A number a flag speaks of: its SI value, its kind (a :data:`strikeline.model.units.KINDS`
    entry), the unit and format the model's own sentence shows it in, and what it is."""

    value: float
    kind: str
    unit: str
    """The unit of the SI sentence (e.g. "mm" for a gap, "us" for a charging time)."""
    fmt: str = ".3g"
    what: str = ""
    bare: bool = False
    """Written without its unit (the low end of a range "1 to 2 Pa m": the unit follows the high end)."""

    @property
    def si_unit(self) -> str:
        return units.si_unit(self.kind)

    def text(self, unit: str | None = None, fmt: str | None = None) -> str:
        """The number and its unit: in ``unit`` (default the sentence's own) with ``fmt``."""
        unit = self.unit if unit is None else unit
        if unit == "%":
            return f"{self.value:{fmt or self.fmt}}"  # a "%" format multiplies by 100 and adds the sign
        x = units.convert(self.value, self.kind, unit)
        return f"{x:{fmt or self.fmt}} {unit}" if unit and not self.bare else f"{x:{fmt or self.fmt}}"


def q(value: float, kind: str, unit: str, fmt: str = ".3g", what: str = "", bare: bool = False) -> Quantity:
    """A :class:`Quantity` (short, for the flags' sentences)."""
    return Quantity(float(value), kind, unit, fmt, what, bare)


@dataclass(frozen=True)
class Flag:
    """One judgement on the operating point: its code and level, a sentence with a {name} for each
    quantity it speaks of, and the quantities (SI). :attr:`reason` is the sentence in the model's own
    units; :meth:`sentence` writes it with each quantity shown as the caller chooses (the screen's
    unit system)."""

    code: str
    """Short stable identifier, e.g. "outside_fitted_range"."""
    level: str
    """"ok", "watch" or "danger"."""
    template: str
    """The sentence, with {name} where each quantity goes."""
    method: str = ""
    """Where the method comes from."""
    quantities: tuple[tuple[str, Quantity], ...] = ()

    def sentence(self, show: Callable[[Quantity], str] = Quantity.text) -> str:
        """The sentence with each quantity written by ``show``."""
        if not self.quantities:
            return self.template
        return self.template.format_map({name: show(x) for name, x in self.quantities})

    @property
    def reason(self) -> str:
        """One line with the numbers behind it, in the model's own (SI) units."""
        return self.sentence()

    def to_json(self) -> dict[str, Any]:
        return {
            "code": self.code,
            "level": self.level,
            "reason": self.reason,
            "method": self.method,
            "quantities": {
                name: {"value": x.value if math.isfinite(x.value) else None, "unit": x.si_unit, "what": x.what}
                for name, x in self.quantities
            },
        }


def flag(code: str, level: str, template: str, method: str = "", **quantities: Quantity) -> Flag:
    """A :class:`Flag` whose sentence ``template`` names its ``quantities`` as {name}."""
    return Flag(code, level, template, method, tuple(quantities.items()))
