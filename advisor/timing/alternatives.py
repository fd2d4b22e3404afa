"""Makers' figures as alternatives: one published formula per source, never mixed.

Makers publish different constants for the same part (the 74HC123's K is 0.45 on
NXP's sheet, 0.55 on Philips' 1998 sheet and R·C on Fairchild's MM74HC123A sheet).
A real part follows one of those designs, not a blend, so each source's figures stay
together as one :class:`Alternative`: its constants (the 74LS123's K and its R offset
from the same formula), its part-to-part spread and, where its sheet prints one, its
min/typ/max width table. The worst-case band is the union of the alternatives'
bands and the Monte Carlo draws an alternative first (``advisor.timing.band``,
``advisor.timing.montecarlo``).

Grouping: the published values of the constants a law uses are grouped by
(source, maker). When no constant has values from two groups the family has one
alternative. Otherwise each group is an alternative; a constant the group does not
publish is taken from the values that belong to no competing group (shared figures
such as a 555's 2/3 threshold), and an optional constant (``r_offset``,
``r_discharge``, ``mono_k``, ``astable_k``) the group does not publish is left out of
its formula. Rows of a width table join the alternative of their source (or maker);
a table from a sheet with no constant of its own becomes an alternative of its own
built on the first alternative's constants.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from advisor.parts import RESERVED_SOURCES, Family, Sourced, WidthRow
from advisor.timing.constants import Constant, pick_from

#: Constants a formula may do without (the law then uses its default).
OPTIONAL = ("r_offset", "r_discharge", "mono_k", "astable_k")


@dataclass(frozen=True)
class Alternative:
    """One source's published formula for a family."""

    source: str
    maker: str | None
    constants: dict[str, Constant]
    rows: tuple[WidthRow, ...] = ()
    label: str = ""

    def to_json(self) -> dict:
        return {"maker": self.maker, "source": self.source, "label": self.label,
                "constants": {k: v.nominal for k, v in self.constants.items()}}


@dataclass(frozen=True)
class MakerChoice:
    """Which alternatives a result uses, the maker named and on what basis."""

    alternatives: list[Alternative]
    maker: str | None
    basis: str
    notes: list[str] = field(default_factory=list)


def _key(v: Sourced) -> tuple[str, str | None]:
    return (v.source, v.maker)


def _shared(v: Sourced) -> bool:
    """A recalled or trade figure naming no maker is no maker's formula: every maker shares it."""
    return v.maker is None and v.source in RESERVED_SOURCES


def alternatives(family: Family, names: tuple[str, ...], vcc: float | None, c: float | None) -> list[Alternative]:
    """The family's alternatives for the constants ``names`` at this supply and C."""
    published = {n: list(family.timing.constants.get(n, [])) for n in names}
    competing: list[tuple[str, str | None]] = []
    for values in published.values():
        keys = list(dict.fromkeys(_key(v) for v in values if not _shared(v)))
        if len(keys) > 1:
            competing += [k for k in keys if k not in competing]
    alts: list[Alternative] = []
    if not competing:
        consts = {n: k for n in names if (k := pick_from(n, published[n], vcc, c)) is not None}
        makers = {_maker_of(family, v) for vals in published.values() for v in vals} - {None}
        sources = [v.source for vals in published.values() for v in vals if not _shared(v)] or \
            [v.source for vals in published.values() for v in vals]
        maker = next(iter(makers)) if len(makers) == 1 else None
        alts.append(Alternative(sources[0] if sources else "", maker, consts, label=maker or (sources[0] if sources else "")))
    else:
        for key in competing:
            consts: dict[str, Constant] = {}
            for n in names:
                own = [v for v in published[n] if _key(v) == key]
                if not own:
                    if n in OPTIONAL:
                        continue
                    own = [v for v in published[n] if _key(v) not in competing] or published[n]
                k = pick_from(n, own, vcc, c)
                if k is not None:
                    consts[n] = k
            src = family.source(key[0])
            maker = key[1] or (src.maker if src is not None else None)
            alts.append(Alternative(key[0], maker, consts, label=maker or key[0]))
    return _attach_tables(family, alts)


def _maker_of(family: Family, v: Sourced) -> str | None:
    if v.maker is not None:
        return v.maker
    src = family.source(v.source)
    return src.maker if src is not None else None


def _attach_tables(family: Family, alts: list[Alternative]) -> list[Alternative]:
    rows = list(family.timing.widths)
    if not rows:
        return alts
    out = list(alts)
    groups: dict[tuple[str, str | None], list[WidthRow]] = {}
    for r in rows:
        groups.setdefault((r.source, r.maker), []).append(r)
    for (source, maker), group in groups.items():
        idx = next((i for i, a in enumerate(out) if a.source == source), None)
        if idx is None and maker is not None:
            idx = next((i for i, a in enumerate(out) if a.maker == maker), None)
        if idx is not None:
            a = out[idx]
            out[idx] = Alternative(a.source, a.maker, a.constants, a.rows + tuple(group), a.label)
        else:
            base = out[0].constants if out else {}
            out.append(Alternative(source, maker, dict(base), tuple(group), label=maker or source))
    return out


def choose(family: Family, alts: list[Alternative], makers: tuple[str, ...], basis: str | None) -> MakerChoice:
    """The alternatives to use for a part whose number (or ``--maker``) names ``makers``.

    Raises :class:`advisor.errors.InputError` when ``--maker`` forces a maker that
    published no constant for this family.
    """
    from advisor.errors import InputError

    published = [a.maker for a in alts if a.maker]
    if makers:
        matched = [a for a in alts if a.maker in makers]
        if matched:
            names = list(dict.fromkeys(a.maker for a in matched))
            return MakerChoice(matched, "/".join(names), basis or "part-number prefix")
        if basis == "--maker":
            known = ", ".join(dict.fromkeys(published)) or "none named"
            raise InputError(
                f"--maker {'/'.join(makers)}: no constant for the {family.id} from that maker in the catalog",
                got="/".join(makers), expected=f"one of the makers with a published constant: {known}")
        # Only worth saying when the family's formulas are tied to makers at all: the NE555's
        # sheets give one formula that no maker tag claims, so its prefix changes nothing.
        notes = [f"the part number names {'/'.join(makers)}, whose own constant for the {family.id} is not in "
                 f"the catalog; the band spans the makers' figures ({', '.join(dict.fromkeys(published))})"] if published else []
        if len(alts) == 1:
            return MakerChoice(alts, alts[0].maker, "only published formula", notes)
        return MakerChoice(alts, None, "unknown: band spans makers", notes)
    if len(alts) == 1:
        return MakerChoice(alts, alts[0].maker, "only published formula")
    return MakerChoice(alts, None, "unknown: band spans makers")
