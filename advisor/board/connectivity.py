"""Join placed items into nets, the way KiCad's schematic connectivity is documented.

Rules (KiCad documentation: "Schematic File Format" for the items; the schematic
editor's manual and the kicad-python "Schematic" page for connection points —
"each connectable object has one or more connection points ... items must exactly
match in position to be considered connected"):

- every connectable item has connection points: a wire its two ends, a pin its
  tip, a label, junction, no-connect flag or sheet pin its anchor;
- items connect where connection points coincide (compared on a 1 nm grid);
- a wire's interior is not a connection point, except where a junction sits on
  it, or a label, a sheet pin or another wire's end is placed on it (KiCad joins a
  wire end that lands on another wire and a label placed on a wire; a pin a wire
  merely passes over stays unconnected);
- a local label joins equal names within its sheet instance, and so does a
  hierarchical label (local and hierarchical labels of one name on one sheet are
  one net: the demo projects' PCBs show it); a global label and a
  power symbol (named by its value) join equal names everywhere; a hidden
  power-input pin of an ordinary symbol joins the global net of its pin name;
- a hierarchical label in a sub-sheet instance joins the matching sheet pin on
  the parent sheet (per instance: two uses of one file stay two circuits);
- a no-connect flag marks the net it sits on;
- buses: a vector label ``NAME[a..b]`` (local, global or hierarchical) or a vector
  sheet pin on a bus names its members ``NAMEa`` … ``NAMEb``; members of every
  vector on one connected bus join by their number (``DQ5`` with ``DPC5``), and
  each member joins the sheet's net of that name. A vector sheet pin carries its
  members to the vector hierarchical label of the sub-sheet instance.

Net names follow KiCad's precedence: power symbol, then global label, then the
label of the highest sheet (``/name`` on the root, ``/sheet/name`` below), then
``Net-(REF-PadN)`` after the first pin.
"""

from __future__ import annotations

import re
from collections import defaultdict

from advisor.board.model import Board, Net

_GRID = 1e6  # file units are mm: compare on a 1 nm grid


def _k(p: tuple[float, float]) -> tuple[int, int]:
    return (round(p[0] * _GRID), round(p[1] * _GRID))


class _Union:
    def __init__(self) -> None:
        self.parent: dict = {}

    def find(self, a):
        parent = self.parent
        parent.setdefault(a, a)
        root = a
        while parent[root] != root:
            root = parent[root]
        while parent[a] != root:
            parent[a], a = root, parent[a]
        return root

    def union(self, a, b) -> None:
        ra, rb = self.find(a), self.find(b)
        if ra != rb:
            self.parent[rb] = ra


def _on_segment(p: tuple[int, int], a: tuple[int, int], b: tuple[int, int]) -> bool:
    """True when p lies on segment a-b strictly between its ends."""
    if p == a or p == b:
        return False
    (px, py), (ax, ay), (bx, by) = p, a, b
    if (bx - ax) * (py - ay) - (by - ay) * (px - ax) != 0:
        return False
    return min(ax, bx) <= px <= max(ax, bx) and min(ay, by) <= py <= max(ay, by)


def _join_wire_interiors(u: _Union, i: int, wires, taps) -> None:
    """Union each tap point lying inside a wire with that wire (axis-aligned wires by lookup)."""
    by_y: dict[int, list] = defaultdict(list)
    by_x: dict[int, list] = defaultdict(list)
    for t in taps:
        by_y[t[1]].append(t)
        by_x[t[0]].append(t)
    for a, b in wires:
        if a[1] == b[1]:
            cands = by_y.get(a[1], ())
        elif a[0] == b[0]:
            cands = by_x.get(a[0], ())
        else:
            cands = taps
        for t in cands:
            if _on_segment(t, a, b):
                u.union((i, a), (i, t))


_VECTOR = re.compile(r"^(.*)\[(\d+)\.\.(\d+)\]$")


def _members(name: str) -> list[tuple[int, str]]:
    """(number, member name) of a vector bus name ``D[0..7]``; empty for any other name."""
    m = _VECTOR.match(name)
    if not m:
        return []
    a, b = int(m.group(2)), int(m.group(3))
    lo, hi = min(a, b), max(a, b)
    if hi - lo > 1024:
        return []
    return [(n, f"{m.group(1)}{n}") for n in range(lo, hi + 1)]


def _bus_finder(i: int, buses):
    """A function from a point to the root of the bus it lies on (None when off every bus)."""
    ub = _Union()
    segs = [(_k(a), _k(b)) for a, b in buses]
    ends: set = set()
    for a, b in segs:
        ub.union(("B", i, a), ("B", i, b))
        ends.add(a)
        ends.add(b)
    for a, b in segs:  # a bus end landing on another bus joins it
        for e in ends:
            if _on_segment(e, a, b):
                ub.union(("B", i, a), ("B", i, e))

    def at(point) -> object | None:
        kp = _k(point)
        if kp in ends:
            return ub.find(("B", i, kp))
        for a, b in segs:
            if _on_segment(kp, a, b):
                return ub.find(("B", i, a))
        return None

    return at


def _join_buses(u: _Union, instances) -> None:
    finders = {}
    for i, inst in enumerate(instances):
        doc = inst.doc
        vectors = [(kind, name) for kind, name, _ in doc.labels if "[" in name]
        if not vectors and not any("[" in n for sub in doc.sheets for n, _ in sub.pins):
            continue
        bus_at = finders[i] = _bus_finder(i, doc.buses) if doc.buses else (lambda p: None)
        for kind, name, p in doc.labels:
            members = _members(name)
            if not members:
                continue
            root = bus_at(p)
            for n, member in members:
                target = ("G", member) if kind == "global" else ("L", i, member)
                if kind == "hierarchical":
                    u.union(("HB", i, name, n), target)
                if root is not None:
                    u.union(("BM", i, root, n), target)
                    if kind == "hierarchical":
                        u.union(("BM", i, root, n), ("HB", i, name, n))
    for ci, inst in enumerate(instances):
        if inst.parent is None or inst.parent not in finders:
            continue
        for sname, p in inst.sheet_pins:
            members = _members(sname)
            root = finders[inst.parent](p) if members else None
            for n, member in members:
                u.union(("HB", ci, sname, n), ("BM", inst.parent, root, n) if root is not None
                        else ("L", inst.parent, member))


def resolve(board: Board, instances) -> None:
    """Fill ``board.nets`` from the placed items of every sheet instance."""
    u = _Union()
    names: dict = defaultdict(list)  # root -> [(priority, depth, name)]
    power_roots: set = set()
    nc_points: list = []
    pin_points: list = []
    for i, inst in enumerate(instances):
        doc = inst.doc
        depth = len(inst.uuids)
        wires = [(_k(a), _k(b)) for a, b in doc.wires]
        taps: set = set()
        for a, b in wires:
            u.union((i, a), (i, b))
            taps.add(a)
            taps.add(b)
        for j in doc.junctions:
            taps.add(_k(j))
            u.find((i, _k(j)))
        for kind, name, p in doc.labels:
            kp = _k(p)
            taps.add(kp)
            if kind == "global":
                u.union(("G", name), (i, kp))
                names[("G", name)].append((1, 0, name))
            elif kind == "local":
                u.union(("L", i, name), (i, kp))
                names[("L", i, name)].append((2, depth, f"{inst.name}{name}"))
            else:  # a hierarchical label shares the sheet's local names (KiCad joins equal names)
                u.union(("L", i, name), (i, kp))
                names[("L", i, name)].append((2, depth, f"{inst.name}{name}"))
        for sname, p in (s for sub in doc.sheets for s in sub.pins):
            taps.add(_k(p))
        for value, p in inst.power:
            kp = _k(p)
            taps.add(kp)
            u.union(("G", value), (i, kp))
            names[("G", value)].append((0, 0, value))
            power_roots.add(("G", value))
        for p in doc.no_connects:
            nc_points.append((i, _k(p)))
        _join_wire_interiors(u, i, wires, list(taps))
        for pin in inst.pins:
            kp = (i, _k(pin.point))
            if pin.hidden and pin.kind == "power_in" and pin.name:
                u.union(("G", pin.name), kp)
                names[("G", pin.name)].append((0, 0, pin.name))
                power_roots.add(("G", pin.name))
            pin_points.append((pin, kp))
    # sheet pins <-> hierarchical labels of the child instance
    for ci, inst in enumerate(instances):
        if inst.parent is None:
            continue
        for sname, p in inst.sheet_pins:
            u.union((inst.parent, _k(p)), ("L", ci, sname))
    _join_buses(u, instances)
    members: dict = defaultdict(set)
    for pin, kp in pin_points:
        if pin.ref.startswith("#"):
            continue
        members[u.find(kp)].add((pin.ref, pin.number))
    label_of: dict = defaultdict(list)
    for key, cands in names.items():
        label_of[u.find(key)].extend(cands)
    powered = {u.find(k) for k in power_roots}
    nc = {u.find(k) for k in nc_points}
    nets = []
    for root, pins in members.items():
        ordered = sorted(pins, key=lambda rp: (_natural(rp[0]), _natural(rp[1])))
        cands = sorted(label_of.get(root, []))
        if cands:
            name = cands[0][2]
        else:
            r, p = ordered[0]
            name = f"Net-({r}-Pad{p})"
        nets.append(Net(name, ordered, power=root in powered, no_connect=root in nc))
    nets.sort(key=lambda n: _natural(n.name))
    board.nets = nets
    board._pin_net = None


_DIGITS = re.compile(r"(\d+)")


def _natural(text: str) -> tuple:
    return tuple(int(t) if t.isdigit() else t for t in _DIGITS.split(text))
