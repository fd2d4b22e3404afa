"""Rule loading (located errors, overrides), the shipped rule set's invariants, and the
context built from a family + circuit + timing JSON.

The family here is a tiny inline one (not the shipped catalog). Its figures follow the
Philips 74HC/HCT221 product specification (1990): supply 2.0 V to 6.0 V, absolute maximum
7 V, t = 0.7·Rext·Cext, nA falling edge (not Schmitt), nB rising edge (Schmitt), nRD clear.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from advisor.circuit import Circuit, Trigger
from advisor.errors import DataError
from advisor.parts import Family
from advisor.rules import build_context, check_findings, evaluate, load_dirs, load_rules, swap_findings
from advisor.rules.loader import require_clean

HC221 = {
    "id": "74HC221",
    "title": "test one-shot",
    "function": "monostable",
    "technology": "hc",
    "channels": 2,
    "status": "active",
    "part_numbers": ["74HC221"],
    "supply": {"recommended": {"min": 2.0, "max": 6.0, "source": "ph"}, "absolute_max": {"value": 7.0, "source": "ph"}},
    "timing": {"law": "krc", "constants": {"k": [{"value": 0.7, "source": "ph"}]}},
    "components": {"r_min": [{"value": 1000.0, "vcc_min": 3.0, "source": "memory"}]},
    "behaviour": {
        "retrigger": "no",
        "retrigger_source": "ph",
        "triggers": [
            {"name": "nA", "function": "TRIG_FALL", "edge": "falling", "schmitt": False, "enable": {"TRIG_RISE": "high", "CLEAR": "high"}},
            {"name": "nB", "function": "TRIG_RISE", "edge": "rising", "schmitt": True, "enable": {"TRIG_FALL": "low", "CLEAR": "high"}},
        ],
        "clear": {"name": "nRD", "active": "low", "ends_pulse": True, "triggers_on_release": True, "source": "ph"},
    },
    "interface": {"inputs": "cmos", "vih_fraction": {"value": 0.7, "source": "memory"}},
    "packages": [{
        "name": "DIP-16", "source": "ph",
        "pins": [
            {"pin": 1, "name": "1A", "function": "TRIG_FALL", "channel": 1},
            {"pin": 2, "name": "1B", "function": "TRIG_RISE", "channel": 1},
            {"pin": 3, "name": "1RD", "function": "CLEAR", "channel": 1},
            {"pin": 8, "name": "GND", "function": "GND"},
            {"pin": 16, "name": "VCC", "function": "VCC"},
        ],
    }],
    "sources": [{"id": "ph", "title": "Philips 74HC/HCT221", "kind": "datasheet"}],
}


def family(**changes) -> Family:
    data = {**HC221, **changes}
    return Family.model_validate(data)


def timing_json(width: float, *, divide_by=None, stays_high=None, period=None) -> dict:
    out = {"mode": "mono", "timing": {"nominal": {"width": width}, "min": {"width": width * 0.85}, "max": {"width": width * 1.15}}}
    if period is not None:
        out["trigger"] = {"period": period, "divide_by": divide_by, "stays_high": stays_high}
    return out


def ids(findings) -> set[str]:
    return {f.rule for f in findings}


# --- the shipped rule set ---------------------------------------------------------

def test_shipped_rules_load_clean_and_meet_the_issue():
    rs = load_rules()
    assert rs.problems == []
    assert len(rs.rules) >= 20  # issue 5: at least 20 rules
    assert len(set(rs.ids())) == len(rs.ids())
    for r in rs.rules:
        assert r.rule.source.strip(), r.id
        assert r.rule.cases.fire and r.rule.cases.no_fire, r.id
    # The topics the issue lists each have a rule.
    required = {
        "rext-below-min", "pot-end-below-min", "rext-above-max", "cext-below-linear-range", "cext-above-max",
        "polarised-cext", "supply-outside-recommended", "supply-above-abs-max", "trigger-above-supply",
        "trigger-below-vih", "trigger-edge-input", "retrigger-lost", "retrigger-gained",
        "pulse-outlasts-trigger-skips", "pulse-outlasts-trigger-sticks", "clear-triggers-on-release",
        "pinout-differs", "cmos-unused-inputs", "555-control-pin-bypass", "555-reset-tie-high",
        "bipolar-555-supply-spikes", "cmos-555-weaker-output", "555-formula-above-100khz", "cmos4000-drive-at-5v",
        "power-down-cext-discharge", "class2-ceramic-timing", "hc123-power-up-reset", "non-schmitt-trigger-input",
    }
    assert required <= set(rs.ids())
    assert {"danger", "warning", "note"} <= {r.severity for r in rs.rules}


def test_supply_rules_cover_old_and_new_parts():
    rs = load_rules()
    for rid in ("supply-above-abs-max", "supply-outside-recommended"):
        assert set(rs.get(rid).rule.applies_to.parts) == {"new", "old"}


def test_polarised_capacitor_rule_carries_the_safety_caution():
    msg = load_rules().get("polarised-cext").rule.message
    assert "burst" in msg and "maker's current datasheet" in msg


# --- located errors -------------------------------------------------------------

GOOD = """\
  - id: {id}
    title: a test rule
    severity: note
    condition: {cond}
    message: "at {{part.vcc:V}}"
    fix: do something
    source: common practice
    cases: {{fire: [{{part.vcc: 9.0}}], no_fire: [{{part.vcc: 1.0}}]}}
"""


def write(tmp: Path, name: str, body: str) -> None:
    (tmp / name).write_text(body, encoding="utf-8")


def problems(tmp: Path) -> list[str]:
    return [str(p) for p in load_dirs([tmp]).problems]


def test_good_rule_loads(tmp_path):
    write(tmp_path, "a.yaml", "topic: t\nrules:\n" + GOOD.format(id="ok-rule", cond="part.vcc > 5"))
    rs = load_dirs([tmp_path])
    assert rs.problems == [] and rs.ids() == ["ok-rule"]


@pytest.mark.parametrize(("edit", "expected"), [
    (lambda s: s.replace("severity: note", "severity: fatal"), "rules/a.yaml: rule bad: severity: "),
    (lambda s: s.replace("    source: common practice\n", ""), "rules/a.yaml: rule bad: source: Field required"),
    (lambda s: s + "    colour: red\n", "rules/a.yaml: rule bad: colour: unknown key"),
    (lambda s: s.replace("part.vcc > 5", "part.vccc > 5"), "rules/a.yaml: rule bad: condition: unknown name 'part.vccc'"),
    (lambda s: s.replace("part.vcc > 5", "part.__class__"), "rules/a.yaml: rule bad: condition: name 'part.__class__'"),
    (lambda s: s.replace('"at {part.vcc:V}"', '"at {part.volts:V}"'), "rules/a.yaml: rule bad: message: in '{part.volts:V}': unknown name"),
    (lambda s: s.replace("{part.vcc: 9.0}", "{part.vcx: 9.0}"), "rules/a.yaml: rule bad: cases.fire[0].part.vcx: unknown name"),
    (lambda s: s.replace("{part.vcc: 9.0}", "{part.vcc: 1e-6}"), "rules/a.yaml: rule bad: cases.fire[0].part.vcc: expected a number"),
    (lambda s: s.replace("no_fire: [{part.vcc: 1.0}]", "no_fire: []"), "rules/a.yaml: rule bad: cases.no_fire: "),
    (lambda s: s.replace("id: bad", "id: Bad_Id"), "rules/a.yaml: rule Bad_Id: id: "),
])
def test_malformed_rule_is_located(tmp_path, edit, expected):
    write(tmp_path, "a.yaml", "topic: t\nrules:\n" + edit(GOOD.format(id="bad", cond="part.vcc > 5")))
    found = problems(tmp_path)
    assert any(p.startswith(expected) for p in found), found


def test_file_level_problems_are_located(tmp_path):
    write(tmp_path, "b.yaml", "topic: t\nrules: [\n")
    write(tmp_path, "c.yaml", "rules:\n" + GOOD.format(id="x-rule", cond="part.vcc > 5"))
    found = problems(tmp_path)
    assert any(p.startswith("rules/b.yaml: line ") and "not valid YAML" in p for p in found), found
    assert any(p.startswith("rules/c.yaml: topic: Field required") for p in found), found


def test_duplicate_ids_and_user_override(tmp_path):
    shipped, user = tmp_path / "shipped", tmp_path / "user"
    shipped.mkdir()
    user.mkdir()
    write(shipped, "a.yaml", "topic: t\nrules:\n" + GOOD.format(id="dup", cond="part.vcc > 5") + GOOD.format(id="dup", cond="part.vcc > 6"))
    found = problems(shipped)
    assert any(p.startswith("rules/a.yaml: rule dup: id: rule id also defined in rules/a.yaml") for p in found), found
    write(shipped, "a.yaml", "topic: t\nrules:\n" + GOOD.format(id="dup", cond="part.vcc > 5"))
    write(user, "a.yaml", "topic: t\nrules:\n" + GOOD.format(id="dup", cond="part.vcc > 8"))
    rs = load_dirs([shipped, user])
    assert rs.problems == [] and rs.get("dup").rule.condition == "part.vcc > 8"


def test_require_clean_names_first_problem(tmp_path):
    write(tmp_path, "a.yaml", "topic: t\nrules:\n" + GOOD.format(id="bad", cond="nope > 1"))
    with pytest.raises(DataError, match=r"^rules/a.yaml: rule bad: condition: unknown name 'nope'"):
        require_clean(load_dirs([tmp_path]))


def test_swap_rule_cannot_name_parts(tmp_path):
    body = GOOD.format(id="sw", cond="new.vcc > 5").replace("    severity: note\n", "    severity: note\n    applies_to: {scope: swap, parts: [old]}\n")
    body = body.replace("part.vcc", "new.vcc")
    write(tmp_path, "a.yaml", "topic: t\nrules:\n" + body)
    assert any("rule sw: applies_to.parts" in p for p in problems(tmp_path))


# --- context and evaluation ------------------------------------------------------

def test_context_values_from_family_circuit_and_timing():
    circ = Circuit(part="74HC221", vcc=5.0, r=10e3, c=10e-9, pot=50e3, pot_setting=0.5,
                   trigger=Trigger(period=64e-6, edge="falling", high=5.0))
    ctx = build_context(family(), circ, timing_json(70e-6, divide_by=2, stays_high=False, period=64e-6))
    assert ctx["new.r_total_min"] == 10e3 and ctx["new.r_total_max"] == 60e3 and ctx["new.r_setting"] == 35e3
    assert ctx["new.r_min"] == 1000.0  # applies at VCC >= 3 V
    assert ctx["new.k"] == 0.7 and ctx["new.supply_max"] == 6.0 and ctx["new.abs_max"] == 7.0
    assert ctx["new.vih"] == pytest.approx(3.5)  # 0.7 x VCC
    assert ctx["new.edge_input"] == "nA" and ctx["new.edge_input_pin"] == 1.0
    assert ctx["new.edge_input_enable"] == "nB high, nRD high" and ctx["new.edge_input_schmitt"] is False
    assert ctx["new.width"] == 70e-6 and ctx["new.divide_by"] == 2 and ctx["new.pulse_duty"] == pytest.approx(70 / 64)
    assert ctx["swap"] is False and ctx["old.id"] is None
    # Only plain values: nothing an expression could walk into.
    assert all(v is None or isinstance(v, (bool, int, float, str)) for v in ctx.values())


def test_check_findings_for_a_dangerous_circuit():
    circ = Circuit(part="74HC221", vcc=15.0, r=None, c=10e-9, pot=50e3, trigger=Trigger(high=15.0, edge="falling"))
    found = check_findings(family(), circ, timing_json(100e-6))
    got = ids(found)
    assert {"supply-above-abs-max", "trigger-edge-input", "non-schmitt-trigger-input", "clear-triggers-on-release"} <= got
    assert found[0].severity == "danger"  # most severe first
    assert all(f.part == "74HC221" for f in found)


def test_pot_at_zero_and_level_findings_at_5v():
    circ = Circuit(part="74HC221", vcc=5.0, c=10e-9, pot=50e3, trigger=Trigger(high=15.0))
    got = ids(check_findings(family(), circ, None))
    assert {"pot-end-below-min", "trigger-above-supply", "cmos-unused-inputs"} <= got
    assert "supply-above-abs-max" not in got
    ok = Circuit(part="74HC221", vcc=5.0, r=4.7e3, c=10e-9, pot=50e3, trigger=Trigger(high=5.0))
    assert not ({"pot-end-below-min", "trigger-above-supply", "trigger-below-vih"} & ids(check_findings(family(), ok, None)))


def test_swap_findings_compare_old_and_new():
    old = family(id="74LS123", technology="ls", status="obsolete",
                 behaviour={**HC221["behaviour"], "retrigger": "yes"},
                 interface={"inputs": "ttl"},
                 supply={"recommended": {"min": 4.75, "max": 5.25, "source": "ph"}, "absolute_max": {"value": 7.0, "source": "ph"}})
    circ = Circuit(part="74LS123", vcc=5.0, r=10e3, c=100e-9)
    found = swap_findings(old, circ, timing_json(450e-6), family(), circ, timing_json(700e-6))
    got = ids(found)
    assert {"retrigger-lost", "open-ttl-inputs-become-floating", "ttl-levels-into-cmos-inputs", "timing-not-kept"} <= got
    assert "part-not-active" not in got  # status rules look at the new part only
    assert {f.part for f in found if f.rule == "retrigger-lost"} == {"74HC221"}


def test_old_part_supply_is_checked_in_a_swap():
    old = family(id="CD4538B", technology="cmos-4000",
                 supply={"recommended": {"min": 3.0, "max": 15.0, "source": "ph"}, "absolute_max": {"value": 18.0, "source": "ph"}})
    old_circ = Circuit(part="CD4538B", vcc=20.0, r=10e3, c=10e-9)
    new_circ = Circuit(part="74HC221", vcc=5.0, r=10e3, c=10e-9)
    found = swap_findings(old, old_circ, None, family(), new_circ, None)
    assert [(f.rule, f.part) for f in found if f.rule == "supply-above-abs-max"] == [("supply-above-abs-max", "CD4538B")]


def test_evaluate_without_parts_returns_nothing():
    assert evaluate({}) == []


# --- the command ------------------------------------------------------------------

def test_rules_command_json_contract(capsys):
    import json

    from advisor.cli.main import main

    assert main(["rules", "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert len(data["rules"]) >= 20
    for r in data["rules"]:
        assert {"id", "severity", "title", "source"} <= set(r)
        assert r["severity"] in ("danger", "warning", "note")


def test_rules_command_check_and_broken_folder(tmp_path, capsys):
    from advisor.cli.main import main

    assert main(["rules", "--check"]) == 0
    assert "example cases: ok" in capsys.readouterr().out
    write(tmp_path, "a.yaml", "topic: t\nrules:\n" + GOOD.format(id="bad", cond="part.__class__"))
    assert main(["rules", "--check", "--rules", str(tmp_path)]) == 1
    err = capsys.readouterr().err
    assert "a.yaml: rule bad: condition: name 'part.__class__'" in err
    assert main(["rules", "--rules", str(tmp_path)]) == 1  # listing refuses a broken set, one line
    assert "rule bad: condition" in capsys.readouterr().err
