"""strikeline's performance figures, printed as one JSON object with --json.

Budgets (ARCHITECTURE.md) are checked here, never in timed tests. Each group of figures lives in
its own file beside this one (``*_figures.py``: ``FIGURES``, ``BUDGETS``, ``measure(quick)``).
``--quick`` runs every group through the same code for a few seconds: the suite runs it so that a
crash fails CI, and it judges no budget (its spans are too short to mean anything).

    python tests/benchmarks/run.py --json
    python tests/benchmarks/run.py --quick
"""

from __future__ import annotations

import argparse
import json
import sys

import curve_figures
import fit_figures
import logbook_figures
import modbus_figures
import poll_figures
import screen_figures
import shiftreport_figures

GROUPS = (
    curve_figures,
    poll_figures,
    modbus_figures,
    fit_figures,
    screen_figures,
    logbook_figures,
    shiftreport_figures,
)
FIGURES = tuple(name for g in GROUPS for name in g.FIGURES)
BUDGETS = {name: budget for g in GROUPS for name, budget in g.BUDGETS.items()}


def within(value: float, budget: tuple[str, float]) -> bool:
    op, limit = budget
    return value <= limit if op == "<=" else value >= limit


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--json", action="store_true", help="print one JSON object of figures")
    ap.add_argument("--quick", action="store_true", help="a few seconds through the same code; no budget judged")
    args = ap.parse_args(argv)
    figures: dict[str, float] = {}
    for group in GROUPS:
        figures |= group.measure(quick=args.quick)
    missing = [name for name in FIGURES if name not in figures]
    if missing:
        raise SystemExit(f"run.py: figures not measured: {', '.join(missing)}")
    verdicts = {} if args.quick else {k: within(figures[k], b) for k, b in BUDGETS.items()}
    if args.json:
        out = {
            "figures": figures,
            "budgets": {k: f"{o} {b}" for k, (o, b) in BUDGETS.items()},
            "within_budget": verdicts,
            "quick": args.quick,
        }
        print(json.dumps(out, indent=2))
    else:
        for k, v in figures.items():
            b = BUDGETS.get(k)
            if b is None:
                mark = ""
            elif args.quick:
                mark = f"   budget {b[0]} {b[1]}: not judged (quick)"
            else:
                mark = f"   budget {b[0]} {b[1]}: {'ok' if verdicts[k] else 'OVER'}"
            print(f"{k:<30} {v:12.4g}{mark}")
    return 0 if all(verdicts.values()) else 1


if __name__ == "__main__":
    sys.exit(main())
