"""`retime ui [PART] [--bom FILE]`: the terminal workbench."""

from __future__ import annotations

import argparse

NAME = "ui"
HELP = "open the terminal workbench: look parts up, check and swap live, review a BOM"
DESCRIPTION = (
    "Open the interactive workbench in this terminal. Desks: part look-up with the family "
    "sheet (F2), check/swap with live recomputation and a timing picture (F3), BOM review "
    "(F4). F1 shows the keys and the safety cautions; Ctrl+Q quits."
)


def register(p: argparse.ArgumentParser) -> None:
    p.add_argument("part", nargs="?", metavar="PART", help="part number to look up first")
    p.add_argument("--bom", metavar="FILE", help="open the BOM desk on this file")


def run(args: argparse.Namespace) -> int:
    import sys

    from advisor.errors import InputError

    if getattr(args, "json", False):
        raise InputError("'retime ui' is interactive and has no JSON output; use check, swap or bom with --json")
    if not (sys.stdin.isatty() and sys.stdout.isatty()):
        raise InputError("'retime ui' needs an interactive terminal", hint="run it in a terminal, not through a pipe")
    from advisor.tui.app import Workbench  # Textual loads only here

    app = Workbench(catalog_dirs=tuple(getattr(args, "catalog", []) or []), part=args.part, bom_file=args.bom)
    app.run()
    return int(app.return_code or 0)
