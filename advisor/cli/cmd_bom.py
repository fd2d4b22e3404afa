"""`retime bom FILE [-o OUT] [--new-vcc V]`: review a bill of materials."""

from __future__ import annotations

import argparse
import sys

NAME = "bom"
HELP = "review every timer and one-shot line of a CSV/XLSX bill of materials"
DESCRIPTION = (
    "Read a CSV or XLSX BOM, recognise each part number once, and give every timer and one-shot "
    "line its family, match score, status, best alternates with their class and key findings. "
    "Every input row comes back in order; the input is never overwritten."
)


def register(p: argparse.ArgumentParser) -> None:
    p.add_argument("file", metavar="FILE", help="BOM as .csv/.tsv/.txt or .xlsx")
    from advisor.cli.options import output_path

    p.add_argument("-o", "--output", metavar="OUT", type=output_path,
                   help="write the reviewed BOM (.csv, .xlsx, .json or .md)")
    p.add_argument("--part-column", metavar="NAME", help="header (or 1-based number) of the part-number column")
    p.add_argument("--sheet", metavar="NAME", help="workbook sheet to read (default: the first with a part-number column)")
    p.add_argument("--new-vcc", metavar="V", help="the supply the board moves to (V)")
    p.add_argument("--vcc", metavar="V", help="supply for lines without a supply column (default 5 V where the part runs there)")
    p.add_argument("--limit", type=int, default=3, help="alternates kept per line (default 3)")
    p.add_argument("--include-obsolete", action="store_true",
                   help="also offer obsolete families (after every family still made, marked)")
    p.add_argument("--stock", metavar="FILE",
                   help="CSV or XLSX list of part numbers on the shelf or the approved list: those rank first among equals")
    from advisor.cli.options import add_fail_on_option, add_report_option

    add_fail_on_option(p)

    add_report_option(p)


def compute(args: argparse.Namespace):
    """The review for these arguments (the Python API calls it too); nothing is written."""
    from advisor.bom.progress import Progress
    from advisor.bom.review import review_bom
    from advisor.bom.table import read_table
    from advisor.cli.options import quantity_from_args, stock_from_args
    from advisor.cli.output import catalog_for

    new_vcc = quantity_from_args(args, "--new-vcc", "voltage")
    vcc = quantity_from_args(args, "--vcc", "voltage")
    _check_paths(args)
    catalog = catalog_for(args)
    stock = stock_from_args(args, catalog)
    table = read_table(args.file, sheet=args.sheet)
    # Long files get a bar (on a terminal only); it counts the distinct timer lines judged.
    bar = Progress("judging distinct timer lines", min_total=1 if len(table.rows) > 500 else 10**9)
    try:
        res = review_bom(table, catalog, part_column=args.part_column, new_vcc=new_vcc, vcc=vcc,
                         limit=max(1, args.limit), progress=bar, include_obsolete=args.include_obsolete,
                         stock=stock)
    finally:
        bar.close()
    from advisor.overrides import note_overrides

    return note_overrides(res, catalog)


def run(args: argparse.Namespace) -> int:
    from advisor.bom.write import write_bom
    from advisor.cli.output import emit_json

    res = compute(args)
    if args.output:
        write_bom(res, args.output)
    from advisor.cli.options import write_report_if_asked

    write_report_if_asked(args, res, "bom")
    if args.json:
        emit_json(res.to_json())
    else:
        _print_text(res, args.output)
    from advisor.cli.options import fail_on_status

    return fail_on_status(args, res)


def _check_paths(args: argparse.Namespace) -> None:
    """-o and --report may name neither the input nor each other (exit 2 before any work)."""
    from pathlib import Path

    from advisor.errors import InputError

    def same(a: str, b: str) -> bool:
        pa, pb = Path(a), Path(b)
        try:
            if pa.exists() and pb.exists():
                return pa.samefile(pb)
        except OSError:
            pass
        return pa.resolve() == pb.resolve()

    out, report = args.output, getattr(args, "report", None)
    if out and same(out, args.file):
        raise InputError(f"-o {out!r} names the input BOM; choose another output name (the input is never overwritten)")
    if report and same(report, args.file):
        raise InputError(f"--report {report!r} names the input BOM; choose another report name")
    if out and report and same(out, report):
        raise InputError(f"-o and --report both name {out!r}; give each its own file")


def _print_text(res, output: str | None) -> None:
    t = res.table
    head = t.header
    part_name = head[res.columns.part] if res.columns.part < len(head) else f"column {res.columns.part + 1}"
    out = sys.stdout
    sheet = f" (sheet {t.sheet!r} of {len(t.sheets)})" if t.sheet and len(t.sheets) > 1 else (
        f" (sheet {t.sheet!r})" if t.sheet else "")
    out.write(f"{t.path.name}{sheet}: {len(res.reviews)} lines, part numbers from {part_name!r}")
    if res.columns.duplicate_part_headers:
        out.write(f" (the header appears {1 + len(res.columns.duplicate_part_headers)} times; the first is used)")
    out.write("\n")
    used = {k: v for k, v in res.value_columns.items() if v}
    if used:
        out.write("  each line's own values from " + ", ".join(f"{k.upper()} {v!r}" for k, v in used.items()) + "\n")
    else:
        out.write("  no R/C columns: classes judged on pins, behaviour and supply with a reference network\n")
    shown = 0
    for rev in res.reviews:
        if rev.status not in ("reviewed", "check-match", "unreadable"):
            continue
        if shown >= 40:
            continue
        shown += 1
        row = t.rows[rev.index]
        part = row[res.columns.part] if res.columns.part < len(row) else ""
        alts = ", ".join(f"{a['family']} [{a['class']}, {a.get('status') or 'unknown'}]"
                         + (" *" if a.get("in_stock") else "") for a in rev.alternates) or "—"
        ref = f"{rev.ref:<6} " if rev.ref else ""
        own = f" ({rev.part_status})" if rev.part_status else ""
        out.write(f"  line {t.line_of(rev.index):>5}  {ref}{part:<18} {rev.status:<12} {rev.family + own:<22} → {alts}\n")
        if rev.new_values:
            from advisor.substitute.text import network

            out.write(f"{'':>14}new values for {rev.best_alternate}: {network(rev.new_values)}\n")
        if rev.reason:
            out.write(f"{'':>14}{rev.reason}\n")
    hidden = sum(1 for r in res.reviews if r.status in ("reviewed", "check-match", "unreadable")) - shown
    if hidden > 0:
        out.write(f"  … {hidden} more timer/one-shot lines (write them all with -o OUT)\n")
    out.write("summary: " + ", ".join(f"{k} {v}" for k, v in res.summary.items()) + "\n")
    for a in res.assumptions:
        out.write(f"assumed: {a}\n")
    if output:
        out.write(f"written: {output}\n")
