"""Part-number recognition: from what is printed on a chip or a BOM line to a family.

A part number is read in three steps, each one scored:

1. **exact** (score 100): the text, upper-cased and without spaces, is a family id
   or one of its listed ``part_numbers``.
2. **normalised** (score 90-99): general rules, not per-part lists. Maker
   prefixes are dropped when a digit follows them (``SN74LS221N``, ``DM74LS123N``,
   ``HEF4538BP``, ``NE555P``); the Motorola 5-digit 4000-series form reads as the
   4-digit one (``MC14538BCP`` = 4538); 54-prefixed military parts read as their
   74 twins; a trailing TI revision letter ``A`` is optional; whatever follows a
   known base form is a package, temperature or reel suffix when it starts with a
   letter (``N``, ``PW``, ``BCP``, ``CDR``, ``IPAZ``, ``-Q1``, ``,118``). A digit right
   after the base form is never a suffix, so 74HC123 does not swallow 74HC1234.
   Prefixes that name a technology (TLC, LMC, ICM, 74HC...) are never dropped,
   so a TLC555 is not taken for a bipolar 555.
3. **fuzzy** (score at most 89): optimal-string-alignment similarity (edits and adjacent swaps) (rapidfuzz) of the
   query's core against every base form, for typos. Always ranked below any
   rule-based match.

``recognise`` returns ranked :class:`Match` objects (best per family);
``resolve_family`` returns one family or raises :class:`UnknownPartError` that
names the candidates ("did you mean ...").
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field

from advisor.errors import UnknownPartError

#: Maker prefixes dropped from a query when a digit follows (longest first).
#: SE/SA/NA are 555 grade prefixes, N and M are Signetics/ST single letters.
QUERY_PREFIXES = (
    "HEF", "HCF", "HCC", "SN", "MC", "MM", "DM", "CD", "NE", "SE", "SA", "NA", "LM", "UA", "MB",
    "HD", "TC", "KA", "N", "M",
)
#: Prefixes also dropped from the catalog's own base forms to derive shorter keys.
#: SE is left out: an SE555 is a separate (military-grade) entry when one exists.
KEY_PREFIXES = tuple(p for p in QUERY_PREFIXES if p != "SE")

_STRIP = re.compile(r"[\s\-_/.,()]+")
_CORE = re.compile(r"^(.*?\d)[A-Z]*$")  # up to the last digit of the leading part
_CMOS_14 = re.compile(r"^14([0-5]\d\d)(.*)$")  # MC14538B -> 4538B (Motorola 4000 series)
_CMOS_B = re.compile(r"^(4\d{3})U?B$")  # 4538B / 4049UB -> 4538 / 4049
_TI_REV = re.compile(r"^(.*\d)A$")  # 74AHC123A -> 74AHC123

# Score bands; a rule-based match always outranks a fuzzy one.
EXACT = 100.0
DIRECT = 99.0  # listed base form + suffix, nothing dropped in front
PREFIXED = 97.0  # a maker prefix was dropped from the query
DERIVED_PENALTY = 2.0  # the key itself was derived from a listed form
FUZZY_CAP = 89.0
FUZZY_FLOOR = 55.0


@dataclass(frozen=True)
class Match:
    """One candidate family for a query."""

    family: str  # family id
    score: float  # 0..100
    how: str  # "exact" | "normalised" | "fuzzy"
    matched: str  # the catalog base form (or derived key) that matched
    suffix: str = ""  # what was read as a package/temperature/reel suffix

    def to_json(self) -> dict:
        return {"family": self.family, "score": round(self.score, 1), "how": self.how,
                "matched": self.matched, "suffix": self.suffix}


@dataclass
class _Index:
    exact: dict[str, set[str]] = field(default_factory=dict)  # normalised form -> family ids
    keys: dict[str, dict[str, bool]] = field(default_factory=dict)  # key -> {family id: derived?}
    choices: list[str] = field(default_factory=list)  # fuzzy choices (keys)
    choice_owner: list[dict[str, bool]] = field(default_factory=list)


def as_typed(typed: str | None, family_id: str) -> str | None:
    """The part number as the user gave it, when it says more than the family id
    (``SN74LS221N`` for 74LS221); None for the bare id in any case."""
    text = (typed or "").strip()
    return text if text and text.upper() != family_id.upper() else None


def clean(text: str) -> str:
    """Upper-case and drop spaces and punctuation (``sn74hc221n`` -> ``SN74HC221N``)."""
    return _STRIP.sub("", text.strip().upper())


def _strip_prefixes(text: str, prefixes: tuple[str, ...]) -> list[tuple[str, str]]:
    """``text`` plus every form with one maker prefix removed (prefix, rest)."""
    out = [("", text)]
    for p in prefixes:
        if text.startswith(p) and len(text) > len(p) and text[len(p)].isdigit():
            out.append((p, text[len(p):]))
    return out


def _variants(form: str) -> list[str]:
    """Rewrites that name the same part: 14xxx -> 4xxx, 4538B -> 4538, 54 -> 74, trailing A."""
    out = [form]
    m = _CMOS_14.match(form)
    if m:
        out.append("4" + m.group(1) + m.group(2))
    for f in list(out):
        m = _CMOS_B.match(f)
        if m:
            out.append(m.group(1))
        if f.startswith("54") and len(f) > 2 and not f[2].isdigit():
            out.append("74" + f[2:])
        m = _TI_REV.match(f)
        if m and not _CMOS_B.match(f) and len(m.group(1)) >= 4:
            out.append(m.group(1))
    return list(dict.fromkeys(out))


def build_index(catalog) -> _Index:
    idx = _Index()
    for fid, fam in catalog.families.items():
        listed = [fam.id, *fam.part_numbers]
        for raw in listed:
            form = clean(raw)
            if not form:
                continue
            idx.exact.setdefault(form, set()).add(fid)
            for pos, base in enumerate(_variants(form)):
                idx.keys.setdefault(base, {})
                idx.keys[base].setdefault(fid, pos > 0)
                if pos == 0:
                    idx.keys[base][fid] = False
                if base.startswith("74"):  # military twins read the same
                    idx.keys.setdefault("54" + base[2:], {}).setdefault(fid, True)
            for prefix, rest in _strip_prefixes(form, KEY_PREFIXES)[1:]:
                for base in _variants(rest):
                    idx.keys.setdefault(base, {}).setdefault(fid, True)
    idx.choices = list(idx.keys)
    idx.choice_owner = [idx.keys[k] for k in idx.choices]
    return idx


def _index(catalog) -> _Index:
    idx = getattr(catalog, "_pn_index", None)
    if idx is None or getattr(catalog, "_pn_index_size", -1) != len(catalog.families):
        idx = build_index(catalog)
        try:
            catalog._pn_index = idx
            catalog._pn_index_size = len(catalog.families)
        except AttributeError:  # pragma: no cover - a frozen stand-in catalog
            pass
    return idx


def _rule_matches(idx: _Index, q: str) -> dict[str, Match]:
    best: dict[str, Match] = {}

    def offer(m: Match) -> None:
        old = best.get(m.family)
        if old is None or (m.score, len(m.matched)) > (old.score, len(old.matched)):
            best[m.family] = m

    for fid in idx.exact.get(q, ()):
        offer(Match(fid, EXACT, "exact", q))
    for prefix, rest in _strip_prefixes(q, QUERY_PREFIXES):
        for k, form in enumerate(_variants(rest)):
            # every split of the form into base + suffix (suffix empty or starting with a letter)
            for cut in range(len(form), 0, -1):
                base, suffix = form[:cut], form[cut:]
                if suffix and not suffix[0].isalpha():
                    continue
                owners = idx.keys.get(base)
                if not owners:
                    continue
                for fid, derived in owners.items():
                    score = (PREFIXED if prefix else DIRECT) - (DERIVED_PENALTY if derived else 0.0)
                    score -= min(len(suffix), 6) * 0.1  # shorter leftovers read more surely
                    if k:  # read through a rewrite (14xxx, 54xx, trailing A)
                        score -= 0.5
                    offer(Match(fid, score, "normalised", base, suffix))
    return best


def _cores(q: str) -> set[str]:
    """What typo matching compares: the query, without a maker prefix, and up to its last digit."""
    cores = {q}
    for _prefix, rest in _strip_prefixes(q, QUERY_PREFIXES):
        cores.add(rest)
        m = _CORE.match(rest)
        if m:
            cores.add(m.group(1))
    return cores


def _fuzzy_matches(idx: _Index, q: str, limit: int) -> dict[str, Match]:
    from rapidfuzz import process
    from rapidfuzz.distance import OSA

    best: dict[str, Match] = {}
    for core in _cores(q):
        hits = process.extract(core, idx.choices, scorer=OSA.normalized_similarity,
                               limit=max(limit * 3, 10), score_cutoff=FUZZY_FLOOR / 100)
        for key, sim, i in hits:
            score = min(FUZZY_CAP, sim * 100)
            for fid, derived in idx.choice_owner[i].items():
                s = score - (1.0 if derived else 0.0)
                old = best.get(fid)
                if old is None or s > old.score:
                    best[fid] = Match(fid, s, "fuzzy", key)
    return best


def recognise(catalog, query: str, limit: int = 10) -> list[Match]:
    """Ranked candidate families for ``query`` (best first, one per family)."""
    q = clean(query)
    if not q:
        return []
    idx = _index(catalog)
    found = _rule_matches(idx, q)
    if not found or max(m.score for m in found.values()) < DIRECT - DERIVED_PENALTY - 1:
        for fid, m in _fuzzy_matches(idx, q, limit).items():
            found.setdefault(fid, m)
    ranked = sorted(found.values(), key=lambda m: (-m.score, -len(m.matched), m.family))
    return ranked[:limit]


def resolve_family(catalog, query: str):
    """The one family ``query`` names; UnknownPartError with candidates otherwise.

    A rule-based match resolves when it beats every other family's match. A
    fuzzy-only match never resolves silently (a wrong part in a swap costs more
    than a retyped number): it is offered as "did you mean".
    """
    matches = recognise(catalog, query, limit=5)
    if matches and matches[0].how != "fuzzy":
        top = matches[0]
        rivals = [m for m in matches[1:] if m.how != "fuzzy" and m.score >= top.score - 1e-9]
        if not rivals:
            return catalog.families[top.family]
        names = ", ".join(m.family for m in [top, *rivals])
        raise UnknownPartError(f"part {query!r} is ambiguous", got=query,
                               hint=f"it matches {names}; give the full part number or a family id")
    if matches:
        hint = "did you mean " + ", ".join(m.family for m in matches[:3]) + "?"
    else:
        hint = "try 'retime find' or 'retime catalog list'"
    raise UnknownPartError(f"no family in the catalog matches {query!r}", got=query, hint=hint)


def recognise_many(catalog, queries: list[str], limit: int = 5) -> dict[str, list[Match]]:
    """:func:`recognise` for many queries at once (a BOM's distinct part numbers).

    Rule-based matching runs per query (microseconds each); the fuzzy step for
    the queries left over runs as one vectorised rapidfuzz ``cdist`` over all of
    their cores, so a 10 000-line BOM of unknown passives costs one matrix, not
    10 000 searches.
    """
    idx = _index(catalog)
    out: dict[str, list[Match]] = {}
    pending: dict[str, dict[str, Match]] = {}
    cores: list[str] = []
    owners: list[str] = []
    for query in queries:
        q = clean(query)
        if not q:
            out[query] = []
            continue
        found = _rule_matches(idx, q)
        if found and max(m.score for m in found.values()) >= DIRECT - DERIVED_PENALTY - 1:
            out[query] = sorted(found.values(), key=lambda m: (-m.score, -len(m.matched), m.family))[:limit]
            continue
        pending[query] = found
        for core in _cores(q):
            cores.append(core)
            owners.append(query)
    if cores:
        import numpy as np
        from rapidfuzz import process
        from rapidfuzz.distance import OSA

        sims = process.cdist(cores, idx.choices, scorer=OSA.normalized_similarity,
                             score_cutoff=FUZZY_FLOOR / 100, workers=-1, dtype=np.float32)
        rows, cols = np.nonzero(sims)
        for r, c in zip(rows.tolist(), cols.tolist()):
            query = owners[r]
            score = min(FUZZY_CAP, float(sims[r, c]) * 100)
            found = pending[query]
            for fid, derived in idx.choice_owner[c].items():
                s = score - (1.0 if derived else 0.0)
                old = found.get(fid)
                if old is None or (old.how == "fuzzy" and s > old.score):
                    found[fid] = Match(fid, s, "fuzzy", idx.choices[c])
    for query, found in pending.items():
        out[query] = sorted(found.values(), key=lambda m: (-m.score, -len(m.matched), m.family))[:limit]
    return out
