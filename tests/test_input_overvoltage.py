"""A trigger above the supply is judged by the input's structure, from the catalog.

- Inputs with clamp diodes to VCC (HC: NXP 74HC04 rev 4 limiting values, input clamp current
  for VI > VCC + 0.5 V; NXP 74LV123 rev 7 Table 4, the same row): more than 0.5 V above the
  supply is a danger (rule trigger-above-supply).
- Over-voltage-tolerant inputs (Nexperia 74LVC1G123: inputs accept up to 5.5 V whatever VCC;
  TTL: TI SN74LS221 SDLS213B, input voltage 7 V) are a danger only above their rating, taken
  as the part's absolute maximum supply (rule trigger-above-input-rating).
"""

from __future__ import annotations

import pytest

from advisor.checking import check_circuit
from advisor.circuit import Circuit, Trigger


def _rules(cat, part, vcc, high):
    res = check_circuit(cat.get(part), Circuit(part=part, vcc=vcc, r=10e3, c=10e-9, trigger=Trigger(None, None, high)))
    return {f.rule for f in res.findings if f.severity == "danger"}


@pytest.mark.parametrize("part, vcc, high, danger", [
    ("74HC123", 3.3, 5.0, "trigger-above-supply"),        # clamped: 1.7 V above VCC
    ("74LV123", 3.3, 5.0, "trigger-above-supply"),        # makers differ; judged clamped (NXP)
    ("74LVC1G123", 3.3, 5.0, None),                       # 5 V into a 5.5 V tolerant input
    ("74LS123", 5.0, 12.0, "trigger-above-input-rating"),  # TTL input rated 7 V
    ("74LS123", 5.0, 5.0, None),
])
def test_trigger_above_the_supply_is_judged_by_the_input(cat, part, vcc, high, danger):
    got = _rules(cat, part, vcc, high) & {"trigger-above-supply", "trigger-above-input-rating"}
    assert got == ({danger} if danger else set())
