"""Timing benchmarks: Monte Carlo of 100 000 samples (goal <= 50 ms) and a cold `retime check`
(goal <= 300 ms, issue 4). Speed is measured here, never asserted: run with
``--benchmark-enable``. tests/bench/check_cold.py prints the cold-start split.
"""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

from advisor.circuit import Circuit
from advisor.timing.model import build
from advisor.timing.montecarlo import simulate
from support.timing_family import make_family

ROOT = Path(__file__).resolve().parent.parent


def _model():
    fam = make_family("timer-555", {"upper_threshold": 2 / 3, "lower_threshold": 1 / 3,
                                    "astable_k": [{"value": 1.44}, {"value": 1.38}]}, function="timer-555")
    return build(fam, Circuit("T", vcc=5, mode="astable", ra=4.7e3, rb=10e3, c=10e-9))


def test_bench_monte_carlo_100k(benchmark):
    model = _model()
    simulate(model, 1000)  # warm numpy
    benchmark(simulate, model, 100_000, window=(1e-4, 2e-4))


def test_bench_check_cold(benchmark):
    cmd = [sys.executable, "-m", "advisor", "check", "NE555", "--r", "10k", "--c", "10n", "--json"]
    done = benchmark.pedantic(subprocess.run, args=(cmd,), kwargs={"cwd": ROOT, "capture_output": True},
                              rounds=3, iterations=1)
    assert done.returncode == 0, done.stderr
