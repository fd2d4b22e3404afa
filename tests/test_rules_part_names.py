"""Rule messages name the parts they are about (from the context), never a family written into
the text; the calibration and interface rules added for alternates fire where they should.

Expected values: hand calculations beside the asserts and the parts' published laws.
"""

from __future__ import annotations

import pytest

from advisor.catalog import load_catalog
from advisor.circuit import Circuit, Measurement
from advisor.substitute.swap import swap


@pytest.fixture(scope="module")
def cat():
    return load_catalog()


def _texts(findings):
    return [f.message + " " + (f.fix or "") for f in findings]


def test_an_lmc555_swap_never_speaks_of_another_cmos_555(cat):
    res = swap(cat, "NE555", "LMC555", Circuit(part="NE555", vcc=12, mode="astable", ra=4.7e3, rb=47e3, c=10e-9))
    assert res.findings
    for text in _texts(res.findings):
        assert "TLC555" not in text and "ICM7555" not in text, text
    assert any(f.rule == "cmos-555-weaker-output" and "LMC555" in f.message for f in res.findings)


def test_no_rule_message_names_a_family_the_rule_is_not_about():
    import re
    from pathlib import Path

    import yaml

    root = Path(__file__).resolve().parents[1]
    ids = {str(yaml.safe_load(f.read_text(encoding="utf-8"))["id"]) for f in (root / "catalog").glob("*.yaml")
           if f.name != "makers.yaml"}
    pattern = re.compile(r"\b(" + "|".join(sorted(map(re.escape, ids), key=len, reverse=True)) + r")\b")
    offenders = []
    for path in sorted((root / "rules").glob("*.yaml")):
        if path.name == "board.yaml":
            continue  # board rules are kept by their own area
        for rule in yaml.safe_load(path.read_text(encoding="utf-8"))["rules"]:
            scoped = set((rule.get("applies_to") or {}).get("family") or [])
            text = re.sub(r"\{[^}]*\}", "", rule.get("message") or "")
            named = set(pattern.findall(text)) - scoped
            if named and "9602" not in rule["id"]:
                offenders.append((rule["id"], sorted(named)))
    assert offenders == []


def test_measured_time_without_its_unit_is_called_a_likely_slip(cat):
    from advisor.checking import check_circuit

    # 74121, 39k and 3.3 µF: tW = 0.693·39k·3.3µF = 89.2 ms (Signetics N74121). "97" typed
    # without a unit is 97 s: a factor 97/0.0892 ≈ 1087, far outside 0.5…2.
    c = Circuit(part="74121", vcc=5, r=39e3, c=3.3e-6, measured=Measurement("width", 97.0))
    rules = {f.rule: f for f in check_circuit(cat.get("74121"), c).findings}
    assert rules["calibration-unit-slip"].severity == "warning" and "74121" in rules["calibration-unit-slip"].message
    # 97 s is above the 28 s the TI SN74121 sheet gives as its longest pulse.
    assert rules["measured-width-outside-published-range"].severity == "danger"
    ok = Circuit(part="74121", vcc=5, r=39e3, c=3.3e-6, measured=Measurement("width", 0.097))
    assert "calibration-unit-slip" not in {f.rule for f in check_circuit(cat.get("74121"), ok).findings}


def test_hc_to_ls_swap_speaks_of_input_current_and_output_highs(cat):
    res = swap(cat, "74HC221", "74LS221", Circuit(part="74HC221", vcc=5, r=10e3, c=10e-9))
    rules = {f.rule for f in res.findings}
    # TI SDLS213B: LS221 IIL −0.4/−0.8 mA and VOH 2.7 V min, against an HC input's 1 µA and VIH.
    assert {"ttl-input-current-on-cmos-driver", "ttl-output-high-into-cmos-inputs"} <= rules
    back = swap(cat, "74LS221", "74HCT221", Circuit(part="74LS221", vcc=5, r=10e3, c=10e-9))
    assert not {"ttl-input-current-on-cmos-driver", "ttl-output-high-into-cmos-inputs"} & {f.rule for f in back.findings}
