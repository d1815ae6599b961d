"""Figures of the shift report: an 8 h logbook at 10 Hz (864 000 readings) through `strikeline report`.

The logbook is written here line by line in the logbook's own format (the records `Session.handle`,
the forecasts and the flags write, with a strike mark every 20 min and a 1 min gauge dropout every
hour), far faster than through the Session; the report is then the real command in its own process,
timed, its memory (and that of the processes it reads the log with) sampled from /proc.
"""

from __future__ import annotations

import json
import math
import random
import subprocess
import sys
import tempfile
import time
from pathlib import Path

FIGURES = ("report_8h_s", "report_8h_peak_MB", "report_8h_html_MB", "report_8h_readings")
BUDGETS = {
    "report_8h_s": ("<=", 15.0),
    "report_8h_peak_MB": ("<=", 500.0),
    "report_8h_html_MB": ("<=", 5.0),
}
T0 = 1.8e9


def write_shift(path: Path, hours: float, rate: float = 10.0) -> int:
    """An invented shift on the demo bench: three channels at ``rate``; returns the readings written."""
    rng = random.Random(7)
    n = int(hours * 3600 * rate)
    readings = 0
    with open(path, "w", encoding="utf-8") as f:

        def rec(t: float, kind: str, **fields) -> None:
            stamp = time.strftime("%Y-%m-%dT%H:%M:%S", time.gmtime(t)) + f".{int(t % 1 * 1e6):06d}Z"
            head = {"t": stamp, "t_unix": t, "mono": round(t - T0, 6), "kind": kind}
            f.write(json.dumps(head | fields, separators=(",", ":")) + "\n")

        rec(T0, "session", format="strikeline-logbook/1", bench="demo", gas="argon", cathode="copper", mode="live")
        for k in range(n):
            t = T0 + k / rate
            p = 20.0 * (1 + 0.03 * math.sin(k / rate / 900)) * (1 + 0.004 * rng.gauss(0, 1))
            dropout = (k / rate) % 3600 >= 3540  # the last minute of every hour: the gauge is lost
            status = "lost" if dropout else "ok"
            rec(
                t,
                "reading",
                channel="chamber",
                quantity="pressure",
                value=None if dropout else p * 1.6,
                indicated=None if dropout else p,
                status=status,
                approximate=True,
                source="serial",
                raw=f"{p:.4g}",
            )
            rec(
                t,
                "reading",
                channel="supply-voltage",
                quantity="voltage",
                value=876.0 + rng.gauss(0, 2),
                indicated=876.0,
                status="ok",
                approximate=False,
                source="serial",
                raw="876",
            )
            rec(
                t,
                "reading",
                channel="supply-current",
                quantity="current",
                value=0.0216 + rng.gauss(0, 1e-4),
                indicated=0.0216,
                status="ok",
                approximate=False,
                source="serial",
                raw="21.6",
            )
            readings += 3
            if k % int(rate) == 0:  # the forecast once a second (the Session's heartbeat)
                rec(
                    t,
                    "forecast",
                    withdrawn="stale" if dropout else None,
                    gas="argon",
                    pressure_Pa=p * 1.6,
                    gap_m=0.03,
                    voltage_V=1200.0,
                    breakdown_V=None if dropout else 123.0 + p,
                    margin_V=None if dropout else 1077.0 - p,
                    strikes=True,
                    branch="left",
                    regime="abnormal glow",
                    worst="watch",
                )
            if k % int(1200 * rate) == 600:
                rec(
                    t,
                    "strike",
                    pressure_Pa=p * 1.6,
                    gap_m=0.03,
                    voltage_V=300.0 + p,
                    gas_temperature_K=293.15,
                    pressure_source="gauge",
                    gas="argon",
                    cathode="copper",
                    note="",
                    made_by="key",
                )
            if k % int(3600 * rate) == int(3540 * rate):
                rec(t, "flag", code="left_branch_longer_paths", level="watch", reason="longer paths", change="raised")
            if k % int(3600 * rate) == 0 and k:
                rec(t, "flag", code="left_branch_longer_paths", level="ok", reason="", change="cleared")
    return readings


def measure(quick: bool = False) -> dict[str, float]:
    """The report of an 8 h logbook (a few minutes of one in quick mode): time, peak memory, HTML size."""
    hours = 0.05 if quick else 8.0
    with tempfile.TemporaryDirectory() as tmp:
        log = Path(tmp, "shift.jsonl")
        readings = write_shift(log, hours)
        out = Path(tmp, "shift.html")
        t = time.perf_counter()
        proc = subprocess.Popen(
            [sys.executable, "-m", "strikeline.tui.cli", "report", str(log), "--out", str(out)],
            stdout=subprocess.PIPE,
            stderr=subprocess.PIPE,
            text=True,
        )
        peak = 0
        while proc.poll() is None:  # the report and its reading processes, summed, every 20 ms
            peak = max(peak, sum(_rss_kB(pid) for pid in _tree(proc.pid)))
            time.sleep(0.02)
        took = time.perf_counter() - t
        _out, err = proc.communicate()
        if proc.returncode != 0:
            raise RuntimeError(f"report failed: {err.strip()}")
        size = out.stat().st_size
    return {
        "report_8h_s": took,
        "report_8h_peak_MB": peak / 1024.0,  # resident memory, shared pages counted in each process
        "report_8h_html_MB": size / 1e6,
        "report_8h_readings": float(readings),
    }


def _tree(pid: int) -> list[int]:
    """``pid`` and every process below it (read from /proc)."""
    out, todo = [], [pid]
    while todo:
        p = todo.pop()
        out.append(p)
        try:
            with open(f"/proc/{p}/task/{p}/children") as f:
                todo += [int(c) for c in f.read().split()]
        except OSError:
            pass
    return out


def _rss_kB(pid: int) -> int:
    try:
        with open(f"/proc/{pid}/status") as f:
            for line in f:
                if line.startswith("VmRSS:"):
                    return int(line.split()[1])
    except OSError:
        pass
    return 0
