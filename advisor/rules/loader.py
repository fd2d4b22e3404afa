"""Load and check the rule files (``rules/*.yaml``).

Every rule is validated against the grammar (:mod:`advisor.rules.model`), its
condition and templates are compiled by the safe evaluator against the context
vocabulary of its scope (unknown names, dunder names, imports, attribute
chains and huge exponents are refused here, at load time), and its cases are
checked to use only known names with values of the right kind. Problems are
collected, not stopped at, and each names its place:
``rules/supply.yaml: rule supply-above-abs-max: condition: unknown name 'part.vc'``.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

from advisor.errors import key_path as _loc, raise_first_problem, short_repr as _short
from advisor.files import FileRefused
from advisor.resources import data_dirs
from advisor.rules.context import Var, vocabulary
from advisor.rules.engine import CompiledRule, RuleSet
from advisor.rules.safe_expr import ExprError, compile_expr
from advisor.rules.template import _any_name, compile_template
from advisor.yamlload import YamlProblem, load_yaml_file


@lru_cache(maxsize=None)
def _vocab(scope: str) -> dict[str, Var]:
    """The names a rule of ``scope`` may read (built when YAML is compiled, not on a cache hit)."""
    if scope == "board":
        from advisor.board.facts import board_vocabulary

        return board_vocabulary(_vocab("part"))
    return vocabulary(scope)


@dataclass(frozen=True)
class RuleProblem:
    file: str
    rule: str | None
    key: str
    message: str

    def __str__(self) -> str:
        where = self.file
        if self.rule:
            where += f": rule {self.rule}"
        if self.key:
            where += f": {self.key}"
        return f"{where}: {self.message}"


_KIND_TYPES = {"number": (int, float), "bool": (bool,), "text": (str,)}


def _case_problems(vocab: dict[str, Var], case: dict, key: str) -> list[tuple[str, str]]:
    out = []
    for name, value in case.items():
        var = vocab.get(name)
        if var is None:
            out.append((f"{key}.{name}", "unknown name (not in the context vocabulary for this scope)"))
            continue
        if value is None:
            continue
        ok = isinstance(value, _KIND_TYPES[var.kind]) and not (var.kind == "number" and isinstance(value, bool))
        if not ok:
            out.append((f"{key}.{name}", f"expected a {var.kind}, got {_short(value)}"))
    return out


def compile_rule(data: object, file: str, topic: str, index: int) -> tuple[CompiledRule | None, list[RuleProblem]]:
    """Validate and compile one rule entry; return it or its located problems."""
    from pydantic import ValidationError

    from advisor.rules.model import Rule

    label = data.get("id") if isinstance(data, dict) and isinstance(data.get("id"), str) else f"#{index + 1}"
    if not isinstance(data, dict):
        return None, [RuleProblem(file, label, "", f"expected a mapping of rule fields, got {_short(data)}")]
    try:
        rule = Rule.model_validate(data)
    except ValidationError as exc:
        probs = []
        for err in exc.errors():
            msg = err["msg"]
            if err["type"] == "extra_forbidden":
                msg = "unknown key (not in the rule grammar; see rules/README.md)"
            elif "input" in err and err["type"] != "missing":
                msg = f"{msg}, got {_short(err['input'])}"
            probs.append(RuleProblem(file, label, _loc(err["loc"]), msg))
        return None, probs
    vocab = _vocab(rule.applies_to.scope)
    known = vocab.__contains__
    problems: list[RuleProblem] = []
    compiled = {}
    for key in ("condition", "message", "fix", "rework.step"):
        if key == "rework.step" and rule.rework is None:
            continue
        try:
            text = rule.rework.step if key == "rework.step" else getattr(rule, key)
            compiled[key] = compile_expr(text, known) if key == "condition" else compile_template(text, known)
        except ExprError as exc:
            problems.append(RuleProblem(file, rule.id, key, str(exc)))
    if rule.swap_class is not None and rule.applies_to.scope == "part" and "new" not in rule.applies_to.parts:
        problems.append(RuleProblem(file, rule.id, "swap_class",
                                    "a swap class only counts for the new part; add 'new' to applies_to.parts"))
    if rule.applies_to.scope == "swap" and rule.applies_to.parts != ["new"]:
        problems.append(RuleProblem(file, rule.id, "applies_to.parts", "only part rules name parts; swap rules see old.* and new.*"))
    for kind in ("fire", "no_fire"):
        for i, case in enumerate(getattr(rule.cases, kind)):
            for key, msg in _case_problems(vocab, case, f"cases.{kind}[{i}]"):
                problems.append(RuleProblem(file, rule.id, key, msg))
    if problems:
        return None, problems
    return CompiledRule(rule, file, topic, compiled["condition"], compiled["message"], compiled["fix"],
                        compiled.get("rework.step")), []


def load_file(path: Path, label: str) -> tuple[list[CompiledRule], list[RuleProblem]]:
    from pydantic import ValidationError

    from advisor.rules.model import RuleFile

    try:
        data = load_yaml_file(path, "rules")
    except YamlProblem as exc:
        return [], [RuleProblem(label, None, exc.where, exc.message)]
    except FileRefused as exc:
        return [], [RuleProblem(label, None, "", f"not read: {exc.message}")]
    try:
        rf = RuleFile.model_validate(data)
    except ValidationError as exc:
        probs = []
        for err in exc.errors():
            msg = "unknown key (a rules file has 'topic' and 'rules')" if err["type"] == "extra_forbidden" else err["msg"]
            probs.append(RuleProblem(label, None, _loc(err["loc"]), msg))
        return [], probs
    rules, problems = [], []
    for i, entry in enumerate(rf.rules):
        rule, probs = compile_rule(entry, label, rf.topic, i)
        problems.extend(probs)
        if rule is not None:
            rules.append(rule)
    return rules, problems


def load_dirs(dirs: list[Path]) -> RuleSet:
    """Load every ``*.yaml`` in ``dirs``; later folders override earlier rules by id."""
    from advisor.overrides import Override

    rs = RuleSet()
    where: dict[str, str] = {}
    index: dict[str, int] = {}
    shipped: set[str] = set()  # ids whose rule came from the shipped folder (dirs[0])
    for n, d in enumerate(dirs):
        for path in sorted(Path(d).glob("*.yaml")):
            if path.name.startswith("_"):
                continue
            label = f"rules/{path.name}" if n == 0 else str(path)
            rules, problems = load_file(path, label)
            rs.problems.extend(problems)
            for rule in rules:
                if rule.id in index:
                    # Origin by folder, not by label: a user folder may itself be named "rules".
                    if (rule.id in shipped) == (n == 0):
                        rs.problems.append(RuleProblem(label, rule.id, "id", f"rule id also defined in {where[rule.id]}"))
                        continue
                    old = rs.rules[index[rule.id]]
                    # a user folder replaces a shipped rule: every answer says so (advisor.overrides)
                    rs.overrides.append(Override("rule", rule.id, label, old.file, old.severity, rule.severity))
                    rs.rules[index[rule.id]] = rule
                else:
                    index[rule.id] = len(rs.rules)
                    rs.rules.append(rule)
                if n == 0:
                    shipped.add(rule.id)
                else:
                    shipped.discard(rule.id)
                where[rule.id] = label
    return rs


@lru_cache(maxsize=4)
def load_rules(extra_dirs: tuple[str, ...] = ()) -> RuleSet:
    """The shipped rules plus ``RETIME_RULES`` / user folders and ``extra_dirs``."""
    from advisor.cache import cached

    dirs = data_dirs("rules", tuple(extra_dirs))
    return cached("rules", dirs, lambda: load_dirs(dirs), _to_cache, lambda data: _from_cache(data, dirs))


def _to_cache(rs: RuleSet) -> dict:
    """The rule set as plain data for :mod:`advisor.cache`: validated rules and their places."""
    from advisor.cache import to_data

    return {
        "rules": [{"rule": to_data(r.rule), "file": r.file, "topic": r.topic} for r in rs.rules],
        "problems": [to_data(p) for p in rs.problems],
        "overrides": [to_data(o) for o in rs.overrides],
    }


def _from_cache(data: dict, dirs: list[Path] | None = None) -> RuleSet:
    """The rule set from cached data (type-checked while rebuilt). Conditions and
    templates are compiled again from their checked text when a run first uses them
    (:class:`_Deferred`): most rules never fire, and many never apply, in one run."""
    from advisor.cache import CacheMismatch, rebuild

    from advisor.rules.model import Rule

    from advisor.overrides import Override

    if type(data) is not dict or set(data) != {"rules", "problems", "overrides"}:
        raise CacheMismatch("not a cached rule set")
    where = tuple(str(d) for d in (data_dirs("rules") if dirs is None else dirs))
    rs = RuleSet()
    for entry in rebuild(list[dict], data["rules"]):
        rule = rebuild(Rule, entry.get("rule"))
        file, topic = rebuild(str, entry.get("file")), rebuild(str, entry.get("topic"))
        rs.rules.append(CompiledRule(
            rule, file, topic, _Deferred(rule.condition, _checked_expr, where, rule.id, "condition"),
            _Deferred(rule.message, _checked_template, where, rule.id, "message"),
            _Deferred(rule.fix, _checked_template, where, rule.id, "fix"),
            _Deferred(rule.rework.step, _checked_template, where, rule.id, "rework") if rule.rework is not None else None))
    rs.problems = rebuild(list[RuleProblem], data["problems"])
    rs.overrides = rebuild(list[Override], data["overrides"])
    return rs


def _checked_expr(text: str):
    return compile_expr(text, _any_name)


def _checked_template(text: str):
    return compile_template(text, _any_name)


class _Deferred:
    """A cached rule's condition or template, compiled from its text on first use.

    The text was checked against the vocabulary when the cache was written (the cache
    key covers the compiler's and the vocabulary's source), so only a damaged cache file
    fails to compile here; the rule set is then read again from the YAML (and the cache
    file dropped), so a damaged file never changes an answer. Attributes (``truth``,
    ``value``, ``render``, ``names``, ``text``, ...) are those of the compiled object.
    """

    __slots__ = ("_source", "_make", "_dirs", "_rule", "_name", "_done")

    def __init__(self, source: str, make, dirs: tuple[str, ...], rule: str, name: str) -> None:
        self._source, self._make, self._dirs, self._rule, self._name = source, make, dirs, rule, name
        self._done = None

    def _compiled(self):
        if self._done is None:
            try:
                self._done = self._make(self._source)
            except ExprError:
                self._done = getattr(_reread(self._dirs).get(self._rule), self._name)
        return self._done

    def __getattr__(self, name: str):
        return getattr(self._compiled(), name)


@lru_cache(maxsize=2)
def _reread(dirs: tuple[str, ...]) -> RuleSet:
    """The rule set read from the YAML again, after a damaged cache file (dropped)."""
    from advisor.cache import drop

    drop("rules")
    return load_dirs([Path(d) for d in dirs])


def require_clean(rs: RuleSet) -> RuleSet:
    """Raise DataError naming the first problem."""
    raise_first_problem(rs.problems, "retime rules --check")
    return rs


def load_rules_checked(extra_dirs: tuple[str, ...] = ()) -> RuleSet:
    return require_clean(load_rules(tuple(extra_dirs)))
