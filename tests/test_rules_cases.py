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


# --- cases through a real circuit: the command line, the engine, build_context, the rules ----

#: Part and swap rules that no shipped family can make fire through a real circuit, and why.
#: (Board rules run through real schematics in tests/test_board_*.py.)
NO_REAL_CIRCUIT = {
    "trigger-below-retrigger-min": "no catalog family publishes a retrigger spacing above 0 s (MC14528B: 0 ns)",
    "constant-interpolated": "every shipped constant is published over the supplies it is used at",
    "shipped-danger-rule-replaced": "needs a user rules folder that replaces a shipped danger rule "
                                    "(tests/test_overrides.py runs every command with one)",
    "above-formula-frequency": "no shipped 4047-class family publishes an astable f_max, and the counter timers' "
                               "oscillator range is judged by oscillator-above-formula-frequency",
}


def _runs():
    for rule in load_rules().rules:
        for i, line in enumerate(rule.rule.cases.run):
            yield pytest.param(rule.id, line, id=f"{rule.id}-run-{i}")


def _fired(answer) -> set[str]:
    out: set[str] = set()
    if isinstance(answer, dict):
        for key, value in answer.items():
            if (key == "findings" or key.endswith("_findings")) and isinstance(value, list):
                out |= {f["rule"] for f in value if isinstance(f, dict)}
            else:
                out |= _fired(value)
    elif isinstance(answer, list):
        for item in answer:
            out |= _fired(item)
    return out


_ANSWERS: dict[str, dict] = {}


def _answer(line: str) -> dict:
    """The command's --json answer, run from the repository root (cached per line)."""
    import contextlib
    import io
    import json
    import os
    import shlex
    from pathlib import Path

    from advisor.cli.main import main

    if line not in _ANSWERS:
        buf, cwd = io.StringIO(), os.getcwd()
        os.chdir(Path(__file__).resolve().parents[1])
        try:
            with contextlib.redirect_stdout(buf):
                assert main(shlex.split(line) + ["--json"]) == 0, line
        finally:
            os.chdir(cwd)
        _ANSWERS[line] = json.loads(buf.getvalue())
    return _ANSWERS[line]


@pytest.mark.parametrize(("rule_id", "line"), list(_runs()))
def test_rule_fires_on_its_real_circuit(rule_id, line):
    assert rule_id in _fired(_answer(line)), f"retime {line} --json does not fire {rule_id}"


def test_every_part_and_swap_rule_has_a_real_circuit_case():
    bare = [r.id for r in load_rules().rules
            if r.rule.applies_to.scope in ("part", "swap") and not r.rule.cases.run and r.id not in NO_REAL_CIRCUIT]
    assert not bare, f"give these rules a cases.run command line: {bare}"
