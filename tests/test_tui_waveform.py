"""The timing picture lays out what the result says, nothing more.

Properties only: the picture must show the pulses the result's ``trigger`` JSON
implies (every trigger, one in n, or an output that never falls) and an astable's
duty within the resolution of one character column.
"""

from __future__ import annotations

import pytest

pytest.importorskip("textual")

from advisor.tui.waveform import _levels, draw, lay_out  # noqa: E402


def mono(width, period=None, divide_by=1, stays_high=False):
    out = {"timing": {"nominal": {"width": width}}}
    if period is not None:
        out["trigger"] = {"period": period, "divide_by": divide_by, "stays_high": stays_high}
    return out


@pytest.mark.parametrize("divide_by", [1, 2, 3, 5])
def test_one_trigger_in_n_fires(divide_by):
    # Property: a non-retriggerable one-shot whose pulse spans n trigger periods fires on
    # triggers 0, n, 2n ... (the result's divide_by); the others are ignored.
    lay = lay_out(mono(width=(divide_by - 0.5) * 10e-6, period=10e-6, divide_by=divide_by))
    kinds = [k for _, k in lay.marks]
    fired = [i for i, k in enumerate(kinds) if k == "fire"]
    assert fired == list(range(0, len(kinds), divide_by))
    assert len(lay.output_high) == len(fired)
    assert all(k == "skip" for i, k in enumerate(kinds) if i not in fired)


def test_stays_high_never_falls():
    lay = lay_out(mono(width=70e-6, period=50e-6, divide_by=None, stays_high=True))
    levels = _levels(lay.output_high, lay.span, 80)
    first = levels.index(True)
    assert all(levels[first:])  # once up, up to the right edge
    assert {k for _, k in lay.marks[1:]} == {"restart"}


def test_astable_duty_within_a_column():
    high, low = 5e-3, 2e-3  # duty 5/7
    lay = lay_out({"timing": {"nominal": {"high": high, "low": low}}})
    levels = _levels(lay.output_high, lay.span, 140)
    cols_per_period = 140 / (lay.span / (high + low))
    # Four periods drawn: the high share of the drawn periods matches the duty to a column each.
    assert sum(levels) == pytest.approx(4 * cols_per_period * high / (high + low), abs=4)


def test_a_pulse_narrower_than_a_column_still_shows():
    levels = _levels([(0.5, 0.5001)], 100.0, 50)
    assert sum(levels) == 1


@pytest.mark.parametrize("result", [None, {}, {"timing": None}, {"timing": {"nominal": {"width": None}}},
                                    {"timing": {"nominal": {"width": -1}}}, {"timing": {"nominal": {"width": 1e-6}}, "trigger": "x"}])
def test_missing_or_odd_results_draw_a_message_not_an_error(result):
    text = draw(result, 80).plain
    assert text  # either a picture or the "nothing to draw" line
