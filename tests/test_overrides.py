"""A user family or rule that replaces a shipped one is named in every answer (issue 18).

The user folders here are test fixtures: a copy of the shipped NE555 file under another
title (a shop's own catalog folder) and a rules file that relaxes the shipped danger rule
``supply-above-abs-max`` to a note and rewords the note ``cmos-unused-inputs``. Every
command that answers with assumptions must list each replacement, naming the id, the user
file and the shipped file; a replaced danger rule is also a warning finding
(``shipped-danger-rule-replaced``, rules/overrides.yaml).
"""

from __future__ import annotations

import json
import os
from pathlib import Path

import pytest

from support.inprocess import retime

ROOT = Path(__file__).resolve().parents[1]
DEMO_BOARD = "advisor/data/demo/bench_pulse_generator.kicad_sch"

USER_RULES = """\
topic: A shop's own rules (test fixture)
rules:
  - id: supply-above-abs-max
    title: Supply above the absolute maximum (relaxed)
    severity: note
    applies_to: {parts: [new]}
    condition: part.vcc > part.abs_max + 1
    message: "{part.id} at {part.vcc:V} is above its absolute maximum."
    fix: "Lower the supply."
    source: the shop's own practice (test fixture)
    cases:
      fire: [{part.vcc: 20.0, part.abs_max: 18.0}]
      no_fire: [{part.vcc: 5.0, part.abs_max: 18.0}]
  - id: cmos-unused-inputs
    title: Unused CMOS inputs (the shop's wording)
    severity: note
    applies_to: {parts: [new]}
    condition: part.cmos
    message: "Tie the unused inputs of {part.id}."
    fix: "Tie them."
    source: the shop's own practice (test fixture)
    cases:
      fire: [{part.cmos: true}]
      no_fire: [{part.cmos: false}]
  - id: shop-only-rule
    title: A rule the shipped set does not have (added, not replaced)
    severity: note
    applies_to: {parts: [new]}
    condition: part.vcc > 100
    message: "never"
    fix: "never"
    source: test fixture
    cases:
      fire: [{part.vcc: 200.0}]
      no_fire: [{part.vcc: 5.0}]
"""


def _reset_rules() -> None:
    """The rule set is kept per process (lru_cache keyed by extra folders, not by
    RETIME_RULES): start and end each test with a fresh one."""
    from advisor.rules.loader import load_rules

    load_rules.cache_clear()


@pytest.fixture
def user_folders(tmp_path, monkeypatch):
    cat = tmp_path / "shop-catalog"
    cat.mkdir()
    text = (ROOT / "catalog" / "ne555.yaml").read_text(encoding="utf-8")
    (cat / "ne555.yaml").write_text(text.replace("title: Single bipolar precision timer (555)",
                                                 "title: NE555 as the shop stocks it", 1), encoding="utf-8")
    rules = tmp_path / "shop-rules"
    rules.mkdir()
    (rules / "shop.yaml").write_text(USER_RULES, encoding="utf-8")
    monkeypatch.setenv("RETIME_RULES", str(rules))
    monkeypatch.chdir(ROOT)
    _reset_rules()
    yield cat, rules
    monkeypatch.delenv("RETIME_RULES")
    _reset_rules()


def expected_lines(cat: Path, rules: Path) -> list[str]:
    """The assumption lines, danger first, then rules, then families."""
    return [
        f"shipped danger rule supply-above-abs-max (rules/supply.yaml) does not apply as shipped: "
        f"{rules / 'shop.yaml'} replaces it (now a note)",
        f"rule cmos-unused-inputs from {rules / 'shop.yaml'} replaces the shipped rule in rules/interface.yaml",
        f"family NE555 from {cat / 'ne555.yaml'} replaces the shipped catalog/ne555.yaml",
    ]


def _bom(tmp_path: Path) -> Path:
    bom = tmp_path / "bom.csv"
    bom.write_text("Ref,Part,R,C,Supply\nU1,NE555P,10k,10n,5\nU2,TLC555CP,47k,100n,5\n", encoding="utf-8")
    return bom


#: Every command whose answer has assumptions, and where they sit in its JSON.
COMMANDS = {
    "check": (["check", "NE555", "--r", "10k", "--c", "10n", "--vcc", "5"], [["assumptions"]]),
    "design": (["design", "NE555", "--width", "1ms", "--vcc", "5"], [["assumptions"]]),
    "swap": (["swap", "NE555", "TLC555", "--r", "10k", "--c", "10n", "--vcc", "5"], [["assumptions"]]),
    "alternates": (["alternates", "NE555", "--r", "10k", "--c", "10n", "--vcc", "5"], [["assumptions"]]),
    "bom": (["bom", "{bom}"], [["assumptions"]]),
    "board": (["board", DEMO_BOARD, "--new-vcc", "5"], [["assumptions"]]),
    "demo": (["demo"], [["swaps", 0, "assumptions"], ["alternates", 0, "assumptions"], ["board", "assumptions"]]),
}


def _at(data, path):
    for key in path:
        data = data[key]
    return data


@pytest.mark.parametrize("name", list(COMMANDS))
def test_every_answer_lists_each_replacement_in_json_and_text(name, user_folders, tmp_path):
    cat, rules = user_folders
    argv, places = COMMANDS[name]
    argv = [a.format(bom=_bom(tmp_path)) for a in argv] + ["--catalog", str(cat)]
    want = expected_lines(cat, rules)
    run = retime(*argv, "--json")
    assert run.code == 0, run.err
    data = json.loads(run.out)
    for place in places:
        got = _at(data, place)
        assert got[:3] == want, (place, got)  # at the head, each once
        assert len(set(got)) == len(got)
    text = retime(*argv)
    assert text.code == 0, text.err
    for line in want:
        assert line in text.out, (name, line)


def test_a_replaced_danger_rule_is_a_warning_finding(user_folders):
    cat, rules = user_folders
    run = retime("check", "NE555", "--r", "10k", "--c", "10n", "--vcc", "5", "--json")
    assert run.code == 0, run.err
    hit = [f for f in json.loads(run.out)["findings"] if f["rule"] == "shipped-danger-rule-replaced"]
    assert len(hit) == 1 and hit[0]["severity"] == "warning"
    assert hit[0]["message"] == (
        f"The shipped danger rule(s) supply-above-abs-max ({rules / 'shop.yaml'}) do not apply as shipped: "
        "a user rules folder replaces them, so this answer does not check that danger the way the "
        "datasheet rule does.")
    # a script stopping on warnings stops on it; a swap carries it once, for the new part
    assert retime("check", "NE555", "--r", "10k", "--c", "10n", "--vcc", "5", "--fail-on", "warning").code == 4
    swap = json.loads(retime("swap", "NE555", "TLC555", "--r", "10k", "--c", "10n", "--vcc", "5", "--json").out)
    assert [f["role"] for f in swap["findings"] if f["rule"] == "shipped-danger-rule-replaced"] == ["new"]


def test_without_user_folders_nothing_is_listed(monkeypatch):
    monkeypatch.delenv("RETIME_RULES", raising=False)
    monkeypatch.chdir(ROOT)
    _reset_rules()
    data = json.loads(retime("check", "NE555", "--r", "10k", "--c", "10n", "--vcc", "5", "--json").out)
    assert not any("replaces" in a for a in data["assumptions"])
    assert "shipped-danger-rule-replaced" not in {f["rule"] for f in data["findings"]}


def test_a_user_folder_that_only_adds_lists_nothing(tmp_path, monkeypatch):
    """A new id is an addition, not a replacement: nothing to say."""
    from support.big_family import write_big_family

    write_big_family(tmp_path, 3)
    monkeypatch.chdir(ROOT)
    _reset_rules()
    run = retime("check", "XB555-00001", "--r", "10k", "--c", "10n", "--vcc", "5", "--json", "--catalog", str(tmp_path))
    assert run.code == 0, run.err
    assert not any("replaces" in a for a in json.loads(run.out)["assumptions"])


def test_the_loaders_record_each_replacement_and_the_cache_keeps_them(user_folders, monkeypatch):
    import advisor.catalog
    import advisor.rules.loader
    from advisor.catalog import load_catalog
    from advisor.overrides import Override
    from advisor.rules.loader import load_rules

    cat, rules = user_folders
    shop = str(rules / "shop.yaml")
    assert load_rules().overrides == [
        Override("rule", "supply-above-abs-max", shop, "rules/supply.yaml", "danger", "note"),
        Override("rule", "cmos-unused-inputs", shop, "rules/interface.yaml", "note", "note"),
    ]
    first = load_catalog((str(cat),)).overrides
    assert first == [Override("family", "NE555", str(cat / "ne555.yaml"), "catalog/ne555.yaml")]
    assert os.environ.get("RETIME_CACHE")  # tests/conftest.py: a fresh cache folder per session
    load_catalog.cache_clear()
    _reset_rules()

    def no_yaml(dirs):
        raise AssertionError("read the YAML again instead of the cache")

    monkeypatch.setattr(advisor.catalog, "load_dirs", no_yaml)
    monkeypatch.setattr(advisor.rules.loader, "load_dirs", no_yaml)
    assert load_catalog((str(cat),)).overrides == first  # read back from the JSON cache
    assert [o.id for o in load_rules().overrides] == ["supply-above-abs-max", "cmos-unused-inputs"]
    load_catalog.cache_clear()


def test_a_user_folder_named_catalog_replaces_and_is_not_a_duplicate(tmp_path, monkeypatch):
    """Origin is the folder, not the label: '--catalog catalog' from another folder is a user folder."""
    (tmp_path / "catalog").mkdir()
    (tmp_path / "catalog" / "ne555.yaml").write_text((ROOT / "catalog" / "ne555.yaml").read_text(encoding="utf-8"),
                                                     encoding="utf-8")
    monkeypatch.chdir(tmp_path)
    _reset_rules()
    run = retime("check", "NE555", "--r", "10k", "--c", "10n", "--vcc", "5", "--json", "--catalog", "catalog")
    assert run.code == 0, run.err
    assert json.loads(run.out)["assumptions"][0] == (
        "family NE555 from catalog/ne555.yaml replaces the shipped catalog/ne555.yaml")


def test_reports_the_api_and_the_workbench_carry_the_lines(user_folders, tmp_path):
    import advisor
    from advisor.catalog import load_catalog
    from advisor.tui.bridge import evaluate, rank_alternates

    cat, rules = user_folders
    want = expected_lines(cat, rules)
    written = tmp_path / "reviewed.md"
    assert retime("bom", str(_bom(tmp_path)), "--catalog", str(cat), "-o", str(written)).code == 0
    assert all(line in written.read_text(encoding="utf-8") for line in want)
    report = tmp_path / "check.md"
    assert retime("check", "NE555", "--r", "10k", "--c", "10n", "--vcc", "5", "--catalog", str(cat),
                  "--report", str(report)).code == 0
    board = tmp_path / "board.html"
    assert retime("board", DEMO_BOARD, "--new-vcc", "5", "--catalog", str(cat), "--report", str(board)).code == 0
    for path in (report, board):
        page = path.read_text(encoding="utf-8")
        assert all(line.replace("'", "&#x27;") in page or line in page for line in want), path
    assert advisor.check("NE555", r="10k", c="10n", vcc=5, catalog=[str(cat)]).assumptions[:3] == want
    shop = load_catalog((str(cat),))
    out = evaluate(shop, {"old": "NE555", "r": "10k", "c": "10n", "vcc": "5"})
    assert out.kind == "check" and out.data["assumptions"][:3] == want
    swapped = evaluate(shop, {"old": "NE555", "new": "TLC555", "r": "10k", "c": "10n", "vcc": "5"})
    assert swapped.kind == "swap" and swapped.data["assumptions"][:3] == want
    ranked, problem = rank_alternates(shop, {"old": "NE555", "r": "10k", "c": "10n", "vcc": "5"})
    assert problem is None and ranked["assumptions"][:3] == want


def test_catalog_check_lists_the_replacements(user_folders):
    cat, rules = user_folders
    run = retime("catalog", "check", "--catalog", str(cat), "--json")
    got = json.loads(run.out)["overrides"]
    assert [(o["kind"], o["id"], o["shipped_file"]) for o in got] == [
        ("rule", "supply-above-abs-max", "rules/supply.yaml"), ("rule", "cmos-unused-inputs", "rules/interface.yaml"),
        ("family", "NE555", "catalog/ne555.yaml")]
    text = retime("catalog", "check", "--catalog", str(cat)).out
    assert all(f"replaced: {line}\n" in text for line in expected_lines(cat, rules))
