"""``retime find QUERY``: which catalog families a part number names, ranked."""

from __future__ import annotations

NAME = "find"
HELP = "recognise a part number (maker prefixes, package suffixes, typos) and rank the families"


def register(parser) -> None:
    parser.add_argument("query", help="a part number as printed or listed, e.g. SN74LS221N, MC14538BCP")
    parser.add_argument("--limit", type=int, default=10, help="most candidates to list (default 10)")


def run(args) -> int:
    from advisor.cli.output import catalog_for, emit_json
    from advisor.errors import InputError
    from advisor.partnumber import recognise

    if args.limit < 1:
        raise InputError("--limit must be at least 1", got=args.limit)
    cat = catalog_for(args)
    matches = recognise(cat, args.query, limit=args.limit)
    rows = []
    for m in matches:
        fam = cat.families[m.family]
        rows.append({**m.to_json(), "title": fam.title, "technology": fam.technology,
                     "function": fam.function, "channels": fam.channels})
    if args.json:
        emit_json({"query": args.query, "results": rows})
        return 0 if rows else 1
    if not rows:
        print(f"no family matches {args.query!r}; 'retime catalog list' shows them all")
        return 1
    width = max(len(r["family"]) for r in rows)
    print(f"candidates for {args.query!r} (score out of 100):")
    for r in rows:
        via = f"read as {r['matched']}" + (f" + suffix {r['suffix']}" if r["suffix"] else "")
        print(f"  {r['family']:<{width}}  {r['score']:5.1f}  {r['how']:<10}  {r['title']}  [{via}]")
    return 0
