"""Pad nets of a KiCad PCB (``.kicad_pcb``): KiCad's own connectivity, the oracle for the schematic reader.

Each footprint carries its reference (``(fp_text reference "R1")`` in KiCad 6,
``(property "Reference" "R1")`` in KiCad 7+) and each pad ``(net N "name")``.
Only the installed demo projects are read; nothing is copied into the repository.
"""

from __future__ import annotations

from pathlib import Path

from advisor.board import sexpr


def pad_nets(path: Path) -> dict[tuple[str, str], str | None]:
    """(reference, pad number) -> net name (None for a pad on no net)."""
    root = sexpr.loads(sexpr.read_text(path), path.name)
    out: dict[tuple[str, str], str | None] = {}
    for fp in root[1:]:
        if sexpr.tag(fp) not in ("footprint", "module"):
            continue
        ref = None
        for c in fp[1:]:
            t = sexpr.tag(c)
            if t == "fp_text" and len(c) > 2 and c[1] == "reference":
                ref = str(c[2])
            elif t == "property" and len(c) > 2 and c[1] == "Reference":
                ref = str(c[2])
        if not ref:
            continue
        for pad in sexpr.children(fp, "pad"):
            number = str(pad[1]) if len(pad) > 1 else ""
            if not number:
                continue
            net = sexpr.child(pad, "net")
            name = str(net[2]) if net is not None and len(net) > 2 else None
            out.setdefault((ref, number), name)
    return out


def demo_pairs(root: Path) -> tuple[list[tuple[Path, Path]], list[tuple[Path, str]]]:
    """(schematic, pcb) pairs of the demos under ``root``, and the PCBs skipped with why."""
    pairs, skipped = [], []
    for pcb in sorted(root.rglob("*.kicad_pcb")):
        sch = pcb.with_suffix(".kicad_sch")
        if sch.exists():
            pairs.append((sch, pcb))
        elif pcb.with_suffix(".sch").exists():
            skipped.append((pcb, "legacy .sch schematic (KiCad 5 format)"))
        else:
            skipped.append((pcb, "no schematic beside the PCB"))
    return pairs, skipped


def partition_differences(sch_nets: list[tuple[str, list[tuple[str, str]]]],
                          pads: dict[tuple[str, str], str | None]) -> list[str]:
    """Pins grouped differently by the schematic and the PCB (pins on both sides only).

    Two pins must share a schematic net exactly when they share a PCB net; a pad
    on no net counts as alone. Names are not compared.
    """
    sch_of: dict[tuple[str, str], int] = {}
    for i, (_, pins) in enumerate(sch_nets):
        for p in pins:
            sch_of[p] = i
    common = [p for p in sch_of if p in pads]
    groups_s: dict[int, set] = {}
    groups_p: dict[object, set] = {}
    for p in common:
        groups_s.setdefault(sch_of[p], set()).add(p)
        key = pads[p] if pads[p] else ("alone", p)
        groups_p.setdefault(key, set()).add(p)
    by_s = {frozenset(g) for g in groups_s.values()}
    by_p = {frozenset(g) for g in groups_p.values()}
    out = []
    for g in sorted(by_s - by_p, key=lambda g: sorted(g)):
        out.append("schematic groups " + ", ".join(f"{r}.{n}" for r, n in sorted(g)))
    for g in sorted(by_p - by_s, key=lambda g: sorted(g)):
        out.append("PCB groups " + ", ".join(f"{r}.{n}" for r, n in sorted(g)))
    return out
