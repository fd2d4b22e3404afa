"""Reports: the page carries the pictures, the findings and the bench steps, and every
number it shows equals the result's JSON (the reporters compute no timing).

Most checks are properties that must hold for any result: the hand-written dicts in
support/report_fixtures.py are fixtures for shape handling, not claims about parts.
The end-to-end checks run the real swap and check engines on the issue's example.
"""

from __future__ import annotations

import json
import re
import subprocess
import sys
from pathlib import Path

import pytest
from support.report_fixtures import CHECK_ASTABLE, CHECK_STUCK, swap
from support.report_html import read_page

from advisor.catalog import load_catalog
from advisor.cli.main import main
from advisor.errors import InputError
from advisor.report import render_report, render_text, report_format
from advisor.report.model import build_report, build_waves
from advisor.values import format_code, format_eng, parse_quantity

ROOT = Path(__file__).resolve().parents[1]


@pytest.fixture(scope="module")
def catalog():
    return load_catalog()


def _lookup(result: dict, key: str):
    """Value at a dotted path like ``new.timing.nominal.width`` or ``candidates.0.values.r``."""
    node = result
    for part in key.split("."):
        node = node[int(part)] if isinstance(node, list) else node[part]
    return node


def _assert_numbers_match(page, result: dict) -> int:
    """Every number tagged with data-key equals the JSON value, and its text reads back
    to that value within the report's 4 significant digits (property of the format)."""
    tagged = page.with_attr("data-key")
    assert tagged, "the report tags no numbers"
    for node in tagged:
        expected = _lookup(result, node.attrs["data-key"])
        assert float(node.attrs["data-si"]) == pytest.approx(expected, rel=1e-12), node.attrs["data-key"]
        text = node.text.strip()
        if text.endswith("%"):  # signed error or duty, in percent with two decimals
            assert float(text.rstrip(" %")) == pytest.approx(expected * 100, abs=0.006)
        else:
            unit = {"s": "time", "Hz": "frequency", "Ω": "resistance", "F": "capacitance", "V": "voltage"}
            kind = next((k for u, k in unit.items() if text.endswith(u)), None)
            if kind:
                assert parse_quantity(text, kind) == pytest.approx(expected, rel=5e-4), text
    return len(tagged)


# --------------------------------------------------------------------------- swap (fixture)


def test_swap_page_has_pictures_findings_steps_and_the_results_numbers(tmp_path, catalog):
    result = swap()
    path = render_report(result, tmp_path / "swap.html", "swap", catalog)
    page = read_page(path.read_text(encoding="utf-8"))
    assert page.svgs >= 2  # issue 9: a timing diagram and a drawing of the network
    assert page.find("figure", "pic-timing") and page.find("figure", "pic-network")
    # Findings: all of them, most severe first, each with its fix and source.
    items = page.find("li", "finding")
    assert [n.attrs["data-rule"] for n in items] == ["fixture-danger", "fixture-warning", "fixture-note"]
    for f in result["findings"]:
        node = next(n for n in items if n.attrs["data-rule"] == f["rule"])
        assert f["message"] in node.text and f["source"] in node.text and f["fix"] in node.text
    # Bench steps in order.
    assert page.find("ol", "bench")
    bench = [n.text.strip() for n in page.nodes if n.tag == "li" and "section#bench" in n.parents]
    assert bench == result["rework"]
    # Numbers: the replacement's network and timing as the result states them.
    count = _assert_numbers_match(page, result)
    keys = {n.attrs["data-key"] for n in page.with_attr("data-key")}
    assert {"new.values.r", "new.values.pot", "new.values.c", "new.timing.nominal.width",
            "old.timing.nominal.width", "trigger.period"} <= keys
    assert count >= 10
    # The same R and C in the network table, with IEC 60062 value codes (Wikipedia "RKM code": 9k1, 10n).
    net = " ".join(n.text for n in page.find("table", "network"))
    assert format_code(result["new"]["values"]["r"], "resistance") == "9k1" and "9k1" in net
    assert format_code(result["new"]["values"]["c"], "capacitance") == "10n" and "10n" in net
    # The pulse width drawn in the timing picture is the result's nominal width.
    width_text = format_eng(result["new"]["timing"]["nominal"]["width"], "s", 4)
    assert width_text in page.find("figure", "pic-timing")[0].text


def test_page_is_self_contained_with_unique_svg_ids(tmp_path, catalog):
    text = render_text(swap(), "swap", "html", catalog)
    page = read_page(text)
    assert not {"script", "link", "iframe", "img", "object"} & page.tags
    assert "@import" not in text and "@font-face" not in text
    # The only URLs are XML namespace names inside the SVG and in-page references.
    urls = set(re.findall(r"https?://[^\s\"'<>)]+", text))
    assert urls <= {"http://www.w3.org/2000/svg", "http://www.w3.org/1999/xlink"}
    assert all(ref.startswith("#") for ref in re.findall(r"url\(([^)]*)\)", text))
    ids = page.svg_ids
    assert len(ids) == len(set(ids))  # two drawings must not share a clip-path id


def test_cautions_block_is_always_there(tmp_path, catalog):
    for result, kind in ((swap(), "swap"), (CHECK_ASTABLE, "check")):
        page = read_page(render_text(result, kind, "html", catalog))
        text = page.section_text("cautions")
        for word in ("mains", "burst", "absolute maximum", "datasheet", "local electrical codes", "licensed"):
            assert word in text, word


def test_stuck_high_and_divided_pictures_follow_the_result():
    # Property: with divide_by = n only every n-th trigger starts a pulse; with
    # stays_high the output is one interval over the whole window.
    r = swap()
    w = build_waves(r["new"]["timing"], r["trigger"], mode="mono", name="new")
    n = r["trigger"]["divide_by"]
    assert [k for k, f in enumerate(w.fired) if f] == list(range(0, len(w.triggers), n))
    starts = [a for a, _ in w.rows[-1][1]]
    assert starts == pytest.approx([k * r["trigger"]["period"] for k in range(0, len(w.triggers), n)])
    widths = {round(b - a, 15) for a, b in w.rows[-1][1][:-1]}
    assert widths == {round(r["new"]["timing"]["nominal"]["width"], 15)}
    s = build_waves(CHECK_STUCK["timing"], CHECK_STUCK["trigger"], mode="mono", name="out")
    assert s.stays_high and s.rows[-1][1] == ((0.0, s.end),)
    page = read_page(render_text(CHECK_STUCK, "check", "html"))
    assert "never falls" in page.find("figure", "pic-timing")[0].text


def test_astable_check_page(catalog):
    page = read_page(render_text(CHECK_ASTABLE, "check", "html", catalog))
    assert page.svgs == 2
    _assert_numbers_match(page, CHECK_ASTABLE)
    keys = {n.attrs["data-key"] for n in page.with_attr("data-key")}
    assert {"values.ra", "values.rb", "values.c", "timing.nominal.period", "timing.nominal.duty"} <= keys
    net = page.find("table", "network")[0].text
    # NE555 DIP-8: DIS pin 7, THRES pin 6, TRIG pin 2 (TI NE555 SLFS022 pinout; catalog checked
    # against kicad-symbols Timer.kicad_sym by the catalog tests).
    assert "pin 7" in net and "pin 6" in net and "pin 2" in net


def test_markdown_has_the_same_content(catalog):
    result = swap()
    md = render_text(result, "swap", "markdown", catalog)
    for heading in ("## At a glance", "## Pictures", "## What the checks found", "## Pin moves",
                    "## Bench steps", "## Take care", "## Where the numbers come from"):
        assert heading in md
    for f in result["findings"]:
        assert f["message"] in md
    for i, step in enumerate(result["rework"], 1):
        assert f"{i}. {step}" in md
    assert format_eng(result["new"]["timing"]["nominal"]["width"], "s", 4) in md
    assert "| R | timing resistor | 9.1 kΩ | 9k1 |" in md
    strip = md.split("```text\n", 1)[1].split("```", 1)[0].splitlines()
    # The one text picture (advisor.picture): the trigger row, then its marks; the result
    # divides by 4, so a fired trigger is followed by three ignored ones.
    assert strip[0].startswith("trigger")
    n = result["trigger"]["divide_by"]
    assert strip[2].replace(" ", "").startswith("▲" + "×" * (n - 1) + "▲")


def test_format_by_extension(tmp_path):
    assert report_format("a.HTML") == "html" and report_format("b.htm") == "html" and report_format("c.md") == "markdown"
    with pytest.raises(InputError, match=r"\.html, \.htm or \.md"):
        report_format("r.pdf")
    with pytest.raises(InputError, match="does not exist"):
        render_report(swap(), tmp_path / "missing" / "r.html", "swap")


def test_bom_and_alternates_shapes(catalog):
    bom = {"file": "parts.csv", "part_column": "MPN", "new_vcc": None, "summary": {"reviewed": 1, "out-of-scope": 1},
           "rows": [{"line": 1, "cells": {"MPN": "SN74121N"}, "status": "reviewed", "family": "74121", "score": 100.0,
                     "alternates": [{"family": "74LS221", "class": "rewire"}],
                     "findings": [{"rule": "r1", "severity": "warning", "message": "fixture message", "fix": "", "source": "s"}],
                     "reason": None},
                    {"line": 2, "cells": {"MPN": "RC0603-10K"}, "status": "out-of-scope", "family": None,
                     "alternates": [], "findings": [], "reason": "not a timer"}]}
    page = read_page(render_text(bom, "bom", "html", catalog))
    text = " ".join(n.text for n in page.find("table"))
    assert "SN74121N" in text and "74LS221 (rewire)" in text and "RC0603-10K" in text and "not a timer" in text
    assert [n.attrs["data-rule"] for n in page.find("li", "finding")] == ["r1"]
    rep = build_report({"old": swap()["old"], "candidates": [{**swap()["new"], "class": "rewire", "error": 0.01,
                                                               "rework": ["a", "b"], "findings": []}]}, "alternates", catalog)
    assert rep.extra_tables[0][1].rows[0][1:3] == ("74HC221", "rewire") and rep.rework == [("", "a"), ("", "b")]


# --------------------------------------------------------------------------- CLI, real engines


SWAP_ARGS = ["swap", "74121", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "5", "--trigger-period", "20us"]


def _swap_cli(tmp_path, name: str, capsys) -> tuple[Path, dict]:
    out = tmp_path / name
    assert main(SWAP_ARGS + ["--json", "--report", str(out)]) == 0
    captured = capsys.readouterr()
    assert "report written" in captured.err
    return out, json.loads(captured.out)


def test_cli_swap_report_matches_the_json(tmp_path, capsys):
    """Issue 9, done-when: the example swap writes a report with at least two pictures,
    the findings and the rework steps; its numbers equal the --json result's."""
    out, result = _swap_cli(tmp_path, "r.html", capsys)
    page = read_page(out.read_text(encoding="utf-8"))
    assert page.svgs >= 2
    assert len(page.find("li", "finding")) == len(result["findings"]) > 0
    bench = [n for n in page.nodes if n.tag == "li" and "section#bench" in n.parents]
    assert [n.text.strip().removeprefix(n.attrs.get("data-action", "")) for n in bench] == [s["detail"] for s in result["rework"]]
    _assert_numbers_match(page, result)
    pins = " ".join(n.text for n in page.find("table", "pin-map"))
    for link in result["pin_map"]["links"]:
        assert f"{link['new_pin']} ({link['new_name']})" in pins
    md, _ = _swap_cli(tmp_path, "r.md", capsys)
    assert "## Bench steps" in md.read_text(encoding="utf-8")


def test_cli_check_report_and_bad_extension(tmp_path, capsys):
    out = tmp_path / "c.html"
    assert main(["check", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "5", "--json", "--report", str(out)]) == 0
    result = json.loads(capsys.readouterr().out)
    page = read_page(out.read_text(encoding="utf-8"))
    assert page.svgs == 2
    _assert_numbers_match(page, result)
    with pytest.raises(SystemExit) as exc:
        main(["check", "74HC221", "--r", "10k", "--c", "10n", "--report", str(tmp_path / "c.pdf")])
    assert exc.value.code == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and ".html, .htm or .md" in err


def test_report_machinery_stays_off_the_cli_start_up_path():
    code = ("import sys; from advisor.cli.main import build_parser; build_parser(); "
            "print(sorted(m for m in ('schemdraw', 'advisor.report') if m in sys.modules))")
    out = subprocess.run([sys.executable, "-c", code], cwd=ROOT, capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "[]"
