"""Benchmark: reading and measuring a 1-million-sample, two-channel capture (goal: <= 1 s).

Speed is measured, not asserted: run with ``--benchmark-enable`` to see the figure.
"""

from __future__ import annotations

import pytest

from advisor.measure import measure_file
from support.captures import synthetic_square, write_csv


@pytest.fixture(scope="module")
def big_capture(tmp_path_factory):
    t, ch = synthetic_square(1_000_000, period_samples=1000.0)
    return write_csv(tmp_path_factory.mktemp("bench") / "big.csv", t, ch, "comma-seconds")


def test_bench_measure_one_million_samples(benchmark, big_capture):
    res = benchmark(measure_file, big_capture, trigger_channel=1, output_channel=2)
    assert res.samples == 1_000_000
    assert res.channels[0].period.median == pytest.approx(1000 * 1e-8, rel=1e-3)  # by construction
