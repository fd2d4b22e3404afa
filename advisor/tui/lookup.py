"""Look-up desk: type a part number, see ranked families live and the chosen family's sheet."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical, VerticalScroll
from textual.screen import Screen
from textual.widgets import Footer, Input, OptionList, Static
from textual.widgets.option_list import Option

from advisor.tui.bridge import find_parts
from advisor.tui.palette import STYLE
from advisor.tui.sheet import render_sheet


#: Characters of a result line that fit the families list (see #lookup-left in the .tcss).
PROMPT_WIDTH = 36


def _hit_prompt(hit) -> Text:
    t = Text(no_wrap=True, overflow="ellipsis")
    t.append(f"{hit.family:<11}", style=STYLE["id"])
    if hit.how in ("list",):
        t.append(" " + hit.title, style=STYLE["dim"])
        t.truncate(PROMPT_WIDTH, overflow="ellipsis")
        return t
    t.append(f"{hit.score:5.0f} ", style=STYLE["key"])
    t.append(f"{hit.how:<10}", style=STYLE["dim"])
    t.append(hit.title, style=STYLE["dim"])
    t.truncate(PROMPT_WIDTH, overflow="ellipsis")
    return t


class LookupScreen(Screen):
    """Part look-up with live ranked results (``advisor.partnumber``) and the family sheet."""

    BINDINGS = [
        Binding("down", "focus_results", "Families", show=False),
        Binding("ctrl+n", "use_as_new", "Use as replacement"),
        Binding("escape", "focus_query", "Back to typing", show=False),
    ]

    def compose(self) -> ComposeResult:
        with Horizontal(id="lookup"):
            with Vertical(id="lookup-left"):
                yield Static("Part number", classes="field-label")
                yield Input(placeholder="as printed, e.g. SN74LS221N", id="query")
                yield Static("", id="lookup-note")
                yield OptionList(id="results")
            with VerticalScroll(id="sheet-pane"):
                yield Static("", id="sheet")
        yield Footer()

    def on_mount(self) -> None:
        self.query_one("#sheet-pane").border_title = "Family sheet"
        self.query_one("#results").border_title = "Families"
        self.query_one("#lookup-note", Static).update(Text("reading the catalog …", style=STYLE["dim"]))
        query = self.query_one("#query", Input)
        start = getattr(self.app, "start_part", None) or ""
        if start:
            query.value = start
        query.focus()
        # The app reads the catalog in the background and calls back when it is there;
        # with a catalog given up front (tests) fill at once.
        if getattr(self.app, "_catalog", None) is not None:
            self._first_fill()
        else:
            self.app.on_catalog_ready = self._first_fill

    def _first_fill(self) -> None:
        self.app.on_catalog_ready = None
        self.refresh_results(self.query_one("#query", Input).value)

    def on_input_changed(self, event: Input.Changed) -> None:
        if event.input.id == "query":
            self.refresh_results(event.value)

    def refresh_results(self, text: str) -> None:
        hits, problem = find_parts(self.app.catalog, text, limit=60)
        results = self.query_one("#results", OptionList)
        results.clear_options()
        results.add_options([Option(_hit_prompt(h), id=h.family) for h in hits])
        note = self.query_one("#lookup-note", Static)
        problems = self.app.catalog.problems
        if problem:
            note.update(Text(problem, style=STYLE["warning"]))
        elif text.strip():
            best = hits[0] if hits else None
            msg = f"{len(hits)} famil{'y' if len(hits) == 1 else 'ies'}"
            if best is not None and best.how == "prefix":
                msg += " starting with " + repr(text.strip())
            elif best is not None and best.how == "fuzzy":
                msg += f" · no exact match; nearest {best.family}"
            note.update(Text(msg + " · Enter checks it, Ctrl+N takes it as the replacement", style=STYLE["dim"]))
        else:
            line = Text(f"{len(hits)} families in the catalog", style=STYLE["dim"])
            if problems:
                line.append(f" · {len(problems)} catalog problem(s): run 'retime catalog check'", style=STYLE["warning"])
            note.update(line)
        if hits:
            results.highlighted = 0
            self.show_sheet(hits[0].family)
        else:
            self.show_sheet(None)

    def show_sheet(self, family_id: str | None) -> None:
        sheet = self.query_one("#sheet", Static)
        if family_id is None:
            sheet.update(Text("No family to show.", style=STYLE["dim"]))
            return
        fam = self.app.catalog.families.get(family_id.upper())
        if fam is None:
            sheet.update(Text(f"{family_id}: not in the loaded catalog", style=STYLE["warning"]))
            return
        sheet.update(render_sheet(fam))
        self.query_one("#sheet-pane").scroll_home(animate=False)

    def on_option_list_option_highlighted(self, event: OptionList.OptionHighlighted) -> None:
        if event.option is not None and event.option.id:
            self.show_sheet(event.option.id)

    def on_option_list_option_selected(self, event: OptionList.OptionSelected) -> None:
        if event.option.id:
            self.app.open_in_workspace(old=event.option.id)

    def on_input_submitted(self, event: Input.Submitted) -> None:
        chosen = self._chosen()
        if chosen:
            self.app.open_in_workspace(old=chosen)

    def _chosen(self) -> str | None:
        results = self.query_one("#results", OptionList)
        if results.highlighted is None or results.option_count == 0:
            return None
        return results.get_option_at_index(results.highlighted).id

    def action_use_as_new(self) -> None:
        chosen = self._chosen()
        if chosen:
            self.app.open_in_workspace(new=chosen)

    def action_focus_results(self) -> None:
        self.query_one("#results", OptionList).focus()

    def action_focus_query(self) -> None:
        self.query_one("#query", Input).focus()
