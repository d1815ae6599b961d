"""Fit a bench curve to strike points (from CSV or the screen's strike marks)."""

from __future__ import annotations

import datetime as _dt
import math
from dataclasses import dataclass, replace
from typing import Any

import numpy as np

from ..model.bench import Bench, OperatingPoint
from ..model.breakdown import breakdown_law
from ..model.calibration import FitResult, fit_curve
from ..model.forecast import forecast

__all__ = ["Calibration", "calibrate", "dc_like", "parse_free"]


@dataclass(frozen=True)
class Calibration:
    result: FitResult
    pd: tuple[float, ...]
    """Reduced pd of each point, Pa m (the forecast's own convention)."""
    voltage: tuple[float, ...]
    labels: tuple[str, ...]
    """Where each point came from (CSV line or strike mark)."""
    textbook_rms: float | None
    """RMS miss of the textbook curve on the same points, V."""
    textbook: dict[str, float]


def parse_free(text: str) -> tuple[str, ...]:
    """ "A,B" -> ("A", "B"); raises ValueError naming the accepted names."""
    names = {"a": "A", "b": "B", "gamma": "gamma", "g": "gamma"}
    out = []
    for part in text.split(","):
        key = part.strip().casefold()
        if key not in names:
            raise ValueError(f"--free {text!r}: {part.strip()!r} is not one of A, B, gamma (e.g. --free A,B)")
        out.append(names[key])
    return tuple(dict.fromkeys(out))


def dc_like(bench: Bench, points: list, labels: list[str]) -> tuple[list, list[str], list[str]]:
    """The marks Paschen's law describes: all of a DC or pulsed bench's, and those of an AC bench
    made where each half cycle breaks down as DC. (points, labels, why each other mark is left out)."""
    s = bench.supply
    if s is None or s.mode != "ac":
        return list(points), list(labels), []
    keep, names, problems = [], [], []
    for point, label in zip(points, labels, strict=True):
        p, d, _volts, temp = point
        f = forecast(OperatingPoint(p, d, None, temp or bench.gas_temperature), replace(bench, curve=None))
        if f.alternating is not None and f.alternating.regime == "dc-like":
            keep.append(point)
            names.append(label)
        else:
            regime = "no breakdown" if f.alternating is None else f.alternating.regime
            problems.append(
                f"{label}: {regime} breakdown at {s.frequency:g} Hz, which Paschen's law does not describe; left out"
            )
    return keep, names, problems


def calibrate(
    bench: Bench,
    points: list[tuple[float, float, float, float | None]],
    labels: list[str],
    free: tuple[str, ...] = ("A", "B"),
    today: str | None = None,
) -> Calibration:
    """Fit the bench's curve to (pressure Pa, gap m, voltage V, temperature K or None) points.
    Paschen's law is a DC law: an AC bench's marks go through :func:`dc_like` first."""
    textbook_bench = replace(bench, curve=None, supply=None)
    pd, v, vb = [], [], []
    for p, d, volts, temp in points:
        f = forecast(OperatingPoint(p, d, None, temp or bench.gas_temperature), textbook_bench)
        pd.append(f.reduced_pd)
        v.append(volts)
        vb.append(math.nan if f.breakdown_voltage is None else f.breakdown_voltage)
    law = breakdown_law(textbook_bench)
    c = law.effective_constants
    gamma = law.gamma
    result = fit_curve(
        np.array(pd),
        np.array(v),
        A=c.A,
        B=c.B,
        gamma=gamma,
        free=free,
        gas=bench.composition,
        cathode=bench.cathode.key,
        fitted_on=today or _dt.date.today().isoformat(),
    )
    miss = np.array(v) - np.array(vb)
    rms = float(np.sqrt(np.nanmean(miss**2))) if np.isfinite(miss).any() else None
    return Calibration(
        result, tuple(pd), tuple(v), tuple(labels), rms, {"A_per_Pa_m": c.A, "B_V_per_Pa_m": c.B, "gamma": gamma}
    )


def calibration_json(cal: Calibration, problems: tuple[str, ...] = ()) -> dict[str, Any]:
    """The ``fit --json`` contract (SI)."""
    cv = cal.result.curve
    return {
        "gas": cv.gas,
        "cathode": cv.cathode,
        "free": list(cal.result.free),
        "A_per_Pa_m": cv.A,
        "A_per_Pa_m_sigma": cv.A_sigma,
        "B_V_per_Pa_m": cv.B,
        "B_V_per_Pa_m_sigma": cv.B_sigma,
        "gamma": cv.gamma,
        "gamma_sigma": cv.gamma_sigma,
        "rms_residual_V": cv.rms_residual,
        "n_points": cv.n_points,
        "pd_range_Pa_m": [cv.pd_low, cv.pd_high],
        "band_level": 0.95,
        "fitted_on": cv.fitted_on,
        "textbook": cal.textbook | {"rms_residual_V": cal.textbook_rms},
        "residuals": [
            {"point": lab, "pd_Pa_m": x, "voltage_V": volts, "residual_V": r}
            for lab, x, volts, r in zip(cal.labels, cal.pd, cal.voltage, cal.result.residuals, strict=True)
        ],
        "warnings": list(problems) + list(cal.result.warnings),
    }


def calibration_summary(cal: Calibration) -> str:
    """A few short lines for the screen's calibration view (the full table is ``fit``'s)."""
    cv = cal.result.curve
    t = cal.textbook
    parts = []
    for name, value, sigma, book in (
        ("A", cv.A, cv.A_sigma, t["A_per_Pa_m"]),
        ("B", cv.B, cv.B_sigma, t["B_V_per_Pa_m"]),
        ("gamma", cv.gamma, cv.gamma_sigma, t["gamma"]),
    ):
        if name in cal.result.free:
            parts.append(f"{name} {value:.4g} +/-{sigma:.2g} (textbook {book:.4g})")
        else:
            parts.append(f"{name} {value:.3g} fixed")
    book = "n/a" if cal.textbook_rms is None else f"{cal.textbook_rms:.1f} V"
    lines = [
        f"bench curve for {cv.gas} on {cv.cathode}: {cv.n_points} strikes, fitted {', '.join(cal.result.free)}",
        "  " + "   ".join(parts),
        f"  rms residual {cv.rms_residual:.1f} V; textbook on the same strikes {book}; band 95 %",
    ]
    lines += [f"  warning: {w}" for w in cal.result.warnings[:2]]
    return "\n".join(lines)


def calibration_text(cal: Calibration, problems: tuple[str, ...] = ()) -> str:
    cv = cal.result.curve
    t = cal.textbook
    lines = [
        f"bench curve for {cv.gas} on {cv.cathode}: {cv.n_points} strikes, fitted {', '.join(cal.result.free)}",
        "",
    ]
    lines.append(f"  {'':<6} {'fitted':>12} {'+/- 1 sigma':>12} {'textbook':>12}")
    for name, value, sigma, book in (
        ("A", cv.A, cv.A_sigma, t["A_per_Pa_m"]),
        ("B", cv.B, cv.B_sigma, t["B_V_per_Pa_m"]),
        ("gamma", cv.gamma, cv.gamma_sigma, t["gamma"]),
    ):
        fixed = "" if name in cal.result.free else "  (fixed)"
        lines.append(f"  {name:<6} {value:>12.4g} {sigma:>12.2g} {book:>12.4g}{fixed}")
    lines.append("  (A in 1/(Pa m), B in V/(Pa m), reduced to the gas data's reference density)")
    book = "n/a" if cal.textbook_rms is None else f"{cal.textbook_rms:.1f} V"
    lines += ["", f"rms residual {cv.rms_residual:.1f} V (textbook constants on the same strikes: {book})", ""]
    lines.append(f"  {'point':<14} {'pd Pa m':>10} {'V':>8} {'residual V':>11}")
    for lab, x, volts, r in zip(cal.labels, cal.pd, cal.voltage, cal.result.residuals, strict=True):
        lines.append(f"  {lab:<14} {x:>10.4g} {volts:>8.0f} {r:>+11.1f}")
    for w in list(problems) + list(cal.result.warnings):
        lines.append(f"warning: {w}")
    return "\n".join(lines)
