"""The real `strikeline live` on an 80x24 pseudo-terminal: its bytes and CPU, and reading to glass.

Both runs read the screen's pty as a terminal would; nothing here imports strikeline. The second
also plays a pressure gauge on a pty of its own (the screen's driver opens it from a bench profile)
and times each new value from the write of its line to the first terminal bytes that show it.
"""

from __future__ import annotations

import fcntl
import math
import os
import pty
import select
import struct
import subprocess
import sys
import termios
import time
import tty
from dataclasses import dataclass

__all__ = ["GAUGE_BENCH", "ScreenCrashed", "Window", "gauge_to_glass", "in_pty"]


class ScreenCrashed(RuntimeError):
    """The screen process ended by itself while it was being measured."""


@dataclass
class Window:
    """What the screen cost between two moments of a run."""

    bytes: int
    cpu: float
    """CPU seconds (user and system) of the screen process."""
    span: float
    """s."""


def _spawn(argv: list[str], env: dict[str, str]) -> tuple[subprocess.Popen, int]:
    master, slave = pty.openpty()
    fcntl.ioctl(slave, termios.TIOCSWINSZ, struct.pack("HHHH", 24, 80, 0, 0))
    proc = subprocess.Popen(argv, stdin=slave, stdout=slave, stderr=slave, env=env, close_fds=True)
    os.close(slave)
    return proc, master


def _end(proc: subprocess.Popen, *fds: int) -> None:
    proc.terminate()
    try:
        proc.wait(5)
    except subprocess.TimeoutExpired:
        proc.kill()
    for fd in fds:
        os.close(fd)


def _cpu_seconds(pid: int) -> float:
    with open(f"/proc/{pid}/stat") as f:
        fields = f.read().rsplit(")", 1)[1].split()
    return (int(fields[11]) + int(fields[12])) / os.sysconf("SC_CLK_TCK")


def in_pty(
    argv: list[str], env: dict[str, str], seconds: float, until: bytes | None = None, marks: tuple[float, ...] = ()
) -> tuple[float | None, list[Window]]:
    """Run ``argv`` on a fresh 80x24 pty for ``seconds`` (or until ``until`` is on screen).

    Returns the seconds until ``until`` was on screen and one :class:`Window` from each of ``marks``
    (s from the start) to the next, the last to the end of the run. A process that ends by itself
    before it is stopped raises :class:`ScreenCrashed` with the end of what it printed."""
    t0 = time.perf_counter()
    proc, master = _spawn(argv, env)
    seen, tail, first, counted = b"", b"", None, 0
    snaps: list[tuple[float, int, float]] = []  # (time, bytes so far, cpu so far) at each mark
    try:
        while time.perf_counter() < t0 + seconds:
            r, _, _ = select.select([master], [], [], 0.05)
            now = time.perf_counter()
            if r:
                try:
                    data = os.read(master, 65536)
                except OSError:
                    break
                tail = (tail + data)[-4000:]
                counted += len(data)
                if first is None and until is not None:
                    seen += data
                    if until in seen:
                        first = now - t0
                        break  # a start-up run ends when its frame is on the screen
            if proc.poll() is not None:
                raise ScreenCrashed(f"{argv[-1]} ended with status {proc.returncode}: {tail[-600:]!r}")
            if len(snaps) < len(marks) and now - t0 >= marks[len(snaps)]:
                snaps.append((now, counted, _cpu_seconds(proc.pid)))
        snaps.append((time.perf_counter(), counted, _cpu_seconds(proc.pid)))
    finally:
        _end(proc, master)
    windows = [Window(b[1] - a[1], b[2] - a[2], b[0] - a[0]) for a, b in zip(snaps, snaps[1:], strict=False)]
    return first, windows


GAUGE_BENCH = """
[bench]
name = "gauge-to-glass"
description = "benchmark: one capacitance gauge on a pty, 10 Hz"
gas = "argon"
cathode = "copper"
gap = "30 mm"
pressure = "20 Pa"

[supply]
open_circuit_voltage = "1.2 kV"
current_limit = "60 mA"
ballast = "15 kohm"

[[port]]
name = "gauge"
url = "{url}"
mode = "streaming"
terminator = "\\n"
timeout = "0.1 s"

[[port.channel]]
name = "chamber"
quantity = "pressure"
pattern = '^P=(?P<value>\\S+)$'
unit = "Pa"
gauge = "capacitance"
stale_after = "1 s"
"""


def gauge_to_glass(
    env: dict[str, str], bench_dir: str, seconds: float, rate: float = 10.0, step_every: int = 7
) -> tuple[list[float], Window]:
    """Latencies (s) of new pressures from a gauge's line to the screen, and what the run cost.

    The gauge writes ``rate`` lines a second, a steady value with 0.2 % noise (under the screen's
    noise threshold), and every ``step_every``-th line a new value never shown before (10.0 to
    99.9 Pa, at least 5 % from the last). A value's latency ends at the first terminal bytes
    holding its readout text ("13.7 Pa"); a value not on the screen by the next step counts as
    infinitely late."""
    import random

    g_master, g_slave = os.openpty()
    tty.setraw(g_master)
    tty.setraw(g_slave)
    bench = os.path.join(bench_dir, "gauge-to-glass.toml")
    with open(bench, "w") as f:
        f.write(GAUGE_BENCH.format(url=os.ttyname(g_slave)))
    argv = [sys.executable, "-m", "strikeline.tui.cli", "live", "--bench", bench]
    proc, master = _spawn(argv, env)
    rng = random.Random(1)
    t0 = time.perf_counter()
    value, k, n = 10.0, 0, 0
    latencies: list[float] = []
    pending: tuple[bytes, float] | None = None  # (readout text, time its line was written)
    since = b""
    started = None  # the gauge steps only once its first value is on the screen
    tail, counted, cpu0 = b"", 0, 0.0
    next_line = t0
    try:
        while time.perf_counter() < t0 + seconds:
            if time.perf_counter() >= next_line:
                step = started is not None and n % step_every == 0
                if step:
                    if pending is not None:
                        latencies.append(math.inf)  # the last new value never reached the screen
                    k += 1
                    value = 10.0 + (k * 37 % 900) / 10.0  # never the same twice in 900 steps
                # exact until the first value is on the screen (noise could show it as 9.99), then noisy
                shown = value if step or started is None else value * (1 + 0.002 * rng.gauss(0, 1))
                written = time.perf_counter()
                os.write(g_master, f"P={shown:.4g}\n".encode())
                if step:
                    pending, since = (f"{value:.1f} Pa".encode(), written), b""
                n += 1
                next_line += 1.0 / rate
            r, _, _ = select.select([master], [], [], max(0.0, min(next_line - time.perf_counter(), 0.05)))
            if r:
                try:
                    data = os.read(master, 65536)
                except OSError:
                    break
                arrived = time.perf_counter()
                tail = (tail + data)[-4000:]
                if started is None and b"10.0 Pa" in tail:
                    started, cpu0, counted = arrived, _cpu_seconds(proc.pid), 0
                counted += len(data)
                if pending is not None:
                    since += data
                    if pending[0] in since:
                        latencies.append(arrived - pending[1])
                        pending = None
            if proc.poll() is not None:
                raise ScreenCrashed(f"live --bench {bench} ended with status {proc.returncode}: {tail[-600:]!r}")
        cost = Window(counted, _cpu_seconds(proc.pid) - cpu0, time.perf_counter() - (started or t0))
    finally:
        _end(proc, master, g_master, g_slave)
    if started is None:
        raise ScreenCrashed(f"the gauge's first value never reached the screen: {tail[-600:]!r}")
    return latencies, cost
