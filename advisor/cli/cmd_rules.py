"""``retime rules``: list the datasheet rules with ids, severities and sources.

``--json`` prints ``{"rules": [{"id", "severity", "title", "source", ...}], ...}``.
``--check`` validates the rule files (grammar, safe expressions, names, and
every rule's own fire/no-fire cases) and exits 1 with located problems.
``--vocabulary`` lists the names rule conditions may read.
"""

from __future__ import annotations

import argparse
import sys

NAME = "rules"
HELP = "list the datasheet rules (ids, severities, sources); --check validates the rule files"


def register(p: argparse.ArgumentParser) -> None:
    p.add_argument("rule", nargs="?", metavar="ID", help="show one rule in full")
    p.add_argument("--rules", action="append", default=[], metavar="DIR",
                   help="extra rules folder that adds or overrides rules (repeatable)")
    p.add_argument("--check", action="store_true", help="validate the rule files and run every rule's example cases")
    p.add_argument("--vocabulary", action="store_true", help="list the names a rule condition may read")
    p.add_argument("--severity", choices=["danger", "warning", "note"], help="only rules of this severity")


def _vocabulary_json() -> dict:
    from advisor.rules.context import PART_VOCABULARY, TOP_VOCABULARY

    def rows(vs, prefix):
        return [{"name": prefix + v.name, "kind": v.kind, "unit": v.unit, "doc": v.doc} for v in vs]

    return {"part": rows(PART_VOCABULARY, "part."), "top": rows(TOP_VOCABULARY, "")}


def run(args: argparse.Namespace) -> int:
    from advisor.cli.output import emit_json
    from advisor.rules.engine import check_cases
    from advisor.rules.loader import load_rules

    if args.vocabulary:
        voc = _vocabulary_json()
        if args.json:
            emit_json(voc)
            return 0
        out = sys.stdout
        out.write("Per part (new.*, old.*; written part.* in part rules):\n")
        for r in voc["part"]:
            unit = f" [{r['unit']}]" if r["unit"] else ""
            out.write(f"  {r['name']:<28} {r['kind']:<6}{unit} {r['doc']}\n")
        out.write("Top level (swaps):\n")
        for r in voc["top"]:
            out.write(f"  {r['name']:<28} {r['kind']:<6} {r['doc']}\n")
        return 0

    rs = load_rules(tuple(args.rules))
    problems = [str(p) for p in rs.problems]
    if args.check:
        for rule in rs.rules:
            problems.extend(f"{rule.file}: rule {rule.id}: {msg}" for msg in check_cases(rule))
        if args.json:
            emit_json({"ok": not problems, "rules": len(rs.rules), "problems": problems})
        else:
            for line in problems:
                sys.stderr.write(line + "\n")
            cases = sum(len(r.rule.cases.fire) + len(r.rule.cases.no_fire) for r in rs.rules)
            state = "ok" if not problems else f"{len(problems)} problem(s)"
            sys.stdout.write(f"{len(rs.rules)} rules, {cases} example cases: {state}\n")
        return 1 if problems else 0

    if problems:
        from advisor.errors import DataError

        more = f" (and {len(problems) - 1} more; run 'retime rules --check')" if len(problems) > 1 else ""
        raise DataError(problems[0] + more)

    rules = rs.rules
    if args.rule:
        rules = [rs.get(args.rule)]
    if args.severity:
        rules = [r for r in rules if r.severity == args.severity]

    if args.json:
        payload = rs.to_json()
        payload["rules"] = [r.to_json() for r in rules]
        payload["count"] = len(rules)
        emit_json(payload)
        return 0

    out = sys.stdout
    if args.rule:
        r = rules[0].to_json()
        for key in ("id", "title", "severity", "topic", "file", "scope", "parts", "function", "technology",
                    "family", "condition", "message", "fix", "source"):
            value = r[key]
            if isinstance(value, list):
                value = ", ".join(value) or "all"
            out.write(f"{key:<11} {value}\n")
        out.write(f"{'cases':<11} {r['cases']['fire']} that fire, {r['cases']['no_fire']} that do not\n")
        return 0
    topic = None
    replaced = {o.id: o for o in rs.overrides}
    for rule in rules:
        if rule.topic != topic:
            topic = rule.topic
            out.write(f"\n{topic} ({rule.file})\n")
        where = "swap" if rule.rule.applies_to.scope == "swap" else "/".join(rule.rule.applies_to.parts)
        out.write(f"  {rule.severity:<7} {rule.id:<34} [{where}] {rule.rule.title}\n")
        out.write(f"          source: {rule.rule.source}\n")
        if rule.id in replaced:
            o = replaced[rule.id]
            out.write(f"          replaces the shipped {o.shipped_severity} rule in {o.shipped_file}\n")
    counts = rs.to_json()["by_severity"]
    out.write(f"\n{len(rules)} rules ({counts['danger']} danger, {counts['warning']} warning, {counts['note']} note)\n")
    return 0
