"""The workbench's capture field: a readable capture calibrates the check (and the swap)
exactly like ``--measured-from`` and the timing picture gains a measured row; a bad
path, an unreadable file or a bad channel number is said under the field.

The capture is made from an ngspice run of the behavioural one-shot in
support/captures.py (the simulator is the independent source): 10 kΩ, 10 nF, triggers
every 250 µs, width ln3·R·C (555 thresholds, TI NE555 SLFS022).
"""

from __future__ import annotations

import math

import pytest

pytest.importorskip("textual")

from support.captures import one_shot, sample, write_csv  # noqa: E402
from textual.widgets import Input, Static  # noqa: E402

from advisor.measure import measured_value  # noqa: E402
from advisor.tui.app import Workbench  # noqa: E402
from advisor.tui.bridge import evaluate  # noqa: E402
from advisor.tui.waveform import draw, lay_out  # noqa: E402

SIZE = (120, 40)


@pytest.fixture(scope="module")
def capture_path(tmp_path_factory):
    sim = one_shot(10e3, 10e-9, 250e-6)  # needs ngspice: skips locally without it
    t, ch = sample(sim, 30_000, noise=0.02, seed=11)
    return write_csv(tmp_path_factory.mktemp("cap") / "bench.csv", t, ch, "comma-seconds")


def shown(app, selector: str) -> str:
    from rich.console import Console

    console = Console(width=200, record=True, color_system=None)
    console.print(app.screen.query_one(selector, Static).content)
    return console.export_text()


async def put(pilot, field: str, text: str) -> None:
    """Set a field's text (as a paste would) and wait until the desk has recomputed from it.

    Waits on the desk's own state (a new outcome, no debounce timer pending), not on a
    fixed pause: a loaded machine runs the debounced recompute late.
    """
    screen = pilot.app.screen
    box = screen.query_one(f"#f-{field}", Input)
    box.focus()
    before = screen.outcome
    box.value = text
    await pilot.pause(0.3)
    for _ in range(200):
        if screen.outcome is not before and screen._timer is None:
            break
        await pilot.pause(0.05)


async def start(pilot, part: str = "NE555") -> None:
    await pilot.press("f3")
    await pilot.pause()
    for field, text in (("old", part), ("vcc", "5"), ("r", "10k"), ("c", "10n")):
        await put(pilot, field, text)


@pytest.mark.external
async def test_capture_field_calibrates_and_draws_the_measured_row(capture_path):
    app = Workbench()
    async with app.run_test(size=SIZE) as pilot:
        await start(pilot)
        assert app.screen.outcome.data["calibration"] is None
        await put(pilot, "capture", str(capture_path))
        out = app.screen.outcome
        assert out.kind == "check", out.problem
        # Exactly like --measured-from: the capture's median output width calibrates the check.
        assert out.data["calibration"]["measured"] == measured_value(capture_path)
        assert out.data["capture"]["file"] == str(capture_path)
        # ngspice one-shot: width ln3·R·C within 0.5 % (issue 10's acceptance).
        assert out.data["timing"]["nominal"]["width"] == pytest.approx(math.log(3) * 10e3 * 10e-9, rel=0.005)
        assert "bench.csv" in shown(app, "#notes")
        picture = app.screen.query_one("#picture")
        lay = lay_out(picture.result)
        assert lay is not None and lay.measured_high is not None
        # Property: one measured pulse per captured output rising edge.
        assert len(lay.measured_high) == len(out.data["capture"]["output"]["rising"])
        text = draw(picture.result, 100).plain
        assert "measured" in text and "predicted" in text
        # A swap keeps the measured width, and its picture has the measured row too.
        await put(pilot, "new", "TLC555")
        out = app.screen.outcome
        assert out.kind == "swap", out.problem
        assert out.data["kept"]["basis"] == "measured" and out.data["capture"] is not None
        assert lay_out(app.screen.query_one("#picture").result).measured_high is not None


@pytest.mark.parametrize("text,expected", [
    ("/no/such/folder/scope.csv", "cannot read the capture"),
    ("{tmp}", "cannot read the capture"),  # a folder, not a file
    ("{tmp}/notes.csv", "no usable time column"),
])
async def test_a_bad_capture_is_said_under_its_field(tmp_path, text, expected):
    (tmp_path / "notes.csv").write_text("bench notes\nno numbers here\n", encoding="utf-8")
    app = Workbench()
    async with app.run_test(size=SIZE) as pilot:
        await start(pilot)
        await put(pilot, "capture", text.format(tmp=tmp_path))
        msg = shown(app, "#e-capture")
        assert expected in msg and "Traceback" not in msg + shown(app, "#headline")
        assert app.screen.query_one("#e-capture").display
        assert app.screen.query_one("#f-capture", Input).has_class("bad")
        assert app.screen.outcome.kind == "error" and not app.screen.query_one("#timing").display
        await put(pilot, "capture", "")  # emptied: the check is back, uncalibrated
        assert app.screen.outcome.kind == "check" and not app.screen.query_one("#e-capture").display


def test_channel_fields_read_whole_numbers_only():
    from advisor.catalog import load_catalog

    out = evaluate(load_catalog(), {"old": "NE555", "r": "10k", "c": "10n", "trigger_channel": "one",
                                    "output_channel": "0"})
    assert out.kind == "error"
    assert "'one'" in out.field_errors["trigger_channel"] and "'0'" in out.field_errors["output_channel"]


@pytest.mark.external
def test_picture_of_a_falling_edge_trigger_shows_low_pulses(tmp_path):
    from advisor.measure.summary import capture_measurement
    from advisor.tui.waveform import _levels

    sim = one_shot(10e3, 10e-9, 250e-6)
    t, ch = sample(sim, 30_000, noise=0.02, seed=11)
    path = write_csv(tmp_path / "inverted.csv", t, [5.0 - ch[0], ch[1]], "comma-seconds")  # trigger upside down
    cap = capture_measurement(path).capture
    lay = lay_out({"timing": {"nominal": {"width": cap["width"]}}, "capture": cap})
    assert lay.trigger_active_low
    # Property: the trigger line is high with one low dip (at least a column) per captured falling edge.
    levels = [not v for v in _levels(lay.trigger_high, lay.span, 80)]
    dips = sum(1 for a, b in zip(levels, levels[1:]) if a and not b)
    assert dips == len(cap["trigger"]["falling"])
