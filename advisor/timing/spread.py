"""Part-to-part spread of one maker's part: which published figure applies, and how
a typical figure is widened.

A family records its spread (``timing.spread``) as guaranteed limits where the sheet
prints them (a min and max column), or as a typical figure. A typical figure
describes an ordinary part, not the worst one, so it is widened by one rule:

    bound = TYPICAL_WIDENING × typical

with ``TYPICAL_WIDENING = 3`` (common practice: a typical spread is read as about one
standard deviation of production, and guaranteed limits sit near three; the NE555
sheet's 1 % typical / 3 % maximum initial error fits this, TI SLFS022). Bounds are
capped at ``MAX_BOUND`` so a width never goes to zero.

Spreads are picked per maker: an entry with ``maker`` (or the maker's source) speaks
for that maker only; entries without one speak for every maker. Among the entries
that apply at this supply and C the widest is used; between published supplies the
bounds are interpolated linearly in supply (no jump), beyond them the nearest holds.
"""

from __future__ import annotations

from dataclasses import dataclass

from advisor.parts import Family, Spread

#: A typical spread figure times this is the bound the band uses (module docstring).
TYPICAL_WIDENING = 3.0
#: Widened bounds are capped here (fractions of the nominal).
MAX_BOUND = 0.9


@dataclass(frozen=True)
class PartSpread:
    """The spread used for one maker's part: (minus, plus) fractions, and where from."""

    minus: float
    plus: float
    basis: str  # "guaranteed" | "typical" (widened) | "table" | "none"
    sources: tuple[str, ...] = ()
    widened: bool = False

    def to_json(self) -> dict:
        return {"minus": self.minus, "plus": self.plus, "basis": self.basis,
                "widened": self.widened, "sources": list(self.sources)}


NO_SPREAD = PartSpread(0.0, 0.0, "none")


def widened(entry: Spread) -> tuple[float, float, bool]:
    """(minus, plus, widened?) of one entry after the typical-figure rule."""
    lo, hi = entry.bounds()
    if entry.basis == "typical":
        return min(lo * TYPICAL_WIDENING, MAX_BOUND), min(hi * TYPICAL_WIDENING, MAX_BOUND), True
    return lo, hi, False


def _mid(entry: Spread, vcc: float) -> float:
    lo = entry.vcc_min if entry.vcc_min is not None else entry.vcc_max
    hi = entry.vcc_max if entry.vcc_max is not None else entry.vcc_min
    return (lo + hi) / 2 if lo is not None and hi is not None else vcc


def part_spread(family: Family, maker: str | None, source: str | None,
                vcc: float | None, c: float | None) -> PartSpread:
    """The spread of ``maker``'s part (``source``: the sheet its constant came from)."""
    entries = list(family.timing.spread)
    if not entries:
        return NO_SPREAD
    own = [e for e in entries if (maker is not None and e.maker == maker) or (source is not None and e.source == source)]
    pool = own or [e for e in entries if e.maker is None] or entries
    fits = [e for e in pool if e.applies(vcc, c)]
    if not fits and vcc is not None:
        at_c = [e for e in pool if e.applies(None, c)] or pool
        below = [e for e in at_c if _mid(e, vcc) <= vcc]
        above = [e for e in at_c if _mid(e, vcc) > vcc]
        if below and above:  # between published supplies: linear in supply, no jump
            b = max(below, key=lambda e: _mid(e, vcc))
            a = min(above, key=lambda e: _mid(e, vcc))
            w = (vcc - _mid(b, vcc)) / (_mid(a, vcc) - _mid(b, vcc))
            (bl, bh, bw), (al, ah, aw) = widened(b), widened(a)
            return PartSpread(bl + w * (al - bl), bh + w * (ah - bh), "typical" if bw or aw else "guaranteed",
                              tuple(dict.fromkeys((b.source, a.source))), bw or aw)
        best = min(abs(_mid(e, vcc) - vcc) for e in at_c)
        fits = [e for e in at_c if abs(_mid(e, vcc) - vcc) <= best + 1e-9]
    fits = fits or pool
    lo = hi = 0.0
    was_widened = False
    basis = "guaranteed"
    for e in fits:
        a, b, w = widened(e)
        lo, hi = max(lo, a), max(hi, b)
        if w:
            was_widened = True
            basis = "typical"
    ids = tuple(dict.fromkeys(e.source for e in fits))
    return PartSpread(lo, hi, basis, ids, was_widened)
