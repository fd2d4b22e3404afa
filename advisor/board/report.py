"""The board plan as a shareable report (Markdown or HTML), reusing the swap report per timer.

The board part (timers found, plan, BOM delta, unresolved) is rendered here; each
planned timer's own section is the swap report of :mod:`advisor.report` for its
swap result, so the pictures and tables are the ones ``retime swap --report`` gives.
"""

from __future__ import annotations

import html
import re
from pathlib import Path

from advisor.board.text import network_text, trigger_text


def _md_escape(text: str) -> str:
    return re.sub(r"([|\\`*_\[\]<>])", r"\\\1", str(text))


def _rows(j: dict) -> tuple[list[str], list[list[str]]]:
    head = ["Ref", "Part", "Supply", "Network", "Trigger", "Plan", "Class"]
    plan = {(p["ref"], p["channel"]): p for p in j["plan"]}
    rows = []
    for t in j["timers"]:
        p = plan.get((t["ref"], t["channel"]), {})
        rows.append([f"{t['ref']}" + (f" ch{t['channel']}" if t["channel"] != 1 else ""), f"{t['part']} ({t['family']})",
                     f"{t['vcc_net']} {t['vcc']:g} V" if t.get("vcc") is not None else str(t.get("vcc_net")),
                     network_text(t), trigger_text(t), p.get("new") or "—", p.get("class") or "—"])
    return head, rows


def _delta_lines(j: dict) -> list[str]:
    d = j["bom_delta"]
    out = [f"replace {r['ref']}: {r['old']} → {r['new']} ({r['class']})" for r in d["replace"]]
    out += [f"change {c['text']}" for c in d["change"]]
    out += [f"add {a['text']} at {a['for']}" for a in d["add"]]
    out += [f"buy {b['qty']} × {b['part']} ({', '.join(b['refs'])})" for b in d["buy"]]
    return out or ["nothing to change"]


def _unresolved(j: dict) -> list[str]:
    return [f"{u['file']}, sheet {u['sheet']}" + (f", {u['ref']}" if u.get("ref") else "") + f": {u['reason']}"
            for u in j["unresolved"]]


def _findings(j: dict) -> list[str]:
    return [f"{p['label']}: {f['severity']} {f['rule']}: {f['message']}" for p in j["plan"] for f in p["board_findings"]]


CAUTION = ("Check every change against the makers' current datasheets before power-up; polarised capacitors "
           "fitted backwards can fail violently.")


def render_markdown(j: dict, catalog=None) -> str:
    from advisor.report import render_text

    head, rows = _rows(j)
    title = f"Board plan: {j['file']}" + (f" → {j['new_vcc']:g} V" if j.get("new_vcc") is not None else "")
    out = [f"# {_md_escape(title)}", "", f"{j['sheets']} sheet(s), {len(j['nets'])} nets.", "", "## Timers and one-shots", "",
           "| " + " | ".join(head) + " |", "|" + "---|" * len(head)]
    out += ["| " + " | ".join(_md_escape(c) for c in r) + " |" for r in rows]
    out += ["", "## Board findings", ""] + [f"- {_md_escape(x)}" for x in _findings(j) or ["none"]]
    out += ["", "## BOM delta", ""] + [f"- {_md_escape(x)}" for x in _delta_lines(j)]
    out += ["", "## Unresolved", ""] + [f"- {_md_escape(x)}" for x in _unresolved(j) or ["none"]]
    if j.get("assumptions"):
        out += ["", "## Assumed", ""] + [f"- {_md_escape(str(x))}" for x in j["assumptions"]]
    out += ["", f"> {CAUTION}", ""]
    for p in j["plan"]:
        if p["swap"] is None:
            continue
        sub = render_text(p["swap"], "swap", "markdown", catalog)
        sub = re.sub(r"^(#+) ", lambda m: "#" + m.group(1) + " ", sub, flags=re.M)
        out += [f"## {_md_escape(p['label'])}: {_md_escape(p['old'])} → {_md_escape(p['new'])}", "", sub, ""]
    return "\n".join(out)


def render_html(j: dict, catalog=None) -> str:
    from advisor.report import render_text

    e = html.escape
    head, rows = _rows(j)
    title = f"Board plan: {j['file']}" + (f" → {j['new_vcc']:g} V" if j.get("new_vcc") is not None else "")
    sections, css = [], ""
    for p in j["plan"]:
        if p["swap"] is None:
            continue
        page = render_text(p["swap"], "swap", "html", catalog)
        if not css:
            m = re.search(r"<style>(.*?)</style>", page, re.S)
            css = m.group(1) if m else ""
        m = re.search(r"<main>(.*)</main>", page, re.S)
        sections.append(f"<section class=\"board-timer\"><h2>{e(p['label'])}: {e(p['old'])} → {e(p['new'])}</h2>"
                        f"{m.group(1) if m else ''}</section>")

    def ul(items: list[str]) -> str:
        return "<ul>" + "".join(f"<li>{e(x)}</li>" for x in items) + "</ul>"

    table = ("<table><thead><tr>" + "".join(f"<th>{e(h)}</th>" for h in head) + "</tr></thead><tbody>"
             + "".join("<tr>" + "".join(f"<td>{e(c)}</td>" for c in r) + "</tr>" for r in rows) + "</tbody></table>")
    return ("<!doctype html><html lang=\"en\"><head><meta charset=\"utf-8\">"
            f"<title>{e(title)}</title><style>{css}</style></head><body><main>"
            f"<header><p class=\"kicker\">retime · board report</p><h1>{e(title)}</h1>"
            f"<p>{j['sheets']} sheet(s), {len(j['nets'])} nets.</p></header>"
            f"<h2>Timers and one-shots</h2>{table}<h2>Board findings</h2>{ul(_findings(j) or ['none'])}"
            f"<h2>BOM delta</h2>{ul(_delta_lines(j))}<h2>Unresolved</h2>{ul(_unresolved(j) or ['none'])}"
            + (f"<h2>Assumed</h2>{ul([str(a) for a in j['assumptions']])}" if j.get("assumptions") else "") +
            f"<p class=\"caution\">{e(CAUTION)}</p>" + "".join(sections) + "</main></body></html>")


def write_board_report(j: dict, path: str, catalog=None) -> Path:
    """Write the report (format by extension) with the one atomic writer
    (:func:`advisor.files.atomic_write`: no half-written or stray file, a device or
    folder target refused); returns the path written."""
    from advisor.files import atomic_write
    from advisor.report import report_format

    fmt = report_format(path)
    text = render_html(j, catalog) if fmt == "html" else render_markdown(j, catalog)
    return atomic_write(path, text.encode("utf-8"), what="--report")
