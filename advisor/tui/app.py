"""The retime workbench: a Textual app with three desks and a help card.

Desks (switched with F2–F4, kept alive while you move between them):

- ``lookup``: type any part number, see ranked families and the family sheet;
- ``workspace``: check one part or swap it for another, recomputed on every keystroke;
- ``bom``: review a bill of materials file row by row.

The app holds the catalog and hands parts from one desk to another; the desks
render engine results and compute nothing themselves.
"""

from __future__ import annotations

import threading

from textual.app import App
from textual.binding import Binding

from textual.screen import ModalScreen
from textual.widgets import Static

from advisor.tui.bomview import BomScreen
from advisor.tui.help import HelpScreen
from advisor.tui.lookup import LookupScreen
from advisor.tui.workspace import WorkspaceScreen

#: The smallest terminal the desks are laid out for (columns, rows). Below it a plain
#: message asks for a larger window instead of a screen too cramped to read.
MIN_SIZE = (72, 20)


class TooSmallScreen(ModalScreen):
    """Covers the desks while the terminal is below :data:`MIN_SIZE`."""

    def compose(self):
        yield Static("", id="too-small")

    def on_mount(self) -> None:
        self.show_size()

    def on_resize(self, event) -> None:
        self.show_size()
        self.app.call_after_refresh(self.app.check_size)

    def show_size(self) -> None:
        w, h = self.app.size
        self.query_one("#too-small", Static).update(
            f"This window is {w}×{h}. The workbench needs at least {MIN_SIZE[0]}×{MIN_SIZE[1]}: "
            "please make the window larger (or the font smaller).")


class Workbench(App):
    """``retime ui``. ``catalog`` overrides the shipped one (tests pass a tiny one)."""

    CSS_PATH = "workbench.tcss"
    TITLE = "retime workbench"
    ENABLE_COMMAND_PALETTE = False
    MODES = {"lookup": LookupScreen, "workspace": WorkspaceScreen, "bom": BomScreen}
    DEFAULT_MODE = "lookup"
    BINDINGS = [
        Binding("f1", "show_help", "Help"),
        Binding("f2", "switch_mode('lookup')", "Look up"),
        Binding("f3", "switch_mode('workspace')", "Check/swap"),
        Binding("f4", "switch_mode('bom')", "BOM"),
        Binding("ctrl+q", "quit", "Quit", priority=True),
    ]

    def __init__(self, catalog=None, *, catalog_dirs: tuple[str, ...] = (), part: str | None = None,
                 bom_file: str | None = None) -> None:
        super().__init__()
        self._catalog = catalog
        self._catalog_dirs = tuple(catalog_dirs)
        self.start_part = part
        self.start_bom = bom_file
        #: Fields the workspace takes over when it is next shown (set by the lookup desk).
        self.pending_fields: dict[str, str] = {}
        self._catalog_lock = threading.Lock()
        #: Called on the UI thread once the catalog is read (the lookup desk fills its list).
        self.on_catalog_ready = None

    @property
    def catalog(self):
        """The catalog; waits for the background read if it is still running.

        Load problems do not stop the workbench: they stay listed in ``problems``.
        """
        with self._catalog_lock:
            if self._catalog is None:
                from advisor.catalog import load_catalog

                self._catalog = load_catalog(self._catalog_dirs)
            return self._catalog

    def on_mount(self) -> None:
        if self._catalog is None:
            # Read the catalog (and warm part-number recognition) off the UI thread, so the
            # first screen paints at once instead of after ~0.3 s of YAML and validation.
            threading.Thread(target=self._read_catalog, name="retime-catalog", daemon=True).start()
        if self.start_bom:
            self.switch_mode("bom")
        self.call_after_refresh(self.check_size)

    def on_resize(self, event) -> None:
        self.check_size()

    def check_size(self) -> None:
        small = self.size.width < MIN_SIZE[0] or self.size.height < MIN_SIZE[1]
        showing = isinstance(self.screen, TooSmallScreen)
        if small and not showing:
            self.push_screen(TooSmallScreen())
        elif showing and not small:
            self.pop_screen()

    def _read_catalog(self) -> None:
        try:
            cat = self.catalog
            from advisor.tui.bridge import find_parts

            find_parts(cat, "555")  # builds the recognition index once
        except Exception:  # shown by the desks when they touch the catalog themselves
            return
        try:
            self.call_from_thread(self._catalog_ready)
        except RuntimeError:  # the app closed while the catalog was being read
            pass

    def _catalog_ready(self) -> None:
        if self.on_catalog_ready is not None:
            self.on_catalog_ready()

    def action_show_help(self) -> None:
        if not isinstance(self.screen, HelpScreen):
            self.push_screen(HelpScreen())

    def open_in_workspace(self, *, replace: bool = False, **fields: str) -> None:
        """Take fields (``old``, ``new``, ``vcc`` ...) to the check/swap desk and show it.
        With ``replace`` every other field of the form is cleared (a BOM row brings all
        of its own values and nothing from earlier work may stay)."""
        if replace:
            self.pending_fields.clear()
            self.pending_fields["__replace__"] = "yes"
        self.pending_fields.update(fields)
        self.switch_mode("workspace")
