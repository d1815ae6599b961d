"""Fit a bench curve to strike points (from CSV or the screen's strike marks)."""

from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass, replace
from typing import Any

import numpy as np

from ..model.bench import Bench
from ..model.calibration import FitResult, fit_curve
from ..model.curve import curve_of

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
    """The unscaled law's view: its A, B (1/(Pa m), V/(Pa m)) and gamma at its minimum."""


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
    """The marks the DC law describes: all of a DC or pulsed bench's, and those of an AC bench made where
    each half cycle breaks down as DC. (points, labels, why each other mark is left out)."""
    s = bench.supply
    if s is None or s.mode != "ac":
        return list(points), list(labels), []
    keep, names, problems = [], [], []
    for point, label in zip(points, labels, strict=True):
        p, d, _volts, temp = point
        c = curve_of(bench, gap=d, temperature=temp or bench.gas_temperature, textbook=True)
        rpd = float(c.reduced(p)[0])
        regime = str(c.law.regimes(rpd))
        if regime == "dc-like":
            keep.append(point)
            names.append(label)
        else:
            problems.append(
                f"{label}: {regime} breakdown at {s.frequency:g} Hz, which the DC law does not describe; left out"
            )
    return keep, names, problems


def calibrate(
    bench: Bench,
    points: list[tuple[float, float, float, float | None]],
    labels: list[str],
    free: tuple[str, ...] = ("A", "B"),
    today: str | None = None,
) -> Calibration:
    """Fit the bench's curve to (pressure Pa, gap m, voltage V, temperature K or None) points: the
    scales of the fill's own DC law on this cathode. An AC bench's marks go through :func:`dc_like`
    first."""
    dc_bench = replace(bench, curve=None, supply=None)
    pd, v, vb = [], [], []
    for p, d, volts, temp in points:
        c = curve_of(dc_bench, gap=d, temperature=temp or bench.gas_temperature)
        rpd = float(c.reduced(p)[0])
        pd.append(rpd)
        v.append(volts)
        vb.append(float(c.law.voltage(rpd)[0][()]))
    law = curve_of(dc_bench).dc
    result = fit_curve(
        np.array(pd),
        np.array(v),
        law,
        free=free,
        gas=bench.composition,
        cathode=bench.cathode.key,
        fitted_on=today or _dt.date.today().isoformat(),
    )
    miss = np.array(v) - np.array(vb)
    rms = float(np.sqrt(np.nanmean(miss**2))) if np.isfinite(miss).any() else None
    c = law.effective_constants
    return Calibration(
        result, tuple(pd), tuple(v), tuple(labels), rms, {"A_per_Pa_m": c.A, "B_V_per_Pa_m": c.B, "gamma": law.gamma}
    )


def fitted_view(cal: Calibration) -> list[tuple[str, float, float, float]]:
    """(name, fitted value, one sigma, textbook value) of A (1/(Pa m)), B (V/(Pa m)) and gamma (at the
    minimum): the unscaled law's view times the fitted scales."""
    cv = cal.result.curve
    t = cal.textbook
    sig = cv.sigmas
    rows = []
    for i, (name, key, scale) in enumerate(
        (("A", "A_per_Pa_m", cv.alpha_scale), ("B", "B_V_per_Pa_m", cv.field_scale), ("gamma", "gamma", cv.gamma_scale))
    ):
        value = t[key] * scale
        rows.append((name, value, value * sig[i], t[key]))
    return rows


def calibration_json(cal: Calibration, problems: tuple[str, ...] = ()) -> dict[str, Any]:
    """The ``fit --json`` contract (SI): the fitted law's A, B and gamma (its textbook view times the
    fitted scales), their sigmas and the scales themselves."""
    cv = cal.result.curve
    view = {name: (value, sigma) for name, value, sigma, _book in fitted_view(cal)}
    return {
        "gas": cv.gas,
        "cathode": cv.cathode,
        "free": list(cal.result.free),
        "A_per_Pa_m": view["A"][0],
        "A_per_Pa_m_sigma": view["A"][1],
        "B_V_per_Pa_m": view["B"][0],
        "B_V_per_Pa_m_sigma": view["B"][1],
        "gamma": view["gamma"][0],
        "gamma_sigma": view["gamma"][1],
        "scales": {"alpha": cv.alpha_scale, "field": cv.field_scale, "gamma": cv.gamma_scale},
        "rms_residual_V": cv.rms_residual,
        "n_points": cv.n_points,
        "reduced_pd_range_Pa_m": [cv.pd_low, cv.pd_high],
        "band_level": 0.95,
        "fitted_on": cv.fitted_on,
        "textbook": cal.textbook | {"rms_residual_V": cal.textbook_rms},
        "residuals": [
            {"point": lab, "reduced_pd_Pa_m": x, "voltage_V": volts, "residual_V": r}
            for lab, x, volts, r in zip(cal.labels, cal.pd, cal.voltage, cal.result.residuals, strict=True)
        ],
        "warnings": list(problems) + list(cal.result.warnings),
    }


def calibration_summary(cal: Calibration) -> str:
    """A few short lines for the screen's calibration view (the full table is ``fit``'s)."""
    cv = cal.result.curve
    parts = []
    for name, value, sigma, book in fitted_view(cal):
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
    lines = [
        f"bench curve for {cv.gas} on {cv.cathode}: {cv.n_points} strikes, fitted {', '.join(cal.result.free)}",
        "",
    ]
    lines.append(f"  {'':<6} {'fitted':>12} {'+/- 1 sigma':>12} {'textbook':>12}")
    for name, value, sigma, book in fitted_view(cal):
        fixed = "" if name in cal.result.free else "  (fixed)"
        lines.append(f"  {name:<6} {value:>12.4g} {sigma:>12.2g} {book:>12.4g}{fixed}")
    lines.append("  (the fill's own law with its ionisation (A), field (B) and gamma scaled; A in 1/(Pa m), B in")
    lines.append("   V/(Pa m) and gamma at the minimum, reduced to the gas data's reference density)")
    book = "n/a" if cal.textbook_rms is None else f"{cal.textbook_rms:.1f} V"
    lines += ["", f"rms residual {cv.rms_residual:.1f} V (the default curve on the same strikes: {book})", ""]
    lines.append(f"  {'point':<14} {'reduced pd':>10} {'V':>8} {'residual V':>11}")
    for lab, x, volts, r in zip(cal.labels, cal.pd, cal.voltage, cal.result.residuals, strict=True):
        lines.append(f"  {lab:<14} {x:>10.4g} {volts:>8.0f} {r:>+11.1f}")
    for w in list(problems) + list(cal.result.warnings):
        lines.append(f"warning: {w}")
    return "\n".join(lines)
