"""What a user can type or feed never ends in a traceback or exit 3: each case of issue 18
is a regression test with the message it must give (README "Values as printed",
advisor/timing/domain.py, advisor/cli/main.py)."""

import errno
import os
import subprocess
import sys
import tempfile

import pytest

from support.inprocess import retime


def _error(*argv: str) -> str:
    run = retime(*argv)
    assert run.code == 2, (run.code, run.err, run.out[:300])
    assert "internal error" not in run.err and "Traceback" not in run.err
    assert run.err.count("\n") == 1  # one line
    return run.err


# --- values misread without a word: now read as printed, with the reading shown ------------
def test_capacitor_code_104_is_100_nF_and_says_so():
    run = retime("check", "74121", "--r", "10k", "--c", "104", "--json")
    assert run.code == 0
    import json

    res = json.loads(run.out)
    assert res["values"]["c"] == pytest.approx(100e-9)  # EIA-style code: 10×10^4 pF
    assert any("capacitor code" in a for a in res["assumptions"])


def test_old_mf_marking_is_microfarads_and_says_so():
    import json

    res = json.loads(retime("check", "NE555", "--r", "10k", "--c", "10mf", "--json").out)
    assert res["values"]["c"] == pytest.approx(10e-6)
    assert any("old marking MFD/MF" in a for a in res["assumptions"])


@pytest.mark.parametrize("argv,message", [
    (["--c", "4,700 pF"], "--c: cannot read '4,700 pF' as a capacitance in F (the comma is ambiguous: 4.7 pF (decimal comma) or 4.7 nF (thousands separator)"),
    (["--c", "1,000uF"], "the comma is ambiguous: 1 µF (decimal comma) or 1 mF (thousands separator)"),
    (["--c", "10n", "--vcc", "3K1"], "--vcc: cannot read '3K1' as a voltage in V ('3K1' is a resistor-style code"),
    (["--c", "10n", "--vcc", "1e9"], "--vcc: cannot read '1e9' as a voltage in V (1 GV is above 1 kV, the largest accepted"),
    (["--c", "10n", "--trigger-period", "1e-315"], "--trigger-period: cannot read '1e-315' as a time in s (1e-315 s is below 1 ps, the smallest accepted"),
    (["--c", "10n", "--target-width", "1 Ms"], "--target-width: cannot read '1 Ms' as a time in s (1 Ms is above 100 ks, the largest accepted"),
    (["--c", "104 F"], "--c: cannot read '104 F' as a capacitance in F (104 F is above 1 F, the largest accepted"),
])
def test_refused_values_name_the_option_and_the_reason(argv, message):
    assert message in _error("check", "74121", "--r", "10k", *argv)


@pytest.mark.parametrize("argv", [
    ["check", "LMC555", "--ra", "10k", "--rb", "10k", "--c", "10n", "--vcc", "3V3"],
    ["check", "74HC221", "--r", "4K7J", "--c", "100NF", "--vcc", "12 VDC"],
    ["check", "74121", "--r", "470 R", "--c", "22uF 25V"],
    ["check", "74121", "--r", "1Meg", "--c", "100nF X7R", "--r-tol", "±5%"],
    ["check", "74HC123", "--r", "10k", "--c", "2N2", "--trigger-period", "64US"],
])
def test_forms_a_technician_types_are_accepted(argv):
    run = retime(*argv)
    assert run.code == 0, run.err


def test_kept_marks_are_shown_in_the_answer():
    run = retime("check", "74121", "--r", "4K7J", "--c", "22uF 25V")
    assert "tolerance letter J (±5 %)" in run.out and "rated 25 V" in run.out


# --- engine crash sites: now located input errors -------------------------------------------
@pytest.mark.parametrize("argv,message", [
    # 555 astable at low supply: RA against the discharge on-resistance (was a math domain error)
    (["check", "LMC555", "--ra", "100", "--rb", "4k7", "--c", "2n2", "--vcc", "1.8"],
     "--ra 100 Ω is too small against the LMC555's discharge on-resistance"),
    # 4528 law below 1 V (was a negative width)
    (["check", "CD4528B", "--r", "10k", "--c", "100n", "--vcc", "0.5"],
     "the CD4528B law t = a·R·C·ln(VDD) gives no pulse at or below 1 V"),
    (["design", "CD4528B", "--width", "1ms", "--vcc", "0.5"], "gives no pulse at or below 1 V"),
    # R = 0 (was ZeroDivisionError in swap, alternates and calibration)
    (["swap", "74121", "74HC221", "--r", "0", "--c", "10n"], "74121: these values give a width of 0 s"),
    (["alternates", "74121", "--r", "0", "--c", "10n"], "74121: these values give a width of 0 s"),
    (["check", "74121", "--r", "0", "--c", "10n", "--measured-width", "10us"], "74121: these values give a width of 0 s"),
    (["check", "NE555", "--r", "0", "--c", "10n", "--measured-width", "10us"], "NE555: these values give a width of 0 s"),
    # RA = RB = 0: no period (the divider check or the zero-time check, whichever meets it first)
    (["check", "NE555", "--ra", "0", "--rb", "0", "--c", "10n"], "--ra"),
    (["swap", "CD4541B", "NE555", "--r", "0", "--c", "100n", "--new-vcc", "3"], "CD4541B: these values give a high of 0 s"),
    # near-zero R: refused as a value
    (["swap", "74121", "74HC221", "--r", "1e-300", "--c", "10n"], "--r: cannot read '1e-300' as a resistance"),
    # any swap from a pulse to CD4541B (was KeyError: 'width')
    (["swap", "74121", "CD4541B", "--r", "10k", "--c", "10n"], "CD4541B is a programmable timer"),
    (["swap", "NE555", "CD4541B", "--r", "10k", "--c", "10n"], "CD4541B is a programmable timer"),
])
def test_engine_refusals(argv, message):
    assert message in _error(*argv)


def test_the_python_api_refuses_implausible_circuits_too():
    from advisor.circuit import Circuit, Trigger
    from advisor.errors import RetimeError

    for kwargs in ({"vcc": 1e9}, {"c": 0.0}, {"r": float("nan")}, {"trigger": Trigger(period=1e-315)}):
        with pytest.raises(RetimeError):
            Circuit(part="74121", **kwargs)


def test_laws_do_not_crash_outside_their_domain():
    from advisor.timing import laws

    # RA small against Rd: the low phase never ends (equation (1) with V∞ = d·VCC above l·VCC).
    th, tl = laws.timer555_astable(100.0, 4.7e3, 2.2e-9, 2 / 3, 1 / 3, r_dis=75.0)
    assert th > 0 and tl == float("inf")
    th, tl = laws.timer555_astable(0.0, 0.0, 1e-9, 2 / 3, 1 / 3, r_dis=0.0)
    assert th == 0 and tl == 0


# --- per-candidate and per-line guards --------------------------------------------------------
def test_a_bug_in_one_candidate_is_a_rejection_not_a_lost_run(monkeypatch):
    import importlib

    alt = importlib.import_module("advisor.substitute.alternates")  # the package exports a function of that name
    real = alt.swap

    def flaky(catalog, old, new, *a, **k):
        if new == "74HC221":
            raise ZeroDivisionError("float division by zero")
        return real(catalog, old, new, *a, **k)

    monkeypatch.setattr(alt, "swap", flaky)
    monkeypatch.delenv("RETIME_DEBUG", raising=False)
    import json

    run = retime("alternates", "74121", "--r", "10k", "--c", "10n", "--json")
    assert run.code == 0, run.err
    res = json.loads(run.out)
    rejected = {r["family"]: r["reason"] for r in res["rejected"]}
    assert "internal problem ZeroDivisionError" in rejected["74HC221"]
    assert res["candidates"]


def test_a_bug_in_one_bom_line_is_that_line_s_reason(monkeypatch, tmp_path):
    import json

    import advisor.bom.review as review

    real = review._read_row

    def flaky(i, row, *a, **k):
        if row and row[0] == "NE555":
            raise KeyError("width")
        return real(i, row, *a, **k)

    monkeypatch.setattr(review, "_read_row", flaky)
    monkeypatch.delenv("RETIME_DEBUG", raising=False)
    bom = tmp_path / "b.csv"
    bom.write_text("Part,R,C\n74121,10k,10n\nNE555,10k,10n\n74HC221,10k,10n\n", encoding="utf-8")
    run = retime("bom", str(bom), "--json")
    assert run.code == 0, run.err
    rows = json.loads(run.out)["rows"]
    assert [r["line"] for r in rows] == [2, 3, 4]
    assert "internal problem KeyError" in rows[1]["reason"]
    assert rows[0]["status"] == rows[2]["status"] == "reviewed"


def test_bom_cells_are_read_as_printed_with_the_reading_shown(tmp_path):
    import json

    bom = tmp_path / "b.csv"
    bom.write_text('Part,R,C,Supply\n74121,4K7J,104,5\n74121,10k,"4,700 pF",5\nNE555,0,10n,3V3\n', encoding="utf-8")
    run = retime("bom", str(bom), "--json")
    assert run.code == 0, run.err
    rows = json.loads(run.out)["rows"]
    assert len(rows) == 3
    assert "capacitor code" in rows[0]["reason"] and "tolerance letter J" in rows[0]["reason"]
    assert rows[1]["status"] == "unreadable" and "comma is ambiguous" in rows[1]["reason"]
    assert "width of 0 s" in rows[2]["reason"]


# --- OS errors: exit 2 with the path -------------------------------------------------------------
def test_output_into_a_read_only_folder_is_exit_2_with_the_path(tmp_path, monkeypatch):
    bom = tmp_path / "b.csv"
    bom.write_text("Part,R,C\n74121,10k,10n\n", encoding="utf-8")
    out = tmp_path / "locked" / "out.csv"
    out.parent.mkdir()

    def refuse(*a, dir=None, **k):  # as a read-only folder answers (root ignores chmod, so simulate)
        raise PermissionError(errno.EACCES, "Permission denied", str(dir))

    monkeypatch.setattr(tempfile, "mkstemp", refuse)
    err = _error("bom", str(bom), "-o", str(out))
    assert f"{out.parent}: Permission denied" in err


def test_output_onto_a_full_disk_is_exit_2_with_the_path(tmp_path, monkeypatch):
    bom = tmp_path / "b.csv"
    bom.write_text("Part,R,C\n74121,10k,10n\n", encoding="utf-8")
    out = tmp_path / "out.csv"
    real_replace = os.replace

    def full(src, dst, *a, **k):
        raise OSError(errno.ENOSPC, "No space left on device", str(dst))

    monkeypatch.setattr(os, "replace", full)
    err = _error("bom", str(bom), "-o", str(out))
    monkeypatch.setattr(os, "replace", real_replace)
    assert f"{out}: No space left on device" in err


@pytest.mark.skipif(not os.path.exists("/dev/full"), reason="needs /dev/full")
@pytest.mark.parametrize("extra", [[], ["--json"]])
def test_stdout_on_a_full_disk_is_exit_2(extra):
    with open("/dev/full", "w") as full:
        proc = subprocess.run([sys.executable, "-m", "advisor", "check", "74121", "--r", "10k", "--c", "10n", *extra],
                              stdout=full, stderr=subprocess.PIPE, text=True, timeout=60)
    assert proc.returncode == 2
    assert proc.stderr == "retime: error: cannot write the output: No space left on device\n"


# --- a terminal that cannot print Ω or µ ----------------------------------------------------------
@pytest.mark.parametrize("env", [{"PYTHONIOENCODING": "ascii"}, {"LANG": "C", "LC_ALL": "C", "PYTHONIOENCODING": "ascii"}])
def test_ascii_terminal_gets_ascii_spellings(env):
    full_env = {**os.environ, **env}
    proc = subprocess.run([sys.executable, "-m", "advisor", "check", "74121", "--r", "10k", "--c", "10n"],
                          capture_output=True, env=full_env, timeout=60)
    assert proc.returncode == 0, proc.stderr
    text = proc.stdout.decode("ascii")  # nothing but ASCII
    assert "10 kohm" in text and " us" in text
    proc = subprocess.run([sys.executable, "-m", "advisor", "check", "74121", "--r", "10k", "--c", "10n", "--json"],
                          capture_output=True, env=full_env, timeout=60)
    import json

    assert proc.returncode == 0
    assert json.loads(proc.stdout.decode("ascii"))["values"]["r"] == 10e3  # escapes keep JSON exact


def test_ascii_error_line_for_a_value_with_micro():
    proc = subprocess.run([sys.executable, "-m", "advisor", "check", "74121", "--r", "10k", "--c", "10µX"],
                          capture_output=True, env={**os.environ, "PYTHONIOENCODING": "ascii"}, timeout=60)
    assert proc.returncode == 2
    assert proc.stderr.decode("ascii").startswith("retime: error: --c: cannot read '10uX'") or \
        proc.stderr.decode("ascii").startswith("retime: error: --c: cannot read '10?X'")
