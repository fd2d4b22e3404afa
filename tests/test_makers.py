"""Makers as data: the part number's maker picks its own constant; makers' figures are
alternatives (band = union of per-maker bands; the Monte Carlo draws a maker first).

Sources: Fairchild MM74HC123A (September 1983, revised May 2001): "simple pulse width
formula T = RC"; NXP 74HC123 rev 9 (19 January 2015) note 2: K = 0.45 at 5 V; Philips
74HC/HCT123 (1998 Jul 08): K = 0.55 at 5 V; TI SN74LS123 (SDLS043): tw = K·RT·Cext,
K ≈ 0.45; onsemi MC14528B/D rev 3 and Nexperia HEF4528B rev 10 (catalog/cd4528b.yaml).
"""

from __future__ import annotations

import json
import subprocess
import sys

import pytest

from advisor.catalog import load_catalog
from advisor.circuit import Circuit
from advisor.errors import InputError
from advisor.timing import analyse, design
from advisor.circuit import Target

CAT = load_catalog()
HC123 = CAT.get("74HC123")


def run(*args: str) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "advisor", *args], capture_output=True, text=True)


@pytest.mark.parametrize("part,makers", [
    ("MM74HC123AN", {"Fairchild", "National"}),
    ("CD4528BCN", {"National", "Fairchild"}),  # National/Fairchild 4000-series form
    ("CD74HC123E", {"TI"}),
    ("HEF4538BP", {"NXP", "Philips", "Nexperia"}),
    ("MC14528BCP", {"onsemi", "Motorola"}),
])
def test_part_numbers_name_their_makers(part, makers):
    hit = CAT.makers.of_part(part)
    assert hit is not None and makers <= set(hit.makers)


def test_ne555_names_no_single_maker_and_a_bare_74_number_names_none():
    assert len(CAT.makers.of_part("NE555P").makers) > 3  # made by many: the file says so
    assert CAT.makers.of_part("74HC123D") is None


def test_mm74hc123a_uses_fairchilds_constant():
    # Fairchild MM74HC123A: T = R·C -> 10 kΩ · 100 nF = 1 ms
    out = run("check", "MM74HC123AN", "--r", "10k", "--c", "100n", "--vcc", "5", "--json")
    assert out.returncode == 0, out.stderr
    j = json.loads(out.stdout)
    assert j["maker"] == "Fairchild" and j["maker_basis"] == "part-number prefix"
    assert j["timing"]["nominal"]["width"] == pytest.approx(1e-3, rel=0.01)


def test_74hc123_without_maker_spans_both_designs():
    res = analyse(HC123, Circuit("74HC123", vcc=5, r=10e3, c=100e-9, r_tol=0.001, c_tol=0.001))
    j = res.to_json()
    assert j["maker"] is None and j["maker_basis"] == "unknown: band spans makers"
    assert j["timing"]["min"]["width"] <= 0.45 * 10e3 * 100e-9 * 1.0001  # NXP K = 0.45
    assert j["timing"]["max"]["width"] >= 1.0 * 10e3 * 100e-9 * 0.9999  # Fairchild T = R·C


def test_design_for_the_fairchild_part_lands_near_10k():
    c = Circuit("74HC123", vcc=5, c=100e-9, target=Target("width", 1e-3), makers=("Fairchild",),
                maker_basis="part-number prefix")
    d = design(HC123, c)
    assert d.maker == "Fairchild"
    assert d.best.values["r"] == pytest.approx(10e3, rel=0.05)


def test_monte_carlo_draws_a_maker_then_its_part():
    # Four formulas at 5 V: NXP 0.45, Philips 0.55, Fairchild 1.0, Hitachi 1.0 (K·R·C). A blend
    # would put samples between the designs; drawing a maker first leaves the gap empty.
    res = analyse(HC123, Circuit("74HC123", vcc=5, r=10e3, c=100e-9, r_tol=0.001, c_tol=0.001), samples=40_000)
    dist = res.distribution
    assert dist is not None
    rc = 10e3 * 100e-9
    from advisor.timing.model import build
    from advisor.timing.montecarlo import draw
    import numpy as np

    v = draw(build(HC123, Circuit("74HC123", vcc=5, r=10e3, c=100e-9, r_tol=0.001, c_tol=0.001)), 40_000,
             np.random.default_rng(3), "width")
    share_rc = np.mean((v > 0.8 * rc) & (v < 1.25 * rc))
    assert 0.4 < share_rc < 0.6  # two of the four formulas are T = R·C
    assert np.mean((v > 0.7 * rc) & (v < 0.8 * rc)) < 0.02


def test_one_formula_stays_together_74ls123():
    # TI's K = 0.45 has no R offset; the textbook's 0.32·(R + 0.7 kΩ) is another formula.
    ls = CAT.get("74LS123")
    res = analyse(ls, Circuit("74LS123", vcc=5, r=5e3, c=10e-9, r_tol=0.001, c_tol=0.001,
                              makers=("TI",), maker_basis="--maker"))
    assert res.maker == "TI"
    assert res.timing["nominal"]["width"] == pytest.approx(0.45 * 5e3 * 10e-9, rel=1e-9)
    assert "r_offset" not in res.constants or res.constants["r_offset"].max == 0.0


def test_cd4528b_band_has_no_jump_around_10v():
    fam = CAT.get("CD4528B")
    bands = [analyse(fam, Circuit("CD4528B", vcc=v, r=10e3, c=10e-9)).timing for v in (9.9, 10.0, 10.1)]
    for key in ("nominal", "min", "max"):
        ws = [b[key]["width"] for b in bands]
        assert max(ws) / min(ws) < 1.05, (key, ws)


def test_forced_maker_errors_are_input_errors():
    bad = run("check", "74HC123", "--r", "10k", "--c", "100n", "--maker", "Fairchlid")
    assert bad.returncode == 2 and "did you mean" in bad.stderr and "Fairchild" in bad.stderr
    none = run("check", "74HC123", "--r", "10k", "--c", "100n", "--maker", "Toshiba")
    assert none.returncode == 2 and "Toshiba" in none.stderr


def test_forced_maker_is_said():
    out = run("check", "74HC123", "--r", "10k", "--c", "100n", "--vcc", "5", "--maker", "nxp", "--json")
    j = json.loads(out.stdout)
    assert j["maker"] == "NXP" and j["maker_basis"] == "--maker"
    assert j["timing"]["nominal"]["width"] == pytest.approx(0.45e-3, rel=1e-6)  # NXP K = 0.45


def test_swap_names_both_makers():
    out = run("swap", "SN74LS123N", "MM74HC123AN", "--r", "10k", "--c", "100n", "--json")
    assert out.returncode == 0, out.stderr
    j = json.loads(out.stdout)
    assert j["old"]["maker"] == "TI" and j["new"]["maker"] == "Fairchild"



def test_swap_from_a_part_that_names_no_maker_says_the_target_is_uncertain():
    # A bare 74HC123 may be NXP's (K = 0.45 at 5 V, rev 9) or Fairchild's (T = RC): the
    # time to keep is unknown by about 2x, and the swap says so until it is measured or named.
    base = ("swap", "74HC123", "MM74HC123AN", "--r", "10k", "--c", "100n", "--vcc", "5", "--json")
    j = json.loads(run(*base).stdout)
    assert "old-maker-unknown" in {f["rule"] for f in j["findings"]}
    for extra in (("--old-maker", "Fairchild"), ("--measured-width", "1ms")):
        k = json.loads(run(*base, *extra).stdout)
        assert "old-maker-unknown" not in {f["rule"] for f in k["findings"]}
    named = json.loads(run(*base, "--old-maker", "Fairchild").stdout)
    assert named["old"]["maker"] == "Fairchild" and named["old"]["maker_basis"] == "--maker"
    assert named["old"]["timing"]["nominal"]["width"] == pytest.approx(1.0e-3, rel=1e-6)  # Fairchild T = RC
    assert named["class"] == "drop-in"  # the same design on both sides: the old values keep the pulse
    bad = run(*base, "--old-maker", "Fairchlid")
    assert bad.returncode == 2 and "--old-maker" in bad.stderr and "Fairchild" in bad.stderr

def test_unknown_maker_in_a_family_is_a_catalog_problem(tmp_path):
    import shutil

    src = (CAT.files["74HC123"])
    from advisor.resources import data_dir

    text = (data_dir("catalog") / "74hc123.yaml").read_text(encoding="utf-8").replace("maker: Hitachi", "maker: Hitachy")
    (tmp_path / "74hc123.yaml").write_text(text, encoding="utf-8")
    from advisor.catalog import load_dirs

    cat = load_dirs([data_dir("catalog"), tmp_path])
    assert any("unknown maker 'Hitachy'" in p.message for p in cat.problems), src
    shutil.rmtree(tmp_path)
