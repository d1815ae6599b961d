"""What is in the chamber: a pure gas or a mixture, written as text or a table, and the films a
reactive process grows (``profiles/data/films.toml``).

A fill is written the same way everywhere (``--gas``, the bench profile's ``gas``, the screen's gas
key):

- ``argon``: a pure gas;
- ``argon:80,oxygen:20``: a mixture by parts (normalised: ``argon:0.8,oxygen:0.2`` is the same);
- ``argon:40 sccm,oxygen:8 sccm``: a mixture by flows; the mole fractions are the flows' shares
  (steady state, every gas pumped alike) and the flows themselves are kept for the target mode.

A bench profile may also give ``gas = { argon = 80, oxygen = 20 }``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from functools import cache
from typing import Any

from ..model.bench import Bench, Film, Gas, Mixture
from ..model.composition import make_mixture
from ..model.limits import parse_within
from ..model.units import QuantityError
from .fields import ProfileError, Table, name_key, read_toml
from .gasdata import data_text, find_gas

__all__ = ["FORM", "Fill", "fill_field", "fill_from_flows", "films", "find_film", "read_fill", "with_fill"]

FORM = 'write a mixture as gas:parts,... e.g. "argon:80,oxygen:20", or by flows, e.g. "argon:40 sccm,oxygen:8 sccm"'


@dataclass(frozen=True)
class Fill:
    """A gas fill: its largest gas, the mixture (None: a pure gas), and the flows it was given by."""

    gas: Gas
    mixture: Mixture | None = None
    flows: tuple[tuple[Gas, float], ...] = ()
    """(gas, Pa m^3/s) when the fill was written as flows (empty otherwise)."""

    @property
    def key(self) -> str:
        """The composition as text ("argon" or "argon:80,oxygen:20")."""
        return self.gas.key if self.mixture is None else self.mixture.key


def with_fill(bench: Bench, fill: Fill) -> Bench:
    """The bench with this gas fill (a fitted curve stays: it applies where its composition matches)."""
    return replace(bench, gas=fill.gas, mixture=fill.mixture)


def read_fill(text: str) -> Fill:
    """A gas, a mixture by parts or a mixture by flows, from text; one-line ProfileError otherwise.

    >>> read_fill("argon:80,oxygen:20").key, read_fill("Ar:1").mixture is None
    ('argon:80,oxygen:20', True)
    >>> f = read_fill("argon:40 sccm,oxygen:10 sccm")
    >>> f.key, [g.key for g, _ in f.flows]
    ('argon:80,oxygen:20', ['argon', 'oxygen'])
    """
    if not isinstance(text, str) or not text.strip():
        raise ProfileError(f"gas {text!r}: empty; give a gas name, or {FORM}")
    if ":" not in text and "," not in text:
        return Fill(find_gas(text))
    items: list[tuple[Gas, float]] = []
    by_flow: list[bool] = []
    for part in text.split(","):
        name, sep, amount = part.partition(":")
        if not sep:
            raise ProfileError(f"gas {text!r}: {part.strip()!r} has no parts; {FORM}")
        if not name.strip():
            raise ProfileError(f"gas {text!r}: {part.strip()!r} names no gas; {FORM}")
        gas = find_gas(name.strip())
        flow = not _is_number(amount)
        x = _flow(text, gas, amount) if flow else _parts(text, gas, amount)
        if any(g.key == gas.key for g, _ in items):
            raise ProfileError(f"gas {text!r}: {gas.key} is listed twice; {FORM}")
        items.append((gas, x))
        by_flow.append(flow)
    if any(by_flow) and not all(by_flow):
        raise ProfileError(f"gas {text!r}: give every gas parts, or every gas a flow with its unit; {FORM}")
    return _fill(text, items, flows=all(by_flow))


def _is_number(text: str) -> bool:
    try:
        float(text)
    except ValueError:
        return not text.strip()  # nothing after the colon: parts missing, said as such
    return True


def _parts(text: str, gas: Gas, amount: str) -> float:
    try:
        x = float(amount)
    except ValueError:
        x = math.nan
    if not (math.isfinite(x) and x > 0):
        raise ProfileError(
            f"gas {text!r}: parts {amount.strip()!r} of {gas.key} are not a finite number above zero; {FORM}"
        )
    return x


def _flow(text: str, gas: Gas, amount: str) -> float:
    try:
        return parse_within(amount, "flow", label=f"{gas.key} flow")
    except QuantityError as e:
        raise ProfileError(f"gas {text!r}: {e}") from None


def _fill(text: str, items: list[tuple[Gas, float]], *, flows: bool) -> Fill:
    if not math.isfinite(sum(x for _, x in items)):
        raise ProfileError(f"gas {text!r}: the parts add up to no finite number; {FORM}")
    keys = {g.key for g, _ in items}
    if "air" in keys and keys & {"nitrogen", "oxygen"}:
        raise ProfileError(
            f"gas {text!r}: air already holds nitrogen and oxygen; write the whole mixture in its gases, "
            'e.g. "nitrogen:78,oxygen:21,argon:1"'
        )
    made = make_mixture(items)
    flow_list = tuple(items) if flows else ()
    if isinstance(made, Gas):
        return Fill(made, None, flow_list)
    return Fill(made.main, made, flow_list)


def fill_from_flows(flows: dict[Gas, float]) -> Fill | None:
    """The fill that measured ``flows`` (Pa m^3/s by gas) make: mole fractions = shares of the total
    flow (steady state, every gas pumped alike). None when nothing flows."""
    present = [(g, q) for g, q in flows.items() if q > 0]
    if not present:
        return None
    return _fill("flows", present, flows=True)


def fill_field(t: Table, key: str) -> Fill:
    """A profile's gas field: text (any form :func:`read_fill` takes) or a table of parts."""
    v: Any = t.data.get(key)
    if isinstance(v, dict):
        if not v:
            raise t.fail(key, f"an empty table; give parts, e.g. {{ argon = 80, oxygen = 20 }}, or {FORM}")
        bad = [n for n, x in v.items() if isinstance(x, bool) or not isinstance(x, int | float | str)]
        if bad:
            raise t.fail(key, f"parts of {bad[0]!r} are {v[bad[0]]!r}; e.g. {{ argon = 80, oxygen = 20 }}")
        text = ",".join(f"{name}:{parts}" for name, parts in v.items())
    else:
        text = t.string(key)
    try:
        return read_fill(text)
    except ProfileError as e:
        raise ProfileError(f"{t.file}: [{t.where}] {e}") from None


@cache
def _film_table() -> tuple[dict[str, Film], dict[str, str]]:
    file = "films.toml"
    out: dict[str, Film] = {}
    names: dict[str, str] = {}
    for key, data in read_toml(data_text(file), file).items():
        t = Table(file, key, data)
        out[key] = Film(
            name=key,
            eps_r=t.pair("eps_r", 1.0, 1e4, equal=True),
            strength=t.pair("strength_V_per_m", 1e5, 1e11, equal=True),
            source=t.string("source"),
        )
        for alias in (key, t.string("name")):
            names[name_key(alias)] = key
    return out, names


def films() -> dict[str, Film]:
    """The films by formula."""
    return dict(_film_table()[0])


def find_film(name: str) -> Film:
    """The film called ``name`` (formula or name, any case), or a one-line error."""
    table, names = _film_table()
    k = name_key(name)
    if k in names:
        return table[names[k]]
    raise ProfileError(f"film {name!r}: unknown; use one of {', '.join(table)}")
