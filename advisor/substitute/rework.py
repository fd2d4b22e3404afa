"""Ordered bench steps for a swap: remove, lift, adapt, jumper, tie, add, fit, protect, set, check.

The steps follow the order a technician works in: take the old part out; when the
footprint is the same, bend out (lift) every new pin whose pad carries another
net; when it differs, build an adapter (or wire the new part on a carrier); then
run the jumpers for moved nets, tie the inputs that need a fixed level, add what
the new part lacks (an external Rext for an internal one), fit the new timing
values, then the step each fired rule with a rework template adds (a series
resistor on an over-voltage trigger, a rewired timing capacitor), where to set a
kept variable resistor, and finally check the pulse on a two-channel scope
(trigger on one channel, output on the other). While a danger stands that no
step fixes, the plan ends with "Do not power up: <reason>" instead.

Pure data: each :class:`Step` has an ``action`` word, a one-line ``detail``, the pins
it touches and, for value changes, the old and new value (SI units).
"""

from __future__ import annotations

from dataclasses import asdict, dataclass

from advisor.substitute.pinmap import PinMap
from advisor.values import format_code, format_eng

ACTIONS = ("remove", "adapter", "lift", "jumper", "tie", "isolate", "add", "fit", "keep", "fit-part", "protect",
           "set", "check", "stop")

#: Value names in the order a technician meets them, with their kind and label.
VALUE_LABELS = {
    "r": ("resistance", "Rext"),
    "ra": ("resistance", "RA"),
    "rb": ("resistance", "RB"),
    "pot": ("resistance", "variable resistor"),
    "c": ("capacitance", "C"),
}

#: Two values are "the same part" when within this fraction (printing rounding only).
SAME_VALUE = 0.005


@dataclass(frozen=True)
class Step:
    n: int
    action: str
    detail: str
    pins: tuple[int, ...] = ()
    old_value: float | None = None
    new_value: float | None = None

    def to_json(self) -> dict:
        d = asdict(self)
        d["pins"] = list(self.pins)
        return d


def same_value(a: float | None, b: float | None) -> bool:
    if a is None or b is None:
        return a is None and b is None
    return abs(a - b) <= SAME_VALUE * max(abs(a), abs(b))


def changed_values(old: dict, new: dict, *, keys=tuple(VALUE_LABELS)) -> dict[str, tuple[float | None, float | None]]:
    """Timing-network values that differ between the old and the new circuit."""
    out = {}
    for k in keys:
        if not same_value(old.get(k), new.get(k)):
            out[k] = (old.get(k), new.get(k))
    return out


def _fmt(kind: str, v: float | None) -> str:
    if v is None:
        return "none"
    unit = "Ω" if kind == "resistance" else "F"
    return f"{format_code(v, kind)} ({format_eng(v, unit, 3)})"


def plan_rework(
    pin_map: PinMap,
    old_values: dict,
    new_values: dict,
    *,
    expected: dict | None = None,
    mode: str = "mono",
    old_label: str | None = None,
    findings=(),
    adjust: dict | None = None,
) -> list[Step]:
    """The ordered bench steps for this pin map and these values.

    ``expected`` is the new part's nominal timing (``{"width": s}`` or
    ``{"period", "high", ...}``) for the closing scope check. ``findings`` are the
    swap's fired findings: each rework template of the new part's and the swap's
    rules adds its step, and a danger no step fixes ends the plan with "Do not
    power up". ``adjust`` is the new timing at both ends of a kept variable
    resistor's travel (``{"min": times, "max": times}``).
    """
    steps: list[Step] = []

    def add(action: str, detail: str, pins=(), old=None, new=None) -> None:
        steps.append(Step(len(steps) + 1, action, detail, tuple(pins), old, new))

    pm = pin_map
    who = old_label or pm.old_family
    add("remove", f"Remove {who} ({pm.old_package}); note where pin 1 sits.")

    links_by_new = {lk.new_pin: lk for lk in pm.links}
    ties_by_new = {t.new_pin: t for t in pm.ties}
    old_net_at = {lk.old_pin: lk for lk in pm.links}
    held_at = {u.old_pin: u for u in pm.unmatched}
    n_new = pm.new_pin_count

    if pm.same_footprint:
        lifted = []
        for pin in range(1, n_new + 1):
            lk = links_by_new.get(pin)
            if lk is not None and not lk.moved:
                continue  # same net on the same pad
            old_has_net = pin in old_net_at or pin in held_at
            tie = ties_by_new.get(pin)
            if tie is not None and pin in held_at and held_at[pin].old_level == ("high" if tie.level == "VCC" else "low"):
                continue  # the pad is already held at the level the new part wants
            if old_has_net:
                lifted.append(pin)
        if lifted:
            add("lift", f"Bend out (or cut the socket contact of) {pm.new_family} pin(s) "
                        f"{', '.join(map(str, lifted))} so they do not touch the old pads, which carry other nets.",
                lifted)
        add("fit-part", f"Fit {pm.new_family} ({pm.new_package}) in the old footprint, pin 1 where {who}'s was"
                        + (" (a socket makes the lifted pins easier)." if lifted else "."))
        for lk in pm.moved_links:
            add("jumper", f"Jumper old pad {lk.old_pin} ({lk.old_name}, {lk.function}) to {pm.new_family} "
                          f"pin {lk.new_pin} ({lk.new_name}).", (lk.new_pin,))
    else:
        add("adapter", f"Footprint changes from {pm.old_package} to {pm.new_package}: mount {pm.new_family} on an "
                       f"adapter that plugs into the old {pm.old_package} pads (or on a small carrier near them) "
                       "and wire it as listed below.")
        for lk in sorted(pm.links, key=lambda x: x.new_pin):
            add("jumper", f"Old pad {lk.old_pin} ({lk.old_name}, {lk.function}) to {pm.new_family} pin "
                          f"{lk.new_pin} ({lk.new_name}).", (lk.new_pin,))

    for t in pm.ties:
        if pm.same_footprint and t not in pm.changed_ties:
            continue
        add("tie", f"Tie {pm.new_family} pin {t.new_pin} ({t.new_name}) to {t.level}: {t.why}.", (t.new_pin,))

    leave = [u for u in pm.unmatched if not u.blocking]
    if leave and not pm.same_footprint:
        add("isolate", "Leave unconnected (no counterpart): " + "; ".join(
            f"old pad {u.old_pin} ({u.old_name}): {u.what}" for u in leave) + ".",
            ())

    # values: the added resistor first (it carries the new R), then the changes
    changes = changed_values(old_values, new_values)
    for a in pm.additions:
        value = new_values.get("r") if a.role == "Rext" else None
        add("add", f"Add {a.role} {_fmt('resistance', value) if value else ''} between {a.between[0]} and "
                   f"{a.between[1]}: {a.why}.".replace("  ", " "), (), None, value)
        if a.role == "Rext":
            changes.pop("r", None)
    for key, (old_v, new_v) in changes.items():
        kind, label = VALUE_LABELS[key]
        if new_v is None or (new_v == 0 and key == "ra"):
            # RA = 0 is the one-resistor oscillator of a 555 without a discharge pin (MIC1555):
            # the resistor goes, it is not bridged by a 0 Ω link
            add("fit", f"Remove {label} {_fmt(kind, old_v)}: not used with {pm.new_family}.", (), old_v, None)
        elif old_v is None:
            add("fit", f"Fit {label} {_fmt(kind, new_v)}.", (), None, new_v)
        else:
            add("fit", f"Replace {label} {_fmt(kind, old_v)} with {_fmt(kind, new_v)}.", (), old_v, new_v)
    kept = [k for k in VALUE_LABELS if k not in changes and new_values.get(k) is not None]
    if kept and changes:
        add("keep", "Keep " + ", ".join(f"{VALUE_LABELS[k][1]} {_fmt(VALUE_LABELS[k][0], new_values[k])}"
                                        for k in kept) + ".")

    from advisor.substitute.classify import counts, open_dangers

    for f in findings:
        if f.rework and counts(f):
            add(f.rework_action or "fit", f.rework)
    pot = new_values.get("pot")
    if pot:
        add("set", _set_text(pot, new_values.get("pot_setting"), expected, adjust, mode))
    stop = open_dangers(list(findings))
    if stop:
        add("stop", "Do not power up: " + " ".join(dict.fromkeys(f.message for f in stop)))
        return steps
    add("check", _check_text(expected, mode))
    return steps


def _set_text(pot: float, setting: float | None, expected: dict | None, adjust: dict | None, mode: str) -> str:
    """Where to set a kept variable resistor (fraction of travel) and the range it gives."""
    q = "width" if mode == "mono" else "period"
    where = (f"{setting:.0%} of its travel ({_fmt('resistance', pot * setting)} in circuit)"
             if setting is not None else "the setting that gives the time on the scope")
    text = f"Set the variable resistor ({_fmt('resistance', pot)}) to {where}"
    if expected and expected.get(q):
        text += f" for about {format_eng(expected[q], 's', 3)}"
    if adjust and isinstance(adjust.get("min"), dict) and isinstance(adjust.get("max"), dict):
        lo, hi = adjust["min"].get(q), adjust["max"].get(q)
        if lo is not None and hi is not None:
            a, b = sorted((lo, hi))
            text += f"; its travel covers {format_eng(a, 's', 3)} to {format_eng(b, 's', 3)}"
    return text + "."


def _check_text(expected: dict | None, mode: str) -> str:
    if not expected:
        return "Power up and check the output on a scope."
    if mode == "astable" and expected.get("period"):
        text = f"Power up; the output should run at {format_eng(expected['period'], 's', 3)} period"
        if expected.get("duty") is not None:
            text += f", {expected['duty'] * 100:.1f} % high"
        return text + " (scope on the output)."
    if expected.get("width"):
        return (f"Power up; trigger the scope on the input (channel 1) and read the output pulse (channel 2): "
                f"about {format_eng(expected['width'], 's', 3)} wide.")
    return "Power up and check the output on a scope."
