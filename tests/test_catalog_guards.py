"""Catalog grammar guards (issue 18): numbers finite and physical, thresholds ordered,
absolute max ≥ recommended max, every source id checked, a missing --catalog folder
refused. Each overlay is the shipped NE555 file with one value changed."""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import pytest
import yaml

from advisor.catalog import family_problems, parse_family

ROOT = Path(__file__).resolve().parents[1]
SHIPPED = yaml.safe_load((ROOT / "catalog" / "ne555.yaml").read_text(encoding="utf-8"))


def problems_of(change) -> list[str]:
    import copy

    data = copy.deepcopy(SHIPPED)
    change(data)
    fam, probs = parse_family(data, "catalog/x.yaml")
    if fam is not None:
        probs = family_problems(fam, "catalog/x.yaml")
    return [str(p) for p in probs]


def test_the_shipped_file_is_clean():
    assert problems_of(lambda d: None) == []


def _set_threshold(value):
    def change(d):
        d["timing"]["constants"]["upper_threshold"][0]["value"] = value
    return change


@pytest.mark.parametrize("value", [float("nan"), float("inf"), -0.5, 0.0, 1.5, 1e308])
def test_thresholds_must_be_fractions(value):
    got = problems_of(_set_threshold(value))
    assert got and all("catalog/x.yaml" in g for g in got)
    assert any("upper_threshold" in g for g in got)


def test_thresholds_must_be_ordered():
    def change(d):
        d["timing"]["constants"]["lower_threshold"][0]["value"] = 0.8
    assert any("not below the upper threshold" in g for g in problems_of(change))


@pytest.mark.parametrize("value", [0.0, -1.1, 1e308, float("nan")])
def test_a_timing_constant_is_positive_and_bounded(value):
    def change(d):
        d["timing"]["constants"].setdefault("mono_k", [{"value": 1.1, "source": "common-practice"}])
        d["timing"]["constants"]["mono_k"][0]["value"] = value
    assert any("mono_k" in g for g in problems_of(change))


def test_absolute_max_below_recommended_max():
    def change(d):
        d["supply"]["absolute_max"]["value"] = d["supply"]["recommended"]["max"] - 1
    assert any("absolute_max" in g and "recommended" in g for g in problems_of(change))


def test_infinite_absolute_max():
    def change(d):
        d["supply"]["absolute_max"]["value"] = float("inf")
    assert any("supply.absolute_max" in g for g in problems_of(change))


def test_an_unknown_source_in_a_behaviour_field():
    def change(d):
        d["behaviour"]["retrigger_source"] = "no-such-sheet"
    got = problems_of(change)
    assert any("behaviour.retrigger_source" in g and "no-such-sheet" in g for g in got)


def test_a_missing_catalog_folder_is_an_input_error(tmp_path):
    done = subprocess.run([sys.executable, "-m", "advisor", "check", "NE555", "--r", "10k", "--c", "10n",
                           "--catalog", str(tmp_path / "missing")], capture_output=True, text=True, cwd=ROOT,
                          timeout=120)
    assert done.returncode == 2 and "no such folder" in done.stderr


def test_long_values_are_quoted_as_a_bounded_excerpt():
    from advisor.errors import short_repr

    deep = [[list(range(10**5))] * 1000] * 1000  # 10^11 items if written out
    assert len(short_repr(deep)) <= 60


def test_a_pin_tie_names_its_use_and_a_listed_source():
    def change(d):
        pin = d["packages"][0]["pins"][3]  # NE555 pin 4, RESET
        pin.update({"tie": {"astable": "VCC", "sometimes": "GND"}, "tie_source": "no-such-sheet"})
    got = problems_of(change)
    assert any("packages[0].pins" in g and "sometimes" in g for g in got), got
    assert any("tie_source" in g and "no-such-sheet" in g for g in got), got
    assert all("catalog/x.yaml" in g for g in got)
