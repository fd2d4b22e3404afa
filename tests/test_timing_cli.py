"""`retime check` / `retime design` JSON keys (design guide, "Command line contract").

Runs the CLI in-process on the shipped catalog; asserts the contract's keys and
properties that must hold, not catalog numbers (those belong to the catalog tests).
"""

from __future__ import annotations

import json

import pytest

from advisor.cli.main import main


def _run(capsys, *argv) -> dict:
    assert main(list(argv) + ["--json"]) == 0
    return json.loads(capsys.readouterr().out)


@pytest.mark.parametrize("argv, shape", [
    (["check", "74HC221", "--r", "10k", "--c", "10n"], {"width"}),
    (["check", "NE555", "--r", "10k", "--c", "10n"], {"width"}),
    (["check", "NE555", "--ra", "4k7", "--rb", "10k", "--c", "10n"], {"high", "low", "period", "frequency", "duty"}),
])
def test_check_keys(capsys, argv, shape):
    j = _run(capsys, *argv, "--pot", "10k", "--target-width" if shape == {"width"} else "--target-period", "100us",
             "--trigger-period", "1ms")
    for k in ("nominal", "min", "max"):
        assert set(j["timing"][k]) == shape
    assert set(j["adjust"]["min"]) == shape and set(j["adjust"]["max"]) == shape
    assert set(j["target"]) >= {"value", "reachable", "setting"}
    assert set(j["trigger"]) >= {"period", "divide_by", "stays_high"}
    assert isinstance(j["findings"], list)
    for f in j["findings"]:
        assert set(f) >= {"rule", "severity", "message", "fix", "source"}
    key = "width" if shape == {"width"} else "period"
    # Property: the band contains the nominal; the pot's ends bracket the nominal
    assert j["timing"]["min"][key] <= j["timing"]["nominal"][key] <= j["timing"]["max"][key]
    assert j["adjust"]["min"][key] <= j["timing"]["nominal"][key] <= j["adjust"]["max"][key]


def test_check_calibration_key(capsys):
    j = _run(capsys, "check", "NE555", "--r", "10k", "--c", "10n", "--measured-width", "120us")
    assert j["calibration"]["quantity"] == "width"
    assert j["timing"]["nominal"]["width"] == pytest.approx(120e-6)


def test_check_text_shows_assumed_tolerances(capsys):
    assert main(["check", "NE555", "--r", "10k", "--c", "10n"]) == 0
    out = capsys.readouterr().out
    assert "(assumed)" in out and "width" in out


def test_check_bad_input_one_line(capsys):
    assert main(["check", "NE555", "--r", "10k"]) == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and "--c" in err


def test_design_keys(capsys):
    j = _run(capsys, "design", "NE555", "--freq", "1kHz", "--duty", "0.6", "--c", "10n")
    assert j["candidates"] and j["timing"] == j["candidates"][0]["timing"]
    assert set(j["timing"]["nominal"]) == {"high", "low", "period", "frequency", "duty"}
    assert "error" in j["candidates"][0]
    j = _run(capsys, "design", "74HC221", "--range", "50us..70us", "--c", "1n")
    c = j["candidates"][0]
    assert c["values"]["pot"] and c["adjust"]["min"]["width"] <= 50e-6 <= 70e-6 <= c["adjust"]["max"]["width"]
