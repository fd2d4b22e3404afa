"""Load, validate and index the part-family catalog (``catalog/*.yaml``).

Each YAML file holds one :class:`advisor.parts.Family`. Loading collects every
problem in every file (not only the first) as located messages:
``catalog/74hc221.yaml: timing.constants.k[0].value: expected a number, got 'abc'``.
"""

from __future__ import annotations

import dataclasses
import math
import re
from collections import Counter
from dataclasses import dataclass, field
from functools import lru_cache
from pathlib import Path

from advisor.errors import InputError, UnknownPartError, key_path as _loc, raise_first_problem, short_repr as _short
from advisor.files import FileRefused
from advisor.parts import RESERVED_SOURCES, SHARED_PIN_FUNCTIONS, TIE_USES, Family, Lifecycle, Sourced
from advisor.record import Record
from advisor.resources import data_dirs
from advisor.yamlload import YamlProblem, load_yaml_file

MAKERS_FILE = "makers.yaml"  # advisor.makers reads it; not a part family

def _required_constants() -> dict[str, tuple[str, ...]]:
    from advisor.timing.registry import LAWS

    return {name: spec.constants for name, spec in LAWS.items()}


#: Constants each timing law needs (the law registry, advisor.timing.registry).
REQUIRED_CONSTANTS: dict[str, tuple[str, ...]] = _required_constants()


@dataclass(frozen=True)
class Problem:
    """One located catalog problem."""

    file: str
    path: str
    message: str

    def __str__(self) -> str:
        return f"{self.file}: {self.path}: {self.message}" if self.path else f"{self.file}: {self.message}"


def parse_family(data: object, file: str) -> tuple[Family | None, list[Problem]]:
    """Validate one file's data; return the family or the located problems."""
    from pydantic import ValidationError

    if not isinstance(data, dict):
        return None, [Problem(file, "", f"expected a mapping of family fields, got {_short(data)}")]
    try:
        return Family.model_validate(data), []
    except ValidationError as exc:
        problems = []
        for err in exc.errors():
            loc = tuple(p for p in err["loc"] if not (isinstance(p, str) and p.startswith("function-")))
            msg = err["msg"]
            if err["type"] == "extra_forbidden":
                msg = "unknown key (not in the catalog grammar; see catalog/README.md)"
            elif "input" in err and err["type"] != "missing":
                msg = f"{msg}, got {_short(err['input'])}"
            problems.append(Problem(file, _loc(loc), msg))
        return None, problems


def family_problems(fam: Family, file: str) -> list[Problem]:
    """Checks the grammar alone cannot make: sources resolve, law constants present."""
    problems: list[Problem] = []
    known = {s.id for s in fam.sources} | set(RESERVED_SOURCES)
    # Counted once each (Counter), never list.count per item: a family may list 20 000
    # part numbers (an approved-parts list), and a count per item made loading quadratic.
    for dup in sorted(i for i, n in Counter(s.id for s in fam.sources).items() if n > 1):
        problems.append(Problem(file, "sources", f"source id {dup!r} listed twice"))

    def visit(obj: object, path: str) -> None:
        # Every field that names a source (``source``, ``retrigger_source``, ...) in every
        # part of the family, behaviour and lifecycle included.
        if isinstance(obj, Record):
            for name in type(obj).model_fields:
                value = getattr(obj, name)
                where = f"{path}.{name}" if path else name
                if (name == "source" or name.endswith("_source")) and isinstance(value, str) and value not in known:
                    problems.append(Problem(file, where, f"unknown source {_short(value)}; expected one of {sorted(known)}"))
                visit(value, where)
        elif isinstance(obj, list):
            for i, item in enumerate(obj):
                visit(item, f"{path}[{i}]")
        elif isinstance(obj, dict):
            for k, item in obj.items():
                visit(item, f"{path}.{k}")

    for name in type(fam).model_fields:
        if name != "sources":
            visit(getattr(fam, name), name)
    for need in REQUIRED_CONSTANTS[fam.timing.law]:
        if not fam.timing.constants.get(need):
            problems.append(Problem(file, f"timing.constants.{need}", f"law {fam.timing.law!r} needs constant {need!r}"))
    if fam.timing.law == "counter" and fam.timing.counter is None:
        problems.append(Problem(file, "timing.counter", "law 'counter' needs a counter block (divide_by: the "
                                "divide ratios the sheet publishes, source); see catalog/README.md"))
    if fam.timing.law != "counter" and fam.timing.counter is not None:
        problems.append(Problem(file, "timing.counter", f"a counter block belongs to law 'counter', not "
                                f"{fam.timing.law!r}"))
    if not any(max(e.bounds()) > 0 for e in fam.timing.spread):
        problems.append(Problem(file, "timing.spread", "no part-to-part spread recorded (a zero spread makes the "
                                "band shrink to the R and C tolerances); expected a guaranteed limit from the sheet, "
                                "or a typical figure marked basis: typical (catalog/README.md)"))
    for i, pkg in enumerate(fam.packages):
        for p in pkg.pins:
            if p.channel is not None and not 1 <= p.channel <= fam.channels:
                problems.append(Problem(file, f"packages[{i}].pins", f"pin {p.pin} channel {p.channel} outside 1..{fam.channels}"))
        problems.extend(package_problems(fam, i, file))
    problems.extend(behaviour_problems(fam, file))
    problems.extend(value_problems(fam, file))
    forms = Counter(p.strip().upper() for p in fam.part_numbers)
    for dup in sorted(f for f, n in forms.items() if n > 1):
        problems.append(Problem(file, "part_numbers", f"{dup!r} listed twice"))
    return problems


#: Physical ranges for the catalog's numbers (common practice: generous bounds that no
#: real timer or one-shot comes near; they catch a unit slip, a sign, an overflow such
#: as 1e308, not a datasheet's tolerance). (low, high, low included, unit)
_V = (0.0, 100.0, False, "V")
_CONSTANT = (0.0, 20.0, False, "")  # K-like constants are 0.1..5 in every sheet read
_FRACTION = (0.0, 1.0, False, "of the supply")
_OHM_OFFSET = (0.0, 1e5, True, "Ω")
_R = (0.0, 1e9, False, "Ω")
_C = (0.0, 1.0, True, "F")
_BOUNDS: dict[str, tuple[float, float, bool, str]] = {
    "supply.recommended.min": _V,
    "supply.recommended.max": _V,
    "supply.absolute_max": _V,
    "timing.constants.upper_threshold": _FRACTION,
    "timing.constants.lower_threshold": _FRACTION,
    "timing.constants.r_offset": _OHM_OFFSET,
    "timing.constants.r_discharge": _OHM_OFFSET,
    "timing.r_internal": (0.0, 1e7, False, "Ω"),
    "timing.c_linear_min": (0.0, 1e-3, True, "F"),
    "timing.f_max": (0.0, 1e10, False, "Hz"),
    "timing.width_min": (0.0, 1e4, True, "s"),
    "timing.width_max": (0.0, 1e6, False, "s"),
    "timing.spread": (0.0, 1.0, True, "(a fraction)"),
    "components.r_min": _R,
    "components.r_max": _R,
    "components.c_min": _C,
    "components.c_max": _C,
    "behaviour.retrigger_min": (0.0, 1e3, True, "s"),
    "behaviour.recovery": (0.0, 1e3, True, "s"),
    "interface.vih": (0.0, 100.0, True, "V"),
    "interface.vil": (0.0, 100.0, True, "V"),
    "interface.vih_fraction": _FRACTION,
    "interface.vil_fraction": _FRACTION,
    "interface.output_source_ma": (0.0, 1e4, True, "mA"),
    "interface.output_sink_ma": (0.0, 1e4, True, "mA"),
}
#: Conditions a published value holds under: supply (V) and timing capacitance (F).
_CONDITIONS = {"vcc_min": _V[:2], "vcc_max": _V[:2], "c_min": (0.0, 1.0), "c_max": (0.0, 1.0)}


def _sourced(obj: object) -> list[tuple[str, object]]:
    """(index suffix, Sourced) for a Sourced, a list of them, or None."""
    if obj is None:
        return []
    if isinstance(obj, list):
        return [(f"[{i}]", s) for i, s in enumerate(obj)]
    return [("", obj)]


def _outside(value: float, bound: tuple[float, float, bool, str]) -> bool:
    low, high, low_in, _unit = bound
    return not math.isfinite(value) or value > high or value < low or (value == low and not low_in)


def _range_text(bound: tuple[float, float, bool, str]) -> str:
    low, high, low_in, unit = bound
    return f"{'≥' if low_in else '>'} {low:g} and ≤ {high:g}{(' ' + unit) if unit else ''}"


def value_problems(fam: Family, file: str) -> list[Problem]:
    """Numbers within physical ranges and in the right order: K > 0, thresholds in 0..1
    with the lower below the upper, absolute max ≥ recommended max, minimum ≤ maximum."""
    problems: list[Problem] = []

    def check(path: str, value: float, bound: tuple[float, float, bool, str]) -> None:
        if _outside(value, bound):
            problems.append(Problem(file, path, f"{value!r} is not a physical value here; expected {_range_text(bound)}"))

    def values_at(path: str) -> list[tuple[str, float]]:
        obj: object = fam
        for part in path.split("."):
            obj = obj.get(part) if isinstance(obj, dict) else getattr(obj, part, None)
        if isinstance(obj, (int, float)) and not isinstance(obj, bool):
            return [(path, float(obj))]
        return [(f"{path}{i}.value", s.value) for i, s in _sourced(obj) if isinstance(getattr(s, "value", None), (int, float))]

    for path, bound in _BOUNDS.items():
        for where, value in values_at(path):
            check(where, value, bound)
    for name, vals in fam.timing.constants.items():
        if f"timing.constants.{name}" not in _BOUNDS:
            for i, s in _sourced(vals):
                check(f"timing.constants.{name}{i}.value", s.value, _CONSTANT)
    ups = [v for _p, v in values_at("timing.constants.upper_threshold")]
    lows = [v for _p, v in values_at("timing.constants.lower_threshold")]
    if ups and lows and max(lows) >= min(ups):
        problems.append(Problem(file, "timing.constants.lower_threshold",
                                f"lower threshold {max(lows):g} is not below the upper threshold {min(ups):g}"))
    rec_max = fam.supply.recommended.max
    if fam.supply.absolute_max.value < rec_max:
        problems.append(Problem(file, "supply.absolute_max.value",
                                f"absolute maximum {fam.supply.absolute_max.value:g} V is below the recommended "
                                f"maximum {rec_max:g} V; expected absolute max ≥ recommended max"))
    for low_name, high_name in (("r_min", "r_max"), ("c_min", "c_max")):
        lows_ = [v for _p, v in values_at(f"components.{low_name}")]
        highs = [v for _p, v in values_at(f"components.{high_name}")]
        if lows_ and highs and min(lows_) > max(highs):
            problems.append(Problem(file, f"components.{low_name}",
                                    f"smallest {low_name} {min(lows_):g} is above the largest {high_name} {max(highs):g}"))
    for pair in (("vil", "vih"), ("vil_fraction", "vih_fraction")):
        lo = getattr(fam.interface, pair[0], None)
        hi = getattr(fam.interface, pair[1], None)
        if lo is not None and hi is not None and lo.value > hi.value:
            problems.append(Problem(file, f"interface.{pair[0]}.value", f"{pair[0]} {lo.value:g} is above {pair[1]} {hi.value:g}"))

    def conditions(obj: object, path: str) -> None:
        if isinstance(obj, Sourced):
            for name, (low, high) in _CONDITIONS.items():
                v = getattr(obj, name, None)
                if v is not None and not (math.isfinite(v) and low <= v <= high):
                    problems.append(Problem(file, f"{path}.{name}", f"{v!r} is outside {low:g}..{high:g}"))
            for a, b in (("vcc_min", "vcc_max"), ("c_min", "c_max")):
                lo, hi = getattr(obj, a, None), getattr(obj, b, None)
                if lo is not None and hi is not None and lo > hi:
                    problems.append(Problem(file, f"{path}.{a}", f"{a} {lo:g} is above {b} {hi:g}"))
        if isinstance(obj, Record):
            for name in type(obj).model_fields:
                conditions(getattr(obj, name), f"{path}.{name}" if path else name)
        elif isinstance(obj, list):
            for i, item in enumerate(obj):
                conditions(item, f"{path}[{i}]")
        elif isinstance(obj, dict):
            for k, item in obj.items():
                conditions(item, f"{path}.{k}")

    conditions(fam, "")
    return problems


#: Functions that belong to one section of a multi-channel part.
_CHANNEL_FUNCTIONS = {"VCC", "GND", "NC"}
#: Controls one pin of which may serve every section (``parts.SHARED_PIN_FUNCTIONS``).
#: One shared pin per function; a forgotten channel on a per-section pin still shows,
#: as a second shared pin or as sections that differ.
_SHARED_FUNCTIONS = frozenset(SHARED_PIN_FUNCTIONS)


def package_problems(fam: Family, index: int, file: str) -> list[Problem]:
    """A pinout lists every pin 1..N once (N from a ``-N`` name), and every
    channel of a multi-channel part carries the same set of functions."""
    import re

    pkg = fam.packages[index]
    where = f"packages[{index}]"
    problems: list[Problem] = []
    numbers = sorted(p.pin for p in pkg.pins)
    m = re.search(r"-(\d+)$", pkg.name)
    count = int(m.group(1)) if m else (numbers[-1] if numbers else 0)
    missing = sorted(set(range(1, count + 1)) - set(numbers))
    extra = [n for n in numbers if not 1 <= n <= count]
    if missing:
        problems.append(Problem(file, f"{where}.pins", f"pins {missing} missing; expected every pin 1..{count} of {pkg.name} (use function NC for unconnected pins)"))
    if extra:
        problems.append(Problem(file, f"{where}.pins", f"pins {extra} outside 1..{count} of {pkg.name}"))
    for need in ("VCC", "GND"):
        if not any(p.function == need for p in pkg.pins):
            problems.append(Problem(file, f"{where}.pins", f"no {need} pin; expected one"))
    source_ids = {s.id for s in fam.sources}
    ratios = {f"/{n}" for n in (fam.timing.counter.divide_by if fam.timing.counter is not None else [])}
    for p in pkg.pins:
        if not p.tie:
            continue
        bad = sorted(k for k in p.tie if k not in TIE_USES and k not in ratios)
        if bad:
            problems.append(Problem(file, f"{where}.pins", f"pin {p.pin} tie keys {bad}; expected "
                                    f"{', '.join(TIE_USES)} or a divide ratio of timing.counter ({', '.join(sorted(ratios)) or 'none'})"))
        if p.tie_source not in source_ids:
            problems.append(Problem(file, f"{where}.pins", f"pin {p.pin} tie_source {p.tie_source!r}; expected the id "
                                    "of a listed source (the function or selection table the levels come from)"))
    per_channel: dict[int, list[str]] = {}
    shared: dict[str, int] = {}
    for p in pkg.pins:
        if p.function in _CHANNEL_FUNCTIONS:
            continue
        if p.channel is None and fam.channels > 1:
            if p.function in _SHARED_FUNCTIONS and p.function not in shared:
                shared[p.function] = p.pin  # one control common to every section
                continue
            if p.function in shared:
                msg = (f"pin {p.pin} ({p.function}) has no channel and pin {shared[p.function]} is already the "
                       f"shared {p.function}; expected a channel 1..{fam.channels}")
            else:
                msg = (f"pin {p.pin} ({p.function}) has no channel; expected 1..{fam.channels} "
                       f"(only {', '.join(sorted(_SHARED_FUNCTIONS))} may be one pin shared by every section)")
            problems.append(Problem(file, f"{where}.pins", msg))
            continue
        per_channel.setdefault(p.channel or 1, []).append(p.function)
    if fam.channels > 1:
        ref = sorted(per_channel.get(1, []))
        for ch in range(2, fam.channels + 1):
            got = sorted(per_channel.get(ch, []))
            if got != ref:
                problems.append(Problem(file, f"{where}.pins", f"channel {ch} functions {got} differ from channel 1 {ref}"))
    return problems


def behaviour_problems(fam: Family, file: str) -> list[Problem]:
    """Trigger and clear inputs name functions that the pinouts carry."""
    problems: list[Problem] = []
    if not fam.packages:
        return [Problem(file, "packages", "no package; expected at least one pinout")]
    functions = {p.function for p in fam.packages[0].pins}
    for i, trig in enumerate(fam.behaviour.triggers):
        if trig.function not in functions:
            problems.append(Problem(file, f"behaviour.triggers[{i}].function", f"{trig.function!r} is on no pin of {fam.packages[0].name}"))
        for other in trig.enable:
            if other not in functions:
                problems.append(Problem(file, f"behaviour.triggers[{i}].enable.{other}", f"{other!r} is on no pin of {fam.packages[0].name}"))
    return problems


def catalog_problems(cat: "Catalog") -> list[Problem]:
    """Checks across files: a listed part number belongs to one family only."""
    owners: dict[str, list[str]] = {}
    for key, fam in cat.families.items():
        for form in {fam.id.upper(), *(p.strip().upper() for p in fam.part_numbers)}:
            owners.setdefault(form, []).append(key)
    problems = []
    for form, keys in sorted(owners.items()):
        if len(keys) > 1:
            files = ", ".join(cat.files[k] for k in sorted(keys))
            problems.append(Problem(cat.files[sorted(keys)[-1]], "part_numbers", f"{form!r} is listed by {len(keys)} families ({files}); expected one"))
    return problems


def count_memory(fam: Family) -> int:
    """How many sourced items (numbers, ranges, pinouts, behaviour facts) are
    still from memory (unverified)."""
    n = 0

    def visit(obj: object) -> None:
        nonlocal n
        if isinstance(obj, Lifecycle):
            return  # a status statement is no value of the part: shown by 'show', not counted here
        if isinstance(getattr(obj, "source", None), str) and isinstance(obj, Record):
            n += obj.source == "memory"
        if hasattr(obj, "retrigger_source"):
            n += obj.retrigger_source == "memory"
        if isinstance(obj, Record):
            for name in type(obj).model_fields:
                visit(getattr(obj, name))
        elif isinstance(obj, (list, tuple)):
            for item in obj:
                visit(item)
        elif isinstance(obj, dict):
            for item in obj.values():
                visit(item)

    visit(fam)
    return n


#: Source kinds that count as a published document when the source names its document.
PUBLISHED_KINDS = ("datasheet", "app-note", "standard", "textbook")

#: What names a document's revision: a year (a sheet's date or "revised May 2001"), a
#: revision word with its mark ("rev 8", "Rev. 7", "revision 3"), or a maker's literature
#: number with its revision letter (TI SCHS142F, SLFS022A). Checked on ``document``.
_REVISION = re.compile(r"\b(19[5-9]\d|20[0-4]\d)\b|\b[Rr][Ee][Vv](ision)?\.?\s*(\d|[A-Z]\b)|\b[A-Z]{4}\d{3}[A-Z]\b")


def names_revision(document: str | None) -> bool:
    """Whether a source's ``document`` text names the revision or date of what was read.

    An id alone (\"TI SCBA004\", \"Hitachi data sheet\") does not: sheets change between
    revisions, and a figure must be traceable to the one that printed it (issue 15).
    """
    return bool(document) and _REVISION.search(document) is not None


def provenance(fam: Family) -> dict[str, int]:
    """Where a family's numbers come from (``catalog check --json`` ``provenance``).

    ``values``: every sourced number (a ``{value, source}`` entry, a range, a spread,
    a width-table row) in supply, timing, components, behaviour and interface.
    ``published``: those whose source is a listed document of a kind in
    :data:`PUBLISHED_KINDS` whose ``document`` names its id and revision or date
    (:func:`names_revision`). ``unrevised``: those whose published-kind source names no
    revision (counted in ``values`` only). ``memory`` and ``common_practice``: the reserved
    sources. ``constants_from_memory``: timing-law constant entries (``timing.constants``)
    from memory. The rest (forum reports, product and distributor pages, measurements)
    count in ``values`` only.
    """
    out = {"values": 0, "published": 0, "memory": 0, "common_practice": 0, "constants_from_memory": 0,
           "unrevised": 0}
    of_kind = [s for s in fam.sources if s.document and s.kind in PUBLISHED_KINDS]
    published = {s.id for s in of_kind if names_revision(s.document)}
    unrevised = {s.id for s in of_kind} - published

    def count(obj: object) -> None:
        if isinstance(obj, Record):
            src = getattr(obj, "source", None)
            numeric = any(isinstance(getattr(obj, k, None), (int, float)) and not isinstance(getattr(obj, k, None), bool)
                          for k in ("value", "min", "max", "typ", "minus", "plus"))
            if isinstance(src, str) and numeric:
                out["values"] += 1
                out["published"] += src in published
                out["unrevised"] += src in unrevised
                out["memory"] += src == "memory"
                out["common_practice"] += src == "common-practice"
            for name in type(obj).model_fields:
                count(getattr(obj, name))
        elif isinstance(obj, (list, tuple)):
            for item in obj:
                count(item)
        elif isinstance(obj, dict):
            for item in obj.values():
                count(item)

    for part in (fam.supply, fam.timing, fam.components, fam.behaviour, fam.interface):
        count(part)
    out["constants_from_memory"] = sum(v.source == "memory" for vals in fam.timing.constants.values() for v in vals)
    return out


@dataclass
class Catalog:
    """All families, indexed by upper-case id; ``problems`` lists what failed to load."""

    families: dict[str, Family] = field(default_factory=dict)
    files: dict[str, str] = field(default_factory=dict)  # id -> file it came from
    problems: list[Problem] = field(default_factory=list)
    makers: "MakerBook" = field(default_factory=lambda: _empty_book())  # catalog/makers.yaml
    #: Shipped families a user folder replaced (advisor.overrides: listed in every answer).
    overrides: list["Override"] = field(default_factory=list)

    def __repr__(self) -> str:
        # Short on purpose: the full field dump of every family runs to hundreds of kB (a test
        # framework that prints its arguments, a debugger, a log line).
        return (f"Catalog({len(self.families)} families, {len(self.problems)} problems, "
                f"{len(self.overrides)} overrides)")

    def ids(self) -> list[str]:
        return sorted(self.families, key=_natural)

    def get(self, family_id: str) -> Family:
        """The family with exactly this id (case-insensitive), else UnknownPartError."""
        fam = self.families.get(family_id.strip().upper())
        if fam is None:
            raise UnknownPartError(f"no family {family_id!r} in the catalog", got=family_id)
        return fam

    def resolve(self, query: str) -> Family:
        """A family id or any recognised part number; raises with suggestions otherwise."""
        fam = self.families.get(query.strip().upper())
        if fam is not None:
            return fam
        from advisor.partnumber import resolve_family

        return resolve_family(self, query)


def _empty_book():
    from advisor.makers import MakerBook

    return MakerBook()


def _load_makers(cat: "Catalog", path: Path, label: str) -> None:
    from pydantic import ValidationError

    from advisor.makers import read_makers

    try:
        data = read_makers(path)
    except YamlProblem as exc:
        cat.problems.append(Problem(label, exc.where, exc.message))
        return
    except FileRefused as exc:
        cat.problems.append(Problem(label, "", f"not read: {exc.message}"))
        return
    except ValidationError as exc:
        for err in exc.errors():
            cat.problems.append(Problem(label, _loc(err["loc"]), err["msg"]))
        return
    cat.makers.add(data)
    cat.problems.extend(Problem(*p) for p in cat.makers.problems(label))


def maker_problems(cat: "Catalog") -> list[Problem]:
    """Every ``maker:`` a family names is a maker id of catalog/makers.yaml."""
    known = set(cat.makers.makers)
    if not known:
        return []
    out = []
    for key, fam in cat.families.items():
        seen: set[str] = set()

        def visit(obj: object, path: str) -> None:
            if isinstance(obj, Record):
                m = getattr(obj, "maker", None)
                if isinstance(m, str) and m not in known and (path, m) not in seen:
                    seen.add((path, m))
                    hint = cat.makers.canonical(m)
                    expected = f"the maker id {hint!r}" if hint else "a maker id of catalog/makers.yaml"
                    out.append(Problem(cat.files[key], f"{path}.maker", f"unknown maker {m!r}; expected {expected}"))
                for name in type(obj).model_fields:
                    visit(getattr(obj, name), f"{path}.{name}" if path else name)
            elif isinstance(obj, list):
                for i, item in enumerate(obj):
                    visit(item, f"{path}[{i}]")
            elif isinstance(obj, dict):
                for k, item in obj.items():
                    visit(item, f"{path}.{k}")

        visit(fam.timing, "timing")
        visit(fam.components, "components")
        visit(fam.sources, "sources")
    return out


def _natural(text: str) -> tuple:
    import re

    return tuple(int(t) if t.isdigit() else t for t in re.split(r"(\d+)", text))


def load_dirs(dirs: list[Path]) -> Catalog:
    """Load every ``*.yaml`` in ``dirs``; later folders override earlier ones by id."""
    from advisor.overrides import Override

    cat = Catalog()
    shipped: set[str] = set()  # ids whose entry came from the shipped folder (dirs[0])
    for n, d in enumerate(dirs):
        for path in sorted(Path(d).glob("*.yaml")):
            if path.name.startswith("_"):
                continue
            label = f"catalog/{path.name}" if n == 0 else str(path)
            if path.name == MAKERS_FILE:
                _load_makers(cat, path, label)
                continue
            try:
                data = load_yaml_file(path, "catalog")
            except YamlProblem as exc:
                cat.problems.append(Problem(label, exc.where, exc.message))
                continue
            except FileRefused as exc:
                cat.problems.append(Problem(label, "", f"not read: {exc.message}"))
                continue
            fam, problems = parse_family(data, label)
            cat.problems.extend(problems)
            if fam is None:
                continue
            extra = family_problems(fam, label)
            cat.problems.extend(extra)
            key = fam.id.upper()
            if key in cat.families:
                # Origin by folder, not by label: a user folder may itself be named "catalog".
                if (key in shipped) == (n == 0):
                    cat.problems.append(Problem(label, "id", f"family id {fam.id!r} also defined in {cat.files[key]}"))
                else:  # a user folder replaces a shipped family: every answer says so
                    cat.overrides.append(Override("family", fam.id, label, cat.files[key]))
            if n == 0:
                shipped.add(key)
            else:
                shipped.discard(key)
            cat.families[key] = fam
            cat.files[key] = label
    cat.problems.extend(catalog_problems(cat))
    cat.problems.extend(maker_problems(cat))
    return cat


@lru_cache(maxsize=4)
def load_catalog(extra: tuple[str, ...] = ()) -> Catalog:
    """The shipped catalog plus user folders and ``extra`` (``--catalog DIR``) folders."""
    from advisor.cache import cached

    for folder in extra:  # a --catalog folder that is not there is an error, never silently nothing
        if not Path(folder).is_dir():
            why = "no such folder" if not Path(folder).exists() else "not a folder"
            raise InputError(f"--catalog {folder!r}: {why}", hint="name a folder of family YAML files")
    dirs = data_dirs("catalog", extra)
    return cached("catalog", dirs, lambda: load_dirs(dirs), _to_cache, lambda data: _from_cache(data, dirs))


def _to_cache(cat: Catalog) -> dict:
    """The catalog as plain data for :mod:`advisor.cache`; each family is its own JSON
    text, so a cache hit parses and rebuilds only the families a command looks at."""
    import json

    from advisor.cache import to_data

    data = to_data(cat)
    data["families"] = {key: json.dumps(fam, ensure_ascii=False, allow_nan=False, separators=(",", ":"))
                        for key, fam in data["families"].items()}
    return data


def _from_cache(data: dict, dirs: list[Path]) -> Catalog:
    from advisor.cache import CacheMismatch, rebuild

    from advisor.makers import MakerBook

    from advisor.overrides import Override

    fields = {f.name for f in dataclasses.fields(Catalog)}
    if type(data) is not dict or set(data) != fields or fields != {"families", "files", "problems", "makers", "overrides"}:
        raise CacheMismatch("not a cached catalog of this shape")  # a new Catalog field: rebuilt (and a test says so)
    cat = Catalog(files=rebuild(dict[str, str], data["files"]), problems=rebuild(list[Problem], data["problems"]),
                  makers=rebuild(MakerBook, data["makers"]), overrides=rebuild(list[Override], data["overrides"]))
    cat.families = _CachedFamilies(rebuild(dict[str, str], data["families"]), cat, lambda: load_dirs(dirs))
    return cat


class _CachedFamilies(dict):
    """Family id -> Family, rebuilt from its cached JSON text on first access.

    A cached text that does not rebuild (a damaged or planted cache file) makes the
    whole catalog load again from the YAML files, in place, and drops the cache file,
    so the command goes on with validated data.
    """

    def __init__(self, raw: dict[str, str], owner: Catalog, reload) -> None:
        super().__init__(raw)
        self._owner = owner
        self._reload = reload

    def _family(self, key: str, value):
        if type(value) is not str:
            return value
        import json

        from advisor.cache import rebuild

        try:
            fam = rebuild(Family, json.loads(value))
        except (ValueError, TypeError, KeyError, NameError, AttributeError, RecursionError):
            return self._recover(key)
        dict.__setitem__(self, key, fam)
        return fam

    def _recover(self, key: str):
        from advisor.cache import drop

        drop("catalog")
        fresh = self._reload()
        dict.clear(self)
        dict.update(self, fresh.families)
        self._owner.files = fresh.files
        self._owner.problems = fresh.problems
        self._owner.overrides = fresh.overrides
        return dict.__getitem__(self, key)

    def _all(self) -> None:
        for key, value in list(dict.items(self)):
            if type(value) is str:
                self._family(key, value)

    def __getitem__(self, key):
        return self._family(key, dict.__getitem__(self, key))

    def get(self, key, default=None):
        if dict.__contains__(self, key):
            return self[key]
        return default

    def __iter__(self):  # not dict's own iterator: dict(x) and {**x} go through __getitem__
        return iter(list(dict.keys(self)))

    def values(self):
        self._all()
        return dict.values(self)

    def items(self):
        self._all()
        return dict.items(self)

    def copy(self):
        self._all()
        return dict(dict.items(self))

    def pop(self, key, *default):
        self._all()
        return dict.pop(self, key, *default)

    def setdefault(self, key, default=None):
        self._all()
        return dict.setdefault(self, key, default)

    def __eq__(self, other):
        self._all()
        return dict.__eq__(self, other)

    __hash__ = None

    def __repr__(self) -> str:
        self._all()
        return dict.__repr__(self)

    def __reduce__(self):
        self._all()
        return (dict, (dict(dict.items(self)),))


def require_clean(cat: Catalog) -> Catalog:
    """Raise DataError naming the first problem (the rest are in ``cat.problems``)."""
    raise_first_problem(cat.problems, "retime catalog check")
    return cat
