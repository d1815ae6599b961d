"""strikeline's performance figures, printed as one JSON object with --json.

Budgets (DESIGN.md) are checked here, never in timed tests. Each figure is the best of
several repeats, to keep scheduler noise on a shared 2-core machine out of the ratio.

    python tests/benchmarks/run.py --json
"""

from __future__ import annotations

import argparse
import json
import math
import sys
import time

import numpy as np

BUDGETS = {
    "curve_vs_log": ("<=", 4.0),
    "curve_vs_rootfind": (">=", 100.0),
    "poll_latency_ms_p50": ("<=", 5.0),
    "max_poll_hz": (">=", 200.0),
    "eight_hour_rss_growth_MB": ("<=", 10.0),
    "fit_200_points_s": ("<=", 0.2),
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


def _best(fn, repeats: int) -> float:
    best = math.inf
    for _ in range(repeats):
        t0 = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t0)
    return best


def curve_figures(n: int = 1_000_000, repeats: int = 15) -> dict[str, float]:
    """Time of an n-point breakdown curve against one np.log and against root finding."""
    from scipy.optimize import brentq
    from strikeline.model import paschen, townsend
    from strikeline.profiles.loader import find_gas

    c = find_gas("argon").constants
    gamma = 0.07
    pd0 = paschen.no_breakdown_pd(c.A, gamma)
    pd = np.geomspace(pd0 * 1.001, pd0 * 1e4, n)
    t_log = _best(lambda: np.log(pd), repeats)
    t_curve = _best(lambda: paschen.breakdown_voltage(pd, c.A, c.B, gamma), repeats)

    # The same curve by solving the Townsend criterion alpha(V/d) d = ln(1 + 1/gamma) for V at
    # each point with scipy's brentq (d = 1 m, so p = pd), on a sample of the points.
    K = math.log1p(1 / gamma)
    sample = pd[:: max(n // 2000, 1)]

    def rootfind():
        out = np.empty_like(sample)
        for i, p in enumerate(sample):
            out[i] = brentq(lambda V, p=p: float(townsend.alpha(V, p, c.A, c.B)) - K, 1e-3, 1e9, xtol=1e-9, rtol=1e-12)
        return out

    t_root = _best(rootfind, 3) * (n / len(sample))
    check = paschen.breakdown_voltage(sample, c.A, c.B, gamma)
    assert np.allclose(rootfind(), check, rtol=1e-8), "root finding disagrees with the closed form"
    return {
        "curve_1e6_ms": t_curve * 1e3,
        "log_1e6_ms": t_log * 1e3,
        "curve_vs_log": t_curve / t_log,
        "curve_vs_rootfind": t_root / t_curve,
    }


def poll_figures(seconds: float = 2.0) -> dict[str, float]:
    """Answer written on a pty -> Reading available (median, p95), and the sustained poll rate."""
    import re
    import threading
    from pathlib import Path

    sys.path.insert(0, str(Path(__file__).resolve().parent.parent))
    from fakes import PtyInstrument
    from strikeline.drivers.framing import ChannelSpec, PortSpec
    from strikeline.drivers.port import PortReader
    from strikeline.drivers.reading import Status

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


def fit_figures() -> dict[str, float]:
    """Time to fit A, B to 200 strike marks (scipy imported beforehand, as in a running session)."""
    import scipy.optimize  # noqa: F401 - import cost is start-up's, not the fit's
    import scipy.stats  # noqa: F401
    from strikeline.model import paschen
    from strikeline.model.calibration import fit_curve

    rng = np.random.default_rng(0)
    pd = np.geomspace(0.45, 20, 200)
    v = paschen.breakdown_voltage(pd, 7.0, 150.0, 0.07) * np.exp(rng.normal(0, 0.03, 200))
    t = _best(lambda: fit_curve(pd, v, A=9.0, B=135.0, gamma=0.07, free=("A", "B")), 5)
    return {"fit_200_points_s": t}


def _in_pty(argv: list[str], env: dict[str, str], seconds: float, until: bytes | None = None):
    """Run ``argv`` on a fresh 80x24 pty; return (seconds to ``until`` on screen, bytes read after the
    first 3 s, CPU seconds used after the first 3 s, measured span)."""
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
                if first is None:
                    seen += data
                    if until is not None and until in seen:
                        first = now - t0
                if t_mark is not None:
                    counted += len(data)
            if t_mark is None and now - t0 >= 3.0:
                t_mark = now
                cpu0 = _cpu_seconds(proc.pid)
            if until is not None and first is not None and seconds <= 0:
                break
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


def screen_figures() -> dict[str, float]:
    """The live screen as a technician runs it: a real process on an 80x24 pty, demo bench (10 Hz
    simulated gauge, plot on), plus reading-to-readout latency at 20 Hz in-process."""
    import asyncio
    import os
    import tempfile
    from dataclasses import replace
    from pathlib import Path

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
        for _ in range(5):  # interleaved, median: start-up times wander with the machine's load
            firsts_bare.append(_in_pty(bare, env, 10, b"bare textual frame")[0])
            firsts_live.append(_in_pty(live, env, 10, b"breakdown")[0])
        _, counted, cpu, span = _in_pty(live, env, 13.0)
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
            await pilot.pause(10.0)

    asyncio.run(run())
    lat_ms = np.array(lat[20:]) * 1e3
    return {
        "reading_to_screen_ms_p50": float(np.median(lat_ms)),
        "reading_to_screen_ms_p95": float(np.percentile(lat_ms, 95)),
        "live_cpu_percent": 100.0 * cpu / span,
        "first_frame_s": live_first,
        "bare_textual_first_frame_s": bare_first,
        "first_frame_vs_bare_textual": live_first / bare_first,
        "terminal_bytes_per_s": counted / span,
    }


def _rss_mb() -> float:
    with open("/proc/self/status") as f:
        for line in f:
            if line.startswith("VmRSS:"):
                return int(line.split()[1]) / 1024
    return float("nan")


def logbook_figures(hours: float = 8.0, rate_hz: float = 10.0) -> dict[str, float]:
    """A shift on a simulated clock through the real Session and Logbook: RSS growth, record rate."""
    import gc
    import tempfile
    from pathlib import Path

    from strikeline.drivers.logbook import Logbook, read_logbook
    from strikeline.drivers.reading import Reading, Status
    from strikeline.drivers.sim import Scenario, pressure_at, supply_at
    from strikeline.profiles.loader import load_bench
    from strikeline.tui.session import Session

    class Clock:
        t = 0.0

        def __call__(self):
            return self.t

    clock = Clock()
    sc = Scenario()
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "shift.jsonl"
        book = Logbook(path, clock=clock, wall=lambda: 1.8e9 + clock.t, sync_interval=3600)
        book.open(bench="demo", mode="benchmark")
        session = Session(load_bench("demo"), logbook=book, clock=clock)
        steps = int(hours * 3600 * rate_hz)
        warm = int(600 * rate_hz)  # ten simulated minutes before the first measurement
        rss0 = None
        t_start = time.perf_counter()
        for i in range(steps):
            t = i / rate_hz
            clock.t = t
            v, a = supply_at(t, sc)
            for ch, q, x in (
                ("chamber", "pressure", pressure_at(t, sc) / 1.6),
                ("supply-voltage", "voltage", v),
                ("supply-current", "current", a),
            ):
                session.handle(Reading(ch, q, x, Status.OK, f"{x:.4E}", t, 1.8e9 + t, "simulated"))
            if i % 5 == 0:  # the forecast twice a second, as `record` does
                session.view(t)
            if i % 36000 == 0:
                book.sync()  # once an hour here; the real sync thread does it every second
            if i == warm:
                gc.collect()
                rss0 = _rss_mb()
        elapsed = time.perf_counter() - t_start
        gc.collect()
        growth = _rss_mb() - rss0
        book.close()
        written = book.written
        readings = sum(1 for r in read_logbook(path).records if r["kind"] == "reading")
    return {
        "eight_hour_rss_growth_MB": growth,
        "eight_hour_readings_logged": readings,
        "eight_hour_readings_expected": steps * 3,
        "logbook_records_per_s": written / elapsed,
    }


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--json", action="store_true", help="print one JSON object of figures")
    args = ap.parse_args(argv)
    figures: dict[str, float] = {}
    figures |= curve_figures()
    figures |= poll_figures()
    figures |= fit_figures()
    figures |= screen_figures()
    figures |= logbook_figures()
    verdicts = {}
    for key, (op, budget) in BUDGETS.items():
        if key in figures:
            v = figures[key]
            verdicts[key] = (v <= budget) if op == "<=" else (v >= budget)
    if args.json:
        print(
            json.dumps(
                {
                    "figures": figures,
                    "budgets": {k: f"{o} {b}" for k, (o, b) in BUDGETS.items()},
                    "within_budget": verdicts,
                },
                indent=2,
            )
        )
    else:
        for k, v in figures.items():
            b = BUDGETS.get(k)
            mark = "" if b is None else f"   budget {b[0]} {b[1]}: {'ok' if verdicts[k] else 'OVER'}"
            print(f"{k:<24} {v:10.3f}{mark}")
    return 0 if all(verdicts.values()) else 1


if __name__ == "__main__":
    sys.exit(main())
