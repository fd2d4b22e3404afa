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


# --- output targets that are not regular files (issue 18) ---------------------------------


@pytest.fixture
def odd_targets(tmp_path):
    """Each kind of existing non-regular target: a device, a FIFO, a folder, links to them."""
    (tmp_path / "folder.csv").mkdir()
    os.mkfifo(tmp_path / "pipe.csv")
    os.symlink("/dev/null", tmp_path / "to-null.md")
    os.symlink(tmp_path / "folder.csv", tmp_path / "to-folder.csv")
    return {
        "/dev/full": "a character device",
        "/dev/null": "a character device",
        str(tmp_path / "folder.csv"): "a folder",
        str(tmp_path / "pipe.csv"): "a FIFO",
        str(tmp_path / "to-null.md"): "a symbolic link to a character device ('/dev/null')",
        str(tmp_path / "to-folder.csv"): f"a symbolic link to a folder ({str(tmp_path / 'folder.csv')!r})",
    }


def _unchanged(path: str) -> None:
    import stat

    if path.startswith("/dev/"):
        assert stat.S_ISCHR(os.stat(path).st_mode), f"{path} is no longer a device"


def test_the_atomic_writer_refuses_a_target_that_is_not_a_regular_file(odd_targets, tmp_path):
    for path, kind in odd_targets.items():
        with pytest.raises(FileRefused) as exc:
            atomic_write(path, b"data", what="-o")
        assert exc.value.render() == f"-o {path!r} is {kind}, not a regular file; nothing was written (name an ordinary file)"
        _unchanged(path)
    # nothing left behind: no temporary file beside the targets, the FIFO and folder untouched
    assert sorted(p.name for p in tmp_path.iterdir()) == ["folder.csv", "pipe.csv", "to-folder.csv", "to-null.md"]
    assert list((tmp_path / "folder.csv").iterdir()) == []
    # a regular file and a dangling link are ordinary targets
    atomic_write(tmp_path / "plain.csv", b"one")
    os.symlink(tmp_path / "gone.csv", tmp_path / "dangling.csv")
    atomic_write(tmp_path / "dangling.csv", b"two")
    assert (tmp_path / "plain.csv").read_bytes() == b"one" and (tmp_path / "dangling.csv").read_bytes() == b"two"


BOM_CSV = "Ref,Part,R,C\nU1,NE555,10k,10n\n"


@pytest.mark.parametrize("flags", [["-o", "{t}"], ["--report", "{t}"], ["-o", "{ok}", "--report", "{t}"]])
def test_bom_refuses_an_output_that_is_not_a_regular_file_before_writing_anything(odd_targets, tmp_path, flags):
    from support.inprocess import retime

    bom = tmp_path / "in.csv"
    bom.write_text(BOM_CSV, encoding="utf-8")
    ok = tmp_path / "written.csv"
    for target, kind in odd_targets.items():
        if "--report" in flags and not target.endswith(".md"):
            continue  # a report needs an .md/.html name (the link to /dev/null is one)
        argv = ["bom", str(bom)] + [f.format(t=target, ok=ok) for f in flags]
        run = retime(*argv)
        flag = "--report" if "--report" in flags else "-o"
        assert run.code == 2, (argv, run)
        assert run.err.count("\n") == 1 and f"{target!r} is {kind}, not a regular file" in run.err, run.err
        assert f"argument {flag}" in run.err or f"argument -o/--output" in run.err, run.err
        assert not ok.exists(), "the good -o was written before the bad --report was refused"
        assert run.out == ""
        _unchanged(target)


@pytest.mark.parametrize("command", [["check", "NE555", "--r", "10k", "--c", "10n"],
                                     ["swap", "NE555", "TLC555", "--r", "10k", "--c", "10n", "--vcc", "5"],
                                     ["alternates", "NE555", "--r", "10k", "--c", "10n", "--vcc", "5"],
                                     ["board", "advisor/data/demo/bench_pulse_generator.kicad_sch"]])
def test_every_report_flag_refuses_a_device_or_a_fifo(command, tmp_path):
    from support.inprocess import retime

    os.mkfifo(tmp_path / "pipe.html")
    os.symlink("/dev/full", tmp_path / "full.md")
    for target, kind in ((tmp_path / "pipe.html", "a FIFO"),
                         (tmp_path / "full.md", "a symbolic link to a character device ('/dev/full')")):
        cwd = os.getcwd()
        os.chdir(ROOT)
        try:
            run = retime(*command, "--report", str(target))
        finally:
            os.chdir(cwd)
        assert run.code == 2 and f"argument --report: {str(target)!r} is {kind}, not a regular file" in run.err, run
        assert run.out == ""
    _unchanged("/dev/full")


def test_a_regular_output_and_a_new_one_still_work(tmp_path):
    from support.inprocess import retime

    bom = tmp_path / "in.csv"
    bom.write_text(BOM_CSV, encoding="utf-8")
    old = tmp_path / "old.csv"
    old.write_text("stale\n", encoding="utf-8")
    run = retime("bom", str(bom), "-o", str(old), "--report", str(tmp_path / "new.md"))
    assert run.code == 0, run
    assert "retime_status" in old.read_text(encoding="utf-8") and (tmp_path / "new.md").is_file()
