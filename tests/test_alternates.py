"""Alternates on the shipped catalog: who can do the job, ranking, rejection reasons."""

from __future__ import annotations

import re

import pytest

from advisor.catalog import load_catalog
from advisor.circuit import Circuit, Trigger
from advisor.substitute import CLASS_ORDER
from advisor.substitute.alternates import alternates, rank_key


@pytest.fixture(scope="module")
def cat():
    return load_catalog()


@pytest.fixture(scope="module")
def alt_74121(cat):
    return alternates(cat, "SN74121N", Circuit(part="", vcc=5, r=10e3, c=10e-9, trigger=Trigger(None, "falling")),
                      new_vcc=5, limit=10)


def test_74121_has_at_least_three_candidates_with_a_221(alt_74121):
    fams = [c.new.family for c in alt_74121.candidates]
    assert len(fams) >= 3  # issue 6 done-when
    assert any(re.fullmatch(r"74[A-Z]*221", f) for f in fams)
    assert "74121" not in fams


def test_ranked_best_first(alt_74121):
    keys = [rank_key(c) for c in alt_74121.candidates]
    assert keys == sorted(keys)
    ranks = [CLASS_ORDER.index(c.cls) for c in alt_74121.candidates]
    assert ranks == sorted(ranks)
    assert all(c.cls != "unsuitable" for c in alt_74121.candidates)


def test_json_shape(alt_74121):
    j = alt_74121.to_json()
    assert j["candidates"] and {"family", "class", "error", "values", "timing", "rework"} <= set(j["candidates"][0])
    assert j["old"]["family"] == "74121"


def test_astable_job_excludes_one_shots_and_rejects_by_supply(cat):
    c = Circuit(part="", vcc=16, mode="astable", ra=10e3, rb=68e3, c=10e-9)
    res = alternates(cat, "NE555", c, new_vcc=16, limit=0)
    fams = {x.new.family: x for x in res.candidates}
    assert all(cat.get(f).function in ("timer-555", "monostable-astable") for f in fams)
    rejected = {r.family for r in res.rejected}
    assert "TLC555" in rejected  # TLC555: 2–15 V (TI SLFS043C)
    assert "ICM7555" in fams and fams["ICM7555"].cls in ("drop-in", "drop-in-new-values")  # 2–18 V (Intersil FN2867)


def test_new_supply_rejects_parts_that_cannot_run_there(cat):
    c = Circuit(part="", vcc=15, r=100e3, c=100e-9, trigger=Trigger(None, "rising"))
    res = alternates(cat, "CD4538B", c, new_vcc=None, limit=0)
    rejected = {r.family for r in res.rejected}
    assert "74HC4538" in rejected  # 74HC: 2–6 V (Nexperia 74HC4538 rev 4)
    assert all(cat.get(x.new.family).supply.recommended.max >= 15 for x in res.candidates)
