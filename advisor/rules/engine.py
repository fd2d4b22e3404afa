"""Evaluate the rule set against a context and return findings.

:func:`evaluate` takes the flat context of :func:`advisor.rules.context.build_context`
(plain values only) and returns :class:`advisor.findings.Finding` objects, most
severe first. Nothing is printed here; reporters render the findings.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from advisor.findings import SEVERITY_ORDER, Finding, sort_findings
from advisor.rules.context import PART_VOCABULARY, ROLES, TOP_VOCABULARY
from advisor.rules.model import Rule
from advisor.rules.safe_expr import Expr
from advisor.rules.template import Template


@dataclass(frozen=True)
class CompiledRule:
    """A validated rule with its condition and templates checked and compiled."""

    rule: Rule
    file: str
    topic: str
    condition: Expr
    message: Template
    fix: Template
    rework: Template | None = None

    @property
    def id(self) -> str:
        return self.rule.id

    @property
    def severity(self) -> str:
        return self.rule.severity

    @property
    def subject(self) -> str:
        """The prefix the applies_to filters look at: ``part`` or ``new``."""
        return "part" if self.rule.applies_to.scope in ("part", "board") else "new"

    def applies(self, view: dict) -> bool:
        a = self.rule.applies_to
        p = self.subject
        if a.function and view.get(f"{p}.function") not in a.function:
            return False
        if a.technology and view.get(f"{p}.technology") not in a.technology:
            return False
        if a.family:
            fam = view.get(f"{p}.id")
            if not isinstance(fam, str) or fam.upper() not in {f.upper() for f in a.family}:
                return False
        return True

    def fires(self, view: dict) -> bool:
        """True when the rule applies to this view and its condition is definitely true."""
        return self.applies(view) and self.condition.truth(view)

    def finding(self, view: dict, part: str | None, role: str | None = None) -> Finding:
        r = self.rule
        return Finding(
            rule=self.id,
            severity=r.severity,  # type: ignore[arg-type]
            message=self.message.render(view),
            fix=self.fix.render(view),
            source=r.source,
            part=part,
            role=role,
            swap_class=r.swap_class,
            blocks=tuple(r.blocks),
            rework=self.rework.render(view) if self.rework is not None else None,
            rework_action=r.rework.action if r.rework is not None else None,
            rework_fixes=bool(r.rework.fixes) if r.rework is not None else False,
        )

    def to_json(self) -> dict:
        r = self.rule
        return {
            "id": r.id,
            "severity": r.severity,
            "title": r.title,
            "source": r.source,
            "topic": self.topic,
            "file": self.file,
            "scope": r.applies_to.scope,
            "parts": list(r.applies_to.parts) if r.applies_to.scope == "part" else ["old", "new"],
            "function": list(r.applies_to.function),
            "technology": list(r.applies_to.technology),
            "family": list(r.applies_to.family),
            "condition": r.condition,
            "message": r.message,
            "fix": r.fix,
            "cases": {"fire": len(r.cases.fire), "no_fire": len(r.cases.no_fire)},
            "swap_class": r.swap_class,
            "blocks": list(r.blocks),
            "rework": r.rework.model_dump() if r.rework is not None else None,
        }


@dataclass
class RuleSet:
    """All loaded rules in file order, plus any located problems."""

    rules: list[CompiledRule] = field(default_factory=list)
    problems: list = field(default_factory=list)
    #: Shipped rules a user folder replaced (advisor.overrides.Override; every answer lists them).
    overrides: list = field(default_factory=list)

    def ids(self) -> list[str]:
        return [r.id for r in self.rules]

    def get(self, rule_id: str) -> CompiledRule:
        for r in self.rules:
            if r.id == rule_id:
                return r
        import difflib

        from advisor.errors import InputError

        close = difflib.get_close_matches(rule_id, self.ids(), n=3, cutoff=0.5)
        hint = ("did you mean " + ", ".join(close) + "?") if close else "'retime rules' lists them"
        raise InputError(f"no rule {rule_id!r}", got=rule_id, hint=hint)

    def to_json(self) -> dict:
        return {
            "rules": [r.to_json() for r in self.rules],
            "count": len(self.rules),
            "by_severity": {s: sum(r.severity == s for r in self.rules) for s in SEVERITY_ORDER},
            "overrides": [o.to_json() for o in self.overrides],
        }


def _views(context: dict) -> dict[str, dict]:
    """One view per present part: top-level names plus ``part.*`` bound to that part."""
    top = {v.name: context.get(v.name) for v in TOP_VOCABULARY}
    views: dict[str, dict] = {}
    for role in ROLES:
        if context.get(f"{role}.id") is None:
            continue
        view = dict(top)
        for v in PART_VOCABULARY:
            view[f"part.{v.name}"] = context.get(f"{role}.{v.name}")
        views[role] = view
    return views


def danger_rules_replaced(rules: RuleSet) -> str | None:
    """The fact ``danger_rules_replaced``: shipped danger rules this rule set replaced
    from a user folder (advisor.overrides), as 'id (user file)', or None."""
    hits = [f"{o.id} ({o.file})" for o in getattr(rules, "overrides", ()) if o.danger]
    return ", ".join(hits) or None


def evaluate(context: dict, rules: RuleSet | None = None) -> list[Finding]:
    """Every rule that fires on ``context``, most severe first.

    ``context`` comes from :func:`build_context`. Part rules run once for each
    part they name that the context holds; swap rules run when ``swap`` is true.
    """
    if rules is None:
        from advisor.rules.loader import load_rules_checked

        rules = load_rules_checked()
    context = {**context, "danger_rules_replaced": danger_rules_replaced(rules)}
    views = _views(context)
    findings: list[Finding] = []
    for rule in rules.rules:
        scope = rule.rule.applies_to
        if scope.scope == "part":
            for role in scope.parts:
                view = views.get(role)
                if view is not None and rule.fires(view):
                    findings.append(rule.finding(view, part=view.get("part.id"), role=role))  # type: ignore[arg-type]
        elif scope.scope == "swap" and context.get("swap") is True and rule.fires(context):
            findings.append(rule.finding(context, part=context.get("new.id"), role="swap"))  # type: ignore[arg-type]
    return sort_findings(findings)


def case_view(rule: CompiledRule, case: dict) -> dict:
    """A case's values as the view the rule reads (names not given are None)."""
    return dict(case)


def check_cases(rule: CompiledRule) -> list[str]:
    """Problems with a rule's own example cases (empty when all behave)."""
    out = []
    for i, case in enumerate(rule.rule.cases.fire):
        if not rule.fires(case_view(rule, case)):
            out.append(f"cases.fire[{i}] does not fire")
    for i, case in enumerate(rule.rule.cases.no_fire):
        if rule.fires(case_view(rule, case)):
            out.append(f"cases.no_fire[{i}] fires")
    return out
