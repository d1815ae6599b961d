"""The benchmark script runs: its quick mode goes through every figure's code in seconds.

Budgets are judged only by a full run of ``tests/benchmarks/run.py``, never here; this test only
holds that the script does not crash and prints every figure it promises.
"""

import importlib.util
import subprocess
import sys
from pathlib import Path

import pytest

BENCH = Path(__file__).resolve().parent / "benchmarks"
pytestmark = pytest.mark.timeout(120)


def _promised_figures(monkeypatch) -> tuple[str, ...]:
    monkeypatch.syspath_prepend(str(BENCH))  # run.py imports its figure groups from beside it
    spec = importlib.util.spec_from_file_location("strikeline_benchmarks_run", BENCH / "run.py")
    run = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(run)
    return run.FIGURES


def test_quick_benchmark_run_prints_every_figure(monkeypatch):
    figures = _promised_figures(monkeypatch)
    assert len(figures) >= 20 and "terminal_bytes_per_s" in figures and "eight_hour_readings_lost" in figures
    r = subprocess.run([sys.executable, str(BENCH / "run.py"), "--quick"], capture_output=True, text=True, timeout=110)
    assert r.returncode == 0, r.stderr[-2000:]
    printed = {line.split()[0] for line in r.stdout.splitlines() if line.strip()}
    assert set(figures) <= printed, set(figures) - printed
    assert "Traceback" not in r.stderr
