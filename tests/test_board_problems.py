"""A schematic with a broken file, an unknown symbol, an open timing pin, a timing pin on a
connector or an unreadable value gives a located message (file, sheet, reference) and a
plan for the rest; never a traceback. Variants are made from the shipped demo board by
editing its text (each symbol sits on one line of the file)."""

from __future__ import annotations

import os
import re
import subprocess
import sys
from pathlib import Path

import pytest

from advisor.board import read_board
from advisor.board.plan import plan_board
from advisor.errors import InputError
from advisor.resources import data_dir

DEMO = data_dir("demo") / "bench_pulse_generator.kicad_sch"


@pytest.fixture(scope="module")
def catalog():
    from advisor.catalog import load_catalog

    return load_catalog()


def _variant(tmp_path: Path, edit, name: str = "board.kicad_sch") -> Path:
    text = DEMO.read_text(encoding="utf-8")
    out = tmp_path / name
    out.write_text(edit(text), encoding="utf-8")
    return out


def _symbol_line(text: str, ref: str) -> str:
    return next(ln for ln in text.splitlines() if f'(property "Reference" "{ref}"' in ln and ln.lstrip().startswith("(symbol"))


def _planned(j) -> set[str]:
    return {p["ref"] for p in j["plan"] if p["swap"] is not None}


def _cli(path: Path, *extra: str):
    env = dict(os.environ, RETIME_CACHE=os.environ.get("RETIME_CACHE", "/tmp/retime-cache-tests"))
    return subprocess.run([sys.executable, "-m", "advisor", "board", str(path), "--new-vcc", "5", *extra],
                          capture_output=True, text=True, env=env, timeout=120)


def test_broken_root_file_is_one_located_line(tmp_path):
    path = _variant(tmp_path, lambda t: t[: len(t) // 2])
    with pytest.raises(InputError) as err:
        read_board(path)
    assert "board.kicad_sch" in err.value.message and "line" in err.value.message
    out = _cli(path)
    assert out.returncode == 2
    assert "Traceback" not in out.stderr and len(out.stderr.strip().splitlines()) == 1
    assert "board.kicad_sch" in out.stderr


def test_broken_sub_sheet_is_listed_and_the_rest_planned(tmp_path, catalog):
    (tmp_path / "extra.kicad_sch").write_text("(kicad_sch (version 20230121) (symbol", encoding="utf-8")
    sheet = ('(sheet (at 10 10) (size 20 20) (uuid "5a0e7a35-0000-4000-8000-000000000001")'
             ' (property "Sheetname" "extra" (at 10 9 0)) (property "Sheetfile" "extra.kicad_sch" (at 10 31 0)))')
    path = _variant(tmp_path, lambda t: t.rstrip()[:-1] + sheet + "\n)\n")
    j = plan_board(catalog, read_board(path), new_vcc=5.0).to_json()
    files = [u for u in j["unresolved"] if u["kind"] == "file"]
    assert files and files[0]["file"] == "board.kicad_sch" and files[0]["sheet"] == "/"
    assert "extra.kicad_sch" in files[0]["reason"]
    assert _planned(j) == {"U3", "U5", "U7", "U9"}


def test_unknown_symbol_is_located_and_the_rest_planned(tmp_path, catalog):
    def edit(t):
        line = _symbol_line(t, "U9")
        return t.replace(line, line.replace('(lib_id "74xx:74LS123")', '(lib_id "74xx:74LS123_MISSING")'))
    j = plan_board(catalog, read_board(_variant(tmp_path, edit)), new_vcc=5.0).to_json()
    sym = [u for u in j["unresolved"] if u["kind"] == "symbol"]
    assert sym and all(u["ref"] == "U9" and u["sheet"] == "/" for u in sym)
    assert _planned(j) == {"U3", "U5", "U7"}


def test_open_timing_pin_is_located_and_the_rest_planned(tmp_path, catalog):
    def edit(t):  # take R9 and C9 off the board: U9's Rext/Cext pin is left open
        for ref in ("R9", "C9"):
            t = t.replace(_symbol_line(t, ref), "")
        return t
    j = plan_board(catalog, read_board(_variant(tmp_path, edit)), new_vcc=5.0).to_json()
    u9 = [u for u in j["unresolved"] if u["ref"] == "U9"]
    assert u9 and any("left open" in u["reason"] for u in u9)
    assert all(u["file"] == "board.kicad_sch" and u["sheet"] == "/" for u in u9)
    assert _planned(j) == {"U3", "U5", "U7"}


def test_timing_pin_on_a_connector_is_located(tmp_path, catalog):
    def edit(t):  # R3 removed and the BNC J1 wired to U3's Rext/Cext net: the resistor is off the board
        t = t.replace(_symbol_line(t, "R3"), "")
        return t.replace('(label "EXT_TRIG"', '(label "U3_RC"', 1)  # the first EXT_TRIG label is J1's
    j = plan_board(catalog, read_board(_variant(tmp_path, edit)), new_vcc=5.0).to_json()
    u3 = [u for u in j["unresolved"] if u["ref"] == "U3"]
    assert u3 and any("connector pin J1.1" in u["reason"] for u in u3), u3
    assert _planned(j) == {"U5", "U7", "U9"}


def test_unreadable_value_is_located_and_the_rest_planned(tmp_path, catalog):
    def edit(t):
        line = _symbol_line(t, "C5")
        return t.replace(line, line.replace('"Value" "100n"', '"Value" "tbd"'))
    j = plan_board(catalog, read_board(_variant(tmp_path, edit)), new_vcc=5.0).to_json()
    val = [u for u in j["unresolved"] if u["kind"] == "value"]
    assert val and val[0]["ref"] == "C5" and "'tbd'" in val[0]["reason"]
    assert any(u["ref"] == "U5" for u in j["unresolved"] if u["kind"] == "unresolved")
    assert _planned(j) == {"U3", "U7", "U9"}
    out = _cli(_variant(tmp_path, edit, "b2.kicad_sch"))
    assert out.returncode == 0 and "Traceback" not in out.stderr
    assert re.search(r"b2\.kicad_sch, sheet /, C5: value 'tbd'", out.stdout)


def test_not_a_kicad_file(tmp_path):
    p = tmp_path / "x.kicad_sch"
    p.write_text("(kicad_pcb (version 1))", encoding="utf-8")
    with pytest.raises(InputError, match="not a KiCad schematic"):
        read_board(p)
    q = tmp_path / "x.txt"
    q.write_text("hello", encoding="utf-8")
    out = _cli(q)
    assert out.returncode == 2 and "Traceback" not in out.stderr
    missing = _cli(tmp_path / "none.kicad_sch")
    assert missing.returncode == 2 and "cannot read" in missing.stderr


def test_unknown_supply_asks_for_the_supply_option(tmp_path, catalog):
    def edit(t):
        return t.replace('"+15V"', '"VDD_A"').replace("power:+15V", "power:+15V")
    path = _variant(tmp_path, edit)
    board = read_board(path)
    j = plan_board(catalog, board, new_vcc=5.0).to_json()
    asks = [u for u in j["unresolved"] if "--supply" in u["reason"]]
    assert asks, j["unresolved"]
    j2 = plan_board(catalog, read_board(path), new_vcc=5.0, supplies={"VDD_A": 15.0}).to_json()
    assert not [u for u in j2["unresolved"] if "--supply" in u["reason"]]


def test_unreadable_value_away_from_the_timers_is_not_their_problem(tmp_path, catalog):
    def edit(t):  # C10 decouples the 5 V rail: it touches no timing, trigger or input pin
        line = _symbol_line(t, "C10")
        return t.replace(line, line.replace('"Value" "100n"', '"Value" "tbd"'))
    j = plan_board(catalog, read_board(_variant(tmp_path, edit)), new_vcc=5.0).to_json()
    assert not [u for u in j["unresolved"] if u["ref"] == "C10"]
    assert _planned(j) == {"U3", "U5", "U7", "U9"}
