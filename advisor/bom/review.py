"""Judge every line of a BOM: recognise the part, and for timers and one-shots give the
best alternates with their class and key findings.

Each distinct part number is recognised once (BOMs repeat lines), and each distinct
(family, supply, R, C) is reviewed once, so a 10 000-line BOM costs what its distinct
lines cost.
"""

from __future__ import annotations

from collections import Counter
from dataclasses import dataclass, field
from typing import Callable

from advisor.bom.table import Columns, Table, locate_columns
from advisor.circuit import Circuit
from advisor.errors import RetimeError
from advisor.values import read_value

#: Row statuses (in the order the summary lists them). ``out-of-scope``: a part number
#: read as a part that is no timer (a logic gate, a resistor, a capacitor);
#: ``not-recognised``: nothing in the catalog or the trade's numbering reads it.
STATUSES = ("reviewed", "check-match", "out-of-scope", "not-recognised", "no-part-number", "unreadable")
#: Columns the review adds after the input's own columns.
ADDED_COLUMNS = (
    "retime_status", "retime_family", "retime_score", "retime_best_alternate", "retime_best_class",
    "retime_alternates", "retime_findings", "retime_reason",
    "retime_part_status", "retime_best_status", "retime_new_r", "retime_new_rb", "retime_new_c",
)
#: Headers of a reference-designator column (normalised as advisor.bom.table.norm_header does).
REF_HEADERS = ("ref", "refs", "refdes", "reference", "references", "designator", "designators", "refdesignator")
#: A typo match below MAYBE_SCORE but at or above this is still offered for a human to confirm
#: (never out of scope), unless the part number reads as a part of another kind.
TYPO_FLOOR = 70.0
#: A rule-based match (exact or normalised: prefixes and suffixes read by rule) is
#: taken as the family. A fuzzy (typo) match at or above MAYBE_SCORE is offered for a
#: human to confirm; below it the line is out of scope. 74HC125 (a buffer) scores
#: 85.7 against 74HC123 and must stay out of scope; 74HC1223 (a doubled digit)
#: scores 87.5 and is worth a question. Scores are 0..100.
MAYBE_SCORE = 87.0


@dataclass
class RowReview:
    index: int  # 0-based index into Table.rows
    status: str
    family: str = ""
    score: float | None = None
    best_alternate: str = ""
    best_class: str = ""
    alternates: list[dict] = field(default_factory=list)
    findings: list[dict] = field(default_factory=list)
    reason: str = ""
    part_status: str = ""  # lifecycle status of the line's own family
    best_status: str = ""  # lifecycle status of the best alternate
    new_values: dict = field(default_factory=dict)  # the best alternate's network when it changes values (Ω, F)
    suggestion: str = ""  # the family a typo match suggests (check-match)
    ref: str = ""  # the line's reference designator(s), when the BOM has such a column

    def added_cells(self) -> list[str]:
        from advisor.values import format_code

        alts = "; ".join(f"{a['family']} ({a['class']}, {a.get('status') or 'unknown'})" for a in self.alternates)
        finds = "; ".join(f"{f['severity']}: {f['rule']}" for f in self.findings)
        nv = self.new_values

        def code(key: str, kind: str) -> str:
            return format_code(nv[key], kind) if nv.get(key) is not None else ""

        return [
            self.status, self.family, "" if self.score is None else f"{self.score:.0f}",
            self.best_alternate, self.best_class, alts, finds, self.reason,
            self.part_status, self.best_status, code("r", "resistance") or code("ra", "resistance"),
            code("rb", "resistance"), code("c", "capacitance"),
        ]

    def to_json(self) -> dict:
        return {
            "status": self.status, "family": self.family or None, "score": self.score,
            "best_alternate": self.best_alternate or None, "best_class": self.best_class or None,
            "alternates": self.alternates, "findings": self.findings, "reason": self.reason or None,
            "part_status": self.part_status or None, "best_status": self.best_status or None,
            "new_values": dict(self.new_values) or None, "suggestion": self.suggestion or None,
            "ref": self.ref or None,
        }


@dataclass
class BomResult:
    table: Table
    columns: Columns
    reviews: list[RowReview]  # one per data row, in order
    new_vcc: float | None = None
    stock: dict | None = None  # the stock list used (advisor.substitute.stock.Stock.to_json)
    assumptions: list[str] = field(default_factory=list)  # what the whole review assumed (advisor.overrides)

    @property
    def summary(self) -> dict[str, int]:
        counts = Counter(r.status for r in self.reviews)
        return {s: counts.get(s, 0) for s in STATUSES}

    def to_json(self) -> dict:
        header = self.table.header
        keys = _unique_keys(header + [""] * (self.table.width - len(header)))
        rows = []
        for rev in self.reviews:
            cells = self.table.rows[rev.index]
            rows.append({
                "line": rev.index + 1,
                "cells": {k: (cells[i] if i < len(cells) else "") for i, k in enumerate(keys)},
                **rev.to_json(),
            })
        return {
            "file": str(self.table.path),
            "sheet": self.table.sheet,
            "part_column": header[self.columns.part] if self.columns.part < len(header) else self.columns.part + 1,
            "new_vcc": self.new_vcc,
            "columns": keys + list(ADDED_COLUMNS),
            "value_columns": self.value_columns,
            "preamble": self.table.rows[: self.table.header_row],
            "rows": rows,
            "summary": self.summary,
            "stock": self.stock,
            "assumptions": list(self.assumptions),
        }

    @property
    def value_columns(self) -> dict[str, str | None]:
        """The headers the line's own R, RB, C and supply were read from (None: not in this BOM)."""
        header = self.table.header

        def name(idx):
            return (header[idx] if idx < len(header) else f"column {idx + 1}") if idx is not None else None

        c = self.columns
        return {"r": name(c.r), "rb": name(c.rb), "c": name(c.c), "vcc": name(c.vcc)}


def _unique_keys(header: list[str]) -> list[str]:
    """Header names made unique for JSON keys ('Part', 'Part (2)'); blanks become 'column N'."""
    out: list[str] = []
    seen: Counter = Counter()
    for i, h in enumerate(header):
        name = h.strip() or f"column {i + 1}"
        seen[name] += 1
        out.append(name if seen[name] == 1 else f"{name} ({seen[name]})")
    return out


def _cell(row: list[str], idx: int | None) -> str:
    if idx is None or idx >= len(row):
        return ""
    return row[idx].strip()


def review_bom(
    table: Table,
    catalog,
    *,
    part_column: str | None = None,
    new_vcc: float | None = None,
    vcc: float | None = None,
    limit: int = 3,
    progress: Callable[[int, int], None] | None = None,
    workers: int | None = None,
    include_obsolete: bool = False,
    stock=None,
) -> BomResult:
    # progress(done, total) counts the distinct jobs judged (the slow part), not rows.
    """Review every data row of ``table``; never drops a row.

    Three passes: read every row (status, family, values) and collect the distinct
    jobs; judge each distinct job once (in ``workers`` processes when there are many
    and the machine has more than one core); then give every row its job's answer.
    Alternates are ranked as ``retime alternates`` ranks them (obsolete families left
    out unless ``include_obsolete``; ``stock`` entries first among equals).
    """
    from advisor.partnumber import recognise_many

    cols = locate_columns(table, part_column)
    data_idx = [i for i in range(table.header_row + 1, len(table.rows))]
    queries = {_cell(table.rows[i], cols.part) for i in data_idx} - {""}
    matches = recognise_many(catalog, sorted(queries))
    # A line the table could not split into cells (an unclosed quote) keeps its place with its reason.
    names = _ColumnNames(table, cols)
    read = [_Read(RowReview(i, "unreadable", reason=table.row_problems[i])) if i in table.row_problems
            else _guarded_read(i, table.rows[i], cols, catalog, matches, new_vcc, vcc, names) for i in data_idx]
    ref_col = _ref_column(table)
    if ref_col is not None:
        for r in read:
            r.review.ref = _cell(table.rows[r.review.index], ref_col)
    jobs = list(dict.fromkeys(r.job for r in read if r.job is not None))
    global _OPTIONS
    _OPTIONS = {"include_obsolete": include_obsolete, "stock": stock}
    answers = _judge(jobs, catalog, limit, progress, workers)
    reviews = [r.finish(answers) for r in read]
    for rev in reviews:
        if rev.family and rev.family.upper() in catalog.families:
            rev.part_status = catalog.families[rev.family.upper()].status
    return BomResult(table, cols, reviews, new_vcc, stock.to_json() if stock is not None else None)


def _ref_column(table: Table) -> int | None:
    from advisor.bom.table import norm_header

    names = [norm_header(h) for h in table.header]
    return next((i for i, n in enumerate(names) if n in REF_HEADERS), None)


class _ColumnNames:
    """What a BOM user fed in place of each flag the engine's messages name
    (advisor.inputnames): the column a line's R, RB, C and supply came from."""

    #: engine flag -> the Columns field holding that value (a 555 astable's RA is the R column)
    FLAGS = {"--r": "r", "--ra": "r", "--rb": "rb", "--c": "c", "--vcc": "vcc"}

    def __init__(self, table: Table, cols: Columns) -> None:
        self.table = table
        self.cols = cols

    def column(self, key: str) -> str:
        idx = getattr(self.cols, key)
        header = self.table.header
        name = header[idx].strip() if idx is not None and idx < len(header) else ""
        return f"column {name!r}" if name else f"column {idx + 1 if idx is not None else '?'}"

    def cell(self, index: int, key: str) -> str:
        """``line 7, column 'Rt'``: where a cell's value was read."""
        return f"line {self.table.line_of(index)}, {self.column(key)}"

    #: what names a value the BOM has no column for (bom has no --r, --rb or --c flag)
    MISSING = {"r": "an R column", "rb": "an RB column", "c": "a C column"}

    def for_row(self, row: list[str]) -> dict[str, str]:
        """Flag -> where this row's value sits: its column (empty or not), or the column the
        BOM lacks. An empty or absent supply cell leaves ``--vcc``: the supply then came from
        the bom command's own --vcc or its default."""
        out = {}
        for flag, key in self.FLAGS.items():
            idx = getattr(self.cols, key)
            if key == "vcc":
                if idx is not None and _cell(row, idx):
                    out[flag] = self.column(key)
            else:
                out[flag] = self.column(key) if idx is not None else self.MISSING[key]
        return out


@dataclass
class _Read:
    """One row after the first pass: a final review, or a job whose answer it waits for."""

    review: RowReview
    job: tuple | None = None  # (family, supply, r, rb, c, new_vcc)
    names: dict = field(default_factory=dict)  # engine flag -> this row's column (advisor.inputnames)

    def finish(self, answers: dict) -> RowReview:
        from advisor.inputnames import rename_flags

        if self.job is None:
            return self.review
        base = answers[self.job]
        rev = self.review
        # how the cells were read, then the answer, naming the row's own columns, not flags
        reason = "; ".join(x for x in (rev.reason, rename_flags(base.reason, self.names)) if x)
        if rev.status == "check-match":
            reason = (f"read as {rev.family} only by a likely typo (score {rev.score:.0f}): confirm the part number"
                      + (f"; {reason}" if reason else ""))
        return RowReview(
            rev.index, rev.status, family=rev.family, score=rev.score, best_alternate=base.best_alternate,
            best_class=base.best_class, alternates=base.alternates, findings=base.findings, reason=reason,
            best_status=base.best_status, new_values=base.new_values, suggestion=rev.suggestion, ref=rev.ref,
        )


def _unexpected(exc: Exception) -> str:
    """The reason given for a line that hit a bug: the line comes back, the others go on."""
    import os

    if os.environ.get("RETIME_DEBUG"):
        raise exc
    return f"could not be judged: internal problem {type(exc).__name__}: {exc} (please report it)"


def _guarded_read(i, row, cols, catalog, matches, new_vcc, vcc, names: _ColumnNames) -> _Read:
    try:
        return _read_row(i, row, cols, catalog, matches, new_vcc, vcc, names)
    except RetimeError as exc:
        return _Read(RowReview(i, "unreadable", reason=exc.message))
    except Exception as exc:  # a bug must cost this line only
        return _Read(RowReview(i, "unreadable", reason=_unexpected(exc)))


def _read_row(i, row, cols, catalog, matches, new_vcc, vcc, names: _ColumnNames) -> _Read:
    if not any(c.strip() for c in row):
        return _Read(RowReview(i, "no-part-number", reason="empty row"))
    if cols.part >= len(row):
        return _Read(RowReview(i, "unreadable", reason=f"row has {len(row)} cells; the part column is number {cols.part + 1}"))
    query = _cell(row, cols.part)
    if not query:
        return _Read(RowReview(i, "no-part-number", reason="part-number cell is empty"))
    found = matches.get(query) or []
    other_kind = _other_kind(query)
    fuzzy = bool(found) and found[0].how == "fuzzy"
    if not found or (fuzzy and (found[0].score < TYPO_FLOOR or (found[0].score < MAYBE_SCORE and other_kind))):
        if other_kind:
            return _Read(RowReview(i, "out-of-scope", reason=f"read as {other_kind}, not a timer or one-shot"))
        return _Read(RowReview(i, "not-recognised", reason="not recognised: no catalog family or part numbering reads it"))
    best = found[0]
    notes: list[str] = []
    try:
        r = _opt(row, cols.r, "resistance", notes, "R", names.cell(i, "r"))
        rb = _opt(row, cols.rb, "resistance", notes, "RB", names.cell(i, "rb"))
        c = _opt(row, cols.c, "capacitance", notes, "C", names.cell(i, "c"))
        row_vcc = _opt(row, cols.vcc, "voltage", notes, "supply", names.cell(i, "vcc"))
    except RetimeError as exc:
        return _Read(RowReview(i, "unreadable", family=best.family, score=best.score, reason=exc.message))
    fam = catalog.get(best.family)
    supply = row_vcc or vcc or _default_vcc(fam)
    status = "reviewed" if best.how != "fuzzy" else "check-match"
    return _Read(RowReview(i, status, family=best.family, score=round(best.score, 1),
                           suggestion=best.family if status == "check-match" else "", reason="; ".join(notes)),
                 (best.family, supply, r, rb, c, new_vcc), names.for_row(row))


#: Part numbers of other kinds, by the trade's numbering (common practice): 74/54-series
#: and 4000-series logic, and the usual chip resistor and ceramic capacitor series.
_OTHER_KINDS = (
    (r"^[A-Z]{0,4}(54|74)[A-Z]{0,5}\d{1,4}[A-Z0-9-]*$", "a 74-series logic part"),
    (r"^(CD|HEF|MC1|MM|TC)?4\d{3}[A-Z0-9-]*$", "a 4000-series logic part"),
    (r"^(CRCW|RC\d{4}|ERJ|RMCF|CR\d{4}|MFR|WR\d{2})", "a resistor"),
    (r"^(GRM|GCM|CL\d\d|C\d{4}[A-Z]|CC\d{4}|VJ\d{4}|ECA|EEU|UVR|T491)", "a capacitor"),
)


def _other_kind(query: str) -> str | None:
    """What kind of part a number reads as when it is no catalog family (None: unknown)."""
    import re

    q = query.strip().upper().replace(" ", "")
    for pattern, kind in _OTHER_KINDS:
        if re.match(pattern, q):
            return kind
    return None


def _opt(row: list[str], idx: int | None, kind: str, notes: list[str], label: str, where: str) -> float | None:
    """A cell read as parts print values (advisor.values.read_value); how it was read goes to
    ``notes``; a value that does not read names its line and column (``where``)."""
    from advisor.errors import ValueParseError

    text = _cell(row, idx)
    if not text:
        return None
    try:
        reading = read_value(text, kind)
    except ValueParseError as exc:
        raise ValueParseError(f"{where}: {exc.message}", got=text, expected=exc.expected) from None
    notes.extend(reading.remarks(label))
    return reading.value


def _default_vcc(fam) -> float:
    """5 V when the family runs there (the common case in BOMs without a supply column)."""
    rec = fam.supply.recommended
    return 5.0 if rec.min <= 5.0 <= rec.max else rec.min


#: How many of the catalog-wide ranking (on the reference network) are re-ranked with a
#: line's own R and C. Classes that depend on pins, behaviour and supply do not change
#: with values; only drop-in vs drop-in-new-values, the timing error and value findings
#: do, so the whole-catalog search runs once per part and supply, not once per line.
SHORTLIST = 8
#: Below this many distinct jobs the review runs in this process (a pool costs more).
PARALLEL_MIN = 24

_CATALOG = None  # the catalog the worker processes read (inherited when they fork)
_OPTIONS: dict = {}  # ranking options (include_obsolete, stock), inherited the same way


def _judge(jobs: list[tuple], catalog, limit: int, progress, workers: int | None) -> dict:
    """The answer (a RowReview with alternates) for every distinct job."""
    global _CATALOG
    _CATALOG = catalog
    refs = list(dict.fromkeys(_ref_key(j) for j in jobs))
    pool = _pool(len(jobs), workers)
    try:
        mapper = pool.imap if pool is not None else map
        shortlists = dict(zip(refs, mapper(_reference_job, refs)))
        tasks = [(j, limit, shortlists[_ref_key(j)]) for j in jobs]
        answers: dict = {}
        for n, (job, answer) in enumerate(zip(jobs, mapper(_values_job, tasks)), 1):
            answers[job] = answer
            if progress is not None and (n % 10 == 0 or n == len(jobs)):
                progress(n, len(jobs))
        return answers
    finally:
        if pool is not None:
            pool.close()
            pool.join()


def _pool(n_jobs: int, workers: int | None):
    """A fork-based process pool when it pays (many jobs, several cores), else None."""
    import multiprocessing
    import os

    count = workers if workers is not None else min(os.cpu_count() or 1, 8)
    if count < 2 or n_jobs < PARALLEL_MIN or "fork" not in multiprocessing.get_all_start_methods():
        return None
    return multiprocessing.get_context("fork").Pool(count)


def _ref_key(job: tuple) -> tuple:
    family, supply, _r, rb, _c, new_vcc = job
    return (family, supply, "astable" if rb is not None else None, new_vcc)


def _reference_job(ref: tuple) -> tuple[list[str], RowReview | None, str | None]:
    """Whole-catalog ranking on the reference network: the shortlist of family ids, the
    answer for lines without a capacitor, or the reason the ranking failed."""
    from advisor.substitute import alternates

    family, supply, mode, new_vcc = ref
    try:
        res = alternates(_CATALOG, family, Circuit(part=family, vcc=supply, mode=mode), new_vcc=new_vcc, limit=0,
                         **_OPTIONS)
    except RetimeError as exc:
        return [], None, exc.message
    except Exception as exc:  # a bug must cost these lines only
        return [], None, _unexpected(exc)
    return [c.new.family for c in res.candidates], _answer(res.to_json(), None, new_vcc, SHORTLIST), None


def _values_job(task: tuple) -> RowReview:
    from advisor.substitute import alternates

    (family, supply, r, rb, c, new_vcc), limit, (ranked, no_values, failed) = task
    if failed is not None:
        return RowReview(-1, "reviewed", reason=failed)
    if c is None:
        return _answer_limited(no_values, limit)
    mode = "astable" if rb is not None else None
    try:
        circuit = Circuit(part=family, vcc=supply, mode=mode, r=r if mode is None else None,
                          ra=r if mode == "astable" else None, rb=rb, c=c)
        res = alternates(_CATALOG, family, circuit, new_vcc=new_vcc, limit=limit,
                         families=ranked[: max(SHORTLIST, limit)], **_OPTIONS)
        return _answer(res.to_json(), c, new_vcc, limit)
    except RetimeError as exc:
        return RowReview(-1, "reviewed", reason=exc.message)
    except Exception as exc:  # a bug must cost these lines only
        return RowReview(-1, "reviewed", reason=_unexpected(exc))


def _answer_limited(base: RowReview, limit: int) -> RowReview:
    alts = base.alternates[:limit]
    return RowReview(-1, "reviewed", best_alternate=base.best_alternate, best_class=base.best_class,
                     alternates=alts, findings=base.findings, reason=base.reason, best_status=base.best_status)


def _answer(res: dict, c: float | None, new_vcc: float | None, limit: int) -> RowReview:
    cands = res.get("candidates", [])[:limit]
    alts = [{"family": a["family"], "class": a["class"], "status": a.get("status"), "rank_reason": a.get("rank_reason"),
             "in_stock": a.get("in_stock")} for a in cands]
    findings = []
    for a in cands[:1]:
        for f in a.get("findings", []):
            if f["severity"] in ("danger", "warning"):
                findings.append({"rule": f["rule"], "severity": f["severity"], "message": f["message"]})
    reason = ""
    if not cands:
        reason = "no alternate in the catalog can do this job" + (f" at {new_vcc:g} V" if new_vcc else "")
    elif c is None:
        reason = "no C value on this line: classes judged on pins, behaviour and supply with a reference network"
    new_values = {}
    if cands and c is not None and (cands[0].get("rank") or {}).get("changed"):
        new_values = {k: cands[0]["values"].get(k) for k in ("r", "ra", "rb", "c") if cands[0]["values"].get(k) is not None}
    return RowReview(
        -1, "reviewed", best_alternate=alts[0]["family"] if alts else "", best_class=alts[0]["class"] if alts else "",
        alternates=alts, findings=findings[:3], reason=reason, best_status=(alts[0].get("status") or "") if alts else "",
        new_values=new_values,
    )
