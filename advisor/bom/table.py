"""Read a bill of materials into a plain table without losing or merging a row.

Delimited text (CSV, TSV, TXT):

- encoding: a byte-order mark decides (UTF-8, UTF-16 LE/BE: a spreadsheet's "Unicode
  text"); UTF-16 without a mark is recognised by its zero bytes; otherwise strict
  UTF-8, then Windows-1252, then Latin-1 (which reads any byte). The encoding, the
  mark, the delimiter and the line ending are kept so the written review matches.
- delimiter: the one of ``, ; tab |`` used most (outside quotes) on the first lines.
- quotes: each physical line is one row, except that a quoted cell may run over
  line breaks (a note typed with Alt+Enter) when it closes within
  :data:`MAX_CELL_LINES` lines and the lines it swallows do not look like rows of their
  own. A quote that opens a cell and is never closed (``U2,"NE555,timer``) does not
  swallow the rest of the file: that line comes back as written, split at each
  delimiter, with a reason naming its line (``Table.row_problems``).

Workbooks (XLSX) are read with openpyxl: every sheet is considered, the sheet asked
for (``--sheet NAME``) or else the first one with a part-number header; merged cells
read as their anchor's value; numbers are kept as numbers for the written workbook
(``Table.numeric``); a formula is read as its text (it is never evaluated).
"""

from __future__ import annotations

import csv
import io
import re
from dataclasses import dataclass, field
from pathlib import Path

from advisor.errors import InputError

#: Longest run of physical lines one quoted cell may span (common practice: a note of a
#: few lines typed into a spreadsheet cell).
MAX_CELL_LINES = 20

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
    """Rows as text; ``header_row`` indexes the header inside ``rows`` (preamble kept).

    ``row_problems`` maps a row index to the reason it could not be read as cells
    (an unclosed quote); ``line_numbers`` gives each row's first physical line (1-based)
    in a text file; ``numeric`` holds the (row, column) cells a workbook stored as
    numbers; ``sheet`` is the workbook sheet read and ``sheets`` all of them.
    """

    path: Path
    rows: list[list[str]]
    header_row: int
    delimiter: str = ","
    encoding: str = "utf-8"
    notes: list[str] = field(default_factory=list)
    mark: bytes = b""
    line_ending: str = "\n"
    row_problems: dict[int, str] = field(default_factory=dict)
    line_numbers: list[int] = field(default_factory=list)
    numeric: set[tuple[int, int]] = field(default_factory=set)
    sheet: str | None = None
    sheets: tuple[str, ...] = ()

    @property
    def header(self) -> list[str]:
        return self.rows[self.header_row] if self.rows else []

    @property
    def width(self) -> int:
        return max((len(r) for r in self.rows), default=0)

    def line_of(self, index: int) -> int:
        """The 1-based line (text) or row (workbook) where row ``index`` starts."""
        return self.line_numbers[index] if index < len(self.line_numbers) else index + 1


_MARKS = ((b"\xef\xbb\xbf", "utf-8-sig", b""), (b"\xff\xfe", "utf-16-le", b"\xff\xfe"),
          (b"\xfe\xff", "utf-16-be", b"\xfe\xff"))


def _decode(raw: bytes) -> tuple[str, str, bytes]:
    """(text, encoding, mark to write back) for the file's bytes."""
    for mark, enc, keep in _MARKS:
        if raw.startswith(mark):
            try:
                return raw[len(mark):].decode(enc.replace("-sig", "")), enc, keep
            except UnicodeDecodeError as exc:
                raise InputError(f"the file starts with a {enc.upper()} byte-order mark but byte "
                                 f"{exc.start + len(mark)} is not valid in that encoding") from None
    sample = raw[:4000]
    if len(sample) >= 4:  # UTF-16 without a mark: a zero byte beside every ASCII character
        even, odd = sample[0::2].count(0), sample[1::2].count(0)
        half = len(sample) // 2
        for enc, zeros, other in (("utf-16-le", odd, even), ("utf-16-be", even, odd)):
            if zeros > 0.4 * half and other < 0.05 * half:
                try:
                    return raw.decode(enc), enc, b""
                except UnicodeDecodeError:
                    break
    for enc in ("utf-8", "cp1252", "latin-1"):
        try:
            return raw.decode(enc), enc, b""
        except UnicodeDecodeError:
            continue
    raise AssertionError("latin-1 decodes every byte")  # pragma: no cover


def _outside_quotes(line: str) -> str:
    return re.sub(r'"[^"]*"', "", line)


def _delimiter(lines: list[str]) -> str:
    """The delimiter used most (outside quotes) on the first lines that hold any."""
    for line in lines[:30]:
        bare = _outside_quotes(line)
        counts = {d: bare.count(d) for d in (",", ";", "\t", "|")}
        best = max(counts, key=lambda d: counts[d])
        if counts[best] > 0:
            return best
    return ","


def _ends_in_quotes(text: str, delim: str) -> bool:
    """True when ``text`` ends inside a quoted cell (csv rules: a quote opens a cell only
    at its start; inside, ``""`` is a quote and a lone ``"`` closes the cell)."""
    inside = False
    at_start = True
    i, n = 0, len(text)
    while i < n:
        ch = text[i]
        if inside:
            if ch == '"':
                if i + 1 < n and text[i + 1] == '"':
                    i += 2
                    continue
                inside = False
            i += 1
            continue
        if ch == '"' and at_start:
            inside = True
        at_start = ch in (delim, "\n")
        i += 1
    return inside


def _split_lines(text: str, delim: str) -> tuple[list[list[str]], list[int], dict[int, str]]:
    """Rows, the 1-based line each starts on, and the rows that could not be read."""
    lines = text.split("\n")
    while lines and not lines[-1].strip():
        lines.pop()  # trailing blank lines are not rows
    bare_counts = [ln.count(delim) for ln in lines[:2000] if '"' not in ln and ln.strip()]
    typical = max(set(bare_counts), key=bare_counts.count) + 1 if bare_counts else 0
    rows: list[list[str]] = []
    starts: list[int] = []
    problems: dict[int, str] = {}
    i = 0
    while i < len(lines):
        line = lines[i]
        if '"' not in line:
            rows.append(line.split(delim))
            starts.append(i + 1)
            i += 1
            continue
        if not _ends_in_quotes(line, delim):
            rows.append(_csv_row(line, delim))
            starts.append(i + 1)
            i += 1
            continue
        joined, end = line, None
        for j in range(i + 1, min(len(lines), i + MAX_CELL_LINES)):
            inner = lines[j]
            candidate = joined + "\n" + inner
            closes = not _ends_in_quotes(candidate, delim)
            # A line that closes the open cell and completes a row of the usual width ends a
            # multi-line cell ('"\n",1.5,...' as csv writes a cell holding a line break) ...
            completes = closes and typical > 0 and len(_csv_row(candidate, delim)) == typical
            if typical > 2 and inner.count(delim) >= typical - 1 and not completes:
                break  # ... any other line that looks like a row of its own: the quote was a stray one
            joined = candidate
            if closes:
                end = j
                break
        cells = _csv_row(joined, delim) if end is not None else None
        if cells is not None and (typical == 0 or len(cells) <= typical):
            rows.append(cells)
            starts.append(i + 1)
            i = end + 1
            continue
        problems[len(rows)] = (f"line {i + 1}: a quote opens a cell that is never closed; "
                               f"the line is kept as written, split at each {_delim_name(delim)}")
        rows.append(line.split(delim))
        starts.append(i + 1)
        i += 1
    return rows, starts, problems


def _csv_row(text: str, delim: str) -> list[str]:
    got = list(csv.reader(io.StringIO(text, newline=""), delimiter=delim))
    return [cell for row in got for cell in row] if len(got) != 1 else got[0]


def _delim_name(delim: str) -> str:
    return {",": "comma", ";": "semicolon", "\t": "tab", "|": "bar"}.get(delim, repr(delim))


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




def read_table(path: str | Path, sheet: str | None = None) -> Table:
    """Read CSV/TSV/TXT or XLSX by extension (or content); raise InputError with the
    reason if unreadable. ``sheet`` names the workbook sheet to read."""
    from advisor.files import FileRefused, read_regular

    p = Path(path)
    if not p.exists():
        raise InputError(f"BOM file {str(p)!r} not found", got=str(p))
    if p.is_dir():
        raise InputError(f"{str(p)!r} is a folder, not a BOM file", got=str(p))
    ext = p.suffix.lower()
    if ext == ".xls":
        raise InputError(f"{p.name}: old .xls workbooks are not read; save it as .xlsx or .csv")
    try:
        raw = read_regular(p, "bom")
    except FileRefused as exc:
        raise InputError(f"BOM file {exc.message}") from None
    if ext in (".xlsx", ".xlsm") or raw[:4] == b"PK\x03\x04":
        return _read_xlsx(p, raw, sheet)
    if sheet is not None:
        raise InputError(f"--sheet {sheet!r}: {p.name} is a text file, not a workbook")
    try:
        text, enc, mark = _decode(raw)
    except InputError as exc:
        raise InputError(f"{p.name}: {exc.message}") from None
    head = text[:100_000]
    ending = "\r\n" if "\r\n" in head else ("\r" if "\r" in head else "\n")
    text = text.replace("\r\n", "\n").replace("\r", "\n")
    delim = "\t" if ext == ".tsv" else _delimiter([ln for ln in text[:200_000].split("\n") if ln.strip()])
    rows, starts, problems = _split_lines(text, delim)
    while rows and not any(c.strip() for c in rows[-1]):
        rows.pop()  # trailing rows of empty cells (",,,") are not rows either
    if not rows:
        raise InputError(f"{p.name}: the file is empty")
    return Table(p, rows, _find_header(rows), delim, enc, mark=mark, line_ending=ending,
                 row_problems=problems, line_numbers=starts)


def _cell_text(value: object) -> str:
    if value is None:
        return ""
    if isinstance(value, bool):
        return "TRUE" if value else "FALSE"
    if isinstance(value, float):
        return str(int(value)) if value.is_integer() and abs(value) < 1e15 else repr(value)
    if hasattr(value, "isoformat"):
        return value.isoformat()
    return str(value)


def _read_xlsx(p: Path, raw: bytes, want: str | None) -> Table:
    try:
        from openpyxl import load_workbook

        wb = load_workbook(io.BytesIO(raw), read_only=False, data_only=False)
    except Exception as exc:  # openpyxl raises many kinds for damaged files
        raise InputError(f"{p.name}: cannot read the workbook ({type(exc).__name__}: {str(exc)[:120]})") from None
    names = tuple(ws.title for ws in wb.worksheets)
    if want is not None:
        pick = [ws for ws in wb.worksheets if ws.title == want] or [
            ws for ws in wb.worksheets if ws.title.strip().lower() == want.strip().lower()]
        if not pick:
            raise InputError(f"--sheet {want!r}: {p.name} has no such sheet",
                             expected="one of " + ", ".join(repr(n) for n in names))
        candidates = pick[:1]
    else:
        candidates = list(wb.worksheets)
    read = [(ws, *_sheet_rows(ws)) for ws in candidates]
    chosen = next(((ws, rows, num) for ws, rows, num in read if rows and _names_part_column(rows)), None)
    if chosen is None:
        chosen = next(((ws, rows, num) for ws, rows, num in read if rows), None)
    if chosen is None:
        which = f"sheet {want!r}" if want is not None else "every sheet"
        raise InputError(f"{p.name}: {which} is empty")
    ws, rows, numeric = chosen
    table = Table(p, rows, _find_header(rows), "xlsx", "xlsx", numeric=numeric, sheet=ws.title, sheets=names,
                  line_numbers=list(range(1, len(rows) + 1)))
    if len(names) > 1:
        table.notes.append(f"read sheet {ws.title!r} of {len(names)} ({', '.join(repr(n) for n in names)})")
    return table


def _sheet_rows(ws) -> tuple[list[list[str]], set[tuple[int, int]]]:
    """A sheet's cells as text, merged ranges filled with their anchor's value."""
    values = [list(r) for r in ws.iter_rows(values_only=True)]
    for rng in ws.merged_cells.ranges:
        if rng.min_row - 1 >= len(values):
            continue
        top = values[rng.min_row - 1]
        anchor = top[rng.min_col - 1] if rng.min_col - 1 < len(top) else None
        for r in range(rng.min_row - 1, min(rng.max_row, len(values))):
            row = values[r]
            for c in range(rng.min_col - 1, min(rng.max_col, len(row))):
                row[c] = anchor
    numeric = {(r, c) for r, row in enumerate(values) for c, v in enumerate(row)
               if isinstance(v, (int, float)) and not isinstance(v, bool)}
    rows = [[_cell_text(v) for v in row] for row in values]
    for row in rows:  # cells past the last filled one are not cells
        while row and row[-1] == "":
            row.pop()
    while rows and not any(c.strip() for c in rows[-1]):
        rows.pop()
    return rows, numeric


def _names_part_column(rows: list[list[str]]) -> bool:
    names = set(PART_HEADERS)
    return any({norm_header(c) for c in row} & names for row in rows[:30])


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
