"""The shift report's figures, drawn with matplotlib's non-interactive backend (no display needed).

Every figure reads in black and white: line styles and markers tell the lines apart, colour only
helps. Labels carry units. Each figure is built as a matplotlib ``Figure`` first (the tests read its
data back from the artists before anything is rendered), then written as SVG text or a file.
"""

from __future__ import annotations

import io
from pathlib import Path

import numpy as np

from .data import CurveData, ReportData

__all__ = ["FIGURE_FORMATS", "curve_figure", "fit_figure", "flags_figure", "save", "series_figure", "svg_text"]

FIGURE_FORMATS = (".png", ".svg", ".pdf")
_A4_WIDTH = 7.0
"""in: the width of a figure on an A4 page inside its margins."""


def _mpl():
    import matplotlib

    matplotlib.use("Agg", force=True)  # never a window: over SSH there is no display
    matplotlib.rcParams.update({"svg.hashsalt": "strikeline", "svg.fonttype": "none", "font.size": 8})
    from matplotlib.figure import Figure

    return Figure


def curve_figure(curve: CurveData, data: ReportData | None = None, title: str = ""):
    """The breakdown curve: textbook, fitted with its band, the supply's voltage, the strike marks
    (typed and seen by the instruments, drawn apart) and the operating point's path."""
    fig = _mpl()(figsize=(_A4_WIDTH, 4.2))
    ax = fig.add_subplot()
    ax.plot(curve.pd, curve.textbook, "k-", lw=1.4, label="textbook breakdown voltage V_b", gid="textbook")
    if curve.upper is not None and np.isfinite(curve.upper).any():
        ax.plot(curve.pd, curve.upper, "k-.", lw=1.2, label="upper branch (electrons swept out)", gid="upper")
    if curve.fitted is not None:
        v, lo, hi = curve.fitted
        ax.plot(curve.pd, v, "k--", lw=1.2, label="this bench's fitted curve", gid="fitted")
        ax.fill_between(
            curve.pd,
            lo,
            hi,
            facecolor="0.85",
            edgecolor="0.5",
            hatch="///",
            lw=0.4,
            label="where the next strike should fall",
            gid="band",
        )
    if curve.supply is not None:
        how = "amplitude" if curve.upper is not None else "open circuit"
        ax.axhline(curve.supply, color="0.3", ls=":", lw=1.2, label=f"supply {curve.supply:.0f} V {how}", gid="supply")
    ax.plot(*curve.minimum, "kD", ms=5, mfc="white", label="textbook minimum", gid="minimum")
    if data is not None:
        pd, v = data.path
        if len(pd):
            ax.plot(
                pd,
                v,
                color="tab:blue",
                ls="-",
                lw=0.6,
                alpha=0.6,
                label="operating point (pd, supply voltage)",
                gid="path",
            )
        for made_by, style, label in (
            ("key", "k+", "strike marked by key"),
            ("detected", "kx", "strike seen, confirmed"),
        ):
            pts = [(m["pressure_Pa"] * m["gap_m"], m["voltage_V"]) for m in data.strikes if _made_by(m) == made_by]
            if pts:
                x, y = zip(*pts, strict=True)
                ax.plot(x, y, style, ms=9, mew=1.6, ls="none", label=label, gid=f"marks-{made_by}")
    ax.set_xscale("log")
    ax.set_yscale("log")
    ax.set_xlim(curve.pd[0], curve.pd[-1])
    top = np.nanmax(curve.textbook[np.isfinite(curve.textbook)]) if np.isfinite(curve.textbook).any() else 1e4
    ax.set_ylim(max(curve.minimum[1] / 2, 1.0), min(top, 3e5) * 1.2)
    ax.set_xlabel("pd (Pa m) at the bench's gas temperature")
    ax.set_ylabel("voltage (V)")
    ax.grid(True, which="both", color="0.9", lw=0.5)
    ax.legend(loc="upper center", fontsize=7, framealpha=0.9)
    if title:
        ax.set_title(title, fontsize=9)
    fig.tight_layout()
    return fig


def _made_by(mark: dict) -> str:
    return "detected" if mark.get("made_by") == "detected" else "key"


def series_figure(data: ReportData):
    """Pressure (gas-corrected and indicated), supply voltage and current, breakdown voltage and strike
    margin against one time axis; gaps and faults shaded, strike marks drawn."""
    s = data.series
    panels = [
        ("pressure (Pa)", [("pressure", "k-", "gas-corrected"), ("pressure_indicated", "k--", "indicated")], "log"),
        ("supply (V)", [("voltage", "k-", "supply voltage")], "linear"),
        ("current (mA)", [("current", "k-", "discharge current")], "linear"),
        ("voltage (V)", [("breakdown", "k-", "breakdown V_b"), ("margin", "k:", "strike margin")], "linear"),
    ]
    panels = [p for p in panels if any(name in s and len(s[name].t) for name, _st, _l in p[1])]
    fig = _mpl()(figsize=(_A4_WIDTH, 1.6 * max(len(panels), 1) + 0.6))
    axes = fig.subplots(max(len(panels), 1), 1, sharex=True, squeeze=False)[:, 0]
    t0 = data.summary.get("start") or 0.0
    unit, per = _time_unit(data)
    for ax, (ylabel, lines, yscale) in zip(axes, panels, strict=False):
        for name, style, label in lines:
            if name in s and len(s[name].t):
                scale = 1e3 if name == "current" else 1.0
                ax.plot((s[name].t - t0) / per, s[name].v * scale, style, lw=0.8, label=label, gid=name)
        if yscale == "log" and all(np.nanmin(s[n].v) > 0 for n, _st, _l in lines if n in s and len(s[n].t)):
            ax.set_yscale("log")
        ax.set_ylabel(ylabel)
        ax.grid(True, color="0.9", lw=0.5)
        if len(lines) > 1:
            ax.legend(loc="upper right", fontsize=7)
        _shade(ax, data, t0, per)
    axes[-1].set_xlabel(f"time since the start of the log ({unit})")
    fig.tight_layout()
    return fig


def _time_unit(data: ReportData) -> tuple[str, float]:
    """Minutes for a log up to three hours, hours beyond: (unit, seconds per unit)."""
    return ("h", 3600.0) if data.summary.get("span_s", 0.0) > 3 * 3600 else ("min", 60.0)


def _shade(ax, data: ReportData, t0: float, per: float) -> None:
    end = data.summary.get("end") or t0
    for g in data.summary["gaps"]:
        a, b = g["from"], g["to"] if g["to"] is not None else end
        ax.axvspan((a - t0) / per, (b - t0) / per, facecolor="0.88", edgecolor="0.6", hatch="xx", lw=0, gid="gap")
    for e in data.summary["faults"]:
        if e.get("t_unix") is not None:
            ax.axvline((e["t_unix"] - t0) / per, color="0.5", ls="-.", lw=0.6, gid="fault")
    for m in data.strikes:
        if m.get("t_unix") is not None:
            ax.axvline((m["t_unix"] - t0) / per, color="k", ls=(0, (1, 1)), lw=0.9, gid="strike")


def flags_figure(data: ReportData):
    """Each flag's raised spans, worst first; hatching tells the levels apart."""
    rows = data.flags
    fig = _mpl()(figsize=(_A4_WIDTH, 0.35 * max(len(rows), 1) + 0.9))
    ax = fig.add_subplot()
    t0 = data.summary.get("start") or 0.0
    end = data.summary.get("end") or t0
    unit, per = _time_unit(data)
    hatch = {"danger": "////", "watch": "...."}
    for i, f in enumerate(rows):
        spans = [((a - t0) / per, ((b if b is not None else end) - a) / per) for a, b in f.spans]
        ax.broken_barh(
            spans,
            (len(rows) - i - 0.8, 0.6),
            facecolors="0.75" if f.level == "danger" else "white",
            edgecolors="k",
            hatch=hatch.get(f.level, ""),
            lw=0.6,
            gid=f"flag-{f.code}",
        )
    ax.set_yticks([len(rows) - i - 0.5 for i in range(len(rows))], [f"{f.code} ({f.level})" for f in rows], fontsize=7)
    ax.set_xlim(0, max((end - t0) / per, 1e-3))
    ax.set_ylim(0, max(len(rows), 1))
    ax.set_xlabel(f"time since the start of the log ({unit})")
    if not rows:
        ax.text(0.5, 0.5, "no flag was raised", ha="center", va="center", transform=ax.transAxes)
    fig.tight_layout()
    return fig


def fit_figure(curve: CurveData, marks: list[tuple[float, float]], title: str):
    """The fit: textbook and fitted curves with the band, and the strikes it was fitted to."""
    fig = curve_figure(curve, None, title)
    ax = fig.axes[0]
    if marks:
        x, y = zip(*marks, strict=True)
        ax.plot(x, y, "k+", ms=9, mew=1.6, ls="none", label="strikes fitted", gid="marks-fitted")
        ax.legend(loc="upper center", fontsize=7, framealpha=0.9)
    return fig


def svg_text(fig) -> str:
    """The figure as SVG markup to put inline in HTML (no XML prolog, no external reference)."""
    buf = io.StringIO()
    fig.savefig(buf, format="svg", metadata={"Date": None})
    text = buf.getvalue()
    return text[text.index("<svg") :]


def save(fig, path: Path) -> None:
    """Write the figure to ``path`` (.png, .svg or .pdf, by its suffix), signed as strikeline's in its
    metadata (so a later report may replace it), through a temporary file and a rename."""
    import os
    import tempfile

    suffix = path.suffix.lower()
    meta = {".svg": {"Creator": "strikeline", "Date": None}, ".pdf": {"Creator": "strikeline", "CreationDate": None}}
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=suffix, dir=path.parent)
    os.close(fd)
    try:
        fig.savefig(tmp, dpi=200, format=suffix[1:], metadata=meta.get(suffix, {"Software": "strikeline"}))
        os.replace(tmp, path)
    except BaseException:
        os.unlink(tmp)
        raise
