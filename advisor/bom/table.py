"""Read a bill of materials into a plain table without losing a row.

CSV is read with the standard library (rows of any length are kept as they are):
the encoding is tried as UTF-8 (with or without a byte-order mark), then cp1252,
then latin-1; line endings are normalised before sniffing; the delimiter is
settled by counting candidates on the header line. XLSX is read with pandas
(openpyxl) as text. Practical notes: pandas alone fails on cp1252 files and on
semicolon files (measured here), hence the manual decoding.
"""

from __future__ import annotations

import csv
import io
import re
from dataclasses import dataclass, field
from pathlib import Path

from advisor.errors import InputError

#: Header spellings that name the part-number column, normalised (lower case, no punctuation).
PART_HEADERS = (
    "mpn", "manufacturerpartnumber", "mfrpartnumber", "mfrpartno", "mfrpn", "mfgpartnumber",
    "mfgpn", "manufacturerpn", "partnumber", "partno", "pn", "part", "partnum", "device", "value",
    "component", "article", "type",
)
# Strong headers win over weak ones ("Value" or "Type" only when nothing better exists).
_STRONG = PART_HEADERS[:13]
R_HEADERS = ("r", "rext", "rt", "ra", "timingr", "timingresistor", "rtiming", "resistor")
RB_HEADERS = ("rb",)
C_HEADERS = ("c", "cext", "ct", "timingc", "timingcapacitor", "ctiming", "capacitor")
VCC_HEADERS = ("vcc", "vdd", "supply", "supplyv", "supplyvoltage", "voltage", "rail", "vsupply")


def norm_header(text: str) -> str:
    return re.sub(r"[^a-z0-9]", "", str(text).lower())


@dataclass
class Table:
    """Rows as text; ``header_row`` indexes the header inside ``rows`` (preamble kept)."""

    path: Path
    rows: list[list[str]]
    header_row: int
    delimiter: str = ","
    encoding: str = "utf-8"
    notes: list[str] = field(default_factory=list)

    @property
    def header(self) -> list[str]:
        return self.rows[self.header_row] if self.rows else []

    @property
    def width(self) -> int:
        return max((len(r) for r in self.rows), default=0)


def _decode(raw: bytes) -> tuple[str, str]:
    for enc in ("utf-8-sig", "cp1252", "latin-1"):
        try:
            return raw.decode(enc), enc
        except UnicodeDecodeError:
            continue
    raise AssertionError("latin-1 decodes every byte")  # pragma: no cover


def _delimiter(lines: list[str]) -> str:
    """The delimiter used most on the first lines that hold any (header line first)."""
    for line in lines[:30]:
        counts = {d: line.count(d) for d in (",", ";", "\t", "|")}
        best = max(counts, key=lambda d: counts[d])
        if counts[best] > 0:
            return best
    return ","


def _find_header(rows: list[list[str]]) -> int:
    """Index of the first row (of the first 30) that names a part-number column."""
    for i, row in enumerate(rows[:30]):
        names = {norm_header(c) for c in row}
        if names & set(_STRONG):
            return i
    for i, row in enumerate(rows[:30]):
        names = {norm_header(c) for c in row}
        if names & set(PART_HEADERS):
            return i
    # No known header: the first non-empty row is the header.
    for i, row in enumerate(rows):
        if any(c.strip() for c in row):
            return i
    return 0


def read_table(path: str | Path) -> Table:
    """Read CSV/TSV/TXT or XLSX by extension; raise InputError with the reason if unreadable."""
    p = Path(path)
    if not p.exists():
        raise InputError(f"BOM file {str(p)!r} not found", got=str(p))
    if p.is_dir():
        raise InputError(f"{str(p)!r} is a folder, not a BOM file", got=str(p))
    ext = p.suffix.lower()
    if ext in (".xlsx", ".xlsm"):
        return _read_xlsx(p)
    if ext == ".xls":
        raise InputError(f"{p.name}: old .xls workbooks are not read; save it as .xlsx or .csv")
    try:
        raw = p.read_bytes()
    except OSError as exc:
        raise InputError(f"cannot read {str(p)!r}: {exc.strerror}") from None
    if raw[:4] == b"PK\x03\x04":
        return _read_xlsx(p)
    text, enc = _decode(raw)
    text = text.replace("\r\n", "\n").replace("\r", "\n")
    lines = text.split("\n")
    delim = "\t" if ext == ".tsv" else _delimiter([ln for ln in lines if ln.strip()])
    rows = list(csv.reader(io.StringIO(text), delimiter=delim))
    while rows and not any(c.strip() for c in rows[-1]):
        rows.pop()  # trailing blank lines are not rows
    if not rows:
        raise InputError(f"{p.name}: the file is empty")
    return Table(p, rows, _find_header(rows), delim, enc)


def _read_xlsx(p: Path) -> Table:
    import pandas as pd  # heavy: only for workbooks

    try:
        frame = pd.read_excel(p, header=None, dtype=str, sheet_name=0, keep_default_na=False)
    except Exception as exc:  # openpyxl raises many kinds for damaged files
        raise InputError(f"{p.name}: cannot read the workbook ({type(exc).__name__}: {exc})") from None
    rows = [["" if v is None else str(v) for v in row] for row in frame.itertuples(index=False, name=None)]
    while rows and not any(c.strip() for c in rows[-1]):
        rows.pop()
    if not rows:
        raise InputError(f"{p.name}: the first sheet is empty")
    return Table(p, rows, _find_header(rows), "xlsx", "xlsx")


@dataclass(frozen=True)
class Columns:
    """Where the review's inputs sit in the table (column indexes)."""

    part: int
    r: int | None = None
    rb: int | None = None
    c: int | None = None
    vcc: int | None = None
    duplicate_part_headers: tuple[int, ...] = ()


def locate_columns(table: Table, part_column: str | None = None) -> Columns:
    """Find the part-number column by header (or by the name given) and the optional
    R, C and supply columns. Raises InputError listing the headers seen."""
    header = table.header
    names = [norm_header(h) for h in header]

    def first(cands: tuple[str, ...]) -> int | None:
        for cand in cands:
            if cand in names:
                return names.index(cand)
        return None

    if part_column is not None:
        want = norm_header(part_column)
        if part_column.isdigit() and 1 <= int(part_column) <= max(len(header), table.width):
            part = int(part_column) - 1
        elif want in names:
            part = names.index(want)
        else:
            raise InputError(
                f"--part-column {part_column!r} is not a header of {table.path.name}",
                got=part_column, expected="one of: " + ", ".join(repr(h) for h in header if h.strip()) + " (or a 1-based column number)",
            )
    else:
        part = first(_STRONG)
        if part is None:
            part = first(PART_HEADERS)
        if part is None:
            seen = ", ".join(repr(h) for h in header if h.strip()) or "none"
            raise InputError(
                f"{table.path.name}: no part-number column found (headers seen: {seen})",
                hint="name it with --part-column NAME or a 1-based column number",
            )
    dups = tuple(i for i, n in enumerate(names) if n == names[part] and i != part)
    return Columns(part, first(R_HEADERS), first(RB_HEADERS), first(C_HEADERS), first(VCC_HEADERS), dups)
