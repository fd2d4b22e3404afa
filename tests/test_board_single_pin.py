"""Parts with one timing pin per section (C to ground, R from the supply or from VREF) are traced.

NE558: each section's TIMING pin takes R from VCC and C to ground, width T = R·C
(Philips NE558 product data, 2003 Feb 14, as catalog/ne558.yaml cites it).
LM3905: the timing resistor returns to the reference output VREF, not to V+, and the
capacitor runs from R/C to ground, T = R·C (National LM122/LM322/LM3905, February
1995, pin function description; catalog/lm3905.yaml). A resistor taken to V+ on the
LM3905 charges towards another voltage: the tracer says so and plans nothing.
The netlists are KiCad netlist exports written by hand for these circuits.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from advisor.board import read_board
from advisor.board.plan import plan_board


def _comp(ref: str, value: str, lib: str = "Device", part: str | None = None) -> str:
    return f'(comp (ref "{ref}") (value "{value}") (libsource (lib "{lib}") (part "{part or ref[0]}")))'


def _net(code: int, name: str, *nodes: tuple[str, str]) -> str:
    pins = " ".join(f'(node (ref "{r}") (pin "{p}") (pintype "passive"))' for r, p in nodes)
    return f'(net (code "{code}") (name "{name}") {pins})'


def _write(tmp_path: Path, name: str, comps: list[str], nets: list[str]) -> Path:
    path = tmp_path / name
    path.write_text('(export (version "E")\n  (components\n    ' + "\n    ".join(comps) + ")\n  (nets\n    "
                    + "\n    ".join(nets) + "))\n", encoding="utf-8")
    return path


def _ne558(tmp_path: Path) -> Path:
    # Section A used (pins 1-3), sections B-D left open; RESET (13) tied high; CONT (4) open.
    comps = [_comp("U1", "NE558N", "Custom", "NE558"), _comp("R1", "100k"), _comp("C1", "10n"),
             _comp("R2", "4k7"), _comp("U2", "74HC14", "74xx", "74HC14")]
    nets = [_net(1, "+5V", ("U1", "5"), ("U1", "13"), ("R1", "1"), ("R2", "1"), ("U2", "14")),
            _net(2, "GND", ("U1", "12"), ("C1", "2"), ("U2", "7")),
            _net(3, "/TA", ("U1", "2"), ("R1", "2"), ("C1", "1")),
            _net(4, "/TRIG", ("U1", "3"), ("U2", "2")),
            _net(5, "/OUTA", ("U1", "1"), ("R2", "2"))]
    nets += [_net(10 + i, f"unconnected-(U1-Pad{p})", ("U1", str(p))) for i, p in
             enumerate((4, 6, 7, 8, 9, 10, 11, 14, 15, 16))]
    return _write(tmp_path, "ne558.net", comps, nets)


def _lm3905(tmp_path: Path, r_top: str) -> Path:
    # R1 from VREF (pin 5) or from V+ (pin 8) to R/C (pin 3); C1 from R/C to ground.
    comps = [_comp("U1", "LM3905N", "Custom", "LM3905"), _comp("R1", "1M"), _comp("C1", "10u"),
             _comp("R2", "4k7"), _comp("U2", "74HC14", "74xx", "74HC14")]
    vplus = [("U1", "8"), ("R2", "1")] + ([("R1", "1")] if r_top == "vcc" else [])
    vref = [("U1", "5")] + ([("R1", "1")] if r_top == "vref" else [])
    nets = [_net(1, "+12V", *vplus), _net(2, "GND", ("U1", "4"), ("U1", "2"), ("C1", "2")),
            _net(3, "/RC", ("U1", "3"), ("R1", "2"), ("C1", "1")), _net(4, "/VREF", *vref),
            _net(5, "/TRIG", ("U1", "1"), ("U2", "2")), _net(6, "/OUT", ("U1", "6"), ("R2", "2")),
            _net(7, "unconnected-(U1-Pad7)", ("U1", "7"))]
    return _write(tmp_path, f"lm3905_{r_top}.net", comps, nets)


@pytest.fixture(scope="module")
def catalog():
    from advisor.catalog import load_catalog

    return load_catalog()


def test_ne558_section_is_traced_and_open_sections_are_unused(tmp_path, catalog):
    j = plan_board(catalog, read_board(_ne558(tmp_path)), new_vcc=5.0).to_json()
    assert [(t["ref"], t["channel"]) for t in j["timers"]] == [("U1", 1)]
    t = j["timers"][0]
    assert t["traced"] and t["r"] == pytest.approx(100e3) and t["c"] == pytest.approx(10e-9)
    assert t["parts"] == {"r": ["R1"], "c": ["C1"]}
    assert not any("RCEXT" in u["reason"] for u in j["unresolved"])
    width = j["plan"][0]["check"]["timing"]["nominal"]["width"]
    assert width == pytest.approx(100e3 * 10e-9, rel=0.01)  # t = R·C (Philips NE558, 2003 Feb 14)


def test_lm3905_resistor_from_vref_is_traced(tmp_path, catalog):
    j = plan_board(catalog, read_board(_lm3905(tmp_path, "vref")), new_vcc=5.0).to_json()
    t = j["timers"][0]
    assert t["traced"] and t["r"] == pytest.approx(1e6) and t["c"] == pytest.approx(10e-6)
    width = j["plan"][0]["check"]["timing"]["nominal"]["width"]
    assert width == pytest.approx(10.0, rel=0.01)  # T = R·C (National, February 1995)


def test_lm3905_resistor_to_the_supply_is_refused_with_the_reason(tmp_path, catalog):
    j = plan_board(catalog, read_board(_lm3905(tmp_path, "vcc")), new_vcc=5.0).to_json()
    assert not j["timers"][0]["traced"]
    reasons = [u["reason"] for u in j["unresolved"]]
    assert any("not to pin 5 (VREF)" in r for r in reasons), reasons
    assert j["plan"][0]["swap"] is None
