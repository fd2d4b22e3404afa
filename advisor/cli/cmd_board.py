"""`retime board FILE [--new-vcc V] [--supply NET=V ...]`: plan a whole KiCad board's move."""

from __future__ import annotations

import argparse
import sys

NAME = "board"
HELP = "read a KiCad schematic or netlist, find every timer and one-shot with its network, plan the move"
DESCRIPTION = (
    "Reads a KiCad 6+ schematic (.kicad_sch, with its sub-sheets and repeated sheet instances) or a "
    "KiCad netlist export (.net), resolves its nets, finds every catalog timer and one-shot, traces each "
    "channel's resistors, capacitors and trimmers, its supply, its trigger source and the state of its "
    "other inputs, then checks it at today's supply and plans its replacement at the new supply "
    "(alternates, best first, with the swap's values, pin map and rework), adds the findings only the "
    "board shows, and lists the BOM delta. What cannot be traced is listed with its place."
)


def register(p: argparse.ArgumentParser) -> None:
    from advisor.cli.options import add_fail_on_option, add_new_vcc_option, add_report_option

    p.add_argument("file", metavar="FILE", help="a KiCad schematic (.kicad_sch) or netlist (.net)")
    add_new_vcc_option(p)
    p.add_argument("--supply", metavar="NET=V", action="append", default=[],
                   help="voltage of a supply net whose name does not say it, e.g. --supply VDD=12 (repeatable)")
    add_report_option(p)
    add_fail_on_option(p)


def run(args: argparse.Namespace) -> int:
    from advisor.board import read_board
    from advisor.board.plan import plan_board
    from advisor.board.rails import parse_supplies
    from advisor.board.text import render_board
    from advisor.cli.options import new_vcc_from_args
    from advisor.cli.output import catalog_for, emit_json, to_plain

    supplies = parse_supplies(args.supply)
    new_vcc = new_vcc_from_args(args)
    catalog = catalog_for(args)
    from advisor.overrides import note_overrides

    plan = note_overrides(plan_board(catalog, read_board(args.file), new_vcc=new_vcc, supplies=supplies), catalog)
    result = to_plain(plan.to_json())
    if getattr(args, "report", None):
        from advisor.board.report import write_board_report

        written = write_board_report(result, args.report, catalog)
        sys.stderr.write(f"retime: report written to {written}\n")
    if args.json:
        emit_json(result)
    else:
        sys.stdout.write(render_board(result))
    from advisor.cli.options import fail_on_status

    return fail_on_status(args, result)
