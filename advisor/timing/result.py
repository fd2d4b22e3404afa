"""Result objects of the timing engine, with the design guide's JSON keys."""

from __future__ import annotations

from dataclasses import dataclass, field

from advisor.findings import Finding, sort_findings


def _json(obj):
    return obj.to_json() if hasattr(obj, "to_json") else obj


@dataclass
class TimingResult:
    """Timing of one circuit on one family (``analyse``). Times calibrated when measured."""

    part: str
    mode: str  # "mono" | "astable"
    law: str
    values: dict
    timing: dict  # {"nominal", "min", "max"}
    adjust: dict | None = None
    target: dict | None = None
    calibration: object | None = None  # Calibration
    trigger: object | None = None  # TriggerResult
    findings: list[Finding] = field(default_factory=list)
    constants: dict = field(default_factory=dict)  # name -> Constant
    tolerances: dict = field(default_factory=dict)
    assumptions: list[str] = field(default_factory=list)
    distribution: object | None = None  # Distribution (Monte Carlo), when asked
    extra: dict = field(default_factory=dict)
    capture: dict | None = None  # summary of the scope capture behind the measurement (advisor.measure.summary)
    facts: dict = field(default_factory=dict)  # what the rules judge: paths, chosen limits (advisor.timing.validity)
    maker: str | None = None  # the maker whose constant the nominal uses; None when unknown
    maker_basis: str | None = None  # "part-number prefix", "--maker", "unknown: band spans makers", ...
    makers: list = field(default_factory=list)  # each maker's formula in the band (AltParams), nominal first
    part_number: str | None = None  # as the user typed it (Circuit.part_number)

    def to_json(self) -> dict:
        out = {
            "part": self.part,
            "part_number": self.part_number,
            "maker": self.maker,
            "maker_basis": self.maker_basis,
            "makers": [_json(m) for m in self.makers],
            "mode": self.mode,
            "law": self.law,
            "values": dict(self.values),
            "timing": {k: dict(v) for k, v in self.timing.items()},
            "adjust": self.adjust,
            "target": self.target,
            "calibration": _json(self.calibration),
            "trigger": _json(self.trigger),
            "findings": [f.to_json() for f in sort_findings(self.findings)],
            "constants": {k: _json(v) for k, v in self.constants.items()},
            "tolerances": dict(self.tolerances),
            "assumptions": list(self.assumptions),
            "capture": self.capture,
            "facts": self.facts,
        }
        if self.distribution is not None:
            out["distribution"] = _json(self.distribution)
        out.update(self.extra)
        return out


@dataclass
class Candidate:
    """One inverse-design answer: the network, its timing and band, its error."""

    values: dict
    timing: dict  # {"nominal", "min", "max"}
    error: float  # signed, relative: achieved/target - 1 on the target quantity
    findings: list[Finding] = field(default_factory=list)
    kept_c: bool = False
    adjust: dict | None = None
    setting: float | None = None
    duty_error: float | None = None
    mode: str = "mono"
    facts: dict = field(default_factory=dict)  # what the rules judge (advisor.timing.validity)

    def to_json(self) -> dict:
        out = {
            "values": dict(self.values),
            "timing": {k: dict(v) for k, v in self.timing.items()},
            "error": self.error,
            "kept_c": self.kept_c,
            "findings": [f.to_json() for f in sort_findings(self.findings)],
            "mode": self.mode,
            "facts": self.facts,
        }
        if self.adjust is not None:
            out["adjust"] = self.adjust
            out["setting"] = self.setting
        if self.duty_error is not None:
            out["duty_error"] = self.duty_error
        return out


@dataclass
class DesignResult:
    part: str
    mode: str
    target: dict
    series: str
    candidates: list[Candidate]
    findings: list[Finding] = field(default_factory=list)
    assumptions: list[str] = field(default_factory=list)
    tolerances: dict = field(default_factory=dict)
    maker: str | None = None
    maker_basis: str | None = None
    c_series: str = "E6"  # capacitor series searched when C may change
    part_number: str | None = None  # as the user typed it (Circuit.part_number)

    @property
    def best(self) -> Candidate | None:
        return self.candidates[0] if self.candidates else None

    def to_json(self) -> dict:
        best = self.best
        return {
            "part": self.part,
            "part_number": self.part_number,
            "maker": self.maker,
            "maker_basis": self.maker_basis,
            "mode": self.mode,
            "target": self.target,
            "series": self.series,
            "c_series": self.c_series,
            "candidates": [c.to_json() for c in self.candidates],
            "timing": {k: dict(v) for k, v in best.timing.items()} if best else None,
            "values": dict(best.values) if best else None,
            "error": best.error if best else None,
            "findings": [f.to_json() for f in sort_findings(self.findings + (best.findings if best else []))],
            "assumptions": list(self.assumptions),
            "tolerances": dict(self.tolerances),
        }
