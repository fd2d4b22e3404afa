"""Check/swap desk: edit the part, its replacement, supply and timing network; every change
recomputes (through :mod:`advisor.tui.bridge`) the values, band, findings, picture, pin map
and rework steps.

A bad value is marked under its own field, quoting what was typed and what is expected;
no result is shown until the whole form reads again, so stale numbers never pass for new.
"""

from __future__ import annotations

from rich.console import Group
from rich.table import Table
from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual import work
from textual.containers import Horizontal, VerticalScroll
from textual.screen import Screen
from textual.timer import Timer
from textual.widgets import Footer, Input, Label, OptionList, Static
from textual.widgets.option_list import Option

from advisor.presentation import class_words, function_words, trigger_verdict
from advisor.tui.bridge import ALL_FIELDS, CAPTURE_FIELDS, FIELD_BY_KEY, REPORT_FIELDS, SECTIONS, Outcome, evaluate
from advisor.tui.late import dropped_when_closed
from advisor.tui.palette import SEVERITY_MARK, STYLE
from advisor.tui.prose import Prose
from advisor.tui.waveform import TimingPicture
from advisor.values import format_code, format_eng

#: Seconds of typing quiet before recomputing; short enough to feel immediate.
DEBOUNCE = 0.08

_QTY_UNITS = {"width": "s", "high": "s", "low": "s", "period": "s", "frequency": "Hz"}
_VALUE_SHOWN = [("vcc", "supply", "V"), ("r", "R", "Ω"), ("ra", "RA", "Ω"), ("rb", "RB", "Ω"), ("c", "C", "F"),
                ("pot", "pot", "Ω"), ("pot_setting", "pot setting", "")]


def _q(name: str, value) -> str:
    if not isinstance(value, (int, float)) or isinstance(value, bool):
        return "—"
    if name == "duty":
        return f"{value:.1%}"
    return format_eng(float(value), _QTY_UNITS.get(name, ""))


def timing_table(timing: dict | None, title: str = "") -> Table | Text:
    """Nominal and worst-case band of one ``timing`` object, one row per quantity."""
    if not isinstance(timing, dict) or not isinstance(timing.get("nominal"), dict):
        return Text("no timing", style=STYLE["dim"])
    t = Table(box=None, pad_edge=False, padding=(0, 1, 0, 0), title=title or None, title_justify="left",
              title_style=STYLE["heading"], header_style=STYLE["dim"])
    # Whole numbers with units or nothing: the columns never wrap (the panel scrolls sideways).
    t.add_column("", no_wrap=True)
    t.add_column("nominal", style=f"bold {STYLE['output']}", justify="right", no_wrap=True)
    t.add_column("band min", justify="right", no_wrap=True)
    t.add_column("band max", justify="right", no_wrap=True)
    lo, hi = timing.get("min") or {}, timing.get("max") or {}
    for name, val in timing["nominal"].items():
        t.add_row(name, _q(name, val), _q(name, lo.get(name)), _q(name, hi.get(name)))
    return t


def values_line(values: dict | None) -> Text:
    """The network actually used, in value codes (4k7, 10n) with SI units for the supply."""
    text = Text()
    if not isinstance(values, dict):
        return text
    for key, label, unit in _VALUE_SHOWN:
        v = values.get(key)
        if not isinstance(v, (int, float)) or isinstance(v, bool):
            continue
        if unit == "Ω":
            shown = format_code(v, "resistance")
        elif unit == "F":
            shown = format_code(v, "capacitance")
        elif key == "pot_setting":
            shown = f"{v:.0%}"
        else:
            shown = format_eng(v, unit)
        if text:
            text.append("  ")
        text.append(f"{label} ", style=STYLE["dim"])
        text.append(shown, style=STYLE["key"])
    return text


def _extras(data: dict) -> list:
    """Adjustment range, target, calibration, trigger and tolerances, when present."""
    out: list = []
    adj = data.get("adjust")
    if isinstance(adj, dict) and isinstance(adj.get("min"), dict):
        parts = [f"{k} {_q(k, adj['min'].get(k))} .. {_q(k, (adj.get('max') or {}).get(k))}" for k in adj["min"] if k != "duty"]
        out.append(Text("trimmer travel: " + "; ".join(parts), style=STYLE["key"]))
    tgt = data.get("target")
    if isinstance(tgt, dict):
        ok = tgt.get("reachable")
        line = Text("target: ", style=STYLE["dim"])
        line.append("reachable" if ok else "not reachable", style=STYLE["good"] if ok else STYLE["danger"])
        if tgt.get("setting") is not None:
            line.append(f" at {tgt['setting']:.0%} of the trimmer's travel")
        out.append(line)
    cal = data.get("calibration")
    if isinstance(cal, dict) and cal.get("factor") is not None:
        out.append(Text(f"calibrated from the measured {cal.get('quantity', 'time')}: ×{cal['factor']:.4g}", style=STYLE["key"]))
    cap = data.get("capture")
    if isinstance(cap, dict):
        out.append(capture_line(cap))
    trig = data.get("trigger")
    if isinstance(trig, dict) and trig.get("period"):
        line = Text("trigger every ", style=STYLE["dim"])
        line.append(format_eng(trig["period"], "s"), style=STYLE["key"])
        good = trig.get("divide_by") == 1 and not trig.get("stays_high")
        line.append(f": {trigger_verdict(trig)}", style=STYLE["good"] if good else STYLE["warning"])
        out.append(line)
    for assumed in data.get("assumptions") or []:
        out.append(Text(f"assumed: {assumed}", style=STYLE["memory"]))
    tol = data.get("tolerances")
    if isinstance(tol, dict) and tol.get("r_tol") is not None:
        line = Text(f"band from R ±{tol['r_tol'] * 100:.3g} %, C ±{(tol.get('c_tol') or 0) * 100:.3g} % and the spread "
                    "of published constants", style=STYLE["dim"])
        dflt = tol.get("defaulted")
        if dflt and (dflt is True or (isinstance(dflt, dict) and any(dflt.values()))):
            line.append(" (tolerances assumed)", style=STYLE["dim"])
        out.append(line)
    return out


def capture_line(cap: dict) -> Text:
    """Where the measurement came from: the capture, its channels and its medians."""
    line = Text("capture ", style=STYLE["dim"])
    line.append(str(cap.get("name") or cap.get("file") or "?"), style=STYLE["measured"])
    chans = f"ch {cap.get('output_channel')} output"
    if cap.get("trigger_channel") is not None:
        chans = f"ch {cap['trigger_channel']} trigger, " + chans
    line.append(f"  {chans}", style=STYLE["dim"])
    for key, label in (("value", f"measured {cap.get('quantity', 'time')}"), ("period", "period")):
        v = cap.get(key)
        if isinstance(v, (int, float)) and not isinstance(v, bool):
            line.append(f"  {label} ", style=STYLE["dim"])
            line.append(format_eng(float(v), "s"), style=STYLE["key"])
    line.append(" (medians)", style=STYLE["dim"])
    if isinstance(cap.get("divide_by"), int) and cap["divide_by"] > 1:
        line.append(f"; 1 trigger in {cap['divide_by']} fired", style=STYLE["warning"])
    if cap.get("stays_active"):
        line.append("; the output stayed high", style=STYLE["warning"])
    return line


def findings_view(findings: list[dict]) -> Table | Text:
    """Most severe first; the mark column keeps wrapped lines aligned under the message."""
    if not findings:
        return Text("No findings: nothing the datasheet rules object to.", style=STYLE["good"])
    t = Table(box=None, show_header=False, pad_edge=False, padding=(0, 1, 0, 0), expand=True)
    t.add_column(no_wrap=True, width=10)
    t.add_column(ratio=1)
    for f in findings:
        sev = str(f.get("severity", "note"))
        body = Text()
        if f.get("part"):
            body.append(f"[{f['part']}] ", style=STYLE["id"])
        body.append(str(f.get("message", "")))
        if f.get("fix"):
            body.append("\nfix: ", style=STYLE["dim"])
            body.append(str(f["fix"]))
        if f.get("source"):
            body.append(f"\nsource: {f['source']}", style=STYLE["dim"])
            if f.get("rule"):
                body.append(f" · rule {f['rule']}", style=STYLE["dim"])
        t.add_row(Text(SEVERITY_MARK.get(sev, sev), style=STYLE.get(sev, STYLE["key"])), Prose(body))
    return t


def _pin(pin, name) -> str:
    if pin is None:
        return "—"
    return f"{pin} {name}" if name else str(pin)


def pin_map_view(pin_map) -> Group | Text:
    """The swap's pin map: each old pin's net and the new pin it goes to, the ties the
    new part needs, old pins with no counterpart, and the map's notes."""
    if not isinstance(pin_map, dict) or not pin_map:
        return Text("no pin map", style=STYLE["dim"])
    out: list = []
    head = Text()
    head.append(f"{pin_map.get('old_package', '?')} → {pin_map.get('new_package', '?')}", style=STYLE["key"])
    if pin_map.get("same_pins"):
        head.append("   same pins", style=STYLE["good"])
    elif pin_map.get("same_footprint"):
        head.append("   same footprint, pins move", style=STYLE["warning"])
    else:
        head.append("   different footprint", style=STYLE["warning"])
    out.append(head)
    links = pin_map.get("links") or []
    if links:
        t = Table(box=None, pad_edge=False, padding=(0, 1, 0, 0), header_style=STYLE["dim"])
        for col in ("ch", "function", f"old {pin_map.get('old_family', '')}".strip(), f"new {pin_map.get('new_family', '')}".strip(), ""):
            t.add_column(col, no_wrap=True)
        for ln in links:
            moved = Text("moves", style=STYLE["warning"]) if ln.get("moved") else Text("")
            t.add_row(str(ln.get("new_channel") or ln.get("old_channel") or ""), function_words(ln.get("function")),
                      _pin(ln.get("old_pin"), ln.get("old_name")), _pin(ln.get("new_pin"), ln.get("new_name")), moved)
        out.append(t)
    for tie in pin_map.get("ties") or []:
        line = Text("tie ", style=STYLE["heading"])
        line.append(f"{_pin(tie.get('new_pin'), tie.get('new_name'))} to {tie.get('level', '?')}")
        if tie.get("why"):
            line.append(f": {tie['why']}", style=STYLE["dim"])
        out.append(line)
    for um in pin_map.get("unmatched") or []:
        line = Text("no match ", style=STYLE["danger"] if um.get("blocking") else STYLE["warning"])
        line.append(f"old {_pin(um.get('old_pin'), um.get('old_name'))}")
        if um.get("what"):
            line.append(f": {um['what']}", style=STYLE["dim"])
        out.append(line)
    for extra in pin_map.get("additions") or []:
        out.append(Text(f"add: {extra.get('what', extra) if isinstance(extra, dict) else extra}", style=STYLE["key"]))
    pol = pin_map.get("polarity")
    if isinstance(pol, dict) and pol.get("edge"):
        from advisor.presentation import edge_route

        out.append(Text(f"trigger: {edge_route(pol, pin_map)}", style=STYLE["key"]))
    for note in pin_map.get("notes") or []:
        out.append(Text(f"note: {note}", style=STYLE["dim"]))
    return Group(*[Prose(x) if isinstance(x, Text) else x for x in out])


def rework_view(steps) -> Prose | Text:
    """Ordered bench steps: number, action, what to do."""
    if not steps:
        return Text("no rework", style=STYLE["dim"])
    text = Text()
    for i, s in enumerate(steps, 1):
        if i > 1:
            text.append("\n")
        n = i
        if isinstance(s, dict):
            n = s.get("n", i)
            action = s.get("action")
            what = s.get("detail") or s.get("text") or s.get("step") or ""
        else:
            action, what = None, str(s)
        text.append(f"{n:>2}. ", style=STYLE["heading"])
        if action:
            text.append(f"{action:<8} ", style=STYLE["output"])
        text.append(str(what))
    return Prose(text)


def swap_summary(data: dict) -> list:
    """What the swap kept, how close the new part gets, and why it has its class."""
    out: list = []
    kept = data.get("kept")
    if isinstance(kept, dict) and kept.get("quantity"):
        q = str(kept["quantity"])
        line = Text("kept: ", style=STYLE["dim"])
        line.append(f"{q} {_q(q, kept.get('value'))}", style=STYLE["key"])
        if kept.get("basis"):
            line.append(f" ({kept['basis']})", style=STYLE["dim"])
        err = data.get("error")
        if isinstance(err, (int, float)):
            line.append("   new part off by ", style=STYLE["dim"])
            line.append(f"{err:+.1%}", style=STYLE["key"])
        out.append(line)
    for reason in data.get("reasons") or []:
        out.append(Text(f"· {reason}", style=STYLE["key"]))
    return out


#: Below this width the form narrows (see .narrow in workbench.tcss).
NARROW_BELOW = 110
#: Seconds of quiet before the alternates are ranked again (a whole-catalog run).
ALTERNATES_DEBOUNCE = 0.4


def _prose(items: list) -> list:
    return [Prose(x) if isinstance(x, Text) else x for x in items]


class WorkspaceScreen(Screen):
    """Check one part, or swap it for another, with live recomputation."""

    BINDINGS = [
        Binding("ctrl+l", "clear_form", "Clear"),
        Binding("ctrl+r", "exchange", "Exchange parts"),
        Binding("ctrl+w", "write_report", "Write report"),
    ]

    def __init__(self) -> None:
        super().__init__()
        self._timer: Timer | None = None
        self._alt_timer: Timer | None = None
        self._alt_key: tuple | None = None
        self.outcome: Outcome | None = None
        #: Ranked alternates of the part on the form: (key they were ranked for, JSON).
        self.alternates: tuple[tuple, dict] | None = None

    def compose(self) -> ComposeResult:
        with Horizontal(id="ws"):
            with VerticalScroll(id="form"):
                for heading, keys in SECTIONS:
                    yield Static(heading, classes="form-heading")
                    for key in keys:
                        yield from self._field(FIELD_BY_KEY[key])
                yield Static("Scope capture (optional)", id="capture-heading", classes="form-heading")
                for spec in CAPTURE_FIELDS:
                    yield from self._field(spec)
                yield Static("Report", classes="form-heading")
                for spec in REPORT_FIELDS:
                    yield from self._field(spec)
                yield Static("", id="form-note")
            with VerticalScroll(id="outcome"):
                yield Static("", id="headline")
                yield Static("", id="timing", classes="panel")
                yield Static("", id="notes", classes="panel")
                yield TimingPicture(id="picture", classes="panel")
                yield Static("", id="findings", classes="panel")
                yield Static("", id="pins", classes="panel")
                yield Static("", id="rework", classes="panel")
                yield OptionList(id="alternates", classes="panel")
        yield Footer()

    @staticmethod
    def _field(spec) -> ComposeResult:
        with Horizontal(classes="field-row"):
            yield Label(spec.label, classes="field-label")
            yield Input(placeholder=spec.placeholder, id=f"f-{spec.key}", tooltip=spec.tip)
        yield Static("", id=f"e-{spec.key}", classes="field-error")

    def on_mount(self) -> None:
        self.query_one("#form").border_title = "Circuit"
        self.query_one("#timing").border_title = "Values and band"
        self.query_one("#notes").border_title = "Notes"
        self.query_one("#picture").border_title = "Timing picture"
        self.query_one("#findings").border_title = "Findings"
        self.query_one("#pins").border_title = "Pin map"
        self.query_one("#rework").border_title = "Rework at the bench"
        self.query_one("#alternates").border_title = "Alternates, best first (Enter swaps to it)"
        self.query_one("#alternates").display = False
        self.set_class(self.app.size.width < NARROW_BELOW, "narrow")
        self.take_pending()
        self.recompute()
        self.query_one("#f-old", Input).focus()

    def on_resize(self, event) -> None:
        self.set_class(event.size.width < NARROW_BELOW, "narrow")
        self.app.check_size()

    def on_screen_resume(self) -> None:
        if self.take_pending():
            self.recompute()

    def take_pending(self) -> bool:
        """Fields handed over by another desk. With ``replace`` (a BOM row) every field is
        cleared first, so nothing from earlier work survives next to the row's values."""
        pending = getattr(self.app, "pending_fields", None)
        if not pending:
            return False
        if pending.pop("__replace__", None):
            for spec in ALL_FIELDS:
                self.query_one(f"#f-{spec.key}", Input).value = ""
        for key, value in list(pending.items()):
            try:
                self.query_one(f"#f-{key}", Input).value = value
            except Exception:  # a key this form does not have: ignore it
                pass
        pending.clear()
        return True

    # --- recomputation -------------------------------------------------------------
    def on_input_changed(self, event: Input.Changed) -> None:
        if event.input.id == "f-report":
            return
        if self._timer is not None:
            self._timer.stop()
        self._timer = self.set_timer(DEBOUNCE, self.recompute)

    def raw_fields(self) -> dict[str, str]:
        return {spec.key: self.query_one(f"#f-{spec.key}", Input).value for spec in ALL_FIELDS}

    def recompute(self) -> None:
        """Read the form, ask the engine, render; never raises."""
        self._timer = None
        raw = self.raw_fields()
        outcome = evaluate(self.app.catalog, raw)
        self.outcome = outcome
        self.show(outcome)
        self._queue_alternates(raw, outcome)

    def show(self, out: Outcome) -> None:
        for spec in ALL_FIELDS:
            err = self.query_one(f"#e-{spec.key}", Static)
            msg = out.field_errors.get(spec.key)
            err.update(Prose(Text(f"↳ {msg}", style=STYLE["danger"])) if msg else "")
            err.set_class(bool(msg), "shown")
            self.query_one(f"#f-{spec.key}", Input).set_class(bool(msg), "bad")
        note = self.query_one("#form-note", Static)
        headline = self.query_one("#headline", Static)
        if out.kind == "empty":
            headline.update(Prose(Text(out.hint or "", style=STYLE["dim"])))
            note.update("")
            self._show_result(None)
            return
        if out.kind == "error":
            line = Text()
            if out.part:
                line.append(out.part, style=STYLE["id"])
                if out.new_part:
                    line.append(" → ")
                    line.append(out.new_part, style=STYLE["id"])
                line.append("  ")
            line.append(out.problem or "fix the marked field", style=STYLE["warning"])
            headline.update(Prose(line))
            note.update(Prose(Text("nothing recomputed until the form reads", style=STYLE["dim"])))
            self._show_result(None)
            return
        note.update("")
        head = Text()
        if out.kind == "swap":
            head.append(out.part or "", style=STYLE["id"])
            head.append(" → ")
            head.append(out.new_part or "", style=STYLE["id"])
            cls = out.data.get("class")
            if cls:
                style = STYLE["danger"] if cls == "unsuitable" else STYLE["warning"] if cls in ("rewire", "redesign") else STYLE["good"]
                head.append("   class ", style=STYLE["dim"])
                head.append(str(cls), style=style)
                head.append(f" ({class_words(cls)})", style=STYLE["dim"])
        else:
            head.append(out.part or "", style=STYLE["id"])
            mode = out.data.get("mode")
            head.append(f"  check{'' if not mode else ' · ' + str(mode)}", style=STYLE["dim"])
        worst = out.findings[0]["severity"] if out.findings else None
        if worst:
            n = sum(1 for f in out.findings if f.get("severity") == worst)
            head.append(f"   {n} {SEVERITY_MARK[worst]}{'s' if n > 1 and worst != 'danger' else ''}", style=STYLE.get(worst))
        headline.update(Prose(head))
        self._show_result(out)

    def _show_result(self, out: Outcome | None) -> None:
        timing = self.query_one("#timing", Static)
        notes = self.query_one("#notes", Static)
        picture = self.query_one("#picture", TimingPicture)
        findings = self.query_one("#findings", Static)
        pins = self.query_one("#pins", Static)
        rework = self.query_one("#rework", Static)
        for w in (timing, notes, picture, findings):
            w.display = out is not None
        is_swap = out is not None and out.kind == "swap"
        pins.display = rework.display = is_swap
        if out is None:
            picture.result = None
            return
        data = out.data
        if is_swap:
            tables: list = []
            for side in ("old", "new"):
                d = data.get(side) or {}
                fam = d.get("family") or side
                tables.append(timing_table(d.get("timing"), f"{side}: {fam}"))
                tables.append(values_line(d.get("values")))
            timing.update(Group(*tables))
            notes.update(Group(*_prose(swap_summary(data) + _extras(data))))
            pins.update(pin_map_view(data.get("pin_map")))
            rework.update(rework_view(data.get("rework")))
        else:
            timing.update(Group(timing_table(data.get("timing")), values_line(data.get("values"))))
            notes.update(Group(*_prose(_extras(data))))
        notes.display = bool(_extras(data)) or (is_swap and bool(swap_summary(data)))
        from advisor.picture import family_edge
        from advisor.report.capture import usable

        fam = self.app.catalog.families.get(str(out.new_part or out.part or "").upper())
        picture.edge = family_edge(fam)
        # The swap's own JSON carries the fitted part's row; a capture is drawn on its window.
        picture.result = out.timing_json if usable(data.get("capture")) else data
        findings.update(findings_view(out.findings))

    # --- alternates -----------------------------------------------------------------
    _ALT_KEYS = ("old", "mode", "vcc", "new_vcc", "r", "rb", "c", "pot", "pot_setting", "trigger_period",
                 "trigger_edge", "trigger_high", "measured", "measured_quantity", "r_tol", "c_tol", "series", "capture")

    def _queue_alternates(self, raw: dict[str, str], out: Outcome) -> None:
        """Rank the catalog for the part on the form (in a worker, after a pause in typing)."""
        box = self.query_one("#alternates", OptionList)
        if out.kind not in ("check", "swap"):
            box.display = False
            return
        key = tuple(raw.get(k, "").strip() for k in self._ALT_KEYS)
        if self.alternates is not None and self.alternates[0] == key:
            box.display = True
            return
        self._alt_key = key
        if self._alt_timer is not None:
            self._alt_timer.stop()
        self._alt_timer = self.set_timer(ALTERNATES_DEBOUNCE, lambda: self._rank(key, dict(raw)))

    @work(thread=True, exclusive=True, group="alternates")
    def _rank(self, key: tuple, raw: dict[str, str]) -> None:
        from advisor.tui.bridge import rank_alternates

        answer = rank_alternates(self.app.catalog, {**raw, "new": ""})
        try:
            self.app.call_from_thread(self._show_alternates, key, answer)
        except RuntimeError:  # the app closed while ranking
            pass

    @dropped_when_closed
    def _show_alternates(self, key: tuple, answer) -> None:
        if key != self._alt_key:
            return  # the form changed since: a newer ranking is on its way
        box = self.query_one("#alternates", OptionList)
        box.clear_options()
        data, problem = answer
        if problem or not data:
            box.display = False
            return
        self.alternates = (key, data)
        for i, c in enumerate(data.get("candidates") or [], 1):
            line = Text(no_wrap=True, overflow="ellipsis")
            line.append(f"{i:>2}. ", style=STYLE["dim"])
            line.append(f"{c.get('family', '?'):<10}", style=STYLE["id"])
            line.append(f" {c.get('class', '')}", style=STYLE["key"])
            reason = c.get("rank_reason") or ""
            if reason:
                line.append(f"  {reason}", style=STYLE["dim"])
            box.add_option(Option(line, id=str(c.get("family"))))
        box.display = box.option_count > 0

    def on_option_list_option_selected(self, event: OptionList.OptionSelected) -> None:
        if event.option_list.id == "alternates" and event.option.id:
            self.query_one("#f-new", Input).value = event.option.id
            self.recompute()

    # --- actions --------------------------------------------------------------------
    def action_clear_form(self) -> None:
        for spec in ALL_FIELDS:
            self.query_one(f"#f-{spec.key}", Input).value = ""
        self.query_one("#f-old", Input).focus()

    #: Fields that belong to a part: they change sides with it.
    _EXCHANGED = (("old", "new"), ("maker", "new_maker"), ("divide", "new_divide"), ("old_package", "new_package"))

    def action_exchange(self) -> None:
        for a, b in self._EXCHANGED:
            old, new = self.query_one(f"#f-{a}", Input), self.query_one(f"#f-{b}", Input)
            old.value, new.value = new.value, old.value

    def action_write_report(self) -> None:
        """Write the HTML (or Markdown) report of what the desk shows now."""
        note = self.query_one("#form-note", Static)
        out = self.outcome
        if out is None or out.kind not in ("check", "swap"):
            note.update(Prose(Text("nothing to report yet: the form must read first", style=STYLE["warning"])))
            return
        from advisor.errors import RetimeError
        from advisor.report import render_report

        path = self.query_one("#f-report", Input).value.strip() or "retime-report.html"
        try:
            written = render_report(out.data, path, out.kind, self.app.catalog)
        except RetimeError as exc:
            from advisor.tui.bridge import ui_words

            note.update(Prose(Text(ui_words(exc.render()) or "", style=STYLE["danger"])))
            return
        except OSError as exc:
            note.update(Prose(Text(f"cannot write {path}: {exc.strerror or exc}", style=STYLE["danger"])))
            return
        note.update(Prose(Text(f"report written: {written}", style=STYLE["good"])))
