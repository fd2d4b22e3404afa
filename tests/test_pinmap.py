"""Pin maps, rework steps and the swap classes on small inline families.

The inline families carry only what the pin map reads. Their pinouts are the
published ones: 74121 and 74LS221 as in the open symbol library (Debian
kicad-symbols, 74xx.kicad_sym: 74LS121, 74LS221), which matches TI SN74121 /
SN74LS221; the 4538 as in kicad-symbols 4xxx.kicad_sym "4538" (Fairchild
CD4538BC DS006000); the 74HC221 as in Philips 74HC/HCT221 (1990); the 555 as in
TI NE555 SLFS022. Trigger enables: 74121 and 74HC221 function tables (A falling
with B high; B rising with A low), 4538 function table (A rising with B high; B
falling with A low). The real catalog's maps are checked in test_swap.py.
"""

from __future__ import annotations

import pytest

from advisor.circuit import Circuit, Trigger
from advisor.parts import Family
from advisor.rules import swap_findings
from advisor.substitute.classify import CLASS_ORDER, classify
from advisor.substitute.pinmap import map_pins
from advisor.substitute.rework import plan_rework
from advisor.substitute.swap import swap_facts

SRC = [{"id": "s", "title": "inline test family", "kind": "datasheet"}]


def fam(id_, function, pins, *, channels=1, triggers=(), clear=None, package="DIP-16", retrigger="no",
        technology="hc", law="krc", r_internal=None) -> Family:
    constants = {"k": [{"value": 0.7, "source": "s"}]} if law == "krc" else {
        "upper_threshold": [{"value": 2 / 3, "source": "s"}], "lower_threshold": [{"value": 1 / 3, "source": "s"}]}
    timing = {"law": law, "constants": constants}
    if r_internal:
        timing["r_internal"] = {"value": r_internal, "source": "s"}
    return Family.model_validate({
        "id": id_, "title": id_, "function": function, "technology": technology, "channels": channels,
        "part_numbers": [id_],
        "supply": {"recommended": {"min": 2, "max": 6, "source": "s"}, "absolute_max": {"value": 7, "source": "s"}},
        "timing": timing, "components": {},
        "behaviour": {"retrigger": retrigger, "retrigger_source": "s", "triggers": list(triggers), "clear": clear},
        "interface": {"inputs": "cmos"},
        "packages": [{"name": package, "source": "s", "pins": [
            {"pin": p, "name": n, "function": f, "channel": c} for p, n, f, c in pins]}],
        "sources": SRC,
    })


CLEAR_LOW = {"name": "CLR", "active": "low", "ends_pulse": True, "triggers_on_release": False, "source": "s"}

T121 = fam("74121", "monostable", [
    (1, "Q̄", "QN", 1), (2, "NC", "NC", None), (3, "A1", "TRIG_FALL", 1), (4, "A2", "TRIG_FALL", 1),
    (5, "B", "TRIG_RISE", 1), (6, "Q", "Q", 1), (7, "GND", "GND", None), (8, "NC", "NC", None),
    (9, "Rint", "RINT", 1), (10, "Cext", "CEXT", 1), (11, "Rext/Cext", "RCEXT", 1), (12, "NC", "NC", None),
    (13, "NC", "NC", None), (14, "VCC", "VCC", None)],
    package="DIP-14", technology="ttl", r_internal=2000, triggers=[
        {"name": "A1", "function": "TRIG_FALL", "edge": "falling", "schmitt": False, "enable": {"TRIG_RISE": "high"}},
        {"name": "B", "function": "TRIG_RISE", "edge": "rising", "schmitt": True, "enable": {"TRIG_FALL": "low"}}])

_221_PINS = [
    (1, "1A", "TRIG_FALL", 1), (2, "1B", "TRIG_RISE", 1), (3, "1RD", "CLEAR", 1), (4, "1Q̄", "QN", 1),
    (5, "2Q", "Q", 2), (6, "2Cext", "CEXT", 2), (7, "2Rext/Cext", "RCEXT", 2), (8, "GND", "GND", None),
    (9, "2A", "TRIG_FALL", 2), (10, "2B", "TRIG_RISE", 2), (11, "2RD", "CLEAR", 2), (12, "2Q̄", "QN", 2),
    (13, "1Q", "Q", 1), (14, "1Cext", "CEXT", 1), (15, "1Rext/Cext", "RCEXT", 1), (16, "VCC", "VCC", None)]
_221_TRIGGERS = [
    {"name": "nA", "function": "TRIG_FALL", "edge": "falling", "schmitt": False,
     "enable": {"TRIG_RISE": "high", "CLEAR": "high"}},
    {"name": "nB", "function": "TRIG_RISE", "edge": "rising", "schmitt": True,
     "enable": {"TRIG_FALL": "low", "CLEAR": "high"}}]
HC221 = fam("74HC221", "monostable", _221_PINS, channels=2, triggers=_221_TRIGGERS, clear=CLEAR_LOW)
LS221 = fam("74LS221", "monostable", _221_PINS, channels=2, triggers=_221_TRIGGERS, clear=CLEAR_LOW,
            technology="ls")

C4538 = fam("CD4538B", "monostable", [
    (1, "1CX", "CEXT", 1), (2, "1RXCX", "RCEXT", 1), (3, "1R", "CLEAR", 1), (4, "1A", "TRIG_RISE", 1),
    (5, "1B", "TRIG_FALL", 1), (6, "1Q", "Q", 1), (7, "1Q̄", "QN", 1), (8, "VSS", "GND", None),
    (9, "2Q̄", "QN", 2), (10, "2Q", "Q", 2), (11, "2B", "TRIG_FALL", 2), (12, "2A", "TRIG_RISE", 2),
    (13, "2R", "CLEAR", 2), (14, "2RXCX", "RCEXT", 2), (15, "2CX", "CEXT", 2), (16, "VDD", "VCC", None)],
    channels=2, retrigger="yes", technology="cmos-4000", clear=CLEAR_LOW, triggers=[
        {"name": "A", "function": "TRIG_RISE", "edge": "rising", "schmitt": True,
         "enable": {"TRIG_FALL": "high", "CLEAR": "high"}},
        {"name": "B", "function": "TRIG_FALL", "edge": "falling", "schmitt": True,
         "enable": {"TRIG_RISE": "low", "CLEAR": "high"}}])

_555_PINS = [(1, "GND", "GND", None), (2, "TRIG", "TRIG", 1), (3, "OUT", "OUT", 1), (4, "RESET", "RESET", 1),
             (5, "CONT", "CONT", 1), (6, "THRES", "THRES", 1), (7, "DISCH", "DIS", 1), (8, "VCC", "VCC", None)]
_555_TRIG = [{"name": "TRIG", "function": "TRIG", "edge": "level-low", "schmitt": False, "enable": {"RESET": "high"}}]
NE555 = fam("NE555", "timer-555", _555_PINS, package="DIP-8", technology="bipolar", law="timer-555",
            triggers=_555_TRIG, clear={**CLEAR_LOW, "name": "RESET"})
TLC555 = fam("TLC555", "timer-555", _555_PINS, package="DIP-8", technology="cmos-555", law="timer-555",
             triggers=_555_TRIG, clear={**CLEAR_LOW, "name": "RESET"})


def _links(pm):
    return {(lk.old_pin, lk.new_pin) for lk in pm.links}


def _ties(pm):
    return {t.new_pin: t.level for t in pm.ties}


def test_74121_to_74hc221_falling_edge_on_a1():
    pm = map_pins(T121, HC221, edge="falling", uses_internal_r=True)
    # Net by net, 74121 (kicad 74LS121) → 74HC221 section 1 (Philips 1990 pinout)
    assert _links(pm) == {(3, 1), (1, 4), (6, 13), (10, 14), (11, 15), (7, 8), (14, 16)}
    ties = _ties(pm)
    assert ties[2] == "VCC"  # 1B high enables 1A (74HC221 function table)
    assert ties[3] == "VCC"  # 1RD inactive (active low)
    # unused section 2: triggers idle, clear held active (common practice: no open CMOS inputs)
    assert ties[9] == "VCC" and ties[10] == "GND" and ties[11] == "GND"
    assert {u.old_pin for u in pm.unmatched} == {4, 5, 9}  # A2, B (enable tie), Rint
    assert not pm.blocking
    assert [a.role for a in pm.additions] == ["Rext"] and "15" in pm.additions[0].between[0]
    assert not pm.same_footprint and not pm.same_pins
    assert pm.polarity.edge == "falling" and pm.polarity.new_input == "1A (pin 1)"


def test_74121_rising_edge_reaches_rising_input_with_falling_input_low():
    pm = map_pins(T121, HC221, edge="rising")
    assert (5, 2) in _links(pm)  # B → 1B
    assert _ties(pm)[1] == "GND"  # 1A low enables 1B (74HC221 function table)
    assert {u.old_pin for u in pm.unmatched} >= {3, 4}  # A1, A2 were enable ties on the old board
    assert not pm.additions  # the board has its own Rext


def test_polarity_follows_the_edge_not_the_old_enable_level():
    # 4538: B falls with A low. 74HC221: A falls with B HIGH. The old low on A must not carry over.
    pm = map_pins(C4538, HC221, edge="falling")
    assert (5, 1) in _links(pm)  # 4538 1B → 74HC221 1A
    assert _ties(pm)[2] == "VCC"  # 1B high, not the 4538's A-low
    assert (3, 3) in _links(pm)  # clear to clear (both active low)
    assert pm.polarity.new_enable == {"TRIG_RISE": "high", "CLEAR": "high"}


def test_same_pinout_same_pins():
    pm = map_pins(LS221, HC221, edge="falling")
    assert all(not lk.moved for lk in pm.links)
    assert pm.same_footprint and pm.same_pins
    assert not pm.changed_ties  # B held high on both boards: no change at the pad
    steps = plan_rework(pm, {"r": 10e3, "c": 10e-9}, {"r": 10e3, "c": 10e-9}, expected={"width": 70e-6})
    assert [s.action for s in steps] == ["remove", "fit-part", "check"]


def test_555_to_cmos_555_is_pin_for_pin():
    pm = map_pins(NE555, TLC555)
    assert _links(pm) == {(i, i) for i in range(1, 9)}
    assert pm.same_pins and not pm.ties


def test_555_to_one_shot_blocks_on_the_timing_network():
    pm = map_pins(NE555, HC221, edge="falling")
    blocking = {u.function for u in pm.blocking}
    assert {"THRES", "DIS", "CONT"} <= blocking
    assert (2, 1) in _links(pm)  # TRIG → 1A: both answer a falling input
    assert (3, 13) in _links(pm)  # OUT → 1Q
    v = _judge(pm, NE555, HC221)
    assert v.cls == "redesign"


def test_dual_to_single_section():
    pm = map_pins(HC221, T121, edge="falling")
    ch2 = [u for u in pm.unmatched if u.channel == 2]
    assert ch2 and not any(u.blocking for u in ch2)
    assert any(u.function == "CLEAR" and u.blocking for u in pm.unmatched)  # the 74121 has no clear


def test_edge_assumed_when_not_given():
    pm = map_pins(T121, HC221)
    assert pm.polarity.assumed and pm.polarity.edge == "falling"
    assert "--trigger-edge" in pm.polarity.note


def test_schmitt_loss_is_noted():
    pm = map_pins(C4538, HC221, edge="falling")  # 4538 B is Schmitt, 74HC221 A is not (Philips 1990)
    assert "Schmitt" in pm.polarity.note


def test_rework_for_74121_to_74hc221_is_ordered():
    pm = map_pins(T121, HC221, edge="falling", uses_internal_r=True)
    steps = plan_rework(pm, {"r": None, "c": 10e-9}, {"r": 20e3, "c": 10e-9}, expected={"width": 140e-6})
    actions = [s.action for s in steps]
    assert actions[0] == "remove" and actions[1] == "adapter" and actions[-1] == "check"
    assert actions.index("jumper") < actions.index("tie") < actions.index("add")
    jumpers = {s.pins[0] for s in steps if s.action == "jumper"}
    assert jumpers == {lk.new_pin for lk in pm.links}
    add = next(s for s in steps if s.action == "add")
    assert add.new_value == 20e3
    assert [s.n for s in steps] == list(range(1, len(steps) + 1))


def test_rework_lifts_pins_on_a_moved_net_in_the_same_footprint():
    # 74HC221 → a made-up part with the same DIP-16 but 1Q and 1Q̄ swapped places
    swapped = [(13 if p == 4 else 4 if p == 13 else p, n, f, c) for p, n, f, c in _221_PINS]
    other = fam("X221", "monostable", swapped, channels=2, triggers=_221_TRIGGERS, clear=CLEAR_LOW)
    pm = map_pins(HC221, other, edge="falling")
    assert pm.same_footprint and not pm.same_pins
    steps = plan_rework(pm, {"r": 1e4, "c": 1e-8}, {"r": 1e4, "c": 1e-8})
    lift = next(s for s in steps if s.action == "lift")
    assert set(lift.pins) == {4, 13}
    assert {s.pins[0] for s in steps if s.action == "jumper"} == {4, 13}
    assert _judge(pm, HC221, other).cls == "rewire"


def _judge(pm, old, new, *, vcc=5.0, trigger_high=None, **kw):
    """The class through the one judgement path: swap facts -> rules context -> findings -> classify."""
    facts = dict(kept={"quantity": "width"}, timing_solved=True, timing_problem=None, error=0.0, duty_error=0.0,
                 tolerance=0.05, how="kept", values_changed=False)
    facts.update(kw)
    circ = Circuit(new.id, vcc=vcc, r=10e3, c=10e-9, trigger=Trigger(high=trigger_high))
    found = swap_findings(old, circ.with_(part=old.id), None, new, circ, None, swap_facts=swap_facts(pm, old, new, **facts))
    return classify(found)


@pytest.mark.parametrize("kw, expected", [
    ({}, "drop-in"),
    ({"values_changed": True}, "drop-in-new-values"),
    ({"error": 0.08}, "redesign"),  # outside the 5 % tolerance: rules/pinout.yaml timing-outside-tolerance
    ({"timing_solved": False, "timing_problem": "no network"}, "unsuitable"),
    ({"vcc": 6.5}, "unsuitable"),  # outside the inline family's 2–6 V recommended range
    ({"vcc": 9.0}, "unsuitable"),  # above its 7 V absolute maximum (a danger no step fixes)
    ({"trigger_high": 15.0}, "redesign"),  # 15 V into a 5 V CMOS input: a protection step, then redesign
])
def test_class_from_fired_findings(kw, expected):
    pm = map_pins(LS221, HC221, edge="falling")
    v = _judge(pm, LS221, HC221, **kw)
    assert v.cls == expected
    if expected != "drop-in":
        assert v.reasons and all(r and not r.startswith("danger:") for r in v.reasons)


def test_rewire_when_package_changes():
    pm = map_pins(T121, HC221, edge="falling")
    v = _judge(pm, T121, HC221, values_changed=True)
    assert v.cls == "rewire" and any("DIP-14" in r for r in v.reasons)
    assert CLASS_ORDER.index(v.cls) == 2
