"""Write a reviewed BOM: CSV, XLSX, JSON or Markdown by the output's extension.

Every input row comes back in order with its original cells and the review's columns
added. What the written file keeps and guards:

- CSV keeps the input's delimiter, encoding, byte-order mark and line ending (a
  workbook input gives UTF-8 with commas). A character the input's encoding cannot
  hold (``Ω`` in Windows-1252) is written as its ASCII spelling (``Ohm``).
- Cells a spreadsheet would run as a formula (leading ``=``, ``+``, ``-``, ``@``, tab or
  carriage return, OWASP's CSV-injection list; common practice) are written as text:
  in CSV with a leading apostrophe, in XLSX as string cells. Plain numbers (``-5``,
  ``+3.3``) are left alone.
- XLSX writes numbers as numbers: the cells the input workbook stored as numbers, and
  for a text input the cells that are plain decimal numbers.
- Markdown escapes HTML (``<``, ``>``, ``&``) so a cell cannot become markup.
- The file is written by :func:`advisor.files.atomic_write` (temporary file in the
  same folder, fsync, rename, mode from the umask); the input is never overwritten.
"""

from __future__ import annotations

import codecs
import csv
import io
import json
import re
from pathlib import Path

from advisor.bom.review import ADDED_COLUMNS, BomResult
from advisor.errors import InputError
from advisor.files import atomic_write

FORMATS = (".csv", ".xlsx", ".json", ".md")

#: First characters that make a spreadsheet treat a cell as a formula (OWASP, CSV injection).
FORMULA_STARTS = ("=", "+", "-", "@", "\t", "\r")
_PLAIN_NUMBER = re.compile(r"^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$")
_XLSX_NUMBER = re.compile(r"^-?(?:0|[1-9]\d{0,14})(?:\.\d+)?(?:[eE][+-]?\d+)?$")
_ASCII = {"Ω": "Ohm", "µ": "u", "μ": "u", "→": "->", "…": "...", "—": "-", "–": "-", "±": "+/-", "≥": ">=", "≤": "<=",
          "×": "x", "°": "deg"}


def _fallback(err: UnicodeEncodeError):
    bad = err.object[err.start:err.end]
    return "".join(_ASCII.get(ch, "?") for ch in bad), err.end


codecs.register_error("retime-ascii", _fallback)


def is_formula_like(text: str) -> bool:
    """True when a spreadsheet opening the file would run ``text`` as a formula."""
    return bool(text) and text.startswith(FORMULA_STARTS) and not _PLAIN_NUMBER.match(text.strip())


def defuse(text: str) -> str:
    """``text`` as a CSV cell a spreadsheet reads as text (a leading apostrophe)."""
    return "'" + text if is_formula_like(text) else text


def output_rows(res: BomResult) -> list[list[str]]:
    """All rows of the output table: preamble as-is, header + added names, data + added cells."""
    t = res.table
    width = t.width
    out: list[list[str]] = [list(r) for r in t.rows[: t.header_row]]
    header = list(t.header) + [""] * (width - len(t.header))
    out.append(header + list(ADDED_COLUMNS))
    for rev in res.reviews:
        cells = list(t.rows[rev.index])
        cells += [""] * (width - len(cells))
        out.append(cells + rev.added_cells())
    return out


def _same_file(a: Path, b: Path) -> bool:
    try:
        if a.exists() and b.exists():
            return a.samefile(b)
    except OSError:
        pass
    return a.resolve() == b.resolve()


def write_bom(res: BomResult, out: str | Path, what: str = "-o") -> Path:
    """Write the reviewed BOM to ``out``; ``what`` names the output in errors (the flag, or
    the workbench's own words)."""
    path = Path(out)
    ext = path.suffix.lower()
    if ext not in FORMATS:
        raise InputError(f"cannot write {path.name!r}", got=str(path), expected="an output ending in " + ", ".join(FORMATS))
    if _same_file(path, res.table.path):
        raise InputError(f"refusing to overwrite the input {path.name!r}; choose another output name")
    if ext == ".xlsx":
        data = _xlsx(res)
    elif ext == ".json":
        data = (json.dumps(res.to_json(), ensure_ascii=False, indent=1) + "\n").encode("utf-8")
    elif ext == ".md":
        data = _markdown(res).encode("utf-8")
    else:
        data = _csv(res)
    return atomic_write(path, data, what=what)


def _csv(res: BomResult) -> bytes:
    t = res.table
    text_input = t.delimiter != "xlsx"
    delim = t.delimiter if text_input and len(t.delimiter) == 1 else ","
    ending = t.line_ending if text_input else "\n"
    encoding = t.encoding if text_input else "utf-8"
    buf = io.StringIO()
    csv.writer(buf, delimiter=delim, lineterminator=ending).writerows(
        [defuse(c) for c in row] for row in output_rows(res))
    return t.mark + buf.getvalue().encode(encoding, errors="retime-ascii")


def _xlsx(res: BomResult) -> bytes:
    from openpyxl import Workbook  # only when writing a workbook

    t = res.table
    rows = output_rows(res)
    pre = t.header_row + 1  # output rows before the data (preamble and header) match the input's
    score_col = t.width + ADDED_COLUMNS.index("retime_score")
    wb = Workbook()
    ws = wb.active
    ws.title = "review"
    for r, row in enumerate(rows):
        src = r if r < pre else res.reviews[r - pre].index
        for c, text in enumerate(row):
            if text == "":
                continue
            cell = ws.cell(row=r + 1, column=c + 1)
            if _numeric(t, src, c, text, r >= pre and c == score_col):
                cell.value = float(text) if any(ch in text for ch in ".eE") else int(text)
            else:
                cell.value = text
                cell.data_type = "s"  # a string cell, never a formula, whatever it starts with
    buf = io.BytesIO()
    wb.save(buf)
    return buf.getvalue()


def _numeric(t, row: int, col: int, text: str, added_number: bool) -> bool:
    if not _XLSX_NUMBER.match(text):
        return False
    if added_number:
        return True
    if t.delimiter == "xlsx":
        return (row, col) in t.numeric
    return col < t.width and row > t.header_row


def _md_cell(text: str) -> str:
    return (str(text).replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")
            .replace("|", "\\|").replace("\r", " ").replace("\n", " "))


def _markdown(res: BomResult) -> str:
    rows = output_rows(res)
    t = res.table
    lines = [f"# BOM review: {_md_cell(t.path.name)}", ""]
    if t.sheet:
        lines += [f"Sheet read: {_md_cell(t.sheet)}", ""]
    if res.new_vcc:
        lines += [f"New supply: {res.new_vcc:g} V", ""]
    lines += ["| status | lines |", "|---|---|"]
    lines += [f"| {k} | {v} |" for k, v in res.summary.items()]
    lines.append("")
    if res.assumptions:  # e.g. a shipped family or rule replaced by a user folder (advisor.overrides)
        lines += [f"- assumed: {_md_cell(a)}" for a in res.assumptions] + [""]
    pre = rows[: t.header_row]
    if pre:
        lines += ["Lines before the header (kept as read):", ""]
        lines += ["    " + " ".join(r).replace("\r", " ").replace("\n", " ") for r in pre]
        lines.append("")
    header, body = rows[t.header_row], rows[t.header_row + 1 :]
    width = len(header)
    lines.append("| " + " | ".join(_md_cell(h) or " " for h in header) + " |")
    lines.append("|" + "---|" * width)
    for r in body:
        r = r + [""] * (width - len(r))
        lines.append("| " + " | ".join(_md_cell(c) for c in r) + " |")
    return "\n".join(lines) + "\n"
