"""The workbench's one door to the engine: it parses the form, quotes bad input back and
never raises, whatever is typed. No terminal needed."""

from __future__ import annotations

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from advisor.catalog import load_catalog
from advisor.tui.bridge import FIELDS, evaluate, parse_fields, ui_words


@pytest.fixture(scope="module")
def catalog():
    return load_catalog()


@pytest.mark.parametrize("key,text", [("r", "4x7"), ("c", "ten nano"), ("vcc", "-5"), ("trigger_period", "0"), ("pot_setting", "1.5")])
def test_bad_value_is_quoted_with_what_is_expected(key, text):
    _, errors = parse_fields({key: text})
    assert f"'{text}'" in errors[key]
    assert "expected" in errors[key]


def test_value_codes_read_as_the_standard_says():
    # IEC 60062 value codes: 4k7 = 4700 Ω, 2n2 = 2.2 nF; SI prefixes for time.
    values, errors = parse_fields({"r": "4k7", "c": "2n2", "trigger_period": "64us", "pot_setting": "50%"})
    assert not errors
    assert values["r"] == pytest.approx(4700.0)
    assert values["c"] == pytest.approx(2.2e-9)
    assert values["trigger_period"] == pytest.approx(64e-6)
    assert values["pot_setting"] == pytest.approx(0.5)


def test_unknown_part_is_marked_on_its_field(catalog):
    out = evaluate(catalog, {"old": "XYZ-not-a-part"})
    assert out.kind == "error"
    assert "XYZ-not-a-part" in out.field_errors["old"]


def test_engine_flags_become_field_names():
    assert ui_words("give the timing capacitor (--c)") == "give the timing capacitor ('C')"
    assert ui_words("move it with --new-vcc") == "move it with 'New supply'"
    assert ui_words("unknown --flag stays") == "unknown --flag stays"


_text = st.text(alphabet="0123456789.kKnpuµmMRr%-eE +xV ", max_size=6)


@settings(max_examples=60, deadline=None)
@given(st.fixed_dictionaries({f.key: _text for f in FIELDS if f.kind != "part"}))
def test_evaluate_never_raises_and_never_reports_an_internal_error(catalog, form):
    # Property: whatever is typed, the answer is a result or a one-line message, not a crash.
    form = {**form, "old": "74HC221"}
    out = evaluate(catalog, form)
    assert out.kind in ("check", "error")
    assert "internal error" not in (out.problem or "")


_GOOD = {
    "voltage": ["", "3.3", "5", "15"],
    "resistance": ["", "100", "4k7", "10k", "1M"],
    "capacitance": ["", "100p", "2n2", "10n", "1u"],
    "fraction": ["", "0", "50%", "1"],
    "time": ["", "1us", "64us", "1ms"],
    "target": ["", "100us", "1kHz"],
    "series": ["", "E12", "E96"],
    "text": [""],
    "count": ["", "1024", "2^13"],
}


def _good(f):
    return f.choices + ("",) if f.kind == "choice" else _GOOD[f.kind]


@settings(max_examples=40, deadline=None)
@given(st.fixed_dictionaries({f.key: st.sampled_from(_good(f)) for f in FIELDS if f.kind != "part"}),
       st.sampled_from(["", "74HC221", "NE555", "CD4538B"]))
def test_readable_forms_never_crash_the_engine(catalog, form, new):
    # Property: values that all read still give a result or a one-line message for check and swap.
    out = evaluate(catalog, {**form, "old": "74LS221", "new": new})
    assert out.kind in ("check", "swap", "error")
    assert "internal error" not in (out.problem or ""), out.problem


def test_divide_fields_read_as_the_sheets_print_them(catalog):
    # A 74HC4060 at /1024 with Rt 100k, Ct 10n: T = 2.5·Rt·Ct = 2.5 ms per oscillator period
    # (Philips 74HC/HCT4060, December 1990), so the output period is 1024 × 2.5 ms = 2.56 s.
    values, errors = parse_fields({"divide": "2^10", "new_divide": "nine"})
    assert values["divide"] == 1024 and "new_divide" in errors and "'nine'" in errors["new_divide"]
    out = evaluate(catalog, {"old": "74HC4060", "vcc": "5", "r": "100k", "c": "10n", "divide": "1024"})
    assert out.kind == "check", out.problem
    assert out.data["timing"]["nominal"]["period"] == pytest.approx(2.56, rel=1e-3)
    swap = evaluate(catalog, {"old": "74HC4060", "new": "CD4541B", "vcc": "5", "r": "100k", "c": "10n",
                              "divide": "1024", "new_divide": "1024"})
    assert swap.kind == "swap", swap.problem
    assert swap.data["new"]["values"]["divide"] == 1024


def test_new_maker_field_names_the_replacements_maker(catalog):
    # 74HC123: NXP gives K = 0.45 at 5 V, the Fairchild MM74HC123A sheet T = R·C (catalog/74hc123.yaml).
    out = evaluate(catalog, {"old": "74LS123", "new": "74HC123", "vcc": "5", "r": "10k", "c": "100n",
                             "new_maker": "Fairchild"})
    assert out.kind == "swap", out.problem
    assert out.data["new"]["maker"] == "Fairchild"
