"""Published values in the shipped catalog, checked against the documents they come from.

Each assert names its source beside it. These are facts of the world, not what the loader
produced: if a test fails, re-read the named datasheet before touching the number.
"""

from __future__ import annotations

import pytest


def values(fam, name, vcc=None, c=None):
    return sorted({round(v.value, 4) for v in fam.constant(name, vcc, c)})


def test_4538_constant_differs_between_4000_and_hc(cat):
    assert values(cat.get("CD4538B"), "k") == [1.0]  # Fairchild CD4538BC DS006000: PW = R x C; NXP HEF4538B rev 06: tW = REXT x CEXT
    assert values(cat.get("74HC4538"), "k") == [0.7]  # Nexperia 74HC4538 rev 4: T = 0.7 REXT CEXT; TI SCHS123E: 0.7 RX CX
    assert values(cat.get("74HCT4538"), "k") == [0.7]  # same Nexperia and TI sheets cover the HCT part


def test_4098_half_rc_above_10nf(cat):
    fam = cat.get("CD4098B")
    assert values(fam, "k", c=1e-7) == [0.5]  # Renesas CD4098BMS FN3332: T = 1/2 RX CX for CX >= 0.01 uF
    assert values(fam, "k", c=1e-9) == []  # FN3332: below 0.01 uF the formula is not given
    assert fam.components.r_min[0].value == 5000  # FN3332: minimum RX 5 kOhm
    assert fam.components.c_max[0].value == pytest.approx(100e-6)  # FN3332: maximum CX 100 uF


def test_4528_supply_law_and_makers_disagree(cat):
    fam = cat.get("CD4528B")
    assert fam.timing.law == "ln-supply"
    onsemi = [v for v in fam.constant("a", 12.0, 1e-7)]
    assert [v.value for v in onsemi] == [0.2]  # onsemi MC14528B: tW = 0.2 RX CX ln(VDD - VSS), CX > 0.01 uF
    assert values(fam, "k", 5.0, 1e-7) == [0.42]  # Nexperia HEF4528B rev 10: K = 0.42 at 5 V
    assert values(fam, "k", 15.0, 1e-7) == [0.3]  # Nexperia HEF4528B rev 10: K = 0.30 at 15 V
    assert fam.components.r_max[0].value == 1e6  # onsemi MC14528B: RX 5 k to 1000 kOhm


def test_4047_constants(cat):
    fam = cat.get("CD4047B")
    assert 2.48 in values(fam, "k_mono", 10.0)  # Philips HEF4047B (1995): tM = 2.48 Rt Ct typ
    assert max(values(fam, "k_mono", 15.0)) == 2.88  # Philips HEF4047B: worst case 2.88 Rt Ct at 15 V
    assert 4.4 in values(fam, "k_astable", 10.0)  # Philips HEF4047B: tA = 4.40 Rt Ct typ
    assert fam.components.r_min[0].value == 10e3  # Philips HEF4047B: 10 kOhm <= Rt <= 1 MOhm
    assert fam.components.c_min[0].value == pytest.approx(100e-12)  # Philips HEF4047B: Ct >= 100 pF
    assert fam.behaviour.clear.active == "high"  # Fairchild DS005969: a high level on Reset resets Q low


def test_4541_oscillator(cat):
    fam = cat.get("CD4541B")
    assert values(fam, "k_osc") == [2.3]  # onsemi MC14541B and Philips HEF4541B: f = 1/(2.3 Rt Ct)
    assert fam.timing.f_max.value == 100e3  # onsemi MC14541B: formula for 1 kHz <= f <= 100 kHz


def test_555_class_supplies(cat):
    ne = cat.get("NE555").supply
    assert (ne.recommended.min, ne.recommended.max, ne.absolute_max.value) == (4.5, 16.0, 18.0)  # TI SLFS022
    tlc = cat.get("TLC555").supply
    assert (tlc.recommended.min, tlc.recommended.max, tlc.absolute_max.value) == (2.0, 15.0, 18.0)  # TI SLFS043C
    lmc = cat.get("LMC555").supply
    assert (lmc.recommended.min, lmc.absolute_max.value) == (1.5, 15.0)  # TI SNAS558J
    icm = cat.get("ICM7555").supply
    assert (icm.recommended.min, icm.recommended.max, icm.absolute_max.value) == (2.0, 18.0, 18.0)  # Intersil FN2867


def test_555_constants(cat):
    for fid in ("NE555", "NE556", "TLC555", "TLC556", "LMC555", "ICM7555", "ICM7556"):
        fam = cat.get(fid)
        assert 1.1 in values(fam, "mono_k")  # TI SLFS022 / SLFS078C / SNAS558J, Intersil FN2867: t = 1.1 RA C
        assert values(fam, "upper_threshold")[0] == pytest.approx(2 / 3, abs=0.005)  # makers' sheets: 2/3 of VCC
        assert values(fam, "lower_threshold")[0] == pytest.approx(1 / 3, abs=0.01)  # makers' sheets: 1/3 of VCC
    icm = cat.get("ICM7555")
    assert 1.38 in values(icm, "astable_k")  # Philips ICM7555 product specification 1994-08-31, note 2
    assert 1.44 in values(cat.get("NE555"), "astable_k")  # Diodes NE555 DS35112 rev 4: f = 1.44/((RA+2RB)C)
    r_max = {v.value for v in cat.get("NE555").components.r_max if v.applies(vcc=5.0) and v.maker is None}
    assert r_max == {3.4e6}  # TI SLFS022 note: RA + RB max ~3.4 MOhm at 5 V


def test_555_drive(cat):
    assert cat.get("NE555").interface.output_source_ma.value == 200  # TI SLFS022: sinks or sources up to 200 mA
    assert cat.get("TLC555").interface.output_source_ma.value == 10  # TI SLFS043C: source 10 mA typ
    assert cat.get("TLC555").interface.output_sink_ma.value == 100  # TI SLFS043C: sink 100 mA typ


@pytest.mark.parametrize(
    "fid,pin,function",
    [
        ("NE555", 7, "DIS"),  # TI SLFS022 pinout: 7 DISCH
        ("NE555", 5, "CONT"),  # TI SLFS022 pinout: 5 CONT
        ("NE556", 1, "DIS"),  # TI SLFS023 pinout: 1 1DISCH
        ("NE556", 8, "TRIG"),  # TI SLFS023 pinout: 8 2TRIG
        ("CD4538B", 4, "TRIG_RISE"),  # onsemi MC74HC4538A / Fairchild: pin 4 = A1, rising-edge trigger
        ("74HC4538", 15, "CEXT"),  # onsemi MC74HC4538A: pins 1 and 15 hard-wired to GND
        ("CD4528B", 5, "TRIG_FALL"),  # NXP HEF4528B functional diagram: pin 5 = 1A (HIGH-to-LOW)
        ("CD4047B", 13, "OSC_OUT"),  # Fairchild DS005969 / Philips HEF4047B pinning
        ("CD4541B", 6, "MASTER_RESET"),  # Philips HEF4541B pinning: 6 MR
    ],
)
def test_pins(cat, fid, pin, function):
    by_pin = {p.pin: p.function for p in cat.get(fid).packages[0].pins}
    assert by_pin[pin] == function


def test_every_family_file_here_has_sources(cat):
    # property: every non-reserved source id a value uses is listed in the family's sources
    for fid in ("NE555", "NE556", "TLC555", "TLC556", "LMC555", "ICM7555", "ICM7556", "CD4538B",
                "74HC4538", "74HCT4538", "CD4528B", "CD4098B", "CD4047B", "CD4541B"):
        fam = cat.get(fid)
        assert fam.sources, fid
        assert all(s.kind for s in fam.sources)


def test_st_cmos_timers(cat):
    ts = cat.get("TS555")
    assert (ts.supply.recommended.min, ts.supply.recommended.max) == (2.0, 16.0)  # ST DocID4077 rev 4: +2 V to +16 V
    assert ts.supply.absolute_max.value == 18.0  # ST TS555 January 1999: supply voltage +18 V absolute maximum
    assert 1.1 in values(ts, "mono_k")  # ST TS555 (12-page sheet) monostable operation: t = 1.1 R x C
    assert 1.44 in values(ts, "astable_k")  # ST DocID4077 rev 4 section 4.2: f = 1.44/((RA + 2RB) C)
    assert (ts.interface.vil.value, ts.interface.vih.value) == (1.36, 1.96)  # ST TS555 at VCC = 5 V: trigger voltage 1.36-1.96 V
    assert ts.behaviour.retrigger == "no"  # ST TS555: stays in its state until the set time has elapsed, even if triggered again
    dual = cat.get("TS556")
    assert (dual.supply.recommended.min, dual.supply.recommended.max, dual.supply.absolute_max.value) == (2.0, 16.0, 18.0)  # ST TS556 rev 2 (2008): 2-16 V, +18 V abs max
    assert 1.1 in values(dual, "mono_k")  # ST TS556 October 1997: t = 1.1 R x C
    by_pin = {p.pin: (p.function, p.channel) for p in dual.packages[0].pins}
    assert by_pin[1] == ("DIS", 1) and by_pin[13] == ("DIS", 2)  # ST TS556 block diagram: discharge 1/13
    assert by_pin[6] == ("TRIG", 1) and by_pin[8] == ("TRIG", 2)  # ST TS556 block diagram: trigger 6/8
    assert by_pin[14] == ("VCC", None) and by_pin[7] == ("GND", None)  # ST TS556 pin connections: 14 +VS, 7 GND
