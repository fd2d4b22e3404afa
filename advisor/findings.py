"""Findings: what the datasheet rules say about a circuit, for reporters to render.

A finding is one datasheet rule (``rules/*.yaml``) that fired, with a severity, a
message, a fix and the source the rule stands on. The rules are the only checks:
the timing engine computes facts and never judges them (DEVELOPERS.md, "One
judgement path"). A finding also carries what its rule declares for a swap: the
class a firing forces (``swap_class``), whether the old values can be kept
(``blocks``) and the bench step that mends it (``rework``), so the swap classifier
and the rework planner read findings and re-test nothing.
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
    role: str | None = None  # "new", "old" (part rules) or "swap" (swap rules); None when not from a rule
    swap_class: str | None = None  # the class a swap is at least when this fires (rule's swap_class)
    blocks: tuple[str, ...] = ()  # what the firing rules out, e.g. "kept-values"
    rework: str | None = None  # the rule's bench step, rendered
    rework_action: str | None = None  # its action word (advisor.substitute.rework.ACTIONS)
    rework_fixes: bool = False  # after that step the hazard is gone (the plan may power up)

    def to_json(self) -> dict:
        d = asdict(self)
        d["blocks"] = list(self.blocks)
        return d


def severity_at_least(findings, level: str) -> bool:
    """True when some finding is as severe as ``level`` (danger > warning > note) or worse."""
    limit = SEVERITY_ORDER[level]
    return any(SEVERITY_ORDER[f.severity] <= limit for f in findings)


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
