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


#: The timing engine checks a law's range itself (so a result is never silent), and
#: the datasheet rules (rules/*.yaml) check the same limits with their sources and
#: fixes as data. When a rule twin fired for the same part, the engine's finding is
#: dropped so the user reads each fact once.
ENGINE_TWINS: dict[str, frozenset[str]] = {
    "law-r-below-min": frozenset({"rext-below-min", "pot-end-below-min"}),
    "law-r-above-max": frozenset({"rext-above-max"}),
    "law-c-below-min": frozenset({"cext-below-min"}),
    "law-c-above-max": frozenset({"cext-above-max"}),
    "law-c-below-linear": frozenset({"cext-below-linear-range"}),
    "law-f-above-range": frozenset({"555-formula-above-100khz", "above-formula-frequency"}),
    "law-width-out-of-range": frozenset({"width-below-specified", "width-above-specified"}),
    "trigger-divides": frozenset({"pulse-outlasts-trigger-skips"}),
    "trigger-stays-high": frozenset({"pulse-outlasts-trigger-sticks"}),
}


def merge_findings(engine: list[Finding], rules: list[Finding]) -> list[Finding]:
    """Engine and rule findings together, engine twins of fired rules dropped, sorted."""
    fired = {(f.rule, f.part) for f in rules}
    fired_any = {f.rule for f in rules}
    kept = []
    for f in engine:
        twins = ENGINE_TWINS.get(f.rule, frozenset())
        if f.part is None:
            if twins & fired_any:
                continue
        elif any((t, f.part) in fired or (t, None) in fired for t in twins):
            continue
        kept.append(f)
    return sort_findings(kept + list(rules))
