"""Figures of the live screen: start-up, CPU and bytes of the real process on a pty, reading latency."""

from __future__ import annotations

import sys
import time

import numpy as np

FIGURES = (
    "reading_to_screen_ms_p50",
    "reading_to_screen_ms_p95",
    "live_cpu_percent",
    "first_frame_s",
    "bare_textual_first_frame_s",
    "first_frame_vs_bare_textual",
    "terminal_bytes_per_s",
)
BUDGETS = {
    "reading_to_screen_ms_p50": ("<=", 50.0),
    "reading_to_screen_ms_p95": ("<=", 100.0),
    "live_cpu_percent": ("<=", 10.0),
    "first_frame_vs_bare_textual": ("<=", 1.5),
    "terminal_bytes_per_s": ("<=", 20_000.0),
}

_BARE_APP = """
from textual.app import App
from textual.widgets import Static
class Bare(App):
    def compose(self):
        yield Static("bare textual frame")
Bare().run()
"""


class ScreenCrashed(RuntimeError):
    """The screen process ended by itself while it was being measured."""


def in_pty(argv: list[str], env: dict[str, str], seconds: float, until: bytes | None = None, warm: float = 3.0):
    """Run ``argv`` on a fresh 80x24 pty for ``seconds`` (or until ``until`` is on screen).

    Returns (seconds to ``until`` on screen, bytes read after the first ``warm`` s, CPU seconds used
    after them, measured span). A process that ends
    by itself before it is stopped raises :class:`ScreenCrashed` with the end of what it printed."""
    import fcntl
    import os
    import pty
    import select
    import struct
    import subprocess
    import termios

    master, slave = pty.openpty()
    fcntl.ioctl(slave, termios.TIOCSWINSZ, struct.pack("HHHH", 24, 80, 0, 0))
    t0 = time.perf_counter()
    proc = subprocess.Popen(argv, stdin=slave, stdout=slave, stderr=slave, env=env, close_fds=True)
    os.close(slave)
    seen = b""
    tail = b""
    first = None
    counted = 0
    cpu0 = None
    t_mark = None
    deadline = t0 + seconds
    try:
        while time.perf_counter() < deadline:
            r, _, _ = select.select([master], [], [], 0.05)
            now = time.perf_counter()
            if r:
                try:
                    data = os.read(master, 65536)
                except OSError:
                    break
                tail = (tail + data)[-4000:]
                if first is None:
                    seen += data
                    if until is not None and until in seen:
                        first = now - t0
                if t_mark is not None:
                    counted += len(data)
            if proc.poll() is not None:
                raise ScreenCrashed(f"{argv[-1]} ended with status {proc.returncode}: {tail[-600:]!r}")
            if t_mark is None and now - t0 >= warm:
                t_mark = now
                cpu0 = _cpu_seconds(proc.pid)
            if until is not None and first is not None:
                break  # a start-up run ends when its frame is on the screen
        cpu = _cpu_seconds(proc.pid) - (cpu0 or 0.0)
        span = time.perf_counter() - (t_mark or t0)
    finally:
        proc.terminate()
        try:
            proc.wait(5)
        except subprocess.TimeoutExpired:
            proc.kill()
        os.close(master)
    return first, counted, cpu, span


def _cpu_seconds(pid: int) -> float:
    import os

    with open(f"/proc/{pid}/stat") as f:
        fields = f.read().rsplit(")", 1)[1].split()
    return (int(fields[11]) + int(fields[12])) / os.sysconf("SC_CLK_TCK")


def measure(quick: bool = False) -> dict[str, float]:
    """The live screen as a technician runs it: a real process on an 80x24 pty, demo bench (10 Hz
    simulated gauge, plot on), plus reading-to-readout latency at 20 Hz in-process."""
    import asyncio
    import os
    import tempfile
    from dataclasses import replace
    from pathlib import Path

    starts, warm, span, in_process = (1, 1.0, 2.0, 1.0) if quick else (5, 3.0, 13.0, 10.0)
    with tempfile.TemporaryDirectory() as tmp:
        env = dict(
            os.environ,
            TERM="xterm-256color",
            XDG_CONFIG_HOME=f"{tmp}/cfg",
            XDG_DATA_HOME=f"{tmp}/data",
            COLUMNS="80",
            LINES="24",
        )
        marker = Path(tmp, "cfg", "strikeline", "cautions-shown")
        marker.parent.mkdir(parents=True)
        marker.write_text("benchmark\n")
        live = [sys.executable, "-m", "strikeline.tui.cli", "live", "--bench", "demo"]
        bare = [sys.executable, "-c", _BARE_APP]
        firsts_live, firsts_bare = [], []
        for _ in range(starts):  # interleaved, median: start-up times wander with the machine's load
            firsts_bare.append(in_pty(bare, env, 10, b"bare textual frame")[0])
            firsts_live.append(in_pty(live, env, 10, b"breakdown")[0])
        _, counted, cpu, span = in_pty(live, env, span, warm=warm)
    live_first = float(np.median(firsts_live))
    bare_first = float(np.median(firsts_bare))

    from strikeline.profiles.loader import load_bench
    from strikeline.tui.app import make_app

    profile = load_bench("demo")
    port = profile.ports[0]
    fast = replace(port, poll_interval=0.05, channels=port.channels[:1])  # the gauge alone at 20 Hz
    profile = replace(profile, ports=(fast,))
    lat: list[float] = []

    async def run():
        app = make_app(profile, log=False, show_caution=False)
        app.latency_probe = lambda t_sent: lat.append(time.perf_counter() - t_sent)
        async with app.run_test(size=(80, 24)) as pilot:
            await pilot.pause(in_process)  # the screen then closes under a streaming gauge

    asyncio.run(run())
    lat_ms = np.array(lat[min(20, len(lat) // 4) :]) * 1e3
    return {
        "reading_to_screen_ms_p50": float(np.median(lat_ms)),
        "reading_to_screen_ms_p95": float(np.percentile(lat_ms, 95)),
        "live_cpu_percent": 100.0 * cpu / span,
        "first_frame_s": live_first,
        "bare_textual_first_frame_s": bare_first,
        "first_frame_vs_bare_textual": live_first / bare_first,
        "terminal_bytes_per_s": counted / span,
    }
