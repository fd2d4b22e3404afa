"""Timing laws: the RC-threshold law, the 555 forms, and published worked examples.

Each check names its source beside it. Families are tiny inline ones
(tests/support/timing_family.py) whose constants are the published ones quoted.
"""

from __future__ import annotations

import math

import pytest

from advisor.circuit import Circuit, Target
from advisor.timing import analyse, design
from advisor.timing import laws
from support.timing_family import make_family


# ------------------------------------------------------------------ RC-threshold law (textbook)

def test_rc_threshold_half_supply_is_ln2():
    # First-order step response: reaching V/2 from 0 takes ln 2·RC (Horowitz & Hill, AoE §1.4)
    assert laws.rc_threshold_time(10e3, 10e-9, 5.0, 0.0, 2.5) == pytest.approx(math.log(2) * 1e-4, rel=1e-12)


def test_rc_threshold_one_time_constant():
    # Property: after one time constant the node has covered 1 - 1/e of the step
    v = 5.0
    assert laws.rc_threshold_time(1e3, 1e-6, v, 0.0, v * (1 - math.exp(-1))) == pytest.approx(1e-3, rel=1e-12)


def test_rc_threshold_discharging_direction():
    # Property: discharging from 2V/3 toward 0 down to V/3 takes ln 2·RC, like charging
    assert laws.rc_threshold_time(1e3, 1e-6, 0.0, 6.0, 3.0) == pytest.approx(math.log(2) * 1e-3, rel=1e-12)


def test_rc_threshold_unreachable_raises():
    # Property: a threshold beyond the final value is never reached
    with pytest.raises(ValueError):
        laws.rc_threshold_time(1e3, 1e-6, 5.0, 0.0, 6.0)


# ------------------------------------------------------------------ 555 forms

def test_555_mono_exact_vs_published_1_1():
    # TI TLC555-Q1 SLFS078C: t = 1.1·RA·C; exact with thresholds 1/3, 2/3 is ln 3 = 1.0986
    exact = laws.timer555_mono(10e3, 100e-9, 2 / 3)
    assert exact == pytest.approx(math.log(3) * 1e-3, rel=1e-12)
    assert exact == pytest.approx(1.1 * 10e3 * 100e-9, rel=2e-3)


def test_555_astable_exact_vs_published_1_44():
    # Diodes NE555 DS35112 rev 4 / ST NE555 doc 2182 rev 6: tH = 0.693(RA+RB)C, tL = 0.693·RB·C,
    # f = 1.44/((RA + 2RB)·C)
    ra, rb, c = 4.7e3, 10e3, 10e-9
    th, tl = laws.timer555_astable(ra, rb, c, 2 / 3, 1 / 3)
    assert th == pytest.approx(0.693 * (ra + rb) * c, rel=1e-3)
    assert tl == pytest.approx(0.693 * rb * c, rel=1e-3)
    assert 1 / (th + tl) == pytest.approx(1.44 / ((ra + 2 * rb) * c), rel=2e-3)


def test_555_discharge_resistance_adds_to_rb():
    # TI TLC555 SLFS043C: the discharge on-resistance adds to RB (for Rd << RA; the exact form
    # also lifts the discharge floor to VCC·Rd/(RA+Rd), a further ~0.02 % here)
    ra, rb, c, rd = 100e3, 10e3, 1e-9, 10.0
    _, tl = laws.timer555_astable(ra, rb, c, 2 / 3, 1 / 3, rd)
    assert tl == pytest.approx(math.log(2) * (rb + rd) * c, rel=5e-4)


def test_555_control_voltage_moves_both_thresholds():
    # TI NE555 SLFS022: output low when THRES > CONT, high when TRIG < CONT/2. CONT at 2/3 VCC
    # (its open value) must give the ordinary ln 2 timing.
    fam = make_family("timer-555", {"upper_threshold": 2 / 3, "lower_threshold": 1 / 3}, function="timer-555")
    open_ = analyse(fam, Circuit("T", vcc=9, mode="astable", ra=1e3, rb=10e3, c=10e-9))
    forced = analyse(fam, Circuit("T", vcc=9, mode="astable", ra=1e3, rb=10e3, c=10e-9, cont=6.0))
    assert forced.timing["nominal"]["period"] == pytest.approx(open_.timing["nominal"]["period"], rel=1e-12)
    lower = analyse(fam, Circuit("T", vcc=9, mode="astable", ra=1e3, rb=10e3, c=10e-9, cont=4.0))
    # Property: a lower control voltage shortens the high time (smaller swing, lower target)
    assert lower.timing["nominal"]["high"] < open_.timing["nominal"]["high"]
    assert lower.timing["nominal"]["low"] == pytest.approx(math.log(2) * 10e3 * 10e-9, rel=1e-12)


def test_tlc555_formula_frequency_and_range_finding():
    # TI TLC555 SLFS043C: RA = 470 Ω, RB = 200 Ω, C = 200 pF -> the formula gives 8.3 MHz
    # (the part runs at 2.1 MHz typ); the same sheet says the equations hold to about 100 kHz.
    fam = make_family(
        "timer-555", {"upper_threshold": 2 / 3, "lower_threshold": 1 / 3}, function="timer-555",
        timing_extra={"f_max": {"value": 1e5, "source": "test"}},
    )
    res = analyse(fam, Circuit("T", vcc=5, mode="astable", ra=470, rb=200, c=200e-12))
    assert res.timing["nominal"]["frequency"] == pytest.approx(8.3e6, rel=0.01)
    from advisor.checking import check_circuit

    found = check_circuit(fam, Circuit("T", vcc=5, mode="astable", ra=470, rb=200, c=200e-12)).findings
    assert "555-formula-above-100khz" in {f.rule for f in found}


# ------------------------------------------------------------------ one-shot laws

def test_74121_textbook_example_68k_2u2():
    # Floyd, Digital Fundamentals, ch. 7 (74121 related example): REXT = 68 kΩ, CEXT = 2.2 µF
    # gives a pulse of 105 ms with tW = 0.7·REXT·CEXT (Signetics N74121: tW = ln2·R·C ≈ 0.7·R·C)
    fam = make_family("krc", {"k": 0.7}, fid="T121")
    res = analyse(fam, Circuit("T121", vcc=5, r=68e3, c=2.2e-6))
    assert res.timing["nominal"]["width"] == pytest.approx(105e-3, rel=0.005)


def test_74ls122_textbook_design_example():
    # Floyd, Digital Fundamentals, Example 7-12: 74LS122, tW = 0.32·REXT·CEXT·(1 + 0.7/REXT)
    # (ns, kΩ, pF); tW = 1 µs with CEXT = 560 pF needs REXT = 4.88 kΩ; "use a standard value
    # of 4.7 kΩ". In SI: K = 0.32, internal offset 0.7 kΩ.
    fam = make_family("krc", {"k": 0.32, "r_offset": 700.0}, fid="T122")
    res = design(fam, Circuit("T122", vcc=5, c=560e-12, target=Target("width", 1e-6)), series="E12")
    best = res.best
    assert best.values["r"] == 4.7e3
    # the ideal value the textbook solves for: tW at 4.88 kΩ is 1 µs
    assert laws.k_rc(0.32, 4.88e3, 560e-12, 700.0) == pytest.approx(1e-6, rel=1e-3)


def test_4528_law():
    # ON MC14528B / NXP HEF4528B rev 7: t = 0.2·Rx·Cx·ln(VDD - VSS)
    fam = make_family("ln-supply", {"a": 0.2})
    res = analyse(fam, Circuit("T", vcc=10, r=100e3, c=100e-9))
    assert res.timing["nominal"]["width"] == pytest.approx(0.2 * 100e3 * 100e-9 * math.log(10), rel=1e-12)


def test_4047_mono_and_astable():
    # Philips HEF4047B (1995): monostable t = 2.48·Rt·Ct; astable period at Q = 4.40·Rt·Ct, Q square
    fam = make_family("cd4047", {"k_mono": 2.48, "k_astable": 4.40}, function="monostable-astable")
    mono = analyse(fam, Circuit("T", vcc=10, r=100e3, c=1e-9))
    ast = analyse(fam, Circuit("T", vcc=10, mode="astable", r=100e3, c=1e-9))
    assert mono.timing["nominal"]["width"] == pytest.approx(2.48e-4, rel=1e-12)
    assert ast.timing["nominal"]["period"] == pytest.approx(4.40e-4, rel=1e-12)
    assert ast.timing["nominal"]["duty"] == pytest.approx(0.5)
