"""A 555 astable's trimmer with RA (the default) or RB, its tolerance and its end resistance.

Hand calculations beside each assert use the 555 astable law with the thresholds at
2/3 and 1/3 of the supply: tH = ln2·(RA + RB)·C, tL = ln2·RB·C (TI SLFS022, NE555
"Astable Operation"; the engine adds the discharge transistor's on-resistance to the
low time only, Diodes DS35112).
"""

from __future__ import annotations

import math

import pytest

from advisor.catalog import load_catalog
from advisor.circuit import Circuit
from advisor.timing.analyse import analyse

LN2 = math.log(2)


@pytest.fixture(scope="module")
def ne555():
    return load_catalog().get("NE555")


def astable(**kw):
    base = dict(part="NE555", vcc=5, mode="astable", ra=1e3, rb=10e3, c=100e-9, pot=10e3)
    base.update(kw)
    return Circuit(**base)


def test_trimmer_in_ra_moves_the_period_and_keeps_the_low_time(ne555):
    res = analyse(ne555, astable(pot_tol=0.0, pot_end=0.0))
    lo, hi = res.adjust["min"], res.adjust["max"]
    assert lo["high"] == pytest.approx(LN2 * (1e3 + 10e3) * 100e-9, rel=2e-3)  # 762.4 µs at the zero stop
    assert hi["high"] == pytest.approx(LN2 * (1e3 + 10e3 + 10e3) * 100e-9, rel=2e-3)  # 1.456 ms at full
    # tL = ln2·10k·100n = 693.1 µs at both stops (the discharge resistance in parallel with RA
    # moves it by a few per cent only)
    assert lo["low"] == pytest.approx(LN2 * 10e3 * 100e-9, rel=0.05)
    assert hi["low"] == pytest.approx(lo["low"], rel=0.05)
    assert res.values["pot_in"] == "ra"


def test_trimmer_in_rb_moves_the_low_time(ne555):
    res = analyse(ne555, astable(pot_in="rb", pot_tol=0.0, pot_end=0.0))
    hi = res.adjust["max"]
    assert hi["low"] == pytest.approx(LN2 * 20e3 * 100e-9, rel=0.05)  # 1.386 ms with RB + 10k
    assert hi["high"] == pytest.approx(LN2 * 21e3 * 100e-9, rel=2e-3)  # 1.456 ms
    assert res.values["pot_in"] == "rb"


def test_a_trimmer_at_zero_is_never_zero_ohms(ne555):
    # Default end resistance: 1 % of 10 kΩ = 100 Ω at each stop (from memory, cermet class).
    res = analyse(ne555, astable(pot_tol=0.0))
    assert res.adjust["min"]["high"] == pytest.approx(LN2 * (1e3 + 100 + 10e3) * 100e-9, rel=2e-3)  # 769.3 µs
    assert res.adjust["max"]["high"] == pytest.approx(LN2 * (1e3 + 10e3 - 100 + 10e3) * 100e-9, rel=2e-3)
    assert any("end resistance" in a for a in res.assumptions)
    given = analyse(ne555, astable(pot_tol=0.0, pot_end=50.0))
    assert given.adjust["min"]["high"] == pytest.approx(LN2 * (1e3 + 50 + 10e3) * 100e-9, rel=2e-3)


def test_trimmer_tolerance_widens_the_band(ne555):
    tight = analyse(ne555, astable(pot_tol=0.0, pot_setting=1.0))
    loose = analyse(ne555, astable(pot_setting=1.0))  # default ±20 %, said so
    assert loose.timing["max"]["period"] > tight.timing["max"]["period"]
    assert loose.timing["min"]["period"] < tight.timing["min"]["period"]
    assert any("±20%" in a and "--pot-tol" in a for a in loose.assumptions)


def test_rules_judge_the_trimmer_where_it_sits(ne555):
    from advisor.rules.context import part_values

    in_ra = analyse(ne555, astable())
    in_rb = analyse(ne555, astable(pot_in="rb"))
    # With the trimmer in RA, turning it to its zero stop leaves only RA (1k) between the
    # supply and DIS: the discharge path goes down with the trimmer.
    assert part_values(ne555, astable(), in_ra.to_json())["pot_in_discharge_path"] is True
    assert part_values(ne555, astable(pot_in="rb"), in_rb.to_json())["pot_in_discharge_path"] is False


def test_cli_says_where_the_trimmer_sits(capsys):
    from advisor.cli.main import main

    assert main(["check", "NE555", "--ra", "1k", "--rb", "10k", "--pot", "10k", "--c", "100n", "--vcc", "5"]) == 0
    assert "(trimmer in RA)" in capsys.readouterr().out
    assert main(["check", "NE555", "--ra", "1k", "--rb", "10k", "--pot", "10k", "--pot-in", "rb", "--c", "100n",
                 "--vcc", "5"]) == 0
    assert "(trimmer in RB)" in capsys.readouterr().out
    with pytest.raises(SystemExit):
        main(["check", "--help"])
    helptext = capsys.readouterr().out
    assert "--pot-in" in helptext and "default 20%" in helptext and "RB in an astable" not in helptext
