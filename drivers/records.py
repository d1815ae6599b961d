"""What a logbook record must hold to be read: the one check every reader of a logbook goes through.

A record that is not what its kind promises (a time written as text, a value that is a list, a
strike mark with text where a number belongs, a name of megabytes, NaN) is refused with one short
reason, and the reader counts and reports it instead of passing it on. New fields may be added to
any kind; the fields below are checked where they are present and required where marked.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Mapping
from typing import Any

from .reading import QUANTITIES, Status

__all__ = ["EARLIEST", "KINDS", "LATEST", "MAX_NAME", "MAX_TEXT", "record_problem"]

EARLIEST = 946684800.0
"""2000-01-01 UTC: no logbook of this tool is older (a negative or tiny time is a corrupt record)."""
LATEST = 7258118400.0
"""2200-01-01 UTC."""
MAX_NAME = 64
"""Characters in a channel, port, field or flag name."""
MAX_TEXT = 4096
"""Characters in any other text (a raw answer, a reason, a note)."""

Check = Callable[[Any], bool]


_NUMBER_TYPES = (int, float)  # exactly: a bool is an int but not a number here


def _number(x: Any) -> bool:
    return type(x) in _NUMBER_TYPES and math.isfinite(x)


def _positive(x: Any) -> bool:
    return _number(x) and x > 0


_NAMES_SEEN: set[str] = set()
"""Names already found good: a logbook repeats a few channel names hundreds of thousands of times."""


def _name(x: Any) -> bool:
    if type(x) is not str:
        return False
    if x in _NAMES_SEEN:
        return True
    good = 0 < len(x) <= MAX_NAME and x.isprintable()
    if good and len(_NAMES_SEEN) < 4096:
        _NAMES_SEEN.add(x)
    return good


def _text(x: Any) -> bool:
    return type(x) is str and len(x) <= MAX_TEXT


def _optional(check: Check) -> Check:
    def optional(x: Any) -> bool:
        return x is None or check(x)

    optional.inner = check  # type: ignore[attr-defined]
    return optional


def _one_of(*allowed: str) -> Check:
    names = frozenset(allowed)

    def one_of(x: Any) -> bool:
        return type(x) is str and x in names

    one_of.names = names  # type: ignore[attr-defined]
    return one_of


def _count(x: Any) -> bool:
    return isinstance(x, int) and not isinstance(x, bool) and x >= 0


def _flows(x: Any) -> bool:
    return isinstance(x, dict) and len(x) <= 16 and all(_name(k) and _number(v) and v >= 0 for k, v in x.items())


_BOOL: Check = lambda x: isinstance(x, bool)  # noqa: E731
_WHAT = {
    _number: "a finite number",
    _positive: "a number above zero",
    _name: f"a name of 1-{MAX_NAME} printable characters",
    _text: f"a text of at most {MAX_TEXT} characters",
    _count: "a whole number of 0 or more",
    _BOOL: "true or false",
    _flows: "a table of up to 16 gas names and flows of 0 or more",
}

# kind -> field -> (check, required)
_FIELDS: dict[str, dict[str, tuple[Check, bool]]] = {
    "session": {f: (_text, False) for f in ("format", "bench", "gas", "cathode", "mode")},
    "reading": {
        "channel": (_name, True),
        "quantity": (_one_of(*QUANTITIES), True),
        "status": (_one_of(*(s.value for s in Status)), True),
        "value": (_optional(_number), False),
        "indicated": (_optional(_number), False),
        "approximate": (_BOOL, False),
        "source": (_text, False),
        "raw": (_text, False),
    },
    "entry": {"field": (_name, True), "text": (_text, False), "accepted": (_BOOL, False), "message": (_text, False)},
    "strike": {
        "pressure_Pa": (_positive, True),
        "gap_m": (_positive, True),
        "voltage_V": (_positive, True),
        "gas_temperature_K": (_optional(_positive), False),
        **{f: (_text, False) for f in ("pressure_source", "gas", "cathode", "note", "made_by")},
    },
    "fill": {
        "composition": (_text, True),
        "source": (_one_of("profile", "typed", "flows"), False),
        "flows_Pa_m3_s": (_flows, False),
        "note": (_text, False),
    },
    "forecast": {
        "withdrawn": (_optional(_text), False),
        "gas": (_text, False),
        **{f: (_optional(_number), False) for f in ("pressure_Pa", "gap_m", "voltage_V", "breakdown_V", "margin_V")},
        "strikes": (_optional(_BOOL), False),
        **{f: (_optional(_text), False) for f in ("branch", "regime", "worst")},
    },
    "flag": {
        "code": (_name, True),
        "level": (_one_of("ok", "watch", "danger"), True),
        "reason": (_text, False),
        "change": (_one_of("raised", "cleared"), True),
    },
    "event": {
        "port": (_optional(_text), False),
        "event": (_text, True),
        "message": (_text, False),
        **{
            f: (_count, False)
            for f in ("readings", "garbled", "unanswered", "overlong", "faults", "reconnects", "exceptions")
        },
    },
}
KINDS = tuple(_FIELDS)
"""The record kinds this version reads."""


_PLAN = {
    kind: tuple((f, check, required) for f, (check, required) in fields.items()) for kind, fields in _FIELDS.items()
}
"""Each kind's checks as a flat tuple (read once per record, hundreds of thousands of times)."""

# The same checks written out as expressions of one value ``v``, for the compiled fast path below.
_EXPR: dict[Check, str] = {
    _number: "(type(v) in _NT and _fin(v))",
    _positive: "(type(v) in _NT and _fin(v) and v > 0)",
    _name: "(type(v) is str and (v in _SEEN or _name(v)))",
    _text: f"(type(v) is str and len(v) <= {MAX_TEXT})",
    _BOOL: "(type(v) is bool)",
}
_ABSENT = object()


def _expression(check: Check, env: dict[str, Any]) -> str:
    if check in _EXPR:
        return _EXPR[check]
    if hasattr(check, "inner"):
        return f"(v is None or {_expression(check.inner, env)})"
    if hasattr(check, "names"):
        env[name := f"_names{len(env)}"] = check.names
        return f"(type(v) is str and v in {name})"
    env[name := f"_check{len(env)}"] = check
    return f"{name}(v)"


def _compiled(kind: str) -> Callable[[dict], bool]:
    """Whether a record of ``kind`` passes every field check of :data:`_FIELDS`, as one function
    written out from them (the loop in :func:`record_problem` costs a shift's logbook seconds; that
    loop still says what is wrong when this finds something is)."""
    env: dict[str, Any] = {"_NT": _NUMBER_TYPES, "_fin": math.isfinite, "_SEEN": _NAMES_SEEN, "_name": _name}
    env["_A"] = _ABSENT
    lines = [
        "def ok(rec):",
        "    v = rec.get('t_unix', _A)",
        f"    if not (type(v) in _NT and {EARLIEST!r} <= v <= {LATEST!r}):\n        return False",
        "    v = rec.get('mono', _A)",
        "    if v is not _A and not (type(v) in _NT and _fin(v) and v >= 0):\n        return False",
        "    v = rec.get('t', _A)",
        f"    if v is not _A and not {_EXPR[_text]}:\n        return False",
    ]
    for field, check, required in _PLAN[kind]:
        lines.append(f"    v = rec.get({field!r}, _A)")
        lines.append(f"    if v is _A:\n        {'return False' if required else 'pass'}")
        lines.append(f"    elif not {_expression(check, env)}:\n        return False")
    lines.append("    return True")
    exec("\n".join(lines), env)  # noqa: S102 - our own text, written from the table above
    return env["ok"]


_FAST = {kind: _compiled(kind) for kind in _PLAN}
_RANGED: dict[tuple[str, int], tuple[Any, bool]] = {}


def _ranged(kind: str, ranges: Mapping[str, tuple[float, float]] | None) -> bool:
    """Whether ``ranges`` holds a field of ``kind`` (remembered per ranges object: callers pass one)."""
    if not ranges:
        return False
    hit = _RANGED.get((kind, id(ranges)))
    if hit is None or hit[0] is not ranges:
        hit = _RANGED[(kind, id(ranges))] = (ranges, any(f in ranges for f in _FIELDS[kind]))
    return hit[1]


def _describe(check: Check) -> str:
    return _WHAT.get(check, "a value of the documented form")


def record_problem(rec: Any, ranges: Mapping[str, tuple[float, float]] | None = None) -> str | None:
    """Why ``rec`` is not a readable logbook record, in a few words; None when it is.

    ``ranges`` adds accepted (low, high) ranges of numeric fields by name (the physical limits the
    caller holds, e.g. ``{"pressure_Pa": (1e-6, 1e6)}``).

    >>> record_problem({"kind": "strike", "t_unix": 1.8e9, "pressure_Pa": "lots", "gap_m": 0.03, "voltage_V": 400})
    "strike field 'pressure_Pa' is 'lots', not a number above zero"
    >>> record_problem({"kind": "reading", "t_unix": -2e9, "channel": "c", "quantity": "pressure", "status": "ok"})
    't_unix -2e+09 is not a time from 2000 to 2200'
    """
    if not isinstance(rec, dict):
        return "not a JSON object"
    kind = rec.get("kind")
    fast = _FAST.get(kind) if type(kind) is str else None
    if fast is not None and fast(rec) and not _ranged(kind, ranges):
        return None  # every field as it should be and none with a range to hold: the common case
    if not isinstance(kind, str) or kind not in _FIELDS:
        return f"kind {str(kind)[:MAX_NAME]!r} is not one of {', '.join(KINDS)}"
    t = rec.get("t_unix")
    if not _number(t):
        return f"t_unix {_shown(t)} is not a number of seconds"
    if not EARLIEST <= t <= LATEST:
        return f"t_unix {t:g} is not a time from 2000 to 2200"
    if "mono" in rec and not (_number(rec["mono"]) and rec["mono"] >= 0):
        return f"mono {_shown(rec['mono'])} is not a number of seconds of 0 or more"
    if "t" in rec and not _text(rec["t"]):
        return f"t {_shown(rec['t'])} is not a time text"
    ranges = ranges or {}
    for field, check, required in _PLAN[kind]:
        value = rec.get(field, _ABSENT)
        if value is _ABSENT:
            if required:
                return f"{kind} has no {field!r}"
            continue
        if not check(value):
            return f"{kind} field {field!r} is {_shown(value)}, not {_describe(check)}"
        if field in ranges and _number(value):
            lo, hi = ranges[field]
            if not lo <= value <= hi:
                return f"{kind} field {field!r} is {value:g}, outside {lo:g} to {hi:g}"
    return None


def _shown(x: Any) -> str:
    text = repr(x)
    return text if len(text) <= 40 else text[:37] + "..."
