"""Where a law holds: the facts the datasheet rules judge (the engine judges nothing).

:func:`network_facts` gathers, for one bound model, what the rules in
``rules/timing-network.yaml`` compare (advisor/rules/context.py reads them):

- the resistance on each path the limits protect, at both ends of the variable
  resistor's travel: the path through the discharge/timing pin (mono: R with the
  pot at 0 Ω; 555 astable: RA, the pot sits in RB) and the whole charging path at
  full travel (mono: R + pot; astable: RA + RB + pot), in Ω;
- each component and law limit that applies at this supply and capacitance, the
  value chosen, its source and why it was chosen (the strictest of the applicable
  published values, :func:`advisor.timing.constants.limit`);
- for each law constant: whether a figure is recalled from memory, interpolated
  between published supplies, or published for no capacitance this close.
"""

from __future__ import annotations

from advisor.parts import Sourced
from advisor.timing.constants import limit, source_label
from advisor.timing.model import Model

#: Limit name -> (catalog place, strictest end). "max": the largest minimum applies.
_LIMITS = {
    "r_min": ("components.r_min", "max"),
    "r_max": ("components.r_max", "min"),
    "c_min": ("components.c_min", "max"),
    "c_max": ("components.c_max", "min"),
}


def _chosen(model: Model, values: list[Sourced], vcc: float, c: float, strict: str, where: str) -> dict | None:
    pool = [v for v in values if v.applies(vcc, c)]
    s = limit(values, vcc, c, lowest=strict == "min")
    if s is None:
        return None
    why = (f"the only value of {where} that applies at {vcc:g} V" if len(pool) == 1 else
           f"the {'smallest' if strict == 'min' else 'largest'} of {len(pool)} published values of {where} "
           f"that apply at {vcc:g} V")
    return {"value": s.value, "source": source_label(model.family, s.source), "why": why}


def _single(model: Model, s: Sourced | None, vcc: float, where: str) -> dict | None:
    if s is None or not s.applies(vcc):
        return None
    return {"value": s.value, "source": source_label(model.family, s.source), "why": f"{where} at {vcc:g} V"}


def network_facts(model: Model) -> dict:
    """The facts of the module docstring, as plain values (Ω, F, Hz, s)."""
    fam = model.family
    p = model.params
    vcc, c = p["vcc"], p["c"]
    pot = model.pot or 0.0
    astable555 = model.law == "timer-555" and model.mode == "astable"
    end = model.pot_end if pot else 0.0  # a trimmer at its zero stop still has its end resistance
    trim_in_ra = astable555 and bool(pot) and model.pot_in == "ra"
    if astable555:
        r_path_min, r_path_max = p["ra"] + (end if trim_in_ra else 0.0), p["ra"] + p["rb"] + pot
        what_min = "RA" + (" (trimmer in RA at its zero stop)" if trim_in_ra else "")
        what_max = "RA + RB" + (" + trimmer" if pot else "")
    else:
        r = p.get("r", 0.0)
        r_path_min, r_path_max = r + end, r + pot
        what_min, what_max = "R" + (" (trimmer at its zero stop)" if pot else ""), "R" + (" + trimmer" if pot else "")
    comp, tim = fam.components, fam.timing
    limits: dict[str, dict | None] = {}
    for name, (where, strict) in _LIMITS.items():
        values = getattr(comp, name)
        limits[name] = _chosen(model, values, vcc, c, strict, where)
    limits["c_linear_min"] = _single(model, tim.c_linear_min, vcc, "timing.c_linear_min")
    limits["f_max"] = _single(model, tim.f_max, vcc, "timing.f_max")
    limits["width_min"] = _single(model, tim.width_min, vcc, "timing.width_min")
    limits["width_max"] = _single(model, tim.width_max, vcc, "timing.width_max")
    constants = {
        name: {"unverified": k.unverified, "interpolated": k.interpolated, "outside_c_range": k.outside_c_range}
        for name, k in model.constants.items()
    }
    out = {
        "r_path_min": None if model.r_internal else r_path_min,
        "r_path_min_what": what_min,
        "r_path_max": r_path_max,
        "r_path_max_what": what_max,
        "pot_in_discharge_path": bool(pot) and (not astable555 or trim_in_ra),
        "limits": limits,
        "constants": constants,
    }
    if model.law == "counter":
        out["counter"] = counter_facts(model)
    return out


def counter_facts(model: Model) -> dict:
    """A counter timer's divide ratio, the ratios it can select and its nominal oscillator
    (period s, frequency Hz): the output time is N oscillator periods (astable) or
    fraction × N (the single interval), advisor.timing.laws.counter_period/counter_delay."""
    counter = model.family.timing.counter
    p = model.params
    n, frac = p.get("n", 1.0), p.get("delay_fraction", 0.5)
    t = model.times()[model.main_quantity]
    period = t / (n if model.mode == "astable" else frac * n)
    return {
        "divide": model.divide,
        "divide_by": list(counter.divide_by) if counter is not None else [],
        "delay_fraction": frac,
        "oscillator": {"period": period, "frequency": 1.0 / period if period > 0 else None},
    }
