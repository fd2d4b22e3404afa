"""Read an oscilloscope capture saved as delimited text.

What is accepted (the common shapes of a scope's "save as CSV"):

- one time column and one or more voltage columns; the time column is the one whose
  heading says time (``Time``, ``t``, ``TIME[ms]``, ``Time (µs)``, ``X``), otherwise the
  first column;
- a heading line or none, and a few lines of preamble (instrument, date, settings)
  before the data; a line of units under the heading (``s,V,V``) is read too;
- delimiters ``,`` ``;`` tab or spaces; decimal commas with ``;`` or tab;
- UTF-8 (with or without a byte-order mark), else Windows-1252, else Latin-1;
- units in the headings: time in s, ms, µs (``us``), ns, ps; voltage in V, mV, µV, kV.
  Values are returned in SI base units (s, V).

Channels are numbered from 1 in the order of the voltage columns, the time column
left out: in ``Time,CH1,CH2`` channel 1 is ``CH1``.

numpy parses the numbers (its C reader, about 0.5 µs a row here); pandas is not
imported, so ``retime measure`` starts fast.
"""

from __future__ import annotations

import io
import re
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from advisor.errors import CaptureError

#: How far into the file a heading and the first data row are looked for.
MAX_PREAMBLE_LINES = 200

_TIME_NAMES = re.compile(r"^\s*(time|t|x|x-axis|sec|second|seconds|zeit|temps|tiempo)\b", re.IGNORECASE)
# A unit written after the name: "Time (us)", "TIME[ms]", "Time/s", "t_ns", "CH1 (mV)".
_UNIT_IN_NAME = re.compile(r"[\(\[\{/_ ]\s*([a-zA-Zµμ]{1,8})\s*[\)\]\}]?\s*$")
_TIME_UNITS = {"s": 1.0, "sec": 1.0, "second": 1.0, "seconds": 1.0, "ms": 1e-3, "us": 1e-6, "µs": 1e-6,
               "μs": 1e-6, "ns": 1e-9, "ps": 1e-12}
_VOLT_UNITS = {"v": 1.0, "volt": 1.0, "volts": 1.0, "mv": 1e-3, "uv": 1e-6, "µv": 1e-6, "μv": 1e-6, "kv": 1e3}
_NUMBER = re.compile(r"^\s*\"?[+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][+-]?\d+)?\"?\s*$|^\s*[+-]?(?:nan|inf)\s*$",
                     re.IGNORECASE)
_DELIMITERS = (";", "\t", ",", None)  # None: runs of spaces


@dataclass(frozen=True)
class Capture:
    """A capture in SI units: ``time`` (s, strictly increasing) and ``channels`` (V).

    ``channels`` has one row per voltage column; :meth:`channel` takes the
    1-based channel number users type.
    """

    time: np.ndarray
    channels: np.ndarray
    names: tuple[str, ...]
    source: str

    @property
    def n_samples(self) -> int:
        return int(self.time.size)

    @property
    def n_channels(self) -> int:
        return int(self.channels.shape[0])

    @property
    def duration(self) -> float:
        return float(self.time[-1] - self.time[0])

    @property
    def sample_interval(self) -> float:
        """Median time step (s)."""
        return float(np.median(np.diff(self.time[: min(self.n_samples, 100_001)])))

    def channel(self, number: int) -> np.ndarray:
        if not 1 <= number <= self.n_channels:
            raise CaptureError(
                f"channel {number} does not exist",
                location=self.source,
                expected=f"1 to {self.n_channels} (channels are the voltage columns, numbered from 1, time column left out)",
            )
        return self.channels[number - 1]


def read_capture(path: str | Path) -> Capture:
    """Read a capture file (see the module docstring for the shapes accepted)."""
    from advisor.files import FileRefused, read_regular

    p = Path(path)
    try:
        raw = read_regular(p, "capture")  # regular files only (a FIFO would hang), size-limited
    except FileRefused as exc:
        raise CaptureError(f"cannot read the capture: {exc.message}", location=str(p)) from None
    return parse_capture(_decode(raw), source=str(p))


def _decode(raw: bytes) -> str:
    for enc in ("utf-8-sig", "cp1252"):
        try:
            return raw.decode(enc)
        except UnicodeDecodeError:
            continue
    return raw.decode("latin-1")


def _split(line: str, delim: str | None) -> list[str]:
    fields = line.split(delim) if delim is not None else line.split()
    if delim is not None and len(fields) > 1 and fields[-1].strip() == "":
        fields = fields[:-1]  # a trailing delimiter
    return fields


def _is_number(field: str, decimal_comma: bool) -> bool:
    if not _NUMBER.match(field):
        return False
    return decimal_comma or "," not in field


def _numeric_width(line: str, delim: str | None) -> int:
    """Number of fields if ``line`` is a data row with this delimiter, else 0."""
    fields = _split(line, delim)
    if len(fields) < 2 and delim is not None:
        return 0
    dec_comma = delim != ","
    if fields and all(_is_number(f, dec_comma) for f in fields):
        return len(fields)
    return 0


def _guess_delimiter(lines: list[str]) -> tuple[str | None, int]:
    """Delimiter and column count that make the sample lines consistent numeric rows."""
    for delim in _DELIMITERS:
        widths = {_numeric_width(ln, delim) for ln in lines}
        if len(widths) == 1 and (w := widths.pop()) >= 1:
            if w >= 2 or delim is None:
                return delim, w
    return None, 0


def _tail_lines(text: str, count: int = 40) -> list[str]:
    tail = text[-20_000:].splitlines()
    if len(text) > 20_000:
        tail = tail[1:]  # the first piece may be a cut line
    return [ln for ln in tail if ln.strip()][-count:]


def parse_capture(text: str, source: str = "<capture>") -> Capture:
    """Parse capture text; raises :class:`CaptureError` with the place of any problem."""
    text = text.lstrip("\ufeff")
    tail = _tail_lines(text)
    # Data rows at the end of the file set the dialect; footer lines (text) are skipped.
    delim, ncols = None, 0
    while tail:
        delim, ncols = _guess_delimiter(tail[-3:])
        if ncols:
            break
        tail.pop()
    if ncols < 2:
        raise CaptureError(
            "no usable time column: the data rows do not have two numeric columns",
            location=source,
            expected="a time column and at least one voltage column separated by , ; tab or spaces",
        )
    decimal_comma = delim in (";", "\t", None) and any("," in f for ln in tail[-3:] for f in _split(ln, delim))

    head = text[: 400_000].splitlines()[:MAX_PREAMBLE_LINES + 1]
    start = None
    for i, line in enumerate(head):
        if line.strip() and _numeric_width(line, delim) == ncols:
            nxt = [ln for ln in head[i + 1 : i + 4] if ln.strip()]
            if all(_numeric_width(ln, delim) == ncols for ln in nxt):
                start = i
                break
    if start is None:
        raise CaptureError(
            f"no data rows found in the first {MAX_PREAMBLE_LINES} lines",
            location=source,
            expected=f"rows of {ncols} numbers after at most {MAX_PREAMBLE_LINES} lines of preamble",
        )
    header, units = _headings(head[:start], delim, ncols)

    # Cut the text at the first data row and after the last one (drop a text footer).
    offset = _line_offset(text, start)
    body = text[offset:]
    last = tail[-1]
    end = body.rfind(last)
    body = body[: end + len(last)] if end >= 0 else body
    if decimal_comma:
        body = body.replace(",", ".")
    trailing = delim is not None and last.rstrip().endswith(delim)
    try:
        data = np.loadtxt(
            io.StringIO(body), delimiter=delim, comments=None, quotechar='"', dtype=np.float64, ndmin=2,
            usecols=range(ncols) if trailing else None,
        )
    except ValueError as exc:
        raise CaptureError(f"unreadable data row: {_loadtxt_reason(exc, start)}", location=source) from None
    if data.shape[1] != ncols:
        raise CaptureError(f"expected {ncols} columns, got {data.shape[1]}", location=source)
    return _assemble(data, header, units, start, source)


def _line_offset(text: str, line_no: int) -> int:
    pos = 0
    for _ in range(line_no):
        nl = text.find("\n", pos)
        cr = text.find("\r", pos)
        if nl < 0 and cr < 0:
            return len(text)
        if cr >= 0 and (nl < 0 or cr < nl):
            pos = cr + (2 if text.startswith("\r\n", cr) else 1)
        else:
            pos = nl + 1
    return pos


def _loadtxt_reason(exc: ValueError, start: int) -> str:
    msg = str(exc).splitlines()[0]
    m = re.search(r"row (\d+)", msg)
    if m:  # numpy counts rows from 1 within the data block
        msg = msg.replace(m.group(0), f"line {int(m.group(1)) + start}")
    return msg


def _headings(pre: list[str], delim: str | None, ncols: int) -> tuple[list[str] | None, list[str] | None]:
    """Column names (and a units line under them) just above the data."""
    rows = []
    for line in reversed(pre):
        if not line.strip():
            if rows:
                break
            continue
        fields = [f.strip().strip('"').strip() for f in _split(line, delim)]
        if len(fields) != ncols:
            break
        rows.append(fields)
        if len(rows) == 2:
            break
    if not rows:
        return None, None
    rows.reverse()
    if len(rows) == 2:
        if all(_unit_word(f) for f in rows[1]):
            return rows[0], rows[1]
        return rows[1], None
    return rows[0], None


def _unit_word(field: str) -> bool:
    f = field.strip().lower()
    return f in _TIME_UNITS or f in _VOLT_UNITS or f in ("", "sequence", "a", "ma", "div")


def _unit_of(name: str) -> str | None:
    m = _UNIT_IN_NAME.search(name.strip())
    return m.group(1) if m else None


def _time_scale(name: str | None, unit: str | None) -> float:
    for u in (unit, _unit_of(name) if name else None):
        if u is None:
            continue
        key = u.strip()
        for cand in (key, key.lower()):
            if cand in _TIME_UNITS:
                return _TIME_UNITS[cand]
    if name and _TIME_NAMES.match(name) and name.strip().lower() in _TIME_UNITS:
        return _TIME_UNITS[name.strip().lower()]
    return 1.0


def _volt_scale(name: str | None, unit: str | None) -> float:
    for u in (unit, _unit_of(name) if name else None):
        if u is not None and u.strip().lower() in _VOLT_UNITS:
            return _VOLT_UNITS[u.strip().lower()]
    return 1.0


def _assemble(data: np.ndarray, header: list[str] | None, units: list[str] | None, start: int, source: str) -> Capture:
    ncols = data.shape[1]
    tcol = 0
    if header:
        named = [i for i, h in enumerate(header) if _TIME_NAMES.match(h)]
        if named:
            tcol = named[0]
    if data.shape[0] < 3:
        raise CaptureError(f"only {data.shape[0]} data rows", location=source, expected="a capture of many samples")
    if not np.isfinite(data).all():
        row = int(np.flatnonzero(~np.isfinite(data).all(axis=1))[0])
        raise CaptureError(f"line {row + start + 1} holds a value that is not a number", location=source)
    time = np.ascontiguousarray(data[:, tcol])
    dt = np.diff(time)
    bad = np.flatnonzero(dt <= 0)
    if bad.size:
        line = int(bad[0]) + 2 + start
        named_time = bool(header and _TIME_NAMES.match(header[tcol]))
        what = "repeats" if dt[bad[0]] == 0 else "goes backwards"
        if not named_time and bad.size > dt.size // 4:
            raise CaptureError(
                "no usable time column: the first column does not increase",
                location=source,
                expected="time (s) in the first column, or a heading naming the time column (Time, t, X)",
            )
        raise CaptureError(
            f"time {what} at line {line} ({time[bad[0]]:g} then {time[bad[0] + 1]:g}): time must increase",
            location=source,
            hint="export with more digits, or one acquisition per file",
        )
    time *= _time_scale(header[tcol] if header else None, units[tcol] if units else None)
    vcols = [i for i in range(ncols) if i != tcol]
    channels = np.ascontiguousarray(data[:, vcols].T)
    names = []
    for n, i in enumerate(vcols, start=1):
        name = header[i] if header else f"channel {n}"
        scale = _volt_scale(header[i] if header else None, units[i] if units else None)
        if scale != 1.0:
            channels[n - 1] *= scale
        names.append(name or f"channel {n}")
    return Capture(time=time, channels=channels, names=tuple(names), source=source)
