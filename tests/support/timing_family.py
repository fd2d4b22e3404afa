"""Tiny inline part families for the timing-engine tests.

The engine is tested against these, not the shipped catalog, so its tests do not
depend on catalog edits (pint's habit: a tiny inline fixture). Every number in
them is stated by the test that builds the family, next to its source.
"""

from __future__ import annotations

from advisor.parts import Family


def make_family(
    law: str,
    constants: dict[str, float | list],
    *,
    fid: str = "TESTPART",
    function: str = "monostable",
    retrigger: str = "no",
    supply: tuple[float, float] = (2.0, 18.0),
    components: dict | None = None,
    timing_extra: dict | None = None,
    behaviour_extra: dict | None = None,
) -> Family:
    """A valid Family with the given law and constants (a float or a list of dicts each)."""
    consts = {}
    for name, v in constants.items():
        if isinstance(v, list):
            consts[name] = [dict({"source": "test"}, **x) for x in v]
        else:
            consts[name] = [{"value": float(v), "source": "test"}]
    data = {
        "id": fid,
        "title": "inline test family",
        "function": function,
        "technology": "cmos-555" if law == "timer-555" else "hc",
        "part_numbers": [fid],
        "supply": {"recommended": {"min": supply[0], "max": supply[1], "source": "test"},
                   "absolute_max": {"value": supply[1] + 1, "source": "test"}},
        "timing": {"law": law, "constants": consts, **(timing_extra or {})},
        "components": components or {},
        "behaviour": {"retrigger": retrigger, "retrigger_source": "test", **(behaviour_extra or {})},
        "interface": {"inputs": "cmos"},
        "packages": [{"name": "DIP-8", "source": "test", "pins": [{"pin": 1, "name": "GND", "function": "GND"}]}],
        "sources": [{"id": "test", "title": "values stated in the test", "kind": "measurement"}],
    }
    return Family.model_validate(data)
