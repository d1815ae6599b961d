"""Strike points from CSV: what the calibration fits.

Columns (any order, case-insensitive): ``pressure``, ``gap``, ``voltage``, and optionally
``temperature`` and ``gas`` (the gas fill the strike was made in, as ``--gas`` writes it; ``fit``
leaves out strikes made in another fill). A header may carry the unit (``pressure_Pa``, ``gap [mm]``,
``voltage (kV)``); cells may carry their own ("20 mTorr"). Every bad row is reported with
its line number and skipped, never dropped silently.
"""

from __future__ import annotations

import csv
import io
import re
from dataclasses import dataclass

from ..model import units
from ..model.limits import check, parse_within
from .fields import ProfileError
from .fill import read_fill

__all__ = ["StrikePoint", "StrikeTable", "parse_strike_csv", "read_strike_csv"]

_COLUMNS = {"pressure": "pressure", "gap": "length", "voltage": "voltage", "temperature": "temperature"}
"""Column -> unit kind of its header or cells; each value is then held to the limit of the same name."""
_LIMIT = {"pressure": "pressure", "gap": "gap", "voltage": "voltage", "temperature": "temperature"}
_HEADER = re.compile(
    r"^\s*(?:gas_)?(?P<name>pressure|gap|voltage|temperature)\s*(?:[_\s]\s*|\[|\()?\s*(?P<unit>[^\])\s]*)\s*[\])]?\s*$",
    re.I,
)


@dataclass(frozen=True)
class StrikePoint:
    pressure: float
    """Pa (true)."""
    gap: float
    """m."""
    voltage: float
    """V."""
    temperature: float | None
    """K, None where not given."""
    line: int
    gas: str | None = None
    """The gas fill's composition key, None where not given."""


@dataclass(frozen=True)
class StrikeTable:
    points: tuple[StrikePoint, ...]
    problems: tuple[str, ...]
    """One line per skipped row: "line N: ..."."""


def read_strike_csv(path: str) -> StrikeTable:
    """Read a strike CSV file (see the module text); raises ValueError for an unusable file."""
    try:
        with open(path, encoding="utf-8-sig", newline="") as f:
            text = f.read()
    except FileNotFoundError:
        raise ValueError(f"{path!r}: no such file; give a CSV of pressure, gap and voltage columns") from None
    except (OSError, UnicodeDecodeError) as e:
        raise ValueError(f"{path!r}: cannot be read ({e})") from None
    return parse_strike_csv(text, path)


def parse_strike_csv(text: str, label: str = "points.csv") -> StrikeTable:
    """The strike points of CSV ``text``; raises ValueError (one line) for a file that cannot be used."""
    try:
        rows = list(csv.reader(io.StringIO(text, newline="")))
    except csv.Error as e:
        raise ValueError(f"{label}: not CSV ({e})") from None
    start = next(
        (i for i, r in enumerate(rows) if any(c.strip() for c in r) and not r[0].lstrip().startswith("#")), None
    )
    if start is None:
        raise ValueError(f"{label}: empty; give a header line with pressure, gap and voltage columns")
    header = rows[start]
    cols: dict[str, tuple[int, float | None]] = {}
    gas_col = next((j for j, name in enumerate(header) if name.strip().casefold() == "gas"), None)
    for j, name in enumerate(header):
        m = _HEADER.match(name)
        if m is None:
            continue
        key = m["name"].lower()
        unit = m["unit"] or None
        factor = None
        if unit:
            try:
                factor = units.parse(f"1 {unit}", _COLUMNS[key], name=f"column {name.strip()!r}")
            except units.QuantityError as e:
                raise ValueError(f"{label}: line {start + 1}: {e}") from None
        cols[key] = (j, factor)
    missing = [c for c in ("pressure", "gap", "voltage") if c not in cols]
    if missing:
        raise ValueError(
            f"{label}: line {start + 1}: no {', '.join(missing)} column; the header needs pressure, gap and voltage "
            "(e.g. pressure_Pa,gap_m,voltage_V or pressure [mTorr],gap [mm],voltage)"
        )
    points: list[StrikePoint] = []
    problems: list[str] = []
    for i in range(start + 1, len(rows)):
        row = rows[i]
        line = i + 1
        if not any(c.strip() for c in row) or row[0].lstrip().startswith("#"):
            continue
        values: dict[str, float | None] = {}
        try:
            for key, (j, factor) in cols.items():
                cell = row[j].strip() if j < len(row) else ""
                if not cell:
                    if key == "temperature":
                        values[key] = None
                        continue
                    raise units.QuantityError(f"{key} is empty")
                try:
                    x = float(cell)
                except ValueError:
                    values[key] = parse_within(cell, _LIMIT[key], label=key)
                    continue
                if factor is None and key != "temperature":
                    raise units.QuantityError(f"{key} {cell!r}: needs a unit, in the cell or the header")
                value = x * (factor or 1.0)  # a bare temperature is taken as kelvin
                values[key] = check(value, _LIMIT[key], label=key, text=cell)
        except units.QuantityError as e:
            problems.append(f"line {line}: {e}; row skipped")
            continue
        gas = None
        cell = row[gas_col].strip() if gas_col is not None and gas_col < len(row) else ""
        if cell:
            try:
                gas = read_fill(cell).key
            except ProfileError as e:
                problems.append(f"line {line}: {e}; row skipped")
                continue
        points.append(
            StrikePoint(values["pressure"], values["gap"], values["voltage"], values.get("temperature"), line, gas)
        )
    return StrikeTable(tuple(points), tuple(problems))
