"""The pin-move picture of a swap: old and new package outlines side by side.

Each outline is a dual-in-line body seen from above (pin 1 top left, counting down the
left side and up the right, the usual numbering of DIP and SO packages); pins that
move, and pins the rework ties, are highlighted and carry the number of the rework
step that handles them, so the picture and the bench steps read together. Pin names
come from the catalog's packages; which pins move and which step handles them come
from the swap's ``pin_map`` and ``rework`` JSON: nothing is decided here.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from html import escape
from typing import Any

INK = "#1f2a33"
MOVED = "#b5562a"
TIED = "#2b4c6f"
PAPER = "#ffffff"
FONT = "DejaVu Sans, Helvetica, Arial, sans-serif"


@dataclass(frozen=True)
class Outline:
    family: str
    package: str
    pins: tuple[tuple[int, str], ...]  # (number, maker's label), every pin of the package
    marks: dict[int, tuple[str, int | None]] = field(default_factory=dict)  # pin -> ("moved"|"tied", step)


@dataclass(frozen=True)
class PinMoves:
    old: Outline
    new: Outline


def _package(fam: Any, name: str | None):
    if fam is None or not fam.packages:
        return None
    return next((p for p in fam.packages if p.name == name), fam.default_package())


def pin_moves(result: dict, catalog: Any) -> PinMoves | None:
    """The picture's content from a swap result, or None without a pin map or packages."""
    pm = result.get("pin_map")
    if not isinstance(pm, dict) or not isinstance(pm.get("links"), list) or catalog is None:
        return None
    fams = []
    for key in ("old_family", "new_family"):
        try:
            fams.append(catalog.get(str(pm.get(key))))
        except Exception:  # a family the catalog does not know: no picture
            return None
    old_pkg = _package(fams[0], pm.get("old_package"))
    new_pkg = _package(fams[1], pm.get("new_package"))
    if old_pkg is None or new_pkg is None:
        return None
    step_of: dict[int, int] = {}  # new pin -> first rework step that names it
    for s in result.get("rework") or []:
        if isinstance(s, dict):
            for p in s.get("pins") or []:
                if isinstance(p, int):
                    step_of.setdefault(p, int(s.get("n") or 0) or None)
    old_marks: dict[int, tuple[str, int | None]] = {}
    new_marks: dict[int, tuple[str, int | None]] = {}
    for link in pm["links"]:
        if isinstance(link, dict) and link.get("moved"):
            step = step_of.get(link.get("new_pin"))
            if isinstance(link.get("old_pin"), int):
                old_marks[link["old_pin"]] = ("moved", step)
            if isinstance(link.get("new_pin"), int):
                new_marks[link["new_pin"]] = ("moved", step)
    for tie in pm.get("ties") or []:
        if isinstance(tie, dict) and isinstance(tie.get("new_pin"), int):
            new_marks.setdefault(tie["new_pin"], ("tied", step_of.get(tie["new_pin"])))
    return PinMoves(
        Outline(fams[0].id, old_pkg.name, tuple(sorted((p.pin, p.name) for p in old_pkg.pins)), old_marks),
        Outline(fams[1].id, new_pkg.name, tuple(sorted((p.pin, p.name) for p in new_pkg.pins)), new_marks),
    )


_PITCH = 22
_BODY_W = 150


def _outline(o: Outline, x0: float, y0: float) -> tuple[list[str], float]:
    n = max((p for p, _ in o.pins), default=0)
    half = (n + 1) // 2
    names = dict(o.pins)
    h = half * _PITCH + 16
    out = [f'<text x="{x0 + _BODY_W / 2}" y="{y0 - 8}" font-size="12" font-weight="bold" fill="{INK}" '
           f'text-anchor="middle">{escape(o.family)} · {escape(o.package)}</text>',
           f'<rect x="{x0}" y="{y0}" width="{_BODY_W}" height="{h}" rx="4" fill="{PAPER}" stroke="{INK}" stroke-width="1.5"/>',
           f'<path d="M {x0 + _BODY_W / 2 - 9} {y0} a 9 9 0 0 0 18 0" fill="none" stroke="{INK}" stroke-width="1.2"/>']
    for pin in range(1, n + 1):
        left = pin <= half
        row = pin - 1 if left else n - pin
        y = y0 + 12 + row * _PITCH + _PITCH / 2
        px = x0 - 16 if left else x0 + _BODY_W
        mark = o.marks.get(pin)
        fill = MOVED if mark and mark[0] == "moved" else TIED if mark else PAPER
        ink = PAPER if mark else INK
        cls = f' class="pin {mark[0]}"' if mark else ' class="pin"'
        out.append(f'<rect{cls} data-pin="{pin}" x="{px}" y="{y - 7}" width="16" height="14" fill="{fill}" '
                   f'stroke="{INK}" stroke-width="1"/>')
        out.append(f'<text x="{px + 8}" y="{y + 4}" font-size="9" fill="{ink}" text-anchor="middle">{pin}</text>')
        label = names.get(pin, "")
        out.append(f'<text x="{x0 + 6 if left else x0 + _BODY_W - 6}" y="{y + 4}" font-size="10" fill="{INK}" '
                   f'text-anchor="{"start" if left else "end"}">{escape(label)}</text>')
        if mark and mark[1]:
            bx = px - 14 if left else px + 30
            out.append(f'<circle cx="{bx}" cy="{y}" r="8" fill="{PAPER}" stroke="{fill}" stroke-width="1.5"/>'
                       f'<text class="step" x="{bx}" y="{y + 3.5}" font-size="9" fill="{INK}" '
                       f'text-anchor="middle">{mark[1]}</text>')
    return out, h


def pin_moves_svg(pm: PinMoves) -> str:
    """Both outlines side by side, with a legend in words."""
    parts: list[str] = []
    a, ha = _outline(pm.old, 60, 34)
    b, hb = _outline(pm.new, 60 + _BODY_W + 150, 34)
    parts += a + b
    mid_y = 34 + max(ha, hb) / 2
    ax = 60 + _BODY_W + 50
    parts.append(f'<path d="M {ax} {mid_y} H {ax + 50}" stroke="{INK}" stroke-width="1.5" fill="none"/>'
                 f'<path d="M {ax + 50} {mid_y} l -8 -5 v 10 z" fill="{INK}"/>')
    y = 34 + max(ha, hb) + 22
    parts.append(f'<rect x="60" y="{y - 10}" width="12" height="12" fill="{MOVED}"/>'
                 f'<text x="78" y="{y}" font-size="10" fill="{INK}">pin moves to another number</text>'
                 f'<rect x="260" y="{y - 10}" width="12" height="12" fill="{TIED}"/>'
                 f'<text x="278" y="{y}" font-size="10" fill="{INK}">tied to a level on the new part</text>'
                 f'<circle cx="466" cy="{y - 4}" r="7" fill="{PAPER}" stroke="{INK}"/>'
                 f'<text x="480" y="{y}" font-size="10" fill="{INK}">rework step number</text>')
    width, height = 60 + 2 * _BODY_W + 150 + 70, y + 12
    title = f"Pin moves: {pm.old.family} {pm.old.package} to {pm.new.family} {pm.new.package}"
    return (f'<svg xmlns="http://www.w3.org/2000/svg" role="img" aria-label="{escape(title)}" class="pic pinmoves" '
            f'viewBox="0 0 {width} {height}" width="{width}" height="{height}" font-family="{FONT}">'
            f"<title>{escape(title)}</title>{''.join(parts)}</svg>")
