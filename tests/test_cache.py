"""The start-up cache (advisor/cache.py): data only, checked on read, keyed by the
grammar's own source code, written atomically, and the same answers as no cache."""

from __future__ import annotations

import json
import os
import pickle
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from advisor import cache
from advisor.catalog import Catalog, _from_cache, _to_cache, load_dirs
from advisor.resources import data_dirs
from advisor.rules import loader as rules_loader

ROOT = Path(__file__).resolve().parents[1]
SWAP = ["swap", "74LS221", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "5", "--json"]


def _run(argv, env_extra, cwd=ROOT):
    env = dict(os.environ, **env_extra)
    env.pop("RETIME_NO_CACHE", None)
    return subprocess.run([sys.executable, "-m", "advisor", *argv], capture_output=True, text=True,
                          cwd=cwd, env=env, timeout=120)


def test_the_cache_file_is_json_and_gives_the_same_catalog(tmp_path, monkeypatch):
    monkeypatch.setenv("RETIME_CACHE", str(tmp_path))
    monkeypatch.delenv("RETIME_NO_CACHE", raising=False)
    dirs = data_dirs("catalog")
    fresh = load_dirs(dirs)
    cache.cached("catalog", dirs, lambda: fresh, _to_cache, lambda d: _from_cache(d, dirs))
    doc = json.loads((tmp_path / "catalog.json").read_text(encoding="utf-8"))
    assert doc["kind"] == "catalog" and doc["format"] == cache.FORMAT
    built = []
    again = cache.cached("catalog", dirs, lambda: built.append(1) or fresh, _to_cache,
                         lambda d: _from_cache(d, dirs))
    assert built == []  # answered from the cache
    assert again is not fresh
    assert sorted(again.families) == sorted(fresh.families)
    for key in fresh.families:
        assert again.families[key] == fresh.families[key]
        assert again.families[key].model_fields_set == fresh.families[key].model_fields_set
    assert again.files == fresh.files and again.problems == fresh.problems


def test_the_cached_rule_set_behaves_like_the_loaded_one(tmp_path, monkeypatch):
    monkeypatch.setenv("RETIME_CACHE", str(tmp_path))
    dirs = data_dirs("rules")
    fresh = rules_loader.load_dirs(dirs)
    again = rules_loader._from_cache(json.loads(json.dumps(rules_loader._to_cache(fresh))))
    assert again.to_json() == fresh.to_json()
    for a, b in zip(again.rules, fresh.rules):
        assert a.rule == b.rule and a.file == b.file and a.topic == b.topic
        for name in ("condition", "message", "fix", "rework"):
            x, y = getattr(a, name), getattr(b, name)
            assert (x is None and y is None) or x.text == y.text, (a.id, name)
        for case in a.rule.cases.fire + a.rule.cases.no_fire:
            assert a.fires(dict(case)) == b.fires(dict(case))
            assert a.finding(dict(case), None) == b.finding(dict(case), None)


def test_a_changed_validator_invalidates_the_cache(tmp_path, monkeypatch):
    """Issue 13: a grammar validator changed (here: one that refuses everything) must not
    be answered from the old cache."""
    monkeypatch.setenv("RETIME_CACHE", str(tmp_path / "cache"))
    code = tmp_path / "code"
    for rel in cache.GRAMMAR_FILES:
        src = Path(cache.__file__).parent / rel
        if src.exists():
            (code / rel).parent.mkdir(parents=True, exist_ok=True)
            shutil.copy(src, code / rel)
    before = cache.code_hash(code)
    assert before == cache.code_hash()  # the copy is the package's own grammar
    real = cache.code_hash
    monkeypatch.setattr(cache, "code_hash", lambda: real(code))  # the key hashes the copy
    dirs = data_dirs("catalog")
    fresh = load_dirs(dirs)
    builds = []

    def build():
        builds.append(1)
        return fresh

    cache.cached("catalog", dirs, build, _to_cache, lambda d: _from_cache(d, dirs))
    cache.cached("catalog", dirs, build, _to_cache, lambda d: _from_cache(d, dirs))
    assert builds == [1]
    parts = code / "parts.py"
    text = parts.read_text(encoding="utf-8")
    assert "if self.min > self.max:" in text
    parts.write_text(text.replace("if self.min > self.max:", "if True:"), encoding="utf-8")
    assert real(code) != before
    cache.cached("catalog", dirs, build, _to_cache, lambda d: _from_cache(d, dirs))
    assert builds == [1, 1]


def test_the_key_covers_the_grammar_and_vocabulary_sources():
    for rel in ("parts.py", "catalog.py", "rules/model.py", "rules/context.py", "rules/loader.py", "cache.py",
                "record.py", "makers.py"):
        assert rel in cache.GRAMMAR_FILES
        assert (Path(cache.__file__).parent / rel).exists()


def test_a_poisoned_cache_file_cannot_run_code(tmp_path):
    """A pickle planted where the cache lives (old and new names) and a JSON file shaped
    to fool the loader: no code runs, the answer is the same as without a cache."""
    marker = tmp_path / "ran"

    class Payload:
        def __reduce__(self):
            return (os.system, (f"touch {marker}",))

    folder = tmp_path / "cache"
    folder.mkdir()
    blob = pickle.dumps(Payload())
    (folder / "catalog.json").write_bytes(blob)
    (folder / "rules.json").write_bytes(blob)
    (folder / "catalog-0123456789abcdef0123.pickle").write_bytes(blob)
    plain = _run(SWAP, {"RETIME_NO_CACHE": "1"})
    assert plain.returncode == 0, plain.stderr
    got = _run(SWAP, {"RETIME_CACHE": str(folder)})
    assert got.returncode == 0, got.stderr
    assert got.stdout == plain.stdout
    assert not marker.exists()
    # The rebuilt files are JSON now; plant well-formed JSON with the right key but
    # values of the wrong kind: it is refused while rebuilt and the answer stands.
    doc = json.loads((folder / "catalog.json").read_text(encoding="utf-8"))
    fams = doc["data"]["families"]
    key = next(iter(fams))
    fam = json.loads(fams[key])
    fam["timing"] = {"law": "__import__('os').system('touch " + str(marker) + "')", "constants": 1}
    for k in list(fams):
        fams[k] = json.dumps(fam)
    (folder / "catalog.json").write_text(json.dumps(doc), encoding="utf-8")
    rdoc = json.loads((folder / "rules.json").read_text(encoding="utf-8"))
    for entry in rdoc["data"]["rules"]:
        entry["rule"]["condition"] = "__import__('os').system('touch " + str(marker) + "')"
    (folder / "rules.json").write_text(json.dumps(rdoc), encoding="utf-8")
    again = _run(SWAP, {"RETIME_CACHE": str(folder)})
    assert again.returncode == 0, again.stderr
    assert again.stdout == plain.stdout
    assert not marker.exists()


def test_rebuild_refuses_values_of_the_wrong_kind():
    from advisor.parts import Sourced

    assert cache.rebuild(Sourced, {"value": 1, "source": "x"}).value == 1.0
    for bad in ({"value": "1", "source": "x"}, {"value": 1.0}, {"value": 1.0, "source": "x", "evil": 1},
                {"value": float("nan"), "source": "x"}, ["value"], {"value": True, "source": "x"}):
        with pytest.raises(cache.CacheMismatch):
            cache.rebuild(Sourced, bad)


def test_a_failed_cache_write_leaves_no_temporary_file(tmp_path, monkeypatch):
    monkeypatch.setenv("RETIME_CACHE", str(tmp_path))

    def refuse(src, dst):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(os, "replace", refuse)
    dirs = data_dirs("rules")
    rs = cache.cached("rules", dirs, lambda: rules_loader.load_dirs(dirs), rules_loader._to_cache,
                      rules_loader._from_cache)
    assert rs.rules
    assert list(tmp_path.iterdir()) == []


def test_an_unwritable_cache_folder_means_no_cache(tmp_path):
    folder = tmp_path / "file-not-folder"
    folder.write_text("x")
    got = _run(SWAP, {"RETIME_CACHE": str(folder)})
    assert got.returncode == 0, got.stderr
