"""The breakdown-curve picture, drawn with plotext behind one function of ours.

``curve_picture`` takes plain numbers and returns text with ANSI colour codes, so the
screen never touches plotext itself and the backend can change in one place. plotext
keeps one global figure; this module is its only user and clears it every time.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

__all__ = ["CurveInputs", "curve_picture", "legend"]


@dataclass(frozen=True)
class CurveInputs:
    """What the picture shows (x in the display's pd unit, y in V)."""

    pd: tuple[float, ...]
    vb: tuple[float, ...]
    """NaN where no breakdown."""
    point: tuple[float, float] | None
    """(pd, V_b) of the operating point; V_b may be NaN."""
    minimum: tuple[float, float]
    supply: float | None
    fitted: tuple[tuple[float, ...], tuple[float, ...], tuple[float, ...], tuple[float, ...]] | None = None
    """(pd, V_b, low, high) of a fitted bench curve and its band."""
    marks: tuple[tuple[float, float], ...] = ()
    """This session's strikes (pd, V)."""
    saved: tuple[tuple[float, float], ...] = ()
    """The strikes the bench's saved curve was fitted to (pd, V), drawn apart from this session's."""
    upper: tuple[float, ...] | None = None
    """The upper branch of an alternating supply's curve at the same pd (NaN where single-valued):
    the curve turns back at low pressure, and the supply strikes only between the two branches."""
    pd_unit: str = "Pa m"
    width: int = 40
    height: int = 12
    colour: bool = True


def legend(c: CurveInputs, width: int) -> str:
    """The picture's key in words, only what the picture shows, in at most ``width`` characters
    (the least needed entries go first when it does not fit). plotext's own legend does not fit small
    plots."""
    y = [v for v in c.vb if v == v and v > 0]
    entries = [("• V_b" if c.upper is None else "• V_b both branches", 0)]
    if c.supply is not None and c.supply > 0:
        if any(v <= c.supply for v in y):
            entries.append(("⣿ strikes", 1))
        entries.append(("─ supply", 2))
    if c.point is not None:
        entries.append(("@ now" if c.point[1] == c.point[1] else "| now", 0))
    entries.append(("m min", 4))
    if c.fitted is not None:
        entries += [("x fit", 1), (": band", 3)]
    if c.marks:
        entries.append(("+ marks", 1))
    if c.saved:
        entries.append(("o fitted marks", 2))
    for cut in (5, 4, 3, 2, 1):
        text = "  ".join(e for e, rank in entries if rank < cut)
        if len(text) <= width:
            return text
        text = " ".join(e for e, rank in entries if rank < cut)
        if len(text) <= width:
            return text
    return text[:width]


def _ticks(lo: float, hi: float) -> tuple[list[float], list[str]]:
    """1-2-5 ticks between lo and hi on a log axis."""
    vals: list[float] = []
    for e in range(math.floor(math.log10(lo)) - 1, math.ceil(math.log10(hi)) + 1):
        for m in (1, 2, 5):
            v = m * 10.0**e
            if lo <= v <= hi:
                vals.append(v)
    if len(vals) > 6:
        vals = [v for v in vals if round(v / 10 ** math.floor(math.log10(v))) == 1] or vals[::2]
    return vals, [_short(v) for v in vals]


def _short(v: float) -> str:
    if v >= 1e3:
        return f"{v / 1e3:g}k"
    if v >= 1:
        return f"{v:g}"
    return f"{v:.0e}".replace("e-0", "e-")


def curve_picture(c: CurveInputs) -> str:
    """The picture as text (ANSI colours unless ``c.colour`` is False).

    Both axes are logarithmic: log10 values are drawn on linear axes with 1-2-5 tick labels,
    which plotext handles more predictably than its own log scale with fixed limits.
    """
    import numpy as np
    import plotext as plt

    plt.clear_figure()
    plt.plotsize(max(c.width, 20), max(c.height, 6))
    plt.theme("pro" if c.colour else "clear")
    x = np.asarray(c.pd, dtype=float)
    y = np.asarray(c.vb, dtype=float)
    ok = np.isfinite(y) & (y > 0)
    if not ok.any():
        return "no breakdown anywhere on this range"
    lx = np.log10(x)

    def line(mask, values, marker, colour):
        # One plotext series per contiguous run, so separate runs are not joined up.
        idx = np.flatnonzero(mask)
        for run in np.split(idx, np.flatnonzero(np.diff(idx) > 1) + 1):
            if run.size:
                plt.plot(list(lx[run]), list(np.log10(values[run])), marker=marker, color=colour)

    ys = [y[ok]]
    up = np.full(y.shape, np.nan) if c.upper is None else np.asarray(c.upper, dtype=float)
    above = np.isfinite(up) & (up > 0)
    if above.any():
        line(above, up, "dot", "cyan")
        ys.append(up[above][up[above] <= 100 * float(np.min(y[ok]))])  # never let it crush the scale
    if c.supply is not None and c.supply > 0:
        strikes = ok & (y <= c.supply) & ~(above & (up < c.supply))
        line(ok & ~strikes, y, "dot", "cyan")
        line(strikes, y, "braille", "green")
        plt.hline(math.log10(c.supply), "yellow")
        ys.append(np.array([c.supply]))
    else:
        line(ok, y, "dot", "cyan")
    if c.fitted is not None:
        fx, fy, flo, fhi = (np.asarray(a, dtype=float) for a in c.fitted)
        g = np.isfinite(fy) & (fy > 0)
        if g.any():
            plt.scatter(list(np.log10(fx[g])), list(np.log10(fy[g])), marker="x", color="magenta")
            ys.append(fy[g])
            # The band can run off towards zero or infinity near the asymptote: it is drawn, but
            # never allowed to set the scale.
            lo_clip, hi_clip = float(np.min(fy[g])) / 2, float(np.max(fy[g])) * 2
            for band in (flo, fhi):
                b = g & np.isfinite(band) & (band >= lo_clip) & (band <= hi_clip)
                if b.any():
                    plt.scatter(list(np.log10(fx[b])), list(np.log10(band[b])), marker=":", color="magenta")
    for marks, marker in ((c.saved, "o"), (c.marks, "+")):
        if marks:
            mx = [math.log10(a) for a, b in marks if a > 0 and b > 0]
            my = [math.log10(b) for a, b in marks if a > 0 and b > 0]
            plt.scatter(mx, my, marker=marker, color="yellow")
            ys.append(np.array([b for _, b in marks if b > 0]))
    plt.scatter([math.log10(c.minimum[0])], [math.log10(c.minimum[1])], marker="m", color="white")
    if c.point is not None and math.isfinite(c.point[1]) and c.point[1] > 0:
        plt.scatter([math.log10(c.point[0])], [math.log10(c.point[1])], marker="@", color="red")
    elif c.point is not None and c.point[0] > 0:
        plt.vline(math.log10(c.point[0]), "red")
    allv = np.concatenate(ys)
    v_lo = float(np.min(allv)) * 0.8
    v_hi = min(float(np.max(allv)) * 1.25, v_lo * 1e4)
    plt.ylim(math.log10(v_lo), math.log10(v_hi))
    plt.xlim(float(lx[0]), float(lx[-1]))
    yv, yl = _ticks(v_lo, v_hi)
    xv, xl = _ticks(float(x[0]), float(x[-1]))
    plt.yticks([math.log10(v) for v in yv], yl)
    plt.xticks([math.log10(v) for v in xv], xl)
    plt.xlabel(f"pd [{c.pd_unit}]")
    return plt.build()
