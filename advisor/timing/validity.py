"""Where a law stops holding: law-validity findings.

Inputs outside the range a law holds in give a finding, not a crash and not a
silent number. Rule ids (the rules engine adds its own on top):

- ``law-r-below-min`` (danger): the fixed timing resistance, with the variable
  resistor at 0 Ω, is below the part's minimum (the minimum protects the chip's
  discharge path);
- ``law-r-above-max`` (warning): the resistance at full travel is above the part's
  maximum (leakage and input current make the law unreliable);
- ``law-c-below-min`` / ``law-c-above-max`` (warning): C outside the part's limits;
- ``law-c-below-linear`` (warning): C below the value the published constant holds for;
- ``law-f-above-range`` (warning): an astable above the formula's frequency range;
- ``law-width-out-of-range`` (warning): a width outside the published min/max;
- ``law-constant-unverified`` (note): a constant recalled, not sourced;
- ``law-constant-interpolated`` (note): no constant published at this supply.
"""

from __future__ import annotations

from advisor.findings import Finding
from advisor.parts import Sourced
from advisor.timing.constants import limit, source_label
from advisor.timing.model import Model
from advisor.values import format_eng


def _src(model: Model, s: Sourced) -> str:
    return source_label(model.family, s.source)


def check_model(model: Model, nominal_uncal: dict) -> list[Finding]:
    fam = model.family
    fid = fam.id
    p = model.params
    vcc = p["vcc"]
    out: list[Finding] = []
    pot = model.pot or 0.0
    if model.law == "timer-555" and model.mode == "astable":
        # RA carries the discharge current; RA + RB (+ pot) carries the threshold current.
        r_low, r_high, what = p["ra"], p["ra"] + p["rb"] + pot, "RA"
        what_high = "RA + RB" + (" + pot" if pot else "")
    else:
        r_low, r_high = p["r"], p["r"] + pot
        what = "R" + (" (pot at 0 Ω)" if pot else "")
        what_high = "R" + (" + pot" if pot else "")
    comp = fam.components
    rmin = limit(comp.r_min, vcc, lowest=False)
    if rmin is not None and rmin.value > 0 and r_low < rmin.value * (1 - 1e-9) and not model.r_internal:
        out.append(Finding(
            "law-r-below-min", "danger",
            f"{what} {format_eng(r_low, 'Ω')} is below the minimum timing resistance {format_eng(rmin.value, 'Ω')} of the {fid}",
            f"use at least {format_eng(rmin.value, 'Ω')} fixed in series" + (" with the pot" if pot else ""),
            _src(model, rmin), fid,
        ))
    rmax = limit(comp.r_max, vcc, lowest=True)
    if rmax is not None and r_high > rmax.value * (1 + 1e-9):
        out.append(Finding(
            "law-r-above-max", "warning",
            f"{what_high} {format_eng(r_high, 'Ω')} is above the {fid}'s maximum {format_eng(rmax.value, 'Ω')}: leakage and input current upset the timing",
            "use a larger C and a smaller R", _src(model, rmax), fid,
        ))
    c = p["c"]
    cmin = limit(comp.c_min, vcc, lowest=False)
    if cmin is not None and cmin.value > 0 and c < cmin.value * (1 - 1e-9):
        out.append(Finding(
            "law-c-below-min", "warning",
            f"C {format_eng(c, 'F')} is below the {fid}'s minimum {format_eng(cmin.value, 'F')}",
            f"use at least {format_eng(cmin.value, 'F')} and a smaller R", _src(model, cmin), fid,
        ))
    cmax = limit(comp.c_max, vcc, lowest=True)
    if cmax is not None and c > cmax.value * (1 + 1e-9):
        out.append(Finding(
            "law-c-above-max", "warning",
            f"C {format_eng(c, 'F')} is above the {fid}'s maximum {format_eng(cmax.value, 'F')}",
            "use a smaller C and a larger R, or a counter-based timer for long times", _src(model, cmax), fid,
        ))
    lin = fam.timing.c_linear_min
    outside_c = any(k.outside_c_range for k in model.constants.values())
    if (lin is not None and c < lin.value * (1 - 1e-9)) or outside_c:
        bound = f" (the law holds from {format_eng(lin.value, 'F')})" if lin is not None else ""
        out.append(Finding(
            "law-c-below-linear", "warning",
            f"C {format_eng(c, 'F')} is outside the range the published constant holds for{bound}: the real time will differ",
            "use a larger C, or set the time on the bench (a measured width calibrates the result)",
            _src(model, lin) if lin is not None else "catalog constant conditions", fid,
        ))
    fmax = fam.timing.f_max
    if model.mode == "astable" and fmax is not None and nominal_uncal["frequency"] > fmax.value:
        out.append(Finding(
            "law-f-above-range", "warning",
            f"{format_eng(nominal_uncal['frequency'], 'Hz')} is above the {format_eng(fmax.value, 'Hz')} the formula holds to: the real frequency will be lower",
            "measure the real circuit and calibrate, or use a faster part", _src(model, fmax), fid,
        ))
    if model.mode == "mono":
        w = nominal_uncal["width"]
        wmin, wmax = fam.timing.width_min, fam.timing.width_max
        if (wmin is not None and w < wmin.value) or (wmax is not None and w > wmax.value):
            s = wmin if wmin is not None and w < wmin.value else wmax
            out.append(Finding(
                "law-width-out-of-range", "warning",
                f"width {format_eng(w, 's')} is outside the {fid}'s published range (limit {format_eng(s.value, 's')})",
                "choose another part or a counter-based timer", _src(model, s), fid,
            ))
    for name, k in model.constants.items():
        if k.unverified:
            out.append(Finding(
                "law-constant-unverified", "note",
                f"the {fid}'s constant '{name}' includes a value recalled from memory, not from a datasheet",
                "check the maker's current datasheet; a measured width calibrates the result", "memory", fid,
            ))
        if k.interpolated and name != "r_discharge":  # a few ohms: not worth a note
            out.append(Finding(
                "law-constant-interpolated", "note",
                f"no '{name}' is published for {vcc:g} V; {k.nominal:.4g} is interpolated between published supplies",
                "confirm on a prototype at this supply", ", ".join(source_label(fam, s) for s in k.sources), fid,
            ))
    return out
