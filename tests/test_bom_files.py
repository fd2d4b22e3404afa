"""BOM files as spreadsheets and editors write them: every row back, in order, with its
reason where it has one (issue 18). The files are built here (test fixtures, not claims
about real boards); the part numbers are real catalog forms."""

from __future__ import annotations

import csv
import io
import json
import os
import stat
import subprocess
import sys
from pathlib import Path

import pytest

from advisor.bom.review import review_bom
from advisor.bom.table import read_table
from advisor.bom.write import write_bom
from advisor.catalog import load_catalog
from advisor.errors import InputError

ROOT = Path(__file__).resolve().parents[1]


def run_cli(*args: str, umask: int | None = None) -> subprocess.CompletedProcess:
    pre = (lambda: os.umask(umask)) if umask is not None else None
    return subprocess.run([sys.executable, "-m", "advisor", *args], capture_output=True, text=True, cwd=ROOT,
                          preexec_fn=pre, timeout=300)


@pytest.fixture(scope="module")
def catalog():
    return load_catalog()


def refs(table, res) -> list[str]:
    return [table.rows[r.index][0] for r in res.reviews]


def test_a_stray_quote_is_a_located_row_not_a_merge(tmp_path, catalog):
    src = tmp_path / "bom.csv"
    src.write_text("Ref,MPN,Note\n"
                   "U1,SN74LS221N,one-shot\n"
                   'U2,"NE555P,timer with a stray quote\n'
                   "U3,CD4538BE,dual one-shot\n"
                   'U4,NE555P,"a note, with a comma"\n'
                   "U5,TLC555CDR,last\n", encoding="utf-8")
    table = read_table(src)
    res = review_bom(table, catalog)
    assert refs(table, res) == ["U1", "U2", "U3", "U4", "U5"]  # every row, in order
    by = {table.rows[r.index][0]: r for r in res.reviews}
    assert by["U2"].status == "unreadable"
    assert "line 3" in by["U2"].reason and "never closed" in by["U2"].reason
    assert by["U3"].family == "CD4538B" and by["U4"].family == "NE555" and by["U5"].status == "reviewed"
    assert table.rows[by["U4"].index][2] == "a note, with a comma"


def test_a_quoted_cell_over_two_lines_is_one_cell(tmp_path, catalog):
    src = tmp_path / "bom.csv"
    src.write_text('Ref,MPN,Note\nU1,NE555P,"first line\nsecond line"\nU2,CD4538BE,x\n', encoding="utf-8")
    table = read_table(src)
    assert table.rows[1] == ["U1", "NE555P", "first line\nsecond line"]
    assert table.line_of(2) == 4 and not table.row_problems


def test_a_cell_holding_only_a_line_break_is_one_row(tmp_path, catalog):
    """What Python's csv writer makes of a cell that is a line break: the closing line
    looks like a row of its own, but it closes the cell and completes the row's width
    (found by tests/test_fuzz_inputs.py)."""
    src = tmp_path / "bom.csv"
    buf = io.StringIO(newline="")
    csv.writer(buf).writerows([["Part", "R", "C", "Supply"], ["\n", "1.5", "1.5", "1.5"], ["NE555P", "10k", "10n", "5"]])
    src.write_text(buf.getvalue(), encoding="utf-8")
    table = read_table(src)
    assert table.rows[1:] == [["\n", "1.5", "1.5", "1.5"], ["NE555P", "10k", "10n", "5"]]
    assert not table.row_problems and len(review_bom(table, catalog).reviews) == 2


def test_utf16_unicode_text_with_its_mark(tmp_path, catalog):
    """A spreadsheet's "Unicode text": UTF-16 LE with a byte-order mark, tab-separated."""
    text = "Ref\tPart Number\tC\r\nU1\tSN74LS221N\t10 µF\r\nU2\tNE555P\t\r\nR1\tCRCW060310K0FKEA\t\r\n"
    src = tmp_path / "bom.txt"
    src.write_bytes(b"\xff\xfe" + text.encode("utf-16-le"))
    table = read_table(src)
    assert table.encoding == "utf-16-le" and table.delimiter == "\t" and table.mark == b"\xff\xfe"
    res = review_bom(table, catalog)
    assert refs(table, res) == ["U1", "U2", "R1"]
    assert [r.family for r in res.reviews[:2]] == ["74LS221", "NE555"]
    out = write_bom(res, tmp_path / "out.csv")
    raw = out.read_bytes()
    assert raw.startswith(b"\xff\xfe")  # the mark and the encoding are kept
    back = raw[2:].decode("utf-16-le")
    assert back.count("\r\n") == 4 and back.split("\r\n")[1].split("\t")[:3] == ["U1", "SN74LS221N", "10 µF"]


def test_cp1252_semicolon_output_keeps_encoding_and_delimiter(tmp_path, catalog):
    src = tmp_path / "bom.csv"
    src.write_bytes("Pos;Part Number;C\n1;MC14538BCP;10 µF\n".encode("cp1252"))
    res = review_bom(read_table(src), catalog)
    raw = write_bom(res, tmp_path / "out.csv").read_bytes()
    text = raw.decode("cp1252")  # would fail if written as UTF-8 (µ is two bytes there)
    assert text.splitlines()[1].split(";")[:3] == ["1", "MC14538BCP", "10 µF"]


def _workbook(path: Path, sheets: dict[str, list[list[object]]], merge: dict[str, list[str]] | None = None) -> Path:
    from openpyxl import Workbook

    wb = Workbook()
    wb.remove(wb.active)
    for name, rows in sheets.items():
        ws = wb.create_sheet(name)
        for row in rows:
            ws.append(row)
        for rng in (merge or {}).get(name, []):
            ws.merge_cells(rng)
    wb.save(path)
    return path


def test_merged_cells_read_as_their_anchor(tmp_path, catalog):
    src = _workbook(tmp_path / "bom.xlsx", {"BOM": [
        ["Ref", "MPN", "Qty"],
        ["U1", "NE555P", 1],
        ["U2", None, 1],  # B2:B3 merged: U2 is an NE555P too
        ["U3", "CD4538BE", 2],
    ]}, merge={"BOM": ["B2:B3"]})
    table = read_table(src)
    res = review_bom(table, catalog)
    assert refs(table, res) == ["U1", "U2", "U3"]
    assert [r.family for r in res.reviews] == ["NE555", "NE555", "CD4538B"]


def test_a_later_sheet_with_the_bom_is_read_and_named(tmp_path, catalog):
    src = _workbook(tmp_path / "bom.xlsx", {
        "Notes": [["Bench counter, rev B"], ["see the next sheet"]],
        "Parts": [["Ref", "Part No."], ["U1", "SN74LS221N"], ["U2", "LM555CN"]],
    })
    table = read_table(src)
    assert table.sheet == "Parts" and table.sheets == ("Notes", "Parts")
    res = review_bom(table, catalog)
    assert [r.family for r in res.reviews] == ["74LS221", "NE555"]
    done = run_cli("bom", str(src))
    assert done.returncode == 0, done.stderr
    assert "sheet 'Parts'" in done.stdout.splitlines()[0]
    assert json.loads(run_cli("bom", str(src), "--json").stdout)["sheet"] == "Parts"
    notes = run_cli("bom", str(src), "--sheet", "Notes")
    assert notes.returncode == 2 and "no part-number column" in notes.stderr
    missing = run_cli("bom", str(src), "--sheet", "Nope")
    assert missing.returncode == 2 and "'Notes', 'Parts'" in missing.stderr


def test_a_row_that_breaks_the_engine_comes_back_with_its_reason(tmp_path, catalog):
    """R = 0 in a 555 (the law divides by the timing resistance): that row gets a
    reason, the rows around it are reviewed."""
    src = tmp_path / "bom.csv"
    src.write_text("Ref,MPN,R,C,VCC\nU1,NE555P,10k,10n,5\nU2,NE555P,0,10n,5\nU3,CD4538BE,100k,10n,5\n",
                   encoding="utf-8")
    table = read_table(src)
    res = review_bom(table, catalog)
    assert refs(table, res) == ["U1", "U2", "U3"]
    u1, u2, u3 = res.reviews
    assert u1.status == "reviewed" and u1.alternates
    assert u2.reason, "the R = 0 row says why it was not judged"
    assert u3.status == "reviewed" and u3.family == "CD4538B"
    done = run_cli("bom", str(src), "--json")
    assert done.returncode == 0, done.stderr
    assert [row["line"] for row in json.loads(done.stdout)["rows"]] == [2, 3, 4]


FORMULAS = [
    ["Ref", "MPN", "Note", "Qty"],
    ["U1", "NE555P", '=HYPERLINK("http://example.invalid/x","open")', "1"],
    ["U2", "SN74LS221N", "@SUM(1,2)", "-5"],
    ["U3", "CD4538BE", "+1+1", "2"],
    ["U4", "TLC555CDR", "-2+3", "3"],
    ["U5", "NE555P", "<script>alert(1)</script>", "1"],
]


def _formula_bom(tmp_path: Path) -> Path:
    src = tmp_path / "bom.csv"
    buf = io.StringIO()
    csv.writer(buf, lineterminator="\n").writerows(FORMULAS)
    src.write_text(buf.getvalue(), encoding="utf-8")
    return src


def test_formula_cells_are_written_as_text(tmp_path, catalog):
    table = read_table(_formula_bom(tmp_path))
    res = review_bom(table, catalog)
    assert refs(table, res) == ["U1", "U2", "U3", "U4", "U5"]
    rows = list(csv.reader(write_bom(res, tmp_path / "out.csv").read_text(encoding="utf-8").splitlines()))
    notes = [r[2] for r in rows[1:]]
    assert notes[:4] == ["'" + FORMULAS[i][2] for i in range(1, 5)]  # defused: read as text
    assert rows[2][3] == "-5"  # a plain number stays a number
    from openpyxl import load_workbook

    ws = load_workbook(write_bom(res, tmp_path / "out.xlsx")).active
    cells = {ws.cell(row=r, column=3).value: ws.cell(row=r, column=3).data_type for r in range(2, 7)}
    for i in range(1, 5):
        assert cells[FORMULAS[i][2]] == "s"  # the text as written, as a string cell, never a formula
    assert ws.cell(row=3, column=4).value == -5 and ws.cell(row=2, column=4).value == 1  # numbers stay numbers
    md = write_bom(res, tmp_path / "out.md").read_text(encoding="utf-8")
    assert "<script>" not in md and "&lt;script&gt;alert(1)&lt;/script&gt;" in md


def test_numbers_in_a_workbook_stay_numbers(tmp_path, catalog):
    src = _workbook(tmp_path / "bom.xlsx", {"BOM": [["Ref", "MPN", "Qty"], ["U1", "NE555P", 4], ["U2", "CD4538BE", 2.5]]})
    res = review_bom(read_table(src), catalog)
    from openpyxl import load_workbook

    ws = load_workbook(write_bom(res, tmp_path / "out.xlsx")).active
    assert ws.cell(row=2, column=3).value == 4 and ws.cell(row=3, column=3).value == 2.5
    assert ws.cell(row=2, column=1).value == "U1"


def test_output_and_report_may_name_neither_the_input_nor_each_other(tmp_path):
    src = _formula_bom(tmp_path)
    before = src.read_bytes()
    for args in (["-o", str(src)], ["--report", str(tmp_path / "bom.csv.md"), "-o", str(tmp_path / "bom.csv.md")],
                 ["-o", str(tmp_path / "x.md"), "--report", str(tmp_path / "x.md")]):
        done = run_cli("bom", str(src), *args)
        assert done.returncode == 2, (args, done.stderr)
        assert "Traceback" not in done.stderr
    link = tmp_path / "link.md"
    os.symlink(src, link)  # the input under another name
    done = run_cli("bom", str(src), "--report", str(link))
    assert done.returncode == 2 and "names the input" in done.stderr
    assert src.read_bytes() == before


def test_outputs_and_reports_are_0644_under_umask_022(tmp_path):
    """Issue 13: one writer, the mode an ordinary file gets (mkstemp alone gives 0600)."""
    src = _formula_bom(tmp_path)
    for ext in (".csv", ".xlsx", ".json", ".md"):
        out = tmp_path / f"out{ext}"
        report = tmp_path / f"report{ext}.html"
        done = run_cli("bom", str(src), "-o", str(out), "--report", str(report), umask=0o022)
        assert done.returncode == 0, done.stderr
        assert stat.S_IMODE(out.stat().st_mode) == 0o644, ext
        assert stat.S_IMODE(report.stat().st_mode) == 0o644
    md = tmp_path / "check.md"
    done = run_cli("check", "NE555", "--r", "10k", "--c", "10n", "--vcc", "5", "--report", str(md), umask=0o022)
    assert done.returncode == 0, done.stderr
    assert stat.S_IMODE(md.stat().st_mode) == 0o644
    leftovers = [p.name for p in tmp_path.iterdir() if p.name.startswith(".")]
    assert leftovers == []


def test_a_missing_sheet_option_on_text_is_an_input_error(tmp_path):
    src = _formula_bom(tmp_path)
    with pytest.raises(InputError, match="not a workbook"):
        read_table(src, sheet="BOM")
