"""The report model: one result JSON dict (plus catalog sources) turned into plain data.

The reporters (HTML, Markdown) render this model and compute nothing about timing:
every number shown comes from the engine's ``to_json()`` dict, formatted once here
(:func:`quantity`) so the HTML, the Markdown and the tests agree on the text.

Input shapes follow the design guide's JSON contract (design.md, "Command line
contract"): ``check`` is a timing result, ``swap`` adds ``old``/``new``/``class``/
``pin_map``/``rework``, ``alternates`` has ``candidates``, ``bom`` has rows. Keys a
result does not carry are left out of the report, never invented.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from typing import Any

from advisor.findings import SEVERITY_ORDER
from advisor.presentation import every_nth
from advisor.values import format_code, format_eng

KINDS = ("check", "swap", "alternates", "bom")

#: Significant digits of every time, frequency and component value in a report.
DIGITS = 4

#: Cautions shown in every report (rule 4 of the project brief). General practice of
#: the trade; the maker's current datasheet and local codes always take precedence.
GENERAL_CAUTIONS = (
    "Switch the equipment off and unplug it before rework. Equipment with a mains input or a "
    "high-voltage section (CRT, valve, switch-mode supplies) holds dangerous charge after switch-off: "
    "discharge its reservoir capacitors safely, and leave such work to someone trained for it.",
    "Polarised (electrolytic or tantalum) capacitors fitted backwards, or run above their rated "
    "voltage, can heat, vent or burst: check the polarity mark against the board before power-up.",
    "Keep every supply, input and output inside the absolute maximum ratings of the fitted part; "
    "an input above its supply can latch a CMOS part up and destroy it.",
    "These figures come from published datasheets as recorded in the catalog. Defer to the maker's "
    "current datasheet for the exact part fitted, to local electrical codes and to licensed practice "
    "where they apply; check the new circuit on the bench before returning it to service.",
)

#: Values of 1 µF and above are usually electrolytic or tantalum (common practice).
POLARISED_FROM = 1e-6

_UNITS = {"width": "s", "high": "s", "low": "s", "period": "s", "frequency": "Hz", "duty": ""}
_VALUE_ROLES = {
    "r": ("R", "timing resistor", "resistance"),
    "ra": ("RA", "timing resistor RA", "resistance"),
    "rb": ("RB", "timing resistor RB", "resistance"),
    "pot": ("VR", "variable resistor", "resistance"),
    "c": ("C", "timing capacitor", "capacitance"),
}


@dataclass(frozen=True)
class Quantity:
    """One number as shown: SI value (for data attributes and tests) and its text."""

    label: str
    value: float | None
    unit: str
    text: str
    key: str = ""  # dotted path into the result JSON, e.g. "new.timing.nominal.width"


def quantity(label: str, value: Any, unit: str, key: str = "") -> Quantity:
    """Format ``value`` the one way every report uses (4 significant digits, SI prefix)."""
    if value is None or isinstance(value, bool) or not isinstance(value, (int, float)):
        return Quantity(label, None, unit, "—" if value is None else str(value), key)
    v = float(value)
    if unit == "":  # fractions (duty, setting) as percent
        return Quantity(label, v, unit, f"{v * 100:.{DIGITS}g} %", key)
    if unit == "%":
        return Quantity(label, v, unit, f"{v * 100:+.2f} %", key)
    if unit == "×":
        return Quantity(label, v, unit, f"{v:.{DIGITS}g}", key)
    return Quantity(label, v, unit, format_eng(v, unit, DIGITS), key)


@dataclass(frozen=True)
class NetItem:
    ref: str  # R, RA, RB, VR, C
    role: str
    value: float
    unit: str
    text: str  # engineering text, 4 significant digits
    code: str  # IEC 60062 value code: 4k7, 10n
    pins: tuple[str, ...] = ()  # "pin 15 (1Rext/Cext)"
    key: str = ""


@dataclass(frozen=True)
class Network:
    """The timing network to fit on one part (channel 1 of its first package)."""

    part: str
    mode: str  # "mono" or "astable"
    function: str  # catalog function (timer-555, monostable, ...) or "" when unknown
    items: tuple[NetItem, ...]
    vcc: float | None
    pot_setting: float | None
    package: str = ""
    pins: dict[str, list[tuple[int, str]]] = field(default_factory=dict)  # function -> [(pin, label)]
    #: Section-1 inputs held at a level: (function, "VCC" | "GND"), as the rework ties them.
    ties: tuple[tuple[str, str], ...] = ()
    trigger_in: str | None = None  # the function the trigger signal drives


@dataclass(frozen=True)
class Waves:
    """What the timing picture draws (times in s, taken from the result)."""

    kind: str  # "triggered" or "astable"
    period: float | None  # trigger period (triggered) or output period (astable)
    edge: str  # "rising" or "falling": the trigger's active edge
    triggers: tuple[float, ...]
    fired: tuple[bool, ...]  # one per trigger: did it start a pulse
    rows: tuple[tuple[str, tuple[tuple[float, float], ...], float | None], ...]  # name, high intervals, width
    end: float
    divide_by: int | None
    stays_high: bool
    note: str
    # A scope capture drawn beside the prediction (advisor.report.capture), times in s
    # from the capture's first trigger edge; None without a capture.
    measured: tuple[tuple[float, float], ...] | None = None  # the measured output's high intervals
    measured_name: str = "measured output"
    measured_width: float | None = None  # the capture's median width (the JSON's capture.width)
    # The captured trigger's pulses: intervals at its active level (low for a falling edge).
    trigger_pulses: tuple[tuple[float, float], ...] | None = None


@dataclass(frozen=True)
class CaptureView:
    """The capture behind the measurement, as the reports show it (from ``capture`` JSON)."""

    caption: str  # names the file, the channels and the thresholds
    facts: tuple[Quantity, ...]  # medians: width, period, delay
    edges: tuple[tuple[str, tuple[Quantity, ...]], ...]  # (channel and edge, times), keys capture.<ch>.<edge>.<i>


@dataclass(frozen=True)
class FindingView:
    severity: str
    rule: str
    message: str
    fix: str
    source: str
    part: str | None


@dataclass(frozen=True)
class SourceView:
    family: str
    id: str
    title: str
    document: str
    kind: str
    cited: bool  # referenced by a constant or finding in this result


@dataclass(frozen=True)
class Table:
    columns: tuple[str, ...]
    rows: tuple[tuple[str, ...], ...]


@dataclass
class Report:
    kind: str
    title: str
    lead: str
    verdict: str | None = None  # swap class
    facts: list[Quantity] = field(default_factory=list)  # headline numbers
    parts: list[tuple[str, list[Quantity]]] = field(default_factory=list)  # (heading, values)
    networks: list[Network] = field(default_factory=list)
    waves: Waves | None = None
    findings: list[FindingView] = field(default_factory=list)
    pin_map: Table | None = None
    rework: list[tuple[str, str]] = field(default_factory=list)  # (action, text), in order
    pin_tables: list[tuple[str, Table]] = field(default_factory=list)
    pin_notes: list[str] = field(default_factory=list)
    extra_tables: list[tuple[str, Table]] = field(default_factory=list)
    cautions: list[str] = field(default_factory=list)
    sources: list[SourceView] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)
    capture: CaptureView | None = None
    #: The timing picture as text lines (advisor.picture), for text reports; empty with a
    #: capture (drawn from the capture's window instead) or nothing to draw.
    picture: list[str] = field(default_factory=list)
    #: What the HTML timing diagram is drawn from (the result JSON and the wired edge).
    picture_source: tuple[dict, str | None] | None = None
    picture_caption: str = ""
    old_part: str = ""  # the fitted part (swap)
    trimmer: str = ""  # where to set the variable resistor, in words
    pin_moves_svg: str = ""  # the pin-move picture (advisor.report.pinmove), swaps only
    new_part: str = ""  # the checked part, or the replacement (swap)


# --------------------------------------------------------------------------- helpers


def _num(x: Any) -> float | None:
    return float(x) if isinstance(x, (int, float)) and not isinstance(x, bool) else None


def timing_quantities(timing: dict | None, prefix: str) -> list[Quantity]:
    """Nominal, min and max of every timing field present (width, or high/low/period/...)."""
    out: list[Quantity] = []
    if not isinstance(timing, dict):
        return out
    nominal = timing.get("nominal") or {}
    for name, unit in _UNITS.items():
        if name not in nominal:
            continue
        for corner in ("nominal", "min", "max"):
            block = timing.get(corner) or {}
            if name in block:
                label = name.replace("frequency", "frequency") + ("" if corner == "nominal" else f" ({corner})")
                out.append(quantity(label, block[name], unit, f"{prefix}timing.{corner}.{name}"))
    return out


def network_items(values: dict | None, prefix: str = "") -> list[NetItem]:
    out: list[NetItem] = []
    for key, (ref, role, kind) in _VALUE_ROLES.items():
        v = _num((values or {}).get(key))
        if v is None or (key == "pot" and v == 0):
            continue
        unit = "Ω" if kind == "resistance" else "F"
        if key == "r" and (values or {}).get("r_internal"):
            role = "internal timing resistor (on the chip: fit nothing)"
        out.append(NetItem(ref, role, v, unit, format_eng(v, unit, DIGITS), format_code(v, kind), (), f"{prefix}values.{key}"))
    return out


def _family(catalog: Any, fid: str | None) -> Any:
    if catalog is None or not fid:
        return None
    try:
        return catalog.get(fid)
    except Exception:  # unknown id: the report still renders from the JSON alone
        return None


def _pin_label(fam: Any, pin: int) -> str:
    for p in fam.default_package().pins:
        if p.pin == pin:
            return p.name
    return ""


#: Which pins each network item connects to, by normalised pin function.
_ITEM_PINS = {
    ("timer-555", "mono"): {"R": ("VCC", "DIS", "THRES"), "VR": ("DIS", "THRES"), "C": ("THRES", "GND")},
    ("timer-555", "astable"): {"RA": ("VCC", "DIS"), "RB": ("DIS", "THRES"), "VR": ("THRES", "TRIG"), "C": ("THRES", "TRIG", "GND")},
    ("one-shot", "mono"): {"R": ("VCC", "RCEXT", "REXT"), "VR": ("RCEXT", "REXT"), "C": ("CEXT", "RCEXT", "RC_COMMON")},
    # a 555 with no DISCHARGE pin (MIC1555): the resistor is fed from OUT (Micrel May 2010, Figures 1 and 3)
    ("555-from-out", "mono"): {"R": ("OUT", "THRES"), "VR": ("OUT", "THRES"), "C": ("THRES", "GND")},
    ("555-from-out", "astable"): {"RB": ("OUT", "THRES", "TRIG"), "VR": ("OUT", "THRES"), "C": ("THRES", "TRIG", "GND")},
}


def build_network(values: dict | None, part: str | None, mode: str | None, catalog: Any, prefix: str = "",
                  *, pin_map: Any = None, edge: str | None = None) -> Network | None:
    items = network_items(values, prefix)
    if not items or not part:
        return None
    fam = _family(catalog, part)
    function = fam.function if fam is not None else ""
    mode = mode or ("astable" if any(i.ref in ("RA", "RB") for i in items) else "mono")
    pins: dict[str, list[tuple[int, str]]] = {}
    package = ""
    if fam is not None and fam.packages:
        pkg = fam.default_package()
        package = pkg.name
        for func, nums in pkg.by_function(1).items():
            pins[func] = [(n, _pin_label(fam, n)) for n in nums]
    from_out = function == "timer-555" and fam is not None and fam.has_discharge() is False
    shape = ("555-from-out" if from_out else "timer-555", mode) if function == "timer-555" else ("one-shot", "mono")
    wiring = _ITEM_PINS.get(shape, {})
    placed = []
    for it in items:
        if from_out and it.ref == "RA" and not it.value:
            continue  # RA = 0: the one-resistor oscillator has no RA to fit
        where = []
        for func in wiring.get(it.ref, ()):
            for n, label in pins.get(func, []):
                where.append(f"pin {n} ({label or func})")
            if func in ("VCC", "GND") and func not in pins:
                where.append(func)
        placed.append(NetItem(it.ref, it.role, it.value, it.unit, it.text, it.code, tuple(where), it.key))
    ties, trigger_in = _ties(fam, function, mode, pin_map, edge)
    return Network(part, mode, function, tuple(placed), _num((values or {}).get("vcc")),
                   _num((values or {}).get("pot_setting")), package, pins, ties, trigger_in)


def _ties(fam: Any, function: str, mode: str, pin_map: Any, edge: str | None) -> tuple[tuple[tuple[str, str], ...], str | None]:
    """Section-1 ties and the trigger's input: the swap's own ties when it has a pin map,
    else the enable levels of the part's input for the wired edge (a 555's RESET held
    high, common practice)."""
    if function == "timer-555":
        has_reset = fam is None or not fam.packages or any(p.function == "RESET" for p in fam.default_package().pins)
        return ((("RESET", "VCC"),) if has_reset else ()), ("TRIG" if mode != "astable" else None)
    ties: list[tuple[str, str]] = []
    trigger_in = None
    if isinstance(pin_map, dict) and isinstance(pin_map.get("ties"), list):
        for t in pin_map["ties"]:
            if isinstance(t, dict) and t.get("channel") in (1, None) and t.get("function"):
                ties.append((str(t["function"]), "GND" if str(t.get("level")).upper() in ("GND", "LOW") else "VCC"))
        pol = pin_map.get("polarity")
        if isinstance(pol, dict) and pol.get("new_input"):
            trigger_in = "TRIG_FALL" if pol.get("edge") == "falling" else "TRIG_RISE"
        return tuple(ties), trigger_in
    if fam is None or not fam.behaviour.triggers:
        return (), None
    wanted = {"falling": ("falling", "level-low"), "rising": ("rising", "level-high")}.get(edge or "", ())
    trig = next((t for t in fam.behaviour.triggers if t.edge in wanted), fam.behaviour.triggers[0])
    for func, level in trig.enable.items():
        ties.append((func, "VCC" if level == "high" else "GND"))
    return tuple(ties), trig.function


def build_waves(timing: dict | None, trigger: dict | None, *, mode: str | None, name: str,
                old: tuple[str, dict | None, dict | None] | None = None, edge: str | None = None) -> Waves | None:
    """The picture's content: trigger instants and output high intervals from the result.

    Nothing is simulated here: which triggers start a pulse follows the result's
    ``trigger.divide_by`` (every n-th) and ``trigger.stays_high``; pulse lengths are the
    result's nominal width (or high/low times for an astable).
    """
    nominal = (timing or {}).get("nominal") or {}
    if mode == "astable" or ("high" in nominal and "low" in nominal and "width" not in nominal):
        high, low = _num(nominal.get("high")), _num(nominal.get("low"))
        if not high or not low:
            return None
        period = high + low
        rows = ((name, tuple((k * period, k * period + high) for k in range(3)), high),)
        return Waves("astable", period, "rising", (), (), rows, 3 * period, None, False,
                     "Three periods of the output at the nominal high and low times.")
    width = _num(nominal.get("width"))
    if not width:
        return None
    trig = trigger or {}
    period = _num(trig.get("period"))
    edge = trig.get("edge") or edge or "rising"
    if not period:
        rows = [(name, ((0.0, width),), width)]
        if old and _num(((old[1] or {}).get("nominal") or {}).get("width")):
            ow = _num(old[1]["nominal"]["width"])
            rows.insert(0, (old[0], ((0.0, ow),), ow))
        end = 1.5 * max(r[2] for r in rows)
        return Waves("triggered", None, edge, (0.0,), (True,), tuple(rows), end, None, False,
                     "One trigger and the pulse it starts (the result carries no trigger analysis for this part).")

    def pattern(tr: dict) -> tuple[bool, int | None]:
        """(stays_high, divide_by) as the result states them."""
        n = tr.get("divide_by")
        ok = isinstance(n, (int, float)) and not isinstance(n, bool) and n >= 1
        return bool(tr.get("stays_high")), int(n) if ok else None

    stays, n = pattern(trig)
    count = 8 if (stays or not n) else max(6, min(24, 2 * n + 2))
    end = count * period
    triggers = tuple(k * period for k in range(count))
    if stays:
        fired = tuple(True for _ in range(count))  # each trigger restarts the running pulse
        intervals: tuple[tuple[float, float], ...] = ((0.0, end),)
        note = ("Every trigger arrives before the pulse ends, so a retriggerable part restarts its "
                "pulse each time and the output never falls.")
    else:
        step = n or 1
        fired = tuple(k % step == 0 for k in range(count))
        intervals = tuple((t, min(t + width, end)) for t, f in zip(triggers, fired) if f)
        note = ("Every trigger starts a pulse." if step == 1 else
                f"The pulse outlasts the trigger period: only {every_nth(step)} starts a pulse; "
                "the triggers in between are ignored.")
    rows = [(name, intervals, width)]
    if old is not None:
        oname, otiming, otrig = old
        ow = _num(((otiming or {}).get("nominal") or {}).get("width"))
        if ow and otrig and ("divide_by" in otrig or "stays_high" in otrig):
            ostays, on = pattern(otrig)
            if ostays:
                oint: tuple[tuple[float, float], ...] = ((0.0, end),)
            else:
                ostep = on or 1
                oint = tuple((t, min(t + ow, end)) for k, t in enumerate(triggers) if k % ostep == 0)
            rows.insert(0, (oname, oint, ow))
        elif ow:
            rows.insert(0, (oname, ((0.0, min(ow, end)),), ow))
            note += " The fitted part's row shows its first pulse only (its trigger analysis is not in the result)."
    return Waves("triggered", period, edge, triggers, fired, tuple(rows), end, n, stays, note)


def findings_of(items: list | None) -> list[FindingView]:
    out = []
    for f in items or []:
        if not isinstance(f, dict):
            continue
        out.append(FindingView(str(f.get("severity", "note")), str(f.get("rule", "")), str(f.get("message", "")),
                               str(f.get("fix") or ""), str(f.get("source") or ""), f.get("part")))
    out.sort(key=lambda f: SEVERITY_ORDER.get(f.severity, 9))
    return out


def _text(v: Any) -> str:
    if v is None:
        return ""
    if isinstance(v, float):
        return f"{v:.{DIGITS}g}"
    if isinstance(v, (list, tuple)):
        return ", ".join(_text(x) for x in v)
    if isinstance(v, dict):
        return "; ".join(f"{k}: {_text(x)}" for k, x in v.items())
    return str(v)


def table_of(rows: Any, preferred: tuple[str, ...] = ()) -> Table | None:
    """A list of flat dicts (or a dict of channel -> list/dict) as a text table."""
    if isinstance(rows, dict):
        flat = []
        for ch, val in rows.items():
            if isinstance(val, list):
                flat += [{"channel": ch, **r} if isinstance(r, dict) else {"channel": ch, "map": r} for r in val]
            elif isinstance(val, dict):
                flat += [{"channel": ch, "from": k, "to": v} for k, v in val.items()]
            else:
                flat.append({"channel": ch, "to": val})
        rows = flat
    if not isinstance(rows, list) or not rows:
        return None
    cols: list[str] = [c for c in preferred if any(isinstance(r, dict) and c in r for r in rows)]
    for r in rows:
        if isinstance(r, dict):
            cols += [k for k in r if k not in cols]
    if not cols:
        return Table(("item",), tuple((_text(r),) for r in rows))
    return Table(tuple(cols), tuple(tuple(_text(r.get(c)) if isinstance(r, dict) else "" for c in cols) for r in rows))


def rework_steps(steps: Any) -> list[tuple[str, str]]:
    """Ordered (action, text) pairs: the engine's steps ``{n, action, detail, ...}`` or plain text."""
    out = []
    for s in steps or []:
        if isinstance(s, str):
            out.append(("", s))
        elif isinstance(s, dict):
            text = s.get("detail") or s.get("text") or s.get("step") or s.get("message") or _text(s)
            out.append((str(s.get("action") or ""), str(text)))
        else:
            out.append(("", _text(s)))
    return out


def pin_tables(pm: Any) -> tuple[Table | None, list[tuple[str, Table]], list[str]]:
    """The swap's pin map as (moves table, further tables, notes).

    Understands the substitute engine's shape (``links``, ``ties``, ``unmatched``,
    ``additions``, ``polarity``, ``notes``); anything else becomes a generic table.
    """
    if not isinstance(pm, dict) or "links" not in pm:
        return table_of(pm, ("channel", "function", "old_pin", "new_pin", "old", "new", "note")), [], []

    def pin(n: Any, name: Any) -> str:
        return f"{n} ({name})" if name else str(n)

    def ch(a: Any, b: Any = None) -> str:
        if a is None and b is None:
            return "shared"
        return str(a) if b in (None, a) else f"{a} → {b}"

    from advisor.presentation import function_words

    rows = tuple((ch(l.get("old_channel"), l.get("new_channel")), function_words(l.get("function")),
                  pin(l.get("old_pin"), l.get("old_name")), pin(l.get("new_pin"), l.get("new_name")),
                  "yes" if l.get("moved") else "no", str(l.get("note") or ""))
                 for l in pm.get("links") or [] if isinstance(l, dict))
    head = ("section", "function", f"old pin ({pm.get('old_package', '')})", f"new pin ({pm.get('new_package', '')})", "moves", "note")
    if not any(r[5] for r in rows):  # no link carries a note: leave the empty column out
        rows, head = tuple(r[:5] for r in rows), head[:5]
    links = Table(head, rows)
    more: list[tuple[str, Table]] = []
    ties = [t for t in pm.get("ties") or [] if isinstance(t, dict)]
    if ties:
        more.append(("Inputs to tie", Table(("new pin", "section", "to", "why"), tuple(
            (pin(t.get("new_pin"), t.get("new_name")), ch(t.get("channel")), str(t.get("level", "")), str(t.get("why", "")))
            for t in ties))))
    un = [u for u in pm.get("unmatched") or [] if isinstance(u, dict)]
    if un:
        more.append(("Old pins with no counterpart", Table(("old pin", "function", "what to do", "blocks the swap"), tuple(
            (pin(u.get("old_pin"), u.get("old_name")), function_words(u.get("function")), str(u.get("what", "")),
             "yes" if u.get("blocking") else "no") for u in un))))
    adds = [a for a in pm.get("additions") or [] if isinstance(a, dict)]
    if adds:
        more.append(("Parts to add", Table(("part", "role", "between", "why"), tuple(
            (str(a.get("what", "")), str(a.get("role", "")), " and ".join(map(str, a.get("between") or [])), str(a.get("why", "")))
            for a in adds))))
    notes = []
    pol = pm.get("polarity")
    if isinstance(pol, dict) and pol.get("old_input"):
        notes.append(f"Trigger: the {pol.get('edge') or 'active'} edge on {pol['old_input']} goes to {pol.get('new_input') or '—'}"
                     + (" (edge assumed)" if pol.get("assumed") else "") + ".")
        if pol.get("note"):
            notes.append(str(pol["note"]))
    notes += [str(n) for n in pm.get("notes") or []]
    if "same_footprint" in pm:
        notes.append(f"Package {pm.get('old_package', '?')} → {pm.get('new_package', '?')}: "
                     + ("same footprint." if pm.get("same_footprint") else "the footprint changes."))
    return links, more, notes


def _cited_ids(result: dict) -> set[str]:
    ids: set[str] = set()

    def walk(o: Any) -> None:
        if isinstance(o, dict):
            for k, v in o.items():
                if k in ("source", "sources"):
                    for s in (v if isinstance(v, list) else [v]):
                        if isinstance(s, str):
                            ids.add(s)
                        elif isinstance(s, dict) and "id" in s:
                            ids.add(str(s["id"]))
                else:
                    walk(v)
        elif isinstance(o, list):
            for v in o:
                walk(v)

    walk(result)
    return ids


def sources_of(result: dict, families: list[str], catalog: Any) -> list[SourceView]:
    cited = _cited_ids(result)
    out: list[SourceView] = []
    seen: set[tuple[str, str]] = set()
    for fid in families:
        fam = _family(catalog, fid)
        if fam is None:
            continue
        for s in fam.sources:
            if (fam.id, s.id) in seen:
                continue
            seen.add((fam.id, s.id))
            # Findings cite sources by title, constants by id: either counts.
            hit = s.id in cited or any(s.title in c for c in cited)
            out.append(SourceView(fam.id, s.id, s.title, s.document or "", s.kind, hit))
    if "memory" in cited:
        out.append(SourceView("", "memory", "Recalled value, not confirmed by a published source", "", "memory", True))
    return out


def _cautions(families: list[str], catalog: Any, nets: list[Network]) -> list[str]:
    out = list(GENERAL_CAUTIONS)
    for fid in families:
        fam = _family(catalog, fid)
        if fam is not None:
            out += [f"{fam.id}: {c}" for c in fam.cautions]
            if fam.components.electrolytic:
                out.append(f"{fam.id}, electrolytic timing capacitor: {fam.components.electrolytic}")
    for net in nets:
        for it in net.items:
            if it.ref == "C" and it.value >= POLARISED_FROM:
                out.append(f"The {it.text} timing capacitor on the {net.part} is likely electrolytic or tantalum: "
                           "mind its polarity and voltage rating, and its leakage, which lengthens or stops the pulse.")
    return out


# --------------------------------------------------------------------------- kinds


def _check(result: dict, catalog: Any) -> Report:
    part = str(result.get("part", "?"))
    mode = result.get("mode")
    rep = Report("check", f"Timing check: {part}", "", new_part=part)
    rep.facts = timing_quantities(result.get("timing"), "")
    values = result.get("values") or {}
    rep.parts.append((f"{part} as fitted", [quantity(i.ref, i.value, i.unit, i.key) for i in network_items(values)]
                      + ([quantity("supply", values["vcc"], "V", "values.vcc")] if _num(values.get("vcc")) else [])))
    _extras(rep, result, "")
    net = build_network(values, part, mode, catalog, edge=(result.get("trigger") or {}).get("edge")
                        if isinstance(result.get("trigger"), dict) else _catalog_edge(catalog, part))
    rep.networks = [net] if net else []
    rep.waves = build_waves(result.get("timing"), result.get("trigger"), mode=mode, name=f"{part} output",
                            edge=_catalog_edge(catalog, part))
    _with_capture(rep, result.get("capture"), result.get("timing"), result.get("trigger"), mode=mode,
                  name=f"{part} output")
    rep.findings = findings_of(result.get("findings"))
    _with_picture(rep, result, _catalog_edge(catalog, part))
    nom = ((result.get("timing") or {}).get("nominal") or {})
    first = rep.facts[0].text if rep.facts else "no timing"
    rep.lead = f"{part} ({mode or 'mono'}): nominal {('width ' if 'width' in nom else 'high time ')}{first}; " \
               f"{_count(rep.findings)}."
    rep.cautions = _cautions([part], catalog, rep.networks)
    rep.sources = sources_of(result, [part], catalog)
    return rep


def _with_capture(rep: Report, capture: Any, timing: dict | None, trigger: dict | None, *, mode: str | None,
                  name: str, old: tuple | None = None, fitted: str | None = None) -> None:
    """A scope capture in the result: the picture over its window with the measured row,
    its medians among the facts, its caption and edge times (advisor.report.capture)."""
    from advisor.report.capture import capture_view, measured_waves

    view = capture_view(capture, fitted=fitted)
    if view is None:
        return
    waves = measured_waves(capture, timing, trigger, mode=mode, name=name, old=old)
    if waves is not None:
        rep.waves = waves
    rep.capture = view
    rep.facts.extend(view.facts)


#: Width of the text picture in a Markdown report (fits a printed page in a monospace font).
PICTURE_COLUMNS = 78


def _with_picture(rep: Report, result: dict, edge: str | None) -> None:
    """The text picture of ``result`` (one renderer: advisor.picture), unless a capture is drawn."""
    if rep.capture is not None:
        return
    from advisor.picture import picture_rows, render_lines

    rep.picture = render_lines(picture_rows(result, PICTURE_COLUMNS, edge=edge))
    if rep.picture:
        rep.picture_source = (result, edge)
        from advisor.presentation import trigger_verdict

        trig = result.get("trigger") or ((result.get("new") or {}).get("trigger") if isinstance(result.get("new"), dict) else None)
        rep.picture_caption = (f"triggers every {format_eng(trig['period'], 's', 4)}: {trigger_verdict(trig)}."
                               if isinstance(trig, dict) and _num(trig.get("period")) else
                               "one trigger and the pulse it starts (no trigger period given).")


def _catalog_edge(catalog: Any, fid: str | None) -> str | None:
    """The active edge of the family's first trigger input (a 555's TRIG fires going low)."""
    fam = _family(catalog, fid)
    if fam is None or not fam.behaviour.triggers:
        return None
    edge = fam.behaviour.triggers[0].edge
    return {"level-low": "falling", "level-high": "rising"}.get(edge, edge)


def _extras(rep: Report, result: dict, prefix: str) -> None:
    """Adjustment range, target, calibration, trigger and tolerances as facts."""
    adj = result.get("adjust")
    if isinstance(adj, dict):
        for end in ("min", "max"):
            for name, unit in _UNITS.items():
                if name in (adj.get(end) or {}):
                    rep.facts.append(quantity(f"{name} at {end} of travel", adj[end][name], unit, f"{prefix}adjust.{end}.{name}"))
    tgt = result.get("target")
    if isinstance(tgt, dict):
        unit = "Hz" if (tgt.get("quantity") or tgt.get("kind")) in ("freq", "frequency") else "s"
        rep.facts.append(quantity("target", tgt.get("value"), unit, f"{prefix}target.value"))
        reach = tgt.get("reachable")
        setting = tgt.get("setting")
        rep.notes.append("The target is " + ("reachable" if reach else "not reachable")
                         + (f" at {setting * 100:.3g} % of the variable resistor's travel." if _num(setting) is not None else "."))
    cal = result.get("calibration")
    if isinstance(cal, dict) and _num(cal.get("factor")):
        rep.facts.append(quantity("calibration factor", cal["factor"], "×", f"{prefix}calibration.factor"))
        rep.notes.append(f"Times are scaled by the measured/predicted ratio of the {cal.get('quantity', 'measured')} "
                         f"({cal['factor']:.{DIGITS}g}).")
    trig = result.get("trigger")
    if isinstance(trig, dict) and _num(trig.get("period")):
        rep.facts.append(quantity("trigger period", trig["period"], "s", f"{prefix}trigger.period"))
        if trig.get("stays_high"):
            rep.notes.append("With this trigger period the output never falls (the part restarts its pulse on every trigger).")
        elif isinstance(trig.get("divide_by"), int) and trig["divide_by"] > 1:
            rep.notes.append(f"With this trigger period only {every_nth(trig['divide_by'])} starts a pulse.")
    tol = result.get("tolerances")
    if isinstance(tol, dict) and (_num(tol.get("r_tol")) is not None or _num(tol.get("c_tol")) is not None):
        d = tol.get("defaulted")
        assumed = [k for k in ("r_tol", "c_tol") if (d.get(k) if isinstance(d, dict) else d)]
        rep.notes.append(
            f"Worst-case band from resistor ±{(tol.get('r_tol') or 0) * 100:.3g} %"
            + (" (assumed)" if "r_tol" in assumed else "")
            + f" and capacitor ±{(tol.get('c_tol') or 0) * 100:.3g} %" + (" (assumed)" if "c_tol" in assumed else "")
            + ", plus the spread of the published constants.")
    rep.notes += [str(a) for a in result.get("assumptions") or [] if str(a) not in rep.notes]


def _trimmer(target: Any, values: Any) -> str:
    """Where the variable resistor goes: the target's setting, else the one computed with."""
    pot = _num((values or {}).get("pot")) if isinstance(values, dict) else None
    if not pot:
        return ""
    code = format_code(pot, "resistance")
    if isinstance(target, dict) and _num(target.get("setting")) is not None:
        return (f"set the {code} trimmer to {target['setting'] * 100:.3g} % of its travel for the target "
                f"(then trim on the scope).")
    setting = _num((values or {}).get("pot_setting"))
    if setting is not None:
        return f"the {code} trimmer was computed at {setting * 100:.3g} % of its travel; trim on the scope."
    return f"the {code} trimmer: trim on the scope for the wanted pulse."


def _count(findings: list[FindingView]) -> str:
    if not findings:
        return "no findings"
    by = {s: sum(1 for f in findings if f.severity == s) for s in ("danger", "warning", "note")}
    return ", ".join(f"{n} {s}{'s' if n != 1 else ''}" for s, n in by.items() if n)


def _swap(result: dict, catalog: Any) -> Report:
    old = result.get("old") or {}
    new = result.get("new") or {}
    ofam, nfam = str(old.get("family", "?")), str(new.get("family", "?"))
    cls = result.get("class")
    rep = Report("swap", f"Replacing {ofam} with {nfam}", "", verdict=cls, old_part=ofam, new_part=nfam)
    rep.facts = timing_quantities(new.get("timing"), "new.")
    for label, side, pre in ((f"{ofam} (fitted now)", old, "old."), (f"{nfam} (replacement)", new, "new.")):
        vals = side.get("values") or {}
        qs = [quantity(i.ref, i.value, i.unit, i.key) for i in network_items(vals, pre)]
        if _num(vals.get("vcc")):
            qs.append(quantity("supply", vals["vcc"], "V", f"{pre}values.vcc"))
        qs += timing_quantities(side.get("timing"), pre)
        rep.parts.append((label, qs))
    _extras(rep, {k: result.get(k) for k in ("adjust", "target", "calibration", "trigger", "tolerances")}, "")
    mode = new.get("mode") or result.get("mode")
    nets = [build_network(new.get("values"), nfam, mode, catalog, "new.", pin_map=result.get("pin_map"))]
    rep.networks = [n for n in nets if n]
    trig = result.get("trigger") or new.get("trigger")
    pol = (result.get("pin_map") or {}).get("polarity") if isinstance(result.get("pin_map"), dict) else None
    edge = (pol.get("edge") if isinstance(pol, dict) else None) or _catalog_edge(catalog, nfam)
    rep.waves = build_waves(new.get("timing"), trig, mode=mode, name=f"{nfam} output",
                            old=(f"{ofam} output", old.get("timing"), old.get("trigger")), edge=edge)
    _with_capture(rep, result.get("capture"), new.get("timing"), trig, mode=mode, name=f"{nfam} output",
                  old=(f"{ofam} output", old.get("timing"), old.get("trigger")), fitted=ofam)
    rep.findings = findings_of(result.get("findings"))
    _with_picture(rep, result, edge)
    rep.pin_map, rep.pin_tables, rep.pin_notes = pin_tables(result.get("pin_map"))
    rep.rework = rework_steps(result.get("rework"))
    from advisor.report.pinmove import pin_moves, pin_moves_svg

    moves = pin_moves(result, catalog)
    rep.pin_moves_svg = pin_moves_svg(moves) if moves is not None else ""
    rep.trimmer = _trimmer(result.get("target"), new.get("values"))
    rep.notes[:0] = [str(r) for r in result.get("reasons") or []]
    rep.notes.append(f"Lifecycle: {ofam} {old.get('status') or 'unknown'}, {nfam} {new.get('status') or 'unknown'}.")
    kept = result.get("kept")
    if isinstance(kept, dict) and kept.get("quantity") in _UNITS:
        q = kept["quantity"]
        rep.facts.insert(0, quantity(f"{q} to keep ({kept.get('basis', 'old circuit')})", kept.get("value"), _UNITS[q], "kept.value"))
    if _num(result.get("error")) is not None:
        rep.facts.append(quantity("error against the kept value", result["error"], "%", "error"))
    rep.notes += [str(a) for a in result.get("assumptions") or []]
    nomw = [q for q in rep.facts if q.key.endswith("nominal.width") or q.key.endswith("nominal.period")]
    rep.lead = (f"{nfam} in place of {ofam}: {cls or 'unclassified'}"
                + (f"; new nominal {nomw[0].label} {nomw[0].text}" if nomw else "") + f"; {_count(rep.findings)}; "
                f"{len(rep.rework)} bench step{'s' if len(rep.rework) != 1 else ''}.")
    rep.cautions = _cautions([ofam, nfam], catalog, rep.networks)
    rep.sources = sources_of(result, [ofam, nfam], catalog)
    return rep


def _alternates(result: dict, catalog: Any) -> Report:
    old = result.get("old") or {}
    ofam = str(old.get("family", old.get("part", "?")) if isinstance(old, dict) else old)
    cands = [c for c in result.get("candidates") or [] if isinstance(c, dict)]
    rep = Report("alternates", f"Alternatives for {ofam}", "")
    rows = []
    for rank, c in enumerate(cands, 1):
        new = c.get("new") if isinstance(c.get("new"), dict) else {}
        timing = c.get("timing") or new.get("timing") or {}
        nom = timing.get("nominal") or {}
        main = next((quantity(k, nom[k], _UNITS[k]).text for k in ("width", "period") if k in nom), "")
        values = c.get("values") or new.get("values") or {}
        vals = " ".join(f"{i.ref} {i.code}" for i in network_items(values))
        err = _num(c.get("error"))
        rows.append((str(rank), str(c.get("family", "?")), str(c.get("class", "")), main, vals,
                     "" if err is None else f"{err * 100:+.2f} %",
                     str(len(c.get("rework") or [])) if "rework" in c else str(c.get("rework_steps", "")),
                     _count(findings_of(c.get("findings")))))
    rep.extra_tables.append(("Ranked candidates", Table(
        ("rank", "family", "class", "nominal", "values", "timing error", "bench steps", "findings"), tuple(rows))))
    rep.parts.append((f"{ofam} (fitted now)", [quantity(i.ref, i.value, i.unit, i.key) for i in network_items(old.get("values"), "old.")]
                      + timing_quantities(old.get("timing"), "old.")) if isinstance(old, dict) else ("", []))
    if cands:  # pictures for the best candidate
        best = cands[0]
        new = best.get("new") if isinstance(best.get("new"), dict) else {}
        fam = str(best.get("family", "?"))
        mode = new.get("mode") or best.get("mode")
        net = build_network(best.get("values") or new.get("values"), fam, mode, catalog, "candidates.0.")
        rep.networks = [net] if net else []
        rep.waves = build_waves(best.get("timing") or new.get("timing"), best.get("trigger") or new.get("trigger"),
                                mode=mode, name=f"{fam} output",
                                old=(f"{ofam} output", old.get("timing"), old.get("trigger")) if isinstance(old, dict) else None)
        rep.findings = findings_of(best.get("findings"))
        if isinstance(best.get("pin_map"), dict):
            rep.pin_map, rep.pin_tables, rep.pin_notes = pin_tables(best["pin_map"])
        elif isinstance(best.get("pairs"), dict):
            rep.pin_map = Table(("old pin", "new pin"), tuple((str(k), str(v)) for k, v in best["pairs"].items()))
        rep.rework = rework_steps(best.get("rework"))
        rep.notes.append(f"Pictures, findings and bench steps below are for the first candidate, {fam}.")
    rep.notes += [f"{i}. {c.get('family')} ({c.get('status') or 'unknown'}): {c['rank_reason']}"
                  for i, c in enumerate(cands, 1) if c.get("rank_reason")]
    rep.notes += [str(a) for a in result.get("assumptions") or [] if str(a) not in rep.notes]
    rep.lead = f"{len(cands)} candidate{'s' if len(cands) != 1 else ''} for {ofam}" + (
        f"; best: {cands[0].get('family')} ({cands[0].get('class')})." if cands else ".")
    fams = [ofam] + [str(c.get("family")) for c in cands[:1]]
    rep.cautions = _cautions(fams, catalog, rep.networks)
    rep.sources = sources_of(result, fams, catalog)
    return rep


def _bom(result: dict, catalog: Any) -> Report:
    """BOM review: the summary by status, then every line (its part cell, status,
    family, best alternate and key findings); findings of every line by severity."""
    rows = [r for r in result.get("rows") or [] if isinstance(r, dict)]
    src = result.get("file")
    rep = Report("bom", "Bill of materials review" + (f": {str(src).rsplit('/', 1)[-1]}" if src else ""), "")
    summary = result.get("summary")
    if isinstance(summary, dict):
        rep.extra_tables.append(("Lines by status", Table(("status", "lines"), tuple((str(k), _text(v)) for k, v in summary.items()))))
    pcol = result.get("part_column")
    table_rows = []
    for r in rows:
        cells = r.get("cells") if isinstance(r.get("cells"), dict) else {}
        part = str(cells.get(pcol, "")) if isinstance(pcol, str) else ""
        alts = "; ".join(f"{a.get('family')} ({a.get('class')})" for a in r.get("alternates") or [] if isinstance(a, dict))
        score = _num(r.get("score"))
        table_rows.append((str(r.get("line", "")), part, str(r.get("status") or ""), str(r.get("family") or ""),
                           "" if score is None else f"{score:.0f}", alts,
                           _count(findings_of(r.get("findings") if isinstance(r.get("findings"), list) else [])),
                           str(r.get("reason") or "")))
    rep.extra_tables.append(("Every line", Table(
        ("line", f"part ({pcol})" if isinstance(pcol, str) else "part", "status", "family", "match score",
         "alternates (class)", "findings", "reason"), tuple(table_rows))))
    fams = sorted({str(r.get("family")) for r in rows if r.get("family")})
    seen: set[tuple] = set()
    for r in rows:
        ref = str(r.get("ref") or f"line {r.get('line', '?')}")
        for f in findings_of(r.get("findings") if isinstance(r.get("findings"), list) else []):
            key = (ref, f.rule, f.part, f.message)
            if key not in seen:  # a BOM repeats lines: show each finding once per line
                seen.add(key)
                rep.findings.append(replace(f, message=f"{ref}: {f.message}"))
    rep.findings.sort(key=lambda f: SEVERITY_ORDER.get(f.severity, 9))
    if _num(result.get("new_vcc")):
        rep.facts.append(quantity("new supply", result["new_vcc"], "V", "new_vcc"))
    rep.lead = (f"{len(rows)} line{'s' if len(rows) != 1 else ''} reviewed; {len(fams)} timer or one-shot "
                f"famil{'ies' if len(fams) != 1 else 'y'} recognised; {_count(rep.findings)}.")
    rep.notes += [str(a) for a in result.get("assumptions") or [] if str(a) not in rep.notes]
    rep.cautions = _cautions(fams, catalog, [])
    rep.sources = sources_of(result, fams, catalog)
    return rep


_BUILDERS = {"check": _check, "swap": _swap, "alternates": _alternates, "bom": _bom}


def build_report(result: dict, kind: str, catalog: Any = None) -> Report:
    """The report model for ``result`` (a ``to_json()`` dict) of the given command kind."""
    if kind not in _BUILDERS:
        from advisor.errors import InputError

        raise InputError(f"unknown report kind {kind!r}", expected=", ".join(KINDS))
    return _BUILDERS[kind](result, catalog)
