"""BOM review: every row comes back, in order, whatever the file looks like.

The BOM files here are built by the tests (they are test fixtures, not claims about
real boards); the part numbers are real catalog forms (SN74LS221N, NE555P, ...).
"""

from __future__ import annotations

import csv
import json
import subprocess
import sys
from pathlib import Path

import pytest

from advisor.bom.review import ADDED_COLUMNS, review_bom
from advisor.bom.table import locate_columns, read_table
from advisor.bom.write import write_bom
from advisor.catalog import load_catalog
from advisor.errors import InputError

ROOT = Path(__file__).resolve().parents[1]


def run_cli(*args: str) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "advisor", *args], capture_output=True, text=True, cwd=ROOT)


@pytest.fixture(scope="module")
def catalog():
    return load_catalog()


def write_csv(path: Path, rows: list[list[str]], *, delimiter=",", encoding="utf-8", newline="\n") -> Path:
    text = "".join(delimiter.join(r) + newline for r in rows)
    path.write_bytes(text.encode(encoding))
    return path


MIXED = [
    ["Ref", "Qty", "Manufacturer Part Number", "Description"],
    ["U1", "1", "SN74LS221N", "dual one-shot"],
    ["R1", "4", "CRCW060310K0FKEA", "resistor 10k"],
    ["U2", "1", "NE555P", "timer"],
    ["", "", "", ""],
    ["U3", "1", "", "part number missing"],
    ["C1", "2", "GRM188R71H103KA01D", "capacitor 10n"],
    ["U4"],  # a short (ragged) row
    ["U5", "1", "CD4538BE", "dual one-shot"],
]


def test_mixed_bom_keeps_every_row_in_order(tmp_path, catalog):
    src = write_csv(tmp_path / "bom.csv", MIXED)
    res = review_bom(read_table(src), catalog)
    assert [r.index for r in res.reviews] == list(range(1, len(MIXED)))
    by_ref = {MIXED[r.index][0]: r for r in res.reviews if MIXED[r.index] and MIXED[r.index][0]}
    assert by_ref["U1"].status == "reviewed" and by_ref["U1"].family == "74LS221"
    assert by_ref["U2"].family == "NE555"
    assert by_ref["U5"].family == "CD4538B"
    assert by_ref["R1"].status == "out-of-scope"
    assert by_ref["U3"].status == "no-part-number"
    assert by_ref["U4"].status == "unreadable" and "cells" in by_ref["U4"].reason
    assert by_ref["U1"].alternates, "a timer line gets alternates"
    out = write_bom(res, tmp_path / "out.csv")
    rows = list(csv.reader(out.read_text(encoding="utf-8").splitlines()))
    assert len(rows) == len(MIXED)
    assert rows[0][: len(MIXED[0])] == MIXED[0]
    assert rows[0][len(MIXED[0]) :] == list(ADDED_COLUMNS)
    for original, written in zip(MIXED[1:], rows[1:]):
        assert written[: len(original)] == original  # original cells untouched


def test_cp1252_semicolon_file_with_preamble(tmp_path, catalog):
    rows = [["Project bench counter rev B"], ["exported by hand"], ["Pos", "Part Number", "C", "Note"],
            ["1", "MC14538BCP", "10 µF", "Cext µ sign in cp1252"], ["2", "TLC555CDR", "", ""]]
    src = write_csv(tmp_path / "bom.csv", rows, delimiter=";", encoding="cp1252", newline="\r\n")
    table = read_table(src)
    assert table.delimiter == ";" and table.encoding == "cp1252"
    assert table.header_row == 2
    res = review_bom(table, catalog)
    assert [r.family for r in res.reviews] == ["CD4538B", "TLC555"]
    out = write_bom(res, tmp_path / "out.json")
    data = json.loads(out.read_text(encoding="utf-8"))
    assert data["preamble"] == [["Project bench counter rev B"], ["exported by hand"]]
    assert data["rows"][0]["cells"]["C"] == "10 µF"


def test_utf8_bom_and_duplicated_headers(tmp_path, catalog):
    rows = [["MPN", "MPN", "Qty"], ["SN74121N", "74LS221", "1"]]
    src = write_csv(tmp_path / "bom.csv", rows, encoding="utf-8-sig")
    table = read_table(src)
    assert table.header[0] == "MPN"  # byte-order mark stripped
    cols = locate_columns(table)
    assert cols.part == 0 and cols.duplicate_part_headers == (1,)
    res = review_bom(table, catalog)
    assert res.reviews[0].family == "74121"
    data = res.to_json()
    assert set(data["rows"][0]["cells"]) == {"MPN", "MPN (2)", "Qty"}


def test_no_part_column_is_a_clear_error(tmp_path):
    src = write_csv(tmp_path / "bom.csv", [["Ref", "Qty"], ["U1", "1"]])
    with pytest.raises(InputError, match="no part-number column found.*'Ref', 'Qty'.*--part-column"):
        locate_columns(read_table(src))


def test_named_part_column(tmp_path, catalog):
    src = write_csv(tmp_path / "bom.csv", [["Ref", "Chip"], ["U1", "NE555P"]])
    res = review_bom(read_table(src), catalog, part_column="Chip")
    assert res.reviews[0].family == "NE555"
    with pytest.raises(InputError, match="'Nope' is not a header.*'Ref', 'Chip'"):
        review_bom(read_table(src), catalog, part_column="Nope")


def test_bad_value_cell_keeps_the_row_with_its_reason(tmp_path, catalog):
    src = write_csv(tmp_path / "bom.csv", [["MPN", "Rext", "Cext"], ["SN74LS221N", "ten k", "10n"]])
    res = review_bom(read_table(src), catalog)
    assert res.reviews[0].status == "unreadable"
    assert "'ten k'" in res.reviews[0].reason


@pytest.mark.parametrize("ext", [".csv", ".xlsx", ".json", ".md"])
def test_every_output_format_has_every_row(tmp_path, catalog, ext):
    src = write_csv(tmp_path / "bom.csv", MIXED)
    res = review_bom(read_table(src), catalog)
    out = write_bom(res, tmp_path / f"out{ext}")
    if ext == ".csv":
        assert len(list(csv.reader(out.read_text(encoding="utf-8").splitlines()))) == len(MIXED)
    elif ext == ".xlsx":
        back = read_table(out)
        assert len(back.rows) == len(MIXED) and back.rows[1][2] == "SN74LS221N"
    elif ext == ".json":
        assert len(json.loads(out.read_text())["rows"]) == len(MIXED) - 1
    else:
        text = out.read_text()
        assert text.count("\n| ") >= len(MIXED) - 1 and "SN74LS221N" in text


def test_xlsx_input(tmp_path, catalog):
    import pandas as pd

    src = tmp_path / "bom.xlsx"
    pd.DataFrame([["U1", "SN74LS221N"], ["U2", "LM555CN"]], columns=["Ref", "Part No."]).to_excel(src, index=False)
    res = review_bom(read_table(src), catalog)
    assert [r.family for r in res.reviews] == ["74LS221", "NE555"]


def test_input_is_never_overwritten(tmp_path, catalog):
    src = write_csv(tmp_path / "bom.csv", MIXED)
    before = src.read_bytes()
    res = review_bom(read_table(src), catalog)
    with pytest.raises(InputError, match="refusing to overwrite"):
        write_bom(res, src)
    assert src.read_bytes() == before


def test_cli_bom_round_trip_and_errors(tmp_path):
    src = write_csv(tmp_path / "bom.csv", MIXED)
    out = tmp_path / "reviewed.csv"
    done = run_cli("bom", str(src), "-o", str(out), "--new-vcc", "3.3")
    assert done.returncode == 0, done.stderr
    assert "summary:" in done.stdout and out.exists()
    bad = run_cli("bom", str(tmp_path / "missing.csv"))
    assert bad.returncode == 2 and bad.stderr.count("\n") == 1 and "not found" in bad.stderr
    nocol = write_csv(tmp_path / "nocol.csv", [["a", "b"], ["1", "2"]])
    bad = run_cli("bom", str(nocol))
    assert bad.returncode == 2 and "Traceback" not in bad.stderr and "--part-column" in bad.stderr


def test_parallel_review_equals_the_single_process_one(tmp_path, catalog):
    """Property: the process pool changes the speed, never the answer."""
    rows = [["MPN", "Rext", "Cext", "VCC"]]
    parts = ["SN74LS221N", "NE555P", "CD4538BE", "74HC123PW"]
    for i, part in enumerate(parts * 8):
        rows.append([part, ["10k", "22k", "47k", "100k"][i % 4], ["10n", "100n"][i % 2], ["5", "12"][(i // 4) % 2]])
    src = write_csv(tmp_path / "bom.csv", rows)
    one = review_bom(read_table(src), catalog, workers=1)
    two = review_bom(read_table(src), catalog, workers=2)
    assert [r.to_json() for r in one.reviews] == [r.to_json() for r in two.reviews]
