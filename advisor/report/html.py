"""The HTML report: one self-contained file (inline CSS and SVG; no scripts, fonts or
links to the network), so it can be mailed, attached to a review or archived with
the board's records and still open years later.

Every number is written with ``data-key`` (its dotted path in the result JSON) and
``data-si`` (the SI value) beside the formatted text, so a reader's tools, and the
tests, can tie the page back to the result.
"""

from __future__ import annotations

from html import escape

from advisor import __version__
from advisor.presentation import CLASS_WORDS
from advisor.report import diagrams
from advisor.report.model import CaptureView, Quantity, Report, Table

SEVERITY_TITLES = {"danger": "Stop: must be fixed", "warning": "Check before fitting", "note": "Worth knowing"}


_CSS = """
:root { --ink:#1f2a33; --muted:#5b6670; --line:#d5dbe0; --paper:#ffffff; --band:#f3f5f7;
  --danger:#9e2a1f; --danger-bg:#fbeceA; --warning:#8a5a00; --warning-bg:#fff4dc;
  --note:#2b4c6f; --note-bg:#e9f0f7; --accent:#b5562a; }
* { box-sizing: border-box; }
body { margin:0; background:var(--paper); color:var(--ink);
  font: 15px/1.5 "DejaVu Sans", "Segoe UI", Helvetica, Arial, sans-serif; }
main { max-width: 60rem; margin: 0 auto; padding: 1.5rem 1.25rem 3rem; }
header { border-bottom: 3px solid var(--accent); margin-bottom: 1.25rem; padding-bottom: .75rem; }
.kicker { text-transform: uppercase; letter-spacing: .08em; font-size: .75rem; color: var(--muted); margin: 0; }
h1 { font-size: 1.6rem; margin: .2rem 0 .4rem; }
h2 { font-size: 1.2rem; margin: 2rem 0 .6rem; border-bottom: 1px solid var(--line); padding-bottom: .2rem; }
h3 { font-size: 1rem; margin: 1rem 0 .4rem; }
.lead { font-size: 1.05rem; margin: .2rem 0; }
.verdict { display:inline-block; padding:.15rem .6rem; border-radius:1rem; background:var(--band);
  border:1px solid var(--line); font-weight:600; }
table { border-collapse: collapse; margin: .4rem 0 1rem; min-width: 50%; }
th, td { text-align: left; padding: .3rem .7rem; border-bottom: 1px solid var(--line); vertical-align: top; }
th { background: var(--band); font-weight: 600; }
td.num { font-variant-numeric: tabular-nums; white-space: nowrap; }
.pics { display: grid; gap: 1.25rem; }
figure { margin: 0; padding: .75rem; border: 1px solid var(--line); border-radius: .4rem; background: #fff; }
figure svg.pic { display:block; max-width: 100%; height: auto; margin: 0 auto; }
figcaption { color: var(--muted); font-size: .9rem; margin-top: .5rem; }
details.capture-edges { margin-top: .5rem; font-size: .85rem; }
table.capture-edges td span.num { display: inline-block; margin-right: .8rem; font-variant-numeric: tabular-nums; }
ol.findings { list-style: none; padding: 0; }
li.finding { border-left: 5px solid var(--note); background: var(--note-bg); padding: .5rem .8rem; margin: .5rem 0; border-radius: 0 .3rem .3rem 0; }
li.sev-danger { border-color: var(--danger); background: var(--danger-bg); }
li.sev-warning { border-color: var(--warning); background: var(--warning-bg); }
li.finding p { margin: .15rem 0; }
.tag { font-size: .75rem; font-weight: 700; text-transform: uppercase; letter-spacing: .05em; margin-right: .4rem; }
.sev-danger .tag { color: var(--danger); } .sev-warning .tag { color: var(--warning); } .sev-note .tag { color: var(--note); }
.rule, .src { color: var(--muted); font-size: .85rem; }
ol.bench li { margin: .3rem 0; } ol.bench .tag { color: var(--accent); }
.cautions { border: 2px solid var(--danger); border-radius: .4rem; padding: .25rem 1rem .5rem; background: #fffaf8; }
.cautions h2 { border: 0; margin-top: .6rem; color: var(--danger); }
.notes li { color: var(--muted); }
footer { margin-top: 2.5rem; color: var(--muted); font-size: .8rem; border-top: 1px solid var(--line); padding-top: .5rem; }
.sheet-top { display: flex; flex-wrap: wrap; gap: 0 2rem; }
.sheet-top table { min-width: 0; }
table.job { width: 100%; } table.job td.fill { border-bottom: 1px solid var(--ink); min-width: 12rem; }
.short-caution { color: var(--danger); font-size: .9rem; }
.pic-pinmoves svg { display: block; max-width: 100%; height: auto; }
"""

#: Print: A4, small type, the bench sheet on the first page, findings after it, pictures
#: and tables kept whole, nothing the screen needs (backgrounds, wide margins).
_PRINT_CSS = """
@page { size: A4; margin: 8mm 10mm; }
@media print {
  html { font-size: 7.4pt; }
  body { font-size: 7.4pt; line-height: 1.2; }
  main { max-width: none; padding: 0; }
  header { margin-bottom: .4rem; padding-bottom: .25rem; border-bottom-width: 2px; }
  h1 { font-size: 12pt; margin: 0 0 .1rem; } h2 { font-size: 9.5pt; margin: .5rem 0 .2rem; }
  h3 { font-size: 8pt; margin: .3rem 0 .15rem; }
  .lead, .kicker { font-size: 7.6pt; }
  th, td { padding: .05rem .35rem; }
  table { margin: .15rem 0 .3rem; }
  figure { break-inside: avoid; padding: .2rem; border: 0; }
  figure svg.pic { max-height: 44mm; width: auto; }
  .pic-pinmoves svg { max-height: 40mm; width: auto; }
  #parts, #glance.swap-notes { display: none; }
  .notes { columns: 2; column-gap: 1.2rem; }
  #sources td, #sources th { font-size: 6.4pt; padding: 0 .3rem; }
  #sources td:nth-child(2), #sources th:nth-child(2) { display: none; }
  .src, .rule { font-size: 6.6pt; }
  figcaption { font-size: 7pt; margin-top: .1rem; }
  .pics { gap: .3rem; grid-template-columns: 1fr 1fr; }
  table.network { display: none; }
  #bench-sheet { break-after: auto; }
  ol.findings { columns: 2; column-gap: 1.2rem; }
  li.finding { break-inside: avoid; }
  .cautions ul { columns: 2; column-gap: 1.2rem; margin: 0; padding-left: 1rem; }
  #sources table { width: 100%; }
  ol.bench li { margin: .05rem 0; }
  ol.bench, ul.notes { padding-left: 1.3rem; margin: .1rem 0; }
  .sheet-top { gap: 0 1rem; flex-wrap: nowrap; }
  li.finding { padding: .05rem .35rem; margin: .1rem 0; border-left-width: 3px; font-size: 6.6pt; line-height: 1.2; }
  .cautions li, .notes li, figcaption { font-size: 6.6pt; line-height: 1.2; }
  .cautions h2 { margin: .2rem 0 .1rem; }
  li.finding p { margin: 0; }
  .cautions { padding: 0 .5rem .2rem; }
  .cautions li, .notes li { margin: 0; }
  table.sources td, table.sources th { font-size: 6.8pt; }
  footer { margin-top: .2rem; padding-top: .1rem; }
  #sources p.src { margin: 0; }
}
"""


def _q_cells(q: Quantity) -> str:
    si = "" if q.value is None else f' data-si="{q.value!r}"'
    key = f' data-key="{escape(q.key)}"' if q.key else ""
    return f"<th>{escape(q.label)}</th><td class=\"num\"{key}{si}>{escape(q.text)}</td>"


def _q_table(qs: list[Quantity], cls: str) -> str:
    if not qs:
        return ""
    rows = "".join(f"<tr>{_q_cells(q)}</tr>" for q in qs)
    return f'<table class="{cls}"><tbody>{rows}</tbody></table>'


def _table(t: Table, cls: str) -> str:
    head = "".join(f"<th>{escape(c.replace('_', ' '))}</th>" for c in t.columns)
    body = "".join("<tr>" + "".join(f"<td>{escape(v)}</td>" for v in row) + "</tr>" for row in t.rows)
    return f'<table class="{cls}"><thead><tr>{head}</tr></thead><tbody>{body}</tbody></table>'


def _pictures(rep: Report) -> str:
    figs = []
    if rep.picture_source is not None:
        from advisor.report.timing_svg import timing_svg_of

        result, edge = rep.picture_source
        names = (f"{rep.old_part} (fitted)", f"{rep.new_part} (new)") if rep.kind == "swap" else ("", "output")
        svg = timing_svg_of(result, edge=edge, names=names)
        figs.append(f'<figure class="pic-timing">{svg}<figcaption>Timing diagram from the engine\'s pulse schedule: '
                    f'{escape(rep.picture_caption)}</figcaption></figure>')
    elif rep.waves is not None:
        svg = diagrams.timing_svg(rep.waves)
        cap = rep.capture
        measured = cap is not None and rep.waves.measured is not None
        figs.append(f'<figure class="pic-timing">{svg}<figcaption>Pulse picture, drawn from the computed '
                    f'nominal timing{" beside the scope capture" if measured else ""}. {escape(rep.waves.note)}'
                    + (f' <span class="capture-caption">{escape(cap.caption)}</span>' if measured else "")
                    + f"</figcaption>{_capture_edges(cap) if cap is not None else ''}</figure>")
    for net in rep.networks:
        svg = diagrams.network_svg(net)
        rows = "".join(
            f'<tr><td>{escape(i.ref)}</td><td>{escape(i.role)}</td><td class="num" data-key="{escape(i.key)}" '
            f'data-si="{i.value!r}">{escape(i.text)}</td><td>{escape(i.code)}</td><td>{escape(", ".join(i.pins) or "—")}</td></tr>'
            for i in net.items)
        table = ('<table class="network"><thead><tr><th>ref</th><th>what</th><th>value</th><th>code</th>'
                 f'<th>connects to</th></tr></thead><tbody>{rows}</tbody></table>')
        where = f"{net.package} pin numbers, section 1" if net.package else "pin numbers not in the catalog"
        figs.append(f'<figure class="pic-network">{svg}<figcaption>Timing network to fit on the {escape(net.part)} '
                    f'({escape(where)}).</figcaption>{table}</figure>')
    if not figs:
        return ""
    return f'<section id="pictures"><h2>Pictures</h2><div class="pics">{"".join(figs)}</div></section>'


def _capture_edges(cap: CaptureView) -> str:
    """The captured edge times (s from the first trigger edge), one row per channel and edge."""
    if not cap.edges:
        return ""
    rows = "".join(
        f"<tr><th>{escape(label)}</th><td>"
        + " ".join(f'<span class="num" data-key="{escape(q.key)}" data-si="{q.value!r}">{escape(q.text)}</span>'
                   for q in times) + "</td></tr>"
        for label, times in cap.edges)
    return ('<details class="capture-edges"><summary>Captured edge times</summary>'
            f'<table class="capture-edges"><tbody>{rows}</tbody></table></details>')


def _findings(rep: Report) -> str:
    if not rep.findings:
        return '<section id="findings"><h2>What the checks found</h2><p>No rule fired for this circuit.</p></section>'
    out = ['<section id="findings"><h2>What the checks found</h2>']
    for sev in ("danger", "warning", "note"):
        items = [f for f in rep.findings if f.severity == sev]
        if not items:
            continue
        out.append(f'<h3>{escape(SEVERITY_TITLES[sev])} ({len(items)})</h3><ol class="findings">')
        for f in items:
            part = f" · {escape(f.part)}" if f.part else ""
            out.append(
                f'<li class="finding sev-{sev}" data-rule="{escape(f.rule)}" data-severity="{sev}">'
                f'<p><span class="tag">{sev}</span>{escape(f.message)}</p>'
                + (f'<p class="fix"><strong>Fix:</strong> {escape(f.fix)}</p>' if f.fix else "")
                + f'<p class="src">Source: {escape(f.source or "not stated")} <span class="rule">· rule {escape(f.rule)}{part}</span></p></li>')
        out.append("</ol>")
    out.append("</section>")
    return "".join(out)


def _job_fields(rep: Report) -> str:
    """Fill-in fields for the bench: date, board, reference designator, sign-off."""
    import datetime

    written = datetime.date.today().isoformat()
    cells = [("Report written", written), ("Date of rework", ""), ("Board", ""), ("Reference designator", ""),
             ("Reworked by", ""), ("Checked and signed off", "")]
    rows = "".join(f'<tr><th>{escape(k)}</th><td class="fill">{escape(v)}</td></tr>' for k, v in cells)
    return f'<table class="job"><tbody>{rows}</tbody></table>'


def _bench_sheet(rep: Report) -> str:
    """What the bench needs, in the order it is done: values, pin moves, steps, ties, trimmer."""
    out = ['<section id="bench-sheet"><h2>Bench sheet</h2><div class="sheet-top">']
    if rep.facts:
        out.append('<div><h3>Values</h3>' + _q_table(rep.facts, "facts") + "</div>")
    new_side = [qs for heading, qs in rep.parts if "replacement" in heading or "as fitted" in heading]
    if new_side and new_side[0]:
        out.append(f'<div><h3>Fit on the {escape(rep.new_part or "part")}</h3>'
                   + _q_table([q for q in new_side[0] if "timing" not in q.key], "part-values") + "</div>")
    if rep.pin_map is not None:
        out.append('<section id="pins"><h3>Pin moves</h3>' + _table(rep.pin_map, "pin-map") + "</section>")
    out.append("</div>")
    if rep.trimmer:
        out.append(f'<p class="trimmer"><strong>Trimmer:</strong> {escape(rep.trimmer)}</p>')
    if rep.pin_moves_svg:
        out.append(f'<figure class="pic-pinmoves">{rep.pin_moves_svg}</figure>')
    if rep.rework:
        out.append('<section id="bench"><h3>Steps, in order</h3><ol class="bench">' + "".join(
            f'<li data-action="{escape(a)}">' + (f'<span class="tag">{escape(a)}</span>' if a else "") + f"{escape(t)}</li>"
            for a, t in rep.rework) + "</ol></section>")
    if rep.pin_tables:
        out.append('<div class="sheet-top">' + "".join(
            f'<div><h3>{escape(heading)}</h3>{_table(t, "pin-extra")}</div>' for heading, t in rep.pin_tables) + "</div>")
    if rep.pin_notes:
        out.append('<ul class="notes">' + "".join(f"<li>{escape(n)}</li>" for n in rep.pin_notes) + "</ul>")
    out.append('<p class="short-caution">Work unpowered; mind capacitor polarity and the part\'s absolute '
               'maximum ratings; the cautions at the end of this report apply.</p>')
    out.append(_job_fields(rep))
    out.append("</section>")
    return "".join(out)


def render_html(rep: Report) -> str:
    """The whole page as text. A swap opens with its bench sheet (what is done at the
    bench, in order); findings, pictures, details and sources follow."""
    parts = [
        "<!DOCTYPE html>",
        '<html lang="en"><head><meta charset="utf-8">',
        '<meta name="viewport" content="width=device-width, initial-scale=1">',
        f"<title>{escape(rep.title)}</title><style>{_CSS}{_PRINT_CSS}</style></head><body><main>",
        f'<header><p class="kicker">retime · {escape(rep.kind)} report</p><h1>{escape(rep.title)}</h1>',
        f'<p class="lead">{escape(rep.lead)}</p>',
    ]
    if rep.verdict:
        words = CLASS_WORDS.get(rep.verdict, "")
        parts.append(f'<p>Outcome: <span class="verdict" data-class="{escape(rep.verdict)}">{escape(rep.verdict)}</span> '
                     f'{escape(words)}</p>')
    parts.append("</header>")
    if rep.kind == "swap":
        parts.append(_bench_sheet(rep))
        parts.append(_findings(rep))
        parts.append(_pictures(rep))
        if rep.notes:
            parts.append('<section id="glance" class="swap-notes"><h2>Notes</h2><ul class="notes">'
                         + "".join(f"<li>{escape(n)}</li>" for n in rep.notes) + "</ul></section>")
        if any(qs for _, qs in rep.parts):
            parts.append('<section id="parts"><h2>Both parts</h2><div class="sheet-top">')
            for heading, qs in rep.parts:
                if qs:
                    parts.append(f"<div><h3>{escape(heading)}</h3>" + _q_table(qs, "part-values") + "</div>")
            parts.append("</div></section>")
    else:
        if rep.facts or rep.notes:
            parts.append('<section id="glance"><h2>At a glance</h2>' + _q_table(rep.facts, "facts"))
            if rep.notes:
                parts.append('<ul class="notes">' + "".join(f"<li>{escape(n)}</li>" for n in rep.notes) + "</ul>")
            parts.append("</section>")
        if any(qs for _, qs in rep.parts):
            parts.append('<section id="parts"><h2>Parts and values</h2>')
            for heading, qs in rep.parts:
                if qs:
                    parts.append(f"<h3>{escape(heading)}</h3>" + _q_table(qs, "part-values"))
            parts.append("</section>")
        for heading, t in rep.extra_tables:
            parts.append(f'<section class="table"><h2>{escape(heading)}</h2>{_table(t, "extra")}</section>')
        parts.append(_pictures(rep))
        parts.append(_findings(rep))
        if rep.pin_map is not None or rep.pin_tables:
            parts.append('<section id="pins"><h2>Pin moves</h2>')
            if rep.pin_map is not None:
                parts.append(_table(rep.pin_map, "pin-map"))
            for heading, t in rep.pin_tables:
                parts.append(f"<h3>{escape(heading)}</h3>{_table(t, 'pin-extra')}")
            if rep.pin_notes:
                parts.append('<ul class="notes">' + "".join(f"<li>{escape(n)}</li>" for n in rep.pin_notes) + "</ul>")
            parts.append("</section>")
        if rep.rework:
            parts.append('<section id="bench"><h2>Bench steps</h2><ol class="bench">' + "".join(
                f'<li data-action="{escape(a)}">' + (f'<span class="tag">{escape(a)}</span>' if a else "") + f"{escape(t)}</li>"
                for a, t in rep.rework) + "</ol></section>")
    parts.append('<section id="cautions" class="cautions"><h2>Take care</h2><ul>'
                 + "".join(f"<li>{escape(c)}</li>" for c in rep.cautions) + "</ul></section>")
    if rep.sources:
        rows = "".join(
            f'<tr><td>{escape(s.family)}</td><td>{escape(s.title)}</td><td>{escape(s.document)}</td>'
            f'<td>{escape(s.kind)}</td><td>{"cited here" if s.cited else ""}</td></tr>' for s in rep.sources)
        parts.append('<section id="sources"><h2>Where the numbers come from</h2><table class="sources"><thead><tr>'
                     '<th>family</th><th>title</th><th>document</th><th>kind</th><th></th></tr></thead>'
                     f"<tbody>{rows}</tbody></table><p class=\"src\">Values marked memory are recalled, not "
                     "confirmed by a published source: treat them as unverified.</p></section>")
    parts.append(f"<footer>Written by retime {escape(__version__)} from the computed result. Times and values are "
                 "nominal unless marked min or max.</footer></main></body></html>")
    return "\n".join(p for p in parts if p)
