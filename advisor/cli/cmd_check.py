"""`retime check PART [circuit options]`: timing of an existing circuit."""

from __future__ import annotations

import argparse
import sys

NAME = "check"
HELP = "timing of an existing circuit: band, adjustment range, target, trigger verdict, findings"
DESCRIPTION = (
    "Compute the pulse width (one-shots, 555 monostables) or the high/low times, period and duty "
    "(555 and 4047 astables) of a circuit with the part's published law, with the worst-case band "
    "from component tolerances and the makers' constants, the range over a variable resistor's "
    "travel, a target's reachability, calibration from a measured time, and what a trigger of a "
    "given period does. Tolerances default to R 5 % and C 10 % and are shown when assumed."
)


def register(p: argparse.ArgumentParser) -> None:
    from advisor.cli.options import add_circuit_options, add_fail_on_option, add_new_vcc_option, add_report_option

    p.add_argument("part", metavar="PART", help="family id or part number, e.g. NE555, SN74HC221N")
    add_circuit_options(p)
    add_new_vcc_option(p)
    add_fail_on_option(p)
    p.add_argument("--range", metavar="TMIN..TMAX", help="acceptance window for the width (or period); adds a Monte Carlo share inside it")
    p.add_argument("--monte-carlo", metavar="N", type=int, help="run a Monte Carlo of N samples (numpy)")
    add_report_option(p)
    p.add_argument("--no-picture", action="store_true", help="leave the timing picture out of the text output")


def compute(args: argparse.Namespace):
    """The engine's answer for these arguments (the Python API calls it too)."""
    from advisor.cli.options import circuit_from_args, new_vcc_from_args
    from advisor.cli.output import catalog_for
    from advisor.errors import InputError
    from advisor.checking import check_circuit

    catalog = catalog_for(args)
    family = catalog.resolve(args.part)
    circuit = circuit_from_args(args, family.id)
    new_vcc = new_vcc_from_args(args)
    if args.monte_carlo is not None and not 100 <= args.monte_carlo <= 10_000_000:
        raise InputError("--monte-carlo: give between 100 and 10 000 000 samples", got=args.monte_carlo)
    result = check_circuit(family, circuit, new_vcc=new_vcc, samples=args.monte_carlo)
    from advisor.overrides import note_overrides

    return note_overrides(result, catalog)


def run(args: argparse.Namespace) -> int:
    from advisor.cli.options import fail_on_status, write_report_if_asked
    from advisor.cli.output import emit_json

    result = compute(args)
    write_report_if_asked(args, result, "check")
    if args.json:
        emit_json(result.to_json())
    else:
        j = result.to_json()
        text = render_text(j)
        if not args.no_picture:
            from advisor.picture import family_edge, render_text as picture, terminal_columns, under_numbers

            from advisor.cli.output import catalog_for

            edge = family_edge(catalog_for(args).get(j["part"]))
            text = under_numbers(text, picture(j, terminal_columns(), indent=2, edge=edge), "findings")
        sys.stdout.write(text)
    return fail_on_status(args, result)


# ----------------------------------------------------------------------------- text


def _t(v) -> str:
    from advisor.values import format_eng

    return format_eng(v, "s") if v is not None else "—"


def _pct(v: float) -> str:
    return f"{v * 100:.3g} %"


def timing_lines(timing: dict, mode: str) -> list[tuple[str, str]]:
    """(label, text) rows for a timing object {nominal, min, max}."""
    from advisor.values import format_eng

    n, lo, hi = timing["nominal"], timing["min"], timing["max"]
    if mode == "mono":
        return [("width", f"{_t(n['width'])}   band {_t(lo['width'])} … {_t(hi['width'])}")]
    return [
        ("frequency", f"{format_eng(n['frequency'], 'Hz')}   band {format_eng(lo['frequency'], 'Hz')} … {format_eng(hi['frequency'], 'Hz')}"),
        ("period", f"{_t(n['period'])}   band {_t(lo['period'])} … {_t(hi['period'])}"),
        ("high / low", f"{_t(n['high'])} / {_t(n['low'])}   duty {_pct(n['duty'])} (band {_pct(lo['duty'])} … {_pct(hi['duty'])})"),
    ]


def network_text(values: dict, mode: str) -> str:
    from advisor.values import format_eng

    parts = []
    if values.get("ra") is not None:
        ra = f"RA {format_eng(values['ra'], 'Ω')}"
        rb = f"RB {format_eng(values['rb'], 'Ω')}"
        if values.get("pot"):
            trim = (f" + trimmer {format_eng(values['pot'], 'Ω')}"
                    + (f" at {_pct(values['pot_setting'])}" if values.get("pot_setting") is not None else ""))
            if values.get("pot_in") == "rb":
                rb += trim + " (trimmer in RB)"
            else:
                ra += trim + " (trimmer in RA)"
        parts += [ra, rb]
    elif values.get("r") is not None:
        r = f"R {format_eng(values['r'], 'Ω')}" + (" (internal)" if values.get("r_internal") else "")
        if values.get("pot"):
            r += f" + pot {format_eng(values['pot'], 'Ω')}" + (f" at {_pct(values['pot_setting'])}" if values.get("pot_setting") is not None else "")
        parts.append(r)
    parts.append(f"C {format_eng(values['c'], 'F')}")
    if values.get("cont") is not None:
        parts.append(f"CONT driven to {format_eng(values['cont'], 'V')}")
    return ",  ".join(parts)


def counter_text(counter: dict, mode: str) -> str:
    """A counter timer's divide ratio and oscillator (facts.counter, advisor.timing.validity)."""
    from advisor.values import format_eng

    osc = counter.get("oscillator") or {}
    f = osc.get("frequency")
    where = f"oscillator {format_eng(f, 'Hz')}" if f else "oscillator"
    n = counter.get("divide")
    if n is None:
        choices = ", ".join(str(x) for x in counter.get("divide_by") or [])
        return f"{where}; no --divide given, so the times below are the oscillator's (outputs: ÷{choices})"
    if mode == "mono":
        return f"{where} ÷{n}; the output first changes {counter.get('delay_fraction', 0.5):g} × {n} periods after reset"
    return f"{where} ÷{n}"


def tolerance_text(tol: dict, makers: list | None = None) -> str:
    """The component tolerances, and what else the band holds: the part-to-part spread of
    each maker's formula in it, and (more than one) the makers' different constants."""
    d = tol.get("defaulted", {})
    r = f"R ±{_pct(tol['r_tol'])}" + (" (assumed)" if d.get("r_tol") else "")
    c = f"C ±{_pct(tol['c_tol'])}" + (" (assumed)" if d.get("c_tol") else "")
    n = len([m for m in makers or [] if isinstance(m, dict)])
    also = "the makers' constants and their part-to-part spread" if n > 1 else "the part-to-part spread"
    return f"{r}, {c}; band also holds {also}"


def findings_lines(findings: list[dict]) -> list[str]:
    mark = {"danger": "!!", "warning": "! ", "note": "· "}
    out = []
    for f in findings:
        out.append(f"  {mark.get(f['severity'], '  ')} {f['severity']:<7} {f['rule']}: {f['message']}")
        if f.get("fix"):
            out.append(f"             fix: {f['fix']}")
        if f.get("source"):
            out.append(f"             source: {f['source']}")
    return out


def maker_text(j: dict) -> str:
    """Whose constant the result uses: "Fairchild (part-number prefix)" or the makers the band spans."""
    labels = list(dict.fromkeys(m.get("label") or m.get("source") for m in j.get("makers") or []))
    if j.get("maker"):
        return f"{j['maker']} constant ({j['maker_basis']})"
    if len(labels) > 1:
        return f"unknown: the band spans {', '.join(labels)}"
    return j.get("maker_basis") or "unknown"


def render_text(j: dict) -> str:
    """Compact text for the bench (reporter; the engine never prints)."""
    from advisor.values import format_eng

    mode = j["mode"]
    kind = "monostable" if mode == "mono" else "astable"
    rows: list[tuple[str, str]] = [
        ("network", network_text(j["values"], mode)),
        ("supply", format_eng(j["values"]["vcc"], "V")),
        ("tolerance", tolerance_text(j["tolerances"], j.get("makers"))),
    ]
    if j.get("maker_basis"):
        rows.append(("maker", maker_text(j)))
    counter = (j.get("facts") or {}).get("counter")
    if counter:
        rows.append(("counter", counter_text(counter, mode)))
    rows += timing_lines(j["timing"], mode)
    cal = j.get("calibration")
    if cal:
        rows.append(("calibrated", f"×{cal['factor']:.4f} from the measured {cal['quantity']} {_t(cal['measured'])} "
                                   f"(law gives {_t(cal['predicted'])}); all times scaled"))
    adj = j.get("adjust")
    if adj:
        key = "width" if mode == "mono" else "period"
        rows.append(("adjust", f"{key} {_t(adj['min'][key])} (pot at 0) … {_t(adj['max'][key])} (pot at full)"))
    tgt = j.get("target")
    if tgt:
        q = tgt["quantity"]
        val = format_eng(tgt["value"], "Hz") if q == "frequency" else _t(tgt["value"])
        if tgt["reachable"]:
            how = f"reachable at {_pct(tgt['setting'])} of the travel" if tgt.get("setting") is not None else "inside the band"
            if tgt.get("reachable_worst_case") is False:
                how += "; not on every board within tolerance"
        else:
            how = "NOT reachable" + (" over the pot's travel" if adj else f" (nominal is {tgt['error'] * 100:+.2f} % off)")
        rows.append(("target", f"{q} {val}: {how}"))
    trig = j.get("trigger")
    if trig:
        from advisor.presentation import trigger_verdict

        verdict = trigger_verdict(trig, short=True)
        if trig.get("divide_by") == 1:
            verdict += f" (duty {_pct(trig['duty'])})"
        elif trig.get("divide_by") and trig.get("output_period"):
            verdict += f" (output period {_t(trig['output_period'])})"
        if trig.get("divide_by_range"):
            from advisor.presentation import every_nth

            a, b = trig["divide_by_range"]
            verdict += f"; {every_nth(a)} to {every_nth(b)} within tolerance"
        rows.append(("trigger", f"every {_t(trig['period'])}: {verdict}"))
    dist = j.get("distribution")
    if dist:
        q = dist["quantity"]
        f = (lambda v: format_eng(v, "Hz")) if q == "frequency" else _t
        txt = f"{dist['samples']} samples: median {f(dist['median'])}, 99.8 % within {f(dist['p001'])} … {f(dist['p999'])}"
        if dist.get("share_in_window") is not None:
            txt += f"; {_pct(dist['share_in_window'])} inside {f(dist['window']['min'])} … {f(dist['window']['max'])}"
        rows.append(("spread", txt))
    for a in j.get("assumptions", []):
        rows.append(("assumed", a))
    width = max(len(k) for k, _ in rows)
    from advisor.presentation import part_words

    lines = [f"{part_words(j)} {kind}  (law {j['law']})"]
    lines += [f"  {k:<{width}}  {v}" for k, v in rows]
    if j["findings"]:
        lines.append("findings")
        lines += findings_lines(j["findings"])
    else:
        lines.append("findings: none")
    return "\n".join(lines) + "\n"
