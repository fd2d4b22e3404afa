"""Benchmark: a user family listing 20 000 part numbers (an approved-parts list folded
into one family): load + validate, first resolve (the part-number index), and a cold
`retime check` of one of its numbers.

Usage: python tests/bench/catalog_20k_parts.py [N]   (run from the repository root)
Prints wall times; nothing is asserted here (speed is measured, never asserted in a
timed test). The family is demo data written here: the shipped NE555 file under a
new id with generated part numbers ``XB555-00000`` … (tests/support/big_family.py).
"""

from __future__ import annotations

import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path[:0] = [str(ROOT), str(ROOT / "tests")]  # this checkout's advisor, not an installed one

from support.big_family import write_big_family  # noqa: E402


def main(n_parts: int = 20_000) -> None:
    from advisor.catalog import load_dirs
    from advisor.partnumber import recognise
    from advisor.resources import data_dir

    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        numbers = write_big_family(folder, n_parts)
        t0 = time.perf_counter()
        cat = load_dirs([data_dir("catalog"), folder])
        t1 = time.perf_counter()
        assert not cat.problems, cat.problems[:3]
        hit = cat.resolve(numbers[n_parts // 2])
        t2 = time.perf_counter()
        recognise(cat, numbers[-1].lower())
        t3 = time.perf_counter()
        print(f"{n_parts} part numbers: load + validate {1e3 * (t1 - t0):.0f} ms, "
              f"first resolve (index) {1e3 * (t2 - t1):.0f} ms, next recognise {1e3 * (t3 - t2):.1f} ms "
              f"-> {hit.id}")
        env = dict(os.environ, RETIME_NO_CACHE="1")
        cmd = [sys.executable, "-m", "advisor", "check", numbers[7], "--catalog", str(folder),
               "--r", "10k", "--c", "10n", "--json", "--no-picture"]
        t = time.perf_counter()
        subprocess.run(cmd, cwd=ROOT, check=True, capture_output=True, env=env)
        print(f"retime check {numbers[7]} (no cache, cold process): {1e3 * (time.perf_counter() - t):.0f} ms")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 20_000)
