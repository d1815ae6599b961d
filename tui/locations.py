"""Where strikeline keeps files (platformdirs): logbooks and its own error log."""

from __future__ import annotations

import datetime as _dt
import re
from pathlib import Path

__all__ = ["error_log_path", "new_logbook_path"]


def _data_dir() -> Path:
    from platformdirs import user_data_path

    return user_data_path("strikeline", appauthor=False)


def new_logbook_path(bench_name: str, t_wall: float) -> Path:
    """A fresh logbook file for a session: <data>/logbooks/<bench>-<UTC time>.jsonl."""
    stamp = _dt.datetime.fromtimestamp(t_wall, _dt.UTC).strftime("%Y%m%dT%H%M%SZ")
    safe = re.sub(r"[^A-Za-z0-9._-]+", "-", bench_name).strip("-") or "bench"
    return _data_dir() / "logbooks" / f"{safe}-{stamp}.jsonl"


def error_log_path() -> Path:
    """The file that keeps tracebacks of unexpected failures."""
    from platformdirs import user_log_path

    return user_log_path("strikeline", appauthor=False, ensure_exists=True) / "strikeline.log"
