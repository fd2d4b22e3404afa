"""Cold-start time of `retime check` (issue 4 asks for <= 300 ms), best of N runs.

Usage: python tests/bench/check_cold.py [N]   (run from the repository root)
Prints the best and median wall time of a fresh process, and the in-process
split: imports, catalog load, rules load, timing analysis.
"""

from __future__ import annotations

import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
SPLIT = """
import time; t0 = time.perf_counter()
import advisor.parts; t1 = time.perf_counter()
from advisor.catalog import load_catalog; cat = load_catalog(); t2 = time.perf_counter()
from advisor.timing import analyse; from advisor.circuit import Circuit; t3 = time.perf_counter()
r = analyse(cat.get('NE555'), Circuit('NE555', r=1e4, c=1e-8)).to_json(); t4 = time.perf_counter()
try:
    from advisor.rules import check_findings
    check_findings(cat.get('NE555'), Circuit('NE555', r=1e4, c=1e-8), r)
except ImportError:
    pass
t5 = time.perf_counter()
print(f"grammar {1e3*(t1-t0):.0f} ms, catalog {1e3*(t2-t1):.0f} ms, timing import {1e3*(t3-t2):.0f} ms, "
      f"analyse {1e3*(t4-t3):.1f} ms, rules {1e3*(t5-t4):.0f} ms")
"""


def main(n: int = 7) -> None:
    cmd = [sys.executable, "-m", "advisor", "check", "NE555", "--r", "10k", "--c", "10n", "--json"]
    runs = []
    for _ in range(n):
        t = time.perf_counter()
        subprocess.run(cmd, cwd=ROOT, check=True, capture_output=True)
        runs.append(time.perf_counter() - t)
    print(f"retime check cold: best {min(runs) * 1e3:.0f} ms, median {statistics.median(runs) * 1e3:.0f} ms ({n} runs)")
    subprocess.run([sys.executable, "-c", SPLIT], cwd=ROOT, check=True)


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 7)
