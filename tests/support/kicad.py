"""A small reader for KiCad 6 symbol libraries (``*.kicad_sym``, S-expressions).

Used by the pinout tests to read the installed open symbol library at test
time; nothing from it is copied into the repository. Only what the tests need:
find one top-level symbol, follow ``extends`` to its base, list its pins with
number, name, electrical type and unit (the section of a multi-unit symbol).
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

_TOKEN = re.compile(r'\(|\)|"(?:[^"\\]|\\.)*"|[^\s()"]+')


def parse(text: str) -> list:
    """Parse one S-expression into nested lists of strings (quotes removed)."""
    stack: list[list] = [[]]
    for tok in _TOKEN.findall(text):
        if tok == "(":
            stack.append([])
        elif tok == ")":
            done = stack.pop()
            stack[-1].append(done)
        elif tok.startswith('"'):
            stack[-1].append(tok[1:-1].replace('\\"', '"'))
        else:
            stack[-1].append(tok)
    return stack[0][0] if stack[0] else []


@dataclass(frozen=True)
class SymPin:
    number: str
    name: str
    kind: str  # input, output, power_in, ...
    unit: int  # 0 = common to all units


@lru_cache(maxsize=8)
def _text(path: str) -> str:
    return Path(path).read_text(encoding="utf-8")


def _top_level_block(text: str, name: str) -> str | None:
    """The balanced text of ``(symbol "name" ...)`` at library level."""
    m = re.search(r'\n  \(symbol "%s"' % re.escape(name), text)
    if not m:
        return None
    start = m.start() + 3
    depth, i, in_str = 0, start, False
    while i < len(text):
        c = text[i]
        if in_str:
            if c == "\\":
                i += 1
            elif c == '"':
                in_str = False
        elif c == '"':
            in_str = True
        elif c == "(":
            depth += 1
        elif c == ")":
            depth -= 1
            if depth == 0:
                return text[start:i + 1]
        i += 1
    return None


def _walk_pins(node: list, unit: int, out: list[SymPin]) -> None:
    for child in node[1:] if node else []:
        if not isinstance(child, list) or not child:
            continue
        if child[0] == "symbol" and len(child) > 1 and isinstance(child[1], str):
            m = re.search(r"_(\d+)_\d+$", child[1])
            _walk_pins(child, int(m.group(1)) if m else unit, out)
        elif child[0] == "pin":
            name = next((c[1] for c in child if isinstance(c, list) and c and c[0] == "name"), "")
            number = next((c[1] for c in child if isinstance(c, list) and c and c[0] == "number"), "")
            out.append(SymPin(number=number, name=name, kind=child[1], unit=unit))


def symbol_pins(library: Path, name: str) -> list[SymPin] | None:
    """Pins of symbol ``name`` (following ``extends``), or None when absent."""
    text = _text(str(library))
    seen = set()
    while name not in seen:
        seen.add(name)
        block = _top_level_block(text, name)
        if block is None:
            return None
        tree = parse(block)
        base = next((c[1] for c in tree if isinstance(c, list) and c and c[0] == "extends"), None)
        if base:  # an alias has no pins of its own
            name = base
            continue
        pins: list[SymPin] = []
        _walk_pins(tree, 0, pins)
        return pins
    return None
