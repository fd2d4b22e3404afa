"""Alternates: every catalog family that can do the old part's job at the (new) supply, ranked.

A family can do the job when its function has the circuit's mode (a one-shot
cannot replace an astable; a 555-class timer or a 4047 can replace either) and
the supply lies in its recommended range. Each such family gets a full
:func:`advisor.substitute.swap.swap`; the ``unsuitable`` ones and the families that
fail are listed under ``rejected`` with the reason. Ranking, best first: class
(:data:`CLASS_ORDER`), then the size of the timing error, then the number of rework
steps, then the findings (dangers, then warnings, then notes), then active
parts before obsolete ones. Timing errors inside the circuit's tolerance (5 %
by default) count as equal: E24 rounding, not the part, makes them.
"""

from __future__ import annotations

from advisor.circuit import Circuit
from advisor.errors import RetimeError
from advisor.substitute.classify import CLASS_ORDER
from advisor.substitute.reference import with_reference
from advisor.substitute.result import AlternatesResult, Rejected
from advisor.substitute.swap import _analyse, _side, kept_quantity, swap

#: Family functions that can make each mode's output.
CAN_DO = {
    "mono": ("monostable", "timer-555", "monostable-astable"),
    "astable": ("timer-555", "monostable-astable"),
}


def rank_key(result, tolerance: float = 0.05) -> tuple:
    """Sort key: class, timing error (errors inside the tolerance count as equal: E24
    rounding, not the part, makes them), rework steps, findings, then active parts
    before obsolete ones."""
    counts = result.severity_counts()
    err = abs(result.error) if result.error is not None else 1.0
    return (
        CLASS_ORDER.index(result.cls),
        int(err / tolerance) if tolerance > 0 else err,
        len(result.rework),
        counts["danger"], counts["warning"], counts["note"],
        {"active": 0, "nrnd": 1, "unknown": 2, "obsolete": 3}.get(result.new.status, 2),
        result.new.family,
    )


def alternates(
    catalog,
    old_query: str,
    circuit: Circuit,
    *,
    new_vcc: float | None = None,
    limit: int = 10,
    series: str = "E24",
    families: list[str] | None = None,
) -> AlternatesResult:
    """Ranked candidates for replacing ``old_query`` in ``circuit`` (see the module docstring).

    ``families`` restricts the search to those family ids (a shortlist), as the BOM
    review does after ranking the whole catalog once per part and supply.
    """
    old = catalog.resolve(old_query)
    circuit, reference_note = with_reference(circuit)
    old_c = circuit.with_(part=old.id)
    old_t = _analyse(old, old_c)
    vcc = new_vcc if new_vcc is not None else old_t.values.get("vcc")
    kept = kept_quantity(old_t.mode, old_t.timing, old_t.calibration is not None)
    results, rejected = [], []
    pool = catalog.ids() if families is None else [f.upper() for f in families if f.upper() in catalog.families]
    for fid in pool:
        fam = catalog.families[fid]
        if fam.id.upper() == old.id.upper():
            continue
        if fam.function not in CAN_DO[old_t.mode]:
            continue  # not the same job: not listed at all
        rec = fam.supply.recommended
        if not rec.min - 1e-9 <= vcc <= rec.max + 1e-9:
            rejected.append(Rejected(fam.id, f"runs from {rec.min:g} to {rec.max:g} V, not at {vcc:g} V"))
            continue
        try:
            r = swap(catalog, old.id, fam.id, circuit, new_vcc=vcc, series=series, old_result=old_t)
        except RetimeError as exc:
            rejected.append(Rejected(fam.id, exc.message))
            continue
        if r.cls == "unsuitable":
            rejected.append(Rejected(fam.id, "; ".join(r.verdict.reasons)))
            continue
        results.append(r)
    results.sort(key=lambda r: rank_key(r, circuit.r_tolerance))
    assumptions = [reference_note] if reference_note else []
    if new_vcc is None:
        assumptions.append(f"candidates at the old supply, {vcc:g} V (give --new-vcc to move it)")
    return AlternatesResult(
        old=_side(old, old_t, old_t.values.get("vcc")),
        kept=kept,
        new_vcc=vcc,
        candidates=results[:limit] if limit else results,
        rejected=rejected,
        assumptions=assumptions,
    )
