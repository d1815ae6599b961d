"""What a bench profile says about an instrument port and its channels: plain, frozen data.

:mod:`strikeline.profiles` builds these from TOML and the port drivers read them. This module
imports no I/O library, so the profile loader can use it without loading pyserial.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field

from .reading import Status

__all__ = ["Analog", "ChannelSpec", "PortSpec"]


@dataclass(frozen=True)
class Analog:
    """A gauge's log-linear voltage characteristic, p = 10^((U - c) / k) in ``unit``."""

    c: float
    k: float
    unit_factor: float
    """SI value of one ``unit`` (e.g. 100 for mbar)."""
    unit: str


@dataclass(frozen=True)
class ChannelSpec:
    """How one channel's answers look (built from a bench profile)."""

    name: str
    quantity: str
    pattern: re.Pattern[str]
    """Must have a group ``value``; may have ``unit`` and ``status``."""
    query: bytes | None = None
    """What to send to poll this channel (None: the device streams)."""
    unit_factor: float | None = None
    """SI value of one unit where the answer carries none."""
    units: dict[str, float] = field(default_factory=dict)
    """Accepted unit texts (case-folded) and their SI factors, for a ``unit`` group."""
    status_map: dict[str, Status] = field(default_factory=dict)
    scale: float = 1.0
    offset: float = 0.0
    over_above: float | None = None
    """SI value at or above which the reading is over range."""
    under_below: float | None = None
    analog: Analog | None = None
    stale_after: float | None = None
    """Seconds after which a reading is stale."""
    encoding: str = "ascii"


@dataclass(frozen=True)
class PortSpec:
    """One port and the channels read through it (built from a bench profile)."""

    name: str
    url: str
    channels: tuple[ChannelSpec, ...]
    mode: str = "polled"
    """"polled" (send each channel's query, read the answer) or "streaming"."""
    baudrate: int = 9600
    bytesize: int = 8
    parity: str = "N"
    stopbits: float = 1
    terminator: bytes = b"\r\n"
    poll_interval: float = 0.5
    """s between polling rounds."""
    timeout: float = 0.5
    """s to wait for an answer."""
    lost_after: int = 3
    """Consecutive unanswered polls after which a channel is reported lost."""
    max_line: int = 256
    source: str = "serial"
    """How readings from this port are labelled ("serial" or "simulated")."""
