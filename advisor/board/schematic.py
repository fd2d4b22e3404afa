"""Read a KiCad 6+ schematic hierarchy (``.kicad_sch``) into a :class:`Board`.

A sheet file is parsed once however often it is used; each use is a *sheet
instance* with its own path of sheet UUIDs (``/<sheet>/<sub-sheet>``, the
"Instance Path" of KiCad's schematic file-format documentation) and its own
reference designators. References come from, in order:

- KiCad 7+: the symbol's ``(instances (project ... (path "/<root>/<sheets>" (reference ...) (unit ...))))``;
- KiCad 6: the root file's ``(symbol_instances (path "/<sheets>/<symbol uuid>" (reference ...) ...))``;
- otherwise the symbol's own Reference field.

Connectivity is :mod:`advisor.board.connectivity`'s; this module only gathers the
placed items of every instance. A sub-sheet file that is missing or unreadable is
reported as a located problem and the rest of the board is still read.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

from advisor.board import sexpr
from advisor.board.geometry import LibSymbol, place, read_lib_symbols
from advisor.board.model import Board, Part, PinInfo, Problem, Where

#: Deepest hierarchy followed (a sheet that includes itself would loop for ever).
MAX_DEPTH = 32
#: First schematic format version written by KiCad 7 (KiCad 6 wrote 2021xxxx versions).
KICAD7_FORMAT = 20220000


@dataclass
class SubSheet:
    uuid: str
    name: str
    file: str
    pins: list[tuple[str, tuple[float, float]]]


@dataclass
class SheetDoc:
    """One parsed sheet file: its embedded library and its placed items."""

    path: Path
    label: str  # file name as shown in messages
    uuid: str
    lib: dict[str, LibSymbol]
    symbols: list[list]
    wires: list[tuple[tuple[float, float], tuple[float, float]]]
    junctions: list[tuple[float, float]]
    no_connects: list[tuple[float, float]]
    labels: list[tuple[str, str, tuple[float, float]]]  # (local|global|hierarchical, name, point)
    sheets: list[SubSheet]
    buses: list[tuple[tuple[float, float], tuple[float, float]]] = field(default_factory=list)
    symbol_instances: dict[str, dict] = field(default_factory=dict)  # KiCad 6 root table
    version: int = 0


@dataclass
class PlacedPin:
    ref: str
    number: str
    name: str
    kind: str
    point: tuple[float, float]
    hidden: bool


@dataclass
class SheetInstance:
    doc: SheetDoc
    uuids: tuple[str, ...]  # sheet UUIDs below the root
    name: str  # "/" or "/amp/" ...
    parent: int | None
    sheet_pins: list[tuple[str, tuple[float, float]]] = field(default_factory=list)  # in the parent's coordinates
    pins: list[PlacedPin] = field(default_factory=list)
    power: list[tuple[str, tuple[float, float]]] = field(default_factory=list)  # power symbol value, point


def _xy(node: list) -> tuple[float, float]:
    return (float(node[1]), float(node[2]))


def _sheet_name_file(node: list) -> tuple[str, str]:
    """A sheet's name and file: properties ``Sheetname``/``Sheetfile`` (KiCad 7+), ``Sheet name``/
    ``Sheet file`` (KiCad 6), or by field id 0 and 1 (files saved in other languages name them
    in that language)."""
    by_name, by_id, in_order = {}, {}, []
    for c in sexpr.children(node, "property"):
        if len(c) < 3:
            continue
        by_name[str(c[1])] = str(c[2])
        fid = sexpr.value(c, "id")
        if isinstance(fid, int):
            by_id[fid] = str(c[2])
        in_order.append(str(c[2]))
    name = by_name.get("Sheetname", by_name.get("Sheet name", by_id.get(0, in_order[0] if in_order else "")))
    file = by_name.get("Sheetfile", by_name.get("Sheet file", by_id.get(1, in_order[1] if len(in_order) > 1 else "")))
    return name, file


def parse_doc(path: Path, label: str) -> SheetDoc:
    root = sexpr.loads(sexpr.read_text(path), label)
    if sexpr.tag(root) != "kicad_sch":
        head = sexpr.tag(root) or "?"
        raise sexpr.BoardFileError(f"{label}: not a KiCad schematic (it starts with '{head}', not 'kicad_sch')")
    version = sexpr.value(root, "version", 0)
    doc = SheetDoc(path, label, str(sexpr.value(root, "uuid", "")), read_lib_symbols(root), [], [], [], [], [], [],
                   version=int(version) if isinstance(version, (int, float)) else 0)
    for c in root[1:]:
        t = sexpr.tag(c)
        if t == "symbol":
            doc.symbols.append(c)
        elif t == "wire":
            pts = sexpr.child(c, "pts")
            xy = [_xy(p) for p in sexpr.children(pts, "xy")] if pts else []
            for a, b in zip(xy, xy[1:]):
                doc.wires.append((a, b))
        elif t == "bus":
            pts = sexpr.child(c, "pts")
            xy = [_xy(p) for p in sexpr.children(pts, "xy")] if pts else []
            for a, b in zip(xy, xy[1:]):
                doc.buses.append((a, b))
        elif t == "junction":
            doc.junctions.append(sexpr.at(c)[:2])
        elif t == "no_connect":
            doc.no_connects.append(sexpr.at(c)[:2])
        elif t in ("label", "global_label", "hierarchical_label"):
            kind = {"label": "local", "global_label": "global", "hierarchical_label": "hierarchical"}[t]
            doc.labels.append((kind, str(c[1]), sexpr.at(c)[:2]))
        elif t == "sheet":
            name, file = _sheet_name_file(c)
            pins = [(str(p[1]), sexpr.at(p)[:2]) for p in sexpr.children(c, "pin") if len(p) > 1]
            doc.sheets.append(SubSheet(str(sexpr.value(c, "uuid", "")), name, file, pins))
        elif t == "symbol_instances":
            for p in sexpr.children(c, "path"):
                doc.symbol_instances[str(p[1])] = {
                    "reference": sexpr.text(p, "reference"), "unit": sexpr.value(p, "unit", 1),
                    "value": sexpr.value(p, "value"), "footprint": sexpr.value(p, "footprint"),
                }
    return doc


def _instance_data(sym: list, root_uuid: str, uuids: tuple[str, ...], table: dict[str, dict]) -> dict | None:
    """This symbol's reference and unit in this sheet instance (KiCad 7+ first, then KiCad 6)."""
    want = "/" + "/".join((root_uuid,) + uuids) if root_uuid else None
    inst = sexpr.child(sym, "instances")
    if inst is not None:
        for proj in sexpr.children(inst, "project"):
            for p in sexpr.children(proj, "path"):
                path = str(p[1]).rstrip("/")
                if want is not None and (path == want or path == "/" + "/".join(uuids)):
                    return {"reference": sexpr.text(p, "reference"), "unit": sexpr.value(p, "unit", 1)}
    uid = str(sexpr.value(sym, "uuid", ""))
    key = "/" + "/".join(uuids + (uid,))
    return table.get(key)


def read_schematic(path: Path) -> Board:
    """Read the hierarchy under ``path`` and resolve its nets."""
    from advisor.board.connectivity import resolve

    label = path.name
    root = parse_doc(path, label)  # a broken root file is an error: nothing else to read
    board = Board(file=label, source="kicad_sch")
    docs: dict[Path, SheetDoc | None] = {path.resolve(): root}
    instances: list[SheetInstance] = [SheetInstance(root, (), "/", None)]
    i = 0
    while i < len(instances):
        inst = instances[i]
        for sub in inst.doc.sheets:
            where = Where(inst.doc.label, inst.name)
            if len(inst.uuids) >= MAX_DEPTH:
                board.problems.append(Problem(f"sheet '{sub.name}' nests deeper than {MAX_DEPTH} levels; not followed",
                                              where, "file"))
                continue
            fpath = (inst.doc.path.parent / sub.file).resolve()
            if fpath not in docs:
                try:
                    docs[fpath] = parse_doc(fpath, sub.file)
                except sexpr.BoardFileError as exc:
                    docs[fpath] = None
                    board.problems.append(Problem(f"sheet '{sub.name}' ({sub.file}) not read: {exc.message}", where, "file"))
            doc = docs[fpath]
            if doc is None:
                continue
            instances.append(SheetInstance(doc, inst.uuids + (sub.uuid,), f"{inst.name}{sub.name}/", i, sub.pins))
        i += 1
    board.sheets = len(instances)
    table = root.symbol_instances
    for inst in instances:
        _place_symbols(inst, root.uuid, table, board)
    resolve(board, instances)
    return board


def _place_symbols(inst: SheetInstance, root_uuid: str, table: dict, board: Board) -> None:
    doc = inst.doc
    for sym in doc.symbols:
        lib_id = sexpr.text(sym, "lib_id")
        lib_name = sexpr.text(sym, "lib_name", lib_id)  # a symbol edited in the sheet points at its own copy
        props = sexpr.properties(sym)
        data = _instance_data(sym, root_uuid, inst.uuids, table) or {}
        ref = data.get("reference") or props.get("Reference", "?")
        unit = data.get("unit") or sexpr.value(sym, "unit", 1)
        unit = int(unit) if isinstance(unit, (int, float)) else 1
        style = sexpr.value(sym, "convert", sexpr.value(sym, "body_style", 1))
        style = int(style) if isinstance(style, (int, float)) else 1
        value = data.get("value") or props.get("Value", "")
        footprint = data.get("footprint") or props.get("Footprint", "")
        x, y, angle = sexpr.at(sym)
        mirror = sexpr.value(sym, "mirror")
        lib = doc.lib.get(lib_name) or doc.lib.get(lib_id)
        where = Where(doc.label, inst.name, ref)
        if lib is None:
            board.problems.append(Problem(f"symbol '{lib_id}' has no embedded library copy; its pins are unknown",
                                          where, "symbol"))
            continue
        if lib.power:
            # A power symbol names a global net after its value through its power-input
            # pin; a flag symbol (PWR_FLAG: a power-output pin) only marks the net driven.
            # KiCad 6 files (format versions of 2021) name the net after the pin, later ones
            # after the value: the demo projects' PCBs, made from KiCad 6 files, follow the pin.
            for p in lib.pins_for(unit, style):
                if p.kind != "power_in":
                    continue
                net = p.name if doc.version < KICAD7_FORMAT and p.name else str(value)
                inst.power.append((net, place(p.x, p.y, (x, y), angle, mirror and str(mirror))))
            continue
        part = board.parts.get(ref)
        if part is None and not ref.startswith("#"):
            part = board.parts[ref] = Part(ref, str(value), lib_id, where, str(footprint))
        for p in lib.pins_for(unit, style):
            point = place(p.x, p.y, (x, y), angle, mirror and str(mirror))
            inst.pins.append(PlacedPin(ref, p.number, p.name, p.kind, point, p.hidden))
            if part is not None:
                part.pins.setdefault(p.number, PinInfo(p.number, p.name, p.kind))
