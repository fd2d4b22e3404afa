"""Write a reviewed BOM: CSV, XLSX, JSON or Markdown by the output's extension.

Every input row comes back in order with its original cells untouched and the
review's columns added. The file is written to a temporary name in the same
folder and moved into place, so a failure never leaves half a file, and the
input is never overwritten.
"""

from __future__ import annotations

import csv
import io
import json
import os
import tempfile
from pathlib import Path

from advisor.bom.review import ADDED_COLUMNS, BomResult
from advisor.errors import InputError

FORMATS = (".csv", ".xlsx", ".json", ".md")


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


def write_bom(res: BomResult, out: str | Path) -> Path:
    path = Path(out)
    ext = path.suffix.lower()
    if ext not in FORMATS:
        raise InputError(f"cannot write {path.name!r}", got=str(path), expected="an output ending in " + ", ".join(FORMATS))
    if path.exists() and path.resolve() == res.table.path.resolve():
        raise InputError(f"refusing to overwrite the input {path.name!r}; choose another output name")
    if ext == ".xlsx":
        data = _xlsx(res)
    elif ext == ".json":
        data = (json.dumps(res.to_json(), ensure_ascii=False, indent=1) + "\n").encode("utf-8")
    elif ext == ".md":
        data = _markdown(res).encode("utf-8")
    else:
        buf = io.StringIO()
        csv.writer(buf, lineterminator="\n").writerows(output_rows(res))
        data = buf.getvalue().encode("utf-8")
    _atomic_write(path, data)
    return path


def _atomic_write(path: Path, data: bytes) -> None:
    folder = path.parent if str(path.parent) else Path(".")
    if not folder.is_dir():
        raise InputError(f"output folder {str(folder)!r} does not exist")
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", dir=folder)
    try:
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
        os.replace(tmp, path)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise


def _xlsx(res: BomResult) -> bytes:
    import pandas as pd  # heavy: only when writing a workbook

    rows = output_rows(res)
    width = max(len(r) for r in rows)
    frame = pd.DataFrame([r + [""] * (width - len(r)) for r in rows])
    buf = io.BytesIO()
    frame.to_excel(buf, header=False, index=False, sheet_name="review")
    return buf.getvalue()


def _md_cell(text: str) -> str:
    return str(text).replace("|", "\\|").replace("\n", " ")


def _markdown(res: BomResult) -> str:
    rows = output_rows(res)
    t = res.table
    lines = [f"# BOM review: {t.path.name}", ""]
    if res.new_vcc:
        lines += [f"New supply: {res.new_vcc:g} V", ""]
    lines += ["| status | lines |", "|---|---|"]
    lines += [f"| {k} | {v} |" for k, v in res.summary.items()]
    lines.append("")
    pre = rows[: t.header_row]
    if pre:
        lines += ["Lines before the header (kept as read):", ""]
        lines += ["    " + " ".join(r) for r in pre]
        lines.append("")
    header, body = rows[t.header_row], rows[t.header_row + 1 :]
    width = len(header)
    lines.append("| " + " | ".join(_md_cell(h) or " " for h in header) + " |")
    lines.append("|" + "---|" * width)
    for r in body:
        r = r + [""] * (width - len(r))
        lines.append("| " + " | ".join(_md_cell(c) for c in r) + " |")
    return "\n".join(lines) + "\n"
