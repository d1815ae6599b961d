"""A panel of text lines that repaints only the lines that changed (the readouts, the curve).

When one number moves, sending the whole panel again would cost a slow SSH link a few hundred
bytes and the screen a render of every line; a panel of one widget per line costs Textual a widget
render each. :class:`LinesView` keeps its lines and marks only the changed ones dirty (Textual's
line API), so the terminal gets the changed rows and the compositor renders one widget.
"""

from __future__ import annotations

from rich.segment import Segment
from rich.text import Text
from textual.geometry import Region
from textual.strip import Strip
from textual.widget import Widget

__all__ = ["LinesView"]


class LinesView(Widget):
    """Lines of text, one per row of the widget; a line wider than the widget ends in an ellipsis."""

    def __init__(self, **kwargs) -> None:
        super().__init__(**kwargs)
        self.line_keys: list[str] = []
        """What each line shown is, as given (plain text with its styles, or ANSI text)."""
        self.lines: list[Text] = []
        self._strips: dict[int, Strip] = {}
        """Rendered rows at the width they were rendered for (dropped on a change or resize)."""
        self._strip_width = -1
        self._row_style = None
        """The widget's own colours, looked up once (a lookup walks the DOM); new CSS clears it."""

    def show(self, lines: list[Text]) -> int:
        """Show ``lines``; repaints only those that differ from the lines shown before. Returns how
        many rows were repainted."""
        keys = [line.plain + "|" + "".join(f"{s.start},{s.end},{s.style}" for s in line.spans) for line in lines]
        return self._show(keys, lambda y: lines[y])

    def show_ansi(self, picture: str) -> int:
        """Show a picture given as text with ANSI colours (lines joined by newlines)."""
        rows = picture.split("\n")
        return self._show(rows, lambda y: Text.from_ansi(rows[y]))

    def _show(self, keys: list[str], text_of) -> int:
        old = self.line_keys
        changed = [y for y in range(max(len(keys), len(old))) if _at(keys, y) != _at(old, y)]
        lines = self.lines[: len(keys)]
        for y in changed:
            self._strips.pop(y, None)
            if y < len(keys):
                if y < len(lines):
                    lines[y] = text_of(y)
                else:
                    lines.append(text_of(y))
        self.line_keys, self.lines = keys, lines
        width = self.size.width
        for y in changed:
            self.refresh(Region(0, y, width, 1))
        return len(changed)

    @property
    def plain(self) -> str:
        """The lines as plain text (no colours)."""
        return "\n".join(line.plain for line in self.lines)

    def notify_style_update(self) -> None:
        super().notify_style_update()
        self._row_style = None
        self._strips.clear()

    def render_line(self, y: int) -> Strip:
        width = self.size.width
        if width != self._strip_width:
            self._strips.clear()
            self._strip_width = width
        strip = self._strips.get(y)
        if strip is None:
            strip = self._strips[y] = self._render_row(y, width)
        return strip

    def _render_row(self, y: int, width: int) -> Strip:
        if self._row_style is None:
            self._row_style = self.rich_style
        style = self._row_style
        if y >= len(self.lines):
            return Strip.blank(width, style)
        text = self.lines[y].copy()
        text.no_wrap = True
        text.truncate(width, overflow="ellipsis")
        segments = [s for s in text.render(self.app.console) if s.text != "\n"]
        # on the widget's own colours, as a Static's text is; every segment then has a style, which
        # the screen's filters (NO_COLOR) expect
        return Strip(segments or [Segment("")]).apply_style(style).crop_extend(0, width, style)


def _at(lines: list[str], y: int) -> str | None:
    return lines[y] if y < len(lines) else None
