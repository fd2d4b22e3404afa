"""Whole-board reading and planning: KiCad schematics and netlists.

Layers, one module each, lower ones knowing nothing of the upper:

- :mod:`sexpr` reads S-expression text (KiCad's file syntax) with sexpdata;
- :mod:`model` holds the board as parts, pins and nets (what both readers produce);
- :mod:`geometry` places library pins on the sheet (position, rotation, mirror);
- :mod:`schematic` walks a ``.kicad_sch`` hierarchy into sheet instances;
- :mod:`connectivity` joins wires, junctions, labels, sheet pins and power symbols into nets;
- :mod:`netlist` reads a KiCad netlist export (``.net``);
- :mod:`recognise` and :mod:`network` find timers and trace their timing networks;
- :mod:`facts` turns board facts into the names the board rules read;
- :mod:`plan` runs check / alternates / swap per timer and gathers the BOM delta.

``read_board(path)`` is the entry point for both file kinds.
"""

from __future__ import annotations

from pathlib import Path


def read_board(path: str | Path):
    """The :class:`advisor.board.model.Board` of a ``.kicad_sch`` or ``.net`` file."""
    from advisor.errors import InputError

    p = Path(path)
    suffix = p.suffix.lower()
    if suffix == ".kicad_sch":
        from advisor.board.schematic import read_schematic

        return read_schematic(p)
    if suffix == ".net":
        from advisor.board.netlist import read_netlist

        return read_netlist(p)
    if suffix == ".sch":
        raise InputError(f"{p}: a legacy KiCad 5 schematic; open and save it in KiCad 6 or later (.kicad_sch)")
    raise InputError(f"{p}: not a KiCad schematic or netlist", expected="a .kicad_sch (KiCad 6+) or a .net export")
