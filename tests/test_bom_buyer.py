"""BOM review for a buyer: the same ranking as alternates, lifecycle statuses, new-value
columns, typo matches offered for confirmation, parts of other kinds told apart from
part numbers nothing reads, and findings tied to the reference designator.

The BOM here is a test fixture built by the test (real catalog part-number forms).
"""

from __future__ import annotations

from pathlib import Path

import pytest

from advisor.bom.review import ADDED_COLUMNS, review_bom
from advisor.bom.table import read_table
from advisor.catalog import load_catalog

ROWS = [
    ["Ref", "MPN", "R", "C"],
    ["U1", "SN74121N", "39k", "3.3u"],
    ["U2", "DM74LS123N", "47k", "100n"],
    ["U3", "DM9602N", "22k", "1u"],
    ["U4", "74HC125D", "", ""],
    ["U5", "XYZ-9", "", ""],
    ["U6", "74HC1223N", "", ""],
    ["U7", "CD4538BE", "100k", "100n"],
]


@pytest.fixture(scope="module")
def cat():
    return load_catalog()


@pytest.fixture(scope="module")
def reviewed(cat, tmp_path_factory):
    path = tmp_path_factory.mktemp("bom") / "buyer.csv"
    path.write_text("".join(",".join(r) + "\n" for r in ROWS), encoding="utf-8")
    return review_bom(read_table(path), cat)


def _by_ref(res):
    return {r.ref: r for r in res.reviews}


def test_no_best_alternate_is_obsolete_while_an_active_one_exists(reviewed, cat):
    for rev in reviewed.reviews:
        if rev.status in ("reviewed", "check-match") and rev.best_alternate:
            assert rev.best_status != "obsolete", rev  # issue 14 done-when
            assert cat.get(rev.best_alternate).status != "obsolete"


def test_part_and_best_alternate_status_columns(reviewed):
    u1 = _by_ref(reviewed)["U1"]
    assert u1.part_status == "obsolete"  # catalog/74121.yaml lifecycle block
    assert u1.best_status == "active"
    assert {"retime_part_status", "retime_best_status", "retime_new_r", "retime_new_c"} <= set(ADDED_COLUMNS)


def test_the_lines_own_values_are_used_and_named(reviewed):
    assert reviewed.value_columns["r"] == "R" and reviewed.value_columns["c"] == "C"
    # CD4538B 100k/100n at 5 V → the best alternate keeps the width within the old band
    # (CD4538BC PW = R·C = 10 ms; a drop-in 74HC4538 needs 0.7·R·C: 150k E24 → 10.5 ms).
    u7 = _by_ref(reviewed)["U7"]
    assert u7.best_alternate
    if u7.new_values:
        assert set(u7.new_values) <= {"r", "ra", "rb", "c"}
        cells = u7.added_cells()
        assert cells[ADDED_COLUMNS.index("retime_new_r")] or cells[ADDED_COLUMNS.index("retime_new_c")]


def test_typo_is_check_match_with_its_suggestion(reviewed):
    u6 = _by_ref(reviewed)["U6"]
    assert u6.status == "check-match" and u6.suggestion == "74HC123"  # a doubled digit of 74HC123
    assert "typo" in u6.reason


def test_a_part_of_another_kind_is_told_apart_from_an_unrecognised_number(reviewed):
    by = _by_ref(reviewed)
    assert by["U4"].status == "out-of-scope" and "logic" in by["U4"].reason  # 74HC125: a quad buffer
    assert by["U5"].status == "not-recognised"


def test_json_rows_carry_the_reference_designator(reviewed):
    rows = reviewed.to_json()["rows"]
    assert [r["ref"] for r in rows] == [r[0] for r in ROWS[1:]]
    assert reviewed.to_json()["value_columns"]["c"] == "C"


def test_report_findings_name_the_line(reviewed, cat):
    from advisor.report.model import build_report

    rep = build_report(reviewed.to_json(), "bom", cat)
    refs = tuple(f"{r[0]}: " for r in ROWS[1:])
    assert rep.findings and all(f.message.startswith(refs) for f in rep.findings)


def test_stock_on_a_bom(cat, tmp_path):
    from advisor.substitute.stock import read_stock

    shelf = tmp_path / "shelf.csv"
    shelf.write_text("SN74HCT221N\n", encoding="utf-8")  # a bare list, no header
    path = tmp_path / "one.csv"
    path.write_text("Ref,MPN,R,C\nU1,SN74121N,39k,3.3u\n", encoding="utf-8")
    res = review_bom(read_table(path), cat, stock=read_stock(shelf, cat))
    alts = res.reviews[0].alternates
    # 74HC221 and 74HCT221 are equal on every ranked criterion (+1.0 % each): the stocked one first.
    fams = [a["family"] for a in alts]
    assert "74HCT221" in fams and alts[fams.index("74HCT221")]["in_stock"] == "SN74HCT221N"
    if "74HC221" in fams:
        assert fams.index("74HCT221") < fams.index("74HC221")
