"""Fuzz: value strings, command lines and BOM tables never end in an internal error (exit 3).

Command lines are built from the real option set (``advisor.cli.main.build_parser``) with
values drawn from the forms parts are printed in, edge values and junk, and run in this
process (fast). The budget is bounded (``max_examples``) so the file stays well under a
minute on two cores; the property is the contract "exit 3 is never for anything a user can
type or feed" (DEVELOPERS.md, exit statuses).
"""

from __future__ import annotations

import argparse
import csv
import math
import tempfile
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from advisor.errors import RetimeError
from advisor.inputnames import FLAG
from advisor.values import KINDS, read_value
from support.inprocess import retime

#: Commands fuzzed: everything that reads circuit values (the file readers and the
#: workbench have their own tests).
COMMANDS = ("check", "design", "swap", "alternates", "find", "show")
#: Options that name files or change where output goes: not fuzzed here.
SKIP_DEST = {"help", "json", "catalog", "report", "measured_from", "stock", "output", "sheet"}

_EDGE = ["0", "-1", "1e-300", "1e308", "nan", "inf", "-inf", "", " ", "1e-315", "1,000", "4,7", "1.5MS", "3K1",
         "104", "10mf", "±5%", "1Meg", "0x10", "1e", "..", "µ", "Ω", "2n2J", "'", '"', "=1+1", "1" * 40]
_GOOD = {
    "voltage": ["1.5", "1.8", "2", "3V3", "4.5", "5", "9", "12 VDC", "15", "18", "0.5", "1", "30"],
    "resistance": ["0", "1", "47", "470 R", "1k", "4K7", "10k", "22k", "100k", "1Meg", "10M", "100M"],
    "capacitance": ["1p", "100p", "1n", "2N2", "10n", "104", "100nF X7R", "1u", "22uF 25V", "100u", "1000u", "0.1"],
    "fraction": ["0", "0.5", "1", "0.01", "5%", "±1%", "0.999999"],
    "time": ["1n", "100n", "1u", "10u", "64us", "1ms", "10ms", "1s", "100s", "1e4", "1e5", "1e-12"],
    "frequency": ["1e-5", "0.1", "1", "100", "1k", "15.625kHz", "1MHZ", "1e10"],
    "range": ["1ms..2ms", "10us..1s", "1e-12..1e5", "50us..51us", "2ms..1ms", "a..b"],
    "series": ["E6", "E12", "E24", "E96", "E192", "E7", "X"],
}


def _option_kinds() -> dict[str, str]:
    from advisor.cli.options import _FLAGS

    kinds = {flag: kind for flag, kind, _ in _FLAGS}
    kinds.update({"--new-vcc": "voltage", "--width": "time", "--period": "time", "--freq": "frequency",
                  "--duty": "fraction", "--range": "range", "--series": "series", "--c-series": "series",
                  "--pot-tol": "fraction"})
    return kinds


def _subparsers() -> dict[str, argparse.ArgumentParser]:
    from advisor.cli.main import build_parser

    parser = build_parser()
    sub = next(a for a in parser._actions if isinstance(a, argparse._SubParsersAction))
    return {name: p for name, p in sub.choices.items() if name in COMMANDS}


PARSERS = _subparsers()
KIND_OF = _option_kinds()


def _bom_flags() -> set[str]:
    from advisor.cli.main import build_parser

    sub = next(a for a in build_parser()._actions if isinstance(a, argparse._SubParsersAction))
    return {s for a in sub.choices["bom"]._actions for s in a.option_strings}


BOM_FLAGS = _bom_flags()


def _parts() -> list[str]:
    from advisor.catalog import load_catalog

    return sorted(load_catalog(()).families)


PARTS = _parts()
part_text = st.one_of(st.sampled_from(PARTS), st.sampled_from(["SN74HC221N", "NE555P", "LM555CN", "74hc123",
                                                                 "XYZ", "", "555", "4538"]),
                      st.text(max_size=12))


def value_for(kind: str | None):
    good = _GOOD.get(kind or "", [])
    choices = [st.sampled_from(_EDGE), st.text(max_size=10)]
    if good:
        choices = [st.sampled_from(good)] * 6 + choices
    return st.one_of(*choices)


@st.composite
def command_lines(draw) -> list[str]:
    cmd = draw(st.sampled_from(COMMANDS))
    parser = PARSERS[cmd]
    argv = [cmd]
    for action in parser._actions:  # positionals: part numbers (and find's query)
        if not action.option_strings and action.dest not in ("help",):
            n = 2 if action.nargs == 2 else 1
            argv += [draw(part_text) for _ in range(n)]
    options = [a for a in parser._actions if a.option_strings and a.dest not in SKIP_DEST
               and a.option_strings[-1].startswith("--")]
    chosen = draw(st.lists(st.sampled_from(options), max_size=6, unique_by=lambda a: a.dest)) if options else []
    for action in chosen:
        flag = action.option_strings[-1]
        if action.nargs == 0:
            argv.append(flag)
        elif action.choices:
            argv += [flag, draw(st.one_of(st.sampled_from(sorted(map(str, action.choices))), st.text(max_size=5)))]
        elif action.type is int:
            argv += [flag, str(draw(st.integers(-3, 200)))]
        else:
            argv += [flag, draw(value_for(KIND_OF.get(flag)))]
    if draw(st.booleans()):
        argv.append("--json")
    return argv


@settings(max_examples=400, deadline=None)
@given(st.one_of(st.text(max_size=24), st.from_regex(
    r"\A[+-]?[0-9]{0,4}[.,]?[0-9]{0,4}\s?[pPnNuUµmMkKRrVG]?[0-9]{0,3}\s?(F|f|Ω|ohm|s|S|Hz|V|VDC|MFD|meg|%)?\s?[JKMF]?\Z")),
       st.sampled_from(sorted(KINDS)))
def test_fuzz_value_strings(text, kind):
    try:
        r = read_value(text, kind)
    except RetimeError as exc:
        assert exc.exit_code == 2 and exc.message
        return
    assert math.isfinite(r.value)
    lim = KINDS[kind].limits
    if lim is not None and r.value:
        assert lim.low <= abs(r.value) <= lim.high


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(command_lines())
def test_fuzz_command_lines_never_exit_3(argv):
    run = retime(*argv)
    assert run.code != 3, (argv, run.err)
    assert "internal error" not in run.err and "Traceback" not in run.err, (argv, run.err)
    if run.code == 2:
        assert run.err.startswith("retime") and run.err.count("\n") == 1, (argv, run.err)


cell = st.one_of(st.sampled_from(sum(_GOOD.values(), [])), st.sampled_from(_EDGE), st.text(max_size=8))
bom_rows = st.lists(st.tuples(part_text, cell, cell, cell), min_size=1, max_size=8)


@settings(max_examples=15, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(bom_rows)
def test_fuzz_bom_tables_keep_every_row(rows):
    import json

    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "bom.csv"
        with path.open("w", newline="", encoding="utf-8") as fh:
            w = csv.writer(fh)
            w.writerow(["Part", "R", "C", "Supply"])
            w.writerows(rows)
        run = retime("bom", str(path), "--json")
    assert run.code != 3, (rows, run.err)
    assert "internal error" not in run.err
    if run.code == 0:
        answer = json.loads(run.out)["rows"]
        assert len(answer) == len(rows)  # every row comes back
        # a line's reason names its columns, never a flag the bom command does not have (--r, --c)
        for row in answer:
            assert set(FLAG.findall(row["reason"] or "")) <= BOM_FLAGS, row["reason"]


# --- regression cases (issue 18): found by hand or by the properties above ----------------------


@pytest.mark.parametrize(("argv", "named", "never"), [
    # design spells its targets --width/--period/--freq: errors and notes say so
    (["design", "NE555", "--width", "1x"], "--width: cannot read '1x'", "--target"),
    (["design", "NE555", "--period", "2ms", "--width", "1ms"], "(--width, --period or --freq)", "--target"),
    (["design", "74HC123", "--freq", "1k"], "give --width", "--target"),
    # an output that is a device or a folder: refused with its path before anything is written
    (["bom", str(Path(__file__).parent / "data" / "fail_on_bom.csv"), "-o", "/dev/full"],
     "argument -o/--output: '/dev/full' is a character device, not a regular file; nothing was written", "Traceback"),
])
def test_regression_command_lines(argv, named, never):
    run = retime(*argv)
    assert run.code == 2 and run.err.count("\n") == 1, run.err
    assert named in run.err and never not in run.err, run.err
