"""Typed, validated access to TOML tables: every bad field is one line naming file and field.

Quantities in profiles carry their units as text ("40 mm", "1.5 kV"), read by
:mod:`strikeline.model.units`. Nothing in a profile is evaluated as code.
"""

from __future__ import annotations

import math
import tomllib
from collections.abc import Callable, Iterable
from typing import Any, TypeVar

from ..model import units
from ..model.limits import LIMITS, Limit, parse_within
from ..model.units import QuantityError

__all__ = ["ProfileError", "Table", "example", "name_key", "read_toml"]

T = TypeVar("T")


class ProfileError(ValueError):
    """A profile (or a gas/cathode name) is not acceptable; the message is one line."""


def name_key(name: str) -> str:
    """A name folded for lookup: case, "-", "_" and repeated spaces do not matter.

    >>> name_key("Carbon_Dioxide"), name_key("stainless  steel")
    ('carbon dioxide', 'stainless steel')
    """
    return " ".join(name.replace("_", " ").replace("-", " ").split()).casefold()


class Table:
    """Typed access to one TOML table, with errors that name file and field."""

    def __init__(self, file: str, where: str, data: Any):
        self.file, self.where = file, where
        if not isinstance(data, dict):
            raise ProfileError(f"{file}: [{where}] must be a table of fields, not {type(data).__name__}")
        self.data: dict[str, Any] = data

    def fail(self, key: str, problem: str) -> ProfileError:
        shown = key if key and key.isprintable() and key.strip() == key else repr(key)
        where = f"[{self.where}] " if self.where else ""
        return ProfileError(" ".join(f"{self.file}: {where}{shown}: {problem}".split()))

    def only(self, allowed: Iterable[str]) -> None:
        allowed = tuple(allowed)
        for key in self.data:
            if key not in allowed:
                raise self.fail(key, f"unknown field; accepted fields are {', '.join(allowed)}")

    def has(self, key: str) -> bool:
        return key in self.data

    def string(self, key: str, *, default: str | None = None, choices: tuple[str, ...] = ()) -> str:
        if key not in self.data:
            if default is None:
                raise self.fail(key, "missing; it is required")
            return default
        v = self.data[key]
        if not isinstance(v, str) or not v.strip():
            raise self.fail(key, f"{v!r} is not a non-empty text")
        if choices and v.strip().casefold() not in choices:
            raise self.fail(key, f"{v!r} is not one of {', '.join(choices)}")
        return v.strip()

    def number(
        self, key: str, lo: float, hi: float, *, default: float | None = None, required: bool = True
    ) -> float | None:
        if key not in self.data:
            if default is None and required:
                raise self.fail(key, f"missing; give a number from {lo:g} to {hi:g}")
            return default
        v = self.data[key]
        if isinstance(v, bool) or not isinstance(v, int | float) or not math.isfinite(v) or not lo <= v <= hi:
            raise self.fail(key, f"{v!r} is not a number from {lo:g} to {hi:g}")
        return float(v)

    def pair(self, key: str, lo: float, hi: float, *, equal: bool = False) -> tuple[float, float]:
        """[low, high] inside [lo, hi]; ``equal``: low may equal high (a range that is one value)."""
        v = self.data.get(key)
        ok = (
            isinstance(v, list)
            and len(v) == 2
            and all(isinstance(x, int | float) and not isinstance(x, bool) for x in v)
            and all(math.isfinite(x) and lo <= x <= hi for x in v)
            and (v[0] < v[1] or (equal and v[0] == v[1]))
        )
        if not ok:
            order = "<=" if equal else "<"
            raise self.fail(key, f"{v!r} is not [low, high] with {lo:g} <= low {order} high <= {hi:g}")
        return float(v[0]), float(v[1])

    def quantity(self, key: str, limit: str | Limit, *, required: bool = True) -> float | None:
        """The quantity ``key`` in SI, inside ``limit`` (a name in :data:`LIMITS`, shared with the
        command line and the screen, or a :class:`Limit` of this field's own)."""
        lim = LIMITS[limit] if isinstance(limit, str) else limit
        if key not in self.data:
            if required:
                raise self.fail(key, f"missing; give {lim.kind} with its unit, e.g. {example(lim)}")
            return None
        try:
            return parse_within(self.data[key], lim, label=key)
        except QuantityError as e:
            raise ProfileError(f"{self.file}: [{self.where}] {e}") from None

    def lookup(self, key: str, find: Callable[[str], T]) -> T:
        """The thing named by the text field ``key``, found by ``find`` (a gas or cathode by name);
        its one-line refusal is prefixed with this file and section, once."""
        name = self.string(key)
        try:
            return find(name)
        except ProfileError as e:
            raise ProfileError(f"{self.file}: [{self.where}] {e}") from None

    def sub(self, key: str) -> Table | None:
        if key not in self.data:
            return None
        return Table(self.file, f"{self.where}.{key}" if self.where else key, self.data[key])


def example(lim: Limit) -> str:
    """An example value inside ``lim``, with its SI unit, for a "missing" message."""
    lo = lim.low if lim.low > 0 else lim.high / 1e3
    return f'"{math.sqrt(lo * lim.high):.3g} {units.units_of(lim.kind)[0]}"'


def read_toml(text: str, file: str) -> dict[str, Any]:
    """Parse TOML ``text``; a syntax error is one line naming ``file``."""
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as e:
        raise ProfileError(f"{file}: not valid TOML: {str(e).splitlines()[0]}") from None
