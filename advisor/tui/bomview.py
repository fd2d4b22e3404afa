"""BOM desk: read a bill of materials with :mod:`advisor.bom`, show each row's status with a
progress bar while it runs, and write the reviewed rows next to the input on request.

The review runs in a worker thread so the screen keeps answering keys; progress comes
back through ``call_from_thread``. Every failure (file missing, no part column, a bad
supply) is one line under the fields.
"""

from __future__ import annotations

from pathlib import Path

from rich.text import Text
from textual import work
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.screen import Screen
from textual.widgets import DataTable, Footer, Input, Label, ProgressBar, Static

from advisor.errors import RetimeError
from advisor.tui.late import dropped_when_closed
from advisor.tui.palette import STYLE
from advisor.values import parse_quantity

_STATUS_STYLE = {
    "reviewed": STYLE["good"], "check-match": STYLE["warning"], "out-of-scope": STYLE["dim"],
    "no-part-number": STYLE["dim"], "unreadable": STYLE["danger"],
}


def row_fields(result, rev, catalog, new_vcc: str = "") -> dict[str, str]:
    """The check/swap form's fields for one reviewed BOM row: its family and best
    alternate, and its own R, RB, C and supply cells as written in the file (the
    supply the review assumed when the row has none), with the desk's new supply."""
    t, cols = result.table, result.columns
    row = t.rows[rev.index]

    def cell(idx) -> str:
        return row[idx].strip() if idx is not None and idx < len(row) else ""

    fields = {"old": rev.family, "new": rev.best_alternate or "", "r": cell(cols.r), "rb": cell(cols.rb),
              "c": cell(cols.c), "vcc": cell(cols.vcc), "new_vcc": new_vcc}
    if not fields["vcc"] and rev.family:
        from advisor.bom.review import _default_vcc

        fields["vcc"] = f"{_default_vcc(catalog.get(rev.family)):g}"
    return fields


class BomScreen(Screen):
    """Load a CSV/XLSX BOM and review it row by row."""

    BINDINGS = [
        Binding("ctrl+s", "save", "Write reviewed copy"),
    ]

    def __init__(self) -> None:
        super().__init__()
        self.result = None  # advisor.bom.BomResult of the last review

    def compose(self) -> ComposeResult:
        with Vertical(id="bom-form"):
            with Horizontal(classes="field-row"):
                yield Label("BOM file", classes="field-label")
                yield Input(placeholder="path to a .csv or .xlsx file, then Enter", id="bom-path")
            with Horizontal(classes="field-row"):
                yield Label("New supply", classes="field-label")
                yield Input(placeholder="blank = keep the supply", id="bom-new-vcc")
            with Horizontal(classes="field-row"):
                yield Label("Part column", classes="field-label")
                yield Input(placeholder="blank = found by its header", id="bom-column")
            yield Static("", id="bom-note")
            yield ProgressBar(id="bom-progress", show_eta=False)
        yield DataTable(id="bom-table", zebra_stripes=True, cursor_type="row")
        yield Static("", id="bom-summary")
        yield Footer()

    def on_mount(self) -> None:
        self.query_one("#bom-table").border_title = "Rows"
        start = getattr(self.app, "start_bom", None)
        path = self.query_one("#bom-path", Input)
        if start:
            path.value = start
            self.start_review()
        path.focus()

    def on_input_submitted(self, event: Input.Submitted) -> None:
        self.start_review()

    @dropped_when_closed
    def _say(self, message: str, style: str = "warning") -> None:
        self.query_one("#bom-note", Static).update(Text(message, style=STYLE[style]))

    def start_review(self) -> None:
        raw_path = self.query_one("#bom-path", Input).value.strip()
        raw_vcc = self.query_one("#bom-new-vcc", Input).value.strip()
        column = self.query_one("#bom-column", Input).value.strip() or None
        if not raw_path:
            self._say("type the path of a BOM file (.csv or .xlsx), then Enter")
            return
        try:
            new_vcc = parse_quantity(raw_vcc, "voltage") if raw_vcc else None
        except RetimeError as exc:
            self._say(f"New supply: {exc.render()}", "danger")
            return
        path = Path(raw_path).expanduser()
        if not path.is_file():
            self._say(f"no file {raw_path!r}; expected the path of a .csv or .xlsx file", "danger")
            return
        self._say(f"reading {path.name} …", "dim")
        bar = self.query_one("#bom-progress", ProgressBar)
        bar.update(total=None, progress=0)
        self.query_one("#bom-table", DataTable).clear(columns=True)
        self.query_one("#bom-summary", Static).update("")
        self.review(path, new_vcc, column)

    @work(thread=True, exclusive=True, group="bom")
    def review(self, path: Path, new_vcc: float | None, column: str | None) -> None:
        from advisor.bom.review import review_bom
        from advisor.bom.table import read_table

        def progress(done: int, total: int) -> None:
            self.app.call_from_thread(self._progress, done, total)

        try:
            table = read_table(path)
            # One process: forking from the app's worker thread could deadlock the event loop.
            res = review_bom(table, self.app.catalog, part_column=column, new_vcc=new_vcc, progress=progress,
                             workers=1)
        except RetimeError as exc:
            self.app.call_from_thread(self._say, exc.render(), "danger")
            return
        except Exception as exc:  # an engine bug: one line, no traceback
            self.app.call_from_thread(self._say, f"internal error: {type(exc).__name__}: {exc} (please report it)", "danger")
            return
        self.app.call_from_thread(self.show_result, res)

    @dropped_when_closed
    def _progress(self, done: int, total: int) -> None:
        self.query_one("#bom-progress", ProgressBar).update(total=total, progress=done)

    @dropped_when_closed
    def show_result(self, res) -> None:
        self.result = res
        table = self.query_one("#bom-table", DataTable)
        table.clear(columns=True)
        table.add_columns("line", "part number", "status", "family", "score", "best alternate", "class", "findings", "reason")
        t = res.table
        col = res.columns.part
        for rev in res.reviews:
            row = t.rows[rev.index]
            part = row[col] if col < len(row) else ""
            finds = ", ".join(f"{f.get('severity')}:{f.get('rule')}" for f in rev.findings[:3])
            table.add_row(
                str(rev.index + 1), part,
                Text(rev.status, style=_STATUS_STYLE.get(rev.status, "")),
                rev.family, "" if rev.score is None else f"{rev.score:.0f}",
                rev.best_alternate, rev.best_class, finds, rev.reason,
                key=str(rev.index),
            )
        n = len(res.reviews)
        bar = self.query_one("#bom-progress", ProgressBar)
        bar.update(total=max(n, 1), progress=max(n, 1))
        head = t.header
        part_name = head[col] if col < len(head) else f"column {col + 1}"
        self._say(f"{t.path.name}: {n} rows, part numbers from {part_name!r}" + (f" · {'; '.join(t.notes)}" if t.notes else ""), "dim")
        summary = Text("summary: ", style=STYLE["dim"])
        for i, (status, count) in enumerate(res.summary.items()):
            if i:
                summary.append("  ")
            summary.append(f"{status} {count}", style=_STATUS_STYLE.get(status, ""))
        self.query_one("#bom-summary", Static).update(summary)
        table.focus()

    def on_data_table_row_selected(self, event: DataTable.RowSelected) -> None:
        """Enter on a reviewed row: open that part and its best alternate on the check/swap desk."""
        if self.result is None or event.row_key.value is None:
            return
        index = int(event.row_key.value)
        rev = next((r for r in self.result.reviews if r.index == index), None)
        if rev is None or not rev.family:
            self._say("this row has no recognised timer or one-shot to open")
            return
        self.app.open_in_workspace(replace=True, **row_fields(self.result, rev, self.app.catalog,
                                                               self.query_one("#bom-new-vcc", Input).value.strip()))

    def action_save(self) -> None:
        if self.result is None:
            self._say("nothing reviewed yet: load a BOM first")
            return
        from advisor.bom.write import write_bom

        src = Path(self.result.table.path)
        out = src.with_name(f"{src.stem}-reviewed.csv")
        try:
            write_bom(self.result, out, what="the reviewed BOM")
        except RetimeError as exc:
            self._say(exc.render(), "danger")
            return
        except OSError as exc:
            self._say(f"cannot write {out}: {exc.strerror or exc}", "danger")
            return
        self._say(f"written: {out}", "good")
