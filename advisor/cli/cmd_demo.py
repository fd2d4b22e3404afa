"""`retime demo`: run the bundled (invented) scenario end to end and print the substitution report."""

from __future__ import annotations

import argparse
import sys

NAME = "demo"
HELP = "run the bundled scenario: a small bench instrument re-spun from 15 V to 5 V"
DESCRIPTION = (
    "Runs the scenario shipped in advisor/data/demo (an instrument of our own invention): each "
    "timer and one-shot is swapped at the new supply with its values, class, pin map, rework and "
    "findings, and the obsolete one-shot gets a ranked list of alternates. Then the instrument's "
    "logic board (a KiCad schematic shipped beside the scenario) goes through 'retime board' at 5 V."
)

#: The scenario's board and the supply it moves to (advisor/data/demo, tools/make_demo_board.py).
DEMO_BOARD = "bench_pulse_generator.kicad_sch"
DEMO_BOARD_VCC = 5.0


def register(p: argparse.ArgumentParser) -> None:
    p.add_argument("--scenario", metavar="FILE", help="run another scenario file of the same form")


def run(args: argparse.Namespace) -> int:
    from pathlib import Path

    from advisor.cli.output import catalog_for, emit_json
    from advisor.substitute.demo import load_scenario, render_demo, run_demo

    scenario = load_scenario(Path(args.scenario) if args.scenario else None)
    catalog = catalog_for(args)
    result = run_demo(catalog, scenario)
    from advisor.overrides import note_overrides

    for _line, answer in result.swaps + result.alternates:
        note_overrides(answer, catalog)
    board = None if args.scenario else _board(catalog)
    if args.json:
        emit_json({**result.to_json(), "board": board})
    else:
        sys.stdout.write(render_demo(result))
        if board is not None:
            from advisor.board.text import render_board

            sys.stdout.write("\n" + render_board(board))
    return 0


def _board(catalog) -> dict | None:
    """The demo board's plan (``retime board`` on the shipped schematic), or None when not shipped."""
    from advisor.board import read_board
    from advisor.board.plan import plan_board
    from advisor.cli.output import to_plain
    from advisor.resources import data_dir

    path = data_dir("demo") / DEMO_BOARD
    if not path.exists():
        return None
    from advisor.overrides import note_overrides

    return to_plain(note_overrides(plan_board(catalog, read_board(path), new_vcc=DEMO_BOARD_VCC), catalog).to_json())
