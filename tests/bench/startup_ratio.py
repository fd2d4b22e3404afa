"""Start-up cost of a cached `retime swap` against the cold floor, measured side by side.

Usage: python tests/bench/startup_ratio.py [N]   (run from the repository root)

The floor is what any command of this design pays before doing work: a fresh Python
process that imports yaml and pydantic and defines and uses one pydantic model. The
answer is `retime swap 74LS221 74HC221 --r 10k --c 10n --vcc 5 --json` with the
catalog and rules cache warm (one unmeasured run first). The two are run alternately
N times so machine load falls on both alike; the ratio of the medians is printed
(goal <= 1.3; DEVELOPERS.md records the measured figure).
"""

from __future__ import annotations

import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
FLOOR = """
import yaml
from pydantic import BaseModel
class Probe(BaseModel):
    value: float
    source: str
Probe.model_validate({"value": 1.0, "source": "x"})
"""
ANSWER = ["swap", "74LS221", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "5", "--json"]


def _retime() -> list[str]:
    script = Path(sys.executable).with_name("retime")
    return [str(script)] if script.exists() else [sys.executable, "-m", "advisor"]


def _time(cmd: list[str], env: dict) -> float:
    t = time.perf_counter()
    subprocess.run(cmd, cwd=ROOT, env=env, check=True, stdout=subprocess.DEVNULL)
    return time.perf_counter() - t


def main(n: int = 15) -> float:
    env = dict(os.environ)
    env.setdefault("RETIME_CACHE", tempfile.mkdtemp(prefix="retime-bench-cache-"))
    env.pop("RETIME_NO_CACHE", None)
    # Measure what an installed copy pays: byte-compiled modules (kept out of the tree).
    env.pop("PYTHONDONTWRITEBYTECODE", None)
    env.setdefault("PYTHONPYCACHEPREFIX", tempfile.mkdtemp(prefix="retime-bench-pyc-"))
    answer = _retime() + ANSWER
    floor = [sys.executable, "-c", FLOOR]
    _time(answer, env)  # warm the cache (and the OS file cache)
    _time(floor, env)
    a_runs, f_runs = [], []
    for _ in range(n):
        f_runs.append(_time(floor, env))
        a_runs.append(_time(answer, env))
    a, f = statistics.median(a_runs), statistics.median(f_runs)
    ratio = a / f
    print(f"floor (python + yaml + one pydantic model): median {f * 1e3:.0f} ms, best {min(f_runs) * 1e3:.0f} ms")
    print(f"cached swap: median {a * 1e3:.0f} ms, best {min(a_runs) * 1e3:.0f} ms")
    print(f"ratio (medians) {ratio:.2f}x; ratio (bests) {min(a_runs) / min(f_runs):.2f}x; goal <= 1.3x; {n} runs each")
    return ratio


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 15)
