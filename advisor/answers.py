"""Typed, frozen answers of the commands: the ``--json`` contract as pydantic models.

Every command's JSON answer (DEVELOPERS.md, "The command-line and JSON contract")
has a model here; the JSON Schemas in ``schemas/`` are generated from them
(``python -m advisor.schemas``) and a test validates every README example against
them. The Python API (:mod:`advisor.api`) returns these objects, so a notebook reads
``answer.timing.nominal.width`` instead of digging in dicts.

Models are frozen and typed for the keys the contract lists; keys beyond those are
kept (``extra="allow"``: keys may be added, none renamed or removed). Quantities are
SI base units (s, Hz, Ω, F, V). ``to_json()`` gives the same dict the command prints;
tabular answers have ``to_frame()`` (pandas is imported only there).
"""

from __future__ import annotations

from typing import Any, Literal, Optional

from pydantic import BaseModel, ConfigDict, Field

Severity = Literal["danger", "warning", "note"]
SwapClass = Literal["drop-in", "drop-in-new-values", "rewire", "redesign", "unsuitable"]


class _Answer(BaseModel):
    # defer_build: nothing is built until an answer is made (start-up stays light).
    model_config = ConfigDict(frozen=True, extra="allow", defer_build=True, populate_by_name=True)

    def to_json(self) -> dict:
        """The dict the command prints with --json (aliases such as ``class`` restored)."""
        return self.model_dump(mode="json", by_alias=True, exclude_unset=True)


def _frame(rows: list[dict]):
    import pandas as pd  # only here: ``import advisor`` stays light

    return pd.DataFrame(rows)


class Finding(_Answer):
    rule: str
    severity: Severity
    message: str
    fix: str
    source: str
    part: Optional[str] = None
    role: Optional[str] = None
    swap_class: Optional[str] = None
    blocks: list[str] = Field(default_factory=list)
    rework: Optional[str] = None


class _WithFindings(_Answer):
    findings: list[Finding] = Field(default_factory=list)

    def findings_frame(self):
        """The findings as a table (one row per finding)."""
        return _frame([f.to_json() for f in self.findings])


class Times(_Answer):
    """One set of times: ``width`` (one-shots, 555 monostable) or the astable keys."""

    width: Optional[float] = None
    high: Optional[float] = None
    low: Optional[float] = None
    period: Optional[float] = None
    frequency: Optional[float] = None
    duty: Optional[float] = None


class Band(_Answer):
    nominal: Times
    min: Times
    max: Times


class Network(_Answer):
    r: Optional[float] = None
    ra: Optional[float] = None
    rb: Optional[float] = None
    c: Optional[float] = None
    pot: Optional[float] = None
    pot_setting: Optional[float] = None
    vcc: Optional[float] = None


class Adjust(_Answer):
    min: Times
    max: Times
    pot: float


class TargetVerdict(_Answer):
    value: float
    reachable: Optional[bool] = None
    setting: Optional[float] = None


class Calibration(_Answer):
    factor: float
    quantity: str


class TriggerFacts(_Answer):
    period: float
    divide_by: Optional[int] = None
    stays_high: bool


class CheckAnswer(_WithFindings):
    """``retime check --json``: the timing of one circuit with its findings."""

    part: str
    #: The part number as typed (MM74HC123AN), when it says more than the family id; else null.
    part_number: Optional[str] = None
    mode: Literal["mono", "astable"]
    law: str
    values: Network
    timing: Band
    adjust: Optional[Adjust] = None
    target: Optional[TargetVerdict] = None
    calibration: Optional[Calibration] = None
    trigger: Optional[TriggerFacts] = None
    assumptions: list[str] = Field(default_factory=list)
    capture: Optional[dict[str, Any]] = None
    facts: dict[str, Any] = Field(default_factory=dict)
    #: The maker whose constant the nominal uses (None: unknown) and why (catalog/makers.yaml).
    maker: Optional[str] = None
    maker_basis: Optional[str] = None
    #: Each maker's formula in the band, nominal first (advisor.timing.alternatives).
    makers: list[dict[str, Any]] = Field(default_factory=list)


class Candidate(_WithFindings):
    values: Network
    timing: Band
    error: float
    kept_c: bool


class DesignAnswer(_WithFindings):
    """``retime design --json``: candidates best first; the best one's timing repeated."""

    part: str
    #: The part number as typed (MM74HC123AN), when it says more than the family id; else null.
    part_number: Optional[str] = None
    mode: Literal["mono", "astable"]
    target: dict[str, Any]
    series: str
    candidates: list[Candidate]
    timing: Optional[Band] = None
    values: Optional[Network] = None
    error: Optional[float] = None
    assumptions: list[str] = Field(default_factory=list)
    maker: Optional[str] = None
    maker_basis: Optional[str] = None

    def to_frame(self):
        """One row per candidate: its values, nominal time, error and finding count."""
        rows = []
        for c in self.candidates:
            row = {k: v for k, v in c.values.to_json().items() if v is not None and k in Network.model_fields}
            row.update({f"nominal_{k}": v for k, v in c.timing.nominal.to_json().items() if v is not None})
            row.update(error=c.error, kept_c=c.kept_c, findings=len(c.findings))
            rows.append(row)
        return _frame(rows)


class Side(_Answer):
    family: str
    #: The part number as typed (MM74HC123AN), when it says more than the family id; else null.
    part_number: Optional[str] = None
    vcc: Optional[float] = None
    mode: str
    values: Network
    timing: Band
    maker: Optional[str] = None
    maker_basis: Optional[str] = None


class Step(_Answer):
    n: int
    action: str
    detail: str
    pins: list[int] = Field(default_factory=list)


class SwapAnswer(_WithFindings):
    """``retime swap --json``: the class, why, the pin map and the bench rework."""

    old: Side
    new: Side
    cls: SwapClass = Field(alias="class")
    reasons: list[str]
    criteria: dict[str, Any] = Field(default_factory=dict)
    pin_map: dict[str, Any]
    rework: list[Step]
    timing: Band
    values: Network
    calibration: Optional[Calibration] = None
    trigger: Optional[dict[str, Any]] = None
    assumptions: list[str] = Field(default_factory=list)
    capture: Optional[dict[str, Any]] = None

    def to_frame(self):
        """The rework plan as a table (one row per bench step)."""
        return _frame([s.to_json() for s in self.rework])


class AlternateSummary(_WithFindings):
    family: str
    cls: SwapClass = Field(alias="class")
    reasons: list[str] = Field(default_factory=list)
    error: Optional[float] = None
    values: Network
    timing: Band


class AlternatesAnswer(_Answer):
    """``retime alternates --json``: ``candidates`` best first, ``rejected`` with reasons."""

    old: Side
    candidates: list[AlternateSummary]
    rejected: list[dict[str, Any]] = Field(default_factory=list)
    assumptions: list[str] = Field(default_factory=list)

    def to_frame(self):
        """One row per candidate: family, class, timing error, nominal time, findings by severity."""
        rows = []
        for c in self.candidates:
            sev = [f.severity for f in c.findings]
            rows.append({"family": c.family, "class": c.cls, "error": c.error,
                         **{f"nominal_{k}": v for k, v in c.timing.nominal.to_json().items() if v is not None},
                         "danger": sev.count("danger"), "warning": sev.count("warning"), "note": sev.count("note")})
        return _frame(rows)


class BomFinding(_Answer):
    rule: str
    severity: Severity
    message: str


class BomRow(_Answer):
    line: int
    cells: dict[str, Any]
    status: str
    family: Optional[str] = None
    findings: list[BomFinding] = Field(default_factory=list)


class BomAnswer(_Answer):
    """``retime bom --json``: every input row back, in order, with its review."""

    file: str
    rows: list[BomRow]
    summary: dict[str, int]
    #: What the whole review assumed: shipped families or rules a user folder replaced (advisor.overrides).
    assumptions: list[str] = Field(default_factory=list)

    def to_frame(self):
        """One row per BOM line: its cells, then status, family, best alternate and class."""
        out = []
        for r in self.rows:
            j = r.to_json()
            row = dict(r.cells)
            for k in ("status", "family", "score", "best_alternate", "best_class", "reason"):
                row[k] = j.get(k)
            row["findings"] = len(r.findings)
            out.append(row)
        return _frame(out)


class Statistic(_Answer):
    median: Optional[float] = None
    min: Optional[float] = None
    max: Optional[float] = None
    count: int


class Channel(_Answer):
    index: int
    name: str
    high: Statistic
    low: Statistic
    period: Statistic
    frequency: Statistic
    duty: Statistic


class MeasureAnswer(_Answer):
    """``retime measure --json``: statistics per channel and the trigger/output pair."""

    capture: dict[str, Any]
    channels: list[Channel]
    pair: Optional[dict[str, Any]] = None

    def to_frame(self):
        """One row per channel and quantity: median, min, max, count."""
        rows = []
        for ch in self.channels:
            for q in ("high", "low", "period", "frequency", "duty"):
                rows.append({"channel": ch.index, "name": ch.name, "quantity": q, **getattr(ch, q).to_json()})
        return _frame(rows)


class FindResult(_Answer):
    family: str
    score: float


class FindAnswer(_Answer):
    """``retime find --json``."""

    results: list[FindResult]


class FamilySheet(_Answer):
    """``retime show --json``: the family as the catalog holds it."""

    id: str
    title: str
    function: str
    technology: str


class CatalogListAnswer(_Answer):
    """``retime catalog list --json``."""

    families: list[dict[str, Any]]


class RuleEntry(_Answer):
    id: str
    severity: Severity
    title: str
    source: str


class RulesAnswer(_Answer):
    """``retime rules --json``."""

    rules: list[RuleEntry]


class BoardPlanItem(_Answer):
    ref: str
    cls: Optional[str] = Field(default=None, alias="class")


class BoardAnswer(_Answer):
    """``retime board --json``: the timers traced from a KiCad schematic or netlist and their plan."""

    file: str
    source: str
    new_vcc: Optional[float] = None
    nets: list[dict[str, Any]]
    timers: list[dict[str, Any]]
    plan: list[BoardPlanItem]
    bom_delta: dict[str, Any]
    unresolved: list[Any] = Field(default_factory=list)
    #: What the whole plan assumed: shipped families or rules a user folder replaced (advisor.overrides).
    assumptions: list[str] = Field(default_factory=list)

    def to_frame(self):
        """One row per planned timer: reference, class, and the board's note."""
        return _frame([{"ref": p.ref, "class": p.cls, **{k: v for k, v in p.to_json().items()
                                                         if k in ("channel", "label", "note")}} for p in self.plan])


#: The model of each command's ``--json`` answer (schemas/<name>.schema.json).
ANSWERS: dict[str, type[_Answer]] = {
    "check": CheckAnswer,
    "design": DesignAnswer,
    "swap": SwapAnswer,
    "alternates": AlternatesAnswer,
    "bom": BomAnswer,
    "measure": MeasureAnswer,
    "find": FindAnswer,
    "show": FamilySheet,
    "catalog-list": CatalogListAnswer,
    "rules": RulesAnswer,
    "board": BoardAnswer,
}
