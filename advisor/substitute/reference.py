"""A reference timing network for comparing parts when the board's values are unknown.

A purchaser's BOM line (or ``retime alternates 74121`` typed without values) names a
part but not its R and C. The parts can still be compared: the same reference
network is put on the old part and on each candidate, so the question "do the old
values keep the pulse on the new part?" is answered by the ratio of the two laws at
that network (a 4538 at K = 1.0 against a 74HC4538 at 0.7 gives 30 % short whatever
the values). 10 kΩ and 100 nF sit inside the published Rext/Cext limits of every
family in the catalog and above the C where the K·R·C laws stop holding (common
practice for a comparison point, not a recommendation).
"""

from __future__ import annotations

from advisor.circuit import Circuit

REFERENCE_R = 10e3  # Ω
REFERENCE_C = 100e-9  # F


def needs_reference(circuit: Circuit) -> bool:
    """True when the circuit gives no timing capacitor and no measured pulse to keep."""
    return circuit.c is None and circuit.measured is None


def with_reference(circuit: Circuit) -> tuple[Circuit, str | None]:
    """The circuit with the reference network filled in where values are missing, and
    the assumption line that says so (None when nothing was filled in)."""
    if not needs_reference(circuit):
        return circuit, None
    if circuit.mode == "astable" or circuit.rb is not None:
        filled = circuit.with_(ra=circuit.ra or REFERENCE_R, rb=circuit.rb or REFERENCE_R, c=REFERENCE_C)
        what = "RA = RB = 10 kΩ, C = 100 nF"
    else:
        filled = circuit.with_(r=circuit.r if circuit.r is not None else REFERENCE_R, c=REFERENCE_C)
        what = f"R = {'the given R' if circuit.r is not None else '10 kΩ'}, C = 100 nF"
    note = (f"no timing capacitor given: parts compared on a reference network ({what}); "
            "give --r and --c (or a measurement) for the board's own values")
    return filled, note
