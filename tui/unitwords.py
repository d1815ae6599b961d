"""Sentences in the operator's units: the model writes every flag with SI quantities (Pa, Pa m,
V/(Pa m), mm), and the screen and the text output show them in the unit system chosen (SI, mbar,
Torr). The JSON contract and the logbook keep the SI sentence.

A quantity is a number, or a range "a to b" / "a-b", followed by one of those units as a whole word.
"""

from __future__ import annotations

import re

from ..model.units import convert

__all__ = ["SYSTEMS", "in_units"]

SYSTEMS = {
    # pressure, length, pd (pressure, length)
    "SI": ("Pa", "mm", ("Pa", "m")),
    "mbar": ("mbar", "mm", ("mbar", "mm")),
    "Torr": ("mTorr", "cm", ("Torr", "cm")),
}
"""The unit systems the screen and the text output offer."""

_NUM = r"\d+(?:\.\d+)?(?:e[+-]?\d+)?"
_QUANTITY = re.compile(
    rf"(?<![\w.])(?P<a>{_NUM})(?:(?P<sep>-| to )(?P<b>{_NUM}))? (?P<unit>V/\(Pa m\)|Pa m|Pa|mm)(?![\w/(])"
)


def _factor(unit: str, system: str) -> tuple[float, str]:
    """(multiplier from the SI value, the unit shown) for one of the canonical units."""
    pu, lu, (ppu, plu) = SYSTEMS[system]
    pd = convert(1.0, "pressure", ppu) * convert(1.0, "length", plu)
    if unit == "Pa":
        return convert(1.0, "pressure", pu), pu
    if unit == "Pa m":
        return pd, f"{ppu} {plu}"
    if unit == "V/(Pa m)":
        return 1.0 / pd, f"V/({ppu} {plu})"
    return convert(1e-3, "length", lu), lu  # mm


def in_units(text: str, system: str) -> str:
    """``text`` with its SI quantities shown in ``system``.

    >>> in_units("pd 0.0187 Pa m is at or left of 0.5 Pa m: raise the pressure above 10.8 Pa", "Torr")
    'pd 0.014 Torr cm is at or left of 0.375 Torr cm: raise the pressure above 81 mTorr'
    >>> in_units("outside the 75 to 450 V/(Pa m) the pair was fitted over; gap (30 mm)", "mbar")
    'outside the 7.5 to 45 V/(mbar mm) the pair was fitted over; gap (30 mm)'
    """
    if system == "SI":
        return text

    def shown(m: re.Match) -> str:
        k, unit = _factor(m["unit"], system)
        a = f"{float(m['a']) * k:.3g}"
        if m["b"] is None:
            return f"{a} {unit}"
        return f"{a}{m['sep']}{float(m['b']) * k:.3g} {unit}"

    return _QUANTITY.sub(shown, text)
