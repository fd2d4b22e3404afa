"""``retime catalog list|check``: the families on file, and a full validation."""

from __future__ import annotations

NAME = "catalog"
HELP = "list the part families, or check every catalog (and rules) file for problems"


def register(parser) -> None:
    parser.add_argument("action", choices=["list", "check"], help="list: all families; check: validate, exit 1 on problems")


def _summary(cat, key: str) -> dict:
    from advisor.catalog import count_memory
    from advisor.lifecycle import lifecycle_json

    fam = cat.families[key]
    return {"id": fam.id, "title": fam.title, "function": fam.function, "technology": fam.technology,
            "channels": fam.channels, "status": fam.status, "lifecycle": lifecycle_json(fam), "retrigger": fam.behaviour.retrigger,
            "law": fam.timing.law, "supply_min": fam.supply.recommended.min,
            "supply_max": fam.supply.recommended.max, "part_numbers": fam.part_numbers,
            "packages": [p.name for p in fam.packages], "file": cat.files[key],
            "memory_values": count_memory(fam)}


def _rules_problems() -> list[str]:
    """Every located problem in the rules files (the catalog check covers both)."""
    from advisor.rules import load_rules

    return [str(p) for p in load_rules().problems]


def run(args) -> int:
    from advisor.catalog import load_catalog
    from advisor.cli.output import catalog_for, emit_json

    if args.action == "list":
        cat = catalog_for(args)
        rows = [_summary(cat, k) for k in cat.ids()]
        if args.json:
            emit_json({"families": rows})
            return 0
        width = max((len(r["id"]) for r in rows), default=2)
        for r in rows:
            flag = f"  ({r['memory_values']} from memory)" if r["memory_values"] else ""
            print(f"{r['id']:<{width}}  {r['technology']:<9} {r['channels']}ch  {r['status']:<13} retrigger {r['retrigger']:<10} "
                  f"{r['supply_min']:g}-{r['supply_max']:g} V  {r['title']}{flag}")
        print(f"{len(rows)} families")
        return 0

    cat = load_catalog(tuple(getattr(args, "catalog", []) or []))
    problems = [str(p) for p in cat.problems] + _rules_problems()
    rows = [_summary(cat, k) for k in cat.ids()]
    memory = sum(r["memory_values"] for r in rows)
    by_family = {r["id"]: r["memory_values"] for r in rows if r["memory_values"]}
    from advisor.catalog import provenance

    prov = {"values": 0, "published": 0, "memory": 0, "common_practice": 0, "constants_from_memory": 0,
            "unrevised": 0}
    for k in cat.ids():
        for name, n in provenance(cat.families[k]).items():
            prov[name] += n
    from advisor.overrides import overrides_in_use

    replaced = overrides_in_use(cat)  # shipped families and rules a user folder replaced
    if args.json:
        emit_json({"ok": not problems, "families": len(rows), "problems": problems,
                   "memory_values": memory, "memory_by_family": by_family, "provenance": prov,
                   "overrides": [o.to_json() for o in replaced]})
    else:
        for line in problems:
            print(line)
        for o in replaced:
            print(f"replaced: {o.assumption()}")
        verdict = "ok" if not problems else f"{len(problems)} problem(s)"
        print(f"catalog: {len(rows)} families, {verdict}; {memory} values still from memory (unverified)"
              + (f" in {len(by_family)} families" if by_family else ""))
        share = prov["published"] / prov["values"] if prov["values"] else 0.0
        print(f"provenance: {prov['values']} numbers, {prov['published']} ({share:.0%}) from a published document, "
              f"{prov['unrevised']} from a document that names no revision, "
              f"{prov['memory']} from memory, {prov['common_practice']} common practice; "
              f"{prov['constants_from_memory']} timing constants from memory")
    return 1 if problems else 0
