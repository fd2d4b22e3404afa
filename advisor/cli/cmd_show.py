"""``retime show PART``: one family's sheet, every number with its source.

The JSON carries the whole family record plus ready-made views: ``limits``
(supply and timing-network limits), ``law`` (equation and constants with their
published spread), ``behaviour``, ``pinouts`` and ``sources``. The text sheet
shows the same for people, marking values that are from memory.
"""

from __future__ import annotations

NAME = "show"
HELP = "show a family's sheet: supply, timing law and constants (with spread), limits, behaviour, pins, sources"

def _law_text() -> dict[str, str]:
    from advisor.timing.registry import LAWS

    return {name: spec.equation for name, spec in LAWS.items()}


#: Equation text per law, from the law registry (advisor.timing.registry).
LAW_TEXT = _law_text()


def register(parser) -> None:
    parser.add_argument("part", help="family id or any recognised part number")


def spread(values) -> dict:
    nums = [v.value for v in values]
    return {"min": min(nums), "max": max(nums), "count": len(nums),
            "makers": sorted({v.maker for v in values if v.maker}),
            "from_memory": sum(v.source == "memory" for v in values)}


def sheet_json(cat, fam) -> dict:
    from advisor.catalog import count_memory
    from advisor.cli.output import to_plain

    data = to_plain(fam)
    key = fam.id.upper()
    law = {"name": fam.timing.law, "equation": LAW_TEXT.get(fam.timing.law, ""),
           "constants": data["timing"]["constants"],
           "spread": {k: spread(v) for k, v in fam.timing.constants.items() if v}}
    limits = {"supply": data["supply"], "r_min": data["components"]["r_min"],
              "r_max": data["components"]["r_max"], "c_min": data["components"]["c_min"],
              "c_max": data["components"]["c_max"]}
    for name in ("r_internal", "c_linear_min", "f_max", "width_min", "width_max"):
        if data["timing"].get(name) is not None:
            limits[name] = data["timing"][name]
    return {"family": fam.id, **data, "law": law, "limits": limits, "pinouts": data["packages"],
            "memory_values": count_memory(fam), "file": cat.files.get(key)}


def _fmt(v, unit: str) -> str:
    from advisor.values import format_eng

    text = format_eng(v.value, unit) if unit else f"{v.value:g}"
    cond = []
    if v.vcc_min is not None or v.vcc_max is not None:
        lo, hi = v.vcc_min, v.vcc_max
        cond.append(f"VCC {lo:g} V" if lo == hi else f"VCC {'' if lo is None else f'{lo:g}'}..{'' if hi is None else f'{hi:g}'} V")
    if v.c_min is not None or v.c_max is not None:
        cond.append(f"C {'>= ' + format_eng(v.c_min, 'F') if v.c_min is not None else ''}"
                    f"{' <= ' + format_eng(v.c_max, 'F') if v.c_max is not None else ''}")
    who = v.maker + ", " if v.maker else ""
    mark = " [from memory]" if v.source == "memory" else ""
    return f"{text}{' (' + '; '.join(cond) + ')' if cond else ''}  <{who}{v.source}>{mark}"


def sheet_text(cat, fam) -> list[str]:
    from advisor.catalog import count_memory
    from advisor.lifecycle import status_text

    out = [f"{fam.id} - {fam.title}",
           f"  {fam.function}, {fam.technology}, {fam.channels} channel(s), status {status_text(fam)}",
           f"  also read as: {', '.join(fam.part_numbers)}"]
    r = fam.supply.recommended
    out += ["", "Supply", f"  recommended {r.min:g}..{r.max:g} V  <{r.source}>", f"  absolute max {_fmt(fam.supply.absolute_max, 'V')}"]
    out += ["", f"Timing law: {fam.timing.law}   {LAW_TEXT.get(fam.timing.law, '')}"]
    for name, values in fam.timing.constants.items():
        unit = "Ω" if name.startswith("r_") else ""
        s = spread(values) if values else None
        span = f"  (published spread {s['min']:g}..{s['max']:g})" if s and s["min"] != s["max"] else ""
        out.append(f"  {name}{span}")
        out += [f"    {_fmt(v, unit)}" + (f"  - {v.note}" if v.note else "") for v in values]
    for name, unit in (("r_internal", "Ω"), ("c_linear_min", "F"), ("f_max", "Hz"), ("width_min", "s"), ("width_max", "s")):
        v = getattr(fam.timing, name)
        if v is not None:
            out.append(f"  {name}: {_fmt(v, unit)}")
    for v in fam.timing.spread:
        who = f"{v.maker}, " if v.maker else ""
        out.append(f"  part-to-part spread: {v.text()}  ({who}<{v.source}>)" + (f"  - {v.note}" if v.note else ""))
    for row in fam.timing.widths:
        lim = f"{row.min:g}..{row.max:g}" if row.min is not None and row.max is not None else "typ only"
        out.append(f"  published width at R {row.r:g} Ω, C {row.c:g} F, {row.vcc:g} V: typ {row.typ:g} s ({lim})"
                   f"  <{row.source}, {row.table}>")
    if fam.timing.note:
        out.append(f"  note: {fam.timing.note}")
    out += ["", "Timing network limits"]
    for name, unit in (("r_min", "Ω"), ("r_max", "Ω"), ("c_min", "F"), ("c_max", "F")):
        for v in getattr(fam.components, name):
            out.append(f"  {name}: {_fmt(v, unit)}" + (f"  - {v.note}" if v.note else ""))
    if fam.components.electrolytic:
        out.append(f"  polarised Cext: {fam.components.electrolytic}")
    b = fam.behaviour
    out += ["", "Behaviour", f"  retriggerable: {b.retrigger}  <{b.retrigger_source}>"]
    for t in b.triggers:
        en = ", ".join(f"{k} {v}" for k, v in t.enable.items())
        out.append(f"  trigger {t.name}: {t.edge}{', Schmitt' if t.schmitt else ''}{'; needs ' + en if en else ''}")
    if b.clear:
        c = b.clear
        out.append(f"  clear {c.name}: active {c.active}; ends pulse {'yes' if c.ends_pulse else 'no'}; "
                   f"release can trigger {'yes' if c.triggers_on_release else 'no'}  <{c.source}>")
    if b.power_up:
        out.append(f"  power-up: {b.power_up}")
    i = fam.interface
    out += ["", "Interface", f"  inputs: {i.inputs}{'' if i.input_clamp_to_vcc else ' (tolerate more than VCC)'}"]
    for name, unit in (("vih", "V"), ("vil", "V"), ("vih_fraction", ""), ("vil_fraction", ""), ("output_source_ma", ""), ("output_sink_ma", "")):
        v = getattr(i, name)
        if v is not None:
            out.append(f"  {name}: {_fmt(v, unit)}")
    for pkg in fam.packages:
        out += ["", f"Pins ({pkg.name}{', same as ' + pkg.same_as if pkg.same_as else ''})  <{pkg.source}>"]
        for p in sorted(pkg.pins, key=lambda p: p.pin):
            ch = f" ch{p.channel}" if p.channel else ""
            out.append(f"  {p.pin:>2}  {p.name:<12} {p.function}{ch}" + (f"  ({p.note})" if p.note else ""))
    out += ["", "Sources"]
    for s in fam.sources:
        out.append(f"  {s.id}: {s.title}" + (f" - {s.document}" if s.document else "") + f" [{s.kind}]")
    n = count_memory(fam)
    out += ["", f"{n} value(s) from memory (unverified)" if n else "every value has a published source"]
    for c in fam.cautions:
        out.append(f"caution: {c}")
    return out


def run(args) -> int:
    from advisor.cli.output import catalog_for, emit_json

    cat = catalog_for(args)
    fam = cat.resolve(args.part)
    if args.json:
        emit_json(sheet_json(cat, fam))
    else:
        print("\n".join(sheet_text(cat, fam)))
    return 0
