"""How results are worded for a person: one home for the words every face shares.

The text CLI, the Markdown and HTML reports and the workbench all read their
trigger verdict, pin-function names, input levels, classes and findings order from
here, so a technician reads the same sentence wherever the result is shown. Nothing
here judges: the verdicts are the engine's (``trigger.divide_by``,
``trigger.stays_high``, the swap's ``class``, the findings' severities); this module
only puts them in words. The words are our own (common practice of the trade:
"falling-edge input", "held high", "tied to ground").
"""

from __future__ import annotations

from typing import Any, Iterable

from advisor.findings import SEVERITY_ORDER

# --------------------------------------------------------------------------- counting


def ordinal(n: int) -> str:
    """1st, 2nd, 3rd, 4th, 11th, 12th, 13th, 21st, 22nd, 101st, 111th."""
    suffix = "th" if 10 <= n % 100 <= 20 else {1: "st", 2: "nd", 3: "rd"}.get(n % 10, "th")
    return f"{n}{suffix}"


def every_nth(n: int | None, noun: str = "trigger") -> str:
    """"every trigger" for n = 1, "every 3rd trigger" otherwise."""
    if not n or n == 1:
        return f"every {noun}"
    return f"every {ordinal(n)} {noun}"


def percent(fraction: float, digits: int = 3) -> str:
    """0.05 -> "5 %" (a fraction of 0..1 as percent, with a space as SI writes it)."""
    return f"{fraction * 100:.{digits}g} %"


# --------------------------------------------------------------------------- pins and levels

#: Pin functions (advisor.parts.PinFunction) in a technician's words.
FUNCTION_WORDS: dict[str, str] = {
    "VCC": "supply", "GND": "ground", "NC": "not connected",
    "TRIG": "trigger input", "THRES": "threshold input", "DIS": "discharge pin", "OUT": "output",
    "RESET": "reset input", "CONT": "control-voltage pin",
    "TRIG_FALL": "falling-edge input", "TRIG_RISE": "rising-edge input", "CLEAR": "clear input",
    "Q": "output", "QN": "inverted output",
    "CEXT": "timing-capacitor pin", "RCEXT": "timing resistor and capacitor pin",
    "RINT": "internal timing resistor", "REXT": "timing-resistor pin",
    "ASTABLE": "astable enable", "ASTABLE_N": "astable enable (active low)", "RETRIGGER": "retrigger input",
    "OSC_OUT": "oscillator output", "RC_COMMON": "timing network common pin",
    "RS": "oscillator resistor pin", "RTC": "timing-resistor pin", "CTC": "timing-capacitor pin",
    "AUTO_RESET": "power-on reset enable", "MASTER_RESET": "master reset input",
    "PROG_A": "divider select A", "PROG_B": "divider select B", "MODE": "mode select", "QSEL": "output phase select",
    "OUT_C": "output transistor collector", "OUT_E": "output transistor emitter",
    "LOGIC": "output polarity select", "VREF": "reference output",
}


def function_words(function: str | None) -> str:
    """``TRIG_FALL`` -> "falling-edge input"; unknown names pass through in lower case."""
    if not function:
        return "pin"
    return FUNCTION_WORDS.get(function, function.replace("_", " ").lower())


#: A level an input is held at, as said at the bench.
LEVEL_WORDS = {"high": "held high", "low": "held low", "VCC": "tied to the supply", "GND": "tied to ground",
               "vcc": "tied to the supply", "gnd": "tied to ground"}


def level_words(level: Any) -> str:
    return LEVEL_WORDS.get(str(level), f"at {level}")


def pin_words(function: str | None, name: str | None = None, pin: Any = None) -> str:
    """"falling-edge input A (pin 1)": the function's words, the maker's label, the number."""
    text = function_words(function)
    label = str(name or "").strip()
    if label and label.upper() != str(function or "").upper():
        text += f" {label}"
    if pin is not None:
        text += f" (pin {pin})"
    return text


def enable_words(enable: Any, names: dict[str, str] | None = None) -> str:
    """Inputs that must sit at a level for a trigger to work, e.g. ``{"TRIG_RISE": "high",
    "CLEAR": "high"}`` -> "rising-edge input B held high, clear input held high".

    ``names`` maps a pin function to the part's own label (B, nRD) when known.
    """
    if not isinstance(enable, dict) or not enable:
        return ""
    names = names or {}
    return ", ".join(f"{pin_words(func, names.get(func))} {level_words(lvl)}" for func, lvl in enable.items())


# --------------------------------------------------------------------------- verdicts


def trigger_verdict(trigger: Any, *, short: bool = False) -> str:
    """What a trigger of the given period does, from the engine's verdict.

    ``trigger`` is the result's ``trigger`` JSON: ``stays_high`` (a retriggerable part
    restarted before its pulse ends), ``divide_by`` (n: every n-th trigger fires) and
    ``divide_by_range`` (the spread of n within tolerance). ``short`` drops the detail.
    """
    if not isinstance(trigger, dict):
        return ""
    n = trigger.get("divide_by")
    if trigger.get("stays_high"):
        text = "the output never falls: each trigger restarts the pulse before it ends"
    elif n == 1:
        text = "every trigger fires a pulse"
    elif isinstance(n, int) and n > 1:
        text = f"only {every_nth(n)} fires a pulse; the ones between arrive while the pulse runs and are ignored"
        if short:
            text = f"only {every_nth(n)} fires a pulse"
    else:
        return str(trigger.get("note") or "a trigger does not set this circuit's timing")
    rng = trigger.get("divide_by_range")
    if not short and isinstance(rng, (list, tuple)) and len(rng) == 2:
        text += f"; within tolerance anywhere from {every_nth(rng[0])} to {every_nth(rng[1])}"
    return text


#: Swap classes (the engine's ``class``) in words of our own.
CLASS_WORDS = {
    "drop-in": "fits the socket as it is",
    "drop-in-new-values": "fits the socket with new R/C values",
    "rewire": "needs rewiring (pins move)",
    "redesign": "needs a redesigned network",
    "unsuitable": "not suitable",
}


def part_words(answer: Any, family_key: str = "part") -> str:
    """A part as the user named it and as it was read: ``MM74HC123AN (74HC123, Fairchild)``;
    the bare family id when nothing was typed beyond it (a check or design answer's ``part``,
    a swap side's ``family``; ``part_number`` and ``maker`` from the same answer)."""
    family = str(_get(answer, family_key) or "?")
    typed, maker = _get(answer, "part_number"), _get(answer, "maker")
    if not typed:
        return family if not maker else f"{family} ({maker})"
    return f"{typed} ({family}" + (f", {maker})" if maker else ")")


def class_words(cls: Any) -> str:
    return CLASS_WORDS.get(str(cls), "")


# --------------------------------------------------------------------------- findings

#: Headings of the findings groups, most severe first.
SEVERITY_TITLES = {"danger": "Stop: must be fixed", "warning": "Check before fitting", "note": "Worth knowing"}
SEVERITIES = ("danger", "warning", "note")


def _get(f: Any, key: str) -> Any:
    return f.get(key) if isinstance(f, dict) else getattr(f, key, None)


def order_findings(findings: Iterable[Any]) -> list[Any]:
    """Most severe first; within a severity the replacement part's before the old part's,
    then by rule id, so every face lists them in the same order. Duplicates (same rule,
    part and message) are shown once."""
    seen: set[tuple] = set()
    out = []
    for f in findings or []:
        key = (_get(f, "rule"), _get(f, "part"), _get(f, "message"))
        if key in seen:
            continue
        seen.add(key)
        out.append(f)
    return sorted(out, key=lambda f: SEVERITY_ORDER.get(str(_get(f, "severity")), 9))


def group_findings(findings: Iterable[Any]) -> list[tuple[str, str, list[Any]]]:
    """(severity, heading, findings) for each severity present, most severe first."""
    ordered = order_findings(findings)
    groups = []
    for sev in SEVERITIES:
        items = [f for f in ordered if _get(f, "severity") == sev]
        if items:
            groups.append((sev, SEVERITY_TITLES[sev], items))
    return groups


def count_words(findings: Iterable[Any]) -> str:
    """"2 warnings, 1 note" or "no findings"."""
    items = order_findings(findings)
    if not items:
        return "no findings"
    parts = []
    for sev in SEVERITIES:
        n = sum(1 for f in items if _get(f, "severity") == sev)
        if n:
            parts.append(f"{n} {sev}{'s' if n != 1 else ''}")
    return ", ".join(parts)


# --------------------------------------------------------------------------- plain text

def plain(value: Any) -> str:
    """Any JSON value as words: lists joined, mappings as "key value", never a Python repr."""
    if value is None:
        return "—"
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, float):
        return f"{value:.4g}"
    if isinstance(value, (list, tuple)):
        return ", ".join(plain(v) for v in value)
    if isinstance(value, dict):
        return ", ".join(f"{str(k).replace('_', ' ')} {plain(v)}" for k, v in value.items())
    return str(value)


def new_pin_names(pin_map: Any) -> dict[str, str]:
    """Function -> the new part's own label on section 1, from a swap's pin map JSON."""
    names: dict[str, str] = {}
    if not isinstance(pin_map, dict):
        return names
    for key in ("links", "ties"):
        for item in pin_map.get(key) or []:
            if not isinstance(item, dict) or not item.get("function") or not item.get("new_name"):
                continue
            ch = item.get("new_channel", item.get("channel"))
            if ch in (None, 1):
                names.setdefault(str(item["function"]), str(item["new_name"]))
    return names


def edge_route(polarity: Any, pin_map: Any = None) -> str:
    """"the falling edge goes from A1 (pin 3) to 1A (pin 1), with rising-edge input 1B held
    high and clear input 1R̄D held high" from a swap's ``pin_map.polarity``."""
    if not isinstance(polarity, dict) or not polarity.get("edge"):
        return ""
    text = (f"the {polarity['edge']} edge goes from {polarity.get('old_input') or 'the old trigger input'} "
            f"to {polarity.get('new_input') or 'no input of the new part'}")
    if polarity.get("assumed"):
        text += " (edge assumed: give the trigger edge to be sure)"
    enable = enable_words(polarity.get("new_enable"), new_pin_names(pin_map))
    if enable:
        text += f", with {enable}"
    return text
