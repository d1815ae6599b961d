"""The command line's parser: one-line usage errors, quantity arguments, the cautions on every verb."""

from __future__ import annotations

import argparse
import math
from collections.abc import Callable

from ...model.limits import LIMITS, parse_within
from ...model.units import QuantityError

__all__ = ["SAFETY", "UsageError", "add_gas", "add_verb", "build_parser", "count", "number", "quantity"]

SAFETY = (
    "High voltage can kill. strikeline is advisory: it reads instruments and controls nothing. "
    "Keep the interlocks working, discharge and ground the supply before touching the chamber, "
    "work one-handed near live parts, and follow local codes, your lab's safety officer and "
    "licensed practice first."
)


class UsageError(Exception):
    """A bad command line; the message is the one line shown to the user."""


class _Parser(argparse.ArgumentParser):
    verbs: tuple[str, ...] = ()
    """The verb names, once the verbs are registered."""

    def error(self, message: str):  # one line, never the usage block
        raise UsageError(f"{self.prog}: {message} (see {self.prog} --help)")


def quantity(limit: str, bare_unit: str | None = None) -> Callable[[str], float]:
    """An argparse type reading a quantity into SI inside the physical limit ``limit`` (a name in
    :data:`strikeline.model.limits.LIMITS`: the same limits a bench profile and the screen apply).
    An option whose name carries its unit (``--seconds``) gives ``bare_unit``: a bare number is then
    taken in it ("30" is 30 s), and a quantity with its own unit ("2 min") is still read as written."""

    def read(text: str) -> float:
        if bare_unit is not None and _is_number(text):
            text = f"{text.strip()} {bare_unit}"
        try:
            return parse_within(text, limit, label=LIMITS[limit].kind)
        except QuantityError as e:  # argparse shows ArgumentTypeError text as it is
            raise argparse.ArgumentTypeError(str(e)) from None

    read.__name__ = limit
    return read


def number(low: float, high: float, what: str) -> Callable[[str], float]:
    """An argparse type for a plain finite number from ``low`` to ``high`` (NaN and infinity refused)."""

    def read(text: str) -> float:
        try:
            x = float(text)
        except ValueError:
            x = math.nan
        if not (math.isfinite(x) and low <= x <= high):
            raise argparse.ArgumentTypeError(f"{text!r} is not {what} from {low:g} to {high:g}")
        return x

    read.__name__ = what
    return read


def count(low: int, high: int, what: str) -> Callable[[str], int]:
    """An argparse type for a whole number from ``low`` to ``high``."""

    def read(text: str) -> int:
        try:
            n = int(text.strip())
        except ValueError:
            n = low - 1
        if not low <= n <= high:
            raise argparse.ArgumentTypeError(f"{text!r} is not {what}: a whole number from {low} to {high}")
        return n

    read.__name__ = what
    return read


def _is_number(text: str) -> bool:
    try:
        float(text)
    except ValueError:
        return False
    return True


def add_verb(sub, name: str, summary: str, description: str) -> argparse.ArgumentParser:
    """A verb's parser, with the high-voltage cautions as its epilog (every verb carries them)."""
    return sub.add_parser(name, help=summary, description=description, epilog=SAFETY)


def add_gas(p: argparse.ArgumentParser) -> None:
    """The --gas option, written the same way for every verb that takes one."""
    p.add_argument(
        "--gas",
        help="gas or mixture (default: the bench's): a name or symbol (argon, Ar, N2, air), parts "
        "(argon:80,oxygen:20; normalised) or flows (argon:40sccm,oxygen:8sccm; mole fractions = shares of the flow)",
    )


def build_parser(adders: list[Callable]) -> argparse.ArgumentParser:
    """The ``strikeline`` parser; each of ``adders`` adds one verb (``add(sub)``), in help order."""
    p = _Parser(
        prog="strikeline",
        description=(
            "Where a glow-discharge or DC sputter bench sits on its gas's breakdown (Paschen) curve, "
            "whether the supply can strike it, and what risks come with that operating point. "
            "Quantities take units: --pressure '0.5 Pa', --gap 40mm, --voltage 600V."
        ),
        epilog=SAFETY,
    )
    sub = p.add_subparsers(dest="verb", metavar="VERB", parser_class=_Parser)
    for add in adders:
        add(sub)
    p.verbs = tuple(sub.choices)
    return p
