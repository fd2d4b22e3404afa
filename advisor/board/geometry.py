"""Library symbols and where their pins land on the sheet.

A library symbol (``lib_symbols`` of a schematic, KiCad 6+ format) holds units as
sub-symbols named ``NAME_U_S``: unit ``U`` (0 = common to every unit) and body
style ``S`` (0 = both, 1 = normal, 2 = De Morgan). A pin's ``(at x y angle)`` is its
connection point in library coordinates, whose Y axis points *up*; the schematic's
Y axis points *down* (KiCad file-format documentation, "Schematic File Format",
symbol section; the library file format uses the same Y-up convention).

A placed symbol ``(at X Y A)`` with optional ``(mirror x|y)`` puts a library point
``(x, y)`` at ``(X, Y) + R(A) · M · (x, −y)``: first the Y flip into sheet
orientation, then the mirror (``x``: about the horizontal axis, ``y``: about the
vertical one), then a counter-clockwise rotation by A degrees as seen on screen.
The KiCad demo projects' PCB pad nets check this order (tests/test_board_kicad_demos.py).
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

from advisor.board import sexpr

_UNIT = re.compile(r"_(\d+)_(\d+)$")


@dataclass(frozen=True)
class LibPin:
    number: str
    name: str
    kind: str  # electrical type
    x: float
    y: float  # library coordinates, Y up
    unit: int  # 0: every unit
    style: int  # 0: every body style
    hidden: bool


@dataclass(frozen=True)
class LibSymbol:
    name: str
    power: bool  # a power symbol: its pin names a global net after the symbol's value
    pins: tuple[LibPin, ...]
    units: int

    def pins_for(self, unit: int, style: int) -> list[LibPin]:
        return [p for p in self.pins if p.unit in (0, unit) and p.style in (0, style)]


def _pins(node: list, unit: int, style: int, out: list[LibPin]) -> None:
    for c in node[1:]:
        t = sexpr.tag(c)
        if t == "symbol" and len(c) > 1 and isinstance(c[1], str):
            m = _UNIT.search(str(c[1]))
            _pins(c, int(m.group(1)) if m else unit, int(m.group(2)) if m else style, out)
        elif t == "pin" and len(c) > 1:
            x, y, _ = sexpr.at(c)
            name = sexpr.value(c, "name", "")
            number = sexpr.value(c, "number", "")
            out.append(LibPin(str(number), str(name), str(c[1]), x, y, unit, style, sexpr.has_flag(c, "hide")))


def read_lib_symbols(root: list) -> dict[str, LibSymbol]:
    """Every embedded library symbol of a schematic by its name (the symbols' ``lib_id``)."""
    out: dict[str, LibSymbol] = {}
    block = sexpr.child(root, "lib_symbols")
    if block is None:
        return out
    raw = {str(s[1]): s for s in sexpr.children(block, "symbol") if len(s) > 1}
    for name, node in raw.items():
        pins: list[LibPin] = []
        base = sexpr.value(node, "extends")
        _pins(node, 0, 0, pins)
        if not pins and base is not None and str(base) in raw:  # a derived symbol takes its base's pins
            _pins(raw[str(base)], 0, 0, pins)
        units = max([p.unit for p in pins] + [1])
        out[name] = LibSymbol(name, sexpr.child(node, "power") is not None, tuple(pins), units)
    return out


def place(x: float, y: float, origin: tuple[float, float], angle: float, mirror: str | None) -> tuple[float, float]:
    """Sheet position of library point (x, y) for a symbol at ``origin``, ``angle`` (deg), ``mirror``."""
    px, py = x, -y  # library Y up -> sheet Y down
    if MIRROR_FIRST:
        px, py = _mirror(px, py, mirror)
    a = int(round(angle)) % 360
    if a == 0:
        rx, ry = px, py
    elif a == 90:
        rx, ry = py, -px
    elif a == 180:
        rx, ry = -px, -py
    elif a == 270:
        rx, ry = -py, px
    else:  # KiCad places symbols at right angles only; keep any other exact
        t = math.radians(a)
        rx, ry = px * math.cos(t) + py * math.sin(t), -px * math.sin(t) + py * math.cos(t)
    if not MIRROR_FIRST:
        rx, ry = _mirror(rx, ry, mirror)
    return (origin[0] + rx, origin[1] + ry)


MIRROR_FIRST = False


def _mirror(x: float, y: float, mirror: str | None) -> tuple[float, float]:
    if mirror == "x":
        return x, -y
    if mirror == "y":
        return -x, y
    return x, y
