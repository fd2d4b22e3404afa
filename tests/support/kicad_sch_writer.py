"""Write small KiCad 7+ schematics (``.kicad_sch``) from a description: symbols, wires, labels, power, sheets.

Used to build the shipped demo board (``tools/make_demo_board.py``) and the test
fixtures (a repeated hierarchy, broken files). Library symbols are read from the
installed open symbol library (``/usr/share/kicad/symbols``) at generation time and
embedded in ``lib_symbols`` as KiCad does, so the written file needs no library
to be read. Every pin gets a short wire stub ending in a local label or a power
symbol, so the files exercise wires, labels, power symbols and pin placement.
"""

from __future__ import annotations

import uuid as _uuid
from dataclasses import dataclass, field
from pathlib import Path

from advisor.board.geometry import read_lib_symbols
from advisor.board.sexpr import loads
from tests.support.kicad import _text, _top_level_block

SYMBOLS = Path("/usr/share/kicad/symbols")
STUB = 2.54
POWER_NETS = {"+5V", "+15V", "+12V", "+3V3", "GND", "VCC", "VDD"}


def _q(s: str) -> str:
    return '"' + s.replace("\\", "\\\\").replace('"', '\\"') + '"'


def _uid(seed: str) -> str:
    return str(_uuid.uuid5(_uuid.NAMESPACE_URL, "retime-demo/" + seed))


def lib_block(lib: str, name: str) -> str:
    """The library symbol ``lib:name`` as KiCad embeds it (top name prefixed with the library)."""
    text = _text(str(SYMBOLS / f"{lib}.kicad_sym"))
    block = _top_level_block(text, name)
    if block is None:
        raise KeyError(f"{lib}:{name} not in the installed symbol library")
    return block.replace(f'(symbol "{name}"', f'(symbol "{lib}:{name}"', 1)


@dataclass
class Sheet:
    """One sheet file being written; ``project`` and ``root_uuid`` name the instance paths."""

    name: str
    project: str
    root_uuid: str
    path: str = ""  # instance path below the root, e.g. "/<sheet uuid>"
    items: list[str] = field(default_factory=list)
    libs: dict[str, str] = field(default_factory=dict)
    _n: int = 0
    _pwr: int = 0
    instances: list[tuple[str, dict[str, str]]] = field(default_factory=list)

    def _lib(self, lib_id: str):
        if lib_id not in self.libs:
            lib, name = lib_id.split(":", 1)
            self.libs[lib_id] = lib_block(lib, name)
        tree = loads("(kicad_sch (lib_symbols " + self.libs[lib_id] + "))", lib_id)
        return read_lib_symbols(tree)[lib_id]

    def symbol(self, lib_id: str, ref: str, value: str, at: tuple[float, float], *, unit: int = 1,
               angle: int = 0, footprint: str = "", nets: dict[str, str] | None = None, no_connect=(),
               refs_by_path: dict[str, str] | None = None) -> None:
        """Place unit ``unit`` of a symbol and tie its pins: ``nets`` maps pin number -> net name."""
        from advisor.board.geometry import place

        lib = self._lib(lib_id)
        self._n += 1
        uid = _uid(f"{self.name}/{ref}/{unit}/{self._n}")
        paths = refs_by_path or {self.path: ref}
        inst = "".join(f'(path {_q("/" + self.root_uuid + p)} (reference {_q(r)}) (unit {unit}))'
                       for p, r in paths.items())
        self.items.append(
            f'(symbol (lib_id {_q(lib_id)}) (at {at[0]:g} {at[1]:g} {angle}) (unit {unit}) (in_bom yes) (on_board yes)'
            f' (uuid {_q(uid)})'
            f' (property "Reference" {_q(ref)} (at {at[0]:g} {at[1] - 2:g} 0))'
            f' (property "Value" {_q(value)} (at {at[0]:g} {at[1] + 2:g} 0))'
            f' (property "Footprint" {_q(footprint)} (at {at[0]:g} {at[1]:g} 0) (effects hide))'
            f' (instances (project {_q(self.project)} {inst})))')
        for p in lib.pins_for(unit, 1):
            if p.hidden and p.kind == "power_in":
                continue
            pt = place(p.x, p.y, at, angle, None)
            if nets and p.number in nets:
                self.tie(pt, nets[p.number], away=(pt[0] - at[0], pt[1] - at[1]))
            elif p.number in no_connect:
                self.items.append(f"(no_connect (at {pt[0]:g} {pt[1]:g}) (uuid {_q(_uid(f'{uid}/nc/{p.number}'))}))")

    def tie(self, pt: tuple[float, float], net: str, away: tuple[float, float] = (1, 0)) -> None:
        """A wire stub from ``pt`` outwards, ending in a power symbol or a local label named ``net``."""
        dx, dy = away
        if abs(dx) >= abs(dy):
            end = (pt[0] + (STUB if dx >= 0 else -STUB), pt[1])
        else:
            end = (pt[0], pt[1] + (STUB if dy >= 0 else -STUB))
        self._n += 1
        self.items.append(f"(wire (pts (xy {pt[0]:g} {pt[1]:g}) (xy {end[0]:g} {end[1]:g})) "
                          f"(stroke (width 0) (type default)) (uuid {_q(_uid(f'{self.name}/w/{self._n}'))}))")
        if net in POWER_NETS:
            self._pwr += 1
            lib = f"power:{net}"
            self._lib(lib)
            ref = f"#PWR{self._pwr:03d}"
            self.items.append(
                f'(symbol (lib_id {_q(lib)}) (at {end[0]:g} {end[1]:g} 0) (unit 1) (in_bom yes) (on_board yes)'
                f' (uuid {_q(_uid(f"{self.name}/p/{self._n}"))})'
                f' (property "Reference" {_q(ref)} (at {end[0]:g} {end[1]:g} 0) (effects hide))'
                f' (property "Value" {_q(net)} (at {end[0]:g} {end[1]:g} 0))'
                f' (instances (project {_q(self.project)} (path {_q("/" + self.root_uuid + self.path)} '
                f'(reference {_q(ref)}) (unit 1)))))')
        else:
            self.items.append(f"(label {_q(net)} (at {end[0]:g} {end[1]:g} 0) "
                              f"(uuid {_q(_uid(f'{self.name}/l/{self._n}'))}))")

    def hier_label(self, net: str, at: tuple[float, float]) -> None:
        self._n += 1
        self.items.append(f"(hierarchical_label {_q(net)} (shape input) (at {at[0]:g} {at[1]:g} 0) "
                          f"(uuid {_q(_uid(f'{self.name}/h/{self._n}'))}))")
        self.tie(at, net, away=(1, 0))

    def sheet(self, name: str, file: str, uid: str, at: tuple[float, float], pins: list[str]) -> None:
        """A sub-sheet box with one pin per name on its left edge, each tied to the parent net of that name."""
        pin_txt = []
        for i, pname in enumerate(pins):
            y = at[1] + 2.54 * (i + 1)
            pin_txt.append(f'(pin {_q(pname)} input (at {at[0]:g} {y:g} 180) (uuid {_q(_uid(f"{uid}/{pname}"))}))')
            self.tie((at[0], y), pname, away=(-1, 0))
        self.items.append(
            f'(sheet (at {at[0]:g} {at[1]:g}) (size 20 {2.54 * (len(pins) + 1):g}) (uuid {_q(uid)})'
            f' (property "Sheetname" {_q(name)} (at {at[0]:g} {at[1] - 1:g} 0))'
            f' (property "Sheetfile" {_q(file)} (at {at[0]:g} {at[1] + 30:g} 0)) ' + " ".join(pin_txt) + ")")

    def text(self, uid: str, title: str, comment: str = "") -> str:
        libs = "\n    ".join(self.libs[k] for k in sorted(self.libs))
        head = (f'(kicad_sch (version 20230121) (generator "retime-tests")\n  (uuid {_q(uid)})\n  (paper "A3")\n'
                f'  (title_block (title {_q(title)}) (comment 1 {_q(comment)}))\n')
        return head + f"  (lib_symbols\n    {libs}\n  )\n  " + "\n  ".join(self.items) + "\n)\n"
