"""The class of a swap, from explicit criteria checked in a fixed order.

Classes, best first (:data:`CLASS_ORDER`):

``unsuitable``
    the new part cannot run at the (new) supply (outside its recommended range),
    or no timing network inside its limits makes the pulse, or a danger finding
    about the new circuit remains that no circuit change named below resolves.
``redesign``
    the behaviour changes in a way the circuit must follow: retrigger semantics
    the circuit relies on (its pulse outlasts the trigger period, so the old part
    divided or stayed high and the new one would not do the same), an old input
    with no equivalent on the new part (trigger edge, clear), a different timing
    network (555 ↔ one-shot), trigger levels that need shifting at the new supply,
    or a pulse that standard values cannot bring within the tolerance.
``rewire``
    a different package, or any used function at a different pin number, an added
    component (an external R replacing an internal one) or a tie the old board
    did not have.
``drop-in-new-values``
    same pinout at the same pin numbers for every used function, but the timing
    network must change to keep the pulse.
``drop-in``
    same pinout and the old values keep the pulse within the tolerance.

"Within the tolerance" is the circuit's resistor tolerance (5 % when not given,
common practice for E24 parts): a difference smaller than the parts' own spread
is not a reason to change them.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass, field

from advisor.findings import Finding
from advisor.substitute.pinmap import PinMap

CLASS_ORDER = ["drop-in", "drop-in-new-values", "rewire", "redesign", "unsuitable"]


@dataclass(frozen=True)
class Verdict:
    """The class and every criterion that was checked, with the reasons that decided it."""

    cls: str
    reasons: tuple[str, ...]
    criteria: dict = field(default_factory=dict)

    @property
    def rank(self) -> int:
        return CLASS_ORDER.index(self.cls)

    def to_json(self) -> dict:
        d = asdict(self)
        d["class"] = d.pop("cls")
        d["reasons"] = list(self.reasons)
        return d


@dataclass(frozen=True)
class SwapFacts:
    """What the swap engine found, as plain facts for :func:`classify`."""

    supply_ok: bool
    supply_reason: str | None
    timing_solved: bool  # some network inside the new part's limits makes the pulse
    timing_within_tolerance: bool  # the chosen standard values keep it within tolerance
    timing_reason: str | None
    values_changed: bool
    pin_map: PinMap
    behaviour_reasons: tuple[str, ...] = ()  # retrigger relied on, level shifting, network kind...
    dangers: tuple[Finding, ...] = ()  # danger findings about the new circuit
    resolved_by_redesign: frozenset[str] = frozenset()  # rule ids a named redesign step resolves


def classify(f: SwapFacts) -> Verdict:
    """Apply the criteria in the module docstring, worst class first."""
    pm = f.pin_map
    open_dangers = [d for d in f.dangers if d.rule not in f.resolved_by_redesign]
    criteria = {
        "supply_ok": f.supply_ok,
        "timing_solved": f.timing_solved,
        "timing_within_tolerance": f.timing_within_tolerance,
        "danger_findings": len(open_dangers),
        "behaviour_changes": list(f.behaviour_reasons),
        "blocking_pins": [f"{u.old_name} (pin {u.old_pin})" for u in pm.blocking],
        "same_footprint": pm.same_footprint,
        "same_pins": pm.same_pins,
        "values_changed": f.values_changed,
    }

    reasons: list[str] = []
    if not f.supply_ok:
        reasons.append(f.supply_reason or "the new part cannot run at this supply")
    if not f.timing_solved:
        reasons.append(f.timing_reason or "no timing network inside the new part's limits makes the pulse")
    for d in open_dangers:
        reasons.append(f"danger: {d.message}")
    if reasons:
        return Verdict("unsuitable", tuple(reasons), criteria)

    reasons = list(f.behaviour_reasons)
    for u in pm.blocking:
        reasons.append(f"{pm.old_family} {u.old_name} (pin {u.old_pin}): {u.what}")
    if pm.polarity.edge is not None and pm.polarity.new_input is None:
        reasons.append(pm.polarity.note or f"{pm.new_family} has no input for the {pm.polarity.edge} edge")
    if not f.timing_within_tolerance:
        reasons.append(f.timing_reason or "standard values do not keep the pulse within the tolerance")
    if reasons:
        return Verdict("redesign", tuple(dict.fromkeys(reasons)), criteria)

    if not pm.same_pins:
        why = []
        if not pm.same_footprint:
            why.append(f"package changes: {pm.old_package} → {pm.new_package}")
        moved = pm.moved_links
        if moved:
            why.append("moved pins: " + ", ".join(f"{m.function} {m.old_pin}→{m.new_pin}" for m in moved[:6])
                       + (" …" if len(moved) > 6 else ""))
        for a in pm.additions:
            why.append(f"add {a.what} ({a.role}) between {a.between[0]} and {a.between[1]}")
        changed = pm.changed_ties
        if changed:
            why.append("new ties: " + ", ".join(f"{t.new_name} (pin {t.new_pin}) to {t.level}" for t in changed))
        return Verdict("rewire", tuple(why) or ("pins differ",), criteria)

    if f.values_changed:
        return Verdict("drop-in-new-values",
                       (f.timing_reason or "same pins; the timing network changes to keep the pulse",), criteria)
    return Verdict("drop-in", ("same pins; the old values keep the pulse within the tolerance",), criteria)
