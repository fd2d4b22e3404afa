"""What each part on the board is: a catalog timer or one-shot, a resistor, a trimmer, a capacitor, a connector.

Timers are recognised as ``retime find`` does (:func:`advisor.partnumber.recognise`),
from the Value field first and then the library symbol's name (``Timer:NE555P`` →
``NE555P``); only rule-based matches count (a fuzzy "did you mean" never makes a
part a timer). Passives are told by their library symbol (the open symbol library's
``Device:R*``, ``Device:C*``, ``Device:R_Potentiometer*``) or, failing that, by the
reference prefix (R, C, RV/VR/POT) — common practice of reference designators
(IEEE 315 / IEC 81346 letter codes). Values are read from the Value field in
engineering notation or value codes (:func:`advisor.values.parse_quantity`).
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field

from advisor.board.model import Board, Part, Problem
from advisor.errors import ValueParseError
from advisor.values import parse_quantity

_PREFIX = re.compile(r"^([A-Za-z_]+)")
_CONNECTOR_PREFIX = {"J", "P", "CN", "X", "CON"}
#: Wiper pin of a 3-pin potentiometer: the open symbol library's Device:R_Potentiometer*
#: symbols put the wiper on pin 2 (read from Device.kicad_sym); a pin named W or wiper wins.
DEFAULT_WIPER = "2"


@dataclass
class Timer:
    part: Part
    family: object  # advisor.parts.Family
    matched: str  # what was recognised: the value or the symbol name
    package: object  # advisor.parts.Package


@dataclass
class Passive:
    part: Part
    kind: str  # "R" resistor, "C" capacitor, "POT" 3-pin variable resistor, "RV" 2-pin variable resistor
    value: float | None
    wiper: str | None = None


@dataclass
class Recognised:
    timers: list[Timer] = field(default_factory=list)
    passives: dict[str, Passive] = field(default_factory=dict)
    connectors: set[str] = field(default_factory=set)
    problems: list[Problem] = field(default_factory=list)


def _symbol_name(lib_id: str) -> str:
    return lib_id.split(":", 1)[-1]


def _prefix(ref: str) -> str:
    m = _PREFIX.match(ref)
    return m.group(1).upper() if m else ""


def recognise_timer(catalog, part: Part):
    """(family, what matched) when the part's value or symbol name is a catalog timer, else None."""
    from advisor.partnumber import recognise

    for query in (part.value, _symbol_name(part.lib_id)):
        if not query or len(query) > 40:
            continue
        matches = recognise(catalog, query, limit=3)
        if matches and matches[0].how != "fuzzy":
            rivals = [m for m in matches[1:] if m.how != "fuzzy" and m.score >= matches[0].score - 1e-9]
            if not rivals:
                return catalog.families[matches[0].family], query
    return None


def passive_by_symbol(part: Part) -> str | None:
    """R, RV, POT or C from the library symbol's name (the open library's Device:R*, C*, R_Potentiometer*)."""
    name = _symbol_name(part.lib_id).upper()
    npins = len(part.pins)
    if "POT" in name or "TRIM" in name:
        return "POT" if npins >= 3 else "RV"
    if re.match(r"^R(_|$)", name) and "ARRAY" not in name and "PACK" not in name:
        return "RV" if "VARIABLE" in name else "R"
    if re.match(r"^C(P)?(_|$)", name) or name.startswith("C_POLARIZED"):
        return "C"
    return None


def passive_kind(part: Part) -> str | None:
    by_symbol = passive_by_symbol(part)
    if by_symbol is not None:
        return by_symbol
    npins = len(part.pins)
    pre = _prefix(part.ref)
    if pre in ("RV", "VR", "POT", "TR") and npins >= 3:
        return "POT"
    if pre == "R" and npins == 2:
        return "R"
    if pre == "C" and npins == 2:
        return "C"
    return None


def read_value(text: str, kind: str) -> float:
    """The part's value: the whole field, else its first word (``100n 50V``, ``10k/1%``)."""
    try:
        return parse_quantity(text, kind)
    except ValueParseError:
        first = re.split(r"[\s/,;]+", text.strip())[0] if text.strip() else text
        return parse_quantity(first, kind)


def _package(family, part: Part):
    """The catalog package matching the footprint's style and pin count (else the first)."""
    numbers = [int(n) for n in part.pins if n.isdigit()]
    count = max(numbers) if numbers else 0
    fp = part.footprint.upper()
    best, best_score = family.packages[0], -1
    for pkg in family.packages:
        n = len(pkg.pins)
        score = (2 if count and n == count else 0) + (1 if pkg.name.split("-")[0].upper() in fp else 0)
        if score > best_score:
            best, best_score = pkg, score
    return best


def recognise_board(catalog, board: Board) -> Recognised:
    out = Recognised()
    for ref, part in board.parts.items():
        # a resistor or capacitor symbol is never a timer: skip the part-number search for it
        hit = None if passive_by_symbol(part) is not None else recognise_timer(catalog, part)
        if hit is not None:
            fam, matched = hit
            out.timers.append(Timer(part, fam, matched, _package(fam, part)))
            continue
        kind = passive_kind(part)
        if kind is not None:
            quantity = "capacitance" if kind == "C" else "resistance"
            try:
                value = read_value(part.value, quantity)
            except ValueParseError:
                value = None
                out.problems.append(Problem(f"value {part.value!r} of {ref} cannot be read as a {quantity}",
                                            part.where, "value"))
            wiper = None
            if kind == "POT":
                named = [n for n, p in part.pins.items() if p.name.strip().lower() in ("w", "wiper")]
                wiper = named[0] if named else (DEFAULT_WIPER if DEFAULT_WIPER in part.pins else None)
            out.passives[ref] = Passive(part, kind, value, wiper)
            continue
        if _prefix(ref) in _CONNECTOR_PREFIX or part.lib_id.lower().startswith("connector"):
            out.connectors.add(ref)
    out.timers.sort(key=lambda t: _natural(t.part.ref))
    return out


def _natural(text: str) -> tuple:
    return tuple(int(t) if t.isdigit() else t for t in re.split(r"(\d+)", text))
