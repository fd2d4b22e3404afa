"""Heavy libraries stay off the command line's start-up path (design rule: pandas and
textual are imported only by the commands that need them)."""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
PROBE = """
import contextlib, io, json, sys
from advisor.cli.main import main
with contextlib.redirect_stdout(io.StringIO()):
    code = main(sys.argv[1:])
print(json.dumps({"code": code, "loaded": sorted(m for m in ("pandas", "textual", "schemdraw", "openpyxl")
                                                  if m in sys.modules)}))
"""


@pytest.mark.parametrize(
    "argv",
    [
        ["check", "NE555", "--r", "10k", "--c", "10n", "--vcc", "5"],
        ["swap", "CD4538B", "74HC4538", "--r", "100k", "--c", "10n", "--vcc", "15", "--new-vcc", "5"],
        ["find", "sn74hc221n"],
        ["design", "74HC4538", "--width", "1ms", "--vcc", "5"],
        ["demo"],
    ],
)
def test_heavy_libraries_are_not_imported(argv):
    done = subprocess.run([sys.executable, "-c", PROBE, *argv], capture_output=True, text=True, cwd=ROOT)
    assert done.returncode == 0, done.stderr
    out = json.loads(done.stdout.strip().splitlines()[-1])
    assert out["code"] == 0
    assert out["loaded"] == []


HIT_PROBE = """
import contextlib, io, json, sys
from advisor.cli.main import main
with contextlib.redirect_stdout(io.StringIO()):
    code = main(sys.argv[1:])
faces = ("advisor.report", "advisor.tui", "advisor.board", "advisor.bom", "advisor.measure")
print(json.dumps({"code": code,
                  "loaded": sorted(m for m in sys.modules
                                   if m in ("pydantic", "pydantic_core", "yaml", "importlib.resources", "rapidfuzz",
                                            "jsonschema", "numpy", "pandas", "textual")
                                   or m.startswith(faces)),
                  "commands": sorted(m for m in sys.modules if m.startswith("advisor.cli.cmd_"))}))
"""


@pytest.mark.parametrize("argv", [
    ["swap", "74LS221", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "5", "--json"],
    ["swap", "CD4538B", "74HC4538", "--r", "100k", "--c", "10n", "--vcc", "15", "--new-vcc", "5"],
    ["check", "NE555", "--ra", "4k7", "--rb", "47k", "--c", "10n", "--vcc", "12"],
    ["design", "74HC4538", "--width", "1ms", "--vcc", "5", "--json"],
    ["alternates", "74121", "--r", "10k", "--c", "10n", "--vcc", "5", "--json"],
    ["find", "sn74hc221n", "--json"],
    ["show", "74HC221", "--json"],
    ["catalog", "list", "--json"],
    ["rules", "--json"],
])
def test_a_cache_hit_imports_no_validator_nor_yaml_and_loads_one_command(tmp_path, argv):
    """The start-up cache's promise (DEVELOPERS.md, Benchmarks): a run answered from it imports
    neither pydantic (no validation schema is built) nor a YAML parser, no library and no face
    (report, workbench, board, BOM, capture) the answer does not use (rapidfuzz only for a fuzzy
    match, numpy only for Monte Carlo), and only the command it runs."""
    import os

    env = dict(os.environ, RETIME_CACHE=str(tmp_path))
    env.pop("RETIME_NO_CACHE", None)
    first = subprocess.run([sys.executable, "-c", HIT_PROBE, *argv], capture_output=True, text=True, cwd=ROOT, env=env)
    assert first.returncode == 0, first.stderr
    done = subprocess.run([sys.executable, "-c", HIT_PROBE, *argv], capture_output=True, text=True, cwd=ROOT, env=env)
    assert done.returncode == 0, done.stderr
    out = json.loads(done.stdout.strip().splitlines()[-1])
    assert out["code"] == 0
    assert out["loaded"] == []
    assert out["commands"] == [f"advisor.cli.cmd_{argv[0]}"]
