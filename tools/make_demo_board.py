"""Write the demo board advisor/data/demo/bench_pulse_generator.kicad_sch (run from the repository root).

The board is the bundled scenario's instrument (INVENTED: the BPG-2 bench pulse
generator of bench_pulse_generator.yaml), drawn with the real symbols of the open
symbol library, read from /usr/share/kicad/symbols (Debian package kicad-symbols)
when this script runs and embedded in the file, so reading the shipped schematic
needs no KiCad install. Values are the demo's own.

    python tools/make_demo_board.py
"""

from __future__ import annotations

import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from tests.support.kicad_sch_writer import Sheet, _uid  # noqa: E402

OUT = ROOT / "advisor" / "data" / "demo" / "bench_pulse_generator.kicad_sch"


def build() -> str:
    root_uuid = _uid("bpg2/root")
    s = Sheet("bpg2", "bench_pulse_generator", root_uuid)
    dip14, dip16, dip8 = ("Package_DIP:DIP-14_W7.62mm", "Package_DIP:DIP-16_W7.62mm", "Package_DIP:DIP-8_W7.62mm")
    r, c = "Device:R", "Device:C"
    # External trigger in (BNC) and the output header
    s.symbol("Connector:Conn_Coaxial", "J1", "TRIG IN", (20, 40), nets={"1": "EXT_TRIG", "2": "GND"})
    s.symbol("Connector_Generic:Conn_01x04", "J2", "OUT", (260, 40),
             nets={"1": "SHAPED", "2": "GATE", "3": "ALARM", "4": "GND"})
    # U1: Schmitt buffer on the 5 V logic rail; one gate used, its power unit placed
    s.symbol("74xx:74HC14", "U1", "74HC14", (45, 40), unit=1, footprint=dip14, nets={"1": "EXT_TRIG", "2": "TRIG_IN"})
    s.symbol("74xx:74HC14", "U1", "74HC14", (45, 80), unit=7, footprint=dip14, nets={"14": "+5V", "7": "GND"})
    # U3: trigger shaper, 74121 with Rext 10k and Cext 10n on +5 V
    s.symbol("74xx:74LS121", "U3", "SN74121N", (80, 40), footprint=dip14,
             nets={"3": "TRIG_IN", "4": "+5V", "5": "+5V", "6": "SHAPED", "10": "U3_CX", "11": "U3_RC",
                   "14": "+5V", "7": "GND"}, no_connect=("1", "9"))
    s.symbol(r, "R3", "10k", (80, 15), nets={"1": "+5V", "2": "U3_RC"})
    s.symbol(c, "C3", "10n", (95, 15), nets={"1": "U3_RC", "2": "U3_CX"})
    # U7: internal clock, NE555 astable on +15 V: RA 10k, RB 56k + 22k trimmer, C 10n, 10n on CONT
    s.symbol("Timer:NE555P", "U7", "NE555P", (80, 110), footprint=dip8,
             nets={"8": "+15V", "1": "GND", "4": "+15V", "7": "U7_DIS", "6": "U7_TH", "2": "U7_TH",
                   "5": "U7_CV", "3": "CLOCK"})
    s.symbol(r, "R7", "10k", (110, 95), nets={"1": "+15V", "2": "U7_DIS"})
    s.symbol(r, "R8", "56k", (110, 115), nets={"1": "U7_DIS", "2": "U7_RB"})
    s.symbol("Device:R_Potentiometer_Trim", "RV1", "22k", (125, 115), nets={"1": "U7_RB", "2": "U7_TH", "3": "U7_TH"})
    s.symbol(c, "C7", "10n", (110, 135), nets={"1": "U7_TH", "2": "GND"})
    s.symbol(c, "C6", "10n", (60, 135), nets={"1": "U7_CV", "2": "GND"})
    # U5: gate pulse stretcher, CD4538 channel 1 on +15 V (Rx 100k, Cx 100n); channel 2 unused and tied off
    s.symbol("4xxx:4538", "U5", "CD4538BE", (170, 40), unit=1, footprint=dip16,
             nets={"4": "CLOCK", "5": "+15V", "3": "+15V", "6": "GATE", "1": "GND", "2": "U5_RC"}, no_connect=("7",))
    s.symbol("4xxx:4538", "U5", "CD4538BE", (170, 80), unit=2, footprint=dip16,
             nets={"12": "GND", "11": "+15V", "13": "GND", "15": "GND"}, no_connect=("14", "10", "9"))
    s.symbol("4xxx:4538", "U5", "CD4538BE", (200, 80), unit=3, footprint=dip16, nets={"16": "+15V", "8": "GND"})
    s.symbol(r, "R5", "100k", (175, 15), nets={"1": "+15V", "2": "U5_RC"})
    s.symbol(c, "C5", "100n", (190, 15), nets={"1": "U5_RC", "2": "GND"})
    # U9: missing-pulse detector, 74LS123 channel 1 on +5 V (Rext 47k, Cext 100n), CLR left open;
    # channel 2 unused, inputs tied low
    s.symbol("74xx:74LS123", "U9", "SN74LS123N", (170, 120), unit=1, footprint=dip16,
             nets={"1": "GND", "2": "SHAPED", "13": "ALARM", "14": "U9_CX", "15": "U9_RC"}, no_connect=("4",))
    s.symbol("74xx:74LS123", "U9", "SN74LS123N", (170, 160), unit=2, footprint=dip16,
             nets={"9": "GND", "10": "GND", "11": "GND"}, no_connect=("5", "12", "6", "7"))
    s.symbol("74xx:74LS123", "U9", "SN74LS123N", (200, 160), unit=3, footprint=dip16, nets={"16": "+5V", "8": "GND"})
    s.symbol(r, "R9", "47k", (175, 95), nets={"1": "+5V", "2": "U9_RC"})
    s.symbol(c, "C9", "100n", (190, 95), nets={"1": "U9_RC", "2": "U9_CX"})
    # Decoupling: one 100n on the 5 V rail; the 15 V rail has none (the plan points it out)
    s.symbol(c, "C10", "100n", (45, 110), nets={"1": "+5V", "2": "GND"})
    return s.text(root_uuid, "BPG-2 bench pulse generator, logic board (INVENTED demo)",
                  "Invented demo board of retime; symbols from the KiCad open symbol library")


if __name__ == "__main__":
    OUT.write_text(build(), encoding="utf-8")
    print(f"wrote {OUT.relative_to(ROOT)}")
