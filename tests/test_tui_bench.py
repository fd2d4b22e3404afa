"""The workbench at the bench: a BOM row brings exactly its own values to the check/swap
desk, every command-line input has a field, the picture keeps its axis while the trimmer
turns, the layout holds at 80×24, a window below the minimum says so, the help card
scrolls, look-up filters by prefix, the desk ranks alternates and writes the report.

Driven through Textual's Pilot on the shipped catalog. Values that stand for the real
world name their source; the rest are properties that must hold for any catalog.
"""

from __future__ import annotations

import re

import pytest

pytest.importorskip("textual")

from rich.console import Console  # noqa: E402
from textual.widgets import Input, OptionList, Static  # noqa: E402

from advisor.cli.main import build_parser  # noqa: E402
from advisor.picture import axis_for, column, facts_of  # noqa: E402
from advisor.tui.app import MIN_SIZE, TooSmallScreen, Workbench  # noqa: E402
from advisor.tui.bridge import ALL_FIELDS  # noqa: E402
from advisor.tui.help import HelpScreen  # noqa: E402
from advisor.tui.waveform import draw  # noqa: E402
from advisor.tui.workspace import WorkspaceScreen  # noqa: E402

REPR_MARKS = ("{'", "['", "None", "True", "False")
UNIT = re.compile(r"^(?:[pnuµmkMG]?(?:s|Hz|Ω|F|V)|%)(?![A-Za-z])")


def shown(app, selector: str, width: int | None = None) -> str:
    """What a Static shows, printed at its own width (as on screen)."""
    widget = app.screen.query_one(selector, Static)
    w = width or max(20, widget.content_size.width)
    console = Console(width=w, record=True, color_system=None)
    console.print(widget.content)
    return console.export_text()


async def put(pilot, field: str, text: str) -> None:
    """Set a field and wait until the desk has recomputed from it (debounced)."""
    screen = pilot.app.screen
    box = screen.query_one(f"#f-{field}", Input)
    before = screen.outcome
    box.value = text
    await pilot.pause(0.2)
    for _ in range(100):
        if screen.outcome is not before and screen._timer is None:
            break
        await pilot.pause(0.05)


async def desk(pilot) -> WorkspaceScreen:
    await pilot.press("f3")
    await pilot.pause()
    assert isinstance(pilot.app.screen, WorkspaceScreen)
    return pilot.app.screen


def field(app, key: str) -> str:
    return app.screen.query_one(f"#f-{key}", Input).value


# --- a BOM row on the desk -----------------------------------------------------------


async def test_a_bom_row_brings_its_own_values_and_nothing_else(tmp_path):
    bom = tmp_path / "board.csv"
    bom.write_text("Ref,MPN,R,C,Supply\nU7,NE555P,10k,100n,15\n", encoding="utf-8")
    app = Workbench()
    async with app.run_test(size=(120, 40)) as pilot:
        await desk(pilot)
        # Earlier work on the desk: another part, its own trimmer, trigger and supply.
        for key, text in (("old", "74HC221"), ("r", "4k7"), ("c", "2n2"), ("vcc", "3.3"), ("pot", "10k"),
                          ("pot_setting", "0.3"), ("trigger_period", "50us"), ("trigger_edge", "falling"),
                          ("r_tol", "1%"), ("target", "80us")):
            await put(pilot, key, text)
        await pilot.press("f4")
        await pilot.pause()
        app.screen.query_one("#bom-new-vcc", Input).value = "5"
        app.screen.query_one("#bom-path", Input).value = str(bom)
        app.screen.start_review()
        for _ in range(200):  # the review runs in a worker thread
            await pilot.pause(0.05)
            if app.screen.result is not None:
                break
        table = app.screen.query_one("#bom-table")
        table.focus()
        table.move_cursor(row=0)
        await pilot.press("enter")
        await pilot.pause(0.4)
        assert isinstance(app.screen, WorkspaceScreen)
        values = {spec.key: field(app, spec.key) for spec in ALL_FIELDS}
        row = {"old": "NE555", "r": "10k", "c": "100n", "vcc": "15", "new_vcc": "5"}
        assert {k: values[k] for k in row} == row
        # Nothing from before survives: every other field is empty but the best alternate.
        assert {k: v for k, v in values.items() if v and k not in row and k != "new"} == {}
        out = app.screen.outcome
        assert out.kind in ("swap", "check"), out.problem
        side = out.data["old"]["values"] if out.kind == "swap" else out.data["values"]
        assert side["r"] == 10e3 and side["c"] == 100e-9 and side["vcc"] == 15.0
        assert side["pot"] is None
        if out.kind == "swap":
            assert out.data["new"]["vcc"] == 5.0  # the 15 V -> 5 V move is analysed as such


# --- every command-line input has a field --------------------------------------------

#: Flags of check/swap and the form field that takes them (several flags share a field:
#: --ra and --r are the main resistor; the measured and target flags share one field
#: and its "is" choice).
FLAG_FIELD = {
    "--vcc": "vcc", "--r": "r", "--ra": "r", "--rb": "rb", "--pot": "pot", "--pot-setting": "pot_setting",
    "--c": "c", "--cont": "cont", "--r-tol": "r_tol", "--c-tol": "c_tol", "--trigger-period": "trigger_period",
    "--trigger-high": "trigger_high", "--trigger-edge": "trigger_edge", "--mode": "mode",
    "--measured-width": "measured", "--measured-high": "measured", "--measured-low": "measured",
    "--measured-period": "measured", "--measured-quantity": "measured_quantity", "--measured-from": "capture",
    "--trigger-channel": "trigger_channel", "--output-channel": "output_channel", "--target-width": "target",
    "--target-period": "target", "--target-freq": "target", "--new-vcc": "new_vcc", "--series": "series",
    "--old-package": "old_package", "--new-package": "new_package", "--keep-within": "keep_within",
    "--report": "report", "--pot-in": "pot_in", "--maker": "maker", "--c-series": "c_series",
    "--pot-tol": "pot_tol", "--pot-end": "pot_end",
    # The form's Maker names the part on the board (swap's --old-maker); a new part's maker
    # comes from its part number on the form.
    "--old-maker": "maker",
}
#: Flags that are not circuit inputs (output form, catalog location, check-only statistics).
#: --divide (a counter timer's divide ratio) has no form field yet: the workbench times counter
#: timers at their oscillator; giving the form a divide field is open work.
NOT_ON_THE_FORM = {"--json", "--catalog", "--no-picture", "--help", "--fail-on", "--range", "--monte-carlo",
                   "--divide", "--new-divide"}


def test_every_circuit_flag_of_check_and_swap_has_a_field():
    parser = build_parser()
    keys = {spec.key for spec in ALL_FIELDS}
    sub = next(a for a in parser._actions if a.__class__.__name__ == "_SubParsersAction")
    for cmd in ("check", "swap"):
        flags = {o for a in sub.choices[cmd]._actions for o in a.option_strings if o.startswith("--")}
        missing = {f for f in flags - NOT_ON_THE_FORM if FLAG_FIELD.get(f) not in keys}
        assert not missing, (cmd, missing)


# --- the picture on a fixed axis -----------------------------------------------------


async def test_turning_the_trimmer_moves_the_edge_on_a_fixed_axis():
    app = Workbench()
    async with app.run_test(size=(120, 40)) as pilot:
        await desk(pilot)
        for key, text in (("old", "74HC221"), ("vcc", "5"), ("r", "10k"), ("c", "10n"), ("pot", "10k"),
                          ("pot_setting", "0.2")):
            await put(pilot, key, text)
        picture = app.screen.query_one("#picture")
        width = picture.content_size.width
        a_data, a_text = app.screen.outcome.data, draw(picture.result, width, picture.edge).plain.splitlines()
        await put(pilot, "pot_setting", "0.8")
        b_data, b_text = app.screen.outcome.data, draw(picture.result, width, picture.edge).plain.splitlines()
        axis = [i for i, line in enumerate(a_text) if line.startswith("time")][0]
        assert a_text[axis:axis + 2] == b_text[axis:axis + 2]  # the axis did not move
        ax = axis_for(facts_of(a_data))
        assert ax == axis_for(facts_of(b_data))
        cols = width - 10
        wa, wb = a_data["timing"]["nominal"]["width"], b_data["timing"]["nominal"]["width"]
        # Philips 74HC/HCT221 (1990): t = 0.7·R·C. Between the settings the wiper sweeps 0.6 of the
        # trimmer's travel; the travel is its 10 kΩ less the end resistance left at each stop
        # (1 % of the value by default, DEVELOPERS "trimmers": 100 Ω each), so 0.6·9.8 kΩ.
        assert wb - wa == pytest.approx(0.7 * 0.6 * (10e3 - 2 * 100) * 10e-9, rel=1e-6)
        out_row = [i for i, line in enumerate(a_text) if line.startswith("output")][0] + 1
        fall_a, fall_b = a_text[out_row].index("└"), b_text[out_row].index("└")
        expected = column(ax.lead + wb, ax, cols) - column(ax.lead + wa, ax, cols)
        assert expected > 0 and fall_b - fall_a == expected


async def test_a_falling_edge_trigger_is_drawn_falling_on_the_desk():
    app = Workbench()
    async with app.run_test(size=(120, 40)) as pilot:
        await desk(pilot)
        for key, text in (("old", "74HC221"), ("vcc", "5"), ("r", "10k"), ("c", "10n"),
                          ("trigger_period", "100us"), ("trigger_edge", "falling")):
            await put(pilot, key, text)
        picture = app.screen.query_one("#picture")
        lines = draw(picture.result, picture.content_size.width, picture.edge).plain.splitlines()
        top = lines[0][10:]
        first = top.index("┐")
        assert set(top[:first]) <= {"─"} and top[first + 1] == "┌"  # idles high, dips at the trigger


# --- layout ----------------------------------------------------------------------------


def _split_numbers(text: str) -> list[str]:
    """Lines that end in a number whose unit starts the next line."""
    lines = text.splitlines()
    return [a + " / " + b for a, b in zip(lines, lines[1:])
            if re.search(r"\d$", a.rstrip()) and UNIT.match(b.strip())]


@pytest.mark.parametrize("size", [(80, 24), (120, 40)])
async def test_results_never_split_a_number_from_its_unit(size):
    app = Workbench()
    async with app.run_test(size=size) as pilot:
        await desk(pilot)
        for key, text in (("old", "74121"), ("new", "74HC221"), ("vcc", "5"), ("r", "10k"), ("c", "10n"),
                          ("trigger_period", "20us")):
            await put(pilot, key, text)
        assert app.screen.outcome.kind == "swap"
        for sel in ("#headline", "#timing", "#notes", "#findings", "#pins", "#rework"):
            text = shown(app, sel)
            assert not _split_numbers(text), (sel, _split_numbers(text))
            for mark in REPR_MARKS:
                assert mark not in text, (sel, mark)
        # The values table keeps every column: nominal, band min, band max, whole.
        timing = shown(app, "#timing")
        from advisor.values import format_eng

        t = app.screen.outcome.data["new"]["timing"]
        line = [ln for ln in timing.splitlines() if ln.strip().startswith("width")][-1]
        cells = [format_eng(t[k]["width"], "s") for k in ("nominal", "min", "max")]
        assert all(c in line for c in cells), (line, cells)


async def test_below_the_minimum_size_a_plain_message_asks_for_more():
    app = Workbench()
    async with app.run_test(size=(MIN_SIZE[0] - 12, MIN_SIZE[1])) as pilot:
        await pilot.pause(0.2)
        assert isinstance(app.screen, TooSmallScreen)
        text = str(app.screen.query_one("#too-small", Static).content)
        assert f"{MIN_SIZE[0]}×{MIN_SIZE[1]}" in text and "larger" in text
        await pilot.resize_terminal(100, 30)
        await pilot.pause(0.2)
        assert not isinstance(app.screen, TooSmallScreen)


async def test_help_scrolls_at_80_by_24():
    app = Workbench()
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press("f1")
        await pilot.pause()
        assert isinstance(app.screen, HelpScreen)
        card = app.screen.query_one("#help-card")
        assert card.max_scroll_y > 0  # more than fits: the cautions are below
        await pilot.press("end")
        await pilot.pause()
        assert card.scroll_y == card.max_scroll_y


# --- look-up -----------------------------------------------------------------------------


async def test_lookup_filters_by_prefix_in_natural_order():
    app = Workbench()
    async with app.run_test(size=(120, 40)) as pilot:
        await pilot.press(*"74H")
        await pilot.pause(0.2)
        results = app.screen.query_one("#results", OptionList)
        ids = [results.get_option_at_index(i).id for i in range(results.option_count)]
        assert ids and all(i.upper().startswith("74H") for i in ids)
        assert {"74HC123", "74HC221", "74HC4538"} <= set(ids)
        # Natural order: 74HC123 before 74HC221 before 74HC423 before 74HC4538.
        order = [ids.index(i) for i in ("74HC123", "74HC221", "74HC423", "74HC4538")]
        assert order == sorted(order)


# --- alternates and the report ----------------------------------------------------------


async def test_the_desk_lists_alternates_and_one_is_picked_to_swap(tmp_path):
    app = Workbench()
    async with app.run_test(size=(120, 40)) as pilot:
        await desk(pilot)
        for key, text in (("old", "74121"), ("vcc", "5"), ("r", "10k"), ("c", "10n")):
            await put(pilot, key, text)
        box = app.screen.query_one("#alternates", OptionList)
        for _ in range(200):  # ranked in a worker thread
            await pilot.pause(0.05)
            if box.option_count:
                break
        assert box.option_count > 0
        best = box.get_option_at_index(0).id
        assert best == app.screen.alternates[1]["candidates"][0]["family"]
        box.focus()
        box.highlighted = 0
        await pilot.press("enter")
        await pilot.pause(0.3)
        assert field(app, "new") == best and app.screen.outcome.kind == "swap"
        # Ctrl+W writes the report of what is on screen.
        report = tmp_path / "desk.md"
        await put(pilot, "report", str(report))
        await pilot.press("ctrl+w")
        await pilot.pause(0.2)
        text = report.read_text(encoding="utf-8")
        assert f"Replacing 74121 with {best}" in text
