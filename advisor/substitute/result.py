"""Result objects of a swap and of an alternates search, with the design guide's JSON keys.

``SwapResult.to_json()``: ``old`` and ``new`` (family, supply, values, timing),
``class``, ``pin_map``, ``rework`` (ordered steps), ``findings`` (both parts, most
severe first), and the new part's ``timing``, ``calibration`` and ``trigger`` at
the top level, like every timing result; ``capture`` is the summary of the old
board's scope capture when the measurement came from one (else null). ``AlternatesResult.to_json()``:
``{"old": ..., "candidates": [summary, ...], "rejected": [...]}``, best first.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from advisor.findings import SEVERITY_ORDER, Finding, sort_findings
from advisor.substitute.classify import Verdict
from advisor.substitute.pinmap import PinMap
from advisor.substitute.rework import Step


@dataclass
class PartSide:
    """One side of a swap: the family, the supply, the network and its timing."""

    family: str
    title: str
    vcc: float | None
    values: dict
    timing: dict  # {"nominal", "min", "max"}
    mode: str
    technology: str
    status: str
    trigger: dict | None = None  # this side's trigger-rate verdict, when a trigger period was given
    maker: str | None = None  # the maker whose constant this side's timing uses (None: unknown)
    maker_basis: str | None = None
    part_number: str | None = None  # as the user typed it, when not the bare family id

    def to_json(self) -> dict:
        return {
            "part_number": self.part_number,
            "maker": self.maker,
            "maker_basis": self.maker_basis,
            "trigger": dict(self.trigger) if self.trigger else None,
            "family": self.family,
            "title": self.title,
            "vcc": self.vcc,
            "mode": self.mode,
            "technology": self.technology,
            "status": self.status,
            "values": dict(self.values),
            "timing": {k: dict(v) for k, v in self.timing.items()},
        }


@dataclass
class SwapResult:
    old: PartSide
    new: PartSide
    verdict: Verdict
    pin_map: PinMap
    rework: list[Step]
    findings: list[Finding]
    kept: dict  # {"quantity", "value", "basis": "measured"|"predicted", ...}
    error: float | None  # new nominal / kept - 1 on the kept quantity
    calibration: dict | None = None
    trigger: dict | None = None
    design: dict | None = None  # how the values were found (series, kept_c, alternatives)
    assumptions: list[str] = field(default_factory=list)
    capture: dict | None = None  # summary of the old board's scope capture, when the measurement came from one
    rank: object | None = None  # advisor.substitute.rank.RankFacts, set when ranked among alternates

    @property
    def cls(self) -> str:
        return self.verdict.cls

    @property
    def timing(self) -> dict:
        return self.new.timing

    def severity_counts(self) -> dict[str, int]:
        out = {k: 0 for k in SEVERITY_ORDER}
        for f in self.findings:
            out[f.severity] += 1
        return out

    def to_json(self) -> dict:
        return {
            "old": self.old.to_json(),
            "new": self.new.to_json(),
            "class": self.verdict.cls,
            "reasons": list(self.verdict.reasons),
            "criteria": dict(self.verdict.criteria),
            "kept": dict(self.kept),
            "error": self.error,
            "pin_map": self.pin_map.to_json(),
            "rework": [s.to_json() for s in self.rework],
            "findings": [f.to_json() for f in sort_findings(self.findings)],
            "timing": {k: dict(v) for k, v in self.new.timing.items()},
            "values": dict(self.new.values),
            "calibration": self.calibration,
            "trigger": self.trigger,
            "design": self.design,
            "assumptions": list(self.assumptions),
            "capture": self.capture,
        }

    def summary(self) -> dict:
        """The short form an alternates list carries for each candidate."""
        return {
            "family": self.new.family,
            "title": self.new.title,
            "class": self.verdict.cls,
            "reasons": list(self.verdict.reasons),
            "error": self.error,
            "values": dict(self.new.values),
            "timing": {k: dict(v) for k, v in self.new.timing.items()},
            "vcc": self.new.vcc,
            "package": self.pin_map.new_package,
            "pairs": {str(k): v for k, v in sorted(self.pin_map.pairs().items())},
            "rework_steps": len(self.rework),
            "rework": [s.detail for s in self.rework],
            "findings": [f.to_json() for f in sort_findings(self.findings)],
            "severity_counts": self.severity_counts(),
            "status": self.new.status,
            "rank_reason": self.rank.reason() if self.rank is not None else None,
            "rank": self.rank.to_json() if self.rank is not None else None,
            "in_stock": self.rank.in_stock if self.rank is not None else None,
            "other_option": (self.design or {}).get("other_option"),
        }


@dataclass
class Rejected:
    family: str
    reason: str

    def to_json(self) -> dict:
        return {"family": self.family, "reason": self.reason}


@dataclass
class AlternatesResult:
    old: PartSide
    kept: dict
    new_vcc: float | None
    candidates: list[SwapResult]
    rejected: list[Rejected] = field(default_factory=list)
    assumptions: list[str] = field(default_factory=list)
    left_out: list[str] = field(default_factory=list)  # obsolete families not listed (--include-obsolete lists them)
    stock: dict | None = None  # the stock list used: {"file", "entries", "families"}

    def to_json(self) -> dict:
        return {
            "old": self.old.to_json(),
            "kept": dict(self.kept),
            "new_vcc": self.new_vcc,
            "candidates": [c.summary() for c in self.candidates],
            "rejected": [r.to_json() for r in self.rejected],
            "assumptions": list(self.assumptions),
            "left_out_obsolete": list(self.left_out),
            "stock": self.stock,
        }
