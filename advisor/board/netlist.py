"""Read a KiCad netlist export (``.net``, the S-expression "export" format) into a :class:`Board`.

The file lists components (``comp``: ``ref``, ``value``, ``footprint``,
``libsource`` with ``lib`` and ``part``, ``sheetpath``) and nets (``net``: ``code``,
``name``, ``node`` entries with ``ref``, ``pin`` and, from KiCad 6, ``pinfunction``
and ``pintype``). Pin names and types come from the nodes, else from ``libparts``.
Connectivity is already resolved by KiCad; nothing is inferred here.
"""

from __future__ import annotations

from pathlib import Path

from advisor.board import sexpr
from advisor.board.model import Board, Net, Part, PinInfo, Problem, Where


def read_netlist(path: Path) -> Board:
    label = path.name
    root = sexpr.loads(sexpr.read_text(path), label)
    if sexpr.tag(root) != "export":
        raise sexpr.BoardFileError(f"{label}: not a KiCad netlist (it starts with '{sexpr.tag(root) or '?'}', "
                                   "not 'export')")
    board = Board(file=label, source="net")
    libpins: dict[tuple[str, str], dict[str, PinInfo]] = {}
    block = sexpr.child(root, "libparts")
    for lp in sexpr.children(block, "libpart") if block else []:
        pins = {}
        pb = sexpr.child(lp, "pins")
        for p in sexpr.children(pb, "pin") if pb else []:
            num = sexpr.text(p, "num")
            pins[num] = PinInfo(num, sexpr.text(p, "name"), sexpr.text(p, "type", "unspecified"))
        libpins[(sexpr.text(lp, "lib"), sexpr.text(lp, "part"))] = pins
    comps = sexpr.child(root, "components")
    for c in sexpr.children(comps, "comp") if comps else []:
        ref = sexpr.text(c, "ref")
        src = sexpr.child(c, "libsource")
        lib, part = (sexpr.text(src, "lib"), sexpr.text(src, "part")) if src else ("", "")
        sp = sexpr.child(c, "sheetpath")
        sheet = sexpr.text(sp, "names", "/") if sp else "/"
        p = Part(ref, sexpr.text(c, "value"), f"{lib}:{part}" if lib else part, Where(label, sheet, ref),
                 sexpr.text(c, "footprint"))
        for num, info in libpins.get((lib, part), {}).items():
            p.pins[num] = PinInfo(info.number, info.name, info.kind)
        board.parts[ref] = p
    nets = sexpr.child(root, "nets")
    for n in sexpr.children(nets, "net") if nets else []:
        net = Net(sexpr.text(n, "name", f"net {sexpr.text(n, 'code')}"))
        for node in sexpr.children(n, "node"):
            ref, pin = sexpr.text(node, "ref"), sexpr.text(node, "pin")
            part = board.parts.get(ref)
            if part is None:
                board.problems.append(Problem(f"net {net.name!r} names {ref}.{pin}, a part the component list lacks",
                                              Where(label, "/", ref), "file"))
                continue
            info = part.pins.setdefault(pin, PinInfo(pin))
            if sexpr.child(node, "pinfunction") is not None:
                info.name = sexpr.text(node, "pinfunction")
            if sexpr.child(node, "pintype") is not None:
                info.kind = sexpr.text(node, "pintype").split("+")[0]
            net.pins.append((ref, pin))
        net.power = any(board.parts[r].pins[p].kind == "power_in" for r, p in net.pins if r in board.parts)
        board.nets.append(net)
    return board
