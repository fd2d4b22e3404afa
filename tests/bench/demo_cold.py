"""Wall time of `retime demo --json` in a fresh process (goal: 2 s or less), best and median of N.

Usage: python tests/bench/demo_cold.py [N]   (run from the repository root)
Speed is measured here, never asserted in a test.
"""

from __future__ import annotations

import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]


def main(n: int = 5) -> None:
    times = []
    for _ in range(n):
        t0 = time.perf_counter()
        subprocess.run([sys.executable, "-m", "advisor", "demo", "--json"], cwd=ROOT, check=True,
                       capture_output=True)
        times.append(time.perf_counter() - t0)
    print(f"retime demo: best {min(times):.2f} s, median {statistics.median(times):.2f} s over {n} runs")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 5)
