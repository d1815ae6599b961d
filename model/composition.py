"""What is in the chamber: one type for a pure gas or a mixture, its one text form and its one parser.

A :class:`Composition` is components (gas, mole fraction) that add up to 1, largest first; a pure
gas is a one-component composition. Its :attr:`~Composition.key` is the one canonical text form
("argon", or "argon:80,oxygen:20" in percent, largest first), and :func:`parse` reads every form a
user writes (the bench profile, ``--gas``, the screen, a logbook):

- ``argon``: a pure gas (name, symbol or alias: the caller's ``find`` looks it up);
- ``argon:80,oxygen:20``: by parts, normalised (``argon:0.8,oxygen:0.2`` is the same);
- ``argon:40 sccm,oxygen:8 sccm``: by flows; the mole fractions are the flows' shares (steady state,
  every gas pumped alike) and the flows are returned beside the composition.

Pure: the gas data come in through ``find``; nothing here reads a file.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass

from .gas import Gas
from .limits import parse_within
from .units import QuantityError

__all__ = [
    "FORM",
    "SAME_WITHIN",
    "Component",
    "Composition",
    "CompositionError",
    "make",
    "parse",
    "parts_of",
    "pure",
    "same_composition",
]

SAME_WITHIN = 0.01
"""Two compositions whose mole fractions all agree within this (absolute) are the same fill: a bench
curve fitted at one applies at the other (our judgement: flows drift by that much)."""
FORM = 'write a mixture as gas:parts,... e.g. "argon:80,oxygen:20", or by flows, e.g. "argon:40 sccm,oxygen:8 sccm"'
"""The accepted forms, as every refusal states them."""


class CompositionError(ValueError):
    """Text that is not a gas fill (the message is one line naming the value and the accepted form)."""


@dataclass(frozen=True)
class Component:
    """One gas of a composition and its mole fraction."""

    gas: Gas
    fraction: float


@dataclass(frozen=True)
class Composition:
    """Gases and their mole fractions (adding up to 1, largest first)."""

    components: tuple[Component, ...]

    @property
    def key(self) -> str:
        """The one text form: "argon", or "argon:80,oxygen:20" (percent to four figures, largest first)."""
        if len(self.components) == 1:
            return self.components[0].gas.key
        return ",".join(f"{c.gas.key}:{100 * c.fraction:.4g}" for c in self.components)

    @property
    def main(self) -> Gas:
        """The largest component: its data stand for the fill where no mixing rule exists (glow, afterglow)."""
        return self.components[0].gas

    @property
    def pure(self) -> bool:
        """One gas alone."""
        return len(self.components) == 1

    @property
    def gases(self) -> tuple[Gas, ...]:
        return tuple(c.gas for c in self.components)

    def fraction(self, key: str) -> float:
        """The mole fraction of the gas ``key`` (0 where it is not in the fill)."""
        return next((c.fraction for c in self.components if c.gas.key == key), 0.0)

    def same_as(self, other: Composition, within: float = SAME_WITHIN) -> bool:
        """The same gases with every mole fraction within ``within`` (absolute)."""
        return same_composition(self.key, other.key, within)


def pure(gas: Gas) -> Composition:
    """The composition that is ``gas`` alone."""
    return Composition((Component(gas, 1.0),))


def make(items: Sequence[tuple[Gas, float]]) -> Composition:
    """A composition of ``items`` (gas, parts): normalised, largest first, gases without parts left out.

    >>> from strikeline.profiles.gasdata import find_gas
    >>> ar, o2 = find_gas("argon"), find_gas("oxygen")
    >>> make([(o2, 1), (ar, 4)]).key, make([(ar, 3), (o2, 0)]).key
    ('argon:80,oxygen:20', 'argon')
    """
    present = [(g, x) for g, x in items if x > 0]
    if not present:
        raise CompositionError("a gas fill needs at least one gas with parts above zero")
    total = math.fsum(x for _, x in present)
    ordered = sorted(present, key=lambda item: (-item[1], item[0].key))
    return Composition(tuple(Component(g, x / total) for g, x in ordered))


def parse(text: str, find: Callable[[str], Gas]) -> tuple[Composition, tuple[tuple[Gas, float], ...]]:
    """The composition ``text`` names (any form in the module text) and, for a fill by flows, the flows
    (gas, Pa m^3/s), else (). ``find`` looks a gas up by name and raises ValueError with its own line.
    Raises :class:`CompositionError` (or ``find``'s error) with one line naming the value."""
    if not isinstance(text, str) or not text.strip():
        raise CompositionError(f"gas {text!r}: empty; give a gas name, or {FORM}")
    if ":" not in text and "," not in text:
        return pure(find(text.strip())), ()
    items: list[tuple[Gas, float]] = []
    by_flow: list[bool] = []
    for part in text.split(","):
        name, sep, amount = part.partition(":")
        if not sep:
            raise CompositionError(f"gas {text!r}: {part.strip()!r} has no parts; {FORM}")
        if not name.strip():
            raise CompositionError(f"gas {text!r}: {part.strip()!r} names no gas; {FORM}")
        gas = find(name.strip())
        flow = not _is_number(amount)
        x = _flow(text, gas, amount) if flow else _parts(text, gas, amount)
        if any(g.key == gas.key for g, _ in items):
            raise CompositionError(f"gas {text!r}: {gas.key} is listed twice; {FORM}")
        items.append((gas, x))
        by_flow.append(flow)
    if any(by_flow) and not all(by_flow):
        raise CompositionError(f"gas {text!r}: give every gas parts, or every gas a flow with its unit; {FORM}")
    if not math.isfinite(sum(x for _, x in items)):
        raise CompositionError(f"gas {text!r}: the parts add up to no finite number; {FORM}")
    keys = {g.key for g, _ in items}
    if "air" in keys and keys & {"nitrogen", "oxygen"}:
        raise CompositionError(
            f"gas {text!r}: air already holds nitrogen and oxygen; write the whole mixture in its gases, "
            'e.g. "nitrogen:78,oxygen:21,argon:1"'
        )
    return make(items), tuple(items) if all(by_flow) else ()


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
        raise CompositionError(
            f"gas {text!r}: parts {amount.strip()!r} of {gas.key} are not a finite number above zero; {FORM}"
        )
    return x


def _flow(text: str, gas: Gas, amount: str) -> float:
    try:
        return parse_within(amount, "flow", label=f"{gas.key} flow")
    except QuantityError as e:
        raise CompositionError(f"gas {text!r}: {e}") from None


def parts_of(key: str) -> dict[str, float]:
    """Mole fractions by gas key from a composition key (no gas data needed).

    >>> parts_of("argon:80,oxygen:20"), parts_of("argon")
    ({'argon': 0.8, 'oxygen': 0.2}, {'argon': 1.0})
    """
    if ":" not in key:
        return {key: 1.0}
    out = {}
    for part in key.split(","):
        name, _, pct = part.partition(":")
        out[name] = float(pct) / 100.0
    return out


def same_composition(a: str, b: str, within: float = SAME_WITHIN) -> bool:
    """Whether two composition keys name the same gases with mole fractions within ``within``.

    >>> same_composition("argon:80,oxygen:20", "argon:80.5,oxygen:19.5"), same_composition("argon", "argon:95,oxygen:5")
    (True, False)
    """
    pa, pb = parts_of(a), parts_of(b)
    return pa.keys() == pb.keys() and all(abs(pa[k] - pb[k]) <= within for k in pa)
