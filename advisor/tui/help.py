"""The help card: keys of every desk and the safety cautions, over the current desk."""

from __future__ import annotations

from rich.table import Table
from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Footer, Static

from advisor.tui.palette import STYLE

KEYS: list[tuple[str, str, str]] = [
    ("everywhere", "F1", "this help card"),
    ("", "F2 / F3 / F4", "look up · check/swap · BOM review"),
    ("", "Tab / Shift+Tab", "next / previous field or list"),
    ("", "Ctrl+Q", "quit"),
    ("", "↑ ↓ PgUp PgDn", "scroll this card"),
    ("look up", "type", "families whose number starts with what you type, recognised part numbers first"),
    ("", "↓ / ↑", "move through the families; the sheet follows"),
    ("", "Enter", "check the chosen family on the check/swap desk"),
    ("", "Ctrl+N", "take the chosen family as the replacement"),
    ("check/swap", "type", "every change recomputes the values, band, findings and picture"),
    ("", "choices", "Mode, Trigger edge, Measured is, Target is: type the word or its start"),
    ("", "Enter on an alternate", "swap to it"),
    ("", "Ctrl+W", "write the report of what is on screen (Report file: .html or .md)"),
    ("", "Ctrl+L", "clear the form"),
    ("", "Ctrl+R", "exchange the part and its replacement"),
    ("BOM", "Enter", "read the file named in the path field"),
    ("", "Enter on a row", "open that row's part, values and best alternate on the check/swap desk"),
    ("", "Ctrl+S", "write the reviewed rows next to the input (…-reviewed.csv)"),
]

CAUTIONS: list[str] = [
    "Equipment on mains or other high voltage can kill: work on it unpowered, with the "
    "supply capacitors discharged, and only if you are qualified to do so.",
    "An electrolytic or tantalum capacitor fitted backwards, or run above its rated "
    "voltage, can vent or burst. Check the polarity marking before power is applied.",
    "A part run above its absolute maximum supply or input voltage can fail hot or short "
    "its supply; a DANGER finding here means the datasheet forbids the condition.",
    "Figures marked 'memory (unverified)' have no published source in the catalog yet.",
    "This tool is an aid, not a sign-off: the maker's current datasheet, local codes and "
    "licensed practice take precedence over anything shown here.",
]


def help_text() -> Table:
    t = Table(box=None, show_header=False, padding=(0, 2, 0, 0))
    t.add_column(style=STYLE["heading"], no_wrap=True)
    t.add_column(style=f"bold {STYLE['trigger']}", no_wrap=True)
    t.add_column()
    for desk, key, what in KEYS:
        t.add_row(desk, key, what)
    return t


def cautions_text() -> Text:
    text = Text()
    for i, c in enumerate(CAUTIONS):
        if i:
            text.append("\n")
        text.append("⚠ ", style=STYLE["danger"])
        text.append(c)
    return text


class HelpScreen(ModalScreen):
    """Keys and cautions; Escape, F1 or q closes it; the card scrolls when the window is short."""

    BINDINGS = [
        Binding("escape", "dismiss", "Close"),
        Binding("f1", "dismiss", "Close", show=False),
        Binding("q", "dismiss", "Close", show=False),
    ]

    def compose(self) -> ComposeResult:
        with VerticalScroll(id="help-card"):
            yield Static(Text("Keys", style=STYLE["heading"]), classes="help-title")
            yield Static(help_text(), id="help-keys")
            yield Static(Text("Cautions", style=STYLE["danger"]), classes="help-title")
            yield Static(cautions_text(), id="help-cautions")
            from advisor.tui.app import MIN_SIZE

            yield Static(Text(f"The workbench needs a window of at least {MIN_SIZE[0]}×{MIN_SIZE[1]}.",
                              style=STYLE["dim"]), classes="help-title")
        yield Footer()

    def on_mount(self) -> None:
        self.query_one("#help-card").focus()  # arrow keys and PgUp/PgDn scroll it
