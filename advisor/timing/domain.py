"""Where a timing law has no physical meaning: refused before and after it is evaluated.

The laws in :mod:`advisor.timing.laws` are formulas; fed values outside their domain
they divide by zero, take the logarithm of a negative number or give a negative
width. This module names those cases as located input errors (exit 2, naming the
option a user would change) or, for thresholds published in a catalog file, a data
error (exit 1, naming the family and key), so no caller ever sees a bare
``ZeroDivisionError``, a math domain error or a negative time:

- ``ln-supply`` (4528 class), t = a·R·C·ln(VDD): no positive width at or below
  VDD = 1 V (ln 1 = 0);
- 555 astable: the discharge transistor (on-resistance Rd) and RA form a divider;
  C only discharges to the lower threshold l·VCC when Rd/(RA + Rd) < l, i.e.
  RA > Rd·(1 − l)/l, otherwise the low phase never ends (laws.timer555_astable);
- 555 thresholds: 0 < lower < upper < 1 (fractions of VCC) over their published spread;
- any law: the times (width, high, low, period) must be finite and at least
  :data:`TIME_FLOOR`; a zero total timing resistance gives a zero time, and the
  frequency, the calibration factor and the swap error all divide by it.

Sources: equation (1) of advisor.timing.laws (first-order RC step response);
the 4528 law per ON Semiconductor MC14528B (cited in laws.ln_supply).
"""

from __future__ import annotations

import math

from advisor.errors import DataError, InputError
from advisor.timing.model import TIME_KEYS, Model
from advisor.values import format_eng

#: The shortest time a law may give (s): one picosecond is far below any logic
#: gate's propagation delay, so a shorter "pulse" is no pulse (common practice).
TIME_FLOOR = 1e-12


def check_domain(model: Model, *, network: bool = True) -> None:
    """Raise before evaluating the law when its inputs are outside its domain.

    ``network=False`` (inverse design, whose resistors are placeholders until solved)
    checks only what does not depend on the resistors: the supply and the thresholds.
    Each maker's figures (``model.alternatives``) are checked as well as the nominal's.
    """
    _check_one(model, network)
    if len(model.alternatives) > 1:
        for alt in model.alternatives:
            _check_one(model.for_alternative(alt), network)


def _check_one(model: Model, network: bool) -> None:
    p = model.params
    fid = model.family.id
    if model.law == "ln-supply" and p["vcc"] <= 1.0:
        rec = model.family.supply.recommended
        raise InputError(
            f"supply {p['vcc']:g} V: the {fid} law t = a·R·C·ln(VDD) gives no pulse at or below 1 V",
            got=p["vcc"], expected=f"a supply inside the {fid}'s range, {rec.min:g} to {rec.max:g} V",
        )
    if model.law != "timer-555":
        return
    u_lo, u_hi = _ends(model, "upper")
    l_lo, l_hi = _ends(model, "lower")
    if not 0.0 < l_lo <= l_hi < u_lo <= u_hi < 1.0:
        if model.cont is not None:  # driven CONT gives u = Vc/VCC, l = Vc/(2·VCC): ordered by construction
            raise InputError(f"control voltage (--cont) {model.cont:g} V gives thresholds outside 0..1 of the supply")
        raise DataError(
            f"{fid}: timing.constants.upper_threshold / lower_threshold must satisfy 0 < lower < upper < 1 "
            f"over their published values (lower {l_lo:g}..{l_hi:g}, upper {u_lo:g}..{u_hi:g})",
        )
    if network and model.mode == "astable":
        rd_lo, rd_hi = _ends(model, "r_dis")
        ra_lo, _ra_hi = _ends(model, "ra")
        if rd_hi > 0 and rd_hi / (ra_lo + rd_hi) >= l_lo:
            need = rd_hi * (1.0 - l_lo) / l_lo
            tol = 1.0 - ra_lo / p["ra"] if p["ra"] else 0.0
            need /= max(1e-9, 1.0 - tol)
            raise InputError(
                f"--ra {format_eng(p['ra'], 'Ω')} is too small against the {fid}'s discharge on-resistance "
                f"(up to {format_eng(rd_hi, 'Ω')} at {p['vcc']:g} V): the capacitor never discharges to the lower "
                "threshold, so the circuit stops oscillating",
                got=p["ra"], expected=f"RA above {format_eng(need, 'Ω', 3)}",
            )


def check_times(model: Model, *timings: dict) -> None:
    """Raise when a computed time is not a positive finite number (see the module docstring)."""
    for times in timings:
        for key in TIME_KEYS:
            t = times.get(key)
            if t is None:
                continue
            if not math.isfinite(t) or t < TIME_FLOOR:
                raise InputError(_why(model, key, t), got=t, expected=_expected(model))


def _ends(model: Model, name: str) -> tuple[float, float]:
    nom = model.params.get(name, 0.0)
    lo, hi = model.ranges.get(name, (nom, nom))
    return min(lo, hi, nom), max(lo, hi, nom)


def _resistors(model: Model) -> str:
    if model.law == "timer-555" and model.mode == "astable":
        return "--ra and --rb"
    return "--r" + (" / --pot" if model.pot else "")


def _why(model: Model, key: str, t: float) -> str:
    fid = model.family.id
    shown = "not a number" if math.isnan(t) else format_eng(t, "s")
    if math.isfinite(t):  # zero, negative or below the floor
        return (f"{fid}: these values give a {key} of {shown}: the timing resistance ({_resistors(model)}) "
                "or the capacitor is too small to make a pulse")
    return f"{fid}: these values give a {key} of {shown}: no circuit can make that time"


def _expected(model: Model) -> str:
    return f"a timing resistance ({_resistors(model)}) and capacitance (--c) that give a time of at least {format_eng(TIME_FLOOR, 's')}"
