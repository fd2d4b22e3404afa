"""Compact text for people: one block per swap, one table per alternates list, the demo.

Reporters only: they read the results' ``to_json()`` dicts and never compute.
"""

from __future__ import annotations

from advisor.values import format_code, format_eng

_MARK = {"danger": "!!", "warning": "! ", "note": "· "}


def _t(v) -> str:
    return format_eng(v, "s", 3) if v is not None else "—"


def network(values: dict) -> str:
    parts = []
    if values.get("ra") is not None:
        parts.append(f"RA {format_code(values['ra'])}")
        parts.append(f"RB {format_code(values['rb'])}")
    elif values.get("r") is not None:
        parts.append(f"R {format_code(values['r'])}" + (" (internal)" if values.get("r_internal") else ""))
    if values.get("pot"):
        setting = values.get("pot_setting")
        where = f" in {values['pot_in'].upper()}" if values.get("pot_in") else ""
        parts.append(f"+ trimmer {format_code(values['pot'])}{where}" + (f" at {setting:.0%}" if setting is not None else ""))
    if values.get("c") is not None:
        parts.append(f"C {format_code(values['c'], 'capacitance')}")
    return " ".join(parts)


def timing_text(timing: dict, mode: str) -> str:
    n, lo, hi = timing["nominal"], timing["min"], timing["max"]
    if mode == "mono":
        return f"width {_t(n['width'])} ({_t(lo['width'])} … {_t(hi['width'])})"
    return (f"{format_eng(n['frequency'], 'Hz', 4)}, period {_t(n['period'])} ({_t(lo['period'])} … "
            f"{_t(hi['period'])}), duty {n['duty']:.1%}")


def _side_line(label: str, side: dict) -> str:
    status = f"  [{side['status']}]" if side.get("status") else ""
    return (f"  {label:<4} {side['family']:<10} @ {format_eng(side['vcc'], 'V', 3):<6} {network(side['values']):<24} "
            f"{timing_text(side['timing'], side['mode'])}{status}")


def _other_option(j: dict) -> str | None:
    other = (j.get("design") or {}).get("other_option")
    if not other:
        return None
    err = f" ({other['error']:+.1%})" if other.get("error") is not None else ""
    return f"  or   {network(other['values'])}{err}" + ("" if other.get("kept_c") else ", another capacitor")


def _kept(j: dict) -> str:
    k = j["kept"]
    text = f"{k['quantity']} {_t(k['value'])}"
    if k.get("duty") is not None:
        text += f", duty {k['duty']:.1%}"
    if j.get("calibration"):
        cal = j["calibration"]
        text += (f" (measured; {j['old']['family']} law gives {_t(cal['predicted'])}, "
                 f"calibration ×{cal['factor']:.3f})")
    else:
        text += f" (predicted for {j['old']['family']})"
    return text


def render_swap(j: dict, *, title: str | None = None, findings: bool = True) -> str:
    """One swap as a compact block."""
    from advisor.presentation import part_words

    lines = [title or f"{part_words(j['old'], 'family')} → {part_words(j['new'], 'family')}    class: {j['class']}"]
    if title:
        lines.append(f"  class: {j['class']}")
    lines.append(f"  keep {_kept(j)}")
    lines.append(_side_line("old", j["old"]))
    err = f"   ({j['error']:+.1%})" if j.get("error") is not None else ""
    lines.append(_side_line("new", j["new"]) + err)
    other = _other_option(j)
    if other:
        lines.append(other)
    for r in j["reasons"]:
        lines.append(f"  why  {r}")
    pm = j["pin_map"]
    pairs = ", ".join(f"{lk['old_pin']}→{lk['new_pin']}" + ("" if not lk["moved"] else "*")
                      for lk in sorted(pm["links"], key=lambda x: x["old_pin"]))
    moved = any(lk["moved"] for lk in pm["links"])
    lines.append(f"  pins {pm['old_package']} → {pm['new_package']}: {pairs}" + ("   (* moved)" if moved else "   (same pins)"))
    pol = pm["polarity"]
    if pol.get("edge"):
        from advisor.presentation import edge_route

        lines.append(f"  edge {edge_route(pol, pm)}")
    trig = j.get("trigger")
    if trig:
        from advisor.presentation import trigger_verdict

        lines.append(f"  trig every {_t(trig['period'])}: {trigger_verdict(trig, short=True)}")
    if j["class"] == "unsuitable":
        lines.append("  rework: none advised: this part cannot do the job as the circuit stands (see why)")
    else:
        lines.append("  rework")
        for s in j["rework"]:
            lines.append(f"    {s['n']:>2}. {s['detail']}")
    if findings:
        if j["findings"]:
            lines.append("  findings")
            for f in j["findings"]:
                lines.append(f"    {_MARK.get(f['severity'], '  ')} {f['severity']:<7} [{f.get('part') or '—'}] "
                             f"{f['rule']}: {f['message']}")
                if f.get("fix"):
                    lines.append(f"               fix: {f['fix']}")
        else:
            lines.append("  findings: none")
    for a in j.get("assumptions", []):
        lines.append(f"  assumed: {a}")
    return "\n".join(lines) + "\n"


def render_alternates(j: dict) -> str:
    """The ranked alternates as a table, with the rejected families after it."""
    old = j["old"]
    lines = [f"Alternates for {old['family']} @ {format_eng(j['new_vcc'], 'V', 3)}: keep "
             f"{j['kept']['quantity']} {_t(j['kept']['value'])}"]
    if not j["candidates"]:
        lines.append("  no catalog family can do this job")
    head = (f"  {'#':>2}  {'family':<11} {'status':<13} {'class':<19} {'error':>7}  {'values':<24} "
            f"{'steps':>5}  findings")
    lines.append(head)
    for i, c in enumerate(j["candidates"], 1):
        sc = c["severity_counts"]
        fnd = ", ".join(f"{n} {k}" for k, n in sc.items() if n) or "none"
        err = f"{c['error']:+.1%}" if c.get("error") is not None else "—"
        status = (c.get("status") or "—") + (" *" if c.get("in_stock") else "")
        lines.append(f"  {i:>2}  {c['family']:<11} {status:<13} {c['class']:<19} {err:>7}  {network(c['values']):<24} "
                     f"{c['rework_steps']:>5}  {fnd}")
        if c.get("rank_reason"):
            lines.append(f"      place: {c['rank_reason']}")
        if c.get("reasons"):
            lines.append(f"      why:   {c['reasons'][0]}")
        other = c.get("other_option")
        if other:
            lines.append(f"      or:    {network(other['values'])}" + (
                f" ({other['error']:+.1%})" if other.get("error") is not None else ""))
    if any(c.get("in_stock") for c in j["candidates"]):
        lines.append("  * in the stock list")
    if j.get("left_out_obsolete"):
        lines.append(f"  left out (obsolete; --include-obsolete lists them): {', '.join(j['left_out_obsolete'])}")
    if j.get("rejected"):
        lines.append("  not suitable:")
        for r in j["rejected"]:
            lines.append(f"      {r['family']}: {r['reason']}")
    for a in j.get("assumptions", []):
        lines.append(f"  assumed: {a}")
    return "\n".join(lines) + "\n"
