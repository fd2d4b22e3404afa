"""Benchmark: review a 10 000-line mixed BOM from a cold process.

Usage: python tests/bench/bom_10k.py   (prints the wall time of `retime bom`)
The BOM is generated here: timer/one-shot lines drawn from real part-number forms,
mixed with passive parts and junk rows; part numbers repeat as in real BOMs.
"""

from __future__ import annotations

import random
import subprocess
import sys
import tempfile
import time
from pathlib import Path

TIMERS = ["SN74LS221N", "sn74hc221n", "CD4538BE", "MC14538BCP", "HEF4538BP", "NE555P", "LM555CN",
          "TLC555CDR", "ICM7555IPAZ", "DM74LS123N", "74HC123PW", "SN74121N", "NE556N", "CD4047BE"]


def make_bom(path: Path, lines: int = 10_000, seed: int = 1) -> None:
    rnd = random.Random(seed)
    out = ["Ref,Qty,MPN,Description"]
    for i in range(lines):
        k = rnd.random()
        if k < 0.1:
            part = rnd.choice(TIMERS)
        elif k < 0.95:
            part = f"RC0603FR-07{rnd.randint(1, 999)}KL" if rnd.random() < 0.5 else f"GRM188R71H{rnd.randint(100, 999)}KA01D"
        elif k < 0.98:
            part = ""
        else:
            part = "???"
        out.append(f"X{i},1,{part},line {i}")
    path.write_text("\n".join(out) + "\n", encoding="utf-8")


def main() -> None:
    with tempfile.TemporaryDirectory() as d:
        src = Path(d) / "bom10k.csv"
        make_bom(src)
        start = time.perf_counter()
        done = subprocess.run([sys.executable, "-m", "advisor", "bom", str(src), "-o", str(Path(d) / "out.csv")],
                              capture_output=True, text=True)
        took = time.perf_counter() - start
        rows = sum(1 for _ in open(Path(d) / "out.csv", encoding="utf-8")) if done.returncode == 0 else 0
        print(f"retime bom, 10 000 lines, cold process: {took:.2f} s, exit {done.returncode}, {rows} rows written")
        if done.returncode:
            print(done.stderr)


if __name__ == "__main__":
    main()
