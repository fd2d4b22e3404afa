"""Catalog pinouts against the open symbol library (Debian kicad-symbols).

Source: the installed KiCad 6 libraries under /usr/share/kicad/symbols, read at
test time (never copied). Pins are compared by number and a normalised function,
because the library's labels and active-low marks differ from makers' labels
(e.g. "Clr", "~{CLR}", "R", "~{Reset1}" are all the clear input). Aliases
(``extends``) are followed to the base symbol. Multi-unit symbols also check that
each unit holds the same pins as our channel of that number.
"""

from __future__ import annotations

import re

import pytest

from advisor.catalog import load_catalog
from support.external import kicad_symbols_dir
from support.kicad import symbol_pins

pytestmark = pytest.mark.external

#: family id -> (library file, symbol). Every family of ours the library carries.
CARRIED = {
    "74121": ("74xx", "74LS121"),
    "74122": ("74xx", "74LS122"),
    "74LS122": ("74xx", "74LS122"),
    "74123": ("74xx", "74LS123"),
    "74LS123": ("74xx", "74LS123"),
    "74HC123": ("74xx", "74HC123"),  # alias of 74LS123
    "74HCT123": ("74xx", "74HCT123"),  # alias of 74LS123
    "74AHCT123A": ("74xx", "74AHCT123"),  # alias of 74LS123
    "74221": ("74xx", "74LS221"),
    "74LS221": ("74xx", "74LS221"),
    "74LVC1G123": ("74xGxx", "74LVC1G123"),
    "NE555": ("Timer", "NE555P"),
    "TLC555": ("Timer", "TLC555xD"),  # alias of NE555D
    "LMC555": ("Timer", "LMC555xN"),
    "ICM7555": ("Timer", "ICM7555xP"),  # alias of NE555P
    "NE556": ("Timer", "NE556"),  # alias of LM556
    "ICM7556": ("Timer", "ICM7556"),  # alias of LM556
    "CD4538B": ("4xxx", "4538"),
    "CD4528B": ("4xxx", "4528"),  # alias of 4538
    "CD4098B": ("4xxx", "4098"),
    "CD4047B": ("4xxx", "4047"),
}

# Library labels -> our normalised functions (after dropping ~{...} marks and channel digits).
_TIMER = {"GND": "GND", "VSS": "GND", "VCC": "VCC", "VDD": "VCC", "TR": "TRIG", "TRIG": "TRIG",
          "Q": "OUT", "OUT": "OUT", "R": "RESET", "RESET": "RESET", "CV": "CONT", "CONT": "CONT",
          "THR": "THRES", "THRES": "THRES", "DIS": "DIS", "DISCH": "DIS", "NC": "NC"}
_ONESHOT = {"GND": "GND", "VSS": "GND", "VCC": "VCC", "VDD": "VCC", "NC": "NC",
            "A": "TRIG_FALL", "CLK-": "TRIG_FALL", "-TR": "TRIG_FALL", "-TRIGGER": "TRIG_FALL",
            "B": "TRIG_RISE", "CLK+": "TRIG_RISE", "+TR": "TRIG_RISE", "+TRIGGER": "TRIG_RISE",
            "CLR": "CLEAR", "R": "CLEAR", "RESET": "CLEAR", "EXT_RESET": "CLEAR",
            "Q": "Q", "~Q": "QN", "CEXT": "CEXT", "CX": "CEXT", "C": "CEXT",
            "R/CEXT": "RCEXT", "RCEXT": "RCEXT", "RXCX": "RCEXT", "RX_CX": "RCEXT",
            "RINT": "RINT", "RC_COMMON": "RC_COMMON", "ASTABLE": "ASTABLE", "~ASTABLE": "ASTABLE_N",
            "RETRIGGER": "RETRIGGER", "OSC_OUT": "OSC_OUT"}
# Our synonyms: the same pin can be named CLEAR / RESET / MASTER_RESET by different authors.
_OURS = {"MASTER_RESET": "CLEAR", "RESET": "CLEAR"}


def kicad_function(name: str, timer: bool, family_id: str) -> str:
    low = name.startswith("~{")
    text = re.sub(r"~\{([^}]*)\}", r"\1", name).upper()
    text = re.sub(r"(?<=[A-Z_+\-])\d$", "", text)  # channel digit: Q1, Cx2, -TR1
    text = text.replace("X1_CX", "X_CX").replace("X2_CX", "X_CX")
    if timer:
        return _TIMER.get(text, text)
    if family_id == "CD4047B" and text == "R":  # the 4047's R pin is its timing resistor
        return "REXT"
    key = ("~" + text) if low and ("~" + text) in _ONESHOT else text
    # active-low marks on inputs (~{A}, ~{CLR}) do not change the function
    return _ONESHOT.get(key, _ONESHOT.get(text, text))


def ours(function: str, timer: bool) -> str:
    return function if timer else _OURS.get(function, function)


@pytest.fixture(scope="module")
def catalog():
    return load_catalog()


@pytest.mark.parametrize("family_id", sorted(CARRIED))
def test_pinout_matches_open_symbol_library(catalog, family_id):
    lib, symbol = CARRIED[family_id]
    path = kicad_symbols_dir() / f"{lib}.kicad_sym"
    pins = symbol_pins(path, symbol)
    assert pins, f"{symbol} not found in {path}"  # source: kicad-symbols 6.0.10 carries it
    fam = catalog.families.get(family_id)
    if fam is None:
        pytest.skip(f"{family_id} not in the catalog yet")
    timer = fam.function == "timer-555"
    size = max(int(p.number) for p in pins)
    pkg = next((p for p in fam.packages if len(p.pins) == size), None)
    if pkg is None:  # the library symbol leaves NC pins out: match by the highest pin number
        pkg = next((p for p in fam.packages if max(x.pin for x in p.pins) == size), None)
    assert pkg is not None, f"{family_id}: no package with {size} pins to compare with {symbol}"
    by_number = {p.pin: p for p in pkg.pins}
    mismatches = []
    for sp in pins:
        mine = by_number.get(int(sp.number))
        want = kicad_function(sp.name, timer, family_id)
        got = ours(mine.function, timer) if mine else None
        if got != want:
            mismatches.append(f"pin {sp.number}: library {sp.name!r} -> {want}, catalog {got}")
    # source: /usr/share/kicad/symbols/{lib}.kicad_sym, symbol {symbol}
    assert not mismatches, f"{family_id} vs {symbol} ({pkg.name}): " + "; ".join(mismatches)
    # pins the library leaves out must be NC in the catalog
    listed = {int(p.number) for p in pins}
    extra = [p.pin for p in pkg.pins if p.pin not in listed and p.function != "NC"]
    assert not extra, f"{family_id}: pins {extra} carry a function but the library symbol has no such pin"
    # sections: library unit n holds the pins of our channel n
    units = {p.unit for p in pins if p.kind != "power_in" and p.unit > 0}
    if fam.channels > 1 and len(units) == fam.channels:
        for sp in pins:
            mine = by_number[int(sp.number)]
            if sp.kind != "power_in" and mine.channel is not None:
                assert mine.channel == sp.unit, f"{family_id} pin {sp.number}: channel {mine.channel}, library unit {sp.unit}"


def test_library_covers_at_least_nine_of_our_families(catalog):
    """Issue 3: at least 9 of our families are compared with the open library."""
    kicad_symbols_dir()
    present = [f for f in CARRIED if f in catalog.families]
    assert len(present) >= 9, present
