"""Generated KiCad schematics for the board tests and the benchmark (need the open symbol library).

``repeated_hierarchy(folder, copies)`` writes a root sheet that uses one sub-sheet
file ``copies`` times (a repeated sheet instance with its own reference designators
per instance, KiCad's "Instance Path"), each copy holding a 555 monostable driven
through a hierarchical label from a Schmitt buffer on the root sheet, plus
``padding`` extra resistor/capacitor pairs per copy (for the 200-symbol benchmark).
Values are invented fixtures.
"""

from __future__ import annotations

from pathlib import Path

from tests.support.kicad_sch_writer import Sheet, _uid


def repeated_hierarchy(folder: Path, copies: int = 2, padding: int = 0) -> Path:
    root_uuid = _uid(f"rep/root/{copies}/{padding}")
    sheet_uuids = [_uid(f"rep/sheet/{i}") for i in range(copies)]
    paths = {f"/{u}": i for i, u in enumerate(sheet_uuids)}
    sub = Sheet("mono", "repeat", root_uuid)

    def refs(prefix: str, base: int) -> dict[str, str]:
        return {p: f"{prefix}{base + 100 * (i + 1)}" for p, i in paths.items()}

    sub.symbol("Timer:NE555P", "U1", "NE555P", (80, 60), nets={"8": "+5V", "1": "GND", "4": "+5V", "7": "TH",
                                                               "6": "TH", "2": "TRIG", "3": "OUT", "5": "CV"},
               refs_by_path=refs("U", 1))
    sub.symbol("Device:R", "R1", "47k", (110, 45), nets={"1": "+5V", "2": "TH"}, refs_by_path=refs("R", 1))
    sub.symbol("Device:C", "C1", "100n", (110, 75), nets={"1": "TH", "2": "GND"}, refs_by_path=refs("C", 1))
    sub.symbol("Device:C", "C2", "10n", (60, 85), nets={"1": "CV", "2": "GND"}, refs_by_path=refs("C", 2))
    sub.symbol("Device:C", "C3", "100n", (140, 85), nets={"1": "+5V", "2": "GND"}, refs_by_path=refs("C", 3))
    for k in range(padding):
        x = 20 + 12 * (k % 15)
        y = 120 + 25 * (k // 15)
        sub.symbol("Device:R", f"R{10 + k}", "10k", (x, y), nets={"1": "OUT", "2": f"N{k}"},
                   refs_by_path=refs("R", 10 + k))
        sub.symbol("Device:C", f"C{10 + k}", "1n", (x + 6, y), nets={"1": f"N{k}", "2": "GND"},
                   refs_by_path=refs("C", 10 + k))
    sub.hier_label("TRIG", (40, 40))
    (folder / "mono.kicad_sch").write_text(sub.text(_uid("rep/mono"), "one monostable (fixture)"), encoding="utf-8")
    root = Sheet("root", "repeat", root_uuid)
    root.symbol("74xx:74HC14", "U1", "74HC14", (40, 40), unit=1, nets={"1": "IN", "2": "TRIG_BUS"})
    root.symbol("74xx:74HC14", "U1", "74HC14", (40, 80), unit=7, nets={"14": "+5V", "7": "GND"})
    root.symbol("Connector:Conn_Coaxial", "J1", "IN", (15, 40), nets={"1": "IN", "2": "GND"})
    for i, u in enumerate(sheet_uuids):
        root.sheet(f"mono{i + 1}", "mono.kicad_sch", u, (120, 30 + 30 * i), ["TRIG_BUS"])
    # The sheet pin is named after the child's hierarchical label: rename in the text.
    text = root.text(root_uuid, "repeated hierarchy (fixture)").replace('(pin "TRIG_BUS" input', '(pin "TRIG" input')
    out = folder / "repeat.kicad_sch"
    out.write_text(text, encoding="utf-8")
    return out
