"""Tiny inline catalogs for loader and recognition tests (not the shipped catalog).

``family_dict`` builds the smallest valid family; tests change one field and
write it with ``write_family``. Values here are placeholders for the grammar,
not data about any real part.
"""

from __future__ import annotations

import copy
from pathlib import Path

import yaml

_BASE = {
    "id": "TEST1",
    "title": "Test one-shot",
    "function": "monostable",
    "technology": "hc",
    "channels": 1,
    "part_numbers": ["TEST1"],
    "supply": {"recommended": {"min": 2.0, "max": 6.0, "source": "s1"},
               "absolute_max": {"value": 7.0, "source": "s1"}},
    "timing": {"law": "krc", "constants": {"k": [{"value": 0.7, "source": "s1"}]},
               "spread": {"value": 0.05, "basis": "typical", "source": "s1"}},
    "components": {"r_min": [{"value": 1000.0, "source": "memory"}]},
    "behaviour": {"retrigger": "no", "retrigger_source": "s1",
                  "triggers": [{"name": "A", "function": "TRIG_FALL", "edge": "falling", "schmitt": False}]},
    "interface": {"inputs": "cmos"},
    "packages": [{"name": "DIP-8", "source": "s1", "pins": [
        {"pin": 1, "name": "A", "function": "TRIG_FALL"},
        {"pin": 2, "name": "B", "function": "TRIG_RISE"},
        {"pin": 3, "name": "Q", "function": "Q"},
        {"pin": 4, "name": "GND", "function": "GND"},
        {"pin": 5, "name": "CX", "function": "CEXT"},
        {"pin": 6, "name": "RCX", "function": "RCEXT"},
        {"pin": 7, "name": "NC", "function": "NC"},
        {"pin": 8, "name": "VCC", "function": "VCC"}]}],
    "sources": [{"id": "s1", "title": "placeholder document", "kind": "datasheet"}],
}


def family_dict(family_id: str = "TEST1", **changes) -> dict:
    data = copy.deepcopy(_BASE)
    data["id"] = family_id
    data["part_numbers"] = [family_id]
    data.update(changes)
    return data


def write_family(folder: Path, family_id: str = "TEST1", *, file: str | None = None, text: str | None = None, **changes) -> Path:
    path = Path(folder) / (file or f"{family_id.lower()}.yaml")
    path.write_text(text if text is not None else yaml.safe_dump(family_dict(family_id, **changes), sort_keys=False, allow_unicode=True), encoding="utf-8")
    return path
