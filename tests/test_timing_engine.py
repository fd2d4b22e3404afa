"""Timing engine: band, Monte Carlo, adjustment, calibration, trigger analysis, findings, design.

Inline families (tests/support/timing_family.py); the checks are properties that
must hold or values from the named published law.
"""

from __future__ import annotations


import pytest

from advisor.circuit import Circuit, Measurement, Target, Trigger
from advisor.errors import InputError
from advisor.timing import analyse, design, predict_nominal
from advisor.timing.trigger import divide_ratio
from support.timing_family import make_family

# K = 0.7 (ln 2 rounded): the 74121/74HC221 class, Signetics N74121 / Philips 74HC221
K07 = make_family("krc", {"k": 0.7})


def test_band_is_product_of_tolerance_corners():
    # Property: t = K·R·C is monotonic in R and C, so the band is K·R(1±r)·C(1±c)
    res = analyse(K07, Circuit("T", vcc=5, r=10e3, c=10e-9, r_tol=0.01, c_tol=0.05))
    assert res.timing["min"]["width"] == pytest.approx(0.7 * 10e3 * 0.99 * 10e-9 * 0.95, rel=1e-12)
    assert res.timing["max"]["width"] == pytest.approx(0.7 * 10e3 * 1.01 * 10e-9 * 1.05, rel=1e-12)
    assert res.tolerances == {"r_tol": 0.01, "c_tol": 0.05, "defaulted": {"r_tol": False, "c_tol": False}}


def test_default_tolerances_are_reported():
    res = analyse(K07, Circuit("T", vcc=5, r=10e3, c=10e-9))
    assert res.tolerances["defaulted"] == {"r_tol": True, "c_tol": True}
    assert res.to_json()["tolerances"]["r_tol"] == 0.05


def test_constant_spread_widens_band():
    # NXP 74HC123 rev 9 gives K = 0.45 at 5 V, Philips 1998 gives 0.55: the band spans both
    fam = make_family("krc", {"k": [{"value": 0.45}, {"value": 0.55}]})
    res = analyse(fam, Circuit("T", vcc=5, r=10e3, c=100e-9, r_tol=0.0, c_tol=0.0))
    assert res.timing["nominal"]["width"] == pytest.approx(0.45e-3)
    assert res.timing["min"]["width"] == pytest.approx(0.45e-3)
    assert res.timing["max"]["width"] == pytest.approx(0.55e-3)
    assert res.constants["k"].min == 0.45 and res.constants["k"].max == 0.55


def test_constant_interpolated_between_supplies():
    # NXP 74HC123 rev 9: K = 0.55 at 2 V and 0.45 at 5 V; at 3.5 V the engine interpolates
    fam = make_family("krc", {"k": [{"value": 0.55, "vcc_min": 2.0, "vcc_max": 2.0},
                                    {"value": 0.45, "vcc_min": 5.0, "vcc_max": 5.0}]})
    res = analyse(fam, Circuit("T", vcc=3.5, r=10e3, c=100e-9))
    assert res.constants["k"].nominal == pytest.approx(0.50)
    assert res.facts["constants"]["k"]["interpolated"] is True
    # the rule judges the fact (rules/timing-network.yaml constant-interpolated)
    from advisor.checking import check_circuit

    checked = check_circuit(fam, Circuit("T", vcc=3.5, r=10e3, c=100e-9))
    assert "constant-interpolated" in {f.rule for f in checked.findings}


def test_monte_carlo_inside_band_and_window_share():
    res = analyse(K07, Circuit("T", vcc=5, r=10e3, c=10e-9), samples=20_000)
    d = res.distribution
    # Property: every sample lies inside the worst-case band; the median sits near nominal
    assert res.timing["min"]["width"] <= d.p001 and d.p999 <= res.timing["max"]["width"]
    assert d.p50 == pytest.approx(res.timing["nominal"]["width"], rel=0.01)
    lo, hi = res.timing["min"]["width"], res.timing["max"]["width"]
    res2 = analyse(K07, Circuit("T", vcc=5, r=10e3, c=10e-9, target=Target("width", 7e-5, range=(lo, hi))))
    assert res2.distribution.share_in_window == 1.0  # the band contains every sample


def test_pot_range_and_setting():
    # Property: t = K·(R + pot·s)·C, so the setting for a target solves exactly (an ideal
    # trimmer: --pot-end 0; the default end resistance is tested in test_trimmer.py)
    res = analyse(K07, Circuit("T", vcc=5, r=10e3, c=10e-9, pot=10e3, pot_end=0.0, target=Target("width", 105e-6)))
    assert res.adjust["min"]["width"] == pytest.approx(0.7 * 10e3 * 10e-9)
    assert res.adjust["max"]["width"] == pytest.approx(0.7 * 20e3 * 10e-9)
    assert res.target["reachable"] is True
    assert res.target["setting"] == pytest.approx(0.5, abs=1e-9)
    far = analyse(K07, Circuit("T", vcc=5, r=10e3, c=10e-9, pot=10e3, pot_end=0.0, target=Target("width", 1e-3)))
    assert far.target["reachable"] is False and far.target["setting"] is None


def test_worst_case_reach_needs_margin():
    # Target at the very end of the travel: reachable nominally, not on every board
    res = analyse(K07, Circuit("T", vcc=5, r=10e3, c=10e-9, pot=10e3, target=Target("width", 139e-6)))
    assert res.target["reachable"] is True and res.target["reachable_worst_case"] is False


def test_calibration_scales_every_time():
    base = analyse(K07, Circuit("T", vcc=5, r=10e3, c=10e-9, pot=10e3, pot_setting=0.0))
    w = base.timing["nominal"]["width"]
    cal = analyse(K07, Circuit("T", vcc=5, r=10e3, c=10e-9, pot=10e3, pot_setting=0.0,
                                measured=Measurement("width", 1.1 * w), target=Target("width", 1.1 * w)))
    assert cal.calibration.factor == pytest.approx(1.1)
    for key in ("nominal", "min", "max"):
        assert cal.timing[key]["width"] == pytest.approx(1.1 * base.timing[key]["width"])
    assert cal.adjust["max"]["width"] == pytest.approx(1.1 * base.adjust["max"]["width"])
    assert cal.target["setting"] == pytest.approx(0.0, abs=1e-9)  # judged after calibration
    assert predict_nominal(K07, Circuit("T", vcc=5, r=10e3, c=10e-9, measured=Measurement("width", 2 * 70e-6)))["width"] == pytest.approx(140e-6)


def test_calibration_astable_frequency_divided():
    fam = make_family("timer-555", {"upper_threshold": 2 / 3, "lower_threshold": 1 / 3}, function="timer-555")
    c = Circuit("T", vcc=5, mode="astable", ra=1e3, rb=10e3, c=10e-9)
    base = analyse(fam, c)
    cal = analyse(fam, c.with_(measured=Measurement("period", 2 * base.timing["nominal"]["period"])))
    assert cal.timing["nominal"]["frequency"] == pytest.approx(base.timing["nominal"]["frequency"] / 2)
    assert cal.timing["nominal"]["duty"] == pytest.approx(base.timing["nominal"]["duty"])
    with pytest.raises(InputError):
        analyse(fam, c.with_(measured=Measurement("width", 1e-3)))


@pytest.mark.parametrize("w, t, n", [(0.5, 1.0, 1), (1.0, 1.0, 2), (2.5, 1.0, 3), (2.0, 1.0, 3), (0.99, 1.0, 1)])
def test_divide_ratio(w, t, n):
    # Property of a non-retriggerable part: the first trigger after the pulse ends fires
    assert divide_ratio(w, t) == n


def test_trigger_recovery_counts():
    # A trigger during the recovery time is ignored (behaviour.recovery)
    assert divide_ratio(0.9, 1.0, 0.2) == 2


def test_trigger_verdicts():
    mono_nr = make_family("krc", {"k": 0.7}, retrigger="no")
    mono_r = make_family("krc", {"k": 0.7}, retrigger="yes")
    w = 0.7 * 10e3 * 10e-9
    c = Circuit("T", vcc=5, r=10e3, c=10e-9, r_tol=0, c_tol=0)
    ok = analyse(mono_nr, c.with_(trigger=Trigger(period=2 * w))).trigger
    assert ok.divide_by == 1 and ok.stays_high is False and ok.duty == pytest.approx(0.5)
    div = analyse(mono_nr, c.with_(trigger=Trigger(period=w / 2.5))).trigger
    assert div.divide_by == 3 and div.stays_high is False
    high = analyse(mono_r, c.with_(trigger=Trigger(period=w / 2))).trigger
    assert high.stays_high is True and high.divide_by is None
    j = high.to_json()
    assert set(j) >= {"period", "divide_by", "stays_high"}


def test_findings_r_below_min_c_below_linear_r_above_max():
    fam = make_family(
        "krc", {"k": 0.7},
        components={"r_min": [{"value": 2000, "source": "test"}], "r_max": [{"value": 40e3, "source": "test"}]},
        timing_extra={"c_linear_min": {"value": 1e-9, "source": "test"}},
    )
    from advisor.checking import check_circuit

    res = analyse(fam, Circuit("T", vcc=5, r=1e3, c=100e-12, pot=50e3))
    assert res.findings == []  # the engine computes facts; the rules judge them
    f = res.facts
    # R + the trimmer's end resistance at its zero stop (default class: 1 % of 50 kΩ = 500 Ω)
    assert f["r_path_min"] == 1e3 + 500 and f["r_path_max"] == 51e3 and f["pot_in_discharge_path"] is True
    assert f["limits"]["r_min"]["value"] == 2000 and f["limits"]["r_max"]["value"] == 40e3
    rules = {x.rule: x.severity for x in check_circuit(fam, Circuit("T", vcc=5, r=1e3, c=100e-12, pot=50e3)).findings}
    assert rules["pot-end-below-min"] == "danger"
    assert rules["rext-above-max"] == "warning"
    assert rules["cext-below-linear-range"] == "warning"
    clean = check_circuit(fam, Circuit("T", vcc=5, r=10e3, c=10e-9))
    assert not {x.rule for x in clean.findings} & {"rext-below-min", "pot-end-below-min", "rext-above-max",
                                                     "cext-below-linear-range", "cext-below-min", "cext-above-max"}


def test_missing_values_are_input_errors():
    with pytest.raises(InputError):
        analyse(K07, Circuit("T", vcc=5, r=10e3))
    fam = make_family("timer-555", {"upper_threshold": 2 / 3, "lower_threshold": 1 / 3}, function="timer-555")
    with pytest.raises(InputError):
        analyse(fam, Circuit("T", vcc=5, mode="astable", ra=1e3, c=1e-9))
    with pytest.raises(InputError):
        analyse(fam, Circuit("T", vcc=5, mode="astable", ra=1e3, rb=1e3, c=1e-9, cont=6.0))


def test_internal_resistor_used_when_no_r():
    # 74121 class: an on-chip timing resistor (catalog r_internal) when no Rext is fitted
    fam = make_family("krc", {"k": 0.7}, timing_extra={"r_internal": {"value": 2000, "source": "test"}})
    res = analyse(fam, Circuit("T", vcc=5, c=1e-6))
    assert res.values["r_internal"] is True
    assert res.timing["nominal"]["width"] == pytest.approx(0.7 * 2000 * 1e-6)


def test_design_keeps_capacitor_and_uses_standard_values():
    res = design(K07, Circuit("T", vcc=5, c=10e-9, target=Target("width", 70e-6)))
    best = res.best
    assert best.kept_c and best.values["c"] == 10e-9
    assert best.values["r"] == 10e3  # IEC 60063 E24 holds 10 (exact solution)
    assert best.error == pytest.approx(0.0, abs=1e-12)
    j = res.to_json()
    assert j["timing"] == best.to_json()["timing"] and j["candidates"][0]["values"]["r"] == 10e3


def test_design_changes_capacitor_when_r_would_break_limits():
    fam = make_family("krc", {"k": 0.7}, components={"r_min": [{"value": 5e3, "source": "test"}],
                                                     "r_max": [{"value": 1e6, "source": "test"}]})
    res = design(fam, Circuit("T", vcc=5, c=1e-9, target=Target("width", 10e-3)))  # would need 14 MΩ
    assert not res.best.kept_c
    assert 5e3 <= res.best.values["r"] <= 1e6
    assert abs(res.best.error) < 0.05


def test_design_fixed_plus_pot_respects_minimum_and_covers_window():
    fam = make_family("krc", {"k": 0.7}, components={"r_min": [{"value": 2e3, "source": "test"}]})
    window = (50e-6, 70e-6)
    res = design(fam, Circuit("T", vcc=5, c=1e-9, target=Target("width", 60e-6, range=window)))
    for cand in res.candidates:
        assert cand.values["r"] >= 2e3
        assert cand.adjust["min"]["width"] <= window[0] and cand.adjust["max"]["width"] >= window[1]
        assert cand.setting is not None


def test_design_555_astable_frequency_and_duty():
    fam = make_family("timer-555", {"upper_threshold": 2 / 3, "lower_threshold": 1 / 3}, function="timer-555",
                      components={"r_min": [{"value": 1e3, "source": "test"}]})
    res = design(fam, Circuit("T", vcc=5, c=10e-9, target=Target("freq", 1e3, duty=0.6)))
    best = res.best
    assert res.mode == "astable"
    assert abs(best.error) < 0.05 and abs(best.duty_error) < 0.03
    assert best.values["ra"] >= 1e3


def test_design_needs_target():
    with pytest.raises(InputError):
        design(K07, Circuit("T", vcc=5, c=1e-9))
