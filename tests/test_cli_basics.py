"""The command line's promises: help lists the commands; a bad value is one line, exit 2."""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
COMMANDS = ["demo", "find", "show", "catalog", "check", "design", "swap", "alternates", "bom", "measure", "rules", "ui"]


def run_cli(*args: str) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "advisor", *args], capture_output=True, text=True, cwd=ROOT)


def test_help_lists_every_command():
    done = run_cli("--help")
    assert done.returncode == 0
    for name in COMMANDS:
        assert f"    {name} " in done.stdout or f"    {name}\n" in done.stdout, name


@pytest.mark.parametrize(
    "argv",
    [
        ["check", "74HC221", "--r", "ten k", "--c", "10n", "--vcc", "5"],
        ["check", "74HC221", "--r", "10k", "--c", "10 kΩ", "--vcc", "5"],
        ["check", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "five"],
        ["design", "74HC221", "--width", "1 parsec", "--vcc", "5"],
        ["swap", "74121", "74HC221", "--r", "10k", "--c=-10n", "--vcc", "5"],
        ["swap", "CD4538B", "74HC4538", "--r", "100k", "--c", "10n", "--vcc", "15", "--new-vcc", "5 volts please"],
        ["alternates", "74121", "--r", "10k", "--c", "10n", "--trigger-period", "soon"],
        ["check", "NE555", "--ra", "1k", "--rb", "10k", "--c", "10n", "--pot", "10k", "--pot-setting", "1.5"],
    ],
)
def test_bad_value_is_one_line_and_exit_2(argv):
    done = run_cli(*argv)
    assert done.returncode == 2, done.stderr
    assert done.stderr.count("\n") == 1, done.stderr
    assert "Traceback" not in done.stderr
    assert done.stderr.startswith("retime") and "error:" in done.stderr


def test_unknown_part_is_one_line_and_exit_2():
    done = run_cli("show", "QX-NOTAPART-9")
    assert done.returncode == 2
    assert done.stderr.count("\n") == 1 and "Traceback" not in done.stderr


def test_python_dash_m_and_console_script_agree():
    done = run_cli("--version")
    assert done.returncode == 0 and done.stdout.startswith("retime ")
