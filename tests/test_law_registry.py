"""The one registry of timing laws serves the catalog loader, the engine, the rules context and show."""

from __future__ import annotations

import math

import pytest

from advisor.catalog import REQUIRED_CONSTANTS, load_catalog
from advisor.cli.cmd_show import LAW_TEXT
from advisor.parts import Law
from advisor.timing.registry import LAWS, main_constant


def test_every_catalog_law_is_registered_once():
    assert set(LAWS) == set(Law.__args__)
    assert REQUIRED_CONSTANTS == {n: s.constants for n, s in LAWS.items()}
    assert LAW_TEXT == {n: s.equation for n, s in LAWS.items()}


@pytest.mark.parametrize("name", sorted(LAWS))
def test_main_constant_and_modes(name):
    spec = LAWS[name]
    assert spec.modes and all(main_constant(name, m) for m in spec.modes)


def test_555_evaluators_match_the_textbook_forms():
    # Diodes NE555 DS35112 rev 4: tH = ln 2·(RA+RB)·C, tL = ln 2·RB·C; mono t = ln 3·R·C (u = 2/3)
    p = {"ra": 1e3, "rb": 10e3, "c": 10e-9, "upper": 2 / 3, "lower": 1 / 3}
    th, tl = LAWS["timer-555"].astable(p, 0.0)
    assert th == pytest.approx(math.log(2) * 11e3 * 10e-9) and tl == pytest.approx(math.log(2) * 10e3 * 10e-9)
    assert LAWS["timer-555"].mono({"c": 10e-9, "upper": 2 / 3}, 10e3) == pytest.approx(math.log(3) * 1e-4)


def test_every_family_names_its_main_constant():
    for fam in load_catalog().families.values():
        spec = LAWS[fam.timing.law]
        assert set(spec.constants) <= set(fam.timing.constants), fam.id
