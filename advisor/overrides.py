"""What a user folder replaced: a family or a rule whose id the shipped catalog or the
shipped rules already have.

A user catalog folder (``--catalog DIR``, ``RETIME_CATALOG``, ``~/.config/retime/catalog``)
or rules folder (``RETIME_RULES``, ``~/.config/retime/rules``) may replace a shipped entry
by giving its id. The loaders record each replacement once, as an :class:`Override`
(``advisor.catalog.load_dirs`` into ``Catalog.overrides``, ``advisor.rules.loader.load_dirs``
into ``RuleSet.overrides``); :func:`note_overrides` puts one assumption line per
replacement at the head of an answer's ``assumptions``, so every answer (check, design,
swap, alternates, bom, board; text, JSON, reports and the workbench) says which data it
did not take as shipped. Faces only render those lines.

A replaced shipped rule of severity ``danger`` is also a fact for the rules
(``danger_rules_replaced``, set by :func:`advisor.rules.engine.evaluate` from the rule
set being evaluated): the rule ``shipped-danger-rule-replaced`` (rules/overrides.yaml) turns
it into a warning finding, so a datasheet danger check that no longer applies as
shipped is never only a line among the assumptions.
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Override:
    """One shipped entry replaced by a user file."""

    kind: str  # "family" or "rule"
    id: str
    file: str  # the user file whose entry is used
    shipped_file: str  # the shipped file whose entry it replaces
    shipped_severity: str | None = None  # rules: the shipped rule's severity
    severity: str | None = None  # rules: the replacing rule's severity

    @property
    def danger(self) -> bool:
        """A shipped danger rule replaced (whatever the replacement's severity)."""
        return self.kind == "rule" and self.shipped_severity == "danger"

    def assumption(self) -> str:
        """The one line every answer carries for this replacement."""
        if self.kind == "family":
            return f"family {self.id} from {self.file} replaces the shipped {self.shipped_file}"
        if self.danger:
            now = "" if self.severity == "danger" else f" (now a {self.severity})"
            return (f"shipped danger rule {self.id} ({self.shipped_file}) does not apply as shipped: "
                    f"{self.file} replaces it{now}")
        return f"rule {self.id} from {self.file} replaces the shipped rule in {self.shipped_file}"

    def to_json(self) -> dict:
        return {"kind": self.kind, "id": self.id, "file": self.file, "shipped_file": self.shipped_file,
                "shipped_severity": self.shipped_severity, "severity": self.severity}


def overrides_in_use(catalog=None, rules=None) -> list[Override]:
    """The replacements behind an answer: the catalog's (when given) and the rule set's
    (``rules``, else the set the engine evaluates: shipped plus the user rules folders).
    Replaced danger rules first, then rules, then families, each in load order."""
    found: list[Override] = list(getattr(catalog, "overrides", None) or [])
    if rules is None:
        from advisor.rules.loader import load_rules

        rules = load_rules()
    found += list(getattr(rules, "overrides", None) or [])
    order = {"rule": 1, "family": 2}
    return sorted(found, key=lambda o: (0 if o.danger else order.get(o.kind, 3)))


def override_assumptions(catalog=None, rules=None) -> list[str]:
    """One assumption line per replacement (:meth:`Override.assumption`)."""
    return [o.assumption() for o in overrides_in_use(catalog, rules)]


def note_overrides(answer, catalog=None, rules=None):
    """Put the replacement lines at the head of ``answer.assumptions`` (once); returns ``answer``.

    ``answer`` is an engine result with an ``assumptions`` list (TimingResult,
    DesignResult, SwapResult, AlternatesResult, BomResult, BoardPlan).
    """
    lines = override_assumptions(catalog, rules)
    if lines:
        kept = [a for a in answer.assumptions if a not in lines]
        answer.assumptions[:] = lines + kept
    return answer
