"""Message and fix templates: text with ``{expression}`` or ``{expression:unit}``.

The expression is a safe expression (:mod:`advisor.rules.safe_expr`), checked
against the rule's vocabulary at load time, so ``{part.r_min - part.r_total_min:Ω}``
works and ``{part.__class__}`` is refused. Python's own string formatting is never
applied to file content.

Units: ``V A W Ω F s Hz`` render in engineering notation with the unit
(:func:`advisor.values.format_eng`: ``4.7 kΩ``, ``10 nF``); ``%`` renders a fraction
as a percentage; an empty unit renders a plain number (``2``, ``0.7``). Text and
booleans render as they are (``yes``/``no``); a missing value renders as ``?``.
``{{`` and ``}}`` are literal braces.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Callable, Iterable

from advisor.rules.safe_expr import Expr, ExprError, compile_expr
from advisor.values import format_eng

UNITS = ("V", "A", "W", "Ω", "F", "s", "Hz", "%", "")
MISSING = "?"


@dataclass(frozen=True)
class Template:
    text: str
    parts: tuple[str | tuple[Expr, str], ...]

    @property
    def names(self) -> frozenset[str]:
        out: set[str] = set()
        for p in self.parts:
            if not isinstance(p, str):
                out |= p[0].names
        return frozenset(out)

    def __reduce__(self):
        # Recompiled from its checked text when a cached rule set is loaded (advisor.cache).
        return (compile_template, (self.text, _any_name))

    def render(self, env: dict) -> str:
        out = []
        for p in self.parts:
            if isinstance(p, str):
                out.append(p)
            else:
                out.append(render_value(p[0].value(env), p[1]))
        return "".join(out)


def render_value(value: object, unit: str) -> str:
    if value is None:
        return MISSING
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, str):
        return value
    if isinstance(value, (int, float)):
        if not math.isfinite(value):
            return MISSING
        if unit == "%":
            return f"{value * 100:.3g} %"
        if unit == "":
            if float(value).is_integer() and abs(value) < 1e9:
                return str(int(value))
            return f"{value:.3g}"
        return format_eng(float(value), unit, digits=3)
    return MISSING


def _any_name(name: str) -> bool:
    """Vocabulary predicate for recompiling an already checked template."""
    return True


def compile_template(text: object, vocabulary: Callable[[str], bool] | Iterable[str]) -> Template:
    """Split ``text`` into literal text and checked expressions; raise ExprError."""
    if not isinstance(text, str):
        raise ExprError(f"expected text, got {type(text).__name__}")
    parts: list[str | tuple[Expr, str]] = []
    buf: list[str] = []
    i, n = 0, len(text)
    while i < n:
        ch = text[i]
        if ch == "{" and text.startswith("{{", i):
            buf.append("{")
            i += 2
            continue
        if ch == "}" and text.startswith("}}", i):
            buf.append("}")
            i += 2
            continue
        if ch == "}":
            raise ExprError(f"unmatched '}}' at column {i + 1}")
        if ch == "{":
            end = text.find("}", i + 1)
            if end < 0:
                raise ExprError(f"unclosed '{{' at column {i + 1}")
            body = text[i + 1 : end]
            if "{" in body:
                raise ExprError(f"nested '{{' at column {i + 1}")
            expr_text, unit = body, ""
            if ":" in body:
                expr_text, unit = body.rsplit(":", 1)
                unit = unit.strip()
                if unit not in UNITS:
                    raise ExprError(f"unit '{unit}' in '{{{body}}}' is not one of: {', '.join(u for u in UNITS if u)}")
            try:
                expr = compile_expr(expr_text, vocabulary)
            except ExprError as exc:
                raise ExprError(f"in '{{{body}}}': {exc}") from None
            if buf:
                parts.append("".join(buf))
                buf = []
            parts.append((expr, unit))
            i = end + 1
            continue
        buf.append(ch)
        i += 1
    if buf:
        parts.append("".join(buf))
    return Template(text, tuple(parts))
