"""The bundled demo: shipped as package data, every class shown, fast."""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

from advisor.catalog import load_catalog
from advisor.resources import data_dir
from advisor.substitute import CLASS_ORDER
from advisor.substitute.demo import load_scenario, render_demo, run_demo

ROOT = Path(__file__).resolve().parents[1]


def test_demo_data_is_a_real_directory_in_the_package():
    d = data_dir("demo")
    assert d.is_dir() and not d.is_symlink()
    assert list(d.glob("*.yaml"))


def test_demo_shows_every_class():
    run = run_demo(load_catalog(), load_scenario())
    assert {res.cls for _, res in run.swaps} == set(CLASS_ORDER)
    text = render_demo(run)
    for cls in CLASS_ORDER:
        assert cls in text
    assert run.alternates and run.alternates[0][1].candidates


def test_retime_demo_runs_as_a_command():
    # Its speed is measured by tests/bench/demo_cold.py, never asserted here.
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    out = subprocess.run([sys.executable, "-m", "advisor", "demo", "--json"], cwd=ROOT, env=env,
                         capture_output=True, text=True, timeout=120)
    assert out.returncode == 0, out.stderr
    j = json.loads(out.stdout)
    assert j["classes"] == CLASS_ORDER
