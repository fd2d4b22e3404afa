"""Swaps on the shipped catalog: kept pulse, class, pin map against the catalog's pinouts.

Independent laws used as oracles (not the engine's numbers):
- CD4538B: t = Rx·Cx (Fairchild CD4538BC DS006000; NXP HEF4538B rev 06).
- 74HC4538: t = 0.7·Rext·Cext (Nexperia 74HC4538 rev 4; TI CD74HC4538).
- 74LS221: t = ln2·Rext·Cext ≈ 0.693·R·C (SN74LS221, ON sheet).
- 74HC221: t = 0.7·Rext·Cext (Philips 74HC/HCT221, 1990).
- 555 astable: f = 1.44/((RA + 2RB)·C) (Diodes NE555 DS35112 rev 4; TI TLC555 SLFS043C).
The circuits themselves (R, C, supplies) are inputs of our choosing.
"""

from __future__ import annotations

import math

import pytest

from advisor import eseries
from advisor.catalog import load_catalog
from advisor.circuit import Circuit, Measurement, Trigger
from advisor.substitute import CLASS_ORDER
from advisor.substitute.pinmap import RELATED, kind_of
from advisor.substitute.swap import swap


@pytest.fixture(scope="module")
def cat():
    return load_catalog()


def mono(vcc, r, c, edge="falling", period=None, **kw):
    return Circuit(part="", vcc=vcc, r=r, c=c, trigger=Trigger(period, edge), **kw)


def width(result) -> float:
    return result.new.timing["nominal"]["width"]


def test_74ls221_to_74hc221_keeps_width_within_5_percent(cat):
    res = swap(cat, "SN74LS221N", "74HC221", mono(5, 10e3, 10e-9), new_vcc=5)
    old_w = math.log(2) * 10e3 * 10e-9  # SN74LS221: tW = ln2·R·C
    assert abs(width(res) / old_w - 1) <= 0.05  # issue 6 done-when
    assert abs(width(res) / (0.7 * res.new.values["r"] * res.new.values["c"]) - 1) < 1e-6  # Philips 74HC221: 0.7·R·C
    assert res.cls in ("drop-in", "drop-in-new-values")  # same DIP-16 pinout (kicad 74LS221 = Philips 74HC221)


def test_cd4538b_15v_to_74hc4538_5v_within_3_percent_with_standard_values(cat):
    # Asked for 3 % (--keep-within 3%): the one-resistor answer (150k, +5 %) is outside it.
    res = swap(cat, "CD4538BE", "74HC4538", mono(15, 100e3, 100e-9, edge="rising"), new_vcc=5, keep_within=0.03)
    old_w = 100e3 * 100e-9  # CD4538BC: PW = R·C
    r, c = res.new.values["r"], res.new.values["c"]
    new_w = 0.7 * r * c  # Nexperia 74HC4538: tW = 0.7·R·C
    assert abs(new_w / old_w - 1) <= 0.03  # issue 6 done-when
    assert abs(width(res) / new_w - 1) < 1e-6
    assert eseries.nearest("E24", r) == pytest.approx(r)  # a standard resistor (IEC 60063 E24)
    assert eseries.nearest("E24", c) == pytest.approx(c)  # and a standard capacitor
    assert res.new.vcc == 5
    assert res.cls == "drop-in-new-values"  # same pinout (onsemi MC74HC4538A = Fairchild CD4538BC), K 1.0 → 0.7
    assert not any(f.severity == "danger" for f in res.findings if f.part == "74HC4538")


def test_cd4538b_to_74hc4538_without_new_vcc_is_unsuitable_with_a_danger(cat):
    res = swap(cat, "CD4538BE", "74HC4538", mono(15, 100e3, 100e-9, edge="rising"), new_vcc=None)
    assert res.cls == "unsuitable"
    # 74HC: 2–6 V recommended, 7 V absolute maximum (Nexperia 74HC4538 rev 4)
    assert any(f.severity == "danger" and f.part == "74HC4538" for f in res.findings)
    assert res.to_json()["class"] == "unsuitable"


def test_74121_to_74hc221_is_a_rewire_with_pin_map_and_rework(cat):
    res = swap(cat, "SN74121N", "74HC221", mono(5, 10e3, 10e-9, period=1e-3, measured=Measurement("width", 72e-6)),
               new_vcc=5)
    assert res.cls == "rewire"
    j = res.to_json()
    assert j["pin_map"]["old_package"] == "DIP-14" and j["pin_map"]["new_package"] == "DIP-16"
    actions = [s["action"] for s in j["rework"]]
    assert actions[0] == "remove" and "adapter" in actions and "jumper" in actions and actions[-1] == "check"
    # the measured pulse is kept (calibration), within the tolerance
    assert j["calibration"]["quantity"] == "width"
    assert abs(j["timing"]["nominal"]["width"] / 72e-6 - 1) <= 0.05
    # falling edge on A1 → the 74HC221's falling-edge input; its B tied high (Philips 74HC221 function table)
    pol = j["pin_map"]["polarity"]
    assert pol["edge"] == "falling" and "1A" in pol["new_input"]
    ties = {t["new_pin"]: t["level"] for t in j["pin_map"]["ties"]}
    assert ties[2] == "VCC"


def test_74121_on_its_internal_resistor_needs_an_external_one(cat):
    res = swap(cat, "74121", "74HC221", mono(5, None, 10e-9), new_vcc=5)
    assert [a.role for a in res.pin_map.additions] == ["Rext"]
    add = next(s for s in res.rework if s.action == "add")
    assert add.new_value == res.new.values["r"]
    assert res.cls == "rewire"


def _check_against_catalog(res, cat):
    """Every link joins the same normalised function, per the catalog's own pinouts."""
    old, new = cat.get(res.old.family), cat.get(res.new.family)
    opkg = next(p for p in old.packages if p.name == res.pin_map.old_package)
    npkg = next(p for p in new.packages if p.name == res.pin_map.new_package)
    ofun = {p.pin: p.function for p in opkg.pins}
    nfun = {p.pin: p.function for p in npkg.pins}
    for lk in res.pin_map.links:
        assert ofun[lk.old_pin] == lk.function
        if kind_of(lk.function) == "trigger" and res.pin_map.polarity.edge:
            assert nfun[lk.new_pin] in ("TRIG_FALL", "TRIG_RISE", "TRIG")
        else:
            assert nfun[lk.new_pin] == lk.function or nfun[lk.new_pin] in RELATED.get(lk.function, ())
    assert len({lk.new_pin for lk in res.pin_map.links}) == len(res.pin_map.links)  # no pin used twice
    linked_or_tied = {lk.new_pin for lk in res.pin_map.links} | {t.new_pin for t in res.pin_map.ties}
    assert len(linked_or_tied) == len(res.pin_map.links) + len(res.pin_map.ties)
    for t in res.pin_map.ties:
        assert nfun[t.new_pin] == t.function


@pytest.mark.parametrize("old, new, circuit, new_vcc", [
    ("74121", "74HC221", mono(5, 10e3, 10e-9), 5),
    ("74121", "74HC221", mono(5, 10e3, 10e-9, edge="rising"), 5),
    ("CD4538B", "74HC4538", mono(15, 100e3, 100e-9, edge="rising"), 5),
    ("CD4538B", "74HC221", mono(15, 100e3, 100e-9, edge="falling"), 5),
    ("74LS123", "74HC221", mono(5, 47e3, 100e-9, edge="rising"), 5),
    ("NE555", "TLC555", Circuit(part="", vcc=15, mode="astable", ra=10e3, rb=68e3, c=10e-9), 5),
    ("NE556", "NE555", Circuit(part="", vcc=12, r=100e3, c=1e-6, trigger=Trigger(None, "falling")), None),
])
def test_pin_maps_follow_the_catalog_pinouts(cat, old, new, circuit, new_vcc):
    res = swap(cat, old, new, circuit, new_vcc=new_vcc)
    _check_against_catalog(res, cat)


def test_falling_edge_reaches_the_falling_input_with_the_other_input_enabling(cat):
    # CD4538B B (falling, A low enables) → 74HC221 A (falling, B HIGH enables): the function tables
    # of Fairchild CD4538BC and Philips 74HC221 disagree on the enabling level, so it must not carry over.
    res = swap(cat, "CD4538B", "74HC221", mono(5, 100e3, 10e-9, edge="falling"), new_vcc=5)
    new = cat.get("74HC221")
    fall = next(t for t in new.behaviour.triggers if t.function == "TRIG_FALL")
    trig_link = next(lk for lk in res.pin_map.links if kind_of(lk.function) == "trigger")
    assert trig_link.function == "TRIG_FALL"
    npins = {p.pin: p for p in new.default_package().pins}
    assert npins[trig_link.new_pin].function == "TRIG_FALL"
    for t in res.pin_map.ties:
        if t.channel == npins[trig_link.new_pin].channel and t.function in fall.enable:
            assert t.level == ("VCC" if fall.enable[t.function] == "high" else "GND")


@pytest.mark.parametrize("new", ["TLC555", "ICM7555", "LMC555"])
def test_bipolar_555_astable_15v_to_cmos_555_5v_is_a_drop_in(cat, new):
    c = Circuit(part="", vcc=15, mode="astable", ra=10e3, rb=68e3, c=10e-9)
    res = swap(cat, "NE555P", new, c, new_vcc=5)
    assert res.cls in ("drop-in", "drop-in-new-values")  # issue 6 done-when
    f_old = 1.44 / ((10e3 + 2 * 68e3) * 10e-9)  # NE555 astable law (Diodes DS35112)
    assert abs(res.new.timing["nominal"]["frequency"] / f_old - 1) <= 0.05
    assert res.pin_map.same_pins  # DIP-8 pin for pin (TI NE555 SLFS022, TI TLC555 SLFS043C)


def test_retriggerable_behaviour_relied_on_means_redesign(cat):
    # 74LS123 is retriggerable, 74HC221 is not (ON SN74LS123; Philips 74HC221): a pulse longer than
    # the trigger period keeps the '123 high but makes the '221 divide.
    res = swap(cat, "74LS123", "74HC221", mono(5, 47e3, 100e-9, edge="rising", period=1e-3), new_vcc=5)
    assert res.cls == "redesign"
    assert any("retrigger" in r for r in res.verdict.reasons)


def test_trigger_above_the_new_supply_needs_level_shifting(cat):
    c = Circuit(part="", vcc=15, r=100e3, c=100e-9, trigger=Trigger(None, "rising", 15.0))
    res = swap(cat, "CD4538B", "74HC4538", c, new_vcc=5)
    # 15 V into a 5 V HC input: clamp current (rules/interface.yaml trigger-above-supply, a danger);
    # a level shifter resolves it, so the swap is a redesign, not unsuitable.
    assert any(f.rule == "trigger-above-supply" and f.severity == "danger" for f in res.findings)
    assert res.cls == "redesign"
    danger = next(f for f in res.findings if f.rule == "trigger-above-supply")
    assert danger.message in res.verdict.reasons  # the reason is the finding's own message
    actions = [s.action for s in res.rework]
    assert "protect" in actions and actions.index("protect") < actions.index("check")


def test_astable_cannot_go_to_a_one_shot(cat):
    from advisor.errors import InputError

    with pytest.raises(InputError, match="one-shot"):
        swap(cat, "NE555", "74HC221", Circuit(part="", vcc=5, mode="astable", ra=1e3, rb=10e3, c=1e-8), new_vcc=5)


def test_json_keys_per_design_guide(cat):
    j = swap(cat, "74121", "74HC221", mono(5, 10e3, 10e-9, period=1e-3), new_vcc=5).to_json()
    for key in ("old", "new", "pin_map", "rework", "class", "findings", "timing", "calibration", "trigger"):
        assert key in j
    for side in ("old", "new"):
        assert {"family", "values", "timing"} <= set(j[side])
        assert {"nominal", "min", "max"} <= set(j[side]["timing"])
    assert j["class"] in CLASS_ORDER
    assert j["trigger"]["period"] == pytest.approx(1e-3)
    for f in j["findings"]:
        assert {"rule", "severity", "message", "fix", "source"} <= set(f)


def test_one_shot_to_a_bare_output_transistor_gets_a_pull_up_on_the_collector(cat):
    # LM3905: one floating output transistor; with LOGIC open or high it is off during the
    # timing period, so its collector with a pull-up is high during the pulse, like Q
    # (National LM122/LM322/LM3905, February 1995, pin function description).
    res = swap(cat, "74LS221", "LM3905", mono(5, 100e3, 10e-6), new_vcc=5)
    new = cat.get("LM3905")
    collector = next(p.pin for p in new.packages[0].pins if p.function == "OUT_C")
    q = next(lk for lk in res.pin_map.links if lk.function == "Q")
    assert q.new_pin == collector and "pull-up" in q.note
    assert "bare-transistor-output-needs-a-resistor" in {f.rule for f in res.findings}
    qn = next(u for u in res.pin_map.unmatched if u.function == "QN" and u.channel == 1)
    assert "inverter" in qn.what and "not both" in qn.what
    assert any(s.action == "add" and "pull-up" in s.detail and "never both" in s.detail for s in res.rework)


def _ties(res) -> dict[int, str]:
    return {t.new_pin: t.level for t in res.pin_map.ties}


def test_4047_control_inputs_are_tied_for_the_use(cat):
    # Philips HEF4047B (January 1995): a HIGH on ASTABLE enables astable operation (or a LOW on
    # ASTABLE-bar); retriggering takes one pulse on RETRIGGER and +TRIGGER. Pins: 4 ASTABLE-bar,
    # 5 ASTABLE, 6 -TRIGGER, 8 +TRIGGER, 9 EXTERNAL RESET, 12 RETRIGGER (catalog/cd4047b.yaml).
    mono_ = swap(cat, "74HC123", "CD4047B", mono(5, 100e3, 10e-9), new_vcc=5)
    assert {4: "VCC", 5: "GND", 8: "VCC", 12: "GND"}.items() <= _ties(mono_).items()
    astable = swap(cat, "NE555", "CD4047B", Circuit(part="", mode="astable", vcc=5, ra=10e3, rb=100e3, c=10e-9), new_vcc=5)
    ties = _ties(astable)
    assert {4: "VCC", 5: "VCC", 6: "VCC", 8: "GND", 12: "GND"}.items() <= ties.items()
    # the 555's TRIG sits on the timing capacitor in the astable (TI SLFS022 figure 12): not carried to -TRIGGER
    assert not any(lk.old_pin == 2 for lk in astable.pin_map.links)
    # every input of the new part is tied or carries a net: a CMOS input never floats
    inputs = {p.pin for p in cat.get("CD4047B").packages[0].pins
              if p.function in ("ASTABLE", "ASTABLE_N", "TRIG_FALL", "TRIG_RISE", "CLEAR", "RETRIGGER")}
    assert inputs <= set(ties) | {lk.new_pin for lk in astable.pin_map.links}


def test_555_reset_onto_an_active_high_clear_is_tied_inactive_and_flagged(cat):
    # NE555 RESET is active low (TI SLFS022); the 4047's EXTERNAL RESET is active high (a HIGH
    # on MR terminates the pulse: Philips HEF4047B, January 1995). Carried straight over, a
    # RESET held high would hold the new part in reset.
    res = swap(cat, "NE555", "CD4047B", Circuit(part="", mode="astable", vcc=5, ra=10e3, rb=100e3, c=10e-9), new_vcc=5)
    assert not any(lk.old_pin == 4 for lk in res.pin_map.links)
    assert _ties(res)[9] == "GND"
    assert "clear-polarity-inverted" in {f.rule for f in res.findings}
    same = swap(cat, "74HC123", "74HC4538", mono(5, 100e3, 10e-9), new_vcc=5)  # both active low
    assert "clear-polarity-inverted" not in {f.rule for f in same.findings}


#: Fairchild CD4541BC DS006001, division ratio table: A B = 0 0 -> 2^13, 0 1 -> 2^10, 1 0 -> 2^8, 1 1 -> 2^16.
_4541_SELECT = {256: ("VCC", "GND"), 1024: ("GND", "VCC"), 8192: ("GND", "GND"), 65536: ("VCC", "VCC")}


@pytest.mark.parametrize("divide", [256, 1024, 8192, 16384])
def test_4541_time_select_follows_the_division_ratio_table(cat, divide):
    # Truth table of the same sheet: pin 10 MODE 1 = recycle, pin 5 AR 1 = auto reset off.
    # Pins 12 (A) and 13 (B) as in catalog/cd4541b.yaml (Philips HEF4541B pinning). A 74HC4060
    # /16384 has no 4541 ratio: the new part's ratio is the design's, and A/B follow it.
    res = swap(cat, "74HC4060", "CD4541B", Circuit(part="", vcc=5, r=100e3, c=10e-9, divide=divide), new_vcc=5)
    new_divide = res.new.values["divide"]
    ties = _ties(res)
    assert (ties[12], ties[13]) == _4541_SELECT[new_divide]
    assert ties[10] == "VCC" and ties[5] == "VCC"
    tap = next(lk for lk in res.pin_map.links if lk.function == "Q_TAP")
    old_tap = next(p for p in cat.get("74HC4060").packages[0].pins if p.pin == tap.old_pin)
    assert (old_tap.note or "").strip() == f"/{divide}"  # the tap the board uses carries over
