"""A small, safe evaluator for rule conditions and message expressions.

Rule files are data written by contributors, so their expressions are never
handed to Python's own evaluator. They are parsed with :mod:`ast` and checked
against an allow-list before anything runs:

- constants: numbers, booleans, ``None`` and short strings;
- names from the declared vocabulary, written ``part.vcc`` or ``trigger_high``:
  a dotted name is *one* flat key of the context (no attribute is ever looked
  up on a Python object), and no part of it may start with ``_``;
- ``+ - * /`` and ``**`` on numbers only (exponent at most ``MAX_EXPONENT`` in
  size, computed in floating point), unary ``-``/``+``/``not``;
- comparisons (``< <= > >= == !=``, ``in``/``not in`` a literal tuple, ``is
  None``/``is not None``), ``and``/``or``, ``x if c else y``;
- calls to the whitelisted pure helpers in :data:`FUNCTIONS` (``min``, ``max``,
  ``abs``, ``ln``, ``log10``, ``sqrt``, ``known``), positional arguments only.

Everything else (subscripts, other attributes, lambdas, comprehensions,
f-strings, ``%``, keyword arguments, dunder names) is refused at compile time
with a message naming the construct, and length and nesting are bounded.

Missing data: a name whose value is ``None`` makes arithmetic and comparisons
*unknown*. ``and``/``or``/``not`` follow three-valued (Kleene) logic, so
``a or b`` is true when ``b`` is true even if ``a`` is unknown. A condition that
ends unknown does not fire: a rule never fires on data the circuit did not give.
"""

from __future__ import annotations

import ast
import math
from dataclasses import dataclass
from typing import Callable, Iterable

MAX_LENGTH = 600  # characters in one expression
MAX_DEPTH = 24  # nesting of the syntax tree
MAX_STRING = 80  # characters in a string constant
MAX_EXPONENT = 64.0  # |exponent| allowed in a ** b
MAX_CALL_ARGS = 8
MAX_TUPLE = 32
MAX_NUMBER = 1e30  # |numeric literal|


class ExprError(ValueError):
    """An expression that is not allowed or cannot be read (message says why)."""


class _Unknown(Exception):
    """Raised inside evaluation when a value needed is missing (None)."""


Number = (int, float)


def _num(x: object) -> float:
    if x is None:
        raise _Unknown
    if isinstance(x, bool) or not isinstance(x, Number):
        raise _Unknown  # strings and other types never take part in arithmetic
    return x  # type: ignore[return-value]


def _f_min(*args: object) -> float:
    return min(_num(a) for a in args)


def _f_max(*args: object) -> float:
    return max(_num(a) for a in args)


def _f_abs(x: object) -> float:
    return abs(_num(x))


def _f_ln(x: object) -> float:
    v = _num(x)
    if v <= 0:
        raise _Unknown
    return math.log(v)


def _f_log10(x: object) -> float:
    v = _num(x)
    if v <= 0:
        raise _Unknown
    return math.log10(v)


def _f_sqrt(x: object) -> float:
    v = _num(x)
    if v < 0:
        raise _Unknown
    return math.sqrt(v)


#: The only callables an expression can reach: pure numeric helpers plus
#: ``known(x)`` (true when the value was given). Arity: (min, max) arguments.
FUNCTIONS: dict[str, tuple[Callable[..., object], int, int]] = {
    "min": (_f_min, 1, MAX_CALL_ARGS),
    "max": (_f_max, 1, MAX_CALL_ARGS),
    "abs": (_f_abs, 1, 1),
    "ln": (_f_ln, 1, 1),
    "log10": (_f_log10, 1, 1),
    "sqrt": (_f_sqrt, 1, 1),
    "known": (lambda x: x is not None, 1, 1),
}

_BINOPS: dict[type, Callable[[float, float], float]] = {
    ast.Add: lambda a, b: a + b,
    ast.Sub: lambda a, b: a - b,
    ast.Mult: lambda a, b: a * b,
    ast.Div: lambda a, b: a / b,
    ast.Pow: lambda a, b: math.pow(a, b),
}

_ORDER: dict[type, Callable[[object, object], bool]] = {
    ast.Lt: lambda a, b: a < b,
    ast.LtE: lambda a, b: a <= b,
    ast.Gt: lambda a, b: a > b,
    ast.GtE: lambda a, b: a >= b,
}

Node = Callable[[dict], object]


@dataclass(frozen=True)
class Expr:
    """A checked expression: its text, the names it reads, and its evaluator."""

    text: str
    names: frozenset[str]
    _run: Node

    def value(self, env: dict) -> object:
        """The expression's value, or ``None`` when it needs a missing value."""
        try:
            return self._run(env)
        except _Unknown:
            return None
        except (ZeroDivisionError, OverflowError, ValueError):
            return None

    def truth(self, env: dict) -> bool:
        """True only when the expression is definitely true (unknown is false)."""
        return _truth(self.value(env)) is True

    def __reduce__(self):
        # The evaluator is a tree of closures, which pickle cannot store: a cached
        # rule set (advisor.cache) keeps the checked text and compiles it again.
        return (compile_expr, (self.text,))


def _truth(v: object) -> bool | None:
    if v is None:
        return None
    if isinstance(v, bool):
        return v
    if isinstance(v, Number):
        return v != 0
    if isinstance(v, str):
        return bool(v)
    return None


def dotted_name(node: ast.AST) -> str | None:
    """``part.vcc`` for an Attribute chain that bottoms out in a Name, else None."""
    parts: list[str] = []
    while isinstance(node, ast.Attribute):
        parts.append(node.attr)
        node = node.value
    if not isinstance(node, ast.Name):
        return None
    parts.append(node.id)
    return ".".join(reversed(parts))


class _Compiler:
    def __init__(self, vocabulary: Callable[[str], bool] | None) -> None:
        self.known = vocabulary
        self.names: set[str] = set()

    def fail(self, node: ast.AST, why: str) -> ExprError:
        col = getattr(node, "col_offset", None)
        where = f" (at column {col + 1})" if col is not None else ""
        return ExprError(why + where)

    def build(self, node: ast.AST, depth: int) -> Node:
        if depth > MAX_DEPTH:
            raise self.fail(node, f"expression nested deeper than {MAX_DEPTH} levels")
        method = getattr(self, f"_n_{type(node).__name__}", None)
        if method is None:
            raise self.fail(node, f"'{type(node).__name__}' is not allowed in a rule expression")
        return method(node, depth + 1)

    # --- leaves -----------------------------------------------------------------
    def _n_Constant(self, node: ast.Constant, depth: int) -> Node:
        v = node.value
        if v is None or isinstance(v, bool):
            return lambda env, v=v: v
        if isinstance(v, (int, float)):
            if abs(v) > MAX_NUMBER or not math.isfinite(float(v)):
                raise self.fail(node, f"number {v!r} is out of range")
            f = float(v)
            return lambda env, f=f: f
        if isinstance(v, str):
            if len(v) > MAX_STRING:
                raise self.fail(node, f"string constant longer than {MAX_STRING} characters")
            return lambda env, v=v: v
        raise self.fail(node, f"constant of type '{type(v).__name__}' is not allowed")

    def _name(self, node: ast.AST, name: str) -> Node:
        for part in name.split("."):
            if part.startswith("_"):
                raise self.fail(node, f"name '{name}': parts starting with '_' are not allowed")
        if name.count(".") > 1:
            raise self.fail(node, f"name '{name}': at most one '.' (prefix.field) is allowed")
        if name in FUNCTIONS:
            raise self.fail(node, f"'{name}' is a function; call it as {name}(...)")
        if self.known is not None and not self.known(name):
            raise self.fail(node, f"unknown name '{name}' (not in the context vocabulary; see rules/README.md)")
        self.names.add(name)
        return lambda env, name=name: env.get(name)

    def _n_Name(self, node: ast.Name, depth: int) -> Node:
        return self._name(node, node.id)

    def _n_Attribute(self, node: ast.Attribute, depth: int) -> Node:
        name = dotted_name(node)
        if name is None:
            raise self.fail(node, f"attribute '.{node.attr}' is only allowed on a vocabulary prefix such as part.vcc")
        return self._name(node, name)

    # --- operators --------------------------------------------------------------
    def _n_BinOp(self, node: ast.BinOp, depth: int) -> Node:
        op = _BINOPS.get(type(node.op))
        if op is None:
            raise self.fail(node, f"operator '{type(node.op).__name__}' is not allowed (use + - * / **)")
        for side in (node.left, node.right):
            if isinstance(side, ast.Constant) and isinstance(side.value, str):
                raise self.fail(node, "arithmetic on text is not allowed")
        left = self.build(node.left, depth)
        right = self.build(node.right, depth)
        if isinstance(node.op, ast.Pow):
            if isinstance(node.right, ast.Constant) and isinstance(node.right.value, (int, float)):
                if abs(node.right.value) > MAX_EXPONENT:
                    raise self.fail(node, f"exponent {node.right.value!r} is larger than {MAX_EXPONENT:g}")

            def power(env: dict) -> float:
                a, b = _num(left(env)), _num(right(env))
                if abs(b) > MAX_EXPONENT:
                    raise _Unknown
                try:
                    return math.pow(float(a), float(b))
                except (ZeroDivisionError, OverflowError, ValueError):
                    raise _Unknown from None

            return power

        def binop(env: dict) -> float:
            try:
                return float(op(_num(left(env)), _num(right(env))))
            except (ZeroDivisionError, OverflowError, ValueError):
                raise _Unknown from None

        return binop

    def _n_UnaryOp(self, node: ast.UnaryOp, depth: int) -> Node:
        operand = self.build(node.operand, depth)
        if isinstance(node.op, ast.USub):
            return lambda env: -_num(operand(env))
        if isinstance(node.op, ast.UAdd):
            return lambda env: +_num(operand(env))
        if isinstance(node.op, ast.Not):
            def negate(env: dict) -> bool:
                t = _truth(operand(env))
                if t is None:
                    raise _Unknown
                return not t
            return negate
        raise self.fail(node, f"operator '{type(node.op).__name__}' is not allowed")

    def _n_BoolOp(self, node: ast.BoolOp, depth: int) -> Node:
        parts = [self.build(v, depth) for v in node.values]
        is_and = isinstance(node.op, ast.And)

        def kleene(env: dict) -> bool:
            unknown = False
            for p in parts:
                try:
                    t = _truth(p(env))
                except _Unknown:
                    t = None
                if t is None:
                    unknown = True
                elif t is not is_and:  # False decides an 'and', True decides an 'or'
                    return t
            if unknown:
                raise _Unknown
            return is_and

        return kleene

    def _n_IfExp(self, node: ast.IfExp, depth: int) -> Node:
        test = self.build(node.test, depth)
        body = self.build(node.body, depth)
        orelse = self.build(node.orelse, depth)

        def choose(env: dict) -> object:
            t = _truth(test(env))
            if t is None:
                raise _Unknown
            return body(env) if t else orelse(env)

        return choose

    def _literal_tuple(self, node: ast.AST) -> tuple:
        if not isinstance(node, (ast.Tuple, ast.List)):
            raise self.fail(node, "'in' needs a literal tuple such as (\"hc\", \"hct\")")
        if len(node.elts) > MAX_TUPLE:
            raise self.fail(node, f"tuple longer than {MAX_TUPLE} items")
        out = []
        for e in node.elts:
            if not isinstance(e, ast.Constant) or not isinstance(e.value, (str, int, float)) or isinstance(e.value, bool):
                raise self.fail(e, "'in' tuples hold only number or string constants")
            if isinstance(e.value, str) and len(e.value) > MAX_STRING:
                raise self.fail(e, f"string constant longer than {MAX_STRING} characters")
            out.append(float(e.value) if isinstance(e.value, int) else e.value)
        return tuple(out)

    def _n_Compare(self, node: ast.Compare, depth: int) -> Node:
        left = self.build(node.left, depth)
        steps: list[tuple[str, object, Node | None]] = []
        for op, comp in zip(node.ops, node.comparators):
            if isinstance(op, (ast.In, ast.NotIn)):
                steps.append(("in" if isinstance(op, ast.In) else "not in", self._literal_tuple(comp), None))
            elif isinstance(op, (ast.Is, ast.IsNot)):
                if not (isinstance(comp, ast.Constant) and comp.value is None):
                    raise self.fail(comp, "'is' / 'is not' are only allowed with None")
                steps.append(("is" if isinstance(op, ast.Is) else "is not", None, None))
            elif isinstance(op, (ast.Eq, ast.NotEq)):
                steps.append(("==" if isinstance(op, ast.Eq) else "!=", None, self.build(comp, depth)))
            elif type(op) in _ORDER:
                steps.append(("order", _ORDER[type(op)], self.build(comp, depth)))
            else:
                raise self.fail(node, f"comparison '{type(op).__name__}' is not allowed")

        def compare(env: dict) -> bool:
            a = left(env)
            for kind, extra, right in steps:
                if kind in ("is", "is not"):
                    ok = (a is None) == (kind == "is")
                    b = None
                else:
                    if a is None:
                        raise _Unknown
                    if kind in ("in", "not in"):
                        ok = (a in extra) == (kind == "in")  # type: ignore[operator]
                        b = None
                    else:
                        b = right(env)  # type: ignore[misc]
                        if b is None:
                            raise _Unknown
                        if kind == "order":
                            ok = extra(_num(a), _num(b))  # type: ignore[operator]
                        else:
                            same = a == b if type(a) is type(b) or (isinstance(a, Number) and isinstance(b, Number)) else False
                            ok = same if kind == "==" else not same
                if not ok:
                    return False
                a = b
            return True

        return compare

    def _n_Call(self, node: ast.Call, depth: int) -> Node:
        if not isinstance(node.func, ast.Name) or node.func.id not in FUNCTIONS:
            what = node.func.id if isinstance(node.func, ast.Name) else type(node.func).__name__
            raise self.fail(node, f"call to '{what}' is not allowed (only {', '.join(sorted(FUNCTIONS))})")
        if node.keywords:
            raise self.fail(node, "keyword arguments are not allowed")
        fn, lo, hi = FUNCTIONS[node.func.id]
        if any(isinstance(a, ast.Starred) for a in node.args):
            raise self.fail(node, "'*' arguments are not allowed")
        if not lo <= len(node.args) <= hi:
            raise self.fail(node, f"{node.func.id}() takes {lo}..{hi} arguments, got {len(node.args)}")
        args = [self.build(a, depth) for a in node.args]
        if node.func.id == "known":
            only = args[0]
            return lambda env: only(env) is not None
        return lambda env: fn(*(a(env) for a in args))


def compile_expr(text: object, vocabulary: Callable[[str], bool] | Iterable[str] | None = None) -> Expr:
    """Check ``text`` against the allow-list and return an :class:`Expr`.

    ``vocabulary`` is a set of allowed names (or a predicate); unknown names are
    refused here, at load time. Raises :class:`ExprError` with the reason.
    """
    if not isinstance(text, str):
        raise ExprError(f"expected an expression as text, got {type(text).__name__}")
    if len(text) > MAX_LENGTH:
        raise ExprError(f"expression longer than {MAX_LENGTH} characters")
    if not text.strip():
        raise ExprError("empty expression")
    if "\x00" in text:
        raise ExprError("expression contains a NUL character")
    try:
        tree = ast.parse(text.strip(), mode="eval")
    except SyntaxError as exc:
        raise ExprError(f"cannot read the expression: {exc.msg}") from None
    except (ValueError, RecursionError, MemoryError) as exc:
        raise ExprError(f"cannot read the expression: {type(exc).__name__}") from None
    if vocabulary is None or callable(vocabulary):
        pred = vocabulary
    else:
        allowed = frozenset(vocabulary)
        pred = allowed.__contains__
    comp = _Compiler(pred)  # type: ignore[arg-type]
    run = comp.build(tree.body, 0)
    return Expr(text.strip(), frozenset(comp.names), run)
