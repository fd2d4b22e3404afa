"""`retime design PART --width T / --period T / --freq F [--duty D] [--range TMIN..TMAX]`."""

from __future__ import annotations

import argparse
import sys

NAME = "design"
HELP = "standard-value R (and C) for a target width, period or frequency, fixed or with a trimmer"
DESCRIPTION = (
    "Choose standard-value timing components for a part: a width (one-shots, 555 monostables), "
    "a period or frequency with an optional duty (astables), or an adjustment window that a fixed "
    "resistor plus a trimmer must cover. The existing capacitor (--c) is kept when the part's "
    "resistor limits allow; each candidate shows its error and worst-case band."
)


def register(p: argparse.ArgumentParser) -> None:
    from advisor.cli.options import add_circuit_options, add_fail_on_option

    p.add_argument("part", metavar="PART", help="family id or part number")
    t = p.add_argument_group("target (give one)")
    t.add_argument("--width", dest="target_width", metavar="T", help="wanted pulse width (astable: high time)")
    t.add_argument("--period", dest="target_period", metavar="T", help="wanted period (astable)")
    t.add_argument("--freq", dest="target_freq", metavar="F", help="wanted frequency (astable)")
    t.add_argument("--duty", metavar="D", help="wanted duty (high fraction), e.g. 0.6 or 60%%")
    t.add_argument("--range", metavar="TMIN..TMAX", help="adjustment window: a fixed resistor plus a trimmer must cover it")
    add_circuit_options(p, targets=False)
    from advisor.cli.options import add_series_options

    add_series_options(p)
    add_fail_on_option(p)
    p.add_argument("--new-c", action="store_true", help="do not try to keep the existing capacitor")
    p.add_argument("--limit", type=int, default=5, help="candidates shown (default 5)")


def compute(args: argparse.Namespace):
    """The engine's answer for these arguments (the Python API calls it too)."""
    from advisor.cli.options import circuit_from_args, series_from_args, with_series
    from advisor.cli.output import catalog_for
    from advisor.timing import design

    catalog = catalog_for(args)
    family = catalog.resolve(args.part)
    series, c_series = series_from_args(args)
    circuit = with_series(args, circuit_from_args(args, family.id))
    result = design(family, circuit, series=series, c_series=c_series, keep_c=not args.new_c, limit=max(1, args.limit))
    from advisor.overrides import note_overrides

    return note_overrides(result, catalog)


def run(args: argparse.Namespace) -> int:
    from advisor.cli.options import fail_on_status
    from advisor.cli.output import emit_json

    result = compute(args)
    if args.json:
        emit_json(result.to_json())
    else:
        sys.stdout.write(render_text(result.to_json()))
    return fail_on_status(args, result)


def _network(values: dict) -> str:
    from advisor.values import format_code

    parts = []
    if values.get("ra") is not None:
        parts += [f"RA {format_code(values['ra'])}", f"RB {format_code(values['rb'])}"]
    elif values.get("r") is not None:
        parts.append(f"R {format_code(values['r'])}")
    if values.get("pot"):
        where = f" in {values['pot_in'].upper()}" if values.get("pot_in") else ""
        parts.append(f"+ trimmer {format_code(values['pot'])}{where}")
    parts.append(f"C {format_code(values['c'], 'capacitance')}")
    if values.get("divide") is not None:  # a counter timer: the output's divide ratio
        parts.append(f"÷{values['divide']}")
    return "  ".join(parts)


def render_text(j: dict) -> str:
    from advisor.cli.cmd_check import _pct, _t, findings_lines
    from advisor.values import format_eng

    tgt = j["target"]
    unit = "Hz" if tgt["kind"] == "freq" else "s"
    from advisor.presentation import part_words

    head = f"{part_words(j)} {'monostable' if j['mode'] == 'mono' else 'astable'}: {tgt['kind']} {format_eng(tgt['value'], unit)}"
    if tgt.get("duty") is not None:
        head += f", duty {_pct(tgt['duty'])}"
    if tgt.get("range"):
        head += f", window {_t(tgt['range']['min'])} … {_t(tgt['range']['max'])}"
    lines = [head + f"  ({j['series']} resistors, {j.get('c_series') or 'E6'} capacitors)"]
    # The error is signed in the quantity the user gave (--freq: the frequency's error).
    key = ("width" if j["mode"] == "mono" else "frequency" if tgt["kind"] == "freq"
           else "period" if tgt["kind"] == "period" else "high")

    def show(v):
        return format_eng(v, "Hz", 4) if key == "frequency" else _t(v)

    for i, c in enumerate(j["candidates"], 1):
        n = c["timing"]["nominal"][key]
        lo, hi = sorted((c["timing"]["min"][key], c["timing"]["max"][key]))
        line = f"  {i}. {_network(c['values']):<34} {key} {show(n)} ({c['error'] * 100:+.2f} %), band {show(lo)} … {show(hi)}"
        if c.get("adjust"):
            a = c["adjust"]
            line += f"; trimmer spans {show(a['min'][key])} … {show(a['max'][key])}"
            if c.get("setting") is not None:
                line += f", target at {_pct(c['setting'])}"
        if c.get("duty_error") is not None:
            line += f"; duty {_pct(c['timing']['nominal']['duty'])}"
        if c.get("kept_c"):
            line += "  [existing C]"
        lines.append(line)
    for a in j.get("assumptions", []):
        lines.append(f"  assumed: {a}")
    tol = j.get("tolerances") or {}
    if tol:
        d = tol.get("defaulted", {})
        def basis(kind):
            if not d.get(f"{kind}_tol"):
                return ""
            return f" ({tol[kind + '_series']} tolerance)" if tol.get(f"{kind}_series") else " (assumed)"

        lines.append(f"  bands use R ±{_pct(tol['r_tol'])}{basis('r')}, "
                     f"C ±{_pct(tol['c_tol'])}{basis('c')} and the makers' constants")
    if j["findings"]:
        lines.append("findings (best candidate)")
        lines += findings_lines(j["findings"])
    return "\n".join(lines) + "\n"
