"""Pick a family's published constants for one supply and capacitor.

Makers publish different figures for the same constant (74HC123 K by revision,
1.44 vs 1.38 for 555-class astables). The first applicable value in catalog order
is the nominal; the lowest and highest applicable values bound the spread the
worst-case band uses. When no value is published for this exact supply, values
published at other supplies are interpolated linearly in VCC (and the result is
marked ``interpolated``); beyond the published supplies the nearest is used.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from advisor.parts import Family, Sourced


@dataclass(frozen=True)
class Constant:
    """One constant as used: nominal, spread and where the figures came from."""

    name: str
    nominal: float
    min: float
    max: float
    sources: tuple[str, ...] = ()
    unverified: bool = False  # some figure is from memory
    interpolated: bool = False  # no value published at this supply
    outside_c_range: bool = False  # no value published for this capacitance
    notes: tuple[str, ...] = field(default=())

    def to_json(self) -> dict:
        return {
            "nominal": self.nominal, "min": self.min, "max": self.max, "sources": list(self.sources),
            "unverified": self.unverified, "interpolated": self.interpolated,
        }


def source_label(family: Family, source_id: str) -> str:
    """Readable source text for a source id (title and document), or the reserved id."""
    if source_id == "memory":
        return "from memory (unverified)"
    if source_id == "common-practice":
        return "common practice"
    src = family.source(source_id)
    if src is None:
        return source_id
    return f"{src.title} ({src.document})" if src.document else src.title


def _make(name: str, values: list[Sourced], nominal: float | None = None, **flags) -> Constant:
    nums = [v.value for v in values]
    nom = values[0].value if nominal is None else nominal
    ids: list[str] = []
    for v in values:
        if v.source not in ids:
            ids.append(v.source)
    return Constant(
        name, nom, min(nums + [nom]), max(nums + [nom]), tuple(ids),
        unverified=any(v.unverified for v in values), **flags,
    )


def pick(family: Family, name: str, vcc: float | None, c: float | None) -> Constant | None:
    """The constant ``name`` at supply ``vcc`` (V) and capacitance ``c`` (F), or None.

    Pools every maker's figures; the engine itself works per maker
    (:func:`advisor.timing.alternatives.alternatives` calls :func:`pick_from` on one
    source's figures at a time).
    """
    return pick_from(name, family.timing.constants.get(name, []), vcc, c)


def pick_from(name: str, published: list[Sourced], vcc: float | None, c: float | None) -> Constant | None:
    """:func:`pick` over a given list of published values (one source's, or all)."""
    if not published:
        return None
    exact = [v for v in published if v.applies(vcc, c)]
    if exact:
        return _make(name, exact)
    # Nothing for this capacitance: the law is outside its published range (the
    # validity checks say so); keep going with the values for this supply.
    c_ok = [v for v in published if v.applies(None, c)]
    outside_c = not c_ok
    pool = c_ok or [v for v in published if v.applies(vcc, None)] or published
    if vcc is None:
        return _make(name, pool, outside_c_range=outside_c)
    at_vcc = [v for v in pool if v.applies(vcc, None)]
    if at_vcc:
        return _make(name, at_vcc, outside_c_range=outside_c)
    # Interpolate between the nearest published supplies below and above.
    def mid(v: Sourced) -> float:
        lo = v.vcc_min if v.vcc_min is not None else v.vcc_max
        hi = v.vcc_max if v.vcc_max is not None else v.vcc_min
        return (lo + hi) / 2 if lo is not None and hi is not None else vcc

    below = [v for v in pool if mid(v) <= vcc]
    above = [v for v in pool if mid(v) > vcc]
    if below and above:
        b = max(below, key=mid)
        a = min(above, key=mid)
        w = (vcc - mid(b)) / (mid(a) - mid(b))
        nominal = b.value + w * (a.value - b.value)
        # Figures published at other supplies are no spread at this one: the interpolated
        # value stands alone (a range here would jump at the published supplies).
        k = _make(name, [b, a], nominal=nominal, interpolated=True, outside_c_range=outside_c)
        return Constant(k.name, nominal, nominal, nominal, k.sources, k.unverified, True, outside_c)
    nearest = min(pool, key=lambda v: abs(mid(v) - vcc))
    return _make(name, [nearest], interpolated=True, outside_c_range=outside_c)


def limit(values: list[Sourced], vcc: float | None, c: float | None = None, *, lowest: bool) -> Sourced | None:
    """The most conservative applicable limit (lowest max or highest min) at ``vcc`` and ``c``.

    The one place a limit is chosen: the engine's facts, the rules context and the
    design search all call it, so they never pick different limits.
    """
    pool = [v for v in values if v.applies(vcc, c)]
    if not pool:
        return None
    return min(pool, key=lambda v: v.value) if lowest else max(pool, key=lambda v: v.value)
