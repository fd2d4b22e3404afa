"""Variable resistor: the range over its travel, and whether a target is reachable.

The network is a fixed resistor in series with a variable resistor used as a
rheostat (its end resistance at setting 0, its full value less the end resistance
at setting 1); in a 555 astable it adds to RA (the default: trimming RA moves the
period and keeps the low time) or to RB (``--pot-in rb``). Times are nominal at the two ends of travel; reachability on the real board
is also judged with the worst-case band at both ends (``reachable_worst_case``):
the target must lie above the longest time at setting 0 and below the shortest
time at setting 1.
"""

from __future__ import annotations

from advisor.circuit import Target
from advisor.errors import InputError
from advisor.timing.band import band
from advisor.timing.calibrate import scale
from advisor.timing.model import Model


def travel_ends(model: Model, factor: float = 1.0) -> tuple[dict, dict]:
    """Nominal times at setting 0 and setting 1 (calibrated by ``factor``)."""
    lo = model.times(model.at(rp=0.0))
    hi = model.times(model.at(rp=model.pot or 0.0))
    return scale(lo, factor), scale(hi, factor)


def target_quantity(model: Model, target: Target) -> str:
    if target.kind == "freq":
        if model.mode == "mono":
            raise InputError("a monostable has no frequency; give --target-width", got="freq")
        return "frequency"
    if target.kind == "period":
        if model.mode == "mono":
            raise InputError("a monostable has a pulse width, not a period; give --target-width", got="period")
        return "period"
    return "width" if model.mode == "mono" else "high"


def setting_for(model: Model, quantity: str, value: float, factor: float = 1.0) -> float | None:
    """Fraction of travel giving ``value`` of ``quantity``, or None when out of reach."""
    if not model.pot:
        return None

    def f(s: float) -> float:
        return scale(model.times(model.at(rp=model.pot * s)), factor)[quantity] - value

    a, b = f(0.0), f(1.0)
    if a == 0:
        return 0.0
    if b == 0:
        return 1.0
    if (a > 0) == (b > 0):
        return None
    lo, hi = 0.0, 1.0
    for _ in range(60):  # bisection: the laws are monotonic in the resistance
        mid = 0.5 * (lo + hi)
        if (f(mid) > 0) == (a > 0):
            lo = mid
        else:
            hi = mid
    return 0.5 * (lo + hi)


def judge_target(model: Model, target: Target, nominal: dict, lows: dict, highs: dict, factor: float = 1.0) -> dict:
    """The ``target`` object of the result: value, reachable, setting (+ detail keys).

    Without a variable resistor the target counts as reachable when it lies inside
    the worst-case band of the fixed network.
    """
    q = target_quantity(model, target)
    value = target.value
    values = [value] if target.range is None else [target.range[0], target.range[1]]
    out: dict = {"value": value, "quantity": q, "error": nominal[q] / value - 1.0}
    if target.range is not None:
        out["range"] = {"min": target.range[0], "max": target.range[1]}
    if model.pot:
        settings = [setting_for(model, q, v, factor) for v in values]
        out["reachable"] = all(s is not None for s in settings)
        out["setting"] = setting_for(model, q, value, factor)
        out["reachable_worst_case"] = _worst_case_reach(model, q, values, factor)
    else:
        out["reachable"] = all(lows[q] <= v <= highs[q] for v in values)
        out["setting"] = None
    return out


def _worst_case_reach(model: Model, q: str, values: list[float], factor: float) -> bool:
    lo0, hi0 = (scale(d, factor) for d in band(model, model.at(rp=0.0)))
    lo1, hi1 = (scale(d, factor) for d in band(model, model.at(rp=model.pot)))
    if q == "frequency":  # frequency falls as the resistance grows
        lo0, hi0, lo1, hi1 = lo1, hi1, lo0, hi0
    # Guaranteed on any board within tolerance: above the slowest part at setting 0 and
    # below the fastest part at setting 1.
    return all(hi0[q] <= v <= lo1[q] for v in values)
