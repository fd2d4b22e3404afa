"""Pin maps checked against the open symbol library (Debian kicad-symbols), read at test time.

The library carries the 74LS121 and the 74LS221 (74xx.kicad_sym) and the 4538 (4xxx.kicad_sym):
each link the swap makes must join pins that the library gives the same normalised function.
"""

from __future__ import annotations

import re

import pytest

from support.external import kicad_symbols_dir

from advisor.catalog import load_catalog
from advisor.circuit import Circuit, Trigger
from advisor.substitute.swap import swap

#: Library pin names → normalised functions (names differ between symbols; common practice).
NAMES = {
    "A1": "TRIG_FALL", "A2": "TRIG_FALL", "~{A}": "TRIG_FALL", "Clk-": "TRIG_FALL",
    "B": "TRIG_RISE", "Clk+": "TRIG_RISE", "~{Q}": "QN", "Q": "Q", "Cext": "CEXT", "Cx": "CEXT",
    "R/Cext": "RCEXT", "RCext": "RCEXT", "RxCx": "RCEXT", "~{CLR}": "CLEAR", "R": "CLEAR", "Rint": "RINT",
    "GND": "GND", "VSS": "GND", "VCC": "VCC", "VDD": "VCC",
}


def symbol_pins(lib: str, name: str) -> dict[int, str]:
    text = (kicad_symbols_dir() / lib).read_text(encoding="utf-8")
    start = text.find(f'(symbol "{name}"')
    assert start >= 0, f"{name} not in {lib}"
    end = text.find('\n  (symbol "', start + 10)
    block = text[start:end if end > 0 else None]
    pins = re.findall(r'\(pin \w+ \w+.*?\(name "([^"]*)".*?\(number "(\d+)"', block, re.S)
    return {int(num): NAMES.get(nm, nm) for nm, num in pins}


@pytest.mark.external
@pytest.mark.parametrize("old, old_sym, new, new_sym, circuit", [
    ("74121", ("74xx.kicad_sym", "74LS121"), "74LS221", ("74xx.kicad_sym", "74LS221"),
     Circuit(part="", vcc=5, r=10e3, c=10e-9, trigger=Trigger(None, "falling"))),
    ("74121", ("74xx.kicad_sym", "74LS121"), "74LS221", ("74xx.kicad_sym", "74LS221"),
     Circuit(part="", vcc=5, r=10e3, c=10e-9, trigger=Trigger(None, "rising"))),
    ("CD4538B", ("4xxx.kicad_sym", "4538"), "74LS221", ("74xx.kicad_sym", "74LS221"),
     Circuit(part="", vcc=5, r=100e3, c=10e-9, trigger=Trigger(None, "falling"))),
])
def test_links_join_the_same_function_in_the_symbol_library(old, old_sym, new, new_sym, circuit):
    res = swap(load_catalog(), old, new, circuit, new_vcc=5)
    a, b = symbol_pins(*old_sym), symbol_pins(*new_sym)
    assert res.pin_map.links
    for lk in res.pin_map.links:
        assert a[lk.old_pin] == lk.function, f"{old} pin {lk.old_pin}"
        # the edge travels to an input of the same sense in the library's symbol
        assert b[lk.new_pin] == lk.function, f"{new} pin {lk.new_pin}"
    for t in res.pin_map.ties:
        assert b[t.new_pin] == t.function
