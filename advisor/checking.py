"""Check one circuit: the timing engine's result with the datasheet rules' findings merged.

One function behind ``retime check``, the workbench's check view and any other
front end, so they all report the same findings in the same order.
"""

from __future__ import annotations

from advisor.circuit import Circuit
from advisor.findings import merge_findings
from advisor.parts import Family


def check_circuit(family: Family, circuit: Circuit, *, new_vcc: float | None = None,
                  samples: int | None = None):
    """Analyse ``circuit`` on ``family`` (at ``new_vcc`` when the supply moves) and add
    the rule findings; engine findings whose rule twin fired are dropped.

    Returns the :class:`advisor.timing.result.TimingResult`, its findings merged.
    """
    from advisor.rules import check_findings
    from advisor.timing import analyse

    moved = None
    if new_vcc is not None:
        moved = (f"supply moved from {circuit.vcc:g} V to {new_vcc:g} V" if circuit.vcc is not None
                 else f"checked at the new supply, {new_vcc:g} V")
        if circuit.trigger.high is None:
            moved += "; the trigger source is assumed to move with it (give --trigger-high to check its levels)"
        circuit = circuit.with_(vcc=new_vcc)
    result = analyse(family, circuit, samples=samples)
    if moved:
        result.assumptions.append(moved)
    rules = check_findings(family, circuit, result.to_json())
    result.findings[:] = merge_findings(result.findings, rules)
    return result
