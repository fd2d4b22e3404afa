"""The Python API: the README's example runs as written; answers equal the commands' JSON."""

from __future__ import annotations

import json
import re
from pathlib import Path

import pytest

import advisor
from advisor.cli.main import main
from advisor.errors import InputError, RetimeError

ROOT = Path(__file__).resolve().parents[1]


def readme_python() -> str:
    blocks = re.findall(r"```python\n(.*?)```", (ROOT / "README.md").read_text(encoding="utf-8"), re.S)
    assert len(blocks) == 1, "the README carries one Python example"
    return blocks[0]


def test_the_readme_python_example_runs(capsys):
    exec(compile(readme_python(), "README.md", "exec"), {})
    out = capsys.readouterr().out
    assert "redesign" in out or "unsuitable" in out or "drop-in" in out


def test_api_answer_is_the_commands_json(capsys):
    argv = ["swap", "CD4538B", "74HC4538", "--r", "100k", "--c", "10n", "--vcc", "15", "--new-vcc", "5", "--json"]
    assert main(argv) == 0
    printed = json.loads(capsys.readouterr().out)
    typed = advisor.swap("CD4538B", "74HC4538", r="100k", c=10e-9, vcc=15, new_vcc=5)
    assert typed.to_json() == printed
    assert typed.cls == printed["class"] and typed.timing.nominal.width == printed["timing"]["nominal"]["width"]
    with pytest.raises(Exception):
        typed.reasons = []  # frozen


def test_api_refuses_unknown_options_and_bad_values():
    with pytest.raises(InputError, match="did you mean"):
        advisor.check("NE555", rr="10k")
    with pytest.raises(RetimeError) as bad:  # the command's own exit-2 error
        advisor.check("NE555", r="4x7", c="10n")
    assert bad.value.exit_code == 2


def test_tabular_answers_have_frames():
    frame = advisor.design("74HC4538", width="1ms", vcc=5, c="100n").to_frame()
    assert len(frame) >= 1 and {"error", "kept_c"} <= set(frame.columns)
    bom = advisor.review_bom(ROOT / "tests" / "data" / "fail_on_bom.csv").to_frame()
    assert list(bom["Ref"]) == ["U1", "R1", "U2"]  # every row back, in order
