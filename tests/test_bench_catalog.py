"""Benchmarks (not timed tests): load + validate the whole catalog; one find.

Goals from issue 3: load at most 100 ms, find at most 5 ms. Run with
``python -m pytest tests/test_bench_catalog.py --benchmark-enable``.
"""

from __future__ import annotations

from advisor.catalog import load_dirs
from advisor.resources import data_dir
from advisor.partnumber import recognise

QUERIES = ["SN74LS221N", "MC14538BCP", "TLC555CDR", "74HC123PW", "SN74LS21N"]


def test_bench_load_and_validate_catalog(benchmark):
    cat = benchmark(lambda: load_dirs([data_dir("catalog")]))
    assert not cat.problems


def test_bench_find_one_part_number(benchmark):
    cat = load_dirs([data_dir("catalog")])
    recognise(cat, "74HC221")  # builds the index once, as the CLI does on first use

    def run():
        return [recognise(cat, q) for q in QUERIES]

    result = benchmark(run)
    assert result[0][0].family == "74LS221"
