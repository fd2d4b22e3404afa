"""Benchmark: read and plan a 200-symbol hierarchical KiCad schematic.

Usage: python tests/bench/board_200.py   (needs the open symbol library, kicad-symbols)
The schematic is generated here (tests/support/board_fixtures.py): a root sheet and
one sub-sheet file used 8 times (repeated instances, own references), each copy a
555 monostable with its network, decoupling and 10 resistor/capacitor pairs: 203
symbols, 8 timers. Prints the in-process time of read + plan (catalog and rules
loaded before) and the wall time of a cold `retime board` process.
"""

from __future__ import annotations

import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))


def main() -> None:
    from advisor.board import read_board
    from advisor.board.plan import plan_board
    from advisor.catalog import load_catalog
    from advisor.rules.loader import load_rules_checked
    from tests.support.board_fixtures import repeated_hierarchy

    with tempfile.TemporaryDirectory() as tmp:
        path = repeated_hierarchy(Path(tmp), copies=8, padding=10)
        catalog, rules = load_catalog(), load_rules_checked()
        board = read_board(path)
        symbols = len(board.parts) + 1  # U1 of the root has two units placed
        runs = []
        for _ in range(5):
            t0 = time.perf_counter()
            plan = plan_board(catalog, read_board(path), new_vcc=3.3, rules=rules)
            runs.append(time.perf_counter() - t0)
        print(f"{symbols} symbols, {board.sheets} sheets, {len(plan.channels)} timers")
        print(f"read + plan: best {min(runs):.3f} s, median {statistics.median(runs):.3f} s (goal <= 1 s)")
        t0 = time.perf_counter()
        subprocess.run([sys.executable, "-m", "advisor", "board", str(path), "--new-vcc", "3.3", "--json"],
                       cwd=ROOT, check=True, capture_output=True)
        print(f"cold `retime board`: {time.perf_counter() - t0:.3f} s")


if __name__ == "__main__":
    main()
