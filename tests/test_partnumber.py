"""Part-number recognition against the shipped catalog.

The part numbers are real orderable or marked forms from makers' ordering
tables (sources beside each case). The 4538 and 555 families come from the
catalog's 4000-series and 555-class files.
"""

from __future__ import annotations

import pytest

from advisor.catalog import load_catalog
from advisor.errors import UnknownPartError
from advisor.partnumber import clean, recognise, resolve_family


@pytest.fixture(scope="module")
def cat():
    return load_catalog()


def _need(cat, *ids):
    missing = [i for i in ids if i.upper() not in cat.families]
    if missing:
        pytest.skip(f"families not in the catalog yet: {missing}")


@pytest.mark.parametrize(
    "query, family",
    [
        ("SN74LS221N", "74LS221"),  # TI ordering code, N = plastic DIP (TI SDLS213)
        ("sn74hc221n", "74HC221"),  # lower case still reads (issue 3)
        ("CD4538BE", "CD4538B"),  # TI CD4538B, E = PDIP
        ("MC14538BCP", "CD4538B"),  # ON/Motorola 5-digit form of the 4538
        ("HEF4538BP", "CD4538B"),  # NXP HEF4538B, P = DIP (HEF4538B rev 06)
        ("NE555P", "NE555"),  # TI NE555, P = PDIP (SLFS022)
        ("LM555CN", "NE555"),  # National/TI LM555, C grade, N = DIP
        ("TLC555CDR", "TLC555"),  # TI TLC555, C grade, D = SOIC, R = reel (SLFS043)
        ("ICM7555IPAZ", "ICM7555"),  # Intersil ICM7555, I grade, PA = PDIP, Z = lead-free (FN2867)
        ("DM74LS123N", "74LS123"),  # Fairchild/National DM prefix
        ("74HC123PW", "74HC123"),  # NXP 74HC123, PW = TSSOP16
        ("SN74121N", "74121"),  # TI SN74121N (store.ti.com)
        ("SN74LS122DR", "74LS122"),  # TI SOIC reel
        ("MM74HC423AN", "74HC423"),  # National MM74HC423A
        ("CD74HCT123E", "74HCT123"),  # TI/Harris SCHS142
        ("SN74AHCT123ADR", "74AHCT123A"),  # TI SCLS420
        ("SN74LV123APWR", "74LV123"),  # TI SCLS393
        ("SN74LVC1G123DCTR", "74LVC1G123"),  # TI SCES586
        ("74HCT123D,652", "74HCT123"),  # NXP 12NC-style packing suffix
        ("DM96LS02N", "96LS02"),  # Fairchild DS009816
        ("DM9602N", "9602"),  # Fairchild DS006611
        ("SN54LS123J", "74LS123"),  # military 54 twin reads as the 74 family
        ("MC74HC4538AN", "74HC4538"),  # ON MC74HC4538A
    ],
)
def test_real_part_numbers_resolve(cat, query, family):
    _need(cat, family)
    assert resolve_family(cat, query).id == family
    assert cat.resolve(query).id == family


def test_exact_id_scores_100(cat):
    top = recognise(cat, "74HC221")[0]
    assert (top.family, top.score, top.how) == ("74HC221", 100.0, "exact")


def test_4538_and_74hc4538_are_not_confused(cat):
    """A 74HC4538 (K = 0.7) is not a CD4538B (K = 1.0): NXP 74HC4538 vs HEF4538B."""
    _need(cat, "CD4538B", "74HC4538")
    assert resolve_family(cat, "74HC4538D").id == "74HC4538"
    assert resolve_family(cat, "CD74HC4538E").id == "74HC4538"
    assert resolve_family(cat, "CD4538BM96").id == "CD4538B"
    assert resolve_family(cat, "14538").id == "CD4538B"


def test_tlc555_is_not_read_as_a_bipolar_555(cat):
    _need(cat, "TLC555", "NE555")
    matches = recognise(cat, "TLC555CP")
    assert matches[0].family == "TLC555"
    assert all(m.family != "NE555" or m.score < matches[0].score for m in matches)


def test_digit_after_base_form_is_not_a_suffix(cat):
    """74HC1234 is not a 74HC123 with a package suffix (property of the rules)."""
    assert all(m.how == "fuzzy" for m in recognise(cat, "74HC1234"))


@pytest.mark.parametrize(
    "typo, family",
    [
        ("SN74LS21N", "74LS221"),  # one character dropped
        ("74HC213", "74HC123"),  # two neighbours swapped (one edit)
        ("74HC1223", "74HC123"),  # one character added
        ("74LS23", "74LS123"),  # one character dropped
        ("NE5555", "NE555"),
    ],
)
def test_typo_still_finds_the_family(cat, typo, family):
    _need(cat, family)
    matches = recognise(cat, typo)
    assert matches[0].family == family
    assert matches[0].how == "fuzzy" and matches[0].score < 90


def test_typo_is_not_resolved_silently(cat):
    with pytest.raises(UnknownPartError) as exc:
        resolve_family(cat, "SN74LS21N")
    assert "did you mean 74LS221" in exc.value.render()


def test_unknown_part_says_so(cat):
    with pytest.raises(UnknownPartError) as exc:
        resolve_family(cat, "LM317T")
    assert "no family in the catalog matches 'LM317T'" in exc.value.render()


def test_ranked_candidates_are_one_per_family_best_first(cat):
    matches = recognise(cat, "74123", limit=10)
    assert matches[0].family == "74123"
    assert len({m.family for m in matches}) == len(matches)
    assert [m.score for m in matches] == sorted((m.score for m in matches), reverse=True)


def test_ambiguous_input_lists_candidates(tmp_path):
    """Two families listing the same base form: resolve refuses and names both."""
    from advisor.catalog import load_dirs
    from support.minicat import write_family

    write_family(tmp_path, "CCC1", part_numbers=["SN7499"], file="c.yaml")
    write_family(tmp_path, "DDD1", part_numbers=["DM7499"], file="d.yaml")
    cat = load_dirs([tmp_path])
    with pytest.raises(UnknownPartError) as exc:
        resolve_family(cat, "7499N")
    assert "ambiguous" in exc.value.render() and "CCC1" in exc.value.render() and "DDD1" in exc.value.render()


def test_clean():
    assert clean(" sn74hc221n ") == "SN74HC221N"
    assert clean("74HCT123D,652") == "74HCT123D652"
