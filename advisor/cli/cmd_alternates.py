"""`retime alternates OLD [circuit options] [--new-vcc V]`: ranked replacement candidates."""

from __future__ import annotations

import argparse
import sys

NAME = "alternates"
HELP = "every catalog family that can do the old part's job at the (new) supply, ranked"
DESCRIPTION = (
    "Run a swap for every catalog family that can make the old circuit's pulse (or clock) at the "
    "supply, and rank them: obsolete parts never above a part still made (left out unless "
    "--include-obsolete), then the class (drop-in, drop-in-new-values, rewire, redesign), the "
    "lifecycle status, the behaviour kept (retriggering, clear, Schmitt inputs, power-up), the fewest "
    "parts changed (keep R and C, then one part), the same mounting, then the timing error (errors "
    "inside the tolerance count as equal); parts in --stock come first among equals. Each candidate "
    "says why it stands where it does. Families that cannot do the job at this supply are listed with the reason."
)


def register(p: argparse.ArgumentParser) -> None:
    from advisor.cli.options import add_circuit_options, add_new_vcc_option

    p.add_argument("old", metavar="OLD", help="the part on the board (family id or part number)")
    add_circuit_options(p, targets=False)
    add_new_vcc_option(p)
    p.add_argument("--limit", type=int, default=10, metavar="N", help="show the best N candidates (0: all; default 10)")
    from advisor.cli.options import add_fail_on_option, add_ranking_options, add_report_option, add_series_options

    add_fail_on_option(p)
    add_series_options(p, capacitors=False)
    add_ranking_options(p)
    add_report_option(p)


def compute(args: argparse.Namespace):
    """The engine's answer for these arguments (the Python API calls it too)."""
    from advisor.cli.options import (circuit_from_args, keep_within_from_args, new_vcc_from_args,
                                     series_from_args, stock_from_args, with_series)
    from advisor.cli.output import catalog_for
    from advisor.errors import InputError
    from advisor.substitute.alternates import alternates

    if args.limit < 0:
        raise InputError("--limit: give 0 (all) or a positive number", got=args.limit)
    catalog = catalog_for(args)
    old = catalog.resolve(args.old)
    series, _ = series_from_args(args)
    circuit = with_series(args, circuit_from_args(args, old.id))
    result = alternates(catalog, old.id, circuit, new_vcc=new_vcc_from_args(args), limit=args.limit, series=series,
                        include_obsolete=args.include_obsolete, stock=stock_from_args(args, catalog),
                        keep_within=keep_within_from_args(args))
    from advisor.overrides import note_overrides

    return note_overrides(result, catalog)


def run(args: argparse.Namespace) -> int:
    from advisor.cli.options import fail_on_status
    from advisor.cli.output import emit_json
    from advisor.substitute.text import render_alternates

    result = compute(args)
    from advisor.cli.options import write_report_if_asked

    write_report_if_asked(args, result, "alternates")
    if args.json:
        emit_json(result.to_json())
    else:
        sys.stdout.write(render_alternates(result.to_json()))
    return fail_on_status(args, result)
