"""What a Textual screen shows, as text: the rows of its SVG screenshot (the picture Textual itself
renders), so a test can ask whether a sentence is visible whole rather than whether a widget holds it."""

from __future__ import annotations

import html
import re
from collections import defaultdict

__all__ = ["screen_rows", "visible"]

_TEXT = re.compile(r'<text class="[^"]*" x="([\d.]+)" y="([\d.]+)" textLength="([\d.]+)"[^>]*>(.*?)</text>')


def screen_rows(app) -> list[str]:
    """The screen's rows, top to bottom, each piece of text at its own cell column."""
    rows: dict[float, list[tuple[float, str]]] = defaultdict(list)
    cell = None
    for m in _TEXT.finditer(app.export_screenshot()):
        text = html.unescape(m[4]).replace("\xa0", " ")
        rows[float(m[2])].append((float(m[1]), text))
        if cell is None and len(text) > 3:
            cell = float(m[3]) / len(text)
    out = []
    for _y, parts in sorted(rows.items()):
        line = ""
        for x, text in sorted(parts):
            col = round(x / (cell or 12.2))
            line = line.ljust(col)[:col] + text
        out.append(line)
    return out


def visible(app, sentence: str, frame: str | None = None) -> bool:
    """Whether ``sentence`` can be read on the screen, wrapped over rows or not. ``frame`` (a box
    character such as "┃") reads only what lies inside a dialog drawn with it."""
    rows = screen_rows(app)
    if frame is not None:  # inside the dialog, its scroll bar aside
        rows = [re.sub("[▁▂▃▄▅▆▇█]", " ", r[r.index(frame) + 1 : r.rindex(frame)]) for r in rows if r.count(frame) >= 2]
    words = " ".join(" ".join(rows).split())
    return " ".join(sentence.split()) in words
