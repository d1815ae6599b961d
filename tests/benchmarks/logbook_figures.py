"""Figures of the logbook: a shift through the real Session and Logbook on a simulated clock."""

from __future__ import annotations

import time

FIGURES = (
    "eight_hour_rss_growth_MB",
    "eight_hour_readings_logged",
    "eight_hour_readings_expected",
    "eight_hour_readings_lost",
    "logbook_records_per_s",
)
BUDGETS = {
    "eight_hour_rss_growth_MB": ("<=", 10.0),
    "eight_hour_readings_lost": ("<=", 0.0),
    # a 100-channel bench at 10 Hz writes 1000 records a second (our sizing)
    "logbook_records_per_s": (">=", 1000.0),
}


def _rss_mb() -> float:
    with open("/proc/self/status") as f:
        for line in f:
            if line.startswith("VmRSS:"):
                return int(line.split()[1]) / 1024
    return float("nan")


def measure(quick: bool = False) -> dict[str, float]:
    """A shift on a simulated clock through the real Session and Logbook: RSS growth, record rate.

    The full run is 8 h at 10 Hz; the quick one a few simulated minutes through the same code."""
    hours, rate_hz = (0.05 if quick else 8.0), 10.0
    import gc
    import tempfile
    from pathlib import Path

    from strikeline.drivers.logbook import Logbook, read_logbook
    from strikeline.drivers.reading import Reading, Status
    from strikeline.drivers.sim import Scenario, pressure_at, supply_at
    from strikeline.profiles.bench import load_bench
    from strikeline.tui.session.session import Session

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
        warm = min(int(600 * rate_hz), steps // 5)  # ten simulated minutes (or a fifth) before measuring
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
                session.update(t)
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
        "eight_hour_readings_lost": steps * 3 - readings,
        "logbook_records_per_s": written / elapsed,
    }
