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

from dataclasses import dataclass, replace
from functools import cache
from typing import Any

from ..model import composition
from ..model.bench import Bench
from ..model.composition import FORM, Composition, CompositionError
from ..model.gas import Film, Gas
from .fields import ProfileError, Table, name_key, read_toml
from .gasdata import data_text, find_gas

__all__ = ["FORM", "Fill", "fill_field", "fill_from_flows", "films", "find_film", "read_fill", "with_fill"]


@dataclass(frozen=True)
class Fill:
    """A gas fill as the user wrote it: what is in the chamber, and the flows it was given by."""

    composition: Composition
    flows: tuple[tuple[Gas, float], ...] = ()
    """(gas, Pa m^3/s) when the fill was written as flows (empty otherwise)."""

    @property
    def key(self) -> str:
        """The composition as text ("argon" or "argon:80,oxygen:20")."""
        return self.composition.key


def with_fill(bench: Bench, fill: Fill | Composition) -> Bench:
    """The bench with this gas fill (a fitted curve stays: it applies where its composition matches)."""
    return replace(bench, fill=fill.composition if isinstance(fill, Fill) else fill)


def read_fill(text: str) -> Fill:
    """A gas, a mixture by parts or a mixture by flows, from text (:func:`strikeline.model.composition.parse`);
    one-line ProfileError otherwise.

    >>> read_fill("argon:80,oxygen:20").key, read_fill("Ar:1").composition.pure
    ('argon:80,oxygen:20', True)
    >>> f = read_fill("argon:40 sccm,oxygen:10 sccm")
    >>> f.key, [g.key for g, _ in f.flows]
    ('argon:80,oxygen:20', ['argon', 'oxygen'])
    """
    try:
        comp, flows = composition.parse(text, find_gas)
    except CompositionError as e:
        raise ProfileError(str(e)) from None
    return Fill(comp, flows)


def fill_from_flows(flows: dict[Gas, float]) -> Fill | None:
    """The fill that measured ``flows`` (Pa m^3/s by gas) make: mole fractions = shares of the total
    flow (steady state, every gas pumped alike). None when nothing flows."""
    present = [(g, q) for g, q in flows.items() if q > 0]
    if not present:
        return None
    return Fill(composition.make(present), tuple(present))


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
