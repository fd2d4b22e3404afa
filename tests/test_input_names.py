"""Messages name what the user typed or fed (issue 18): the flag as the command spells it
(``design --width``, not the canonical ``--target-width``), the BOM line and column a value
came from, the workbench field. The engine names inputs by their canonical flag once;
``advisor.inputnames`` renames them in each front end. The BOMs are test fixtures."""

from __future__ import annotations

import argparse
import json

import pytest

from advisor.errors import ValueParseError
from advisor.inputnames import FLAG, parser_names, rename_flags
from support.inprocess import retime


def _parser(command: str) -> argparse.ArgumentParser:
    from advisor.cli.main import build_parser

    sub = next(a for a in build_parser()._actions if isinstance(a, argparse._SubParsersAction))
    return sub.choices[command]


def test_the_renamer_touches_whole_flags_only():
    names = {"--target-width": "--width", "--r": "column 'Rt'"}
    assert rename_flags("--target-width: bad; --target-widths stay; --r-tol too; (--r)", names) == (
        "--width: bad; --target-widths stay; --r-tol too; (column 'Rt')")
    assert FLAG.findall("a--b --c-series x") == ["--c-series"]


def test_design_spells_its_targets_without_the_target_prefix():
    assert parser_names(_parser("design")) == {"--target-width": "--width", "--target-period": "--period",
                                               "--target-freq": "--freq"}
    assert parser_names(_parser("check")) == {}  # check types the canonical spellings


@pytest.mark.parametrize(("argv", "message"), [
    (["design", "NE555", "--width", "1x"],
     "retime: error: --width: cannot read '1x' as a time in s; expected a time in s, for example 64us, 64 µs, 1.5 ms"),
    (["design", "NE555", "--freq", "0"],
     "retime: error: --freq: cannot read '0' as a frequency in Hz (must be greater than zero); expected a frequency "
     "in Hz, for example 15.625kHz, 1 MHz"),
    (["design", "NE555", "--width", "1ms", "--period", "2ms"],
     "retime: error: give one target at a time (--width, --period or --freq)"),
    (["design", "74HC123", "--freq", "1k"], "retime: error: a monostable has no frequency; give --width"),
    (["design", "NE555", "--period", "1ms", "--duty", "2"],
     "retime: error: --duty '2' is not a duty; expected the high share of the period, above 0 and below 1 "
     "(e.g. 0.6 or 60%)"),
    (["check", "NE555", "--r", "10k", "--c", "10n", "--target-width", "1x"],
     "retime: error: --target-width: cannot read '1x' as a time in s; expected a time in s, for example 64us, "
     "64 µs, 1.5 ms"),
])
def test_command_line_errors_name_the_flag_as_typed(argv, message):
    run = retime(*argv)
    assert run.code == 2 and run.err == message + "\n", run.err


def test_design_notes_and_the_api_name_the_flag_as_typed():
    import advisor

    run = retime("design", "NE555", "--width", "1MS", "--c", "10n", "--json")
    assert run.code == 0, run.err
    assumptions = json.loads(run.out)["assumptions"]
    assert assumptions[0].startswith("--width '1MS': 'MS' read as milliseconds"), assumptions
    assert not any("--target" in a for a in assumptions)
    with pytest.raises(ValueParseError, match=r"^--width: cannot read '1x'"):
        advisor.design("NE555", width="1x")


def _review(tmp_path, text: str) -> dict:
    path = tmp_path / "bom.csv"
    path.write_text(text, encoding="utf-8")
    run = retime("bom", str(path), "--json")
    assert run.code == 0, run.err
    return {r["cells"]["Ref"]: r for r in json.loads(run.out)["rows"]}


def test_a_bom_value_error_names_its_line_and_column_not_a_flag(tmp_path):
    rows = _review(tmp_path, "Ref,MPN,Rt,Cext,Rail\n"
                             "U1,NE555P,abc,10n,5\n"
                             "U2,NE555P,0,10n,5\n"
                             "U3,SN74HC123N,10k,1x,5\n"
                             "U4,NE555P,10k,10n,-5\n"
                             "U5,SN74HC221N,,10n,5\n"
                             "U6,NE555P,10k,10n,5\n")
    assert rows["U1"]["reason"] == "line 2, column 'Rt': cannot read 'abc' as a resistance in Ω"
    assert rows["U3"]["reason"] == "line 4, column 'Cext': cannot read '1x' as a capacitance in F"
    assert rows["U4"]["reason"] == "line 5, column 'Rail': cannot read '-5' as a voltage in V (must not be negative)"
    # the engine's answer for the line's values names the columns they came from
    assert rows["U2"]["reason"] == ("NE555: these values give a width of 0 s: the timing resistance (column 'Rt') "
                                    "or the capacitor is too small to make a pulse")
    assert rows["U5"]["reason"] == "74HC221: give the timing resistor (column 'Rt') and capacitor (column 'Cext')"
    for r in rows.values():
        assert not FLAG.findall(r["reason"] or ""), r["reason"]


def test_a_bom_without_the_column_says_so_and_the_bom_flags_stay(tmp_path):
    rows = _review(tmp_path, "Ref,MPN,C\nU1,SN74HC221N,10n\n")
    assert rows["U1"]["reason"] == "74HC221: give the timing resistor (an R column) and capacitor (column 'C')"


def test_workbench_messages_name_the_fields():
    from advisor.catalog import load_catalog
    from advisor.tui.bridge import evaluate, rank_alternates

    cat = load_catalog()
    out = evaluate(cat, {"old": "NE555", "r": "0", "c": "10n", "vcc": "5"})
    assert out.kind == "error" and out.problem.startswith(
        "NE555: these values give a width of 0 s: the timing resistance ('R') or the capacitor"), out.problem
    ranked, problem = rank_alternates(cat, {"old": "NE555", "r": "0", "c": "10n", "vcc": "5"})
    assert ranked is None and "('R')" in problem
    for text in (out.problem, problem):
        assert not FLAG.findall(text), text


def test_a_board_names_the_parts_on_the_timing_pins():
    from types import SimpleNamespace

    from advisor.board.plan import channel_names
    from advisor.inputnames import rename_flags

    ch = SimpleNamespace(parts={"r": ["R3", "R4"], "c": ["C2"], "pot": []}, vcc_net="+5V")
    text = "NE555: these values give a width of 0 s: the timing resistance (--r) or the capacitor (--c); --pot, --vcc"
    assert rename_flags(text, channel_names(ch)) == (
        "NE555: these values give a width of 0 s: the timing resistance (R3 + R4) or the capacitor (C2); --pot, rail +5V")
