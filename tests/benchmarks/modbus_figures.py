"""Figures of the Modbus driver: the round trip of a poll of 8 registers over TCP, and the highest poll rate.

Against pymodbus's own server on localhost (tests/fake_modbus.py); the reader polls as fast as the
device answers, so the time between rounds is the round trip and its inverse the highest rate.
"""

from __future__ import annotations

import sys
import threading
import time
from pathlib import Path

import numpy as np

FIGURES = ("modbus_poll_ms_p50", "modbus_poll_ms_p95", "modbus_max_poll_hz")
BUDGETS = {"modbus_poll_ms_p50": ("<=", 2.0), "modbus_max_poll_hz": (">=", 200.0)}


def measure(quick: bool = False) -> dict[str, float]:
    sys.path.insert(0, str(Path(__file__).resolve().parent.parent))
    from fake_modbus import ModbusDevice
    from strikeline.drivers.modbus import ModbusReader
    from strikeline.drivers.specs import ChannelSpec, ModbusPortSpec, Register

    seconds = 0.5 if quick else 3.0
    dev = ModbusDevice(unit=1)
    dev.set("holding", 0, list(range(100, 108)))
    channels = tuple(
        ChannelSpec(f"r{i}", "voltage", register=Register("holding", i, "uint16"), unit_factor=1.0) for i in range(8)
    )
    spec = ModbusPortSpec("bench", "tcp", 1, channels, host="127.0.0.1", tcp_port=dev.port, poll_interval=0.0)
    rounds: list[float] = []
    reader = ModbusReader(spec, lambda r: rounds.append(time.perf_counter()) if r.channel == "r0" else None)
    reader.start()
    threading.Event().wait(seconds)
    reader.stop()
    dev.close()
    gaps = np.diff(np.array(rounds[5:])) * 1e3  # after the connection is up
    assert reader.stats.readings and not reader.stats.timeouts, reader.stats
    return {
        "modbus_poll_ms_p50": float(np.median(gaps)),
        "modbus_poll_ms_p95": float(np.percentile(gaps, 95)),
        "modbus_max_poll_hz": len(gaps) / (rounds[-1] - rounds[5]) if len(rounds) > 6 else 0.0,
    }
