"""Datasheet rules as data: load ``rules/*.yaml``, evaluate them safely, return findings.

Public interface (see DEVELOPERS.md for the context vocabulary):

- :func:`load_rules` (``extra_dirs``) -> :class:`RuleSet` (``.rules``, ``.problems``, ``.to_json()``)
- :func:`build_context` (new, circuit, timing_json, old=..., old_circuit=..., old_timing=...) -> dict
- :func:`evaluate` (context) -> list of :class:`advisor.findings.Finding`
- :func:`check_findings` / :func:`swap_findings`: the two common uses in one call.

Conditions and message templates are never run by Python's own evaluator: a
small allow-listed interpreter over :mod:`ast` (:mod:`advisor.rules.safe_expr`)
checks them at load time against the declared vocabulary.
"""

from __future__ import annotations

from advisor.circuit import Circuit
from advisor.findings import Finding
from advisor.parts import Family
from advisor.rules.context import PART_VOCABULARY, TOP_VOCABULARY, build_context, part_values, vocabulary
from advisor.rules.engine import CompiledRule, RuleSet, check_cases, evaluate
from advisor.rules.loader import RuleProblem, load_dirs, load_rules, load_rules_checked, require_clean


def check_findings(family: Family, circuit: Circuit, timing) -> list[Finding]:
    """Rule findings for one part in one circuit (``check``, each ``design`` candidate, a swap's kept values).

    ``timing`` is the engine's result (a TimingResult or a design Candidate, or its JSON), or None.
    """
    return evaluate(build_context(family, circuit, timing))


def swap_findings(
    old: Family,
    old_circuit: Circuit,
    old_timing_json: dict | None,
    new: Family,
    new_circuit: Circuit,
    new_timing_json: dict | None,
    *,
    swap_facts: dict | None = None,
) -> list[Finding]:
    """Rule findings for replacing ``old`` by ``new`` (both parts' rules and the swap rules).

    ``swap_facts`` are the swap engine's facts (pin moves, ties, design outcome;
    :func:`advisor.substitute.swap.swap_facts`), read by the swap rules.
    """
    ctx = build_context(new, new_circuit, new_timing_json, old=old, old_circuit=old_circuit,
                        old_timing=old_timing_json, swap_facts=swap_facts)
    return evaluate(ctx)


__all__ = [
    "PART_VOCABULARY", "TOP_VOCABULARY", "CompiledRule", "RuleProblem", "RuleSet", "build_context",
    "check_cases", "check_findings", "evaluate", "load_dirs", "load_rules", "load_rules_checked",
    "part_values", "require_clean", "swap_findings", "vocabulary",
]
