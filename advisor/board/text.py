"""Terminal text for a board plan (reporter only: it renders ``BoardPlan.to_json()``)."""

from __future__ import annotations

from advisor.values import format_eng

_MARK = {"danger": "!!", "warning": "! ", "note": "· "}


def _r(v) -> str:
    return format_eng(v, "Ω") if v is not None else "?"


def network_text(t: dict) -> str:
    parts = t.get("parts", {})

    def refs(role: str) -> str:
        r = parts.get(role) or []
        return "+".join(r) + " " if r else ""

    out = []
    if t.get("mode") == "astable":
        out.append(f"RA {refs('ra')}{_r(t.get('ra'))}")
        rb = f"RB {refs('rb')}{_r(t.get('rb'))}"
        if t.get("pot"):
            rb += f" + trimmer {refs('pot')}{_r(t['pot'])}"
        out.append(rb)
    elif t.get("internal_r"):
        out.append("R internal")
    elif t.get("r") is not None or t.get("pot"):
        r = f"R {refs('r')}{_r(t.get('r'))}"
        if t.get("pot"):
            r += f" + trimmer {refs('pot')}{_r(t['pot'])}"
        out.append(r)
    out.append(f"C {refs('c')}{format_eng(t['c'], 'F') if t.get('c') is not None else '?'}")
    return ", ".join(out)


def trigger_text(t: dict) -> str:
    trig = t.get("trigger")
    if t.get("mode") == "astable":
        return "free-running (astable)"
    if not trig:
        return "no driven trigger input"
    src = trig.get("source") or "?"
    if trig.get("external"):
        return f"{trig['input']} ({trig['edge']}) from connector {src}"
    supply = f" at {trig['source_supply']:g} V" if trig.get("source_supply") is not None else ""
    via = f" via {trig['via']}" if trig.get("via") else ""
    return f"{trig['input']} ({trig['edge']}) from {src} {trig.get('source_part') or ''}{supply}{via}".replace("  ", " ")


def _timing(swap: dict) -> str:
    old, new = swap["old"]["timing"]["nominal"], swap["new"]["timing"]["nominal"]
    if "width" in old and old.get("width") is not None:
        return f"width {format_eng(old['width'], 's')} → {format_eng(new.get('width'), 's')}"
    return f"frequency {format_eng(old['frequency'], 'Hz')} → {format_eng(new.get('frequency'), 'Hz')}"


def render_board(j: dict) -> str:
    nv = f"; new supply {j['new_vcc']:g} V" if j.get("new_vcc") is not None else "; no new supply given (--new-vcc)"
    lines = [f"Board {j['file']}  ({j['sheets']} sheet{'s' if j['sheets'] != 1 else ''}, {len(j['nets'])} nets{nv})", ""]
    lines.append("Timers and one-shots")
    if not j["timers"]:
        lines.append("  none found")
    for t in j["timers"]:
        label = t["ref"] if t.get("channel", 1) == 1 and not t["ref"].endswith(")") else t["ref"]
        ch = f" ch{t['channel']}" if t["channel"] != 1 or any(
            x["ref"] == t["ref"] and x["channel"] != 1 for x in j["timers"]) else ""
        supply = f"{t['vcc_net']} {t['vcc']:g} V" if t.get("vcc") is not None else f"{t.get('vcc_net')} ? V"
        lines.append(f"  {label}{ch:<4} {t['part']} ({t['family']}, {t['mode'] or '?'})  {supply}  sheet {t['where']['sheet']}")
        lines.append(f"        network: {network_text(t)}")
        lines.append(f"        trigger: {trigger_text(t)}")
        states = [f"{k} {v['state']}" for k, v in t.get("inputs", {}).items()
                  if not (t.get("trigger") and k == t["trigger"].get("input"))]
        if t.get("cont"):
            c = t["cont"]
            states.append("CONT " + (f"capacitor {format_eng(c['capacitance'], 'F')}" if c.get("capacitance") else c["state"]))
        if states:
            lines.append(f"        inputs:  {', '.join(states)}")
    lines.append("")
    lines.append(f"Plan{' at ' + format(j['new_vcc'], 'g') + ' V' if j.get('new_vcc') is not None else ''}")
    for p in j["plan"]:
        if p["swap"] is None:
            lines.append(f"  {p['label']}: {p['note'] or 'no plan'}")
            continue
        sw = p["swap"]
        head = f"  {p['label']}: {p['old']} → {p['new']}  [{p['class']}]  {_timing(sw)}"
        lines.append(head)
        chk = (p.get("check") or {}).get("findings") or []
        worst = [f for f in chk if f["severity"] in ("danger", "warning")]
        if worst:
            lines.append(f"      today: {len(worst)} warning(s) on {p['old']}, e.g. {worst[0]['message']}")
        for f in p["board_findings"]:
            lines.append(f"      {_MARK.get(f['severity'], '  ')} {f['severity']} {f['rule']}: {f['message']}")
        new_findings = [f for f in sw.get("findings", []) if f["severity"] in ("danger", "warning") and f.get("part") == p["new"]]
        for f in new_findings[:3]:
            lines.append(f"      {_MARK.get(f['severity'], '  ')} {f['severity']} {f['rule']}: {f['message']}")
        if p.get("note"):
            lines.append(f"      note: {p['note']}")
        alts = [a["family"] for a in p.get("alternates", [])[1:]]
        if alts:
            lines.append(f"      next best: {', '.join(alts)}")
    d = j["bom_delta"]
    lines += ["", "BOM delta"]
    for r in d["replace"]:
        lines.append(f"  replace {r['ref']}: {r['old']} → {r['new']} ({r['class']})")
    for c in d["change"]:
        lines.append(f"  change  {c['text']}")
    for a in d["add"]:
        lines.append(f"  add     {a['text']} at {a['for']}")
    for b in d["buy"]:
        lines.append(f"  buy     {b['qty']} × {b['part']}  ({', '.join(b['refs'])})")
    if not any(d.values()):
        lines.append("  nothing to change")
    lines += ["", "Unresolved" if j["unresolved"] else "Unresolved: none"]
    for u in j["unresolved"]:
        where = f"{u['file']}, sheet {u['sheet']}" + (f", {u['ref']}" if u.get("ref") else "")
        lines.append(f"  {where}: {u['reason']}")
    for a in j.get("assumptions") or []:
        lines.append(f"assumed: {a}")
    lines += ["", "Check every change against the makers' current datasheets before power-up; "
                  "polarised capacitors fitted backwards can fail violently."]
    return "\n".join(lines) + "\n"
