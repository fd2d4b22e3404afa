"""IEC 60063 preferred-number series E3 to E192, and look-ups on a log scale.

The tables are the standard's printed values (IEC 60063:2015, formerly IEC 63), as
significant digits of one decade. They are data, not a formula: in E24 and below
2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7 and 8.2 differ from round(10**(i/24), 1), and E192
prints 9.20 where the formula gives 9.19. Source: IEC 60063, as tabulated in
Wikipedia "E-series of preferred numbers"; checked in tests against the ``eseries``
package and the published irregular values.
"""

from __future__ import annotations

import bisect
import math
from functools import lru_cache

from advisor.errors import InputError

#: Significant digits of one decade for each series (two digits up to E24, three above).
TABLES: dict[str, tuple[int, ...]] = {
    "E3": (
        10, 22, 47,
    ),
    "E6": (
        10, 15, 22, 33, 47, 68,
    ),
    "E12": (
        10, 12, 15, 18, 22, 27, 33, 39, 47, 56, 68, 82,
    ),
    "E24": (
        10, 11, 12, 13, 15, 16, 18, 20, 22, 24, 27, 30, 33, 36, 39, 43, 47, 51, 56, 62, 68,
        75, 82, 91,
    ),
    "E48": (
        100, 105, 110, 115, 121, 127, 133, 140, 147, 154, 162, 169, 178, 187, 196, 205, 215,
        226, 237, 249, 261, 274, 287, 301, 316, 332, 348, 365, 383, 402, 422, 442, 464, 487,
        511, 536, 562, 590, 619, 649, 681, 715, 750, 787, 825, 866, 909, 953,
    ),
    "E96": (
        100, 102, 105, 107, 110, 113, 115, 118, 121, 124, 127, 130, 133, 137, 140, 143, 147,
        150, 154, 158, 162, 165, 169, 174, 178, 182, 187, 191, 196, 200, 205, 210, 215, 221,
        226, 232, 237, 243, 249, 255, 261, 267, 274, 280, 287, 294, 301, 309, 316, 324, 332,
        340, 348, 357, 365, 374, 383, 392, 402, 412, 422, 432, 442, 453, 464, 475, 487, 499,
        511, 523, 536, 549, 562, 576, 590, 604, 619, 634, 649, 665, 681, 698, 715, 732, 750,
        768, 787, 806, 825, 845, 866, 887, 909, 931, 953, 976,
    ),
    "E192": (
        100, 101, 102, 104, 105, 106, 107, 109, 110, 111, 113, 114, 115, 117, 118, 120, 121,
        123, 124, 126, 127, 129, 130, 132, 133, 135, 137, 138, 140, 142, 143, 145, 147, 149,
        150, 152, 154, 156, 158, 160, 162, 164, 165, 167, 169, 172, 174, 176, 178, 180, 182,
        184, 187, 189, 191, 193, 196, 198, 200, 203, 205, 208, 210, 213, 215, 218, 221, 223,
        226, 229, 232, 234, 237, 240, 243, 246, 249, 252, 255, 258, 261, 264, 267, 271, 274,
        277, 280, 284, 287, 291, 294, 298, 301, 305, 309, 312, 316, 320, 324, 328, 332, 336,
        340, 344, 348, 352, 357, 361, 365, 370, 374, 379, 383, 388, 392, 397, 402, 407, 412,
        417, 422, 427, 432, 437, 442, 448, 453, 459, 464, 470, 475, 481, 487, 493, 499, 505,
        511, 517, 523, 530, 536, 542, 549, 556, 562, 569, 576, 583, 590, 597, 604, 612, 619,
        626, 634, 642, 649, 657, 665, 673, 681, 690, 698, 706, 715, 723, 732, 741, 750, 759,
        768, 777, 787, 796, 806, 816, 825, 835, 845, 856, 866, 876, 887, 898, 909, 920, 931,
        942, 953, 965, 976, 988,
    ),
}

#: Nominal tolerance of each series (IEC 60063), as a fraction.
TOLERANCE: dict[str, float] = {
    "E3": 0.40, "E6": 0.20, "E12": 0.10, "E24": 0.05, "E48": 0.02, "E96": 0.01, "E192": 0.005,
}


def _name(series: str) -> str:
    key = series.upper().strip()
    if not key.startswith("E"):
        key = "E" + key
    if key not in TABLES:
        raise InputError(
            f"unknown E-series {series!r}", got=series, expected="one of " + ", ".join(TABLES)
        )
    return key


def series_name(text: str, flag: str = "--series") -> str:
    """The canonical name of a series typed by a user (``e96`` → ``E96``); an unknown
    name is bad input (exit 2) naming the flag. One parser for every command's
    ``--series`` and ``--c-series``."""
    try:
        return _name(str(text))
    except InputError as exc:
        raise InputError(f"{flag}: {exc.message}", got=text, expected="one of " + ", ".join(TABLES)) from None


@lru_cache(maxsize=None)
def mantissas(series: str) -> tuple[float, ...]:
    """The series' values in one decade, [1, 10), as floats (1.0, 2.2, 4.7 for E3)."""
    key = _name(series)
    scale = 10 if len(TABLES[key]) <= 24 else 100
    return tuple(v / scale for v in TABLES[key])


def values_between(series: str, lo: float, hi: float) -> list[float]:
    """Every value of ``series`` with lo <= v <= hi (SI units; lo > 0)."""
    if lo <= 0 or hi < lo:
        return []
    out: list[float] = []
    for decade in range(math.floor(math.log10(lo)) - 1, math.floor(math.log10(hi)) + 2):
        for m in mantissas(series):
            v = _at(m, decade)
            if lo * (1 - 1e-12) <= v <= hi * (1 + 1e-12):
                out.append(v)
    return sorted(out)


def _at(mantissa: float, decade: int) -> float:
    # Round to the series' printed digits so 4.7 * 1e3 is exactly 4700.0.
    return float(f"{mantissa:.2f}e{decade}")


#: Decades the look-up ladder spans: 1 fΩ/fF/fs up to 10 TΩ, far beyond any part.
_DECADES = range(-16, 14)


@lru_cache(maxsize=None)
def _ladder(series: str) -> tuple[float, ...]:
    """Every value of the series over :data:`_DECADES`, sorted (built once per series)."""
    return tuple(_at(m, d) for d in _DECADES for m in mantissas(series))


def neighbours(series: str, value: float) -> tuple[float, float]:
    """The series values just at-or-below and just at-or-above ``value`` (> 0)."""
    if not value > 0 or not math.isfinite(value):
        raise InputError(f"no preferred value for {value!r}", got=value, expected="a positive number")
    cands = _ladder(_name(series))
    if not cands[0] < value < cands[-1]:
        raise InputError(f"no preferred value for {value!r}", got=value, expected="a value between 1e-16 and 1e13")
    i = bisect.bisect_left(cands, value * (1 - 1e-12))
    if i < len(cands) and abs(cands[i] - value) <= value * 1e-12:
        return cands[i], cands[i]
    return cands[i - 1], cands[i]


def nearest(series: str, value: float) -> float:
    """The series value nearest ``value`` on a log scale (9.08 in E12 gives 10, not 8.2)."""
    lo, hi = neighbours(series, value)
    return lo if math.log(value / lo) <= math.log(hi / value) else hi


def next_up(series: str, value: float) -> float:
    """The smallest series value strictly above ``value``."""
    lo, hi = neighbours(series, value)
    if hi > value * (1 + 1e-12):
        return hi
    return neighbours(series, value * 1.0001)[1]


def next_down(series: str, value: float) -> float:
    """The largest series value strictly below ``value``."""
    lo, hi = neighbours(series, value)
    if lo < value * (1 - 1e-12):
        return lo
    return neighbours(series, value * 0.9999)[0]


def tolerance(series: str) -> float:
    """The series' nominal tolerance as a fraction (E24: 0.05)."""
    return TOLERANCE[_name(series)]
