"""New families from other designs than the 555 class and the counter timers.

Each family's law is checked against a figure of its own sheet, named beside the
assert; the pin set against the sheet's pin function description. Families the open
symbol library (KiCad) does not carry get no pinout comparison there.
"""

from __future__ import annotations

import math

import pytest

from advisor.catalog import load_catalog
from advisor.circuit import Circuit
from advisor.timing import analyse

CAT = load_catalog()


def _band(fid: str, vcc: float, r: float, c: float) -> tuple[float, float, float]:
    fam = CAT.get(fid)
    res = analyse(fam, Circuit(fam.id, vcc=vcc, r=r, c=c, r_tol=0.001, c_tol=0.001))
    return tuple(res.timing[k]["width"] for k in ("nominal", "min", "max"))


# --------------------------------------------------------------------------- LM3905
# Source: National Semiconductor LM122/LM322/LM3905 Precision Timers, February 1995.


def test_lm3905_period_is_one_rc():
    # General description: "an internal 2V divider between the reference and ground sets
    # the timing period to 1 RC": 1 MOhm x 1 uF = 1 s.
    nominal, _, _ = _band("LM3905", vcc=15.0, r=1e6, c=1e-6)
    assert nominal == pytest.approx(1.0, rel=1e-3)


def test_lm3905_band_holds_the_guaranteed_timing_ratio():
    # Electrical characteristics, timing ratio at 25 C, 4.5 V <= V+ <= 40 V: LM3905
    # 0.620 min, 0.644 max. The capacitor charges toward VREF, so T = -RC ln(1 - ratio).
    t_min, t_max = -math.log(1 - 0.620), -math.log(1 - 0.644)  # for RC = 1 s
    _, lo, hi = _band("LM3905", vcc=5.0, r=1e6, c=1e-6)
    assert lo <= t_min * (1 + 1e-6) and hi >= t_max * (1 - 1e-6)
    assert lo >= 0.99 * t_min and hi <= 1.01 * t_max  # 0.1 % parts add little


def test_lm3905_width_does_not_follow_the_supply():
    # Pin function description: timing ends when R/C reaches the 2.0 V tap of the
    # 3.15 V reference, so the period is the same at 5 V and at 40 V.
    assert _band("LM3905", 5.0, 1e5, 1e-5)[0] == pytest.approx(_band("LM3905", 40.0, 1e5, 1e-5)[0], rel=1e-9)


def test_lm3905_pin_functions_are_the_sheets():
    # Pin function description: trigger, R/C, reference, logic, emitter and collector
    # of the floating output transistor, V+ and ground; no boost or VADJ on the LM3905.
    fam = CAT.get("LM3905")
    funcs = sorted(p.function for p in fam.default_package().pins)
    assert funcs == sorted(["TRIG_RISE", "RCEXT", "VREF", "LOGIC", "OUT_E", "OUT_C", "VCC", "GND"])
    assert fam.behaviour.retrigger == "no"  # "immune to any trigger voltage during the timing periods"
    assert fam.timing.width_min.value == pytest.approx(1e-3)  # "limiting minimum timing period to 1 ms"


def test_lm3905_not_in_the_symbol_library():
    """KiCad's symbol library carries no LM3905, so no pinout comparison is possible there."""
    from pathlib import Path

    libs = sorted(Path("/usr/share/kicad/symbols").glob("*.kicad_sym"))
    if not libs:
        pytest.skip("kicad-symbols not installed")
    assert not any('(symbol "LM3905' in p.read_text(errors="replace") for p in libs)
