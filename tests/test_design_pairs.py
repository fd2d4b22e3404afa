"""Design search for two-resistor networks: the 555 astable's RA/RB pair with C kept.

The reference in each test is an exhaustive search written here over every pair of
the series, evaluated on the part's law as the engine states it (the catalog's
thresholds and discharge resistance). A hand check on the textbook law of the 555
astable sits beside it: tH = ln2·(RA+RB)·C, tL = ln2·RB·C,
f = 1/(ln2·(RA+2RB)·C) ≈ 1.44/((RA+2RB)·C) (TI SLFS022, NE555 "Astable Operation").
Without a duty target the search keeps 50 % < duty ≤ 2/3 (RA ≤ RB), as the design
module documents.
"""

from __future__ import annotations

import math

import pytest

from advisor import eseries
from advisor.catalog import load_catalog
from advisor.circuit import Circuit, Target
from advisor.timing.design import _r_limits, design

LN2 = math.log(2)


@pytest.fixture(scope="module")
def ne555():
    return load_catalog().get("NE555")


def _textbook(ra, rb, c):
    f = 1.0 / (LN2 * (ra + 2 * rb) * c)
    duty = (ra + rb) / (ra + 2 * rb)
    return f, duty


def _exhaustive_best(fam, series, c, f_goal, r_lo, r_hi):
    """Smallest |frequency error| over every (RA, RB) pair of the series (the test's own search)."""
    from advisor.timing.model import build

    model = build(fam, Circuit(part=fam.id, vcc=5, mode="astable", ra=1e3, rb=1e3, c=c), need_network=False)
    values = eseries.values_between(series, r_lo, r_hi)
    best = math.inf
    for ra in values:
        for rb in values:
            if ra + rb > r_hi:
                continue
            t = model.times(model.at(ra=ra, rb=rb, rp=0.0))
            if 0.5 <= t["duty"] <= 2 / 3 + 1e-9:
                best = min(best, abs(t["frequency"] / f_goal - 1))
    return best


@pytest.mark.parametrize("series", ["E24", "E96"])
@pytest.mark.parametrize("f_goal", [470.0, 1e3, 2.2e3, 16.4e3])
def test_astable_with_c_kept_is_as_close_as_the_series_allows(ne555, series, f_goal):
    c = 10e-9
    circuit = Circuit(part="NE555", vcc=5, mode="astable", c=c, target=Target("freq", f_goal))
    res = design(ne555, circuit, series=series, keep_c=True, limit=3)
    best = res.candidates[0]
    assert best.kept_c and best.values["c"] == pytest.approx(c)
    got = abs(best.error)
    r_lo, r_hi = _r_limits(ne555, 5.0)
    reference = _exhaustive_best(ne555, series, c, f_goal, r_lo, r_hi)
    assert got <= reference + 1e-9  # nothing in the series does better
    if reference <= 0.01:
        assert got <= 0.01  # issue 14 done-when: within 1 % wherever the series allows it
    # Textbook cross-check: the pair gives the frequency within 1 % + the 0.6 % the
    # discharge transistor and threshold spread add to 1/(ln2·(RA+2RB)·C) at small RA.
    f, _ = _textbook(best.values["ra"], best.values["rb"], c)
    assert abs(f / f_goal - 1) <= 0.016


def test_error_is_signed_in_the_frequency_when_a_frequency_is_given(ne555):
    circuit = Circuit(part="NE555", vcc=5, mode="astable", c=10e-9, target=Target("freq", 1e3))
    best = design(ne555, circuit, keep_c=True, limit=1).candidates[0]
    assert best.error == pytest.approx(best.timing["nominal"]["frequency"] / 1e3 - 1)


def test_capacitor_series_is_searched_when_c_may_change(ne555):
    circuit = Circuit(part="NE555", vcc=5, mode="astable", target=Target("freq", 1e3))
    res = design(ne555, circuit, keep_c=False, c_series="E12", limit=5)
    e12 = eseries.values_between("E12", 1e-12, 1e-3)
    assert all(any(abs(cd.values["c"] / v - 1) < 1e-9 for v in e12) for cd in res.candidates)
    assert res.to_json()["c_series"] == "E12"


def test_bands_use_the_series_tolerance():
    # IEC 60063: E96 is the 1 % series.
    c = Circuit(part="NE555", r_series="E96")
    assert c.r_tolerance == pytest.approx(0.01)
    assert Circuit(part="NE555", r_series="E96", r_tol=0.05).r_tolerance == pytest.approx(0.05)


def test_bad_series_names_are_bad_input(ne555):
    from advisor.errors import InputError

    circuit = Circuit(part="NE555", vcc=5, mode="astable", target=Target("freq", 1e3))
    with pytest.raises(InputError, match="--c-series"):
        design(ne555, circuit, c_series="E7")
