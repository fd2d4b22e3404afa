"""S-expression text (KiCad's file syntax) to nested Python lists, with helpers to walk them.

Parsing is sexpdata's (BSD-2-Clause; the choice is recorded in DEVELOPERS.md).
Atoms come back as ``str`` (sexpdata's Symbol is a str subclass; quoted strings are
plain str), ``int`` or ``float``. A syntax error becomes a located
:class:`BoardFileError` (file and line), never a traceback.
"""

from __future__ import annotations

from pathlib import Path

from advisor.errors import InputError

#: Largest design file read (bytes): KiCad's own biggest demo schematic is under 1 MB.
MAX_BYTES = 64 * 1024 * 1024


class BoardFileError(InputError):
    """A design file that cannot be read (missing, too large, not an S-expression)."""


def read_text(path: Path) -> str:
    try:
        size = path.stat().st_size
        if size > MAX_BYTES:
            raise BoardFileError(f"{path}: {size} bytes is more than the {MAX_BYTES} read for a design file")
        return path.read_text(encoding="utf-8", errors="replace")
    except OSError as exc:
        raise BoardFileError(f"{path}: cannot read the file ({exc.strerror or exc})") from None


def loads(text: str, where: str) -> list:
    """The first S-expression in ``text``; ``where`` (the file) locates errors."""
    import sexpdata

    try:
        tree = sexpdata.loads(text, nil=None, true=None, false=None)
    except Exception as exc:  # sexpdata raises its own exception classes and ValueError
        hint = _line_hint(text) or f" ({_short(exc)})"
        raise BoardFileError(f"{where}: not a readable S-expression{hint}") from None
    if not isinstance(tree, list) or not tree:
        raise BoardFileError(f"{where}: no S-expression found")
    _plain(tree, sexpdata.Symbol)
    return tree


def _plain(tree: list, symbol: type) -> None:
    """Symbols to plain ``str`` in place (sexpdata's Symbol never equals a str)."""
    stack = [tree]
    while stack:
        node = stack.pop()
        for i, item in enumerate(node):
            t = type(item)
            if t is list:
                stack.append(item)
            elif t is symbol:
                node[i] = str.__str__(item)


def _short(exc: Exception) -> str:
    msg = str(exc).split("\n")[0]
    return msg[:120]


def _line_hint(text: str) -> str:
    """Where the brackets stop balancing: the line of the first unclosed or extra bracket."""
    line, in_str, esc, open_lines, str_line = 1, False, False, [], 0
    for ch in text:
        if ch == "\n":
            line += 1
        if in_str:
            if esc:
                esc = False
            elif ch == "\\":
                esc = True
            elif ch == '"':
                in_str = False
            continue
        if ch == '"':
            in_str, str_line = True, line
        elif ch == "(":
            open_lines.append(line)
        elif ch == ")":
            if not open_lines:
                return f" at line {line}: a ')' with nothing to close"
            open_lines.pop()
    if in_str:
        return f": the quoted string opened at line {str_line} never closes (a cut-off file?)"
    if open_lines:
        return (f": the '(' opened at line {open_lines[0]} is never closed" if len(open_lines) == 1 else
                f": {len(open_lines)} brackets never close (the innermost opened at line {open_lines[-1]}; a cut-off file?)")
    return ""


def tag(node: object) -> str | None:
    """The head token of a list node (``wire`` for ``(wire ...)``)."""
    if isinstance(node, list) and node and isinstance(node[0], str):
        return str(node[0])
    return None


def children(node: list, name: str) -> list[list]:
    """Direct children ``(name ...)`` of ``node``."""
    return [c for c in node[1:] if isinstance(c, list) and c and c[0] == name]


def child(node: list, name: str) -> list | None:
    for c in node[1:]:
        if isinstance(c, list) and c and c[0] == name:
            return c
    return None


def value(node: list, name: str, default=None):
    """The first atom of child ``(name atom ...)``, or ``default``."""
    c = child(node, name)
    if c is None or len(c) < 2:
        return default
    return c[1]


def text(node: list, name: str, default: str = "") -> str:
    v = value(node, name, None)
    return default if v is None else str(v)


def has_flag(node: list, flag: str) -> bool:
    """True for a bare atom ``flag`` among the children, or a child ``(flag yes)``."""
    for c in node[1:]:
        if isinstance(c, str) and c == flag:
            return True
        if isinstance(c, list) and c and c[0] == flag and (len(c) == 1 or str(c[1]) == "yes"):
            return True
    return False


def at(node: list) -> tuple[float, float, float]:
    """``(at x y [angle])`` of ``node`` as floats (0 when absent)."""
    c = child(node, "at")
    if c is None:
        return (0.0, 0.0, 0.0)
    nums = [float(v) for v in c[1:4] if isinstance(v, (int, float))]
    while len(nums) < 3:
        nums.append(0.0)
    return (nums[0], nums[1], nums[2])


def properties(node: list) -> dict[str, str]:
    """``(property "Name" "Value" ...)`` children as a dict (first wins)."""
    out: dict[str, str] = {}
    for c in children(node, "property"):
        if len(c) >= 3:
            out.setdefault(str(c[1]), str(c[2]))
    return out
