"""One judgement path: the rules are the only checks; class and rework are read from fired findings.

The four swaps below once contradicted themselves (a class no finding explained, a
caution `show` printed that the swap ignored, a danger followed by "power up", a
mistyped series taken as a verdict). Each now has a test through the command line.
Thresholds are the rules' own (rules/interface.yaml trigger-above-supply: NXP 74HC04
rev 4 limiting values, input clamp current for VI > VCC + 0.5 V).
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from advisor.cli.main import main
from advisor.findings import Finding
from advisor.substitute.classify import CLASS_ORDER, DROP_IN_REASON, classify, open_dangers

ROOT = Path(__file__).resolve().parents[1]


def run(capsys, *argv):
    try:
        code = main(list(argv))
    except SystemExit as exc:  # argparse refuses the arguments (one line, exit 2)
        code = exc.code
    out = capsys.readouterr()
    return code, out.out, out.err


def swap_json(capsys, *argv):
    code, out, err = run(capsys, "swap", *argv, "--json")
    assert code == 0, err
    return json.loads(out)


def reasons_are_findings(j: dict) -> None:
    """Every reason printed for the class is the message of a fired finding that declares that class."""
    if j["class"] == "drop-in":
        assert j["reasons"] == [DROP_IN_REASON]
        assert not [f for f in j["findings"] if f["swap_class"] and f["role"] != "old"]
        return
    deciding = {f["message"] for f in j["findings"] if f["swap_class"] == j["class"] and f["role"] != "old"}
    assert j["reasons"] and set(j["reasons"]) <= deciding
    worst = max((f["swap_class"] for f in j["findings"] if f["swap_class"] and f["role"] != "old"),
                key=CLASS_ORDER.index)
    assert worst == j["class"]


# ------------------------------------------------------------ the four contradictions


def test_trigger_a_little_above_the_supply_is_judged_by_the_rule_alone(capsys):
    # 5.4 V into a 74HC221 at 5 V is inside the VCC + 0.5 V input limit (NXP 74HC04 rev 4):
    # no level finding, so the class cannot be "redesign" for levels.
    j = swap_json(capsys, "74LS221", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "5", "--trigger-high", "5.4")
    assert "trigger-above-supply" not in {f["rule"] for f in j["findings"]}
    reasons_are_findings(j)
    assert j["class"] != "redesign"
    # 5.6 V is beyond it: the rule fires and its message is the reason for the class it declares
    j = swap_json(capsys, "74LS221", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "5", "--trigger-high", "5.6")
    fired = next(f for f in j["findings"] if f["rule"] == "trigger-above-supply")
    assert j["class"] == fired["swap_class"] == "redesign"
    assert fired["message"] in j["reasons"]
    reasons_are_findings(j)


def test_9602_to_4538_is_not_a_drop_in_and_says_why(capsys):
    # catalog/9602.yaml caution, now rules/pinout.yaml timing-pins-differ-9602-4538: the 4538's pins 1
    # and 15 are the capacitor's ground return (onsemi MC74HC4538A rev 8; CD4538B 'C1 (to VSS)').
    j = swap_json(capsys, "9602", "74HC4538", "--r", "10k", "--c", "10n", "--vcc", "5")
    assert j["class"] not in ("drop-in", "drop-in-new-values")
    assert any("timing pins differ" in r for r in j["reasons"])
    reasons_are_findings(j)
    steps = [s["detail"] for s in j["rework"]]
    assert any("pins 1 and 15 to GND" in s for s in steps)


def test_15v_trigger_into_a_5v_part_gets_a_fix_before_power_up(capsys):
    j = swap_json(capsys, "CD4538B", "74HC4538", "--r", "100k", "--c", "10n", "--vcc", "15", "--new-vcc", "5",
                  "--trigger-high", "15")
    dangers = [f for f in j["findings"] if f["severity"] == "danger"]
    assert dangers and j["criteria"]["danger_findings"] == len(dangers)
    actions = [s["action"] for s in j["rework"]]
    assert "protect" in actions and actions[-1] == "check"
    assert actions.index("protect") < actions.index("check")
    protect = j["rework"][actions.index("protect")]["detail"]
    assert "series resistor" in protect and "level shifter" in protect
    reasons_are_findings(j)


#: Valid arguments for each command that takes --series (a new such command must be listed).
SERIES_ARGS = {
    "swap": ("9602", "74HC4538", "--r", "10k", "--c", "10n", "--vcc", "5"),
    "alternates": ("9602", "--r", "10k", "--c", "10n", "--vcc", "5"),
    "design": ("74HC123", "--width", "1ms", "--c", "10n"),
    "bom": (str(ROOT / "tests" / "data" / "fail_on_bom.csv"),),
}


def _commands_with(option: str) -> list[str]:
    from advisor.cli.main import build_parser

    sub = next(a for a in build_parser()._actions if a.__class__.__name__ == "_SubParsersAction")
    return sorted(n for n, p in sub.choices.items() if any(option in a.option_strings for a in p._actions))


@pytest.mark.parametrize("command", _commands_with("--series"))
def test_a_mistyped_series_is_bad_input_on_every_command(capsys, command):
    assert command in SERIES_ARGS, f"give test arguments for {command}"
    code, out, err = run(capsys, command, *SERIES_ARGS[command], "--series", "E25")
    assert code == 2, (out, err)
    assert "E25" in err and err.count("\n") == 1


# ------------------------------------------------------------ --fail-on


FAIL_ON = {
    # 74HC4538 at 15 V: a danger (supply-above-abs-max); 74LS221 → 74HC221 at 5 V: warnings, no danger
    "swap": (("CD4538B", "74HC4538", "--vcc", "15", "--r", "100k", "--c", "100n"),
             ("74LS221", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "5")),
    "check": (("74HC221", "--vcc", "9", "--r", "10k", "--c", "10n"),
              ("74HC221", "--vcc", "5", "--r", "10k", "--c", "10n", "--trigger-edge", "rising")),
    "design": (("74HC123", "--vcc", "9", "--width", "1ms"), ("NE555", "--vcc", "5", "--width", "1ms")),
}


@pytest.mark.parametrize("command", sorted(FAIL_ON))
def test_fail_on_exits_4_only_when_such_a_finding_is_present(capsys, command):
    dangerous, milder = FAIL_ON[command]
    assert run(capsys, command, *dangerous, "--fail-on", "danger")[0] == 4
    assert run(capsys, command, *dangerous)[0] == 0  # without the option the answer is the answer
    j = json.loads(run(capsys, command, *milder, "--json")[1])
    sev = {f["severity"] for f in j["findings"]}
    assert "danger" not in sev
    assert run(capsys, command, *milder, "--fail-on", "danger")[0] == 0
    assert run(capsys, command, *milder, "--fail-on", "warning")[0] == (4 if "warning" in sev else 0)


@pytest.mark.parametrize("command", ["check", "design", "swap", "alternates", "bom", "board"])
def test_fail_on_is_offered_by_every_judging_command(command):
    assert command in _commands_with("--fail-on")


def test_fail_on_bom_and_alternates(capsys):
    bom = str(ROOT / "tests" / "data" / "fail_on_bom.csv")
    assert run(capsys, "bom", bom, "--fail-on", "note")[0] == 2  # only danger|warning are offered
    code_w = run(capsys, "bom", bom, "--fail-on", "warning")[0]
    j = json.loads(run(capsys, "bom", bom, "--json")[1])
    from advisor.cli.options import _severities

    assert code_w == (4 if "warning" in set(_severities(j)) or "danger" in set(_severities(j)) else 0)
    alt = ("alternates", "74LS221", "--r", "10k", "--c", "10n", "--vcc", "5")
    j = json.loads(run(capsys, *alt, "--json")[1])
    worst = set(_severities(j))
    assert run(capsys, *alt, "--fail-on", "danger")[0] == (4 if "danger" in worst else 0)


# ------------------------------------------------------------ a danger no step fixes


def test_a_danger_no_step_fixes_ends_the_plan_without_power_up(capsys):
    # 74HC4538 at 15 V: above its 7 V absolute maximum (NXP 74HC04 rev 4 limiting values, 74HC family)
    j = swap_json(capsys, "CD4538B", "74HC4538", "--vcc", "15", "--r", "100k", "--c", "100n")
    assert j["class"] == "unsuitable"
    last = j["rework"][-1]
    assert last["action"] == "stop" and last["detail"].startswith("Do not power up: ")
    assert not any(s["action"] == "check" for s in j["rework"])
    danger = next(f for f in j["findings"] if f["rule"] == "supply-above-abs-max" and f["role"] == "new")
    assert danger["message"] in last["detail"]


def test_a_kept_variable_resistor_gets_its_setting_step(capsys):
    j = swap_json(capsys, "74LS123", "74HC123", "--r", "10k", "--pot", "20k", "--pot-setting", "0.5", "--c", "100n",
                  "--vcc", "5")
    sets = [s for s in j["rework"] if s["action"] == "set"]
    assert len(sets) == 1
    assert "% of its travel" in sets[0]["detail"] and "travel covers" in sets[0]["detail"]
    assert [s["action"] for s in j["rework"]].index("set") < len(j["rework"]) - 1


# ------------------------------------------------------------ classification and rework units


def _f(rule, severity="warning", swap_class=None, role="new", rework=None, fixes=True):
    return Finding(rule, severity, f"message of {rule}", "fix", "source", part="X", role=role,
                   swap_class=swap_class, rework=rework, rework_action="protect" if rework else None,
                   rework_fixes=fixes if rework else False)


def test_classify_takes_the_worst_declared_class_and_its_messages():
    v = classify([_f("a", swap_class="rewire"), _f("b", swap_class="redesign"), _f("c")])
    assert v.cls == "redesign" and v.reasons == ("message of b",)
    assert v.criteria["fired"] == {"a": "rewire", "b": "redesign"}


def test_classify_ignores_the_removed_parts_own_findings():
    assert classify([_f("a", swap_class="unsuitable", role="old")]).cls == "drop-in"


def test_open_dangers_are_those_no_rework_step_fixes():
    fixed = _f("d1", "danger", rework="fit a resistor", fixes=True)
    stands = _f("d2", "danger", rework="check it", fixes=False)
    bare = _f("d3", "danger")
    assert open_dangers([fixed, stands, bare, _f("w")]) == [stands, bare]
