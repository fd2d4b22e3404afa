"""Hierarchy: one sub-sheet file used twice gets its own references and its own nets per
instance; the hierarchical label joins the parent's net through the sheet pin; a netlist
export of the same circuit reads to the same timers.

Fixtures are generated from the installed open symbol library (external)."""

from __future__ import annotations

import pytest

from advisor.board import read_board
from advisor.board.plan import plan_board
from tests.support.external import kicad_symbols_dir



@pytest.fixture(scope="module")
def catalog():
    from advisor.catalog import load_catalog

    return load_catalog()


@pytest.fixture()
def repeated(tmp_path):
    kicad_symbols_dir()
    from tests.support.board_fixtures import repeated_hierarchy

    return repeated_hierarchy(tmp_path, copies=2)


@pytest.mark.external
def test_repeated_instances_keep_their_own_references_and_nets(repeated):
    b = read_board(repeated)
    assert b.sheets == 3
    assert {"U101", "U201", "R101", "R201", "C101", "C201"} <= set(b.parts)
    th1 = b.net_of("U101", "6")
    th2 = b.net_of("U201", "6")
    assert th1 is not th2
    assert set(th1.pins) == {("U101", "6"), ("U101", "7"), ("R101", "2"), ("C101", "1")}
    assert th1.name == "/mono1/TH" and th2.name == "/mono2/TH"
    # both instances' TRIG reach the root buffer's output through the sheet pins
    trig = b.net_of("U1", "2")
    assert {("U101", "2"), ("U201", "2")} <= set(trig.pins)
    # power is global across the instances
    assert b.net_of("U101", "8") is b.net_of("U201", "8")


@pytest.mark.external
def test_repeated_instances_are_planned_each(repeated, catalog):
    j = plan_board(catalog, read_board(repeated), new_vcc=3.3).to_json()
    refs = [t["ref"] for t in j["timers"]]
    assert refs == ["U101", "U201"]
    for t in j["timers"]:
        assert (t["mode"], t["r"], t["c"], t["vcc"]) == ("mono", 47e3, 100e-9, 5.0)
        assert t["trigger"]["source"] == "U1.2" and t["trigger"]["source_supply"] == 5.0
        assert t["decoupling"]  # C3 of the same instance joins +5V and GND
    plans = [p for p in j["plan"] if p["swap"]]
    assert len(plans) == 2 and plans[0]["new"] == plans[1]["new"]


NETLIST = """(export (version "E")
  (components
    (comp (ref "U1") (value "NE555P") (footprint "Package_DIP:DIP-8_W7.62mm")
      (libsource (lib "Timer") (part "NE555P") (description "")) (sheetpath (names "/") (tstamps "/")))
    (comp (ref "R1") (value "47k") (libsource (lib "Device") (part "R")))
    (comp (ref "C1") (value "100n") (libsource (lib "Device") (part "C")))
    (comp (ref "U2") (value "74HC14") (libsource (lib "74xx") (part "74HC14"))))
  (nets
    (net (code "1") (name "+5V") (node (ref "U1") (pin "8") (pintype "power_in")) (node (ref "U1") (pin "4") (pintype "input"))
      (node (ref "R1") (pin "1") (pintype "passive")) (node (ref "U2") (pin "14") (pinfunction "VCC") (pintype "power_in")))
    (net (code "2") (name "GND") (node (ref "U1") (pin "1") (pintype "power_in")) (node (ref "C1") (pin "2") (pintype "passive"))
      (node (ref "U2") (pin "7") (pinfunction "GND") (pintype "power_in")))
    (net (code "3") (name "/TH") (node (ref "U1") (pin "6") (pintype "input")) (node (ref "U1") (pin "7") (pintype "input"))
      (node (ref "R1") (pin "2") (pintype "passive")) (node (ref "C1") (pin "1") (pintype "passive")))
    (net (code "4") (name "/TRIG") (node (ref "U1") (pin "2") (pintype "input")) (node (ref "U2") (pin "2") (pintype "output")))))
"""


def test_netlist_export_reads_to_the_same_timer(tmp_path, catalog):
    p = tmp_path / "mono.net"
    p.write_text(NETLIST, encoding="utf-8")
    b = read_board(p)
    assert b.source == "net" and len(b.nets) == 4
    j = plan_board(catalog, b, new_vcc=3.3).to_json()
    (t,) = j["timers"]
    assert (t["ref"], t["mode"], t["r"], t["c"], t["vcc"]) == ("U1", "mono", 47e3, 100e-9, 5.0)
    assert t["trigger"]["source"] == "U2.2" and t["trigger"]["source_supply"] == 5.0
    assert t["inputs"]["pin 4 (RESET)"]["state"] == "tied-high"
    assert {"name": "/TRIG", "pins": ["U1.2", "U2.2"]} in j["nets"]
