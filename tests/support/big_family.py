"""A family listing many part numbers (demo data): the shipped NE555 file under the id
``XB555`` with generated part numbers ``XB555-00000``, ``XB555-00001``, ….

Used by the loading test (tests/test_catalog_loader.py) and the benchmark
tests/bench/catalog_20k_parts.py: a user folding an approved-parts list into one
family must not make loading slow (issue 18).
"""

from __future__ import annotations

import re
from pathlib import Path

SHIPPED = Path(__file__).resolve().parents[2] / "catalog" / "ne555.yaml"
FAMILY_ID = "XB555"


def big_family_numbers(n: int) -> list[str]:
    return [f"{FAMILY_ID}-{i:05d}" for i in range(n)]


def write_big_family(folder: Path, n: int, name: str = "xb555.yaml") -> list[str]:
    """Write the family into ``folder``; return its part numbers."""
    numbers = big_family_numbers(n)
    text = SHIPPED.read_text(encoding="utf-8")
    text = re.sub(r"(?m)^id: NE555$", f"id: {FAMILY_ID}", text, count=1)
    text = re.sub(r"(?m)^part_numbers: \[.*\]$", "part_numbers: [" + ", ".join(numbers) + "]", text, count=1)
    assert f"id: {FAMILY_ID}" in text and numbers[-1] in text, "the NE555 file changed shape"
    (folder / name).write_text(text, encoding="utf-8")
    return numbers
