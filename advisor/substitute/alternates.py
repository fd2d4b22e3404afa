"""Alternates: every catalog family that can do the old part's job at the (new) supply, ranked.

A family can do the job when its function has the circuit's mode (a one-shot
cannot replace an astable; a 555-class timer or a 4047 can replace either). Each
such family gets a full :func:`advisor.substitute.swap.swap`, judged by the rules
alone (a supply outside the family's range is the rules' finding, not a pre-screen);
the ``unsuitable`` ones and the families that fail are listed under ``rejected``
with the fired finding's message. The ranking and each
candidate's one-line reason are :mod:`advisor.substitute.rank`'s. Obsolete
families are left out (named in ``left_out``) unless ``include_obsolete`` is set or
no family still made can do the job; when listed they come after every other one.
"""

from __future__ import annotations

import os

from advisor.circuit import Circuit
from advisor.errors import RetimeError
from advisor.substitute.rank import rank_facts
from advisor.substitute.reference import with_reference
from advisor.substitute.result import AlternatesResult, Rejected
from advisor.substitute.swap import _analyse, _side, kept_quantity, swap

#: Family functions that can make each mode's output.
CAN_DO = {
    "mono": ("monostable", "timer-555", "monostable-astable"),
    "astable": ("timer-555", "monostable-astable"),
}


def rank_key(result, tolerance: float = 0.05) -> tuple:
    """Sort key of a ranked candidate (:meth:`advisor.substitute.rank.RankFacts.key`)."""
    if result.rank is None:
        raise ValueError(f"{result.new.family}: no ranking facts (rank it through alternates())")
    return result.rank.key()


def alternates(
    catalog,
    old_query: str,
    circuit: Circuit,
    *,
    new_vcc: float | None = None,
    limit: int = 10,
    series: str = "E24",
    families: list[str] | None = None,
    include_obsolete: bool = False,
    stock=None,
    keep_within: float | None = None,
) -> AlternatesResult:
    """Ranked candidates for replacing ``old_query`` in ``circuit`` (see the module docstring).

    ``families`` restricts the search to those family ids (a shortlist), as the BOM
    review does after ranking the whole catalog once per part and supply. ``stock`` is
    a :class:`advisor.substitute.stock.Stock` (parts on the shelf or the approved list):
    those rank first among equals and are marked.
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
        # No supply pre-screen here: a family outside its recommended supply is judged by the
        # rules like any other (supply-outside-recommended declares swap_class: unsuitable) and
        # lands in `rejected` with that finding's own message.
        try:
            r = swap(catalog, old.id, fam.id, circuit, new_vcc=vcc, series=series, old_result=old_t,
                     keep_within=keep_within)
        except RetimeError as exc:
            rejected.append(Rejected(fam.id, exc.message))
            continue
        except Exception as exc:  # a bug in one candidate must not lose the others
            if os.environ.get("RETIME_DEBUG"):
                raise
            rejected.append(Rejected(fam.id, f"could not be judged: internal problem {type(exc).__name__}: {exc} "
                                             "(please report it)"))
            continue
        if r.cls == "unsuitable":
            rejected.append(Rejected(fam.id, "; ".join(r.verdict.reasons)))
            continue
        r.rank = rank_facts(r, old, fam, tolerance=circuit.r_tolerance, edge=circuit.trigger.edge,
                            in_stock=stock.entry_for(fam.id) if stock is not None else None)
        results.append(r)
    results.sort(key=rank_key)
    assumptions = [reference_note] if reference_note else []
    left_out: list[str] = []
    if not include_obsolete and any(r.rank.status != "obsolete" for r in results):
        left_out = [r.new.family for r in results if r.rank.status == "obsolete"]
        results = [r for r in results if r.rank.status != "obsolete"]
    elif not include_obsolete and results:
        assumptions.append("only obsolete families can do this job: listed, marked")
    if new_vcc is None:
        assumptions.append(f"candidates at the old supply, {vcc:g} V (give --new-vcc to move it)")
    return AlternatesResult(
        old=_side(old, old_t, old_t.values.get("vcc")),
        kept=kept,
        new_vcc=vcc,
        candidates=results[:limit] if limit else results,
        rejected=rejected,
        assumptions=assumptions,
        left_out=left_out,
        stock=stock.to_json() if stock is not None else None,
    )
