"""SCPI port sections (``protocol = "scpi"``): a VISA resource and each channel's query.

The resource string is VISA's own (``TCPIP::host::port::SOCKET``, ``TCPIP::host::INSTR``,
``USB0::...::INSTR``, ``ASRL/dev/ttyUSB0::INSTR``, ``GPIB0::12::INSTR`` where a backend has GPIB).
Each channel's ``query`` is the instrument's command (``MEAS:VOLT?`` style, from its manual), and
its answer is parsed like a line channel's; without a ``pattern`` the answer must be one number.
"""

from __future__ import annotations

import re

from ..drivers.specs import ChannelSpec, ScpiPortSpec
from ..model.composition import Composition
from ..model.gauges import GaugeCorrection
from .channels import (
    CHANNEL_FIELDS,
    PORT_FIELDS,
    ascii_field,
    channel_fields,
    channels_of,
    pattern_field,
    port_timing,
    unit_map,
)
from .fields import Table

__all__ = ["scpi_port"]

_PORT_FIELDS = PORT_FIELDS + ("resource", "backend", "read_termination", "write_termination", "identify")
_CHANNEL_FIELDS = CHANNEL_FIELDS + ("query", "pattern", "units")
NUMBER_ONLY = r"^\s*(?P<value>[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*$"
"""The pattern of a channel that gives none: the whole answer is one number."""
_RESOURCE = re.compile(r"^(TCPIP|USB|ASRL|GPIB|VXI|PXI)\d*::\S+$", re.IGNORECASE)


def scpi_port(
    t: Table, label: str, i: int, fill: Composition, names: set[str], gauges: dict[str, GaugeCorrection]
) -> ScpiPortSpec:
    """A ``protocol = "scpi"`` port section."""
    t.only(_PORT_FIELDS)
    resource = t.string("resource")
    if not _RESOURCE.match(resource):
        raise t.fail(
            "resource",
            f'{resource!r} is not a VISA resource string such as "TCPIP::192.0.2.7::5025::SOCKET", '
            '"USB0::0x1234::0x5678::SN1::INSTR" or "ASRL/dev/ttyUSB0::INSTR"',
        )
    backend = t.string("backend", default="@py")
    if not backend.endswith(("@py", "@ivi", "@sim")):
        raise t.fail("backend", f'{backend!r} is not "@py" (pyvisa-py), "@ivi" (a vendor VISA) or "file.yaml@sim"')
    identify = t.data.get("identify", True)
    if not isinstance(identify, bool):
        raise t.fail("identify", f"{identify!r} is not true or false")

    def channel(c: Table) -> tuple[ChannelSpec, GaugeCorrection | None]:
        c.only(_CHANNEL_FIELDS)
        pattern = pattern_field(c, default=NUMBER_ONLY)
        fields, corr = channel_fields(c, fill, unit_in_answer="unit" in pattern.groupindex)
        if "query" not in c.data:
            raise c.fail("query", 'missing; give the instrument\'s command that asks for this value, e.g. "MEAS:VOLT?"')
        units_ = unit_map(c, fields["quantity"])
        return ChannelSpec(pattern=pattern, query=ascii_field(c, "query"), units=units_, **fields), corr

    return ScpiPortSpec(
        name=t.string("name", default=f"port{i}"),
        resource=resource,
        channels=channels_of(t, label, i, channel, names, gauges),
        backend=backend,
        read_termination=_termination(t, "read_termination"),
        write_termination=_termination(t, "write_termination"),
        identify=identify,
        **port_timing(t),
    )


def _termination(t: Table, key: str) -> str:
    if not t.has(key):
        return "\n"
    return ascii_field(t, key).decode("ascii")
