"""The --json answers against their checked-in JSON Schemas (schemas/, from advisor/answers.py).

(a) Regenerating the schemas from the models gives the checked-in files.
(b) Every command example in the README, run with --json, validates against its
    command's schema (jsonschema, draft 2020-12) and through its typed model.
The files the examples name (parts.csv, capture.csv, shelf.csv, logic.kicad_sch, logic.net)
are stand-ins written here: a small BOM, the shipped demo capture, a one-line stock list,
the shipped demo schematic and a small netlist export (tests/data/logic.net).
"""

from __future__ import annotations

import json
import re
import shlex
import shutil
from pathlib import Path

import jsonschema
import pytest

from advisor.answers import ANSWERS
from advisor.cli.main import main
from advisor.schemas import SCHEMA_DIR, rendered

ROOT = Path(__file__).resolve().parents[1]


def readme_examples() -> list[str]:
    """The ``retime ...`` lines of the README's command tour (comments stripped)."""
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    out = []
    for block in re.findall(r"```\n(.*?)```", text, re.S):
        for line in block.splitlines():
            line = line.split("  #")[0].strip()
            if line.startswith("retime ") and not line.startswith(("retime ui", "retime demo")):
                out.append(line)
    return out


def answer_name(argv: list[str]) -> str:
    return "catalog-list" if argv[:2] == ["catalog", "list"] else argv[0]


def test_checked_in_schemas_match_the_models():
    files = rendered()
    assert sorted(p.name for p in SCHEMA_DIR.glob("*.schema.json")) == sorted(files)
    for name, text in files.items():
        assert (SCHEMA_DIR / name).read_text(encoding="utf-8") == text, f"run python -m advisor.schemas ({name})"


def test_every_command_with_json_has_a_schema_and_the_readme_shows_it():
    shown = {answer_name(shlex.split(line)[1:]) for line in readme_examples()}
    assert set(ANSWERS) <= shown | {"catalog-list"}


@pytest.fixture()
def bench(tmp_path, monkeypatch):
    shutil.copy(ROOT / "tests" / "data" / "fail_on_bom.csv", tmp_path / "parts.csv")
    shutil.copy(ROOT / "advisor" / "data" / "demo" / "u3_scope.csv", tmp_path / "capture.csv")
    (tmp_path / "shelf.csv").write_text("Part\nSN74HC221N\n", encoding="utf-8")
    shutil.copy(ROOT / "advisor" / "data" / "demo" / "bench_pulse_generator.kicad_sch", tmp_path / "logic.kicad_sch")
    shutil.copy(ROOT / "tests" / "data" / "logic.net", tmp_path / "logic.net")
    monkeypatch.chdir(tmp_path)
    return tmp_path


@pytest.mark.parametrize("line", [ln for ln in readme_examples() if "catalog check" not in ln])
def test_readme_example_json_validates_against_its_schema(bench, capsys, line):
    argv = shlex.split(line)[1:]
    code = main(argv + ["--json"])
    out = capsys.readouterr()
    assert code == 0, out.err
    answer = json.loads(out.out)
    name = answer_name(argv)
    schema = json.loads((SCHEMA_DIR / f"{name}.schema.json").read_text(encoding="utf-8"))
    jsonschema.validate(answer, schema, cls=jsonschema.Draft202012Validator)
    typed = ANSWERS[name].model_validate(answer)
    # the typed answer gives back every key of the printed one
    back = typed.to_json()
    assert set(answer) <= set(back)
