"""What every instrument channel and port section says, whatever the protocol.

A channel has a name and a quantity, then how its number becomes a value: a unit (or units
named in the answer, or an analog gauge characteristic), status words, scale and offset, its own
range, a stale limit, and for a pressure the gauge kind. A "state" channel (an interlock bit) has
words for its values instead of a unit. Every port has a polling interval, a timeout and the
number of unanswered polls after which a channel is lost. The protocol modules add the rest.
"""

from __future__ import annotations

import re
from collections.abc import Callable
from typing import Any

from ..drivers.reading import QUANTITIES, Status
from ..drivers.specs import Analog, ChannelSpec
from ..model import units
from ..model.composition import Composition
from ..model.gauges import GAUGE_KINDS, GaugeCorrection
from ..model.limits import Limit
from .fields import Table
from .gauges import gauge_correction

__all__ = [
    "CHANNEL_FIELDS",
    "PORT_FIELDS",
    "ascii_field",
    "channel_fields",
    "channels_of",
    "pattern_field",
    "port_timing",
    "unit_map",
]

CHANNEL_FIELDS = (
    "name",
    "quantity",
    "unit",
    "status",
    "scale",
    "offset",
    "over_range_above",
    "under_range_below",
    "analog",
    "stale_after",
    "gauge",
    "gauge_factor",
    "labels",
)
"""Fields every channel may have (each protocol adds its own)."""
PORT_FIELDS = ("name", "protocol", "poll_interval", "timeout", "lost_after", "channel")
"""Fields every port may have."""

_POLL = Limit("time", 1e-3, 3600.0, "a millisecond to an hour")
_TIMEOUT = Limit("time", 1e-3, 60.0, "a millisecond to a minute")
_STALE = Limit("time", 1e-3, 3600.0, "a millisecond to an hour")
_OWN = "the instrument's own range"
_KIND = {
    "pressure": "pressure",
    "voltage": "voltage",
    "current": "current",
    "flow": "flow",
    "state": None,
    "forward_power": "power",
    "reflected_power": "power",
    "self_bias": "voltage",
    "rf_voltage": "voltage",
}


def ascii_field(t: Table, key: str) -> bytes:
    """A field taken byte for byte (no stripping: a query keeps its line ending)."""
    raw = t.data[key]
    if not isinstance(raw, str) or not raw or not raw.isascii():
        raise t.fail(key, f'{raw!r} is not a non-empty ASCII text such as "MEAS P1\\r\\n"')
    return raw.encode("ascii")


def pattern_field(c: Table, default: str | None = None) -> re.Pattern[str]:
    """The channel's regular expression, with a (?P<value>...) group."""
    text = c.string("pattern", default=default)
    try:
        pattern = re.compile(text)
    except re.error as e:
        raise c.fail("pattern", f"not a valid regular expression ({e})") from None
    if "value" not in pattern.groupindex:
        raise c.fail("pattern", "needs a named group (?P<value>...) for the number")
    return pattern


def port_timing(t: Table) -> dict[str, Any]:
    """poll_interval, timeout and lost_after of a port section."""
    return {
        "poll_interval": t.quantity("poll_interval", _POLL, required=False) or 0.5,
        "timeout": t.quantity("timeout", _TIMEOUT, required=False) or 0.5,
        "lost_after": int(t.number("lost_after", 1, 1000, default=3)),
    }


def _unit_factor(t: Table, key: str, kind: str) -> float:
    unit = t.string(key)
    try:
        return units.parse(f"1 {unit}", kind)
    except units.QuantityError:
        raise t.fail(key, f"{unit!r} is not a {kind} unit ({', '.join(units.units_of(kind))})") from None


def channel_fields(
    c: Table, fill: Composition, *, unit_in_answer: bool = False
) -> tuple[dict[str, Any], GaugeCorrection | None]:
    """The protocol-independent fields of channel table ``c`` as ChannelSpec arguments, and the gas
    correction of a pressure channel. ``unit_in_answer``: the answer may name its own unit (a
    (?P<unit>) group), so a fixed unit is not required."""
    quantity = c.string("quantity", choices=QUANTITIES).casefold()
    kind = _KIND[quantity]
    out: dict[str, Any] = {"name": c.string("name"), "quantity": quantity}
    if kind is None:  # a state: words for its values, no unit
        for key in ("unit", "analog", "gauge", "over_range_above", "under_range_below"):
            if key in c.data:
                raise c.fail(
                    key, 'a state channel has no unit or range; give labels = { "0" = "open", "1" = "closed" }'
                )
        out["labels"] = _labels(c)
    else:
        if "labels" in c.data:
            raise c.fail("labels", 'only a state channel (quantity = "state") has labels')
        if (a := c.sub("analog")) is not None:
            a.only(("c", "k", "unit"))
            k = a.number("k", -1e6, 1e6)
            if k == 0:
                raise a.fail("k", "must not be zero")
            out["analog"] = Analog(a.number("c", -1e6, 1e6), k, _unit_factor(a, "unit", kind), a.string("unit"))
        elif "unit" in c.data:
            out["unit_factor"] = _unit_factor(c, "unit", kind)
        elif not unit_in_answer:
            raise c.fail("unit", f"missing; give the unit of the answers, one of {', '.join(units.units_of(kind))}")
        out["over_above"] = c.quantity("over_range_above", Limit(kind, 1e-12, 1e12, _OWN), required=False)
        out["under_below"] = c.quantity("under_range_below", Limit(kind, 1e-15, 1e12, _OWN), required=False)
    out["status_map"] = _status_map(c)
    out["scale"] = c.number("scale", -1e12, 1e12, default=1.0)
    out["offset"] = c.number("offset", -1e12, 1e12, default=0.0)
    out["stale_after"] = c.quantity("stale_after", _STALE, required=False) or 2.0
    corr = None
    if "gauge" in c.data:
        if quantity != "pressure":
            raise c.fail("gauge", "only a pressure channel has a gauge kind")
        factor = c.number("gauge_factor", 1e-3, 1e3, required=False)
        corr = gauge_correction(c.string("gauge", choices=GAUGE_KINDS).casefold(), fill, factor)
    elif "gauge_factor" in c.data:
        raise c.fail("gauge_factor", "needs gauge = capacitance, thermal or ionisation beside it")
    return out, corr


def unit_map(c: Table, quantity: str) -> dict[str, float]:
    """The units an answer may name (case-folded) and their SI factors: ``units`` or every unit of the kind."""
    kind = _KIND[quantity]
    if kind is None:
        return {}
    accepted = c.data.get("units", list(units.units_of(kind)))
    if not isinstance(accepted, list) or not all(isinstance(u, str) for u in accepted):
        raise c.fail("units", f"{accepted!r} is not a list of unit names")
    out: dict[str, float] = {}
    for u in accepted:
        try:
            out[u.casefold()] = units.parse(f"1 {u}", kind)
        except units.QuantityError:
            raise c.fail("units", f"{u!r} is not a {kind} unit") from None
    return out


def _status_map(c: Table) -> dict[str, Status]:
    out: dict[str, Status] = {}
    if (st := c.sub("status")) is not None:
        for text, ours in st.data.items():
            if not isinstance(ours, str) or ours not in [s.value for s in Status]:
                raise st.fail(text, f"{ours!r} is not one of {', '.join(s.value for s in Status)}")
            out[text.casefold()] = Status(ours)
    return out


def _labels(c: Table) -> dict[int, str]:
    out: dict[int, str] = {}
    if (lt := c.sub("labels")) is not None:
        for text, word in lt.data.items():
            if not text.strip().lstrip("-").isdigit():
                raise lt.fail(text, 'is not a whole number; label the values a state takes, e.g. "0" = "open"')
            if not isinstance(word, str) or not word.strip() or len(word) > 20:
                raise lt.fail(text, f"{word!r} is not a word of 1-20 characters")
            out[int(text)] = word.strip()
    return out


def channels_of(
    t: Table,
    label: str,
    port_no: int,
    make: Callable[[Table], tuple[ChannelSpec, GaugeCorrection | None]],
    names: set[str],
    gauges: dict[str, GaugeCorrection],
) -> tuple[ChannelSpec, ...]:
    """The [[port.channel]] tables of port section ``t``, each built by ``make``; names are unique
    across the bench and gas corrections are collected into ``gauges``."""
    items = t.data.get("channel", [])
    if not isinstance(items, list) or not items:
        raise t.fail("channel", "give at least one [[port.channel]] block")
    out: list[ChannelSpec] = []
    for j, item in enumerate(items, 1):
        c = Table(label, f"port #{port_no} channel #{j}", item)
        spec, corr = make(c)
        if spec.name in names:
            raise c.fail("name", f"{spec.name!r} is used by another channel")
        names.add(spec.name)
        out.append(spec)
        if corr is not None:
            gauges[spec.name] = corr
    return tuple(out)
