"""Benchmarks for the rules engine (run with --benchmark-enable to time them)."""

from __future__ import annotations

from advisor.circuit import Circuit, Trigger
from advisor.rules import build_context, evaluate, load_rules
from advisor.rules.loader import load_dirs
from advisor.resources import data_dir
from test_rules_loader import family, timing_json


def test_bench_load_rules(benchmark):
    rs = benchmark(lambda: load_dirs([data_dir("rules")]))
    assert len(rs.rules) >= 20 and not rs.problems


def test_bench_build_and_evaluate(benchmark):
    fam = family()
    circ = Circuit(part="74HC221", vcc=5.0, r=10e3, c=10e-9, pot=50e3, trigger=Trigger(period=64e-6, edge="falling", high=5.0))
    tj = timing_json(70e-6, divide_by=2, stays_high=False, period=64e-6)
    rules = load_rules()
    found = benchmark(lambda: evaluate(build_context(fam, circ, tj), rules))
    assert found
