"""Behaviour of the terminal workbench, driven through Textual's Pilot.

Each check drives the app the way a user does (keys into fields) and reads what the
screen shows. Values that stand for the real world are named with their source;
the rest are properties that must hold whatever the catalog's figures are.
"""

from __future__ import annotations

import pytest

pytest.importorskip("textual")

from textual.widgets import Input, OptionList, Static  # noqa: E402

from advisor.catalog import load_catalog  # noqa: E402
from advisor.tui.app import Workbench  # noqa: E402
from advisor.tui.help import HelpScreen  # noqa: E402
from advisor.tui.workspace import WorkspaceScreen  # noqa: E402

SIZE = (120, 40)


def rendered_text(app, selector: str) -> str:
    """Plain text of what a Static shows (its Rich content printed without colour)."""
    from rich.console import Console

    widget = app.screen.query_one(selector, Static)
    console = Console(width=200, record=True, color_system=None)
    console.print(widget.content)
    return console.export_text()


async def fill(pilot, field: str, text: str) -> None:
    """Replace one workspace field's text by typing it (the debounce then recomputes)."""
    box = pilot.app.screen.query_one(f"#f-{field}", Input)
    box.focus()
    await pilot.pause()
    box.value = ""
    await pilot.press(*text) if text else None
    await pilot.pause(0.15)  # longer than the workspace's debounce


async def open_workspace(pilot) -> WorkspaceScreen:
    await pilot.press("f3")
    await pilot.pause()
    assert isinstance(pilot.app.screen, WorkspaceScreen)
    return pilot.app.screen


def width_of(app) -> float:
    return app.screen.outcome.data["timing"]["nominal"]["width"]


# --- look-up desk -----------------------------------------------------------------------

async def test_first_screen_is_lookup_with_focus_in_the_query():
    app = Workbench()
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        assert app.current_mode == "lookup"
        assert isinstance(app.focused, Input) and app.focused.id == "query"


@pytest.mark.parametrize("typed", ["74HC221", "sn74hc221n"])  # maker prefix + package suffix: issue 3's list
async def test_typing_a_part_shows_that_part(typed):
    app = Workbench()
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press(*typed)
        await pilot.pause()
        results = app.screen.query_one("#results", OptionList)
        assert results.option_count >= 1
        assert results.get_option_at_index(0).id == "74HC221"
        sheet = rendered_text(app, "#sheet")
        assert "74HC221" in sheet
        # The sheet shows the published timing constant with its source (Philips 74HC221: t = 0.7·R·C).
        assert "0.7" in sheet


async def test_unknown_part_says_so_without_a_traceback():
    app = Workbench()
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press(*"QQQ###")
        await pilot.pause()
        note = rendered_text(app, "#lookup-note")
        assert "Traceback" not in note
        assert app.screen.query_one("#results", OptionList).option_count == 0
        assert "no famil" in note.lower() or "matches" in note.lower()


async def test_enter_takes_the_part_to_the_workspace():
    app = Workbench()
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press(*"74HC221", "enter")
        await pilot.pause(0.25)
        assert isinstance(app.screen, WorkspaceScreen)
        assert app.screen.query_one("#f-old", Input).value == "74HC221"



async def test_a_ranking_that_lands_after_the_desk_closed_is_dropped():
    # The alternates ranking runs in a worker thread; its answer can arrive after the desk left
    # the screen stack (Esc, or the app shutting down). A property of the design: it is dropped,
    # never a failed worker (seen as an intermittent NoMatches under load).
    app = Workbench()
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press(*"74HC221", "enter")
        await pilot.pause(0.25)
        desk = app.screen
        assert isinstance(desk, WorkspaceScreen)
    # The app has shut down and the desk's widgets are gone; the late answer must be dropped.
    desk._show_alternates(desk._alt_key, ({"candidates": [{"family": "74HC123"}]}, None))


# --- check/swap desk -------------------------------------------------------------------

async def test_changing_r_changes_the_width():
    app = Workbench()
    async with app.run_test(size=SIZE) as pilot:
        await open_workspace(pilot)
        await fill(pilot, "old", "74HC221")
        await fill(pilot, "vcc", "5")
        await fill(pilot, "c", "10n")
        await fill(pilot, "r", "10k")
        assert app.screen.outcome.kind == "check"
        first = width_of(app)
        # Philips 74HC221 product specification (1990): tW = 0.7·Rext·Cext -> 0.7 x 10 kΩ x 10 nF = 70 µs.
        assert first == pytest.approx(70e-6, rel=1e-6)
        assert "70 µs" in rendered_text(app, "#timing")
        await fill(pilot, "r", "20k")
        second = width_of(app)
        # Same law: the width is proportional to Rext, so doubling R doubles it (140 µs).
        assert second == pytest.approx(2 * first, rel=1e-6)
        assert "140 µs" in rendered_text(app, "#timing")


async def test_value_below_the_published_minimum_shows_a_danger_finding():
    cat = load_catalog()
    fam = cat.get("74HC221")
    r_min = min(v.value for v in fam.components.r_min if v.applies(5.0))
    app = Workbench()
    async with app.run_test(size=SIZE) as pilot:
        await open_workspace(pilot)
        await fill(pilot, "old", "74HC221")
        await fill(pilot, "vcc", "5")
        await fill(pilot, "c", "10n")
        # Property: a timing resistor a decade below the family's minimum Rext is forbidden.
        await fill(pilot, "r", f"{r_min / 10:g}")
        severities = [f["severity"] for f in app.screen.outcome.findings]
        assert "danger" in severities
        assert "DANGER" in rendered_text(app, "#findings")
        assert "DANGER" in rendered_text(app, "#headline")


async def test_supply_above_absolute_maximum_shows_a_danger_finding():
    app = Workbench()
    async with app.run_test(size=SIZE) as pilot:
        await open_workspace(pilot)
        await fill(pilot, "old", "74HC221")
        await fill(pilot, "r", "10k")
        await fill(pilot, "c", "10n")
        await fill(pilot, "vcc", "5")
        assert "danger" not in [f["severity"] for f in app.screen.outcome.findings]
        # Philips 74HC221 product specification (1990): supply absolute maximum 7 V; 15 V breaks it.
        await fill(pilot, "vcc", "15")
        assert "danger" in [f["severity"] for f in app.screen.outcome.findings]
        assert "DANGER" in rendered_text(app, "#findings")


async def test_a_bad_value_shows_an_inline_message_quoting_it():
    app = Workbench()
    async with app.run_test(size=SIZE) as pilot:
        await open_workspace(pilot)
        await fill(pilot, "old", "74HC221")
        await fill(pilot, "c", "10n")
        await fill(pilot, "r", "4x7")
        err = rendered_text(app, "#e-r")
        assert "'4x7'" in err
        assert "expected" in err and "resistance" in err
        assert app.screen.query_one("#e-r").display
        assert app.screen.query_one("#f-r", Input).has_class("bad")
        # Nothing computed from a half-read form, and no traceback anywhere.
        assert not app.screen.query_one("#timing").display
        assert "Traceback" not in rendered_text(app, "#headline")
        # Fixing the value clears the message and computes again.
        await fill(pilot, "r", "4k7")
        assert not app.screen.query_one("#e-r").display
        assert app.screen.outcome.kind == "check"


@pytest.mark.parametrize("field,text", [
    ("old", "no-such-part-zz"),
    ("vcc", "-5"),
    ("pot_setting", "150%"),
    ("trigger_period", "fast"),
    ("c", "0"),
])
async def test_bad_or_empty_input_never_shows_a_traceback(field, text):
    app = Workbench()
    async with app.run_test(size=SIZE) as pilot:
        await open_workspace(pilot)
        await fill(pilot, "old", "74HC221")
        await fill(pilot, "r", "10k")
        await fill(pilot, "c", "10n")
        await fill(pilot, field, text)
        screen_text = rendered_text(app, "#headline") + rendered_text(app, f"#e-{field}")
        assert "Traceback" not in screen_text
        assert app.screen.outcome.kind in ("error", "check")
        if field != "old":
            assert f"'{text}'" in rendered_text(app, f"#e-{field}")
        else:
            assert "no-such-part-zz" in rendered_text(app, "#headline")
        await fill(pilot, field, "")  # emptied again: still no traceback
        assert "Traceback" not in rendered_text(app, "#headline")


async def test_swap_shows_class_pin_map_and_rework():
    app = Workbench()
    async with app.run_test(size=SIZE) as pilot:
        await open_workspace(pilot)
        await fill(pilot, "old", "74121")
        await fill(pilot, "new", "74HC221")
        await fill(pilot, "vcc", "5")
        await fill(pilot, "r", "10k")
        await fill(pilot, "c", "10n")
        assert app.screen.outcome.kind == "swap"
        # 74121 (DIP-14, TI SN74121 sheet) into a 74HC221 (DIP-16, Philips sheet): the pins move,
        # so the swap cannot be a drop-in (issue 6 expects "rewire").
        assert app.screen.outcome.data["class"] not in ("drop-in", "drop-in-new-values")
        head = rendered_text(app, "#headline")
        assert "74121" in head and "74HC221" in head and app.screen.outcome.data["class"] in head
        pins = rendered_text(app, "#pins")
        assert "DIP-14" in pins and "DIP-16" in pins
        rework = rendered_text(app, "#rework")
        assert " 1. " in rework and " 2. " in rework  # ordered steps
        assert app.screen.query_one("#pins").display and app.screen.query_one("#rework").display
        # Ctrl+R exchanges the two parts, and what belongs to each part goes with it.
        await fill(pilot, "maker", "TI")
        app.screen.query_one("#f-old", Input).focus()
        await pilot.press("ctrl+r")
        await pilot.pause(0.15)
        assert app.screen.query_one("#f-old", Input).value == "74HC221"
        assert app.screen.query_one("#f-new", Input).value == "74121"
        assert app.screen.query_one("#f-new_maker", Input).value == "TI"
        assert app.screen.query_one("#f-maker", Input).value == ""


async def test_empty_workspace_asks_for_a_part():
    app = Workbench()
    async with app.run_test(size=SIZE) as pilot:
        await open_workspace(pilot)
        await pilot.pause(0.2)
        assert app.screen.outcome.kind == "empty"
        assert "part" in rendered_text(app, "#headline").lower()


# --- help and BOM ------------------------------------------------------------------------

async def test_help_card_carries_the_cautions_and_closes():
    app = Workbench()
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("f1")
        await pilot.pause()
        assert isinstance(app.screen, HelpScreen)
        text = rendered_text(app, "#help-cautions")
        for word in ("mains", "burst", "absolute maximum", "datasheet", "local codes"):
            assert word in text
        await pilot.press("escape")
        await pilot.pause()
        assert not isinstance(app.screen, HelpScreen)


async def test_bom_desk_reports_a_missing_file_inline(tmp_path):
    app = Workbench()
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("f4")
        await pilot.pause()
        await pilot.press(*str(tmp_path / "nothing.csv"), "enter")
        await pilot.pause(0.2)
        note = rendered_text(app, "#bom-note")
        assert "nothing.csv" in note and "Traceback" not in note


async def test_bom_desk_shows_every_row(tmp_path):
    # Part numbers as printed on real parts (issue 3's recognition list) plus lines out of scope.
    bom = tmp_path / "board.csv"
    bom.write_text("Ref,MPN,Qty\nU1,SN74LS221N,1\nU2,NE555P,1\nR1,RC0603FR-0710KL,4\nU3,,1\n", encoding="utf-8")
    app = Workbench()
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("f4")
        await pilot.pause()
        await pilot.press(*str(bom), "enter")
        for _ in range(100):  # the review runs in a worker thread
            await pilot.pause(0.05)
            if app.screen.result is not None:
                break
        assert app.screen.result is not None, rendered_text(app, "#bom-note")
        table = app.screen.query_one("#bom-table")
        assert table.row_count == 4  # every input row comes back
        summary = rendered_text(app, "#bom-summary")
        assert "summary" in summary
        # Enter on the first row (SN74LS221N) opens it on the check/swap desk.
        table.focus()
        table.move_cursor(row=0)
        await pilot.press("enter")
        await pilot.pause(0.2)
        assert isinstance(app.screen, WorkspaceScreen)
        assert app.screen.query_one("#f-old", Input).value == "74LS221"
