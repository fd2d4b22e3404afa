"""The one text timing picture (advisor.picture) and the engine's pulse schedule.

Properties that must hold for any part: the picture shows the schedule's edges and no
others, a falling-edge trigger idles high and dips, the axis is chosen from what stays
put while the trimmer turns, and a pulse running past the window's end is not drawn
falling there. Real engine runs supply the results (no hand-made dicts).
"""

from __future__ import annotations

import json

import pytest

from advisor.cli.main import main
from advisor.picture import axis_for, column, facts_of, picture_rows, render_lines
from advisor.timing.trigger import schedule


def run_json(capsys, *argv: str) -> dict:
    assert main([*argv, "--json"]) == 0
    return json.loads(capsys.readouterr().out)


def row(rows, role: str, line: int = 0) -> str:
    return [r.text for r in rows if r.role == role][line]


@pytest.mark.parametrize("n", [1, 2, 3, 5])
def test_schedule_fires_every_nth_trigger_and_marks_a_running_pulse_open(n):
    s = schedule(7e-6, 2e-6, divide_by=n, window=41e-6)
    assert [k for k, f in enumerate(s.fired) if f] == list(range(0, len(s.triggers), n))
    assert all(a in s.triggers for a, _ in s.outputs)
    # Every edge listed lies strictly inside the window.
    assert all(0 < t < s.window for t, _ in s.edges())


def test_a_pulse_running_at_the_window_end_has_no_falling_edge_there():
    s = schedule(10e-6, None, window=5e-6, first=1e-6)
    assert s.open_end and s.outputs == ((1e-6, 5e-6),)
    assert s.edges() == [(1e-6, "rise")]


def test_stays_high_restarts_on_every_trigger_after_the_first():
    s = schedule(70e-6, 50e-6, stays_high=True, window=400e-6, first=10e-6)
    assert s.restarts == (False,) + (True,) * (len(s.triggers) - 1)
    assert len(s.outputs) == 1 and s.open_end


def test_falling_edge_trigger_is_drawn_falling(capsys):
    # 74HC221 nA is the falling-edge input (Philips 74HC/HCT221, Dec 1990, function table).
    j = run_json(capsys, "check", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "5",
                 "--trigger-period", "100us", "--trigger-edge", "falling")
    rows = picture_rows(j, 80)
    top, bottom = row(rows, "trigger", 0), row(rows, "trigger", 1)
    first = top.index("┐")
    assert top[:first].strip("─") == ""  # idles high before the first edge
    assert top[first + 1] == "┌" and bottom[first] == "└"
    rising = picture_rows(run_json(capsys, "check", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "5",
                                   "--trigger-period", "100us", "--trigger-edge", "rising"), 80)
    top = row(rising, "trigger", 0)
    assert top.lstrip(" ").startswith("┌┐")  # idles low, rises


def _fall_column(rows) -> int:
    bottom = row(rows, "new", 1)
    return bottom.index("└")


def test_turning_the_trimmer_moves_the_edge_on_a_fixed_axis(capsys):
    base = ["check", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "5", "--pot", "10k"]
    a = run_json(capsys, *base, "--pot-setting", "0.2")
    b = run_json(capsys, *base, "--pot-setting", "0.8")
    ax_a, ax_b = axis_for(facts_of(a)), axis_for(facts_of(b))
    assert ax_a == ax_b  # the axis does not follow the pulse
    ra, rb = picture_rows(a, 80), picture_rows(b, 80)
    assert row(ra, "axis") == row(rb, "axis") and row(ra, "ticks") == row(rb, "ticks")
    cols = 80 - 10
    wa, wb = (x["timing"]["nominal"]["width"] for x in (a, b))
    # t = 0.7 R C (Philips 74HC/HCT221): the edge moves by the width change on the axis' scale.
    expected = column(ax_a.lead + wb, ax_a, cols) - column(ax_a.lead + wa, ax_a, cols)
    assert expected > 5
    assert _fall_column(rb) - _fall_column(ra) == expected


def test_swap_picture_has_both_output_rows_and_the_band_bar(capsys):
    j = run_json(capsys, "swap", "74121", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "5",
                 "--trigger-period", "20us")
    rows = picture_rows(j, 80)
    roles = [r.role for r in rows]
    assert "old" in roles and "new" in roles and "band" in roles
    band = row(rows, "band")
    assert band.index("├") < band.index("●") < band.index("┤")
    # Divide by 4 (the engine's verdict): ignored triggers are marked between fired ones.
    marks = row(rows, "marks").replace(" ", "")
    assert marks.startswith("▲×××▲")
    text = "\n".join(render_lines(rows))
    assert "every 4th trigger" in text


def test_check_and_swap_print_the_picture_unless_told_not_to(capsys):
    args = ["swap", "74121", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "5", "--trigger-period", "20us"]
    assert main(args) == 0
    with_pic = capsys.readouterr().out
    assert main([*args, "--no-picture"]) == 0
    without = capsys.readouterr().out
    assert "trigger ↓" in with_pic and "trigger ↓" not in without
    assert set(without.splitlines()) <= set(with_pic.splitlines())  # otherwise the same text
    j = run_json(capsys, *args)
    assert "trigger ↓" not in json.dumps(j)
