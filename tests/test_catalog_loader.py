"""The catalog loader on tiny inline catalogs (tmp folders), not the shipped one.

Every broken file must give a located message: file, key path, the offending
value and what was expected; every problem is reported, not only the first.
"""

from __future__ import annotations

import pytest

from advisor.catalog import count_memory, load_dirs, require_clean
from advisor.errors import DataError
from support.minicat import family_dict, write_family


def _msgs(cat):
    return [str(p) for p in cat.problems]


def test_minimal_family_loads_clean(tmp_path):
    write_family(tmp_path)
    cat = load_dirs([tmp_path])
    assert cat.problems == []
    fam = cat.get("test1")
    assert fam.timing.constants["k"][0].value == 0.7
    assert count_memory(fam) == 1  # the one r_min marked memory in the fixture


def test_wrong_type_is_located_with_value(tmp_path):
    data = family_dict()
    data["timing"]["constants"]["k"][0]["value"] = "abc"
    write_family(tmp_path, text=__import__("yaml").safe_dump(data))
    msgs = _msgs(load_dirs([tmp_path]))
    assert any(m.startswith("catalog/test1.yaml: timing.constants.k[0].value:") and "'abc'" in m for m in msgs), msgs


def test_unknown_key_is_refused(tmp_path):
    data = family_dict()
    data["supply"]["typo_key"] = 1
    write_family(tmp_path, text=__import__("yaml").safe_dump(data))
    msgs = _msgs(load_dirs([tmp_path]))
    assert any("supply.typo_key: unknown key" in m for m in msgs), msgs


def test_unknown_source_names_the_choices(tmp_path):
    data = family_dict()
    data["supply"]["absolute_max"]["source"] = "nowhere"
    write_family(tmp_path, text=__import__("yaml").safe_dump(data))
    msgs = _msgs(load_dirs([tmp_path]))
    assert any("supply.absolute_max.source: unknown source 'nowhere'" in m and "'memory'" in m for m in msgs), msgs


def test_every_problem_is_listed_not_only_the_first(tmp_path):
    bad = family_dict()
    bad["channels"] = "two"
    bad["supply"]["recommended"]["min"] = "low"
    write_family(tmp_path, "TEST1", text=__import__("yaml").safe_dump(bad))
    write_family(tmp_path, "TEST2", file="test2.yaml", timing={"law": "krc", "constants": {}})
    msgs = _msgs(load_dirs([tmp_path]))
    assert any("test1.yaml: channels:" in m for m in msgs)
    assert any("test1.yaml: supply.recommended.min:" in m for m in msgs)
    assert any("test2.yaml: timing.constants.k: law 'krc' needs constant 'k'" in m for m in msgs), msgs


def test_missing_pin_is_located(tmp_path):
    data = family_dict()
    data["packages"][0]["pins"] = [p for p in data["packages"][0]["pins"] if p["pin"] != 7]
    write_family(tmp_path, text=__import__("yaml").safe_dump(data))
    msgs = _msgs(load_dirs([tmp_path]))
    assert any("packages[0].pins: pins [7] missing; expected every pin 1..8" in m for m in msgs), msgs


def test_channels_must_carry_the_same_functions(tmp_path):
    data = family_dict(channels=2)
    pins = data["packages"][0]["pins"]
    for p in pins:
        if p["function"] not in ("VCC", "GND", "NC"):
            p["channel"] = 1
    pins[6] = {"pin": 7, "name": "2A", "function": "TRIG_FALL", "channel": 2}
    write_family(tmp_path, text=__import__("yaml").safe_dump(data))
    msgs = _msgs(load_dirs([tmp_path]))
    assert any("channel 2 functions ['TRIG_FALL'] differ from channel 1" in m for m in msgs), msgs


def test_trigger_function_must_be_on_a_pin(tmp_path):
    data = family_dict()
    data["behaviour"]["triggers"][0]["enable"] = {"CLEAR": "high"}
    write_family(tmp_path, text=__import__("yaml").safe_dump(data))
    msgs = _msgs(load_dirs([tmp_path]))
    assert any("behaviour.triggers[0].enable.CLEAR: 'CLEAR' is on no pin of DIP-8" in m for m in msgs), msgs


def test_part_number_claimed_by_two_families(tmp_path):
    write_family(tmp_path, "TEST1", part_numbers=["TEST1", "SHARED9"])
    write_family(tmp_path, "TEST2", file="test2.yaml", part_numbers=["TEST2", "SHARED9"])
    msgs = _msgs(load_dirs([tmp_path]))
    assert any("'SHARED9' is listed by 2 families" in m for m in msgs), msgs


def test_invalid_yaml_gives_a_line(tmp_path):
    (tmp_path / "broken.yaml").write_text("id: X\n  title: [unclosed\n", encoding="utf-8")
    msgs = _msgs(load_dirs([tmp_path]))
    assert any(m.startswith("catalog/broken.yaml: line") and "not valid YAML" in m for m in msgs), msgs


def test_later_folder_overrides_by_id(tmp_path):
    a, b = tmp_path / "a", tmp_path / "b"
    a.mkdir(), b.mkdir()
    write_family(a)
    write_family(b, title="Overridden")
    cat = load_dirs([a, b])
    assert cat.problems == [] and cat.get("TEST1").title == "Overridden"


def test_require_clean_raises_data_error(tmp_path):
    write_family(tmp_path, text="- just a list\n")
    with pytest.raises(DataError) as exc:
        require_clean(load_dirs([tmp_path]))
    assert exc.value.exit_code == 1
    assert "expected a mapping of family fields" in exc.value.render()


def test_catalog_check_command_lists_problems(tmp_path, capsys):
    from advisor.cli.main import main

    bad = family_dict()
    bad["supply"]["absolute_max"]["source"] = "nowhere"
    write_family(tmp_path, text=__import__("yaml").safe_dump(bad))
    rc = main(["catalog", "check", "--catalog", str(tmp_path)])
    out = capsys.readouterr().out
    assert rc == 1
    assert "unknown source 'nowhere'" in out and "problem(s)" in out


def test_a_family_without_part_to_part_spread_is_a_catalog_error(tmp_path):
    # Every family records a non-zero spread (catalog/README.md); zero spread shrinks the band
    # to the R and C tolerances alone.
    from support.minicat import _BASE as FAMILY

    import copy

    data = copy.deepcopy(FAMILY)
    data["timing"].pop("spread")
    import yaml

    (tmp_path / "test1.yaml").write_text(yaml.safe_dump(data), encoding="utf-8")
    cat = load_dirs([tmp_path])
    assert any(p.path == "timing.spread" for p in cat.problems)


def test_a_family_listing_20000_part_numbers_loads_and_resolves(tmp_path):
    """A user folding an approved-parts list into one family (issue 18): every listed
    number resolves to it, a repeated number is still named once, and another family's
    number is still refused. Speed is measured in tests/bench/catalog_20k_parts.py."""
    from advisor.resources import data_dir
    from support.big_family import FAMILY_ID, big_family_numbers, write_big_family

    numbers = write_big_family(tmp_path, 20_000)
    cat = load_dirs([data_dir("catalog"), tmp_path])
    assert _msgs(cat) == []
    assert len(cat.get(FAMILY_ID).part_numbers) == 20_000
    for pn in (numbers[0], numbers[12_345], numbers[-1].lower(), f" {numbers[999]} "):
        assert cat.resolve(pn).id == FAMILY_ID, pn
    assert cat.resolve("NE555P").id == "NE555"  # the shipped families are untouched

    text = (tmp_path / "xb555.yaml").read_text(encoding="utf-8")
    dup = big_family_numbers(20_000)[17]
    (tmp_path / "xb555.yaml").write_text(text.replace("part_numbers: [", f"part_numbers: [{dup}, NE555, "),
                                         encoding="utf-8")
    msgs = _msgs(load_dirs([data_dir("catalog"), tmp_path]))
    assert sum(f"{dup!r} listed twice" in m for m in msgs) == 1, msgs
    assert any("'NE555' is listed by 2 families" in m for m in msgs), msgs
