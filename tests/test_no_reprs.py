"""No Python repr reaches a person: every rendered text (CLI text of check, swap,
alternates and show; Markdown and HTML reports) is scanned for the marks of a dict,
list or Python constant printed as-is. The workbench screens are scanned in test_tui."""

from __future__ import annotations

import re

import pytest

from advisor.cli.main import main

REPR_MARKS = ("{'", "['", "None", "True", "False")

RUNS = [
    ["check", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "5", "--trigger-period", "50us"],
    ["check", "NE555", "--ra", "10k", "--rb", "10k", "--c", "10n", "--vcc", "5"],
    ["check", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "5", "--pot", "10k", "--pot-setting", "0.3",
     "--target-width", "100us"],
    ["swap", "74121", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "5", "--trigger-period", "20us"],
    ["swap", "NE555", "TLC555", "--r", "10k", "--c", "10n", "--vcc", "15", "--new-vcc", "5"],
    ["swap", "74121", "CD4538", "--r", "10k", "--c", "10n", "--vcc", "5"],
    ["alternates", "74121", "--r", "10k", "--c", "10n", "--vcc", "5"],
]


def assert_plain(text: str, where: str) -> None:
    for mark in REPR_MARKS:
        assert mark not in text, f"{where}: {mark!r} in {text[max(0, text.find(mark) - 80):text.find(mark) + 80]!r}"


@pytest.mark.parametrize("argv", RUNS, ids=lambda a: " ".join(a[:3]))
def test_text_markdown_and_html_carry_no_reprs(argv, tmp_path, capsys):
    assert main(argv) == 0
    assert_plain(capsys.readouterr().out, "text")
    for ext in ("md", "html"):
        path = tmp_path / f"r.{ext}"
        assert main([*argv, "--report", str(path)]) == 0
        capsys.readouterr()
        text = path.read_text(encoding="utf-8")
        if ext == "html":
            text = re.sub(r"<style>.*?</style>", "", text, flags=re.S)
            text = re.sub(r"<[^>]+>", " ", text)
        assert_plain(text, ext)


@pytest.mark.parametrize("part", ["74HC221", "NE555", "CD4538", "74121"])
def test_show_carries_no_reprs(part, capsys):
    assert main(["show", part]) == 0
    assert_plain(capsys.readouterr().out, "show")


def test_help_texts_carry_no_doubled_percent(capsys):
    for cmd in ("check", "swap", "design", "measure", "alternates", "bom"):
        with pytest.raises(SystemExit):
            main([cmd, "--help"])
        assert "%%" not in capsys.readouterr().out, cmd
