"""Rule files are data: expressions that reach for Python internals are refused at load time.

The probes are the known ways out of naive expression evaluators (memory and CPU
attacks with string formatting and huge powers, dunder attribute chains, imports,
dict methods, lambdas, comprehensions, deep nesting). Each must be refused by
``compile_expr`` before anything runs, and the loader must report it located.
"""

from __future__ import annotations

import re
import time
from pathlib import Path

import pytest

from advisor.rules.context import vocabulary
from advisor.rules.loader import load_dirs
from advisor.rules.safe_expr import ExprError, compile_expr
from advisor.rules.template import compile_template

VOCAB = set(vocabulary("part"))

PROBES = [
    "'%999999999d' % 1",
    "'a'.center(999999999)",
    "'a' * 999999999",
    "3999999**3999999",
    "10 ** 1000",
    "__import__('os').system('true')",
    "__builtins__",
    "part.__class__",
    "part.vcc.__class__",
    "part.__dict__",
    "().__class__.__bases__[0].__subclasses__()",
    "part._private",
    "_x",
    "{}.keys()",
    "{'a': 1}.items()",
    "dict(a=1)",
    "part.id.upper()",
    "part.id[0]",
    "lambda: 1",
    "[x for x in (1, 2)]",
    "{x for x in (1, 2)}",
    "(x for x in (1, 2))",
    "f'{part.vcc}'",
    "open('/etc/passwd')",
    "getattr(part, 'vcc')",
    "eval('1')",
    "exec('1')",
    "min(*(1, 2))",
    "max(part.vcc, key=abs)",
    "(x := 1)",
    "part.vcc if part.vcc else __import__('os')",
    "import os",
    "part.vcc; part.c",
    "b'bytes'",
    "1j",
    "...",
    "part.r_min.real",
    "part.vcc.new.id",
    "unknown_name > 1",
    "part.vc > 1",
    "old.vcc > 1",  # old.* is not in the part-rule vocabulary
    "part.vcc is 5",
    "part.technology in part.id",
    "'x' * 100 + 'y'",
    "'" + "a" * 200 + "'",
    "(" * 300 + "1" + ")" * 300,
    "1" + "+1" * 250,
    "not " * 150 + "part.cmos",
    "-" * 100 + "1",
    "1e999 > 0",
    "9" * 400,
]


@pytest.mark.parametrize("text", PROBES)
def test_probe_refused_at_compile_time(text):
    with pytest.raises(ExprError):
        compile_expr(text, VOCAB)


@pytest.mark.parametrize("text", ["{part.__class__}", "{'%999999999d' % 1}", "{part.id.upper()}", "{part.vcc:Q}", "{part.vcc", "a } b"])
def test_probe_refused_in_templates(text):
    with pytest.raises(ExprError):
        compile_template(text, VOCAB)


def test_probes_refused_by_loader_with_location(tmp_path: Path):
    lines = ["topic: probes", "rules:"]
    for i, probe in enumerate(PROBES[:12]):
        cond = probe.replace("\\", "\\\\").replace('"', '\\"')
        lines += [
            f"  - id: probe-{i}",
            "    title: probe rule",
            "    severity: note",
            f'    condition: "{cond}"',
            "    message: m {part.id}",
            "    fix: f x",
            "    source: test",
            "    cases: {fire: [{part.vcc: 1.0}], no_fire: [{part.vcc: 2.0}]}",
        ]
    (tmp_path / "probes.yaml").write_text("\n".join(lines) + "\n", encoding="utf-8")
    rs = load_dirs([tmp_path])
    assert rs.rules == []
    texts = [str(p) for p in rs.problems]
    for i in range(12):
        assert any(t.startswith(f"rules/probes.yaml: rule probe-{i}: condition: ") for t in texts), texts


def test_runtime_bounds_do_not_hang_or_raise():
    # Exponents from data are bounded at run time too; overflow and division by zero are "unknown".
    e = compile_expr("part.vcc ** part.c > 1", VOCAB)
    assert e.truth({"part.vcc": 3999999.0, "part.c": 3999999.0}) is False
    assert e.truth({"part.vcc": 1e300, "part.c": 60.0}) is False
    assert compile_expr("part.vcc / part.c > 1", VOCAB).truth({"part.vcc": 1.0, "part.c": 0.0}) is False
    assert compile_expr("ln(part.vcc) > 0", VOCAB).truth({"part.vcc": -1.0}) is False


def test_strings_never_take_part_in_arithmetic():
    e = compile_expr("part.id * 3 == 'xxx'", VOCAB)
    assert e.value({"part.id": "x"}) is None


def test_allowed_forms_work():
    # A property that must hold: the allowed grammar evaluates as arithmetic and logic say.
    env = {"part.vcc": 5.0, "part.r_min": 1000.0, "part.technology": "hc", "part.cmos": True, "part.c": None}
    assert compile_expr("part.vcc * 2 + 1 == 11", VOCAB).truth(env)
    assert compile_expr("min(part.vcc, 3) == 3 and max(1, 2, part.vcc) == 5", VOCAB).truth(env)
    assert compile_expr("part.technology in ('hc', 'hct')", VOCAB).truth(env)
    assert compile_expr("part.c is None and not known(part.c)", VOCAB).truth(env)
    assert compile_expr("2 ** 10 == 1024", VOCAB).truth(env)
    assert compile_expr("(part.vcc if part.cmos else 0) > 4", VOCAB).truth(env)
    assert compile_expr("abs(-part.vcc) == 5 and sqrt(4) == 2 and ln(1) == 0 and log10(100) == 2", VOCAB).truth(env)
    # Kleene logic on missing values: unknown never fires, but a true 'or' branch does.
    assert not compile_expr("part.c > 1", VOCAB).truth(env)
    assert not compile_expr("not part.c > 1", VOCAB).truth(env)
    assert compile_expr("part.c > 1 or part.cmos", VOCAB).truth(env)
    assert not compile_expr("part.c > 1 and part.cmos", VOCAB).truth(env)
    assert compile_expr("1 < part.vcc < 6", VOCAB).truth(env)


def test_no_eval_or_exec_anywhere_in_the_package():
    root = Path(__file__).resolve().parents[1] / "advisor"
    pattern = re.compile(r"(?<![\w.])(eval|exec|compile)\s*\(")
    offenders = []
    for path in root.rglob("*.py"):
        for n, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1):
            if pattern.search(line):
                offenders.append(f"{path.relative_to(root.parent)}:{n}: {line.strip()}")
    assert offenders == []
