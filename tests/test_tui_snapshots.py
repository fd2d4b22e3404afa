"""Appearance snapshots of the workbench (pytest-textual-snapshot 1.1.0, SVG files in
tests/__snapshots__/). Regenerate after a deliberate change of look with
``python -m pytest tests/test_tui_snapshots.py --snapshot-update`` and review the SVGs.

The desks run on a one-family inline catalog so a new catalog file or rule elsewhere in
the project does not change these pictures; the family's figures are the Philips
74HC/HCT221 product specification's (December 1990): 2-6 V operation, 7 V absolute
maximum, t = 0.7·Rext·Cext, DIP-16 pinout.
"""

from __future__ import annotations

import pytest

pytest.importorskip("textual")

from textual.app import App, ComposeResult  # noqa: E402

from advisor.catalog import Catalog, parse_family  # noqa: E402
from advisor.tui.app import Workbench  # noqa: E402
from advisor.tui.waveform import TimingPicture  # noqa: E402

SIZE = (120, 40)

_PINS = [
    (1, "1A", "TRIG_FALL", 1), (2, "1B", "TRIG_RISE", 1), (3, "1RD", "CLEAR", 1), (4, "1QN", "QN", 1),
    (5, "2Q", "Q", 2), (6, "2Cext", "CEXT", 2), (7, "2Rext/Cext", "RCEXT", 2), (8, "GND", "GND", None),
    (9, "2A", "TRIG_FALL", 2), (10, "2B", "TRIG_RISE", 2), (11, "2RD", "CLEAR", 2), (12, "2QN", "QN", 2),
    (13, "1Q", "Q", 1), (14, "1Cext", "CEXT", 1), (15, "1Rext/Cext", "RCEXT", 1), (16, "VCC", "VCC", None),
]

FAMILY = {
    "id": "74HC221",
    "title": "Dual non-retriggerable monostable multivibrator with reset (HC)",
    "function": "monostable",
    "technology": "hc",
    "channels": 2,
    "status": "active",
    "part_numbers": ["74HC221"],
    "supply": {"recommended": {"min": 2.0, "max": 6.0, "source": "philips"},
               "absolute_max": {"value": 7.0, "source": "philips"}},
    "timing": {"law": "krc", "constants": {"k": [{"value": 0.7, "source": "philips"}]}},
    # Resistor limits are not in the Philips sheet: common practice, marked as memory.
    "components": {"r_min": [{"value": 1000, "source": "memory"}], "r_max": [{"value": 1.0e6, "source": "memory"}]},
    "behaviour": {
        "retrigger": "no", "retrigger_source": "philips",
        "triggers": [
            {"name": "nA", "function": "TRIG_FALL", "edge": "falling", "schmitt": False, "enable": {"TRIG_RISE": "high", "CLEAR": "high"}},
            {"name": "nB", "function": "TRIG_RISE", "edge": "rising", "schmitt": True, "enable": {"TRIG_FALL": "low", "CLEAR": "high"}},
        ],
        "clear": {"name": "nRD", "active": "low", "ends_pulse": True, "triggers_on_release": True, "source": "philips"},
    },
    "interface": {"inputs": "cmos"},
    "packages": [{"name": "DIP-16", "source": "philips",
                  "pins": [{"pin": p, "name": n, "function": f, "channel": c} for p, n, f, c in _PINS]}],
    "sources": [{"id": "philips", "title": "74HC/HCT221 Dual non-retriggerable monostable multivibrator with reset",
                 "document": "Philips Semiconductors product specification, December 1990", "kind": "datasheet"}],
}


def tiny_catalog() -> Catalog:
    fam, problems = parse_family(FAMILY, "inline")
    assert fam is not None, problems
    return Catalog(families={fam.id.upper(): fam}, files={fam.id.upper(): "inline"})


def test_lookup_desk_with_a_part_typed(snap_compare):
    assert snap_compare(Workbench(tiny_catalog()), press=[*"74HC221", "_"], terminal_size=SIZE)


def test_help_card(snap_compare):
    assert snap_compare(Workbench(tiny_catalog()), press=["f1", "_"], terminal_size=SIZE)


def steady_cursor(pilot) -> None:
    """A blinking text cursor is drawn or not by the clock: hold it steady so the picture is too."""
    from textual.widgets import Input

    for box in pilot.app.screen.query(Input):
        box.cursor_blink = False


def test_workspace_with_a_bad_value(snap_compare):
    async def type_form(pilot) -> None:
        await pilot.press("f3")
        await pilot.pause()
        steady_cursor(pilot)
        await pilot.press(*"74HC221", "tab", "tab", "tab", "5", "tab", "tab", *"4x7")
        await pilot.pause(1.0)  # the debounced recompute, with room for a loaded machine

    assert snap_compare(Workbench(tiny_catalog()), run_before=type_form, terminal_size=SIZE)


@pytest.mark.parametrize("size", [(80, 24), (120, 40)])
def test_desk_with_a_result_keeps_numbers_whole(snap_compare, size):
    """A check with a trigger on the desk at the smallest usual terminal and a large one:
    whole numbers with their units in the values table, the picture on its own axis."""

    async def type_form(pilot) -> None:
        await pilot.press("f3")
        await pilot.pause()
        screen = pilot.app.screen
        steady_cursor(pilot)
        for key, text in (("old", "74HC221"), ("vcc", "5"), ("r", "10k"), ("c", "10n"), ("trigger_period", "100us")):
            screen.query_one(f"#f-{key}").value = text
        await pilot.pause(1.5)

    assert snap_compare(Workbench(tiny_catalog()), run_before=type_form, terminal_size=size)


class PictureApp(App):
    """Two timing pictures from fixed result JSON (the widget renders, it does not compute)."""

    CSS = "TimingPicture { border: round #4fb3a9; margin: 1; }"

    def compose(self) -> ComposeResult:
        # Philips 74HC221: 0.7 x 10 kΩ x 10 nF = 70 µs; with triggers every 50 µs the
        # non-retriggerable part fires on every 2nd trigger (the pulse outlasts the period).
        a = TimingPicture()
        a.result = {"timing": {"nominal": {"width": 70e-6}}, "trigger": {"period": 50e-6, "divide_by": 2, "stays_high": False}}
        yield a
        # The same pulse on a retriggerable part: each trigger restarts it, the output never falls.
        b = TimingPicture()
        b.result = {"timing": {"nominal": {"width": 70e-6}}, "trigger": {"period": 50e-6, "divide_by": None, "stays_high": True}}
        yield b


def test_timing_pictures(snap_compare):
    assert snap_compare(PictureApp(), terminal_size=(100, 24))
