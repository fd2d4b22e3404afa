"""Swap one timer or one-shot for another, keeping the pulse the old circuit really made.

Steps (each one a call into the engine that owns it):

1. the old circuit's timing (``advisor.timing.analyse``), calibrated when the user
   gives a scope measurement: the kept quantity is the measured width (or period
   and duty) when there is one, else the old part's nominal prediction;
2. the old values on the new part at the new supply; when they keep the pulse
   within the tolerance (the circuit's resistor tolerance, 5 % by default) and
   break no limit of the new part, they stay;
3. otherwise standard values from ``advisor.timing.design``, keeping the existing
   capacitor when a standard resistor gets within :data:`DESIGN_GOAL`, else the
   closest network with another capacitor;
4. the pin map, then the findings: the datasheet rules (the only checks) judge
   both parts and the swap, with the swap's facts (pin moves, ties, network kind,
   whether design found values, the error on the kept time) in their context;
5. the class (:func:`advisor.substitute.classify.classify`) and the bench rework
   (:func:`advisor.substitute.rework.plan_rework`), both read from those findings.
"""

from __future__ import annotations

from advisor.circuit import Circuit, Target
from advisor.errors import InputError, RetimeError
from advisor.findings import Finding
from advisor.parts import Family
from advisor.substitute.classify import classify
from advisor.substitute.pinmap import map_pins, network_kind
from advisor.substitute.reference import with_reference
from advisor.substitute.result import PartSide, SwapResult
from advisor.substitute.rework import changed_values, plan_rework

#: Keep the existing capacitor when a standard resistor gets within this fraction
#: of the kept pulse; otherwise prefer another capacitor (common practice: half the
#: 5 % tolerance of E24 resistors, so the new part's own spread still dominates).
DESIGN_GOAL = 0.02

#: A rule that declares this block, fired on the old values on the new part, means they must change.
_KEEP_BLOCK = "kept-values"


def _analyse(family: Family, circuit: Circuit):
    from advisor.timing.analyse import analyse

    return analyse(family, circuit)


def _design(family: Family, circuit: Circuit, series: str, limit: int = 12):
    from advisor.timing.design import design

    return design(family, circuit, series=series, keep_c=True, limit=limit, good_enough=DESIGN_GOAL)


def _rule_findings(old, old_c, old_t, new, new_c, new_t, facts: dict) -> list[Finding]:
    from advisor.rules import swap_findings

    return swap_findings(old, old_c, old_t, new, new_c, new_t, swap_facts=facts)


def _blocks_kept_values(family: Family, circuit: Circuit, result) -> bool:
    """True when a rule that rules out keeping the values fires on them (rules/*.yaml ``blocks``)."""
    from advisor.rules import check_findings

    return any(_KEEP_BLOCK in f.blocks for f in check_findings(family, circuit, result))


def kept_quantity(mode: str, timing: dict, calibrated: bool) -> dict:
    """What the new circuit must reproduce: the width, or the period and duty (s, fraction)."""
    nom = timing["nominal"]
    basis = "measured" if calibrated else "predicted"
    if mode == "mono":
        return {"quantity": "width", "value": nom["width"], "basis": basis}
    return {"quantity": "period", "value": nom["period"], "duty": nom.get("duty"), "basis": basis}


def _error(kept: dict, timing: dict) -> float:
    return timing["nominal"][kept["quantity"]] / kept["value"] - 1.0


def _duty_error(kept: dict, timing: dict) -> float:
    if kept.get("duty") is None or timing["nominal"].get("duty") is None:
        return 0.0
    return timing["nominal"]["duty"] - kept["duty"]


def _side(fam: Family, t, vcc: float | None) -> PartSide:
    trig = t.trigger.to_json() if t.trigger is not None else None
    return PartSide(fam.id, fam.title, vcc, dict(t.values), {k: dict(v) for k, v in t.timing.items()}, t.mode,
                    fam.technology, fam.status, trig, getattr(t, "maker", None), getattr(t, "maker_basis", None),
                    getattr(t, "part_number", None))


def new_circuit_for(circuit: Circuit, new: Family, vcc: float | None, mode: str,
                    new_divide: int | None = None) -> Circuit:
    """The old circuit's network on the new part at the new supply (no measurement, no target).

    A counter timer's divide ratio: ``new_divide`` when given, else the old circuit's when the
    new part can select it, else none (design then chooses one, saying so)."""
    from advisor.timing.model import divide_choices

    divide = new_divide if new_divide is not None else (
        circuit.divide if circuit.divide in divide_choices(new) else None)
    return circuit.with_(part=new.id, vcc=vcc, mode=mode if new.function != "monostable" else None,
                         measured=None, target=None, divide=divide)


def swap(
    catalog,
    old_query: str,
    new_query: str,
    circuit: Circuit,
    *,
    new_vcc: float | None = None,
    series: str = "E24",
    old_package: str | None = None,
    new_package: str | None = None,
    old_result=None,
    keep_within: float | None = None,
    new_maker: str | None = None,
    new_divide: int | None = None,
) -> SwapResult:
    """Replace ``old_query`` by ``new_query`` in ``circuit`` (see the module docstring).

    ``old_result`` lets :func:`advisor.substitute.alternates` reuse one analysis of
    the old circuit for every candidate. ``keep_within`` (fraction) replaces the old
    circuit's worst-case band as the window a one-resistor change must land in.
    """
    from advisor import eseries

    eseries.mantissas(series)  # a mistyped series is bad input (exit 2), never a verdict
    old = catalog.resolve(old_query)
    new = catalog.resolve(new_query)
    circuit, reference_note = with_reference(circuit)
    old_c = circuit.with_(part=old.id)
    old_t = old_result if old_result is not None else _analyse(old, old_c)
    mode = old_t.mode
    old_vcc = old_t.values.get("vcc")
    vcc = new_vcc if new_vcc is not None else old_vcc
    assumptions: list[str] = [reference_note] if reference_note else []
    assumptions += [f"old part: {a}" for a in old_t.assumptions]
    if circuit.vcc is None:
        assumptions.append(f"old supply {old_vcc:g} V (not given: --vcc)")
    if new_vcc is None:
        assumptions.append(f"new part at the old supply, {vcc:g} V (give --new-vcc to move it)")
    if mode == "astable" and new.function == "monostable":
        raise InputError(f"{new.id} is a one-shot: it cannot replace the {old.id} astable",
                         hint="pick a 555-class timer or a 4047")
    if mode == "mono" and new.function == "programmable-timer":  # its law has only an oscillator form
        raise InputError(f"{new.id} is a programmable timer (an RC oscillator and a counter): "
                         f"it cannot make the {old.id}'s single pulse", hint="pick a one-shot or a 555-class timer")
    cal = old_t.calibration.to_json() if old_t.calibration is not None else None
    kept = kept_quantity(mode, old_t.timing, cal is not None)
    if cal is not None:
        kept["predicted"] = kept["value"] / cal["factor"] if cal.get("factor") else None
    tol = circuit.r_tolerance
    uses_rint = mode == "mono" and circuit.r is None and old.timing.r_internal is not None

    from advisor.makers import makers_of

    new_makers, new_basis = makers_of(catalog, new_query, new_maker)
    from advisor.timing.model import check_divide

    check_divide(new, new_divide, "--new-divide")
    from advisor.partnumber import as_typed

    base = new_circuit_for(circuit, new, vcc, mode, new_divide).with_(makers=new_makers, maker_basis=new_basis,
                                                                       part_number=as_typed(new_query, new.id))
    if circuit.divide is not None and base.divide is None and new.timing.law == "counter":
        assumptions.append(f"--divide {circuit.divide} is not a ratio the {new.id} can select: the design "
                           "chooses one (give --new-divide N)")

    # --- values: keep them when they keep the pulse, else design -----------------
    chosen = None  # (circuit, how)
    design_info: dict = {"series": series, "goal": DESIGN_GOAL, "tolerance": tol}
    same_network = not uses_rint and network_kind(old) == network_kind(new)
    if same_network:
        try:
            asis = _analyse(new, base)
        except RetimeError:
            asis = None
        if asis is not None:
            err = _error(kept, asis.timing)
            design_info["as_is_error"] = err
            if abs(err) <= tol and abs(_duty_error(kept, asis.timing)) <= tol and not _blocks_kept_values(new, base, asis):
                chosen = (base, "kept")
    timing_solved = True
    timing_reason = None
    if chosen is None:
        target = (Target("width", kept["value"]) if mode == "mono"
                  else Target("period", kept["value"], duty=kept.get("duty")))
        try:
            d = _design(new, base.with_(target=target, c=circuit.c), series)
        except RetimeError as exc:
            d = None
            timing_solved = False
            timing_reason = f"{new.id}: {exc.message}"
        if d is not None and d.candidates:
            window = _keep_window(kept, old_t.timing, keep_within)
            pick, how = _pick_candidate(d.candidates, kept, old_values=dict(old_t.values), window=window)
            design_info["keep_window"] = {"min": window[0], "max": window[1],
                                          "basis": "--keep-within" if keep_within is not None else "old band"}
            other = _other_option(d.candidates, pick)
            if other is not None:
                design_info["other_option"] = {"values": other.values, "error": other.error, "kept_c": other.kept_c}
            vals = pick.values
            chosen = (base.with_(r=vals.get("r"), ra=vals.get("ra"), rb=vals.get("rb"), c=vals.get("c"),
                                 pot=vals.get("pot"), pot_setting=vals.get("pot_setting"),
                                 divide=vals.get("divide", base.divide)), how)
            design_info["alternatives"] = [
                {"values": c.values, "error": c.error, "kept_c": c.kept_c} for c in d.candidates[:5]]
            assumptions.extend(f"design: {a}" for a in d.assumptions)
        elif timing_solved:
            timing_solved = False
            timing_reason = f"no standard-value network for {new.id} keeps the pulse"
    if chosen is None:  # unsuitable: still report the old values on the new part when possible
        chosen = (base, "kept")
    final_c, how = chosen
    design_info["how"] = how
    try:
        new_t = _analyse(new, final_c)
    except RetimeError as exc:
        raise InputError(f"{new.id} cannot be analysed with this circuit: {exc.message}") from None
    err = _error(kept, new_t.timing)
    if not timing_solved:
        design_info["problem"] = timing_reason

    # --- pins, facts, findings, class, rework ----------------------------------
    edge = circuit.trigger.edge
    pm = map_pins(old, new, edge=edge, uses_internal_r=uses_rint,
                  old_package=old_package, new_package=new_package, assume_edge=mode == "mono",
                  divide=final_c.divide, mode=mode, old_divide=old_c.divide)
    old_values = dict(old_t.values)
    if uses_rint:
        old_values["r"] = None  # the internal resistor is not a part on the board
    facts = swap_facts(pm, old, new, kept=kept, timing_solved=timing_solved, timing_problem=timing_reason,
                       error=err, duty_error=_duty_error(kept, new_t.timing), tolerance=tol, how=how,
                       values_changed=bool(changed_values(old_values, new_t.values)))
    old_json, new_json = old_t.to_json(), new_t.to_json()
    findings = _rule_findings(old, old_c, old_json, new, final_c, new_json, facts)
    verdict = classify(findings)
    rework = plan_rework(pm, old_values, new_t.values, expected=new_t.timing["nominal"], mode=mode,
                         findings=findings, adjust=new_t.adjust)
    if pm.polarity.assumed:
        assumptions.append(pm.polarity.note.split("; ")[-1])
    if mode == "mono" and circuit.trigger.high is None and old_vcc is not None and abs(vcc - old_vcc) > 1e-9:
        assumptions.append(
            f"the trigger source is assumed to move to {vcc:g} V with the part; if it stays at {old_vcc:g} V, "
            "give --trigger-high to check the levels")
    return SwapResult(
        old=_side(old, old_t, old_vcc),
        new=_side(new, new_t, vcc),
        verdict=verdict,
        pin_map=pm,
        rework=rework,
        findings=findings,
        kept=kept,
        error=err,
        calibration=cal,
        trigger=new_json.get("trigger"),
        design=design_info,
        assumptions=list(dict.fromkeys(assumptions)),
        capture=circuit.measured.capture if circuit.measured is not None else None,
    )


def _keep_window(kept: dict, old_timing: dict, keep_within: float | None) -> tuple[float, float]:
    """The relative error window (lo ≤ 0 ≤ hi) a fewest-changes answer must land in:
    ``±keep_within``, else the old circuit's own worst-case band on the kept quantity."""
    if keep_within is not None:
        return -abs(keep_within), abs(keep_within)
    q = kept["quantity"]
    nom = old_timing["nominal"].get(q)
    lo, hi = old_timing["min"].get(q), old_timing["max"].get(q)
    if not nom or lo is None or hi is None:
        return -DESIGN_GOAL, DESIGN_GOAL
    return min(lo / nom - 1.0, 0.0), max(hi / nom - 1.0, 0.0)


def _parts_changed(old_values: dict, values: dict) -> int:
    return len(changed_values(old_values, values))


def _other_option(cands, pick):
    """The closest network that is not the picked one (shown beside the answer)."""
    rest = [c for c in cands if c is not pick and c.values != pick.values]
    return min(rest, key=lambda c: abs(c.error) + 0.5 * abs(c.duty_error or 0.0)) if rest else None


def _pick_candidate(cands, kept: dict, *, old_values: dict | None = None, window: tuple[float, float] | None = None):
    """Fewest changes first: the existing C with one new standard resistor when that
    lands inside ``window`` (the old circuit's worst-case band, or --keep-within);
    else keep C when a standard R gets within DESIGN_GOAL; else the closest network."""
    def score(c):
        return abs(c.error) + 0.5 * abs(c.duty_error or 0.0)

    if old_values is not None and window is not None:
        one = [c for c in cands if c.kept_c and _parts_changed(old_values, c.values) <= 1
               and window[0] - 1e-12 <= c.error <= window[1] + 1e-12
               and abs(c.duty_error or 0.0) <= max(abs(window[0]), window[1])]
        if one:
            return min(one, key=score), "kept-c"
    kept_c = [c for c in cands if c.kept_c]
    if kept_c:
        best = min(kept_c, key=score)
        if score(best) <= DESIGN_GOAL:
            return best, "kept-c"
    best = min(cands, key=score)
    return best, ("kept-c" if best.kept_c else "new-c")


def swap_facts(pm, old: Family, new: Family, *, kept: dict, timing_solved: bool, timing_problem: str | None,
               error: float | None, duty_error: float | None, tolerance: float, how: str,
               values_changed: bool) -> dict:
    """The swap's facts for the rules context (advisor/rules/context.py TOP_VOCABULARY).

    Facts only: the pin map's moves, ties and unmatched inputs, the two timing
    networks, and what the value search found. The rules in rules/pinout.yaml and
    rules/behaviour.yaml judge them.
    """
    moved = pm.moved_links if pm.same_footprint else ()
    ties = pm.changed_ties
    blocking = pm.blocking
    pol = pm.polarity
    edge_missing = pol.edge is not None and pol.new_input is None
    return {
        "same_footprint": pm.same_footprint,
        "same_pins": pm.same_pins,
        "pins_moved": float(len(moved)),
        "pins_moved_list": ", ".join(f"{m.function} {m.old_pin}→{m.new_pin}" for m in moved) or None,
        "pins_blocking": float(len(blocking)),
        "pins_blocking_list": "; ".join(f"{u.old_name} (pin {u.old_pin}): {u.what}" for u in blocking) or None,
        "ties_added": float(len(ties)),
        "ties_added_list": ", ".join(f"{t.new_name} (pin {t.new_pin}) to {t.level}" for t in ties) or None,
        "clears_inverted": float(sum(t.replaces is not None for t in pm.ties)),
        "clears_inverted_list": "; ".join(f"{t.replaces} onto {new.id} {t.new_name} (pin {t.new_pin}), active "
                                          f"{'low' if t.level == 'VCC' else 'high'}"
                                          for t in pm.ties if t.replaces is not None) or None,
        "edge_input_missing": edge_missing,
        "edge_note": (pol.note or f"{new.id} has no input for the {pol.edge} edge") if edge_missing else None,
        "network_changed": network_kind(old) != network_kind(new),
        "old_network": network_kind(old),
        "new_network": network_kind(new),
        "values_changed": values_changed,
        "kept_quantity": kept["quantity"],
        "timing_solved": timing_solved,
        "timing_problem": timing_problem,
        "timing_error": error,
        "duty_error": duty_error,
        "timing_tolerance": tolerance,
        "timing_how": how,
    }
