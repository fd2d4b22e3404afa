"""Inverse design: standard-value networks for a target width, period or frequency.

For each candidate capacitor (the existing one first when it can work) the ideal
resistance is solved from the law (every law here is affine in the timing
resistance, so two evaluations give it exactly), rounded to the neighbouring
values of the chosen IEC 60063 series inside the part's resistor limits, and
evaluated with its worst-case band. With an adjustment range (``--range``) or a
given variable resistor the network is a fixed resistor plus a variable one; the
fixed part never goes below the part's minimum timing resistance, and the ranges
are chosen so the travel covers the window on any board within tolerance when
the limits allow it.

Capacitors are taken from E6 unless another series is named (common practice: film
and C0G parts are stocked in E6/E12). A 555 astable's RA/RB pair is searched over
every RA of the series with the two RB values around the one its period needs
(:func:`astable_pairs`), so the answer is as close as the series allows; a 555 with
no discharge pin oscillates from one resistor (RA = 0, :func:`single_resistor_555`); variable resistors from the 1-2-5 sequence trimmers are sold in (common
practice).
"""

from __future__ import annotations

import math

from advisor import eseries
from advisor.circuit import Circuit, Target
from advisor.errors import InputError
from advisor.findings import Finding
from advisor.parts import Family
from advisor.timing.adjust import setting_for, target_quantity, travel_ends
from advisor.timing.analyse import network_values, tolerances
from advisor.timing.band import band
from advisor.timing.constants import limit
from advisor.timing.domain import check_domain
from advisor.timing.model import build, default_vcc, resolve_mode
from advisor.timing.result import Candidate, DesignResult
from advisor.timing.validity import network_facts
from advisor.values import format_eng

#: Trimmer values (Ω), 1-2-5 sequence (common practice).
POT_VALUES = tuple(m * 10.0 ** e for e in range(2, 7) for m in (1, 2, 5)) + (1e7,)
#: Where resistor limits are not published (common practice: 1 kΩ keeps discharge
#: currents sensible, 10 MΩ keeps leakage small against the timing current).
R_FLOOR, R_CEIL = 1e3, 1e7
#: Comfortable middle of the resistor range for choosing a new capacitor (common
#: practice; the NE555 accuracy figures hold for 1–100 kΩ, TI SLFS022).
R_COMFORT = 33e3


def _r_limits(family: Family, vcc: float) -> tuple[float, float]:
    rmin = limit(family.components.r_min, vcc, lowest=False)
    rmax = limit(family.components.r_max, vcc, lowest=True)
    lo = rmin.value if rmin is not None and rmin.value > 0 else R_FLOOR
    hi = rmax.value if rmax is not None else R_CEIL
    return lo, hi


def _c_limits(family: Family, vcc: float) -> tuple[float, float]:
    cmin = limit(family.components.c_min, vcc, lowest=False)
    cmax = limit(family.components.c_max, vcc, lowest=True)
    lo = max(cmin.value if cmin is not None else 0.0, 100e-12)
    lin = family.timing.c_linear_min
    if lin is not None:
        lo = max(lo, lin.value)
    hi = cmax.value if cmax is not None else 1e-3
    return lo, min(hi, 1e-3)


def _time_goal(mode: str, target: Target) -> tuple[str, float, tuple[float, float] | None]:
    """The time quantity to solve for, its value, and the window (s)."""
    if target.kind == "freq":
        return "period", 1.0 / target.value, target.range
    if target.kind == "period":
        return "period", target.value, target.range
    return ("width" if mode == "mono" else "high"), target.value, target.range


def _affine(evaluate, lo: float = 1e3, hi: float = 2e3) -> tuple[float, float]:
    """Slope and intercept of t(R) from two evaluations (the laws are affine in R)."""
    t1, t2 = evaluate(lo), evaluate(hi)
    m = (t2 - t1) / (hi - lo)
    return m, t1 - m * lo


def _solve(evaluate, t: float) -> float:
    m, b = _affine(evaluate)
    return (t - b) / m if m > 0 else math.inf


def design(
    family: Family, circuit: Circuit, *, series: str = "E24", keep_c: bool = True, limit: int = 5,
    good_enough: float | None = None, c_series: str = "E6",
) -> DesignResult:
    """Candidates (best first) for ``circuit.target`` on ``family``; see the module docstring.

    ``good_enough``: when the existing capacitor already gives a network within this
    relative error, other capacitors are not searched (a swap keeps C then anyway).
    """
    target = circuit.target
    if target is None:
        raise InputError("design needs a target: --width, --period or --freq (or --range)")
    series = eseries.series_name(series, "--series")
    c_series = eseries.series_name(c_series, "--c-series")
    if family.timing.law == "counter":
        if circuit.mode is None and target.kind == "width":
            circuit = circuit.with_(mode="mono")  # a counter timer's width is its single interval
        if circuit.divide is None:
            return _counter_design(family, circuit, series=series, keep_c=keep_c, limit=limit,
                                   good_enough=good_enough, c_series=c_series)
    if circuit.mode is None and target.kind in ("period", "freq") and family.function in ("timer-555", "monostable-astable"):
        circuit = circuit.with_(mode="astable")
    mode = resolve_mode(family, circuit)
    vcc = circuit.vcc if circuit.vcc is not None else default_vcc(family)
    assumptions = list(circuit.notes) + ([] if circuit.vcc is not None else [f"supply {vcc:g} V (not given)"])
    probe = build(family, circuit.with_(vcc=vcc), need_network=False)
    check_domain(probe, network=False)  # a supply the law cannot use: refused, not designed for
    target_quantity(probe, target)  # raises for a target the mode cannot have
    q, t_goal, window = _time_goal(mode, target)
    r_lo, r_hi = _r_limits(family, vcc)
    c_lo, c_hi = _c_limits(family, vcc)
    base = circuit.with_(vcc=vcc, r=None, ra=None, rb=None, measured=None, trigger=circuit.trigger)
    variable = window is not None or circuit.pot is not None

    findings: list[Finding] = []  # the rules judge each candidate (_candidate); none are made here
    astable555 = mode == "astable" and family.timing.law == "timer-555"

    cands: list[Candidate] = []
    kept = circuit.c if keep_c and circuit.c is not None else None
    # The resistors already on the board: with the existing C, the best pair keeping one of them
    # is offered too (a swap's fewest-changes answer changes one part when it can).
    present = {k: getattr(circuit, k) for k in ("ra", "rb") if getattr(circuit, k) is not None}

    def c_choices():
        if kept is not None:
            yield kept
            if good_enough is not None and any(
                    cd.kept_c and abs(cd.error) + 0.5 * abs(cd.duty_error or 0.0) <= good_enough for cd in cands):
                return  # the existing capacitor is good enough: no other capacitor is searched
        for c in _c_candidates(family, base, q, t_goal, c_lo, c_hi, r_lo, r_hi, astable555, c_series):
            if kept is None or abs(c / kept - 1) > 1e-9:
                yield c

    for c in c_choices():
        nets = _networks(family, base.with_(c=c), q, t_goal, window, series, r_lo, r_hi, astable555, variable,
                         present=present if c == kept else None)
        if not nets and c == kept:
            assumptions.append(f"the existing {format_eng(kept, 'F')} needs a resistance outside "
                               f"{format_eng(r_lo, 'Ω')}..{format_eng(r_hi, 'Ω')}: other capacitors proposed")
        for net in nets:
            cands.append(_candidate(family, base.with_(c=c, **net), target, c == kept))
        if len(cands) >= 4 * limit:
            break
    if not cands:
        raise InputError(
            f"no standard-value network for the {family.id} reaches {format_eng(t_goal, 's')} within "
            f"R {format_eng(r_lo, 'Ω')}..{format_eng(r_hi, 'Ω')} and C {format_eng(c_lo, 'F')}..{format_eng(c_hi, 'F')}",
            hint="try another part or a counter-based timer",
        )
    # The existing capacitor wins when its network is as good as the series allows
    # (error within the series' tolerance); otherwise the smallest error wins.
    step = eseries.tolerance(series)

    def score(cd: Candidate) -> tuple:
        err = abs(cd.error) + 0.5 * abs(cd.duty_error or 0.0)
        # A candidate a rule rejects (blocks: kept-values, e.g. below the part's minimum R) ranks last.
        rejected = any("kept-values" in f.blocks for f in cd.findings)
        return (rejected, not _covers(cd, window), err > step, not cd.kept_c, err)

    cands.sort(key=score)
    seen, unique = set(), []
    for cd in cands:
        key = tuple(sorted((k, v) for k, v in cd.values.items() if isinstance(v, float)))
        if key not in seen:
            seen.add(key)
            unique.append(cd)
    tjson = {"kind": target.kind, "value": target.value, "duty": target.duty}
    if window is not None:
        tjson["range"] = {"min": window[0], "max": window[1]}
    assumptions += [a for a in probe.assumptions if a not in assumptions and "part number names" in a]
    return DesignResult(family.id, mode, tjson, series, unique[:limit], findings, assumptions,
                        tolerances(circuit), maker=probe.maker, maker_basis=probe.maker_basis, c_series=c_series,
                        part_number=circuit.part_number)


def _counter_design(family: Family, circuit: Circuit, **kw) -> DesignResult:
    """A counter timer with no ``--divide``: design at every divide ratio the family publishes
    and say which one to use. Ranked: candidates no blocking rule rejects first (an oscillator
    above its formula's range is rejected by a rule), then within the series' tolerance, then
    the largest divide ratio (the smallest timing capacitor for the time: a film part rather
    than an electrolytic, and a shorter oscillator period to count; common practice), then
    the smallest error."""
    from advisor.timing.model import check_divide, divide_choices

    check_divide(family, circuit.divide)
    results, problems = [], []
    for n in divide_choices(family):
        try:
            results.append((n, design(family, circuit.with_(divide=n), **kw)))
        except InputError as exc:
            problems.append(exc)
    if not results:
        why = problems[-1].message if problems else "no divide ratio is published"
        raise InputError(f"{family.id}: no divide ratio it can select ({', '.join(map(str, divide_choices(family)))}) "
                         f"gives a network for this target: at the last one, {why}",
                         hint="a longer time needs a larger Ct or a second counter stage; a shorter one a faster part")
    step = eseries.tolerance(kw.get("series") or "E24")

    def rank(item):
        n, cd = item
        rejected = any("kept-values" in f.blocks for f in cd.findings)
        err = abs(cd.error) + 0.5 * abs(cd.duty_error or 0.0)
        return (rejected, err > step, -n, err)

    pool = sorted(((n, cd) for n, res in results for cd in res.candidates), key=rank)
    best_n = pool[0][0]
    first = dict(results)[best_n]
    limit = kw.get("limit", 5)
    cands = [cd for _, cd in pool][:limit]
    notes = list(first.assumptions) + [
        f"divide ratio {best_n} chosen (no --divide given): the largest of "
        f"{', '.join(str(n) for n in divide_choices(family))} whose network sits inside the part's limits and its "
        f"formula's range; give --divide N to design for another"]
    return DesignResult(first.part, first.mode, first.target, first.series, cands, first.findings, notes,
                        first.tolerances, maker=first.maker, maker_basis=first.maker_basis, c_series=first.c_series,
                        part_number=first.part_number)


def _covers(cd: Candidate, window) -> bool:
    return window is None or cd.setting is not None


def single_resistor_555(family: Family) -> bool:
    """A 555 without a DISCHARGE pin (the 5-pin MIC1555) oscillates from one resistor fed back
    from OUT to THR and TRG: in the 555 law that is RA = 0, RB = the resistor, each half period
    RB·C·ln(u/l) (a 50 % square wave at u = 2/3, l = 1/3). Source: Micrel MIC1555/1557
    M9999-052610-D (May 2010), Figure 3 (oscillator configuration); catalog/mic1555.yaml."""
    return family.timing.law == "timer-555" and family.has_discharge() is False


def _c_candidates(family, base, q, t_goal, c_lo, c_hi, r_lo, r_hi, astable555, c_series: str = "E6") -> list[float]:
    """Capacitors of ``c_series`` whose ideal resistance lies inside the limits, nearest R_COMFORT first."""
    out = []
    centre = min(max(R_COMFORT, r_lo * 3), r_hi / 3)
    one_r = astable555 and single_resistor_555(family)
    for c in eseries.values_between(c_series, c_lo, c_hi):
        model = build(family, base.with_(c=c, r=1e3, ra=1e3, rb=1e3), need_network=False)
        if one_r:
            r = _solve(lambda x: model.times(model.at(ra=0.0, rb=x))[q], t_goal)
        elif astable555:
            r = _solve(lambda x: model.times(model.at(ra=x / 10, rb=x))[q], t_goal)
        else:
            r = _solve(lambda x: model.times(model.at(r=x, rp=0.0))[q], t_goal)
        if r_lo <= r <= r_hi:
            out.append((abs(math.log(r / centre)), c))
    out.sort()
    return [c for _, c in out[:8]]


def _networks(family, circuit, q, t_goal, window, series, r_lo, r_hi, astable555, variable, present=None) -> list[dict]:
    """Resistor networks (dicts of Circuit fields) for one capacitor."""
    model = build(family, circuit.with_(r=1e3, ra=1e3, rb=1e3, pot=None, pot_setting=None), need_network=False)
    # One resistor, no RA, on a 555 without a discharge pin (single_resistor_555): RB alone.
    one_r = astable555 and single_resistor_555(family)
    if astable555 and not one_r:
        return _astable_networks(model, circuit, q, t_goal, window, series, r_lo, r_hi, variable, present)
    field, extra = ("rb", {"ra": 0.0}) if one_r else ("r", {})
    if one_r:
        model = model.with_params(ra=0.0)
        ev = lambda x: model.times(model.at(ra=0.0, rb=x, rp=0.0))[q]  # noqa: E731
    else:
        ev = lambda x: model.times(model.at(r=x, rp=0.0))[q]  # noqa: E731
    if not variable:
        ideal = _solve(ev, t_goal)
        if not r_lo <= ideal <= r_hi:
            return []
        vals = {eseries.next_down(series, ideal * 1.0000001), eseries.next_up(series, ideal * 0.9999999), eseries.nearest(series, ideal)}
        return [{field: v, **extra} for v in sorted(vals) if r_lo <= v <= r_hi]
    return _variable(ev, model, circuit, t_goal, window, series, r_lo, r_hi, field, extra or None)


def _variable(ev, model, circuit, t_goal, window, series, r_lo, r_hi, field_name, fixed_extra=None) -> list[dict]:
    """Fixed + variable resistor covering ``window`` (or centred on the goal with the given pot)."""
    lows, highs = band(model)
    nom = model.times()
    key = next(iter(k for k in ("width", "high", "period") if k in nom))
    up, dn = highs[key] / nom[key], lows[key] / nom[key]
    extra = fixed_extra or {}
    if window is None:  # a given variable resistor: centre the goal on its travel
        pot = circuit.pot
        fixed_ideal = _solve(ev, t_goal) - pot / 2
        if not math.isfinite(fixed_ideal):
            return []  # this capacitor cannot make the time with a resistor here
        fixed = max(eseries.nearest(series, max(fixed_ideal, r_lo)), r_lo)
        fixed = eseries.next_up(series, fixed * 0.9999999) if fixed < r_lo else fixed
        return [{field_name: fixed, "pot": pot, "pot_setting": None, **extra}]
    out = []
    for worst in (True, False):
        a, b = (window[0] / up, window[1] / dn) if worst else window
        f_ideal, top = _solve(ev, a), _solve(ev, b)
        if f_ideal < r_lo or not math.isfinite(top):
            continue
        fixed = eseries.next_down(series, f_ideal * 1.0000001)
        if fixed < r_lo:
            fixed = eseries.next_up(series, r_lo * 0.9999999)
            if fixed > f_ideal:
                continue
        need = top - fixed
        pot = next((p for p in POT_VALUES if p >= need), None)
        if pot is None or fixed + pot > r_hi:
            continue
        out.append({field_name: fixed, "pot": pot, "pot_setting": None, **extra})
        if worst:
            break
    return out


def _astable_networks(model, circuit, q, t_goal, window, series, r_lo, r_hi, variable, present=None) -> list[dict]:
    """RA/RB pairs for a 555 astable: RA from the duty (or about RB/10), RB from the period."""
    c = model.params["c"]
    u, l = model.params["upper"], model.params["lower"]
    a = math.log((1 - l) / (1 - u))
    b = math.log(u / l)
    duty = circuit.target.duty if circuit.target is not None else None
    if q == "high":  # a width target on an astable: the high time, duty from --duty or ~52 %
        period = t_goal / (duty or 0.524)
    else:
        period = t_goal
    spread = model.params.get("spread", 1.0) * model.params.get("kf", 1.0) * model.params.get("fit", 1.0)
    period /= spread
    if duty is not None and duty > 0.5:
        rb = (1 - duty) * period / (c * b)
        ra = duty * period / (c * a) - rb
    else:
        # No duty given (or unreachable): RA = RB/10, i.e. about 52 % duty (common practice).
        rb = period / (c * (a * 1.1 + b))
        ra = rb / 10
    ra = max(ra, r_lo)
    if not variable:
        return astable_pairs(model, q, t_goal, duty, series, r_lo, r_hi, present=present)
    if (circuit.pot_in or "ra") == "ra":
        # Trimmer with RA (the default): RB fixed from the low time, RA fixed + trimmer
        # cover the window; the low time stays put while the period moves.
        # RB from the shortest period wanted with RA = RB there (duty 2/3): the trimmer and
        # the fixed RA then add to RA above it (common practice for a frequency trim).
        t_low = (window[0] if window is not None else t_goal) / spread
        rb_s = eseries.nearest(series, max(t_low / (c * (2 * a + b)), r_lo))
        ev_a = lambda x: model.times(model.at(ra=x, rb=rb_s, rp=0.0))[q]  # noqa: E731
        return _variable(ev_a, model.with_params(rb=rb_s), circuit, t_goal, window, series, r_lo, r_hi - rb_s,
                         "ra", {"rb": rb_s})
    ra_s = max(eseries.nearest(series, ra), eseries.next_up(series, r_lo * 0.9999999))
    ev = lambda x: model.times(model.at(ra=ra_s, rb=x, rp=0.0))[q]  # noqa: E731
    return _variable(ev, model.with_params(ra=ra_s), circuit, t_goal, window, series, 1.0, r_hi - ra_s, "rb", {"ra": ra_s})


#: Without a duty target, an astable pair keeps the duty between these (RA ≤ RB: the
#: classic RA-small network, about 52 % at RA = RB/10; common practice).
FREE_DUTY = (0.5, 2.0 / 3.0)
#: Pairs kept per capacitor from the exhaustive search (best first).
PAIRS_KEPT = 4


def astable_pairs(model, q: str, t_goal: float, duty: float | None, series: str, r_lo: float, r_hi: float,
                  keep: int = PAIRS_KEPT, present: dict | None = None) -> list[dict]:
    """Every RA of the series inside the limits, each with the two series RB values around
    the RB its period needs: the best ``keep`` pairs by the error on ``q`` (plus half the
    duty error when a duty is wanted). The law is monotone in RB for a fixed RA, so the
    best RB for each RA is one of those two neighbours: the search is exhaustive over the
    series' pairs at a cost of a few law evaluations per RA. ``present`` (``{"ra", "rb"}``,
    Ω) adds the best pair keeping the board's RA, and the best keeping its RB."""
    scored = []
    ras = eseries.values_between(series, r_lo, r_hi)
    if present and present.get("ra"):
        ras = sorted(set(ras) | {present["ra"]})
    for ra_s in ras:
        rb_ideal = _solve(lambda x: model.times(model.at(ra=ra_s, rb=x, rp=0.0))[q], t_goal)
        if not math.isfinite(rb_ideal) or rb_ideal <= 0 or ra_s + rb_ideal > r_hi:
            continue
        for rb_s in {eseries.next_down(series, rb_ideal * 1.0000001), eseries.next_up(series, rb_ideal * 0.9999999)}:
            if ra_s + rb_s > r_hi * (1 + 1e-9):
                continue
            t = model.times(model.at(ra=ra_s, rb=rb_s, rp=0.0))
            err = abs(t[q] / t_goal - 1.0)
            if duty is not None:
                score = (err + 0.5 * abs(t["duty"] - duty), 0.0)
            else:
                if not FREE_DUTY[0] <= t["duty"] <= FREE_DUTY[1] + 1e-9:
                    continue
                score = (err, abs(t["duty"] - 0.524))
            scored.append((score, ra_s, rb_s))
    scored.sort()
    out = [(ra, rb) for _, ra, rb in scored[:keep]]
    if present and present.get("rb"):  # RB kept: solve RA instead
        rb_p = present["rb"]
        ra_ideal = _solve(lambda x: model.times(model.at(ra=x, rb=rb_p, rp=0.0))[q], t_goal)
        if math.isfinite(ra_ideal) and ra_ideal > 0:
            for ra_s in {eseries.next_down(series, ra_ideal * 1.0000001), eseries.next_up(series, ra_ideal * 0.9999999)}:
                if r_lo * (1 - 1e-9) <= ra_s and ra_s + rb_p <= r_hi * (1 + 1e-9):
                    out.append((ra_s, rb_p))
    if present and present.get("ra"):
        keeps = [(ra, rb) for _, ra, rb in scored if abs(ra - present["ra"]) <= 1e-9 * ra]
        out += keeps[:1]
    return [{"ra": ra, "rb": rb} for ra, rb in dict.fromkeys(out)]


def _candidate(family: Family, circuit: Circuit, target: Target, kept_c: bool) -> Candidate:
    model = build(family, circuit)
    nominal = model.times()
    lows, highs = band(model)
    q = target_quantity(model, target)
    adjust = setting = None
    if model.pot:
        lo, hi = travel_ends(model)
        adjust = {"min": lo, "max": hi, "pot": model.pot}
        setting = setting_for(model, q, target.value)
        if setting is not None:
            model = model.with_params(rp=model.pot * setting)
            nominal = model.times()
            lows, highs = band(model)
    error = nominal[q] / target.value - 1.0
    duty_error = None
    if target.duty is not None and model.mode == "astable":
        duty_error = nominal["duty"] - target.duty
    values = network_values(model)
    if model.pot:
        values["pot_setting"] = setting
    if target.range is not None and model.pot:
        error = 0.0 if setting is not None else error
    cand = Candidate(
        values=values, timing={"nominal": nominal, "min": lows, "max": highs}, error=error,
        kept_c=kept_c, adjust=adjust, setting=setting, duty_error=duty_error, mode=model.mode,
        facts=network_facts(model),
    )
    from advisor.rules import check_findings  # the same rules as check and swap judge every candidate

    cand.findings[:] = check_findings(family, circuit, cand)
    return cand
