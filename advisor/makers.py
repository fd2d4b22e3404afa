"""Makers and the part-number forms they print (``catalog/makers.yaml``).

``makers`` are the names a family's ``maker:`` field may use; ``forms`` (regular
expressions) and ``prefixes`` (a maker prefix followed by a digit) say which makers
print a part number. Forms are tried first, in file order, then the longest prefix.
Several makers may print one form (NE555 is made by many): the answer is then all
of them, and a result names a single maker only when one of them published a
constant for the family (``advisor.timing.alternatives.choose``).
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from pathlib import Path

from advisor.record import Field, Record, model_validator

from advisor.parts import Source

#: The makers file inside a catalog folder (not a part family).
MAKERS_FILE = "makers.yaml"


class _Frozen(Record):
    """Frozen, unknown keys refused (advisor.record)."""


class Maker(_Frozen):
    id: str  # what a family's ``maker:`` says, e.g. "NXP"
    name: str
    also: list[str] = Field(default_factory=list)  # other spellings accepted by --maker
    lineage: str | None = None
    note: str | None = None


class PartForm(_Frozen):
    """A part-number form (``form``: regular expression) or prefix and the makers that print it."""

    form: str | None = None
    prefix: str | None = None
    makers: list[str]
    source: str
    note: str | None = None

    @model_validator(mode="after")
    def _one(self) -> "PartForm":
        if (self.form is None) == (self.prefix is None):
            raise ValueError("give either form (a regular expression) or prefix")
        if self.form is not None:
            try:
                re.compile(self.form)
            except re.error as exc:
                raise ValueError(f"form {self.form!r} is not a regular expression: {exc}") from None
        return self


class MakersFile(_Frozen):
    sources: list[Source] = Field(default_factory=list)
    makers: list[Maker]
    forms: list[PartForm] = Field(default_factory=list)
    prefixes: list[PartForm] = Field(default_factory=list)


@dataclass(frozen=True)
class PartMakers:
    """Who prints a part number: maker ids and the form or prefix that said so."""

    makers: tuple[str, ...]
    matched: str  # the prefix, or the form's expression
    note: str | None = None

    def to_json(self) -> dict:
        return {"makers": list(self.makers), "matched": self.matched, "note": self.note}


@dataclass
class MakerBook:
    """All makers and forms of the loaded catalog folders (later folders add to earlier ones)."""

    makers: dict[str, Maker] = field(default_factory=dict)
    forms: list[PartForm] = field(default_factory=list)
    prefixes: list[PartForm] = field(default_factory=list)
    sources: dict[str, Source] = field(default_factory=dict)

    def add(self, data: MakersFile) -> None:
        for m in data.makers:
            self.makers[m.id] = m
        self.forms.extend(data.forms)
        self.prefixes = sorted([*self.prefixes, *data.prefixes], key=lambda p: -len(p.prefix or ""))
        for s in data.sources:
            self.sources[s.id] = s

    def canonical(self, name: str) -> str | None:
        """The maker id for a name or spelling (case-insensitive), or None."""
        want = name.strip().casefold()
        for m in self.makers.values():
            if want in (m.id.casefold(), m.name.casefold(), *(a.casefold() for a in m.also)):
                return m.id
        return None

    def resolve(self, name: str) -> str:
        """The maker id ``--maker NAME`` means; InputError with did-you-mean otherwise."""
        from advisor.errors import InputError

        found = self.canonical(name)
        if found is not None:
            return found
        names = [m.id for m in self.makers.values()] + [m.name for m in self.makers.values()]
        hint = ""
        try:
            from rapidfuzz import process

            best = process.extract(name, names, limit=3, score_cutoff=50)
            if best:
                hint = "did you mean " + ", ".join(dict.fromkeys(self.canonical(b[0]) or b[0] for b in best)) + "?"
        except ImportError:  # pragma: no cover - rapidfuzz is a dependency
            pass
        raise InputError(f"--maker {name!r} is not a maker in catalog/makers.yaml", got=name,
                         hint=hint or "one of " + ", ".join(sorted(self.makers)))

    def of_part(self, text: str) -> PartMakers | None:
        """Who prints the part number ``text``, or None when it names no maker."""
        from advisor.partnumber import clean

        q = clean(text)
        for f in self.forms:
            if re.match(f.form, q):
                return PartMakers(tuple(f.makers), f.form, f.note)
        for p in self.prefixes:
            if q.startswith(p.prefix) and len(q) > len(p.prefix) and q[len(p.prefix)].isdigit():
                return PartMakers(tuple(p.makers), p.prefix, p.note)
        return None

    def problems(self, file: str) -> list[tuple[str, str, str]]:
        """(file, key path, message) for makers named in forms that are not listed."""
        out = []
        known = set(self.makers)
        for group, items in (("forms", self.forms), ("prefixes", self.prefixes)):
            for i, f in enumerate(items):
                for m in f.makers:
                    if m not in known:
                        out.append((file, f"{group}[{i}].makers", f"unknown maker {m!r}; expected one of {sorted(known)}"))
                if f.source not in self.sources and f.source not in ("common-practice", "memory"):
                    out.append((file, f"{group}[{i}].source", f"unknown source {f.source!r}"))
        return out


def read_makers(path: Path) -> MakersFile:
    """Raises YamlProblem / FileRefused (advisor.yamlload: strict, bounded, regular files only)."""
    from advisor.yamlload import load_yaml_file

    return MakersFile.model_validate(load_yaml_file(path, "catalog") or {})


def makers_of(catalog, part: str, forced: str | None = None) -> tuple[tuple[str, ...], str | None]:
    """(maker ids, basis) for a part number, or the forced ``--maker`` (basis "--maker").

    Raises InputError for an unknown ``--maker`` name.
    """
    book = getattr(catalog, "makers", None)
    if book is None:
        return (), None
    if forced:
        return (book.resolve(forced),), "--maker"
    hit = book.of_part(part)
    if hit is None:
        return (), None
    return hit.makers, "part-number prefix"
