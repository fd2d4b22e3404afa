"""Hostile and odd files: only regular files are read, within size limits; YAML is
strict (duplicate keys) and bounded (alias bombs); writes leave no temporary files."""

from __future__ import annotations

import os
import subprocess
import sys
import textwrap
from pathlib import Path

import pytest

from advisor.files import FileRefused, atomic_write, read_regular
from advisor.yamlload import YamlProblem, parse_yaml

ROOT = Path(__file__).resolve().parents[1]
SHIPPED = ROOT / "catalog" / "ne555.yaml"

#: The classic "billion laughs" document (nine levels of ten aliases: 10^9 leaves in
#: 349 bytes), from the YAML variant of the XML entity-expansion attack (common practice).
BOMB = textwrap.dedent("""\
    a: &a ["lol","lol","lol","lol","lol","lol","lol","lol","lol"]
    b: &b [*a,*a,*a,*a,*a,*a,*a,*a,*a]
    c: &c [*b,*b,*b,*b,*b,*b,*b,*b,*b]
    d: &d [*c,*c,*c,*c,*c,*c,*c,*c,*c]
    e: &e [*d,*d,*d,*d,*d,*d,*d,*d,*d]
    f: &f [*e,*e,*e,*e,*e,*e,*e,*e,*e]
    g: &g [*f,*f,*f,*f,*f,*f,*f,*f,*f]
    h: &h [*g,*g,*g,*g,*g,*g,*g,*g,*g]
    i: &i [*h,*h,*h,*h,*h,*h,*h,*h,*h]
    """)

#: A subprocess that hangs is a failure; the guard answers at once (no timed assert: the
#: timeout only stops a hang).
HANG = 60


def run_cli(*args: str, env: dict | None = None) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "advisor", *args], capture_output=True, text=True, cwd=ROOT,
                          timeout=HANG, env={**os.environ, **(env or {})})


@pytest.fixture
def fifo(tmp_path):
    path = tmp_path / "pipe.yaml"
    os.mkfifo(path)
    return path


def test_the_yaml_bomb_is_refused(tmp_path):
    assert len(BOMB.encode()) < 400
    with pytest.raises(YamlProblem, match="alias"):
        parse_yaml(BOMB)
    folder = tmp_path / "cat"
    folder.mkdir()
    (folder / "bomb.yaml").write_text(BOMB, encoding="utf-8")
    done = run_cli("catalog", "check", "--catalog", str(folder))
    assert done.returncode == 1
    assert "bomb.yaml" in done.stderr + done.stdout and "alias" in done.stderr + done.stdout
    assert len(done.stderr) < 2000 and len(done.stdout) < 20000  # the expanded input is never quoted


def test_a_recursive_alias_is_refused():
    with pytest.raises(YamlProblem, match="recursive"):
        parse_yaml("a: &a [1, *a]\n")


def test_a_duplicate_key_is_refused_with_both_lines():
    with pytest.raises(YamlProblem, match=r"'k'.*twice.*lines 2 and 4"):
        parse_yaml("timing:\n  k: 0.7\n  r: 1\n  k: 0.45\n")
    assert parse_yaml("base: &b {x: 1}\nother:\n  <<: *b\n  x: 2\n") == {"base": {"x": 1}, "other": {"x": 2}}


def test_a_duplicate_key_in_a_catalog_overlay_names_the_file(tmp_path):
    folder = tmp_path / "cat"
    folder.mkdir()
    text = SHIPPED.read_text(encoding="utf-8")
    (folder / "dup.yaml").write_text(text + "\ntitle: a second title\n", encoding="utf-8")
    done = run_cli("catalog", "check", "--catalog", str(folder))
    assert done.returncode == 1
    assert "dup.yaml" in done.stderr + done.stdout and "twice" in done.stderr + done.stdout


def test_a_fifo_is_refused_not_waited_on(fifo):
    with pytest.raises(FileRefused, match="FIFO"):
        read_regular(fifo, "catalog")
    done = run_cli("catalog", "check", "--catalog", str(fifo.parent))
    assert done.returncode == 1 and "FIFO" in done.stderr + done.stdout
    bom = run_cli("bom", str(fifo))
    assert bom.returncode == 2 and "FIFO" in bom.stderr
    cap = run_cli("check", "NE555", "--r", "10k", "--c", "10n", "--measured-from", str(fifo))
    assert cap.returncode == 2 and "FIFO" in cap.stderr


def test_dev_zero_is_refused():
    with pytest.raises(FileRefused, match="character device"):
        read_regular("/dev/zero", "bom")
    done = run_cli("bom", "/dev/zero")
    assert done.returncode == 2 and "character device" in done.stderr
    cap = run_cli("measure", "/dev/zero")
    assert cap.returncode == 2 and "character device" in cap.stderr


def test_a_rules_folder_fifo_is_refused(fifo):
    done = run_cli("rules", "--check", env={"RETIME_RULES": str(fifo.parent)})
    assert done.returncode == 1 and "FIFO" in done.stderr + done.stdout


def test_files_over_the_size_limit_are_refused_with_both_sizes(tmp_path):
    big = tmp_path / "big.yaml"
    big.write_bytes(b"#" * 2048)
    with pytest.raises(FileRefused, match=r"2.0 kiB; the limit for a catalog file is 1.0 kiB"):
        read_regular(big, "catalog", limit=1024)
    assert read_regular(big, "catalog") == b"#" * 2048


def test_a_failed_write_leaves_nothing(tmp_path, monkeypatch):
    target = tmp_path / "out.csv"

    def interrupted(fd):
        raise KeyboardInterrupt

    monkeypatch.setattr(os, "fsync", interrupted)
    with pytest.raises(KeyboardInterrupt):
        atomic_write(target, b"data")
    assert list(tmp_path.iterdir()) == []


def test_sigterm_during_a_write_leaves_no_temporary_file(tmp_path):
    probe = textwrap.dedent(f"""
        import os, signal
        from advisor import files
        def slow(fd):
            os.kill(os.getpid(), signal.SIGTERM)
        os.fsync = slow
        files.atomic_write({str(tmp_path / 'out.csv')!r}, b"data")
    """)
    done = subprocess.run([sys.executable, "-c", probe], cwd=ROOT, capture_output=True, text=True, timeout=HANG)
    assert done.returncode == 143, done.stderr
    assert list(tmp_path.iterdir()) == []


def test_writing_into_a_missing_folder_is_an_input_error(tmp_path):
    from advisor.errors import InputError

    with pytest.raises(InputError, match="does not exist"):
        atomic_write(tmp_path / "no" / "out.csv", b"x")
