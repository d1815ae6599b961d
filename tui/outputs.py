"""What the verbs write: output paths checked before any work, atomic files, JSON without NaN, and
standard output that fails in one line (a full device, a closed pipe) instead of a traceback."""

from __future__ import annotations

import errno
import json
import os
import stat
import sys
from collections.abc import Callable
from pathlib import Path
from typing import Any

__all__ = ["OutputError", "StdoutGuard", "check_output_file", "print_json", "write_file"]


class OutputError(Exception):
    """Output could not be written; the message is one line."""


def print_json(obj: Any, *, indent: int | None = 2, flush: bool = False) -> None:
    """Print ``obj`` as JSON with every NaN or infinity as null (JSON has neither)."""
    from ..model.results import json_safe  # with the first JSON, not with the screen

    print(json.dumps(json_safe(obj), indent=indent, allow_nan=False), flush=flush)


def check_output_file(path: str, option: str, *, ours: Callable[[str], bool] | None = None) -> Path:
    """``path`` checked before any work: not empty, not a folder, in a folder that exists and can be
    written. An existing file is replaced only if ``ours(its first line)`` says it is one we wrote;
    otherwise it is refused, so no one's data is overwritten. Raises :class:`OutputError`."""
    if not path or not path.strip():
        raise OutputError(f"{option} is empty; give a file name")
    p = Path(path).expanduser()
    try:
        st = p.stat()
    except FileNotFoundError:
        st = None
    except OSError as e:
        raise OutputError(f"{option} {path!r}: cannot be checked ({e.strerror or e})") from None
    if st is not None:
        if stat.S_ISDIR(st.st_mode):
            raise OutputError(f"{option} {path!r}: is a folder; give a file name inside it")
        if not stat.S_ISREG(st.st_mode):
            raise OutputError(f"{option} {path!r}: is not a regular file; give a file name")
        if st.st_size and ours is not None and not ours(_first_line(p)):
            raise OutputError(f"{option} {path!r}: exists and was not written by strikeline; it is left untouched")
    folder = p.parent if str(p.parent) else Path(".")
    if not folder.is_dir():
        raise OutputError(f"{option} {path!r}: the folder {str(folder)!r} does not exist")
    if not os.access(folder, os.W_OK | os.X_OK):
        raise OutputError(f"{option} {path!r}: the folder {str(folder)!r} cannot be written")
    return p


def _first_line(p: Path) -> str:
    try:
        with open(p, encoding="utf-8", errors="replace") as f:
            return f.readline(4096).rstrip("\r\n")
    except OSError:
        return ""


def write_file(path: Path, text: str, option: str) -> None:
    """Write ``text`` to ``path`` atomically (a temporary file and a rename); one-line failure."""
    try:
        from ..profiles.bench import write_atomic

        write_atomic(path, text)
    except OSError as e:
        raise OutputError(f"{option} {str(path)!r}: cannot be written ({e.strerror or e})") from None


class StdoutGuard:
    """Standard output whose write errors become :class:`OutputError` (one line, exit status 2), so
    ``strikeline curve > /dev/full`` says so instead of printing a traceback. Everything else is the
    wrapped stream's."""

    def __init__(self, stream):
        self._stream = stream

    def write(self, text: str) -> int:
        try:
            return self._stream.write(text)
        except OSError as e:
            raise _as_output_error(e) from None

    def flush(self) -> None:
        try:
            self._stream.flush()
        except OSError as e:
            raise _as_output_error(e) from None

    def __getattr__(self, name: str):
        return getattr(self._stream, name)


def _as_output_error(e: OSError) -> OutputError | BrokenPipeError:
    if e.errno == errno.EPIPE or isinstance(e, BrokenPipeError):
        return BrokenPipeError(e.errno, e.strerror)
    return OutputError(f"standard output cannot be written ({e.strerror or e})")


def silence_stdout() -> None:
    """Point standard output at the null device, so Python's final flush of a dead stream (a closed
    pipe, a full device) cannot print a traceback after the one-line error."""
    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.__stdout__.fileno())
    except (OSError, AttributeError, ValueError):
        pass
