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
4. findings for both parts (``advisor.rules.swap_findings`` plus each part's
   law-validity findings), the pin map, the class and the bench rework.
"""

from __future__ import annotations

from advisor.circuit import Circuit, Target
from advisor.errors import InputError, RetimeError
from advisor.findings import Finding, merge_findings
from advisor.parts import Family
from advisor.substitute.classify import SwapFacts, classify
from advisor.substitute.pinmap import map_pins, network_kind
from advisor.substitute.reference import with_reference
from advisor.substitute.result import PartSide, SwapResult
from advisor.substitute.rework import changed_values, plan_rework

#: Keep the existing capacitor when a standard resistor gets within this fraction
#: of the kept pulse; otherwise prefer another capacitor (common practice: half the
#: 5 % tolerance of E24 resistors, so the new part's own spread still dominates).
DESIGN_GOAL = 0.02

#: A finding of this severity about the new part's as-is values means the values must change.
_VALUE_SEVERITIES = ("danger", "warning")

#: Danger rules a level shifter (a named redesign step) resolves: the trigger's high
#: level against the new part's supply or input threshold (rules/interface.yaml).
_LEVEL_RULES = frozenset({"trigger-above-supply", "trigger-below-vih"})


def _analyse(family: Family, circuit: Circuit):
    from advisor.timing.analyse import analyse

    return analyse(family, circuit)


def _design(family: Family, circuit: Circuit, series: str, limit: int = 12):
    from advisor.timing.design import design

    return design(family, circuit, series=series, keep_c=True, limit=limit, good_enough=DESIGN_GOAL)


def _rule_findings(old, old_c, old_t, new, new_c, new_t) -> list[Finding]:
    from advisor.rules import swap_findings

    return swap_findings(old, old_c, old_t, new, new_c, new_t)


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
                    fam.technology, fam.status, trig)


def _tag(findings: list[Finding], part: str) -> list[Finding]:
    from dataclasses import replace

    return [f if f.part else replace(f, part=part) for f in findings]


def _vih(fam: Family, vcc: float) -> float | None:
    """The new part's input-high threshold at ``vcc`` (V): absolute when published for it, else a fraction."""
    itf = fam.interface
    if itf.vih is not None and itf.vih.applies(vcc):
        return itf.vih.value
    if itf.vih_fraction is not None:
        return itf.vih_fraction.value * vcc
    if itf.inputs == "ttl":
        return 2.0  # TTL-compatible input: VIH 2.0 V (HCT, AHCT and LS datasheets)
    return None


def new_circuit_for(circuit: Circuit, new: Family, vcc: float | None, mode: str) -> Circuit:
    """The old circuit's network on the new part at the new supply (no measurement, no target)."""
    return circuit.with_(part=new.id, vcc=vcc, mode=mode if new.function != "monostable" else None,
                         measured=None, target=None)


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
) -> SwapResult:
    """Replace ``old_query`` by ``new_query`` in ``circuit`` (see the module docstring).

    ``old_result`` lets :func:`advisor.substitute.alternates` reuse one analysis of
    the old circuit for every candidate. ``keep_within`` (fraction) replaces the old
    circuit's worst-case band as the window a one-resistor change must land in.
    """
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
    cal = old_t.calibration.to_json() if old_t.calibration is not None else None
    kept = kept_quantity(mode, old_t.timing, cal is not None)
    if cal is not None:
        kept["predicted"] = kept["value"] / cal["factor"] if cal.get("factor") else None
    tol = circuit.r_tolerance
    uses_rint = mode == "mono" and circuit.r is None and old.timing.r_internal is not None

    base = new_circuit_for(circuit, new, vcc, mode)
    rec = new.supply.recommended
    supply_ok = rec.min - 1e-9 <= vcc <= rec.max + 1e-9
    supply_reason = None if supply_ok else (
        f"{new.id} runs from {rec.min:g} to {rec.max:g} V; the circuit needs {vcc:g} V")

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
            bad = [f for f in asis.findings if f.severity in _VALUE_SEVERITIES]
            design_info["as_is_error"] = err
            if abs(err) <= tol and abs(_duty_error(kept, asis.timing)) <= tol and not bad:
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
                                 pot=vals.get("pot"), pot_setting=vals.get("pot_setting")), how)
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
    within = abs(err) <= tol and abs(_duty_error(kept, new_t.timing)) <= tol
    if timing_solved and not within:
        timing_reason = (f"the closest standard values give {err:+.1%} on the {kept['quantity']}, "
                         f"outside the {tol:.0%} tolerance")
    if how != "kept" and timing_reason is None:
        timing_reason = (f"new values keep the {kept['quantity']} within {err:+.1%}"
                         + (" with the same capacitor" if how == "kept-c" else " with another capacitor"))

    # --- findings, pins, class, rework -------------------------------------------
    old_json, new_json = old_t.to_json(), new_t.to_json()
    findings = merge_findings(_tag(old_t.findings, old.id) + _tag(new_t.findings, new.id),
                              _rule_findings(old, old_c, old_json, new, final_c, new_json))

    edge = circuit.trigger.edge
    pm = map_pins(old, new, edge=edge, uses_internal_r=uses_rint,
                  old_package=old_package, new_package=new_package, assume_edge=mode == "mono")
    behaviour, resolved = _behaviour_changes(old, new, old_t, new_t, circuit, vcc, findings, mode)

    old_values = dict(old_t.values)
    if uses_rint:
        old_values["r"] = None  # the internal resistor is not a part on the board
    values_changed = bool(changed_values(old_values, new_t.values))
    dangers = tuple(f for f in findings if f.severity == "danger" and f.part != old.id)
    verdict = classify(SwapFacts(
        supply_ok=supply_ok, supply_reason=supply_reason, timing_solved=timing_solved,
        timing_within_tolerance=within, timing_reason=timing_reason, values_changed=values_changed,
        pin_map=pm, behaviour_reasons=tuple(behaviour), dangers=dangers, resolved_by_redesign=frozenset(resolved),
    ))
    rework = plan_rework(pm, old_values, new_t.values, expected=new_t.timing["nominal"], mode=mode)
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


def _behaviour_changes(old, new, old_t, new_t, circuit, vcc, findings, mode) -> tuple[list[str], set[str]]:
    """Reasons the circuit must change (redesign), and the danger rules those changes resolve."""
    reasons: list[str] = []
    resolved: set[str] = set()
    ot = old_t.trigger.to_json() if old_t.trigger is not None else None
    nt = new_t.trigger.to_json() if new_t.trigger is not None else None
    if ot is not None and mode == "mono":
        relies = (ot.get("divide_by") or 1) > 1 or bool(ot.get("stays_high"))
        if relies and (nt is None or nt.get("divide_by") != ot.get("divide_by")
                       or bool(nt.get("stays_high")) != bool(ot.get("stays_high"))):
            what = "stays high" if ot.get("stays_high") else f"fires on every {ot.get('divide_by')}th trigger"
            reasons.append(
                f"the circuit relies on {old.id}'s retrigger behaviour: its pulse outlasts the trigger period, "
                f"so it {what}; {new.id} ({'retriggerable' if new.behaviour.retrigger == 'yes' else 'not retriggerable'}"
                f") would behave differently")
    high = circuit.trigger.high
    if high is not None:
        vih = _vih(new, vcc)
        if high > vcc + 0.3:
            reasons.append(f"the trigger's {high:g} V high exceeds the {vcc:g} V supply of {new.id}: "
                           "a level shifter (or a divider into a Schmitt buffer) is needed")
        elif vih is not None and high < vih:
            reasons.append(f"the trigger's {high:g} V high is below {new.id}'s {vih:.2g} V input threshold: "
                           "a level shifter or a TTL-compatible (HCT-type) part is needed")
        if reasons:
            resolved |= {f.rule for f in findings if f.rule in _LEVEL_RULES}
    if network_kind(old) != network_kind(new):
        reasons.append(f"{old.id} and {new.id} use different timing networks "
                       f"({network_kind(old)} vs {network_kind(new)}): the network is rebuilt")
    return reasons, resolved
