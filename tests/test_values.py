"""Engineering values: IEC 60062 value codes, SI prefixes, and round-trips."""

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from advisor.errors import RetimeError, ValueParseError
from advisor.values import KINDS, format_code, format_eng, parse_quantity, parse_range

# IEC 60062 (formerly IEC 62) resistance codes, examples as listed in Wikipedia "RKM code".
IEC_60062_RESISTORS = [
    ("R47", 0.47),
    ("4R7", 4.7),
    ("470R", 470.0),
    ("4K7", 4.7e3),
    ("4k7", 4.7e3),
    ("47K", 47e3),
    ("47K3", 47.3e3),
    ("470K", 470e3),
    ("4M7", 4.7e6),
]
# IEC 60062 capacitance codes with p, n, µ, m (Wikipedia "RKM code"): 2n2 = 2.2 nF.
IEC_60062_CAPACITORS = [("4p7", 4.7e-12), ("2n2", 2.2e-9), ("4µ7", 4.7e-6), ("4u7", 4.7e-6), ("1m5", 1.5e-3)]


@pytest.mark.parametrize("text,value", IEC_60062_RESISTORS)
def test_iec_60062_resistor_codes(text, value):
    assert parse_quantity(text, "resistance") == pytest.approx(value, rel=1e-12)


@pytest.mark.parametrize("text,value", IEC_60062_CAPACITORS)
def test_iec_60062_capacitor_codes(text, value):
    assert parse_quantity(text, "capacitance") == pytest.approx(value, rel=1e-12)


# The input forms the CLI contract promises (design guide, "Command line contract").
@pytest.mark.parametrize(
    "text,kind,value",
    [
        ("10n", "capacitance", 10e-9),
        ("10 nF", "capacitance", 10e-9),
        ("0.01u", "capacitance", 10e-9),
        ("0.01µF", "capacitance", 10e-9),
        ("0.01μF", "capacitance", 10e-9),  # Greek mu, as some keyboards type it
        ("100p", "capacitance", 100e-12),
        ("1M", "resistance", 1e6),
        ("2.2 MΩ", "resistance", 2.2e6),
        ("10 kohm", "resistance", 10e3),
        ("64us", "time", 64e-6),
        ("64 µs", "time", 64e-6),
        ("15.625kHz", "frequency", 15625.0),
        ("1e-8", "capacitance", 1e-8),
        ("15 V", "voltage", 15.0),
        ("5%", "fraction", 0.05),
        ("4,7 nF", "capacitance", 4.7e-9),
    ],
)
def test_contract_forms(text, kind, value):
    assert parse_quantity(text, kind) == pytest.approx(value, rel=1e-12)


# ITU-R BT.601 / BT.470: a 625-line system has a 64 µs line at 15 625 Hz.
def test_line_period_and_frequency_agree():
    assert 1 / parse_quantity("64 µs", "time") == pytest.approx(parse_quantity("15.625kHz", "frequency"))


@pytest.mark.parametrize(
    "text,kind",
    [("abc", "resistance"), ("4k7k", "resistance"), ("", "capacitance"), ("-1", "resistance"),
     ("nan", "capacitance"), ("inf", "time"), ("0", "capacitance"), ("10 nF", "resistance"),
     ("4R7", "capacitance"), ("1,000", "resistance"), ("10 kHz", "time")],
)
def test_refused_with_the_input_quoted(text, kind):
    with pytest.raises(ValueParseError) as exc:
        parse_quantity(text, kind)
    assert repr(text) in str(exc.value)
    assert "expected" in str(exc.value)


def test_zero_ohm_series_resistor_is_legal_but_zero_farad_is_not():
    assert parse_quantity("0", "resistance") == 0.0
    with pytest.raises(ValueParseError, match="greater than zero"):
        parse_quantity("0", "capacitance")


@pytest.mark.parametrize(
    "value,unit,text",
    [(4700, "Ω", "4.7 kΩ"), (1e-8, "F", "10 nF"), (64e-6, "s", "64 µs"), (999.99, "Ω", "1 kΩ"), (2.2e6, "Ω", "2.2 MΩ")],
)
def test_format_eng(value, unit, text):
    assert format_eng(value, unit) == text


@pytest.mark.parametrize("value,text", [(4700, "4k7"), (470, "470R"), (4.7, "4R7"), (0.47, "R47"), (47300, "47k3"), (1e6, "1M")])
def test_format_code_resistors(value, text):
    assert format_code(value) == text


def test_parse_range():
    assert parse_range("50us..70us", "time") == pytest.approx((50e-6, 70e-6))
    with pytest.raises(ValueParseError):
        parse_range("70us..50us", "time")


_PHYSICAL = ["resistance", "capacitance", "time", "frequency", "voltage"]


@settings(max_examples=300, deadline=None)
@given(st.data(), st.sampled_from(_PHYSICAL))
def test_format_then_parse_returns_the_value(data, kind):
    """Property: formatting at full precision and parsing back gives the value (inside the
    quantity's plausibility limits, advisor.values.Limits)."""
    lim = KINDS[kind].limits
    value = data.draw(st.floats(min_value=lim.low, max_value=lim.high, allow_nan=False, allow_infinity=False))
    text = format_eng(value, KINDS[kind].unit, digits=17)
    assert math.isclose(parse_quantity(text, kind), value, rel_tol=1e-12)


@settings(max_examples=500, deadline=None)
@given(st.text(max_size=20), st.sampled_from(list(KINDS)))
def test_any_string_parses_or_raises_the_project_error(text, kind):
    """Property: never a bare Python exception, whatever the input."""
    try:
        value = parse_quantity(text, kind)
    except RetimeError:
        return
    assert math.isfinite(value)


@settings(max_examples=200, deadline=None)
@given(st.from_regex(r"\A[0-9]{0,3}[.,]?[0-9]{0,3}\s?[pnuµmkKMGRr]?[0-9]{0,2}\s?(F|Ω|s|Hz|V|ohm)?\Z"), st.sampled_from(_PHYSICAL))
def test_value_like_strings_parse_or_raise(text, kind):
    try:
        parse_quantity(text, kind)
    except RetimeError:
        pass
