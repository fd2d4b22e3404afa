"""`retime demo`: run the bundled (invented) scenario end to end and print the substitution report."""

from __future__ import annotations

import argparse
import sys

NAME = "demo"
HELP = "run the bundled scenario: a small bench instrument re-spun from 15 V to 5 V"
DESCRIPTION = (
    "Runs the scenario shipped in advisor/data/demo (an instrument of our own invention): each "
    "timer and one-shot is swapped at the new supply with its values, class, pin map, rework and "
    "findings, and the obsolete one-shot gets a ranked list of alternates."
)


def register(p: argparse.ArgumentParser) -> None:
    p.add_argument("--scenario", metavar="FILE", help="run another scenario file of the same form")


def run(args: argparse.Namespace) -> int:
    from pathlib import Path

    from advisor.cli.output import catalog_for, emit_json
    from advisor.substitute.demo import load_scenario, render_demo, run_demo

    scenario = load_scenario(Path(args.scenario) if args.scenario else None)
    result = run_demo(catalog_for(args), scenario)
    if args.json:
        emit_json(result.to_json())
    else:
        sys.stdout.write(render_demo(result))
    return 0
