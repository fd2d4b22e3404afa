"""The rule context: a flat, documented vocabulary of plain values.

:func:`build_context` turns a part family (catalog), a :class:`Circuit` and the
timing engine's JSON (``TimingResult.to_json()``, keys per the design guide) into
a dict of plain numbers, booleans and strings. Rule conditions read only these
names; nothing in the context is a live object, so an expression can reach no
Python internals.

Names, all in SI base units (V, Ω, F, s, Hz, A; fractions for ratios):

- per part, under the prefix ``new.`` (the part being checked, or the
  replacement in a swap) and ``old.`` (the part being replaced, swaps only):
  the fields of :data:`PART_VOCABULARY`. Rules that look at one part at a time
  write them as ``part.<field>`` and the engine binds ``part`` to each part the
  rule applies to (``applies_to.parts``).
- top level: :data:`TOP_VOCABULARY` (swap comparisons).

A value the catalog or the circuit does not give is ``None``; conditions that
need it stay silent (see :mod:`advisor.rules.safe_expr`).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

from advisor.circuit import Circuit
from advisor.parts import Family, Sourced
from advisor.timing.constants import limit as _limit
from advisor.timing.constants import pick as _pick_constant
from advisor.timing.registry import main_constant

Kind = Literal["number", "bool", "text"]


@dataclass(frozen=True)
class Var:
    name: str
    kind: Kind
    unit: str
    doc: str


def _v(name: str, kind: Kind, unit: str, doc: str) -> Var:
    return Var(name, kind, unit, doc)


#: Fields every part carries (prefix ``new.``/``old.``, or ``part.`` in part rules).
PART_VOCABULARY: tuple[Var, ...] = (
    # identity
    _v("id", "text", "", "family id, e.g. 74HC221"),
    _v("function", "text", "", "timer-555, monostable, monostable-astable, programmable-timer"),
    _v("technology", "text", "", "bipolar, cmos-555, ttl, ls, als, hc, hct, ac, ahc, ahct, vhc, lv, lvc, cmos-4000"),
    _v("status", "text", "", "active, nrnd, last-time-buy, obsolete, unknown (catalog lifecycle block)"),
    _v("channels", "number", "", "timers or one-shots per package"),
    _v("is_555", "bool", "", "function is timer-555"),
    _v("cmos", "bool", "", "a CMOS technology (cmos-555, 4000 series, HC/HCT/AC/AHC/VHC/LV/LVC...)"),
    _v("bipolar", "bool", "", "a bipolar technology (bipolar 555, TTL, LS, ALS)"),
    _v("ttl_inputs", "bool", "", "inputs use TTL levels (VIH 2.0 V, VIL 0.8 V)"),
    # supply
    _v("vcc", "number", "V", "supply voltage of the circuit"),
    _v("supply_min", "number", "V", "recommended supply, lower end"),
    _v("supply_max", "number", "V", "recommended supply, upper end"),
    _v("abs_max", "number", "V", "absolute maximum supply"),
    # timing network
    _v("mode", "text", "", "mono or astable"),
    _v("r", "number", "Ω", "main fixed timing resistor (Rext, or RA)"),
    _v("ra", "number", "Ω", "555 astable RA"),
    _v("rb", "number", "Ω", "555 astable RB"),
    _v("pot", "number", "Ω", "variable resistor in series with the main resistor (a 555 astable: with RA, or RB with --pot-in rb)"),
    _v("pot_setting", "number", "", "fraction of the pot's travel in circuit (0 = shorted)"),
    _v("has_pot", "bool", "", "a variable resistor is in the timing network"),
    _v("c", "number", "F", "timing capacitor"),
    _v("r_total_min", "number", "Ω", "timing resistance with the pot at 0 (mono: R; astable: RA+RB)"),
    _v("r_total_max", "number", "Ω", "timing resistance with the pot at full travel"),
    _v("r_setting", "number", "Ω", "timing resistance at the given pot setting"),
    _v("r_discharge_min", "number", "Ω", "smallest resistance between the supply and the discharge/timing pin (555 astable: RA; mono: R with the pot at 0)"),
    _v("pot_in_discharge_path", "bool", "", "turning the variable resistor to 0 takes the discharge/timing path down with it (mono, or a 555 astable's trimmer in RA)"),
    # catalog limits at this supply and C
    _v("r_min", "number", "Ω", "smallest timing resistance the datasheet allows (strictest value that applies)"),
    _v("r_max", "number", "Ω", "largest timing resistance the datasheet allows"),
    _v("c_min", "number", "F", "smallest timing capacitor the datasheet allows"),
    _v("c_max", "number", "F", "largest timing capacitor the datasheet allows"),
    _v("c_linear_min", "number", "F", "capacitance below which the timing law stops holding"),
    _v("f_max", "number", "Hz", "frequency above which the formula stops holding"),
    _v("limit_width_min", "number", "s", "shortest pulse the datasheet specifies"),
    _v("limit_width_max", "number", "s", "longest pulse the datasheet specifies"),
    _v("r_internal", "number", "Ω", "on-chip timing resistor, if any"),
    _v("has_r_internal", "bool", "", "the part has an on-chip timing resistor"),
    _v("uses_r_internal", "bool", "", "the circuit times with the on-chip resistor (no external R given)"),
    _v("electrolytic", "text", "", "the datasheet's note on fitting a polarised Cext"),
    _v("has_electrolytic_note", "bool", "", "the catalog has an electrolytic-Cext note for the part"),
    # law constant
    _v("k", "number", "", "first published value of the law's main constant that applies"),
    _v("k_min", "number", "", "smallest published value of that constant"),
    _v("k_max", "number", "", "largest published value of that constant"),
    _v("k_spread", "number", "", "k_max / k_min - 1 (makers' disagreement)"),
    _v("nominal_maker", "text", "", "whose formula the nominal time uses when the part names no maker (the band spans the others)"),
    _v("k_sources", "number", "", "how many published values apply"),
    _v("k_from_memory", "text", "", "the law's constants that include a value recalled from memory (names), if any"),
    _v("k_interpolated", "text", "", "the law's constants interpolated between published supplies (names), if any"),
    _v("k_outside_c_range", "bool", "", "no constant is published for a capacitance this small or large"),
    # timing results (TimingResult.to_json())
    _v("width", "number", "s", "nominal output pulse width (one-shots, 555 monostable)"),
    _v("width_min", "number", "s", "worst-case shortest width"),
    _v("width_max", "number", "s", "worst-case longest width"),
    _v("period", "number", "s", "nominal astable period"),
    _v("frequency", "number", "Hz", "nominal astable frequency"),
    _v("frequency_max", "number", "Hz", "worst-case highest astable frequency"),
    _v("high", "number", "s", "nominal astable high time"),
    _v("low", "number", "s", "nominal astable low time"),
    _v("duty", "number", "", "nominal astable duty (high fraction)"),
    _v("calibration_factor", "number", "", "measured / predicted, when a measurement was given"),
    # counter timers (law counter; the cd4541 law is the oscillator alone)
    _v("divide", "number", "", "divide ratio N on the counter output in use (--divide); unknown when none is given"),
    _v("divide_choices", "text", "", "the divide ratios the counter can select (catalog timing.counter.divide_by)"),
    _v("osc_frequency", "number", "Hz", "nominal frequency of a counter timer's RC oscillator (N × the output's)"),
    _v("osc_frequency_max", "number", "Hz", "worst-case highest oscillator frequency over the band"),
    # trigger
    _v("trigger_period", "number", "s", "period of the trigger signal"),
    _v("trigger_edge", "text", "", "active edge of the trigger signal: rising or falling"),
    _v("trigger_high", "number", "V", "high level of the driving signal"),
    _v("pulse_duty", "number", "", "width / trigger_period (one-shots)"),
    _v("divide_by", "number", "", "1 when every trigger fires a pulse, n when only every n-th does"),
    _v("stays_high", "bool", "", "a retriggerable part whose pulse never ends at this trigger rate"),
    _v("divide_by_min", "number", "", "smallest divide ratio over the tolerance band (non-retriggerable parts)"),
    _v("divide_by_max", "number", "", "largest divide ratio over the tolerance band"),
    _v("retriggerable", "bool", "", "the part was judged retriggerable at this trigger (yes, or selectable wired so)"),
    _v("retrigger_min", "number", "s", "published minimum spacing between retriggers"),
    _v("target_duty", "number", "", "wanted astable duty (high fraction), when a design target gives one"),
    # behaviour
    _v("retrigger", "text", "", "yes, no or selectable"),
    _v("accepts_edge", "bool", "", "the part has an input for trigger_edge"),
    _v("edge_input", "text", "", "the input the trigger edge must reach (maker's label)"),
    _v("edge_input_pin", "number", "", "its pin number, section 1, default package"),
    _v("edge_input_schmitt", "bool", "", "that input has a Schmitt trigger"),
    _v("edge_input_enable", "text", "", "levels the other inputs must sit at to enable it"),
    _v("any_non_schmitt", "bool", "", "some trigger input has no Schmitt trigger"),
    _v("has_clear", "bool", "", "the part has a clear/reset input"),
    _v("clear_name", "text", "", "its label"),
    _v("clear_active", "text", "", "low or high"),
    _v("clear_ends_pulse", "bool", "", "asserting clear ends a pulse in progress"),
    _v("clear_triggers_on_release", "bool", "", "releasing clear can fire a pulse"),
    _v("power_up", "text", "", "published power-up behaviour"),
    # interface
    _v("inputs", "text", "", "ttl or cmos input levels"),
    _v("vih", "number", "V", "minimum high input level at this supply"),
    _v("vil", "number", "V", "maximum low input level at this supply"),
    _v("input_clamp", "bool", "", "inputs clamp to VCC (no over-voltage tolerance)"),
    _v("output_source", "number", "A", "published output source current"),
    _v("output_sink", "number", "A", "published output sink current"),
    # package
    _v("package", "text", "", "default package name"),
    _v("has_discharge", "bool", "", "the default package has a 555 DISCHARGE pin; false for a 555 pinout without one (the 5-pin MIC1555 feeds its timing resistor from OUT); unknown for other pinouts"),
    _v("pin_count", "number", "", "pins of the default package"),
    _v("output_kind", "text", "", "push-pull, open-collector (needs a pull-up to VCC) or transistor (collector and emitter on pins)"),
    _v("vref_pin", "number", "", "pin of a reference output the timing resistor returns to (VREF), default package; unknown when none"),
)

#: Names at the top level of the context (swap comparisons).
TOP_VOCABULARY: tuple[Var, ...] = (
    _v("swap", "bool", "", "true when an old part is being replaced"),
    _v("same_pinout", "bool", "", "default packages match pin for pin (function and section)"),
    _v("pins_differ", "number", "", "pins whose function or section differs"),
    _v("pin_count_changed", "bool", "", "the default packages have different pin counts"),
    _v("supply_changed", "bool", "", "old and new supplies differ"),
    _v("c_kept", "bool", "", "the new circuit keeps the old timing capacitor"),
    _v("width_change", "number", "", "new.width / old.width - 1"),
    _v("frequency_change", "number", "", "new.frequency / old.frequency - 1"),
    # swap facts from the swap engine (advisor.substitute.swap.swap_facts)
    _v("same_footprint", "bool", "", "the chosen packages have the same footprint"),
    _v("same_pins", "bool", "", "every used function sits at the same pin number, no tie or part added"),
    _v("pins_moved", "number", "", "used nets whose pin number changes"),
    _v("pins_moved_list", "text", "", "those moves, e.g. 'Q 6→10'"),
    _v("pins_blocking", "number", "", "old inputs the circuit uses that have no counterpart on the new part"),
    _v("pins_blocking_list", "text", "", "those inputs and what to do with their nets"),
    _v("ties_added", "number", "", "inputs of the new part that need a tie the old board did not have"),
    _v("ties_added_list", "text", "", "those ties"),
    _v("clears_inverted", "number", "", "old clears whose counterpart on the new part is active at the other level"),
    _v("clears_inverted_list", "text", "", "those clears, e.g. 'RESET (pin 4), active low onto CD4047B EXTERNAL RESET (pin 9), active high'"),
    _v("edge_input_missing", "bool", "", "the new part has no input for the trigger's edge"),
    _v("edge_note", "text", "", "the pin map's note on the trigger edge"),
    _v("network_changed", "bool", "", "old and new parts use different timing networks (555 vs one-shot)"),
    _v("old_network", "text", "", "timing network of the old part"),
    _v("new_network", "text", "", "timing network of the new part"),
    _v("values_changed", "bool", "", "the new circuit uses other timing values than the old board"),
    _v("kept_quantity", "text", "", "what the swap keeps: width or period"),
    _v("timing_solved", "bool", "", "some network inside the new part's limits makes the kept time"),
    _v("timing_problem", "text", "", "why no network makes it (design's answer), when none does"),
    _v("timing_error", "number", "", "new nominal / kept - 1 on the kept quantity"),
    _v("duty_error", "number", "", "new duty - kept duty (astables)"),
    _v("timing_tolerance", "number", "", "the circuit's resistor tolerance the error is judged against"),
    _v("timing_how", "text", "", "kept (old values stay), kept-c (same capacitor, new R) or new-c"),
    # the rule set itself (advisor.overrides; set by advisor.rules.engine.evaluate, in every scope)
    _v("danger_rules_replaced", "text", "", "shipped danger rules a user rules folder replaced: "
       "'id (user file)', comma-separated, if any"),
)

PART_FIELDS: dict[str, Var] = {v.name: v for v in PART_VOCABULARY}
TOP_FIELDS: dict[str, Var] = {v.name: v for v in TOP_VOCABULARY}
ROLES = ("new", "old")


def vocabulary(scope: str) -> dict[str, Var]:
    """Every name a rule of this scope may read: ``part`` or ``swap``."""
    out: dict[str, Var] = dict(TOP_FIELDS)
    prefixes = ("part",) if scope == "part" else ROLES
    for p in prefixes:
        for v in PART_VOCABULARY:
            out[f"{p}.{v.name}"] = v
    return out


_CMOS = {"cmos-555", "cmos-4000", "hc", "hct", "ac", "ahc", "ahct", "vhc", "lv", "lvc"}
_BIPOLAR = {"bipolar", "ttl", "ls", "als"}


def _pick(values: list[Sourced], vcc: float | None, c: float | None, strict: str) -> float | None:
    """The strictest value that applies (the engine's own choice, advisor.timing.constants.limit)."""
    s = _limit(values, vcc, c, lowest=strict == "min")
    return s.value if s is not None else None


def _fact_limit(facts: dict, name: str, fallback: float | None) -> float | None:
    """A limit as the engine chose it (TimingResult facts), else the same choice made here."""
    lim = facts.get("limits") if isinstance(facts.get("limits"), dict) else None
    if lim is None or name not in lim:
        return fallback
    entry = lim[name]
    return _num(entry, "value") if isinstance(entry, dict) else None


def _one(value: Sourced | None, vcc: float | None = None, c: float | None = None) -> float | None:
    if value is None or not value.applies(vcc, c):
        return None
    return value.value


def _level(abs_: Sourced | None, frac: Sourced | None, vcc: float | None, ttl_default: float | None) -> float | None:
    if abs_ is not None and vcc is not None and abs_.applies(vcc):
        return abs_.value
    if frac is not None and vcc is not None and frac.applies(vcc):
        return frac.value * vcc
    if ttl_default is not None:
        return ttl_default
    if abs_ is not None and vcc is None:
        return abs_.value
    return None


def _num(d: dict | None, key: str) -> float | None:
    if not isinstance(d, dict):
        return None
    v = d.get(key)
    return float(v) if isinstance(v, (int, float)) and not isinstance(v, bool) else None


def _extreme(t: dict, key: str, fn) -> float | None:
    vals = [x for x in (_num(t.get(b), key) for b in ("nominal", "min", "max")) if x is not None]
    return fn(vals) if vals else None


def _oscillator(family: Family, mode: str, used: dict, t: dict) -> tuple[float | None, float | None, float | None]:
    """A counter timer's divide ratio and its oscillator's nominal and highest frequency (Hz).

    The output period is N × T (astable) and the single interval fraction × N × T (mono),
    so T follows from the engine's times (advisor.timing.laws.counter_period); the law
    ``cd4541`` is the oscillator alone (N = 1)."""
    law = family.timing.law
    if law not in ("counter", "cd4541"):
        return None, None, None
    divide = _num(used, "divide") if law == "counter" else None
    n = divide or 1.0
    if mode == "mono":
        frac = family.timing.counter.delay_fraction if family.timing.counter is not None else 0.5
        widths = [x for x in (_num(t.get(b), "width") for b in ("nominal", "min")) if x]
        osc = [frac * n / w for w in widths]
    else:
        osc = [n * f for f in (_num(t.get(b), "frequency") for b in ("nominal", "min", "max")) if f]
    if not osc:
        return divide, None, None
    return divide, osc[0], max(osc)


def part_values(family: Family, circuit: Circuit | None, timing: dict | None = None) -> dict[str, object]:
    """The :data:`PART_VOCABULARY` fields for one part in one circuit (plain values)."""
    if timing is not None and not isinstance(timing, dict) and hasattr(timing, "to_json"):
        timing = timing.to_json()  # a TimingResult or a design Candidate
    timing = timing if isinstance(timing, dict) else {}
    used = timing.get("values") if isinstance(timing.get("values"), dict) else {}
    circ = circuit

    def val(name: str) -> float | None:
        v = _num(used, name)
        if v is None and circ is not None:
            cv = getattr(circ, name, None)
            v = float(cv) if isinstance(cv, (int, float)) else None
        return v

    vcc = val("vcc")
    r, ra, rb, c, pot, setting = val("r"), val("ra"), val("rb"), val("c"), val("pot"), val("pot_setting")
    mode = (circ.mode if circ is not None else None) or timing.get("mode")
    if mode not in ("mono", "astable"):
        mode = "astable" if rb is not None else "mono"
    pot_v = pot or 0.0
    is_555 = family.function == "timer-555"

    r_total_min = r_total_max = r_setting = r_dis = None
    if mode == "astable" and (ra is not None or rb is not None):
        base = (ra or 0.0) + (rb or 0.0)
        r_total_min, r_total_max = base, base + pot_v
        r_dis = ra if ra is not None else 0.0
        if setting is not None:
            r_setting = base + pot_v * setting
    else:
        main = r if r is not None else ra
        if main is not None or pot is not None:
            base = main or 0.0
            r_total_min, r_total_max = base, base + pot_v
            r_dis = r_total_min
            if setting is not None:
                r_setting = base + pot_v * setting

    comp, tim, beh, itf = family.components, family.timing, family.behaviour, family.interface
    cname = main_constant(tim.law, mode)  # the law registry names the law's main constant
    consts = timing.get("constants") if isinstance(timing.get("constants"), dict) else {}
    used_k = consts.get(cname) if cname else None
    if isinstance(used_k, dict):  # the constant the engine used (interpolated when it had to)
        k_nom, k_lo, k_hi = _num(used_k, "nominal"), _num(used_k, "min"), _num(used_k, "max")
        k_count = float(len(used_k.get("sources") or [])) or 1.0
    else:
        kc = _pick_constant(family, cname, vcc, c) if cname else None
        k_nom, k_lo, k_hi = (kc.nominal, kc.min, kc.max) if kc is not None else (None, None, None)
        k_count = float(len(kc.sources)) if kc is not None else 0.0
    facts = timing.get("facts") if isinstance(timing.get("facts"), dict) else {}
    kfacts = facts.get("constants") if isinstance(facts.get("constants"), dict) else {}
    from_memory = [n for n, f in kfacts.items() if isinstance(f, dict) and f.get("unverified")]
    interpolated = [n for n, f in kfacts.items()
                    if isinstance(f, dict) and f.get("interpolated") and n != "r_discharge"]  # a few ohms
    outside_c = any(isinstance(f, dict) and f.get("outside_c_range") for f in kfacts.values()) if kfacts else None
    if "r_path_min" in facts:
        r_dis = _num(facts, "r_path_min")
    pot_in_path = facts.get("pot_in_discharge_path") if isinstance(facts.get("pot_in_discharge_path"), bool) else (
        bool(pot) and not (mode == "astable" and is_555 and used.get("pot_in") == "rb"))
    # Makers' formulas are alternatives: with no maker named, the constant spans every
    # maker's own figure (advisor.timing.alternatives); with one named, only its own.
    alts = [m for m in timing.get("makers") or [] if isinstance(m, dict) and isinstance(m.get("constants"), dict)]
    alt_k = [m["constants"][cname] for m in alts if cname and isinstance(m["constants"].get(cname), dict)]
    if len(alt_k) > 1:
        lows = [_num(k, "min") for k in alt_k if _num(k, "min") is not None]
        highs = [_num(k, "max") for k in alt_k if _num(k, "max") is not None]
        if lows and highs:
            k_lo, k_hi = min(lows), max(highs)
            k_count = float(len(alt_k))

    t = timing.get("timing") if isinstance(timing.get("timing"), dict) else {}
    nominal = t.get("nominal") if isinstance(t.get("nominal"), dict) else {}
    trig = timing.get("trigger") if isinstance(timing.get("trigger"), dict) else {}
    width = _num(nominal, "width")
    ctrig = circ.trigger if circ is not None else None
    trigger_period = (ctrig.period if ctrig is not None else None) or _num(trig, "period")
    edge = ctrig.edge if ctrig is not None else None

    ttl = itf.inputs == "ttl"
    vih = _level(itf.vih, itf.vih_fraction, vcc, 2.0 if ttl else None)
    vil = _level(itf.vil, itf.vil_fraction, vcc, 0.8 if ttl else None)

    # The input a trigger edge must reach: an edge input of that sense, else a level input.
    accepts = edge_in = None
    if edge is not None:
        wanted = ("rising", "level-high") if edge == "rising" else ("falling", "level-low")
        cands = sorted((tr for tr in beh.triggers if tr.edge in wanted), key=lambda tr: wanted.index(tr.edge))
        edge_in = cands[0] if cands else None
        accepts = edge_in is not None
    pkg = family.packages[0] if family.packages else None
    pin = None
    enable = None
    if edge_in is not None:
        if pkg is not None:
            pins = pkg.by_function(1 if family.channels > 1 else None).get(edge_in.function)
            pin = float(pins[0]) if pins else None
        names = {tr.function: tr.name for tr in beh.triggers}
        if beh.clear is not None:
            names["CLEAR"] = beh.clear.name
            names["RESET"] = beh.clear.name
        enable = ", ".join(f"{names.get(f, f)} {lvl}" for f, lvl in edge_in.enable.items()) or None

    drive_src = itf.output_source_ma.value * 1e-3 if itf.output_source_ma is not None else None
    drive_snk = itf.output_sink_ma.value * 1e-3 if itf.output_sink_ma is not None else None
    divide_by = _num(trig, "divide_by")
    d_range = trig.get("divide_by_range") if isinstance(trig.get("divide_by_range"), list) else None
    stays = trig.get("stays_high") if isinstance(trig.get("stays_high"), bool) else None
    calib = timing.get("calibration") if isinstance(timing.get("calibration"), dict) else None
    divide, osc_f, osc_f_max = _oscillator(family, mode, used, t)

    out: dict[str, object] = {
        "id": family.id,
        "function": family.function,
        "technology": family.technology,
        "status": family.status,
        "channels": float(family.channels),
        "is_555": is_555,
        "cmos": family.technology in _CMOS,
        "bipolar": family.technology in _BIPOLAR,
        "ttl_inputs": ttl,
        "vcc": vcc,
        "supply_min": family.supply.recommended.min,
        "supply_max": family.supply.recommended.max,
        "abs_max": family.supply.absolute_max.value,
        "mode": mode,
        "r": r if mode == "mono" else ra,
        "ra": ra,
        "rb": rb,
        "pot": pot,
        "pot_setting": setting,
        "has_pot": bool(pot),
        "c": c,
        "r_total_min": r_total_min,
        "r_total_max": r_total_max,
        "r_setting": r_setting,
        "r_discharge_min": r_dis,
        "pot_in_discharge_path": pot_in_path,
        "r_min": _fact_limit(facts, "r_min", _pick(comp.r_min, vcc, c, "max")),
        "r_max": _fact_limit(facts, "r_max", _pick(comp.r_max, vcc, c, "min")),
        "c_min": _fact_limit(facts, "c_min", _pick(comp.c_min, vcc, c, "max")),
        "c_max": _fact_limit(facts, "c_max", _pick(comp.c_max, vcc, c, "min")),
        "c_linear_min": _fact_limit(facts, "c_linear_min", _one(tim.c_linear_min, vcc)),
        "f_max": _fact_limit(facts, "f_max", _one(tim.f_max, vcc)),
        "limit_width_min": _fact_limit(facts, "width_min", _one(tim.width_min, vcc)),
        "limit_width_max": _fact_limit(facts, "width_max", _one(tim.width_max, vcc)),
        "r_internal": tim.r_internal.value if tim.r_internal is not None else None,
        "has_r_internal": tim.r_internal is not None,
        "uses_r_internal": tim.r_internal is not None and (used.get("r_internal") is True or (r is None and ra is None and not pot)),
        "electrolytic": comp.electrolytic,
        "has_electrolytic_note": comp.electrolytic is not None,
        "k": k_nom,
        "k_min": k_lo,
        "k_max": k_hi,
        "k_spread": (k_hi / k_lo - 1.0) if k_lo and k_hi is not None and k_lo > 0 else None,
        "k_sources": k_count,
        "nominal_maker": (alts[0].get("label") or alts[0].get("maker")) if len(alts) > 1 else None,
        "k_from_memory": ", ".join(from_memory) or None,
        "k_interpolated": ", ".join(interpolated) or None,
        "k_outside_c_range": outside_c,
        "width": width,
        "width_min": _extreme(t, "width", min),
        "width_max": _extreme(t, "width", max),
        "period": _num(nominal, "period"),
        "frequency": _num(nominal, "frequency"),
        "frequency_max": _extreme(t, "frequency", max),
        "high": _num(nominal, "high"),
        "low": _num(nominal, "low"),
        "duty": _num(nominal, "duty"),
        "calibration_factor": _num(calib, "factor"),
        "divide": divide,
        "divide_choices": (", ".join(str(n) for n in tim.counter.divide_by) if tim.counter is not None else None),
        "osc_frequency": osc_f,
        "osc_frequency_max": osc_f_max,
        "trigger_period": trigger_period,
        "trigger_edge": edge,
        "trigger_high": ctrig.high if ctrig is not None else None,
        "pulse_duty": (width / trigger_period) if width is not None and trigger_period else None,
        "divide_by": divide_by,
        "stays_high": stays,
        "divide_by_min": float(min(d_range)) if d_range else divide_by,
        "divide_by_max": float(max(d_range)) if d_range else divide_by,
        "retriggerable": trig.get("retriggerable") if isinstance(trig.get("retriggerable"), bool) else None,
        "retrigger_min": beh.retrigger_min.value if beh.retrigger_min is not None else None,
        "target_duty": circ.target.duty if circ is not None and circ.target is not None else None,
        "retrigger": beh.retrigger,
        "accepts_edge": accepts,
        "edge_input": edge_in.name if edge_in is not None else None,
        "edge_input_pin": pin,
        "edge_input_schmitt": edge_in.schmitt if edge_in is not None else None,
        "edge_input_enable": enable,
        "any_non_schmitt": any(not tr.schmitt for tr in beh.triggers) if beh.triggers else None,
        "has_clear": beh.clear is not None,
        "clear_name": beh.clear.name if beh.clear else None,
        "clear_active": beh.clear.active if beh.clear else None,
        "clear_ends_pulse": beh.clear.ends_pulse if beh.clear else None,
        "clear_triggers_on_release": beh.clear.triggers_on_release if beh.clear else None,
        "power_up": beh.power_up,
        "inputs": itf.inputs,
        "vih": vih,
        "vil": vil,
        "input_clamp": itf.input_clamp_to_vcc,
        "output_source": drive_src,
        "output_sink": drive_snk,
        "package": pkg.name if pkg else None,
        "pin_count": float(max((p.pin for p in pkg.pins), default=0)) if pkg else None,
        "output_kind": itf.outputs,
        "vref_pin": next((float(p.pin) for p in pkg.pins if p.function == "VREF"), None) if pkg else None,
        # whether the discharge-transistor facts apply: read from the pins, not the function
        "has_discharge": family.has_discharge(),
    }
    return out


def _pinout(family: Family) -> dict[int, tuple[str, int | None]] | None:
    if not family.packages:
        return None
    return {p.pin: (p.function, p.channel) for p in family.packages[0].pins}


def _ratio(a: object, b: object) -> float | None:
    if isinstance(a, (int, float)) and isinstance(b, (int, float)) and b:
        return a / b - 1.0
    return None


def build_context(
    new: Family,
    circuit: Circuit | None,
    timing: dict | None,
    *,
    old: Family | None = None,
    old_circuit: Circuit | None = None,
    old_timing: dict | None = None,
    swap_facts: dict | None = None,
) -> dict[str, object]:
    """The flat context for :func:`advisor.rules.evaluate` (see the module docstring).

    ``timing``/``old_timing`` are ``TimingResult.to_json()`` dicts (or None).
    In a swap, ``old_circuit`` defaults to ``circuit``.
    """
    ctx: dict[str, object] = {v.name: None for v in TOP_VOCABULARY}
    for role in ROLES:
        for v in PART_VOCABULARY:
            ctx[f"{role}.{v.name}"] = None
    for k, v in part_values(new, circuit, timing).items():
        ctx[f"new.{k}"] = v
    ctx["swap"] = old is not None
    if old is not None:
        ov = part_values(old, old_circuit if old_circuit is not None else circuit, old_timing)
        for k, v in ov.items():
            ctx[f"old.{k}"] = v
        a, b = _pinout(old), _pinout(new)
        if a is not None and b is not None:
            differ = sum(1 for pin in set(a) | set(b) if a.get(pin) != b.get(pin))
            ctx["pins_differ"] = float(differ)
            ctx["same_pinout"] = differ == 0
            ctx["pin_count_changed"] = ctx["old.pin_count"] != ctx["new.pin_count"]
        if ctx["old.vcc"] is not None and ctx["new.vcc"] is not None:
            ctx["supply_changed"] = abs(ctx["old.vcc"] - ctx["new.vcc"]) > 1e-9  # type: ignore[operator]
        if ctx["old.c"] is not None and ctx["new.c"] is not None:
            ctx["c_kept"] = abs(ctx["old.c"] / ctx["new.c"] - 1.0) < 1e-9  # type: ignore[operator]
        ctx["width_change"] = _ratio(ctx["new.width"], ctx["old.width"])
        ctx["frequency_change"] = _ratio(ctx["new.frequency"], ctx["old.frequency"])
        for k, v in (swap_facts or {}).items():
            if k not in TOP_FIELDS:
                raise KeyError(f"swap fact {k!r} is not in the rule vocabulary (TOP_VOCABULARY)")
            ctx[k] = v
    return ctx
