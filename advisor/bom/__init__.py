"""BOM review: read a CSV/XLSX bill of materials, judge every timer and one-shot line,
write every row back in order with the tool's columns added."""

from advisor.bom.review import BomResult, review_bom

__all__ = ["BomResult", "review_bom"]
