"""The HTML report's pictures, read back from their SVG (advisor.report.timing_svg,
diagrams, pinmove). Results come from real engine runs of the issue's example."""

from __future__ import annotations

import json
import re

import pytest

from advisor.catalog import load_catalog
from advisor.cli.main import main
from advisor.picture import axis_for, facts_of, schedules
from advisor.report import render_text
from advisor.report.model import build_report

SWAP = ["swap", "74121", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "5", "--trigger-period", "20us"]


@pytest.fixture(scope="module")
def catalog():
    return load_catalog()


@pytest.fixture
def swap_json(capsys):
    assert main([*SWAP, "--json"]) == 0
    return json.loads(capsys.readouterr().out)


def _timing_svg(html: str) -> str:
    return re.search(r'<figure class="pic-timing">(<svg.*?</svg>)', html, re.S).group(1)


def _verticals(d: str) -> list[float]:
    """x of every vertical step (an edge) in an M/H/V path."""
    xs, x = [], None
    for cmd, val in re.findall(r"([MHV])\s*([-\d.]+)", d):
        if cmd in ("M", "H"):
            x = float(val)
        elif cmd == "V":
            xs.append(x)
    return xs


def test_timing_svg_draws_every_edge_inside_the_window_and_none_at_its_end(swap_json, catalog):
    html = render_text(swap_json, "swap", "html", catalog)
    svg = _timing_svg(html)
    right = float(re.search(r'data-right="([\d.]+)"', svg).group(1))
    left = float(re.search(r'data-left="([\d.]+)"', svg).group(1))
    f = facts_of(swap_json)
    ax = axis_for(f)
    new, old = schedules(f, ax)
    for cls, sch in (("output new", new), ("output old", old)):
        d = re.search(rf'<path class="sig {cls}"[^>]* d="([^"]+)"', svg).group(1)
        xs = _verticals(d)
        assert all(left < x < right for x in xs), (cls, xs, right)  # none at the window's edges
        assert len(xs) == len(sch.edges())  # and every edge of the schedule is there
        expected = [left + t / ax.window * (right - left) for t, _ in sch.edges()]
        assert xs == pytest.approx(expected, abs=0.02)
    # The last pulse runs on past the window in this example (a pulse starts at the last fired trigger).
    assert new.open_end


def test_falling_edge_trigger_is_drawn_falling_in_the_svg(swap_json, catalog):
    # The 74121 fires on a falling edge at A1 (TI SN74121 data sheet, function table);
    # the swap carries that edge to 74HC221 nA.
    assert swap_json["pin_map"]["polarity"]["edge"] == "falling"
    svg = _timing_svg(render_text(swap_json, "swap", "html", catalog))
    d = re.search(r'<path class="sig trigger falling"[^>]* d="([^"]+)"', svg).group(1)
    start_y = float(re.match(r"M\s*[\d.]+\s+([\d.]+)", d).group(1))
    first_v = float(re.search(r"V\s*([\d.]+)", d).group(1))
    assert first_v > start_y  # idles high (small y), first step goes down: a falling edge
    assert "starts a pulse" in svg and "ignored" in svg  # marks named in words


def test_timing_axis_has_numbered_ticks(swap_json, catalog):
    svg = _timing_svg(render_text(swap_json, "swap", "html", catalog))
    ticks = re.findall(r'class="tick">([^<]+)<', svg)
    assert ticks[0] == "0" and len(ticks) >= 4 and all("s" in t for t in ticks[1:])


def test_network_drawing_carries_the_reworks_ties(swap_json, catalog):
    rep = build_report(swap_json, "swap", catalog)
    net = rep.networks[0]
    wanted = {(t["function"], t["level"]) for t in swap_json["pin_map"]["ties"] if t["channel"] == 1}
    assert set(net.ties) == wanted and net.trigger_in == "TRIG_FALL"
    html = render_text(swap_json, "swap", "html", catalog)
    fig = re.search(r'<figure class="pic-network">(.*?)</figure>', html, re.S).group(1)
    assert "trigger in" in fig


def test_pin_move_picture_highlights_moved_pins_with_their_step(swap_json, catalog):
    html = render_text(swap_json, "swap", "html", catalog)
    fig = re.search(r'<figure class="pic-pinmoves">(.*?)</figure>', html, re.S).group(1)
    moved_new = {ln["new_pin"] for ln in swap_json["pin_map"]["links"] if ln["moved"]}
    # The second outline (new part) highlights exactly the moved pins plus the tied ones.
    tied = {t["new_pin"] for t in swap_json["pin_map"]["ties"]}
    marked = re.findall(r'<rect class="pin (moved|tied)" data-pin="(\d+)"', fig)
    new_half = marked[len([m for m in marked]) - len(moved_new | tied):]
    assert {int(p) for _, p in new_half} == moved_new | tied
    steps = {int(s) for s in re.findall(r'class="step"[^>]*>(\d+)<', fig)}
    rework_pins = {s["n"] for s in swap_json["rework"] if s["pins"]}
    assert steps <= rework_pins and steps
