"""The class of a swap, read from the fired findings (it re-tests nothing).

Classes, best first (:data:`CLASS_ORDER`): ``drop-in`` (no rule that rules out a
drop-in fired), ``drop-in-new-values``, ``rewire``, ``redesign``, ``unsuitable``.

Each datasheet rule declares what its firing means for a swap (``swap_class`` in
``rules/*.yaml``, grammar in rules/README.md): for example ``pins-moved`` is
``rewire``, ``trigger-above-supply`` is ``redesign``, ``supply-outside-recommended``
is ``unsuitable``. The class is the worst that the fired rules about the new part
and the swap declare (the old part's own findings do not count: it is being
removed), and the reasons printed are those findings' own messages.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass, field

from advisor.findings import Finding

CLASS_ORDER = ["drop-in", "drop-in-new-values", "rewire", "redesign", "unsuitable"]

#: The reason a drop-in gives: nothing fired that rules one out.
DROP_IN_REASON = "same pins; the old values keep the pulse within the tolerance (no rule that rules out a drop-in fired)"


@dataclass(frozen=True)
class Verdict:
    """The class, the messages of the findings that decided it, and what was counted."""

    cls: str
    reasons: tuple[str, ...]
    criteria: dict = field(default_factory=dict)

    @property
    def rank(self) -> int:
        return CLASS_ORDER.index(self.cls)

    def to_json(self) -> dict:
        d = asdict(self)
        d["class"] = d.pop("cls")
        d["reasons"] = list(self.reasons)
        return d


def counts(f: Finding) -> bool:
    """Findings that bear on the swap: the new part's and the swap rules' (not the removed part's)."""
    return f.role != "old"


def open_dangers(findings: list[Finding]) -> list[Finding]:
    """Dangers about the new circuit that no rework step of their rule fixes."""
    return [f for f in findings if f.severity == "danger" and counts(f) and not (f.rework and f.rework_fixes)]


def classify(findings: list[Finding]) -> Verdict:
    """The worst ``swap_class`` the fired findings declare (``drop-in`` when none does)."""
    deciding = [f for f in findings if counts(f) and f.swap_class is not None]
    cls = max((f.swap_class for f in deciding), key=CLASS_ORDER.index, default="drop-in")
    criteria = {
        "fired": {f.rule: f.swap_class for f in deciding},
        "danger_findings": sum(f.severity == "danger" for f in findings),
        "open_dangers": len(open_dangers(findings)),
    }
    if cls == "drop-in":
        return Verdict(cls, (DROP_IN_REASON,), criteria)
    reasons = tuple(dict.fromkeys(f.message for f in deciding if f.swap_class == cls))
    return Verdict(cls, reasons, criteria)
