"""``analyse``: the timing of an existing circuit, with band, adjustment, target,
calibration, trigger facts and the facts the datasheet rules judge (no findings:
the rules are the only checks, :func:`advisor.checking.check_circuit` runs them)."""

from __future__ import annotations

from advisor.circuit import Circuit
from advisor.parts import Family
from advisor.timing.adjust import judge_target, travel_ends
from advisor.timing.band import band
from advisor.timing.calibrate import calibrate, scale
from advisor.timing.domain import check_domain, check_times
from advisor.timing.model import Model, build
from advisor.timing.result import TimingResult
from advisor.timing.trigger import analyse_trigger
from advisor.timing.validity import network_facts


def network_values(model: Model) -> dict:
    """The network actually used (Ω, F, V); keys present for every mode."""
    p = model.params
    return {
        "r": p.get("r") if "r" in p else None,
        "ra": p.get("ra"),
        "rb": p.get("rb"),
        "c": p["c"],
        "pot": model.pot,
        "pot_setting": model.pot_setting,
        "vcc": p["vcc"],
        "cont": model.cont,
        "r_internal": model.r_internal,
        "pot_in": model.pot_in if model.pot else None,
        "divide": model.divide,  # counter timers: the divide ratio N in use (None: the oscillator itself)
    }


def tolerances(circuit: Circuit) -> dict:
    out = {"r_tol": circuit.r_tolerance, "c_tol": circuit.c_tolerance, "defaulted": circuit.tolerances_defaulted}
    # the series whose tolerance stands in for a tolerance not given (E96: 1 %), when one was named
    out.update({k: getattr(circuit, k) for k in ("r_series", "c_series") if getattr(circuit, k)})
    return out


def analyse(family: Family, circuit: Circuit, *, samples: int | None = None, seed: int | None = 1) -> TimingResult:
    """Timing of ``circuit`` on ``family`` (see the module docstring of advisor.timing).

    ``samples`` runs a Monte Carlo of that many draws (numpy); it also runs, with
    100 000 draws, when the target carries a window (``--range``).
    """
    model = build(family, circuit)
    check_domain(model)
    nominal = model.times()
    lows, highs = band(model)
    check_times(model, nominal, lows, highs)
    cal = None
    factor = 1.0
    if circuit.measured is not None:
        cal = calibrate(model.mode, nominal, circuit.measured)
        factor = cal.factor
    timing = {"nominal": scale(nominal, factor), "min": scale(lows, factor), "max": scale(highs, factor)}
    adjust = None
    if model.pot:
        lo, hi = travel_ends(model, factor)
        adjust = {"min": lo, "max": hi, "pot": model.pot}
    target = None
    if circuit.target is not None:
        target = judge_target(model, circuit.target, timing["nominal"], timing["min"], timing["max"], factor)
    trig = None
    if circuit.trigger.period is not None:
        w = timing["nominal"].get("width")
        trig = analyse_trigger(
            family, model.mode, circuit.trigger.period, w, timing["min"].get("width"), timing["max"].get("width"),
            edge=circuit.trigger.edge,
        )
    dist = None
    window = circuit.target.range if circuit.target is not None else None
    if samples or window is not None:
        from advisor.timing.adjust import target_quantity
        from advisor.timing.montecarlo import simulate

        q = target_quantity(model, circuit.target) if window is not None else None
        dist = simulate(model, samples or 100_000, window=window, quantity=q, scale=factor, seed=seed)
    return TimingResult(
        part=family.id, mode=model.mode, law=model.law, values=network_values(model), timing=timing,
        adjust=adjust, target=target, calibration=cal, trigger=trig, findings=[], facts=network_facts(model),
        constants=dict(model.constants), tolerances=tolerances(circuit),
        assumptions=list(circuit.notes) + list(model.assumptions),
        distribution=dist, capture=circuit.measured.capture if circuit.measured is not None else None,
        maker=model.maker, maker_basis=model.maker_basis, makers=list(model.alternatives),
        part_number=circuit.part_number,
    )


def predict_nominal(family: Family, circuit: Circuit) -> dict:
    """Nominal timing only (fast; calibrated when a measurement is given)."""
    model = build(family, circuit)
    check_domain(model)
    nominal = model.times()
    check_times(model, nominal)
    if circuit.measured is not None:
        nominal = scale(nominal, calibrate(model.mode, nominal, circuit.measured).factor)
    return nominal
