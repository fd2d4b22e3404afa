"""`retime swap`, `retime alternates`, `retime demo` from the command line."""

from __future__ import annotations

import json

from advisor.cli.main import main


def run(capsys, *argv):
    code = main(list(argv))
    out = capsys.readouterr()
    return code, out.out, out.err


def test_swap_json(capsys):
    code, out, _ = run(capsys, "swap", "CD4538BE", "74HC4538", "--vcc", "15", "--r", "100k", "--c", "100n",
                       "--trigger-edge", "rising", "--new-vcc", "5", "--keep-within", "3%", "--json")
    assert code == 0
    j = json.loads(out)
    assert j["class"] == "drop-in-new-values"
    assert j["new"]["vcc"] == 5 and j["old"]["vcc"] == 15
    assert j["old"]["status"] == "active" and j["new"]["status"] == "active"  # catalog lifecycle blocks
    assert abs(j["timing"]["nominal"]["width"] / (100e3 * 100e-9) - 1) <= 0.03  # CD4538BC: PW = R·C


def test_swap_text(capsys):
    code, out, _ = run(capsys, "swap", "SN74121N", "74HC221", "--r", "10k", "--c", "10n", "--trigger-edge",
                       "falling", "--measured-width", "72us")
    assert code == 0
    assert "class: rewire" in out and "rework" in out and "DIP-14 → DIP-16" in out


def test_swap_without_new_vcc_is_unsuitable(capsys):
    code, out, _ = run(capsys, "swap", "CD4538B", "74HC4538", "--vcc", "15", "--r", "100k", "--c", "100n", "--json")
    j = json.loads(out)
    assert code == 0 and j["class"] == "unsuitable"
    assert any(f["severity"] == "danger" for f in j["findings"])


def test_bad_input_is_one_line(capsys):
    code, out, err = run(capsys, "swap", "NE555", "TLC555", "--r", "10k", "--c", "10n", "--new-vcc", "five")
    assert code == 2 and "--new-vcc" in err and err.count("\n") == 1 and "Traceback" not in err
    code, out, err = run(capsys, "swap", "NE555", "74HC221", "--mode", "astable", "--ra", "1k", "--rb", "10k",
                         "--c", "10n")
    assert code == 2 and "one-shot" in err and err.count("\n") == 1


def test_alternates_json(capsys):
    code, out, _ = run(capsys, "alternates", "74121", "--r", "10k", "--c", "10n", "--new-vcc", "5", "--json")
    assert code == 0
    j = json.loads(out)
    assert len(j["candidates"]) >= 3
    assert all({"family", "class"} <= set(c) for c in j["candidates"])


def test_demo_text(capsys):
    code, out, _ = run(capsys, "demo")
    assert code == 0 and "Summary:" in out and "unsuitable" in out
