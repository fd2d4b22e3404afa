"""`retime swap OLD NEW [circuit options] [--new-vcc V]`: replace one part by another."""

from __future__ import annotations

import argparse
import sys

NAME = "swap"
HELP = "replace a timer or one-shot: new values, pin map, rework steps, class and findings"
DESCRIPTION = (
    "Keep the pulse (or the frequency and duty) the old circuit made -- the measured one when "
    "--measured-* is given -- on the NEW part at the new supply: standard values (the existing "
    "capacitor kept when possible), findings for both parts, the pin map channel by channel with "
    "the trigger edge carried to the right input, the ordered bench steps, and the class: drop-in, "
    "drop-in-new-values, rewire, redesign or unsuitable."
)


def register(p: argparse.ArgumentParser) -> None:
    from advisor.cli.options import add_circuit_options, add_new_vcc_option

    p.add_argument("old", metavar="OLD", help="the part on the board (family id or part number), e.g. SN74121N")
    p.add_argument("new", metavar="NEW", help="the part to fit instead, e.g. 74HC221")
    add_circuit_options(p, targets=False)
    add_new_vcc_option(p)
    p.add_argument("--old-maker", metavar="NAME",
                   help="the old part's maker, when its part number names none (read from its markings): "
                        "the time to keep then follows that maker's constant (--maker names the new part's)")
    p.add_argument("--new-divide", metavar="N",
                   help="counter-based new part: its divide ratio (default: --divide when the new part can "
                        "select it, else the ratio design chooses)")
    from advisor.cli.options import add_fail_on_option, add_keep_within_option, add_series_options

    add_series_options(p, capacitors=False)
    add_keep_within_option(p)
    add_fail_on_option(p)
    p.add_argument("--old-package", metavar="PKG", help="the old part's package, e.g. DIP-14 (default: its first)")
    p.add_argument("--new-package", metavar="PKG", help="the new part's package (default: the one closest to the old)")
    from advisor.cli.options import add_report_option

    add_report_option(p)
    p.add_argument("--no-picture", action="store_true", help="leave the timing picture out of the text output")


def compute(args: argparse.Namespace):
    """The engine's answer for these arguments (the Python API calls it too)."""
    from advisor.cli.options import circuit_from_args, keep_within_from_args, new_vcc_from_args, series_from_args, with_series
    from advisor.cli.options import count_from_args
    from advisor.cli.output import catalog_for
    from advisor.substitute.swap import swap

    catalog = catalog_for(args)
    old = catalog.resolve(args.old)
    series, _ = series_from_args(args)
    result = swap(catalog, old.id, args.new, with_series(args, circuit_from_args(args, old.id)),
                  new_vcc=new_vcc_from_args(args), series=series, old_package=args.old_package,
                  new_package=args.new_package, keep_within=keep_within_from_args(args),
                  new_maker=getattr(args, "maker", None), new_divide=count_from_args(args, "--new-divide"))
    from advisor.overrides import note_overrides

    return note_overrides(result, catalog)


def run(args: argparse.Namespace) -> int:
    from advisor.cli.options import fail_on_status
    from advisor.cli.output import emit_json

    result = compute(args)
    from advisor.cli.options import write_report_if_asked

    write_report_if_asked(args, result, "swap")
    if args.json:
        emit_json(result.to_json())
    else:
        from advisor.substitute.text import render_swap

        j = result.to_json()
        text = render_swap(j)
        if not args.no_picture:
            from advisor.picture import render_text as picture, terminal_columns, under_numbers

            text = under_numbers(text, picture(j, terminal_columns(), indent=2), "  rework")
        sys.stdout.write(text)
    return fail_on_status(args, result)
