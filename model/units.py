"""Parse and format physical quantities at the edges; everything inside is SI.

Unit factors come from :mod:`scipy.constants` so that they match the CODATA/SI values
exactly. Only the edges of the program (command line, screen, profiles, drivers) call
into this module; the formulas elsewhere in :mod:`strikeline.model` take plain SI floats
and numpy arrays.

>>> round(parse("2.5 mTorr", "pressure"), 6)
0.333306
>>> parse("40mm", "length")
0.04
>>> format_value(0.3333, "pressure", "mTorr")
'2.50 mTorr'
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

from . import constants as _c

__all__ = [
    "CONVENTIONS",
    "KINDS",
    "READINGS",
    "SYSTEMS",
    "QuantityError",
    "convert",
    "format_value",
    "parse",
    "parse_pd",
    "si_unit",
    "units_of",
    "from_amplitude",
    "to_amplitude",
]

CONVENTIONS = {"peak": 1.0, "rms": 1.0 / math.sqrt(2.0), "pp": 2.0}
"""How an alternating voltage is quoted, as a multiple of its amplitude (a sine wave): peak
(amplitude), rms, peak-to-peak. Inside the model every alternating voltage is an amplitude."""


def to_amplitude(value: float, convention: str) -> float:
    """The amplitude of an alternating voltage quoted as ``convention``.

    >>> round(to_amplitude(100.0, "rms"), 3), to_amplitude(800.0, "pp")
    (141.421, 400.0)
    """
    return value / CONVENTIONS[convention]


def from_amplitude(amplitude: float, convention: str) -> float:
    """An amplitude quoted as ``convention`` (peak, rms or pp)."""
    return amplitude * CONVENTIONS[convention]


class QuantityError(ValueError):
    """A value the user gave cannot be read as the quantity asked for.

    The message is one line that names the bad value and the accepted form.
    """


@dataclass(frozen=True)
class _Kind:
    name: str
    si: str
    factors: dict[str, float]
    example: str
    positive: bool = True


_TORR = _c.torr
_KINDS: dict[str, _Kind] = {
    "pressure": _Kind(
        "pressure",
        "Pa",
        {
            "Pa": 1.0,
            "hPa": 100.0,
            "kPa": _c.kilo,
            "mbar": _c.bar * _c.milli,
            "ubar": _c.bar * _c.micro,
            "µbar": _c.bar * _c.micro,
            "bar": _c.bar,
            "Torr": _TORR,
            "mTorr": _TORR * _c.milli,
            "mmHg": _c.mmHg,
            "atm": _c.atm,
            "psi": _c.psi,
        },
        '"0.5 Pa", "2.5 mTorr", "5e-3 mbar"',
    ),
    "length": _Kind(
        "length",
        "m",
        {
            "m": 1.0,
            "cm": _c.centi,
            "mm": _c.milli,
            "um": _c.micro,
            "µm": _c.micro,
            "nm": _c.nano,
            "in": _c.inch,
        },
        '"40mm", "4 cm", "0.04 m"',
    ),
    "voltage": _Kind("voltage", "V", {"V": 1.0, "kV": _c.kilo, "mV": _c.milli}, '"600V", "1.2 kV"'),
    "current": _Kind(
        "current",
        "A",
        {"A": 1.0, "mA": _c.milli, "uA": _c.micro, "µA": _c.micro},
        '"50 mA", "0.2 A"',
    ),
    "resistance": _Kind(
        "resistance",
        "ohm",
        {"ohm": 1.0, "Ω": 1.0, "kohm": _c.kilo, "kΩ": _c.kilo, "Mohm": _c.mega, "MΩ": _c.mega},
        '"10 kohm", "1 Mohm", "470 ohm"',
    ),
    "temperature": _Kind("temperature", "K", {"K": 1.0}, '"293 K", "20 C"'),
    "field": _Kind("field", "T", {"T": 1.0, "mT": _c.milli, "G": 1e-4, "gauss": 1e-4}, '"30 mT", "300 G"'),
    "frequency": _Kind(
        "frequency", "Hz", {"Hz": 1.0, "kHz": _c.kilo, "MHz": _c.mega, "GHz": 1e9}, '"20 kHz", "13.56 MHz"'
    ),
    "time": _Kind(
        "time",
        "s",
        {"s": 1.0, "ms": _c.milli, "us": _c.micro, "µs": _c.micro, "ns": _c.nano, "min": 60.0, "h": 3600.0},
        '"5 us", "2 ms", "10 s", "8 h"',
    ),
    "area": _Kind("area", "m2", {"m2": 1.0, "cm2": _c.centi**2, "mm2": _c.milli**2}, '"20 cm2", "0.002 m2"'),
    # Gas flow as throughput (pressure times volume per time). A standard cubic centimetre is
    # taken at 0 C and 101325 Pa (common practice; some controllers use 20 C: set scale then).
    "flow": _Kind(
        "flow",
        "Pa m3/s",
        {
            "Pa m3/s": 1.0,
            "sccm": _c.atm * _c.centi**3 / 60.0,
            "slm": _c.atm * _c.milli / 60.0,
            "mbar l/s": _c.bar * _c.milli * _c.milli,
            "Torr l/s": _c.torr * _c.milli,
        },
        '"20 sccm", "0.5 slm", "0.03 Pa m3/s"',
    ),
    "power": _Kind("power", "W", {"W": 1.0, "kW": _c.kilo, "mW": _c.milli}, '"300 W", "1.2 kW"'),
    "pd": _Kind(
        "pd",
        "Pa m",
        {"Pa m": 1.0, "mbar mm": _c.bar * _c.milli * _c.milli, "Torr cm": _TORR * _c.centi},
        '"0.5 Torr cm", "1 Pa m"',
    ),
    "e_over_p": _Kind(
        "e_over_p",
        "V/(Pa m)",
        {"V/(Pa m)": 1.0, "V/(mbar mm)": 1.0 / (_c.bar * _c.milli * _c.milli), "V/(Torr cm)": 1.0 / (_TORR * _c.centi)},
        '"100 V/(Torr cm)"',
    ),
    "reduced_field": _Kind("reduced_field", "V m2", {"V m2": 1.0, "Td": 1e-21}, '"120 Td"'),
    "current_density": _Kind(
        "current_density",
        "A/m2",
        {"A/m2": 1.0, "mA/cm^2": _c.milli / _c.centi**2, "A/cm^2": 1.0 / _c.centi**2},
        '"1 mA/cm^2"',
    ),
    "fraction": _Kind("fraction", "1", {"1": 1.0, "%": 0.01}, '"20 %"', positive=False),
    "number": _Kind("number", "", {"": 1.0}, '"18.4"', positive=False),
    "energy": _Kind("energy", "J", {"J": 1.0, "eV": _c.e}, '"15.76 eV"'),
    # Pumping speed: volume per time at the chamber.
    "speed": _Kind(
        "speed",
        "m3/s",
        {"m3/s": 1.0, "l/s": _c.milli, "m3/h": 1.0 / 3600.0, "l/min": _c.milli / 60.0},
        '"250 l/s", "900 m3/h"',
    ),
}
READINGS: dict[str, tuple[str, str]] = {
    "pressure": ("pressure", "Pa"),
    "voltage": ("voltage", "V"),
    "current": ("current", "mA"),
    "flow": ("flow", "sccm"),
    "forward_power": ("power", "W"),
    "reflected_power": ("power", "W"),
    "self_bias": ("voltage", "V"),
    "rf_voltage": ("voltage", "V"),
}
"""Each quantity an instrument channel reads: its unit kind and the unit a reading is shown in."""

_SHOWN_ONLY = ("pd", "e_over_p", "reduced_field", "current_density", "fraction", "number", "energy")
"""Kinds the model's sentences show (a flag's quantities) but nobody types: not offered to the parser."""
KINDS: tuple[str, ...] = tuple(k for k in _KINDS if k not in _SHOWN_ONLY)
"""The kinds a typed quantity may be (every kind converts and formats)."""

SYSTEMS: dict[str, dict[str, str]] = {
    "SI": {"pressure": "Pa", "length": "mm", "pd": "Pa m", "e_over_p": "V/(Pa m)"},
    "mbar": {"pressure": "mbar", "length": "mm", "pd": "mbar mm", "e_over_p": "V/(mbar mm)"},
    "Torr": {"pressure": "mTorr", "length": "cm", "pd": "Torr cm", "e_over_p": "V/(Torr cm)"},
}
"""The unit systems the screen and the text output offer: the unit each of these kinds is shown in
(every other kind is shown as the model wrote it)."""

# "<number><optional space><unit>"; the number accepts 1, 1.5, .5, 1e-3, 1.5E+2.
_QUANTITY = re.compile(
    r"^\s*(?P<num>[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*(?P<unit>(?:[^\W\d_]|°)[^\s]*(?:\s+[^\s]+)?)?\s*$"
)
"""A number, then optionally a unit that starts with a letter (so "2,5 Pa" is not a number and a unit)."""
_TEMPERATURE_C = {"C", "°C", "degC"}


def units_of(kind: str) -> tuple[str, ...]:
    """The unit names accepted for ``kind``, SI unit first."""
    k = _KINDS[kind]
    return (k.si, *[u for u in k.factors if u != k.si])


def _lookup(kind: _Kind, unit: str) -> float | None:
    if unit in kind.factors:
        return kind.factors[unit]
    # Case is forgiven ("torr", "PA", "mtorr") except on a leading m/M, where it is the
    # difference between milli and mega.
    folded = [u for u in kind.factors if u.casefold() == unit.casefold() and not (u[0] in "mM" and u[0] != unit[0])]
    if len(folded) == 1:
        return kind.factors[folded[0]]
    return None


def _accepted(kind: _Kind) -> str:
    names = [*units_of(kind.name), *(["C"] if kind.name == "temperature" else [])]
    return f"a number and one of {', '.join(names)} (e.g. {kind.example})"


def parse(text: str | float | int, kind: str, *, name: str | None = None, allow_zero: bool = False) -> float:
    """Read ``text`` as a ``kind`` quantity and return it in SI units.

    ``kind`` is one of :data:`KINDS`. A unit is always required, so that "5" is never
    silently taken as 5 Pa when the user meant 5 mTorr. Temperatures also accept
    degrees Celsius ("20 C"). The result is finite and positive (or zero where
    ``allow_zero``, e.g. a ballast resistor that is not fitted), or
    :class:`QuantityError` is raised with a one-line message naming ``name`` (the
    option or field) and the accepted form.

    >>> parse("1 Torr", "pressure") == 101325 / 760
    True
    >>> parse("20 C", "temperature")
    293.15
    """
    k = _KINDS[kind]
    label = name or kind
    if isinstance(text, bool) or not isinstance(text, str):
        raise QuantityError(f"{label} {text!r}: needs a unit; give {_accepted(k)}")
    m = _QUANTITY.match(text)
    if m is None:
        raise QuantityError(f"{label} {text!r}: not a quantity; give {_accepted(k)}")
    number = float(m["num"])
    unit = m["unit"]
    if unit is None:
        raise QuantityError(f"{label} {text!r}: needs a unit; give {_accepted(k)}")
    unit = unit.strip()
    if kind == "temperature" and unit in _TEMPERATURE_C:
        value = number + _c.zero_Celsius
    else:
        factor = _lookup(k, unit)
        if factor is None:
            raise QuantityError(f"{label} {text!r}: unknown unit {unit!r}; give {_accepted(k)}")
        value = number * factor
    if not math.isfinite(value):
        raise QuantityError(f"{label} {text!r}: not a finite number; give {_accepted(k)}")
    if k.positive and (value < 0 or (value == 0 and not allow_zero)):
        floor = "zero or more" if allow_zero else "above zero"
        raise QuantityError(f"{label} {text!r}: must be {floor}; give {_accepted(k)}")
    return value


def parse_pd(text: str, *, name: str | None = None) -> float:
    """Read a pressure-times-length product such as "0.5 Torr cm" and return Pa m.

    The unit is a pressure unit and a length unit separated by a space, "*" or "·".

    >>> round(parse_pd("1 Torr cm"), 6)
    1.333224
    """
    label = name or "pd"
    example = 'a number, a pressure unit and a length unit (e.g. "0.5 Torr cm", "0.1 Pa m")'
    if not isinstance(text, str):
        raise QuantityError(f"{label} {text!r}: needs units; give {example}")
    m = re.match(
        r"^\s*(?P<num>[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*(?P<p>[^\s*·]+)\s*[\s*·]\s*(?P<l>[^\s*·]+)\s*$",
        text,
    )
    if m is None:
        raise QuantityError(f"{label} {text!r}: not a pd value; give {example}")
    fp = _lookup(_KINDS["pressure"], m["p"])
    fl = _lookup(_KINDS["length"], m["l"])
    if fp is None or fl is None:
        bad = m["p"] if fp is None else m["l"]
        raise QuantityError(f"{label} {text!r}: unknown unit {bad!r}; give {example}")
    value = float(m["num"]) * fp * fl
    if not math.isfinite(value) or value <= 0:
        raise QuantityError(f"{label} {text!r}: must be a finite value above zero; give {example}")
    return value


def si_unit(kind: str) -> str:
    """The SI unit of ``kind``.

    >>> si_unit("pd")
    'Pa m'
    """
    return _KINDS[kind].si


def convert(value_si: float, kind: str, unit: str) -> float:
    """Express an SI value in ``unit`` (a unit of ``kind``).

    >>> convert(133.32236842105263, "pressure", "Torr")
    1.0
    """
    k = _KINDS[kind]
    factor = _lookup(k, unit)
    if factor is None:
        raise QuantityError(f"unit {unit!r}: not a {kind} unit; use one of {', '.join(units_of(kind))}")
    return value_si / factor


def format_value(value_si: float | None, kind: str, unit: str, digits: int = 3) -> str:
    """Format an SI value in ``unit`` with ``digits`` significant figures.

    ``None`` and non-finite values format as "none" so that a missing result is never
    shown as a number.

    >>> format_value(0.04, "length", "mm")
    '40.0 mm'
    >>> format_value(None, "voltage", "V")
    'none'
    """
    if value_si is None or not math.isfinite(value_si):
        return "none"
    return f"{_sig(convert(value_si, kind, unit), digits)} {unit}"


def _sig(x: float, digits: int) -> str:
    """``x`` with ``digits`` significant figures, plain notation from 1e-3 to 1e6."""
    if x == 0:
        return "0"
    mag = math.floor(math.log10(abs(x)))
    if -3 <= mag < 6:
        decimals = max(digits - 1 - mag, 0)
        return f"{x:.{decimals}f}"
    return f"{x:.{digits - 1}e}"
