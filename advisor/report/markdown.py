"""The Markdown report: the HTML report's content as text and tables.

Pictures become text: the pulse picture is a character strip (one column per
1/64 of the window: ``‾`` high, ``_`` low; ``^`` a trigger that starts a pulse, ``x``
one the part ignores; a scope capture adds a measured row and a table of its edge
times) and the network is its parts table with the pins.
"""

from __future__ import annotations

from advisor import __version__
from advisor.report.html import CLASS_WORDS, SEVERITY_TITLES
from advisor.report.model import Quantity, Report, Table, Waves
from advisor.values import format_eng

COLUMNS = 64


def _cell(text: str) -> str:
    return text.replace("|", "\\|").replace("\n", " ")


def _table(t: Table) -> list[str]:
    out = ["| " + " | ".join(_cell(c.replace("_", " ")) for c in t.columns) + " |",
           "|" + "|".join("---" for _ in t.columns) + "|"]
    out += ["| " + " | ".join(_cell(v) for v in row) + " |" for row in t.rows]
    return out


def _q_table(qs: list[Quantity]) -> list[str]:
    return _table(Table(("quantity", "value"), tuple((q.label, q.text) for q in qs)))


def strip(w: Waves) -> list[str]:
    """The pulse picture as fixed-width text rows (name, then the strip)."""
    step = w.end / COLUMNS
    names = (["trigger"] if w.kind == "triggered" else []) + [r[0] for r in w.rows] + (
        [w.measured_name] if w.measured is not None else [])
    pad = max(len(n) for n in names) + 2
    lines = []
    if w.kind == "triggered":
        row = ["."] * COLUMNS
        for t, fired in zip(w.triggers, w.fired):
            i = min(COLUMNS - 1, int(round(t / step)))
            row[i] = "^" if fired else "x"
        lines.append("trigger".ljust(pad) + "".join(row))
    rows = list(w.rows) + ([(w.measured_name, w.measured, w.measured_width)] if w.measured is not None else [])
    for name, intervals, _ in rows:
        row = []
        for i in range(COLUMNS):
            mid = (i + 0.5) * step
            row.append("‾" if any(a <= mid < b for a, b in intervals) else "_")
        lines.append(name.ljust(pad) + "".join(row))
    lines.append("".ljust(pad) + f"(window {format_eng(w.end, 's', 4)}; one column = {format_eng(step, 's', 3)})")
    return lines


def render_markdown(rep: Report) -> str:
    out = [f"# {rep.title}", "", f"*retime · {rep.kind} report*", "", rep.lead, ""]
    if rep.verdict:
        out += [f"**Outcome: `{rep.verdict}`** — {CLASS_WORDS.get(rep.verdict, '')}", ""]
    if rep.facts or rep.notes:
        out += ["## At a glance", ""]
        if rep.facts:
            out += _q_table(rep.facts) + [""]
        out += [f"- {n}" for n in rep.notes] + ([""] if rep.notes else [])
    if any(qs for _, qs in rep.parts):
        out += ["## Parts and values", ""]
        for heading, qs in rep.parts:
            if qs:
                out += [f"### {heading}", ""] + _q_table(qs) + [""]
    for heading, t in rep.extra_tables:
        out += [f"## {heading}", ""] + _table(t) + [""]
    if rep.waves is not None or rep.networks:
        out += ["## Pictures", ""]
        if rep.picture:
            out += ["### Pulse picture", "", "```text"] + rep.picture + ["```", ""]
            if rep.waves is not None:
                out += [rep.waves.note, ""]
        elif rep.waves is not None:
            out += ["### Pulse picture", "", "```text"] + strip(rep.waves) + ["```", "", rep.waves.note, ""]
        if rep.capture is not None and rep.capture.edges:
            out += ["### Captured edge times", "", rep.capture.caption, ""]
            out += _table(Table(("channel and edge", "times"),
                                tuple((label, ", ".join(q.text for q in times)) for label, times in rep.capture.edges)))
            out.append("")
        for net in rep.networks:
            where = f"{net.package}, section 1" if net.package else "pin numbers not in the catalog"
            out += [f"### Timing network to fit on the {net.part} ({where})", ""]
            out += _table(Table(("ref", "what", "value", "code", "connects to"),
                                tuple((i.ref, i.role, i.text, i.code, ", ".join(i.pins) or "—") for i in net.items)))
            if net.vcc:
                out.append(f"\nSupply: {format_eng(net.vcc, 'V', 4)}.")
            out.append("")
    out += ["## What the checks found", ""]
    if not rep.findings:
        out += ["No rule fired for this circuit.", ""]
    for sev in ("danger", "warning", "note"):
        items = [f for f in rep.findings if f.severity == sev]
        if not items:
            continue
        out += [f"### {SEVERITY_TITLES[sev]} ({len(items)})", ""]
        for f in items:
            out.append(f"- **{sev}** — {f.message}" + (f" ({f.part})" if f.part else ""))
            if f.fix:
                out.append(f"  - Fix: {f.fix}")
            out.append(f"  - Source: {f.source or 'not stated'} · rule `{f.rule}`")
        out.append("")
    if rep.pin_map is not None or rep.pin_tables:
        out += ["## Pin moves", ""]
        if rep.pin_map is not None:
            out += _table(rep.pin_map) + [""]
        for heading, t in rep.pin_tables:
            out += [f"### {heading}", ""] + _table(t) + [""]
        out += [f"- {n}" for n in rep.pin_notes] + ([""] if rep.pin_notes else [])
    if rep.rework:
        out += ["## Bench steps", ""] + [f"{i}. " + (f"**{a}**: " if a else "") + t
                                         for i, (a, t) in enumerate(rep.rework, 1)] + [""]
    out += ["## Take care", ""] + [f"- {c}" for c in rep.cautions] + [""]
    if rep.sources:
        out += ["## Where the numbers come from", ""]
        out += _table(Table(("family", "title", "document", "kind", "cited"),
                            tuple((s.family, s.title, s.document, s.kind, "yes" if s.cited else "") for s in rep.sources)))
        out += ["", "Values marked memory are recalled, not confirmed by a published source: treat them as unverified.", ""]
    out += ["---", f"Written by retime {__version__} from the computed result. Times and values are nominal unless "
            "marked min or max.", ""]
    return "\n".join(out)
