"""`retime board` on the shipped demo board (advisor/data/demo/bench_pulse_generator.kicad_sch).

The board is invented (the bundled scenario's instrument, tools/make_demo_board.py);
its parts and values are the demo's own, so the reader's findings are checked
against the values drawn on it. The timing figures are worked out by hand from the
datasheet laws named beside each assert, and the plan must agree with `retime swap`
run by hand on the same values.
"""

from __future__ import annotations

import json
import math
import os
import subprocess
import sys

import pytest

from advisor.board import read_board
from advisor.board.plan import plan_board
from advisor.resources import data_dir

DEMO = data_dir("demo") / "bench_pulse_generator.kicad_sch"


@pytest.fixture(scope="module")
def plan(catalog):
    return plan_board(catalog, read_board(DEMO), new_vcc=5.0).to_json()


@pytest.fixture(scope="module")
def catalog():
    from advisor.catalog import load_catalog

    return load_catalog()


def _timer(j, ref, channel=1):
    return next(t for t in j["timers"] if t["ref"] == ref and t["channel"] == channel)


def _plan(j, ref, channel=1):
    return next(p for p in j["plan"] if p["ref"] == ref and p["channel"] == channel)


def test_every_timer_and_one_shot_is_found(plan):
    # The board carries a 74121, a CD4538 (one section used), an NE555 and a 74LS123 (one section used).
    assert [(t["ref"], t["family"]) for t in plan["timers"]] == [
        ("U3", "74121"), ("U5", "CD4538B"), ("U7", "NE555"), ("U9", "74LS123")]
    assert plan["unresolved"] == []


def test_networks_supplies_and_trigger_sources(plan):
    u3 = _timer(plan, "U3")  # drawn: Rext R3 10k to +5V, Cext C3 10n, A1 from U1 pin 2 (74HC14 on +5V)
    assert (u3["r"], u3["c"], u3["vcc"]) == (10e3, 10e-9, 5.0)
    assert u3["parts"] == {"r": ["R3"], "c": ["C3"]}
    assert u3["trigger"]["source"] == "U1.2" and u3["trigger"]["source_supply"] == 5.0
    assert u3["trigger"]["edge"] == "falling"
    assert u3["inputs"]["pin 4 (A2)"]["state"] == "tied-high" and u3["inputs"]["pin 5 (B)"]["state"] == "tied-high"

    u5 = _timer(plan, "U5")  # drawn: Rx R5 100k to +15V, Cx C5 100n, A from the 555 output (U7 pin 3, +15V)
    assert (u5["r"], u5["c"], u5["vcc"]) == (100e3, 100e-9, 15.0)
    assert u5["trigger"]["source"] == "U7.3" and u5["trigger"]["source_supply"] == 15.0
    assert u5["trigger"]["edge"] == "rising"

    u7 = _timer(plan, "U7")  # drawn: RA R7 10k, RB R8 56k + trimmer RV1 22k (wiper tied to an end), C7 10n, C6 on CONT
    assert u7["mode"] == "astable"
    assert (u7["ra"], u7["rb"], u7["pot"], u7["c"], u7["vcc"]) == (10e3, 56e3, 22e3, 10e-9, 15.0)
    assert u7["parts"]["pot"] == ["RV1"]
    assert u7["cont"]["capacitance"] == 10e-9
    assert u7["inputs"]["pin 4 (RESET)"]["state"] == "tied-high"

    u9 = _timer(plan, "U9")  # drawn: Rext R9 47k, Cext C9 100n, B from U3 pin 6 (Q), CLR left open
    assert (u9["r"], u9["c"], u9["vcc"]) == (47e3, 100e-9, 5.0)
    assert u9["trigger"]["source"] == "U3.6" and u9["trigger"]["edge"] == "rising"
    assert u9["inputs"]["pin 3 (1CLR)"]["state"] == "open"


def test_todays_timing_matches_the_datasheet_laws_by_hand(plan):
    def nominal(ref):
        return _plan(plan, ref)["check"]["timing"]["nominal"]

    # 74121: tw = Cext·Rt·ln 2 (Fairchild DS006538) = 10 nF · 10 kΩ · 0.693 = 69.3 µs
    assert math.isclose(nominal("U3")["width"], 10e-9 * 10e3 * math.log(2), rel_tol=0.02)
    # CD4538B: tw = Rx·Cx (TI SCHS052 / onsemi MC14538B, K ≈ 1 at 15 V) = 100 kΩ · 100 nF = 10 ms
    assert math.isclose(nominal("U5")["width"], 10e-3, rel_tol=0.05)
    # NE555 astable: f = 1.44 / ((RA + 2 RB)·C) (TI SLFS022); RB = 56k + half the 22k trimmer = 67k
    # (the engine's default setting, stated as an assumption): 1.44 / (144 kΩ · 10 nF) = 1000 Hz
    assert math.isclose(nominal("U7")["frequency"], 1.44 / (144e3 * 10e-9), rel_tol=0.02)
    # 74LS123: tw = K·Rt·Cext, K = 0.45 for Cext > 1 nF (TI SDLS043): 0.45 · 47 kΩ · 100 nF = 2.115 ms
    assert math.isclose(nominal("U9")["width"], 0.45 * 47e3 * 100e-9, rel_tol=0.02)


_BY_HAND = {  # the same values typed into retime swap (see test above for where they come from)
    "U3": ["--vcc", "5", "--r", "10k", "--c", "10n", "--trigger-edge", "falling"],
    "U5": ["--vcc", "15", "--r", "100k", "--c", "100n", "--trigger-edge", "rising"],
    "U7": ["--vcc", "15", "--mode", "astable", "--ra", "10k", "--rb", "56k", "--pot", "22k", "--pot-in", "rb", "--c", "10n"],
    "U9": ["--vcc", "5", "--r", "47k", "--c", "100n", "--trigger-edge", "rising"],
}


@pytest.mark.parametrize("ref", sorted(_BY_HAND))
def test_plan_agrees_with_swap_run_by_hand(plan, ref):
    p = _plan(plan, ref)
    env = dict(os.environ, RETIME_CACHE=os.environ.get("RETIME_CACHE", "/tmp/retime-cache-tests"))
    out = subprocess.run([sys.executable, "-m", "advisor", "swap", p["old"], p["new"], *_BY_HAND[ref],
                          "--new-vcc", "5", "--json"], capture_output=True, text=True, env=env, timeout=120)
    assert out.returncode == 0, out.stderr
    hand = json.loads(out.stdout)
    assert hand["class"] == p["class"]
    assert hand["new"]["values"] == p["swap"]["new"]["values"]
    assert hand["timing"]["nominal"] == p["swap"]["timing"]["nominal"]
    assert [s["detail"] for s in hand["rework"]] == [s["detail"] for s in p["swap"]["rework"]]


def test_bom_delta_names_references(plan):
    d = plan["bom_delta"]
    assert {r["ref"] for r in d["replace"]} == {"U3", "U5", "U7", "U9"}
    for c in d["change"]:
        p = _plan(plan, c["for"].split()[0])
        assert c["new"] == p["swap"]["new"]["values"][c["role"]]
        assert c["old"] == p["swap"]["old"]["values"][c["role"]]
    assert sum(b["qty"] for b in d["buy"] if b["part"] in {r["new"] for r in d["replace"]}) == 4


def test_board_findings_come_from_the_board_rules(plan):
    u7 = {f["rule"] for f in _plan(plan, "U7")["board_findings"]}
    # +15V is shared by U7 and U5 with no capacitor across it on the sheet (drawn so on purpose)
    assert "board-bipolar-555-shared-rail-undecoupled" in u7
    if _plan(plan, "U7")["swap"]["new"]["technology"] == "cmos-555":
        assert "board-cont-capacitor-on-cmos-555" in u7  # C6 10n on CONT


def test_nets_in_json(plan):
    clock = next(n for n in plan["nets"] if "U7.3" in n["pins"])
    assert clock["pins"] == ["U5.4", "U7.3"] and clock["name"] == "/CLOCK"


def test_cli_text_json_and_reports(tmp_path):
    env = dict(os.environ, RETIME_CACHE=os.environ.get("RETIME_CACHE", "/tmp/retime-cache-tests"))
    base = [sys.executable, "-m", "advisor", "board", str(DEMO), "--new-vcc", "5"]
    text = subprocess.run(base + ["--report", str(tmp_path / "b.md")], capture_output=True, text=True, env=env, timeout=120)
    assert text.returncode == 0, text.stderr
    assert "U7: NE555 →" in text.stdout and "BOM delta" in text.stdout and "datasheets" in text.stdout
    md = (tmp_path / "b.md").read_text(encoding="utf-8")
    assert "## BOM delta" in md and "U9" in md
    js = subprocess.run(base + ["--json", "--report", str(tmp_path / "b.html")], capture_output=True, text=True,
                        env=env, timeout=120)
    assert js.returncode == 0, js.stderr
    j = json.loads(js.stdout)
    assert {"nets", "timers", "plan", "bom_delta", "unresolved"} <= set(j)
    assert (tmp_path / "b.html").read_text(encoding="utf-8").startswith("<!doctype html>")


def test_supply_for_a_net_that_is_not_there_is_listed(catalog):
    j = plan_board(catalog, read_board(DEMO), new_vcc=5.0, supplies={"VDD_X": 12.0}).to_json()
    assert any("--supply VDD_X" in u["reason"] for u in j["unresolved"])


def test_retime_demo_runs_the_board_too():
    env = dict(os.environ, RETIME_CACHE=os.environ.get("RETIME_CACHE", "/tmp/retime-cache-tests"))
    out = subprocess.run([sys.executable, "-m", "advisor", "demo", "--json"], capture_output=True, text=True,
                         env=env, timeout=120)
    assert out.returncode == 0, out.stderr
    board = json.loads(out.stdout)["board"]
    assert [t["ref"] for t in board["timers"]] == ["U3", "U5", "U7", "U9"] and board["new_vcc"] == 5.0


@pytest.mark.external
def test_demo_board_embeds_the_open_library_symbols_unchanged():
    """Every embedded library symbol has the installed library's pins (number, name, type, unit)."""
    from advisor.board import sexpr
    from advisor.board.geometry import read_lib_symbols
    from tests.support.external import kicad_symbols_dir
    from tests.support.kicad import symbol_pins

    lib_dir = kicad_symbols_dir()
    embedded = read_lib_symbols(sexpr.loads(DEMO.read_text(encoding="utf-8"), DEMO.name))
    assert {"Timer:NE555P", "74xx:74LS121", "74xx:74LS123", "4xxx:4538", "Device:R"} <= set(embedded)
    for lib_id, sym in embedded.items():
        lib, name = lib_id.split(":", 1)
        want = symbol_pins(lib_dir / f"{lib}.kicad_sym", name)
        assert want is not None, lib_id
        got = sorted((p.number, p.name, p.kind, p.unit) for p in sym.pins)
        assert got == sorted((p.number, p.name, p.kind, p.unit) for p in want), lib_id


@pytest.mark.external
def test_shipped_demo_board_is_the_generator_output(tmp_path):
    """tools/make_demo_board.py rebuilds the shipped file byte for byte from the installed library."""
    from tests.support.external import kicad_symbols_dir

    kicad_symbols_dir()
    sys.path.insert(0, str(DEMO.parents[3] / "tools"))
    try:
        import make_demo_board
    finally:
        sys.path.pop(0)
    assert make_demo_board.build() == DEMO.read_text(encoding="utf-8")
