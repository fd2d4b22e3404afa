"""Worst-case band: the law evaluated at every corner of its inputs' intervals, for
each maker's formula, and the union over the makers.

Each input with a range (resistors ± their tolerance, capacitor ± its tolerance,
a constant a sheet gives as a range, the part-to-part spread) takes its low or high
end; the band is the lowest and highest value of every output over all corners.
The RC laws are monotonic in each input, so the corners bound the whole box
(common practice for worst-case analysis). With n ranged inputs there are 2^n
corners; n is at most eight here, so the cost stays under a millisecond.

Makers' figures are alternatives, not a range (``advisor.timing.alternatives``): a
part follows one maker's formula, so the band is the union of the per-maker bands,
never a box spanning the makers' constants.
"""

from __future__ import annotations

from itertools import product

from advisor.timing.model import Model


def band(model: Model, params: dict | None = None) -> tuple[dict, dict]:
    """(min, max) dicts over every maker's corners, with the same keys as ``model.times``."""
    if len(model.alternatives) <= 1:
        return maker_band(model, params)
    keys = {k for a in model.alternatives for k in a.params}
    lows: dict[str, float] = {}
    highs: dict[str, float] = {}
    for alt in model.alternatives:
        m = model.for_alternative(alt)
        p = None if params is None else {**{k: v for k, v in params.items() if k not in keys}, **alt.params}
        lo, hi = maker_band(m, p)
        for k, v in lo.items():
            lows[k] = min(v, lows.get(k, v))
        for k, v in hi.items():
            highs[k] = max(v, highs.get(k, v))
    return lows, highs


def maker_band(model: Model, params: dict | None = None) -> tuple[dict, dict]:
    """(min, max) over the corners of one formula (the model's own params and ranges)."""
    base = dict(model.params if params is None else params)
    names = [k for k, (lo, hi) in model.ranges.items() if hi != lo]
    lows: dict[str, float] = {}
    highs: dict[str, float] = {}
    for corner in product((0, 1), repeat=len(names)):
        p = dict(base)
        for name, end in zip(names, corner):
            p[name] = model.ranges[name][end] if params is None else _scaled(model, name, end, base)
        for key, value in model.times(p).items():
            if key not in lows or value < lows[key]:
                lows[key] = value
            if key not in highs or value > highs[key]:
                highs[key] = value
    return lows, highs


def _scaled(model: Model, name: str, end: int, base: dict) -> float:
    """The range end of ``name`` moved along with a changed nominal (tolerances are relative)."""
    lo, hi = model.ranges[name]
    if model.tolerance_kind.get(name) in ("r", "c"):
        nom = model.params[name]
        return base[name] * (lo if end == 0 else hi) / nom if nom else base[name]
    return lo if end == 0 else hi
