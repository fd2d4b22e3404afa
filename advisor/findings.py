"""Findings: what the engine says about a circuit, for reporters to render.

A finding is one datasheet rule (or a law's validity check) that fired, with a
severity, a message, a fix and the source the rule stands on.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass
from typing import Literal

Severity = Literal["danger", "warning", "note"]
SEVERITY_ORDER: dict[str, int] = {"danger": 0, "warning": 1, "note": 2}


@dataclass(frozen=True)
class Finding:
    rule: str
    severity: Severity
    message: str
    fix: str
    source: str
    part: str | None = None  # family id the finding is about (old or new part in a swap)

    def to_json(self) -> dict:
        return asdict(self)


def sort_findings(findings: list[Finding]) -> list[Finding]:
    """Most severe first; stable within a severity; duplicates (same rule, part, message) dropped."""
    seen: set[tuple] = set()
    unique = []
    for f in findings:
        key = (f.rule, f.part, f.message)
        if key not in seen:
            seen.add(key)
            unique.append(f)
    return sorted(unique, key=lambda f: SEVERITY_ORDER[f.severity])
