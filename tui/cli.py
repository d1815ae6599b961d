"""The ``strikeline`` command: dispatch to the verbs, and the one place errors become one line.

Every verb prints readable text by default and JSON with ``--json``. A bad value ends
with one line on stderr naming the value and the accepted form, and exit status 2; an
unexpected failure prints one line and leaves the traceback in the log file. The verbs
themselves live in :mod:`strikeline.tui.verbs`.
"""

from __future__ import annotations

import logging
import sys
from collections.abc import Sequence

from ..drivers.logbook import LogbookRefused
from ..model.units import QuantityError
from ..profiles.fields import ProfileError
from .outputs import OutputError, StdoutGuard, silence_stdout
from .verbs import forecast, instruments, logbook, ports
from .verbs.parser import SAFETY, UsageError, build_parser

__all__ = ["SAFETY", "UsageError", "build_parser", "main"]

log = logging.getLogger("strikeline")

VERBS = [
    instruments.add_live,
    forecast.add_strike,
    forecast.add_curve,
    instruments.add_gauge,
    ports.add_ports,
    instruments.add_record,
    logbook.add_fit,
    logbook.add_log,
    logbook.add_report,
    forecast.add_gases,
]
"""Each verb adds itself to the parser, in the order ``--help`` lists them."""


def parser():
    """The full ``strikeline`` parser."""
    return build_parser(VERBS)


def _join_negative_values(argv: list[str]) -> list[str]:
    """Let "--gap -1mm" reach the unit parser (and its message) instead of argparse
    taking "-1mm" for an option."""
    out: list[str] = []
    i = 0
    while i < len(argv):
        tok = argv[i]
        nxt = argv[i + 1] if i + 1 < len(argv) else ""
        if (
            tok.startswith("--")
            and "=" not in tok
            and len(nxt) > 1
            and nxt[0] == "-"
            and (nxt[1].isdigit() or nxt[1] == ".")
        ):
            out.append(f"{tok}={nxt}")
            i += 2
            continue
        out.append(tok)
        i += 1
    return out


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; returns the exit status (0 fine, 2 bad input or output that cannot be
    written, 1 nothing read or an internal error)."""
    argv = _join_negative_values(list(sys.argv[1:] if argv is None else argv))
    p = parser()
    verb = next((a for a in argv if a in p.verbs), None)
    if not isinstance(sys.stdout, StdoutGuard):
        sys.stdout = StdoutGuard(sys.stdout)
    try:
        # With no arguments strikeline opens the screen on the built-in demo bench, so a new
        # user sees the whole job at once (or prints its forecast when not on a terminal).
        if not argv:
            argv = ["live"] if sys.stdout.isatty() and sys.stdin.isatty() else ["strike", "--bench", "demo"]
        args = p.parse_args(argv)
        if args.verb is None:
            raise UsageError("strikeline: name a verb: strike, curve or gases (see strikeline --help)")
        status = args.run(args)
        sys.stdout.flush()  # a full device or closed pipe is met here, not at interpreter exit
        return status
    except (UsageError, QuantityError, ProfileError, LogbookRefused, OutputError) as e:
        if isinstance(e, OutputError):
            silence_stdout()
        _say(verb, str(e))
        return 2
    except BrokenPipeError:  # `strikeline curve | head`: the reader had enough
        silence_stdout()
        _say(verb, "the output was closed before the end (broken pipe)")
        return 0
    except KeyboardInterrupt:
        return 130
    except Exception as e:  # noqa: BLE001 - the entry point shows one line and logs the rest
        where = "the log"
        try:
            from .locations import error_log_path

            path = error_log_path()
            handler = logging.FileHandler(path, encoding="utf-8")
            log.addHandler(handler)
            log.exception("internal error running %r", argv)
            handler.close()
            where = str(path)
        except OSError:
            pass
        print(
            f"strikeline: internal error: {e.__class__.__name__}: {_one_line(str(e))} (details in {where})",
            file=sys.stderr,
        )
        return 1


def _one_line(text: str) -> str:
    return " ".join(text.split())


def _say(verb: str | None, text: str) -> None:
    """One line on stderr, prefixed with the verb."""
    msg = _one_line(text)
    if not msg.startswith("strikeline"):
        msg = f"strikeline {verb}: {msg}" if verb else f"strikeline: {msg}"
    print(msg, file=sys.stderr)


if __name__ == "__main__":
    sys.exit(main())
