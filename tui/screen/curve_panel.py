"""What the curve panels show, worked out as plain numbers (no Textual): testable on their own.

:func:`live_curve` gives the live panel's picture inputs and a key that changes only when the
picture would (so an unchanged picture is never redrawn); :func:`calibration_curve` gives the
calibration screen's. numpy and the model load with the first picture, not with the screen.
"""

from __future__ import annotations

import math
from dataclasses import replace
from typing import TYPE_CHECKING

from ...model.units import SYSTEMS
from .plot import CurveInputs
from .readouts import pd_display

if TYPE_CHECKING:
    from ...model.bench import Bench
    from ..calibrate import Calibration
    from ..session.session import View

__all__ = ["calibration_curve", "live_curve"]

_LEFT_SPAN = 30.0
"""How far left of the minimum (a factor in pd) the curve is drawn where its left branch has no end."""


def live_curve(
    bench: Bench,
    values: dict[str, float | None],
    view: View | None,
    units: str,
    width: int,
    height: int,
    colour: bool,
    marks: tuple[tuple[float, float], ...] = (),
    known: tuple | None = None,
) -> tuple[tuple, CurveInputs | None] | None:
    """(key, picture inputs) for the live panel of ``width`` x ``height`` cells, or None when the
    panel is too small to draw. ``values`` are the session's gap, voltage and gas temperature;
    ``marks`` this session's strikes as (pd in Pa m, V); the bench curve's own are drawn apart.
    When the key equals ``known`` (the picture on screen) the inputs are None: nothing is drawn.

    The key holds what the picture depends on: gas, cathode, gamma, supply voltage, units, size,
    the operating point rounded to a character cell, gas temperature and the fitted curve.
    """
    import numpy as np

    from ...model.curve import curve_of

    if width < 20 or height < 6:
        return None
    T = values["temperature"]
    c = curve_of(bench, gap=values["gap"], temperature=T, textbook=True)  # the default line; a fit over it
    law, freq, scale = c.law, c.frequency, c.scale
    gamma = law.gamma
    f = view.forecast if view is not None else None
    ratio = 1.0
    if f is not None and f.effective_pressure is not None:
        # Magnetised: in 5 % steps, so gauge noise does not redraw an unchanged picture.
        ratio = 10 ** (round(math.log10(f.effective_pressure / f.pressure) * 46) / 46)
    k = scale * ratio  # reduced pd = actual pd * k
    pd0 = law.no_breakdown_pd()
    pd_min, v_min = law.minimum()
    lo = max(pd0 * 1.01, pd_min / _LEFT_SPAN)  # a left branch without an end is drawn over 1.5 decades
    hi = pd_min * 300
    if f is not None:  # the operating point is always on the picture, even left of the asymptote
        lo = min(lo, f.reduced_pd / 2)
        hi = max(hi, f.reduced_pd * 3)
    to_x = pd_display(1.0, units)
    point = None
    if f is not None:
        point = (f.pd * to_x, math.nan if f.breakdown_voltage is None else f.breakdown_voltage)
    cols = max(width - 8, 10)
    bucket = (
        None
        if point is None
        else (
            round(math.log10(point[0]) * cols / math.log10(hi / lo)),
            None if math.isnan(point[1]) else round(math.log10(point[1]) * height / 4),
        )
    )
    key = (bench.composition, bench.cathode.key, gamma, values["voltage"], units, width, height, bucket, T, ratio)
    key += (freq, values["gap"] if freq is not None else None, marks)
    key += (bench.curve,)
    if key == known:
        return key, None  # the picture would not change: nothing is worked out
    rpd = np.geomspace(lo, hi, max(width * 2, 60))
    vb, _w = law.voltage(rpd)
    upper = None if freq is None else tuple(law.upper(rpd))
    inputs = CurveInputs(
        pd=tuple(rpd / k * to_x),
        vb=tuple(vb),
        point=point,
        minimum=(pd_min / k * to_x, v_min),
        supply=values["voltage"],
        fitted=None if freq is not None else _fitted(bench, rpd, k, to_x),
        upper=upper,
        marks=tuple((pd * to_x, v) for pd, v in marks),
        saved=_saved(bench, k, to_x),
        pd_unit=SYSTEMS[units]["pd"],
        width=width,
        height=height,
        colour=colour,
    )
    return key, inputs


def _fitted(bench: Bench, rpd, k: float, to_x: float):
    """(pd, V_b, low, high) of the bench's fitted curve and its band, if it fits this gas fill and cathode."""
    from ...model.calibration import prediction_band
    from ...model.curve import curve_of

    c = curve_of(bench)
    if c.fitted is None:
        return None
    v, lo, hi = prediction_band(c.fitted, c.dc.unscaled(), rpd)
    return tuple(rpd / k * to_x), tuple(v), tuple(lo), tuple(hi)


def _saved(bench: Bench, k: float, to_x: float) -> tuple[tuple[float, float], ...]:
    """The strikes the bench's own curve was fitted to, where that curve holds for this fill."""
    from ...model.curve import fitted_curve

    cv = fitted_curve(bench)
    return () if cv is None else tuple((rpd / k * to_x, v) for rpd, v in cv.marks)


def calibration_curve(
    cal: Calibration | None,
    bench: Bench,
    width: int,
    height: int,
    colour: bool,
    marks: tuple[tuple[float, float], ...] = (),
) -> CurveInputs:
    """The calibration screen's picture: the textbook curve, the fit with its band (when there is
    one) and the marks (the fit's, else ``marks`` as (reduced pd, V)), over reduced pd from a third of
    the lowest mark to three times the highest (two decades either side of the minimum without any)."""
    import numpy as np

    from ...model.calibration import prediction_band
    from ...model.curve import curve_of

    law = curve_of(replace(bench, curve=None, supply=None)).dc  # the DC law: the fit is a DC fit
    pd_min, v_min = law.minimum()
    points = tuple(zip(cal.pd, cal.voltage, strict=True)) if cal is not None else tuple(marks)
    if points:
        lo, hi = min(p for p, _ in points) / 3, max(p for p, _ in points) * 3
    else:
        lo, hi = pd_min / 100, pd_min * 100
    rpd = np.geomspace(lo, hi, 120)
    vb, _w = law.voltage(rpd)
    fitted = None
    if cal is not None:
        fv, flo, fhi = prediction_band(cal.result.curve, law, rpd)
        fitted = (tuple(rpd), tuple(fv), tuple(flo), tuple(fhi))
    return CurveInputs(
        pd=tuple(rpd),
        vb=tuple(vb),
        point=None,
        minimum=(pd_min, v_min),
        supply=None,
        fitted=fitted,
        marks=points,
        pd_unit="Pa m (reduced)",
        width=max(width, 30),
        height=max(height, 6),
        colour=colour,
    )
