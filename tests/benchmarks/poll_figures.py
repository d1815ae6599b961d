"""Figures of the line-protocol driver: poll round trip over a pty and the highest poll rate."""

from __future__ import annotations

import sys
import time

import numpy as np

FIGURES = ("poll_latency_ms_p50", "poll_latency_ms_p95", "max_poll_hz")
BUDGETS = {"poll_latency_ms_p50": ("<=", 5.0), "poll_latency_ms_p95": ("<=", 20.0), "max_poll_hz": (">=", 200.0)}


def measure(quick: bool = False) -> dict[str, float]:
    """Answer written on a pty -> Reading available (median, p95), and the sustained poll rate."""
    import re
    import threading
    from pathlib import Path

    sys.path.insert(0, str(Path(__file__).resolve().parent.parent))
    from fakes import PtyInstrument
    from strikeline.drivers.port import PortReader
    from strikeline.drivers.reading import Status
    from strikeline.drivers.specs import ChannelSpec, PortSpec

    seconds = 0.5 if quick else 2.0
    written: list[float] = []

    def respond(line: bytes) -> bytes:
        written.append(time.perf_counter())
        return b"0;1.00E-02;mbar\r"

    dev = PtyInstrument(respond, terminator=b"\r")
    chan = ChannelSpec(
        "chamber",
        "pressure",
        re.compile(r"^(?P<status>\d);(?P<value>\S+);mbar$"),
        query=b"?P\r",
        unit_factor=100.0,
        status_map={"0": Status.OK},
    )

    def run(interval: float) -> tuple[list[float], int, int]:
        written.clear()
        arrived: list[float] = []
        done = threading.Event()
        spec = PortSpec("bench", dev.path, (chan,), terminator=b"\r", poll_interval=interval, timeout=0.5)
        reader = PortReader(spec, lambda r: arrived.append(time.perf_counter()))
        reader.start()
        done.wait(seconds)
        count, timeouts = len(arrived), reader.stats.timeouts  # before stop() cancels a read
        reader.stop()
        n = min(len(written), len(arrived))
        return [arrived[i] - written[i] for i in range(n)], count, timeouts

    lat, _, _ = run(0.05)  # 20 Hz, as the screen's budget assumes
    _, count, timeouts = run(0.0)  # as fast as the link goes
    dev.close()
    lat_ms = np.array(lat) * 1e3
    return {
        "poll_latency_ms_p50": float(np.median(lat_ms)),
        "poll_latency_ms_p95": float(np.percentile(lat_ms, 95)),
        "max_poll_hz": count / seconds if timeouts == 0 else 0.0,
    }
