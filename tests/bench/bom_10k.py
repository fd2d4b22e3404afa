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


def make_bom_with_values(path: Path, lines: int = 10_000, seed: int = 2) -> None:
    """A harder case: every timer line carries its own Rext, Cext and supply (240 distinct)."""
    rnd = random.Random(seed)
    parts = ["SN74LS221N", "NE555P", "CD4538BE", "74HC123PW", "SN74121N", "TLC555CDR"]
    out = ["Ref,MPN,Rext,Cext,VCC"]
    for i in range(lines):
        if rnd.random() < 0.1:
            out.append(f"U{i},{rnd.choice(parts)},{rnd.choice(['4k7', '10k', '22k', '47k', '100k'])},"
                       f"{rnd.choice(['1n', '10n', '100n', '1u'])},{rnd.choice(['5', '12'])}")
        else:
            out.append(f"R{i},RC0603FR-07{rnd.randint(1, 999)}KL,,,")
    path.write_text("\n".join(out) + "\n", encoding="utf-8")


def _run(src: Path, label: str) -> None:
    out = src.with_suffix(".out.csv")
    start = time.perf_counter()
    done = subprocess.run([sys.executable, "-m", "advisor", "bom", str(src), "-o", str(out)],
                          capture_output=True, text=True)
    took = time.perf_counter() - start
    rows = sum(1 for _ in open(out, encoding="utf-8")) if done.returncode == 0 else 0
    print(f"retime bom, {label}, cold process: {took:.2f} s, exit {done.returncode}, {rows} rows written")
    if done.returncode:
        print(done.stderr)


def main() -> None:
    with tempfile.TemporaryDirectory() as d:
        src = Path(d) / "bom10k.csv"
        make_bom(src)
        _run(src, "10 000 mixed lines")
        src2 = Path(d) / "bom10k_values.csv"
        make_bom_with_values(src2)
        _run(src2, "10 000 lines, 240 distinct timer networks")


if __name__ == "__main__":
    main()
