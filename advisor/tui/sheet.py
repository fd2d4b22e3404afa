"""The family sheet: one catalog family laid out for reading at the bench.

Pure rendering of catalog data (no timing is computed here). Every number shows
the source id it came from; values still from memory are marked unverified.
"""

from __future__ import annotations

from rich.console import Group
from rich.table import Table
from rich.text import Text

from advisor.lifecycle import status_text
from advisor.tui.palette import STYLE as S
from advisor.values import format_eng

_UNITS = {"r_min": "Ω", "r_max": "Ω", "c_min": "F", "c_max": "F"}


def _cond(v) -> str:
    parts = []
    if v.vcc_min is not None or v.vcc_max is not None:
        if v.vcc_min == v.vcc_max:
            parts.append(f"at {format_eng(v.vcc_min, 'V')}")
        else:
            lo = format_eng(v.vcc_min, "V") if v.vcc_min is not None else ""
            hi = format_eng(v.vcc_max, "V") if v.vcc_max is not None else ""
            parts.append(f"VCC {lo}..{hi}")
    if v.c_min is not None or v.c_max is not None:
        lo = format_eng(v.c_min, "F") if v.c_min is not None else ""
        hi = format_eng(v.c_max, "F") if v.c_max is not None else ""
        parts.append(f"C {lo}..{hi}")
    if v.maker:
        parts.append(v.maker)
    return ", ".join(parts)


def _src(source: str) -> Text:
    if source == "memory":
        return Text("memory (unverified)", style=S["memory"])
    return Text(source, style=S["source"])


def _section(title: str) -> Text:
    return Text(f"\n{title}", style=S["heading"])


def _value_table() -> Table:
    t = Table(box=None, show_header=False, pad_edge=False, padding=(0, 2, 0, 0), expand=False)
    t.add_column(style=S["key"], no_wrap=True)
    t.add_column()
    t.add_column(style=S["dim"])
    t.add_column()
    return t


def render_sheet(fam) -> Group:
    """A Rich renderable of one :class:`advisor.parts.Family`."""
    out: list = []
    head = Text()
    head.append(fam.id, style=S["id"])
    head.append(f"  {fam.title}")
    out.append(head)
    out.append(Text(f"{fam.function} · {fam.technology} · {fam.channels} channel(s) · status {status_text(fam)}", style=S["dim"]))

    out.append(_section("Supply"))
    t = _value_table()
    rec = fam.supply.recommended
    t.add_row("recommended", f"{format_eng(rec.min, 'V')} .. {format_eng(rec.max, 'V')}", "", _src(rec.source))
    t.add_row("absolute max", format_eng(fam.supply.absolute_max.value, "V"), _cond(fam.supply.absolute_max), _src(fam.supply.absolute_max.source))
    out.append(t)

    out.append(_section(f"Timing law: {fam.timing.law}"))
    t = _value_table()
    for name, vals in fam.timing.constants.items():
        for v in vals:
            t.add_row(name, f"{v.value:g}", _cond(v), _src(v.source))
    for name, unit in (("r_internal", "Ω"), ("c_linear_min", "F"), ("f_max", "Hz"), ("width_min", "s"), ("width_max", "s")):
        v = getattr(fam.timing, name)
        if v is not None:
            shown = f"{v.value:g}" if not unit else format_eng(v.value, unit)
            t.add_row(name.replace("_", " "), shown, _cond(v), _src(v.source))
    for v in fam.timing.spread:
        t.add_row("spread", v.text(), _cond(v), _src(v.source))
    out.append(t)
    if fam.timing.note:
        out.append(Text(fam.timing.note, style=S["dim"]))

    comp = fam.components
    rows = [(n, v) for n in ("r_min", "r_max", "c_min", "c_max") for v in getattr(comp, n)]
    if rows:
        out.append(_section("Timing components"))
        t = _value_table()
        for n, v in rows:
            t.add_row(n.replace("_", " "), format_eng(v.value, _UNITS[n]), _cond(v), _src(v.source))
        out.append(t)
    if comp.electrolytic:
        out.append(Text(f"electrolytic Cext: {comp.electrolytic}", style=S["caution"]))

    b = fam.behaviour
    out.append(_section("Behaviour"))
    line = Text("retriggerable: ", style=S["key"])
    line.append(b.retrigger)
    line.append("  ")
    line.append_text(_src(b.retrigger_source))
    out.append(line)
    for trig in b.triggers:
        enable = ", ".join(f"{k} {v}" for k, v in trig.enable.items())
        line = Text(f"trigger {trig.name}: ", style=S["key"])
        line.append(f"{trig.edge}{', Schmitt' if trig.schmitt else ''}")
        if enable:
            line.append(f" (with {enable})", style=S["dim"])
        out.append(line)
    if b.clear is not None:
        cl = b.clear
        line = Text(f"clear {cl.name}: ", style=S["key"])
        line.append(f"active {cl.active}; {'ends the pulse' if cl.ends_pulse else 'does not end the pulse'}")
        if cl.triggers_on_release:
            line.append("; release can trigger")
        line.append("  ")
        line.append_text(_src(cl.source))
        out.append(line)
    for name, label in (("retrigger_min", "shortest retrigger spacing"), ("recovery", "recovery after a pulse")):
        v = getattr(b, name)
        if v is not None:
            line = Text(f"{label}: ", style=S["key"])
            line.append(format_eng(v.value, "s") + "  ")
            line.append_text(_src(v.source))
            out.append(line)
    if b.power_up:
        out.append(Text(f"power-up: {b.power_up}", style=S["dim"]))
    if b.note:
        out.append(Text(b.note, style=S["dim"]))

    itf = fam.interface
    out.append(_section("Inputs and outputs"))
    t = _value_table()
    t.add_row("input levels", itf.inputs, "", "")
    for name, unit in (("vih", "V"), ("vil", "V"), ("vih_fraction", ""), ("vil_fraction", ""), ("output_source_ma", "mA"), ("output_sink_ma", "mA")):
        v = getattr(itf, name)
        if v is not None:
            t.add_row(name.replace("_", " "), f"{v.value:g} {unit}".strip(), _cond(v), _src(v.source))
    out.append(t)

    for pkg in fam.packages:
        out.append(_section(f"Pins · {pkg.name}" + (f" (same as {pkg.same_as})" if pkg.same_as else "")))
        pins = sorted(pkg.pins, key=lambda p: p.pin)
        half = (len(pins) + 1) // 2
        t = Table(box=None, show_header=False, pad_edge=False, padding=(0, 1, 0, 0))
        for _ in range(2):
            t.add_column(justify="right", style=S["key"])
            t.add_column()
            t.add_column(style=S["dim"])
        for i in range(half):
            cells: list = []
            for p in (pins[i], pins[i + half] if i + half < len(pins) else None):
                if p is None:
                    cells += ["", "", ""]
                else:
                    ch = f"ch{p.channel}" if p.channel else ""
                    cells += [str(p.pin), p.name, f"{p.function} {ch}".strip()]
            t.add_row(*cells)
        out.append(t)

    out.append(_section("Sources"))
    for s in fam.sources:
        line = Text()
        line.append(s.id, style=S["source"])
        line.append(f"  {s.title}")
        if s.document:
            line.append(f" ({s.document})", style=S["dim"])
        line.append(f" [{s.kind}]", style=S["dim"])
        out.append(line)
    for c in fam.cautions:
        out.append(Text(f"caution: {c}", style=S["caution"]))
    if fam.note:
        out.append(Text(fam.note, style=S["dim"]))
    return Group(*out)
