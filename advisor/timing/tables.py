"""Published min/typ/max width tables, honoured by the law.

Some sheets print the output width at stated R, C and supply with its typical and
its guaranteed limits (NXP HEF4538B Table 8, onsemi MC14528B switching
characteristics). Such a row is data (``timing.widths``). For the maker whose sheet
it is, the law is fitted to each row:

    fit   = typ / law(R_row, C_row, VDD_row)        (nominal correction)
    minus = 1 − min/typ,  plus = max/typ − 1         (guaranteed part-to-part spread)

so at a row the nominal is the sheet's typical and, with exact R and C, the band is
the sheet's min..max. Between rows the three numbers are interpolated, first
piecewise-linearly in log C among the rows of one supply, then linearly in supply
between the published supplies; beyond the outermost rows the nearest row's
numbers hold. The result is continuous in C and supply (no jumps between
published points). R enters through the law only (every table row here is at one R
per C, and the laws are linear in R).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Callable

from advisor.parts import WidthRow


@dataclass(frozen=True)
class TableFit:
    """The fitted correction at one supply and C."""

    fit: float  # multiplier on the law's nominal width
    minus: float | None  # guaranteed spread below typical (fraction), None when no limits printed
    plus: float | None
    rows: tuple[WidthRow, ...]  # the rows the numbers came from

    def to_json(self) -> dict:
        return {"fit": self.fit, "minus": self.minus, "plus": self.plus,
                "rows": [{"source": r.source, "table": r.table, "r": r.r, "c": r.c, "vcc": r.vcc,
                          "min": r.min, "typ": r.typ, "max": r.max} for r in self.rows]}


def _lerp(x: float, x0: float, x1: float, y0, y1):
    if x1 == x0:
        return y0
    w = min(max((x - x0) / (x1 - x0), 0.0), 1.0)
    # A row without printed limits (None) takes its neighbour's limits.
    return tuple(b if a is None else a if b is None else a + w * (b - a) for a, b in zip(y0, y1))


def _along(x: float, points: list[tuple[float, tuple]]) -> tuple:
    """Piecewise-linear value at ``x`` over sorted (x, values) points, clamped at the ends."""
    if x <= points[0][0]:
        return points[0][1]
    if x >= points[-1][0]:
        return points[-1][1]
    for (x0, y0), (x1, y1) in zip(points, points[1:]):
        if x0 <= x <= x1:
            return _lerp(x, x0, x1, y0, y1)
    return points[-1][1]  # pragma: no cover - unreachable for sorted points


def fit_table(rows: list[WidthRow], law: Callable[[float, float, float], float],
              vcc: float, c: float) -> TableFit | None:
    """The fitted (fit, minus, plus) at ``vcc`` (V), ``c`` (F) for ``rows``.

    ``law(r, c, vcc)`` is the maker's nominal width (s) without any correction.
    """
    if not rows:
        return None
    per_row = []
    for row in rows:
        w = law(row.r, row.c, row.vcc)
        if not w or w <= 0 or not math.isfinite(w):
            continue
        minus = 1.0 - row.min / row.typ if row.min is not None else None
        plus = row.max / row.typ - 1.0 if row.max is not None else None
        per_row.append((row, (row.typ / w, minus, plus)))
    if not per_row:
        return None
    levels: dict[float, list[tuple[float, tuple]]] = {}
    for row, vals in per_row:
        levels.setdefault(round(row.vcc, 6), []).append((math.log(row.c), vals))
    lc = math.log(c)
    at_supply = []
    for v, pts in sorted(levels.items()):
        pts.sort(key=lambda p: p[0])
        at_supply.append((v, _along(lc, pts)))
    fit, minus, plus = _along(vcc, at_supply)
    return TableFit(fit, minus, plus, tuple(r for r, _ in per_row))
