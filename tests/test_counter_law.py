"""The counter law (catalog ``law: counter``): an RC oscillator T = k·Rt·Ct divided by a ratio N
the family publishes, ``--divide N`` on the command line, the grammar's refusals and design's
choice of N. Worked examples are the makers' own; each assert names its sheet."""

from __future__ import annotations

import json

import pytest

from advisor.catalog import family_problems, load_catalog, parse_family
from advisor.circuit import Circuit
from advisor.errors import InputError
from advisor.timing import laws
from advisor.timing.analyse import analyse
from advisor.timing.design import design
from support.inprocess import retime


@pytest.fixture(scope="module")
def cat():
    return load_catalog()


def _counter(cat, family_id):
    fam = cat.get(family_id)
    assert fam.timing.law == "counter", family_id
    return fam


# --- the law against the sheets' worked examples ---------------------------------------

def test_4541_oscillator_against_the_philips_example(cat):
    fam = _counter(cat, "CD4541B")
    res = analyse(fam, Circuit("CD4541B", vcc=10.0, r=56e3, c=1e-9, divide=256))
    f_osc = res.facts["counter"]["oscillator"]["frequency"]
    # Philips HEF4541B (January 1995), "typical formula for oscillator frequency": f = 1/(2.3·Rt·Ct)
    assert f_osc == pytest.approx(1 / (2.3 * 56e3 * 1e-9), rel=1e-9)
    # Philips HEF4541B (January 1995), AC characteristics: Rt = 56 kOhm, Ct = 1 nF, RS = 120 kOhm
    # gives fosc = 8 kHz typ at 5, 10 and 15 V; the formula lands within 5 % of it
    assert f_osc == pytest.approx(8e3, rel=0.05)
    # ... and Rt = 5 kOhm, Ct = 1 nF, RS = 10 kOhm gives 90 kHz typ
    fast = analyse(fam, Circuit("CD4541B", vcc=10.0, r=5e3, c=1e-9, divide=256)).facts["counter"]
    assert fast["oscillator"]["frequency"] == pytest.approx(90e3, rel=0.05)


def test_output_period_is_n_oscillator_periods_and_square(cat):
    fam = _counter(cat, "CD4541B")
    res = analyse(fam, Circuit("CD4541B", vcc=10.0, r=56e3, c=1e-9, divide=1024))
    nominal = res.timing["nominal"]
    # Philips HEF4541B (January 1995), frequency selection table: fosc / fout = 2^n (A0 = L, A1 = H: n = 10)
    assert nominal["period"] == pytest.approx(1024 * 2.3 * 56e3 * 1e-9, rel=1e-9)
    assert nominal["duty"] == pytest.approx(0.5)  # a binary stage's output is square (property)
    assert res.values["divide"] == 1024


def test_single_interval_is_half_the_count(cat):
    fam = _counter(cat, "CD4541B")
    res = analyse(fam, Circuit("CD4541B", vcc=10.0, mode="mono", r=56e3, c=1e-9, divide=8192))
    # Philips HEF4541B (January 1995), function table note 2: in single-cycle mode "the output
    # changes state after 2^(n-1) counts" (n = 13 here)
    assert res.timing["nominal"]["width"] == pytest.approx(2 ** 12 * 2.3 * 56e3 * 1e-9, rel=1e-9)


def test_4060_oscillator_formula_and_taps(cat):
    fam = _counter(cat, "74HC4060")
    # Philips 74HC/HCT4060 (December 1990) Fig.10: "typical formula for oscillator frequency"
    # fosc = 1/(2.5·Rt·Ct); its outputs Q3..Q9 and Q11..Q13 divide by 2^4..2^10 and 2^12..2^14
    assert fam.timing.counter.divide_by == [16, 32, 64, 128, 256, 512, 1024, 4096, 8192, 16384]
    res = analyse(fam, Circuit("74HC4060", vcc=5.0, r=100e3, c=1e-9, divide=16384))
    assert res.facts["counter"]["oscillator"]["frequency"] == pytest.approx(1 / (2.5 * 100e3 * 1e-9), rel=1e-9)
    assert res.timing["nominal"]["period"] == pytest.approx(16384 * 2.5 * 100e3 * 1e-9, rel=1e-9)


def test_law_functions_are_the_product_of_count_and_oscillator():
    # property: the counter multiplies the oscillator period; nothing else enters
    assert laws.counter_period(2.3, 10e3, 1e-9, 256) == pytest.approx(256 * 2.3e-5)
    assert laws.counter_delay(2.3, 10e3, 1e-9, 256, 0.5) == pytest.approx(128 * 2.3e-5)


# --- grammar refusals -------------------------------------------------------------------

def _family_data(cat, family_id):
    return cat.get(family_id).model_dump(mode="json", exclude_none=True, exclude={"status"})


def test_a_divide_list_out_of_order_is_refused(cat):
    data = _family_data(cat, "CD4541B")
    data["timing"]["counter"]["divide_by"] = [1024, 256]
    fam, problems = parse_family(data, "x.yaml")
    assert fam is None and any("ascending" in str(p) for p in problems)


def test_a_zero_count_is_refused(cat):
    data = _family_data(cat, "CD4541B")
    data["timing"]["counter"]["divide_by"] = [0, 256]
    fam, problems = parse_family(data, "x.yaml")
    assert fam is None and any("whole counts of 1 or more" in str(p) for p in problems)


def test_law_counter_needs_its_counter_block(cat):
    data = _family_data(cat, "CD4541B")
    del data["timing"]["counter"]
    fam, problems = parse_family(data, "x.yaml")
    assert fam is not None
    assert any("needs a counter block" in str(p) for p in family_problems(fam, "x.yaml"))


def test_a_counter_block_on_another_law_is_refused(cat):
    data = _family_data(cat, "CD4541B")
    data["timing"]["law"] = "cd4541"
    fam, _ = parse_family(data, "x.yaml")
    assert any("belongs to law 'counter'" in str(p) for p in family_problems(fam, "x.yaml"))


def test_engine_refuses_a_ratio_outside_the_set(cat):
    with pytest.raises(InputError, match=r"nearest: 1024"):
        analyse(cat.get("CD4541B"), Circuit("CD4541B", r=56e3, c=1e-9, divide=1000))


# --- the command-line option -------------------------------------------------------------

def _error(*argv: str) -> str:
    run = retime(*argv)
    assert run.code == 2, (run.code, run.err, run.out[:300])
    assert "Traceback" not in run.err and run.err.count("\n") == 1
    return run.err


def test_cli_divide_not_in_the_family_set():
    err = _error("check", "CD4541B", "--r", "56k", "--c", "1n", "--divide", "1000")
    assert "--divide 1000 is not a divide ratio the CD4541B can select (nearest: 1024)" in err
    assert "256, 1024, 8192, 65536" in err


def test_cli_divide_unreadable():
    assert "--divide: cannot read 'ten' as a divide ratio" in _error(
        "check", "CD4541B", "--r", "56k", "--c", "1n", "--divide", "ten")


def test_cli_divide_on_a_part_without_counter():
    assert "the NE555 has no counter" in _error("check", "NE555", "--r", "10k", "--c", "10n", "--divide", "256")


def test_cli_single_interval_needs_a_ratio():
    assert "give the divide ratio (--divide N)" in _error("check", "CD4541B", "--mode", "mono", "--r", "56k",
                                                          "--c", "1n")


def test_cli_divide_as_a_power_of_two():
    run = retime("check", "74HC4060", "--r", "100k", "--c", "1n", "--divide", "2^14", "--json")
    assert run.code == 0, run.err
    assert json.loads(run.out)["values"]["divide"] == 16384


# --- design: R for a time at a given N, or which N ------------------------------------------

def test_design_at_a_given_ratio(cat):
    res = design(cat.get("CD4541B"), Circuit("CD4541B", vcc=10.0, divide=1024,
                                             target=_target("width", 10.0)))
    best = res.best
    assert best.values["divide"] == 1024 and res.mode == "mono"
    assert abs(best.error) <= 0.05  # E24 resistors: within the series' step (property)


def test_design_says_which_ratio(cat):
    res = design(cat.get("74HC4060"), Circuit("74HC4060", vcc=5.0, target=_target("period", 60.0)))
    assert res.best.values["divide"] in cat.get("74HC4060").timing.counter.divide_by
    assert any("divide ratio" in a and "chosen" in a for a in res.assumptions)
    assert abs(res.best.error) <= 0.05


def _target(kind, value):
    from advisor.circuit import Target

    return Target(kind, value)


# --- swap between counter timers ----------------------------------------------------------

def _swap_json(*argv):
    run = retime("swap", *argv, "--json")
    assert run.code == 0, run.err
    return json.loads(run.out)


def test_swap_takes_the_output_to_the_tap_of_the_ratio():
    d = _swap_json("CD4541B", "74HC4060", "--r", "56k", "--c", "1n", "--divide", "1024")
    assert d["new"]["values"]["divide"] == 1024
    out = [lk for lk in d["pin_map"]["links"] if lk["old_pin"] == 8]  # CD4541B output O (Philips HEF4541B pinning)
    # Motorola MC74HC4060 REV 6 logic diagram: Q10 (/1024) is pin 15
    assert [lk["new_pin"] for lk in out] == [15]


def test_swap_with_a_ratio_the_new_part_lacks_lets_design_choose():
    d = _swap_json("CD4541B", "74HC4060", "--r", "56k", "--c", "1n", "--divide", "65536")
    assert d["new"]["values"]["divide"] in (16, 32, 64, 128, 256, 512, 1024, 4096, 8192, 16384)
    assert any("--divide 65536 is not a ratio the 74HC4060 can select" in a for a in d["assumptions"])


def test_swap_new_divide_is_checked():
    err = _error("swap", "CD4541B", "74HC4060", "--r", "56k", "--c", "1n", "--new-divide", "100")
    assert "--new-divide 100 is not a divide ratio the 74HC4060 can select (nearest: 128)" in err
