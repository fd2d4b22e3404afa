"""IEC 60063 preferred numbers: tables against an independent oracle and the standard's irregulars."""

import math

import eseries as oracle  # PyPI 'eseries' (MIT): an independent table, not a runtime dependency
import pytest

from advisor import eseries

ALL = ["E3", "E6", "E12", "E24", "E48", "E96", "E192"]


@pytest.mark.parametrize("name", ALL)
def test_tables_match_the_independent_oracle(name):
    ours = [round(v, 2) for v in eseries.values_between(name, 1.0, 9.999)]
    theirs = [round(v, 2) for v in oracle.erange(getattr(oracle.ESeries, name), 1.0, 9.999)]
    assert ours == theirs


def test_e24_irregular_values_from_the_standard():
    # IEC 60063 E24 prints 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7 and 8.2 where round(10**(i/24), 1)
    # gives 2.6, 2.9, 3.2, 3.5, 3.8, 4.2, 4.6 and 8.3 (Wikipedia "E-series of preferred numbers").
    e24 = eseries.mantissas("E24")
    for printed in (2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2):
        assert printed in e24
    for formula in (2.6, 2.9, 3.2, 3.5, 3.8, 4.2, 4.6, 8.3):
        assert formula not in e24


def test_e192_prints_920_not_919():
    # IEC 60063: E192 has 9.20 where 10**(185/192) rounds to 9.19.
    assert 9.20 in eseries.mantissas("E192")
    assert 9.19 not in eseries.mantissas("E192")


def test_log_nearest_differs_from_linear_nearest():
    # 9.08 lies nearer 8.2 on a linear scale (0.88 vs 0.92) but nearer 10 on a log scale.
    assert eseries.nearest("E12", 9.08) == 10.0
    assert abs(9.08 - 8.2) < abs(10 - 9.08)


@pytest.mark.parametrize("name", ALL)
def test_nearest_is_a_member_and_log_closest(name):
    for v in (1.234e3, 4.65e-9, 9.99e5, 1.0e4, 3.1e-6):
        n = eseries.nearest(name, v)
        lo, hi = eseries.neighbours(name, v)
        assert lo <= v <= hi
        assert n in (lo, hi)
        assert abs(math.log(n / v)) <= min(abs(math.log(lo / v)), abs(math.log(hi / v))) + 1e-12


def test_next_up_and_down():
    assert eseries.next_up("E24", 4700) == 5100
    assert eseries.next_down("E24", 4700) == 4300
    assert eseries.next_up("E12", 8200) == 10000
    assert eseries.next_down("E6", 1.0e-6) == pytest.approx(0.68e-6)


def test_series_tolerances_per_iec_60063():
    assert [eseries.tolerance(n) for n in ALL] == [0.40, 0.20, 0.10, 0.05, 0.02, 0.01, 0.005]


def test_exact_values_have_no_float_noise():
    assert 4700.0 in eseries.values_between("E24", 1e3, 1e4)
