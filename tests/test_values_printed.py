"""Values as printed on parts and typed by technicians (README "Values as printed").

Each accepted form names its source; the refusals name what they refuse and why.
"""

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from advisor.errors import ValueParseError
from advisor.markings import TOLERANCE_LETTERS
from advisor.values import KINDS, check_plausible, format_code, format_eng, parse_quantity, read_value

# --- three-digit capacitor code ---------------------------------------------------------
# Two significant digits and a multiplier, in pF; "105K 330V" = 1 µF ±10 % 330 V (IEC 60384-1
# marking as summarised at primidi.com/rated_capacitance, Wikipedia "Capacitor"); "103 = 10 000 pF"
# (eestudenthelp.blogspot.com "Capacitor markings", 2009); 104 = 100 nF, 472 = 4.7 nF (issue text,
# EIA-198 style).
CAPACITOR_CODES = [("104", 100e-9), ("472", 4.7e-9), ("103", 10e-9), ("105", 1e-6), ("101", 100e-12), ("100", 10e-12)]


@pytest.mark.parametrize("text,value", CAPACITOR_CODES)
def test_three_digit_capacitor_code(text, value):
    r = read_value(text, "capacitance")
    assert r.value == pytest.approx(value, rel=1e-12)
    assert any("capacitor code" in n for n in r.notes)  # the reading is shown, not silent


def test_capacitor_code_with_tolerance_and_rating():
    # "105K 330V": 1 µF, K = ±10 %, 330 V (IEC 60384-1 marking, primidi.com/rated_capacitance).
    r = read_value("105K 330V", "capacitance")
    assert r.value == pytest.approx(1e-6, rel=1e-12)
    assert r.marks == ("tolerance letter K (±10 %)", "rated 330 V")


def test_a_code_is_only_a_capacitance():
    assert parse_quantity("104", "resistance") == 104.0
    assert parse_quantity("104", "time") == 104.0
    assert parse_quantity("104p", "capacitance") == pytest.approx(104e-12)


def test_a_104_farad_timing_capacitor_is_refused_with_the_limit():
    with pytest.raises(ValueParseError, match=r"104 F is above 1 F, the largest accepted"):
        parse_quantity("104 F", "capacitance")


@settings(max_examples=200, deadline=None)
@given(st.integers(10, 99), st.sampled_from([0, 1, 2, 3, 4, 5, 6]))
def test_property_code_digits(sig, mult):
    """Property: XYZ = XY × 10^Z pF for every code digit pair (the code's own definition)."""
    assert parse_quantity(f"{sig}{mult}", "capacitance") == pytest.approx(sig * 10.0 ** mult * 1e-12, rel=1e-12)


# --- old MFD / MF / mf markings: microfarads, with a note ---------------------------------
# "mfd" was how µF was typed without a µ; ".1mf" is 0.1 µF (nostalgiaair.org forum t11905,
# "printed as mfd", "may be written as .1mf"); "mmf" (µµF) is the old pF.
@pytest.mark.parametrize("text,value", [("10mf", 10e-6), ("10 MFD", 10e-6), ("10MF", 10e-6), ("0.1 mfd", 0.1e-6),
                                        (".1mf", 0.1e-6), ("47 mmfd", 47e-12)])
def test_old_microfarad_markings(text, value):
    r = read_value(text, "capacitance")
    assert r.value == pytest.approx(value, rel=1e-12)
    assert r.notes and ("microfarads" in r.notes[0] or "micro-microfarads" in r.notes[0])


def test_si_millifarad_is_read_as_written():
    # 'mF' exactly is the SI millifarad, as retime itself prints it (format_eng).
    assert parse_quantity("1 mF", "capacitance") == pytest.approx(1e-3)
    assert read_value("1 mF", "capacitance").notes == ()


def test_capital_m_code_on_a_capacitance_is_refused_with_both_readings():
    with pytest.raises(ValueParseError, match=r"4.7 µF \(as old MF markings\) or 4.7 mF"):
        parse_quantity("4M7", "capacitance")


# --- case-insensitive prefixes where nothing is ambiguous (common practice) ----------------
@pytest.mark.parametrize("text,kind,value", [
    ("100NF", "capacitance", 100e-9), ("2N2", "capacitance", 2.2e-9), ("10UF", "capacitance", 10e-6),
    ("100PF", "capacitance", 100e-12), ("4U7", "capacitance", 4.7e-6), ("64US", "time", 64e-6),
    ("100NS", "time", 100e-9), ("15.625KHZ", "frequency", 15625.0), ("1MHZ", "frequency", 1e6),
    ("10KOHM", "resistance", 10e3), ("4K7", "resistance", 4.7e3),
])
def test_case_insensitive_prefixes(text, kind, value):
    assert parse_quantity(text, kind) == pytest.approx(value, rel=1e-12)


@settings(max_examples=200, deadline=None)
@given(st.integers(1, 999), st.sampled_from(["p", "n", "u"]), st.sampled_from([("capacitance", "F"), ("time", "s")]))
def test_property_case_does_not_matter_for_p_n_u(number, prefix, kind_unit):
    kind, unit = kind_unit
    lower = parse_quantity(f"{number}{prefix}{unit}", kind)
    assert parse_quantity(f"{number}{prefix.upper()}{unit.upper()}", kind) == lower


# --- M and m where they are ambiguous -------------------------------------------------------
def test_milliseconds_in_capitals_are_milliseconds_with_a_note():
    # In all-capital text case carries nothing; no time here is in megaseconds (common practice).
    r = read_value("1.5MS", "time")
    assert r.value == pytest.approx(1.5e-3)
    assert "milliseconds" in r.notes[0]


def test_si_megaseconds_are_refused_by_the_limit():
    with pytest.raises(ValueParseError, match=r"1 Ms is above 100 ks, the largest accepted"):
        parse_quantity("1 Ms", "time")


@pytest.mark.parametrize("text,both", [
    ("1m", r"1 mΩ \(milli\) or 1 MΩ \(mega\)"),
    ("4.7 mohm", r"4.7 mΩ \(milli\) or 4.7 MΩ \(mega\)"),
])
def test_lower_case_m_on_a_resistance_is_refused_with_both_readings(text, both):
    with pytest.raises(ValueParseError, match=both):
        parse_quantity(text, "resistance")


def test_upper_case_m_on_a_resistance_is_mega_and_milliohm_needs_the_symbol():
    # IEC 60062 resistor codes: M = mega (4M7); SI: 1 mΩ with the symbol.
    assert parse_quantity("4M7", "resistance") == pytest.approx(4.7e6)
    assert parse_quantity("1 mΩ", "resistance") == pytest.approx(1e-3)


def test_time_with_a_bare_capital_m_is_refused_with_both_readings():
    with pytest.raises(ValueParseError, match=r"1.5 ms \(milli\) or 1.5 Ms \(mega\)"):
        parse_quantity("1.5M", "time")


def test_lower_case_mhz_is_refused_with_both_readings():
    with pytest.raises(ValueParseError, match=r"1 mHz \(milli\) or 1 MHz \(mega\)"):
        parse_quantity("1mhz", "frequency")
    assert parse_quantity("1 mHz", "frequency") == pytest.approx(1e-3)  # the SI spelling, exactly


# --- Meg (SPICE: MEG = 1e6, M = milli; Number::Spice documentation, metacpan) ----------------
@pytest.mark.parametrize("text", ["1Meg", "1MEG", "1 meg", "1megohm", "1 Meg Ω"])
def test_meg(text):
    assert parse_quantity(text, "resistance") == pytest.approx(1e6)


# --- 470 R, voltages ------------------------------------------------------------------------
def test_ohms_letter_after_a_space():
    assert parse_quantity("470 R", "resistance") == pytest.approx(470.0)  # IEC 60062: R marks ohms


@pytest.mark.parametrize("text,value", [("3V3", 3.3), ("12 VDC", 12.0), ("12VDC", 12.0), ("5V", 5.0),
                                        ("1V8", 1.8), ("15 V", 15.0)])
def test_voltages_as_schematics_write_them(text, value):
    # 3V3: the RKM style with V as the decimal point, as schematics name rails (common practice).
    assert parse_quantity(text, "voltage") == pytest.approx(value, rel=1e-12)


def test_a_resistor_code_as_a_voltage_is_refused_not_3100_volts():
    with pytest.raises(ValueParseError, match=r"'3K1' is a resistor-style code .*written 3V1 or 3.1 V"):
        parse_quantity("3K1", "voltage")


def test_a_gigavolt_supply_is_refused_with_the_limit_and_the_caution():
    with pytest.raises(ValueParseError, match=r"1 GV is above 1 kV, the largest accepted.*licensed practice"):
        parse_quantity("1e9", "voltage")


def test_ac_voltage_is_not_a_supply():
    with pytest.raises(ValueParseError, match="AC voltage is not a timer's supply"):
        parse_quantity("5 VAC", "voltage")


# --- a value followed by a tolerance letter, rating or dielectric ----------------------------
# Tolerance letters per IEC 60062 (eestudenthelp.blogspot.com "Capacitor markings", 2009).
@pytest.mark.parametrize("text,kind,value,marks", [
    ("4K7J", "resistance", 4.7e3, ("tolerance letter J (±5 %)",)),
    ("22uF 25V", "capacitance", 22e-6, ("rated 25 V",)),
    ("100nF X7R", "capacitance", 100e-9, ("dielectric X7R",)),
    ("100n 50V C0G", "capacitance", 100e-9, ("rated 50 V", "dielectric C0G")),
    ("10k 1%", "resistance", 10e3, ("tolerance ±1%",)),
    ("473J", "capacitance", 47e-9, ("tolerance letter J (±5 %)",)),
])
def test_value_then_marks(text, kind, value, marks):
    r = read_value(text, kind)
    assert r.value == pytest.approx(value, rel=1e-12)
    assert r.marks == marks
    assert r.remarks("--x")[-1].endswith(", ".join(marks))  # kept and shown


def test_unknown_words_after_a_value_are_refused_not_dropped():
    with pytest.raises(ValueParseError, match="'banana' after the value is not a tolerance, rating or dielectric"):
        parse_quantity("10n banana", "capacitance")


def test_a_lower_case_letter_is_not_a_tolerance():
    with pytest.raises(ValueParseError):
        parse_quantity("4k7k", "resistance")


@settings(max_examples=200, deadline=None)
@given(st.sampled_from([1.0, 1.5, 2.2, 3.3, 4.7, 6.8, 8.2]), st.sampled_from([1, 1e3, 1e6]),
       st.sampled_from(sorted("FGJKMZ")))
def test_property_tolerance_letter_keeps_the_value(mant, scale, letter):
    code = format_code(mant * scale)
    r = read_value(code.upper() + letter, "resistance")
    assert r.value == pytest.approx(mant * scale, rel=1e-9)
    assert r.marks == (f"tolerance letter {letter} ({TOLERANCE_LETTERS[letter]})",)


# --- tolerances ------------------------------------------------------------------------------
@pytest.mark.parametrize("text", ["±5%", "± 5 %", "+/-5%", "5%", "0.05"])
def test_tolerances(text):
    assert parse_quantity(text, "fraction") == pytest.approx(0.05)


# --- commas ------------------------------------------------------------------------------------
def test_decimal_comma_where_it_cannot_be_a_thousands_separator():
    assert parse_quantity("4,7k", "resistance") == pytest.approx(4.7e3)
    assert parse_quantity("4,7 nF", "capacitance") == pytest.approx(4.7e-9)
    assert parse_quantity("2,2", "voltage") == pytest.approx(2.2)


@pytest.mark.parametrize("text,both", [
    ("4,700 pF", r"4.7 pF \(decimal comma\) or 4.7 nF \(thousands separator\)"),
    ("1,000uF", r"1 µF \(decimal comma\) or 1 mF \(thousands separator\)"),
])
def test_ambiguous_commas_are_refused_with_both_readings(text, both):
    with pytest.raises(ValueParseError, match=both):
        parse_quantity(text, "capacitance")


@settings(max_examples=200, deadline=None)
@given(st.integers(1, 999), st.integers(0, 999))
def test_property_three_digits_after_a_comma_are_refused(whole, frac):
    with pytest.raises(ValueParseError, match="comma is ambiguous"):
        parse_quantity(f"{whole},{frac:03d}k", "resistance")


@settings(max_examples=200, deadline=None)
@given(st.integers(1, 999), st.integers(1, 99))
def test_property_a_short_fraction_after_a_comma_is_decimal(whole, frac):
    assert parse_quantity(f"{whole},{frac}k", "resistance") == parse_quantity(f"{whole}.{frac}k", "resistance")


# --- plausibility limits -------------------------------------------------------------------------
@settings(max_examples=300, deadline=None)
@given(st.sampled_from(["resistance", "capacitance", "time", "frequency", "voltage"]), st.booleans(),
       st.floats(min_value=1.001, max_value=1e6))
def test_property_outside_the_limits_is_refused_naming_the_limit(kind, above, factor):
    lim = KINDS[kind].limits
    value = lim.high * factor if above else lim.low / factor
    bound = format_eng(lim.high if above else lim.low, KINDS[kind].unit)
    with pytest.raises(ValueParseError, match="largest accepted" if above else "smallest accepted") as exc:
        parse_quantity(repr(value), kind)
    assert bound in str(exc.value)
    with pytest.raises(ValueParseError, match=bound):
        check_plausible(value, kind, "x")


def test_limits_hold_the_catalog_ranges():
    # The limits must never refuse a real network: 10 pF .. 10 000 µF timing capacitors and
    # 1 kΩ .. 10 MΩ resistors (NE555 and CD4528B ranges, common practice), 1.5..18 V supplies.
    for v, kind in [(10e-12, "capacitance"), (10e-3, "capacitance"), (1e3, "resistance"), (10e6, "resistance"),
                    (1.5, "voltage"), (18, "voltage"), (10e-9, "time"), (3600.0, "time")]:
        assert check_plausible(v, kind, "x") == v


@settings(max_examples=300, deadline=None)
@given(st.text(max_size=24), st.sampled_from(list(KINDS)))
def test_property_any_text_reads_or_is_refused_with_the_input_quoted(text, kind):
    try:
        r = read_value(text, kind)
    except ValueParseError as exc:
        assert "cannot read" in exc.message
        return
    assert math.isfinite(r.value)
    lim = KINDS[kind].limits
    if lim is not None and r.value:
        assert lim.low <= abs(r.value) <= lim.high
