"""Running text on the workbench that never splits a number from its unit.

Rich wraps text at any whitespace, a no-break space included, so "10 kΩ" could end
one line with "10" and start the next with "kΩ". :class:`Prose` wraps at ordinary
spaces only, after :func:`glue` has joined each number to its unit with a no-break
space.
"""

from __future__ import annotations

import re

from rich.console import Console, ConsoleOptions, RenderResult
from rich.measure import Measurement
from rich.text import Text

NBSP = "\u00a0"
#: A number, a space, then an SI unit (with prefix) or a percent sign.
_NUMBER_UNIT = re.compile(r"(\d) (?=(?:[pnuµmkMGT]?(?:s|Hz|Ω|F|V|A)|%)(?![A-Za-z]))")


def glue(text: str) -> str:
    """Join every number to its unit with a no-break space ("10 kΩ" stays whole)."""
    return _NUMBER_UNIT.sub(lambda m: m.group(1) + NBSP, text)


def glued(text: Text) -> Text:
    """The same Text with numbers glued to their units (styles kept: one char for one)."""
    out = text.copy()
    out.plain = glue(text.plain)
    return out


def _offsets(line: str, width: int) -> list[int]:
    """Where to break ``line`` so no piece is longer than ``width`` (ordinary spaces only)."""
    cuts: list[int] = []
    start = 0
    for m in re.finditer(r"[^ ]+", line):
        if m.end() - start > width and m.start() > start:
            cuts.append(m.start())
            start = m.start()
    return cuts


class Prose:
    """A Rich renderable: ``text`` wrapped at spaces, never inside "10 kΩ"."""

    def __init__(self, text: Text | str, style: str = "") -> None:
        self.text = glued(text if isinstance(text, Text) else Text(str(text), style=style))

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        width = max(1, options.max_width)
        lines = []
        for line in self.text.split("\n", allow_blank=True):
            for piece in line.divide(_offsets(line.plain, width)):
                piece.rstrip()
                lines.append(piece)
        out = Text("\n").join(lines)
        out.no_wrap = True
        out.overflow = "fold"  # a single word wider than the panel: fold it rather than lose it
        yield out

    def __rich_measure__(self, console: Console, options: ConsoleOptions) -> Measurement:
        longest = max((len(w) for w in re.findall(r"[^ \n]+", self.text.plain)), default=1)
        widest = max((len(line) for line in self.text.plain.split("\n")), default=1)
        return Measurement(min(longest, options.max_width), min(widest, options.max_width))
