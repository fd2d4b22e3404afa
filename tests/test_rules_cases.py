"""Every rule's own example cases, read from rules/*.yaml: one parametrised test.

Adding a rule adds data (its ``cases.fire`` and ``cases.no_fire``), not test code.
The cases are plain context values; each rule's ``source`` field names where the
behaviour it checks comes from.
"""

from __future__ import annotations

import pytest

from advisor.rules import load_rules


def _cases():
    rs = load_rules()
    assert not rs.problems, [str(p) for p in rs.problems]
    for rule in rs.rules:
        for kind in ("fire", "no_fire"):
            for i, case in enumerate(getattr(rule.rule.cases, kind)):
                yield pytest.param(rule, kind, case, id=f"{rule.id}-{kind}-{i}")


@pytest.mark.parametrize(("rule", "kind", "case"), list(_cases()))
def test_rule_case(rule, kind, case):
    fired = rule.fires(case)
    assert fired is (kind == "fire"), f"{rule.file}: rule {rule.id}: {kind} case {case} gave fired={fired}"
    if fired:
        # A firing case renders its message and fix, and the finding carries the rule's source.
        finding = rule.finding(case, part=case.get("part.id"))
        assert finding.message.strip() and finding.fix.strip()
        assert "{" not in finding.message and "{" not in finding.fix
        assert finding.source == rule.rule.source
