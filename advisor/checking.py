"""Check one circuit: the timing engine's facts judged by the datasheet rules.

One function behind ``retime check``, the workbench's check view and any other
front end, so they all report the same findings in the same order.
"""

from __future__ import annotations

from advisor.circuit import Circuit
from advisor.parts import Family


def check_circuit(family: Family, circuit: Circuit, *, new_vcc: float | None = None,
                  samples: int | None = None):
    """Analyse ``circuit`` on ``family`` (at ``new_vcc`` when the supply moves) and judge
    it by the rules (the only checks; the engine computes facts).

    Returns the :class:`advisor.timing.result.TimingResult` with the rule findings.
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
    result.findings[:] = check_findings(family, circuit, result)
    return result
