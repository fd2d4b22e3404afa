"""MIC1555 (Micrel, now Microchip): a 5-pin CMOS 555 with no DISCHARGE, CONTROL or RESET pin.

The numbers in the asserts are the named Micrel sheets' figures (or a law that follows from the
thresholds they publish), not what the loader produced: if one fails, re-read the named page.
"""

from __future__ import annotations

import math

import pytest

from advisor.checking import check_circuit
from advisor.circuit import Circuit
from advisor.partnumber import recognise
from advisor.substitute.swap import swap
from advisor.timing import analyse


def test_supply_thresholds_and_constant(cat):
    fam = cat.get("MIC1555")
    # Micrel MIC1555/1557 (October 1998): operating ratings VS +2.7 V to +18 V; absolute maximum +22 V
    assert (fam.supply.recommended.min, fam.supply.recommended.max) == (2.7, 18.0)
    assert fam.supply.absolute_max.value == 22.0
    # same sheet, functional description: three equal resistors give 2/3 VS and 1/3 VS
    assert [v.value for v in fam.constant("upper_threshold")] == [0.6667]
    assert [v.value for v in fam.constant("lower_threshold")] == [0.3333]
    # Micrel M9999-052610-D (May 2010), Figure 1: tON = 1.1 RT CT
    assert [v.value for v in fam.constant("mono_k")] == [1.1]
    # Micrel Revision 6.0 (March 2014), long time delays: RT above 1 MOhm, CT above 10 uF not recommended
    assert fam.components.r_max[0].value == 1e6 and fam.components.c_max[0].value == pytest.approx(10e-6)


def test_pinout_has_no_discharge_control_or_reset(cat):
    fam = cat.get("MIC1555")
    pkg = fam.packages[0]
    # October 1998 pin description, MIC1555 column: 1 VS, 2 GND, 3 OUT, 4 TRG, 5 THR
    assert pkg.name == "SOT-23-5"
    assert {p.pin: p.function for p in pkg.pins} == {1: "VCC", 2: "GND", 3: "OUT", 4: "TRIG", 5: "THRES"}
    assert fam.behaviour.clear is None


def test_sheet_monostable_row_lies_in_the_band(cat):
    fam = cat.get("MIC1555")
    res = analyse(fam, Circuit("U1", vcc=5.0, r=10e3, c=0.1e-6, r_tol=0.0, c_tol=0.0))
    # 2/3 VS threshold from an empty capacitor: t = ln 3 x R x C = 1.0986 ms at 10 kOhm, 0.1 uF
    assert res.timing["nominal"]["width"] == pytest.approx(math.log(3) * 1e-3, rel=1e-3)
    # electrical characteristics, monostable timing accuracy at RA = 10 kOhm, C = 0.1 uF, VS = 5 V:
    # 858 us min, 1161 us max; with exact R and C the band must hold that row
    assert res.timing["min"]["width"] <= 858e-6 * 1.001
    assert res.timing["max"]["width"] >= 1161e-6 * 0.999


def test_single_resistor_oscillator_is_square(cat):
    fam = cat.get("MIC1555")
    # May 2010 Figure 3: TRG joined to THR, RT fed back from OUT: a 50 % square wave. Between the
    # 1/3 and 2/3 VS thresholds each half period is RT CT ln 2 (RA = 0, RB = RT in the 555 law).
    res = analyse(fam, Circuit("U1", vcc=5.0, mode="astable", ra=0.0, rb=10e3, c=0.1e-6, r_tol=0.0, c_tol=0.0))
    nom = res.timing["nominal"]
    assert nom["high"] == pytest.approx(math.log(2) * 1e-3, rel=1e-3)
    assert nom["low"] == pytest.approx(math.log(2) * 1e-3, rel=1e-3)


def test_rules_that_need_a_reset_or_discharge_pin_stay_quiet(cat):
    fam = cat.get("MIC1555")
    mono = {f.rule for f in check_circuit(fam, Circuit("U1", vcc=15.0, r=470.0, c=0.1e-6)).findings}
    # no RESET pin to tie high, no discharge transistor to overload (October 1998 pin description)
    assert "555-reset-tie-high" not in mono and "555-discharge-current" not in mono
    # the same circuit on an NE555 still gets both (TI SLFS022: RESET to VCC; discharge at 15 mA)
    ne = {f.rule for f in check_circuit(cat.get("NE555"), Circuit("U1", vcc=15.0, r=470.0, c=0.1e-6)).findings}
    assert {"555-reset-tie-high", "555-discharge-current"} <= ne


def test_swap_from_ne555_moves_the_timing_resistor_to_out(cat):
    res = swap(cat, "NE555", "MIC1555", Circuit(part="NE555", vcc=5.0, r=10e3, c=0.1e-6))
    rules = {f.rule for f in res.findings}
    # May 2010 Figure 1: CT is charged through RT from the output; a resistor to VCC never discharges it
    assert "timing-resistor-to-output" in rules
    assert "old-input-without-counterpart" in rules  # the NE555 RESET has nowhere to go
    assert res.cls in ("rewire", "redesign")


def test_part_numbers_read_as_the_family(cat):
    # ordering information: MIC1555BM5 (standard) and MIC1555YM5 (Pb-free), SOT-23-5; -TR reel
    for pn in ("MIC1555YM5-TR", "MIC1555BM5"):
        assert recognise(cat, pn)[0].family == "MIC1555"


def test_design_offers_one_resistor_oscillators(cat):
    from advisor.circuit import Target
    from advisor.timing.design import design

    fam = cat.get("MIC1555")
    res = design(fam, Circuit("U1", vcc=5.0, mode="astable", target=Target("freq", 1e3)))
    assert res.candidates
    for cd in res.candidates:
        # May 2010 Figure 3: one resistor, no RA; each half period RB C ln 2 between 1/3 and 2/3 VS
        assert cd.values["ra"] == 0.0
        assert 1.0 / (2 * math.log(2) * cd.values["rb"] * cd.values["c"]) == pytest.approx(1e3, rel=0.05)


def test_one_resistor_oscillator_rules(cat):
    fam = cat.get("MIC1555")
    two = {f.rule for f in check_circuit(fam, Circuit("U1", vcc=5.0, mode="astable", ra=1e3, rb=10e3, c=0.1e-6)).findings}
    assert "one-resistor-oscillator-ra" in two  # Figure 3: the oscillator has one resistor, no RA
    one = {f.rule for f in check_circuit(fam, Circuit("U1", vcc=5.0, mode="astable", ra=0.0, rb=10e3, c=0.1e-6)).findings}
    assert "one-resistor-oscillator-ra" not in one
    # a swap from an NE555 astable designs the one-resistor network and removes RA
    res = swap(cat, "NE555", "MIC1555", Circuit(part="NE555", vcc=5.0, mode="astable", ra=1e3, rb=10e3, c=0.1e-6))
    assert res.new.values["ra"] == 0.0
    assert any(s.detail.startswith("Remove RA") for s in res.rework)


def test_report_wires_the_resistor_from_out(cat):
    from advisor.report.model import build_network

    # May 2010 Figure 3: the oscillator's one resistor runs from OUT to THR and TRG; no RA, no RESET tie
    net = build_network({"ra": 0.0, "rb": 10e3, "c": 0.1e-6, "vcc": 5.0}, "MIC1555", "astable", cat)
    refs = {i.ref: i.pins for i in net.items}
    assert "RA" not in refs
    assert refs["RB"] == ("pin 3 (OUT)", "pin 5 (THR)", "pin 4 (TRG)")
    assert net.ties == ()
    # Figure 1: the one-shot's resistor from OUT to THR, the capacitor from THR to ground
    mono = build_network({"r": 10e3, "c": 0.1e-6, "vcc": 5.0}, "MIC1555", "mono", cat)
    assert {i.ref: i.pins for i in mono.items}["R"] == ("pin 3 (OUT)", "pin 5 (THR)")
