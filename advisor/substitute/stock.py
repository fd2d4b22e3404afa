"""Stock-aware alternates: a list of part numbers on the shelf or on the approved list.

The file is a CSV or XLSX table read like a BOM (``advisor.bom.table``); the part
column is found by the BOM's own column rules (or is the first column). Each part
number is recognised by rule (maker prefixes, package suffixes); a typo match does
not count as stock. A family is "in stock" when one of its part numbers is listed.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path


@dataclass(frozen=True)
class Stock:
    file: str
    entries: tuple[str, ...]
    families: dict[str, str] = field(default_factory=dict)  # family id (upper) -> first listed part number
    unrecognised: tuple[str, ...] = ()

    def entry_for(self, family_id: str) -> str | None:
        return self.families.get(family_id.upper())

    def to_json(self) -> dict:
        return {"file": self.file, "entries": len(self.entries),
                "families": dict(sorted(self.families.items())), "unrecognised": list(self.unrecognised)}


def read_stock(path: str | Path, catalog) -> Stock:
    """Read a stock list (see the module docstring); bad files raise the BOM reader's errors."""
    from advisor.bom.table import locate_columns, read_table
    from advisor.errors import InputError
    from advisor.partnumber import recognise_many

    table = read_table(Path(path))
    try:
        col = locate_columns(table, None).part
        rows = table.rows[table.header_row + 1:]
    except InputError:  # no part-number header: a bare list, every row (the first too) is a part number
        col, rows = 0, table.rows
    entries = tuple(dict.fromkeys(r[col].strip() for r in rows if col < len(r) and r[col].strip()))
    matches = recognise_many(catalog, list(entries))
    families: dict[str, str] = {}
    unknown = []
    for e in entries:
        found = [m for m in (matches.get(e) or []) if m.how != "fuzzy"]
        if found:
            families.setdefault(found[0].family.upper(), e)
        else:
            unknown.append(e)
    return Stock(str(path), entries, families, tuple(unknown))
