"""Outside oracle for the schematic reader: KiCad's own demo projects.

Each demo (Debian package kicad-demos, read where it is installed, never copied)
ships a schematic and the PCB KiCad made from it; the PCB's pad nets are KiCad's
own connectivity. For every demo with both a ``.kicad_sch`` (KiCad 6+) and a
``.kicad_pcb``, the schematic's nets must group the same pins as the PCB's pad
nets, for the pins present on both sides. Groupings (partitions) are compared,
not names. A PCB with a legacy ``.sch`` or no schematic is skipped with its reason.
"""

from __future__ import annotations

import pytest

from advisor.board import read_board
from tests.support.external import KICAD_DEMOS, kicad_demos_dir
from tests.support.kicad_pcb import demo_pairs, pad_nets, partition_differences

pytestmark = pytest.mark.external

_PAIRS, _SKIPPED = demo_pairs(KICAD_DEMOS) if KICAD_DEMOS.is_dir() else ([], [])


def test_demos_are_there_to_compare():
    root = kicad_demos_dir()
    pairs, _ = demo_pairs(root)
    # kicad-demos 7.0 (Debian 13) ships 13 schematic + PCB pairs; fewer would mean the
    # package changed shape and the comparison below lost its oracle.
    assert len(pairs) >= 10, pairs


@pytest.mark.parametrize("sch,pcb", _PAIRS or [pytest.param(None, None, marks=pytest.mark.skip("no demos"))],
                         ids=lambda p: p.parent.name + "/" + p.name if p is not None else "none")
def test_schematic_nets_match_pcb_pad_nets(sch, pcb):
    kicad_demos_dir()
    board = read_board(sch)
    pads = pad_nets(pcb)
    nets = [(n.name, n.pins) for n in board.nets]
    common = sum(1 for _, pins in nets for p in pins if p in pads)
    assert common >= 4, f"{sch.name}: only {common} pins on both sides"
    diffs = partition_differences(nets, pads)
    assert not diffs, f"{sch.name}: {len(diffs)} groupings differ, e.g. " + "; ".join(d[:160] for d in diffs[:3])
    assert not [p for p in board.problems if p.kind == "file"]


def test_pcbs_without_a_modern_schematic_are_skipped_with_a_reason():
    kicad_demos_dir()
    for pcb, why in _SKIPPED:
        assert why in ("legacy .sch schematic (KiCad 5 format)", "no schematic beside the PCB"), (pcb, why)
