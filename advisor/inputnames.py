"""Name an input the way its user gave it.

The engine's messages name the inputs they are about by their canonical command-line
flag (``--r``, ``--c``, ``--vcc``, ``--target-width``): one spelling in the engine.
Each front end knows what its user typed or fed instead and renames those flags as it
renders a message: a command whose flag is spelled otherwise (``design --width`` for the
canonical ``--target-width``; the table is built from the parser, ``advisor.cli.main``),
a BOM line (the column the value came from, ``advisor.bom.review``), a workbench field
(its label, ``advisor.tui.bridge``). A flag the front end has no other name for stays.
"""

from __future__ import annotations

import re
from typing import Callable, Mapping

from advisor.errors import RetimeError

#: A long flag in running text: ``--target-width``, not part of a longer word or flag.
FLAG = re.compile(r"(?<![\w-])--[a-z][a-z0-9]*(?:-[a-z0-9]+)*(?![\w-])")


def rename_flags(text: str | None, names: Mapping[str, str] | Callable[[str], str | None]) -> str | None:
    """``text`` with each flag that ``names`` knows replaced by its name there.

    ``names`` maps a flag (``"--r"``) to what replaces it, or is a function giving the
    replacement or None (keep the flag).
    """
    if not text or not names:
        return text
    look = names.get if isinstance(names, Mapping) else names
    return FLAG.sub(lambda m: look(m.group(0)) or m.group(0), text)


def renamed(exc: RetimeError, names: Mapping[str, str] | Callable[[str], str | None]) -> RetimeError:
    """A copy of ``exc`` (same class and exit code) whose message, expectation and hint
    name the inputs by ``names``; ``exc`` itself when nothing changes."""
    fields = {k: rename_flags(getattr(exc, k), names) for k in ("message", "location", "expected", "hint")}
    if all(fields[k] == getattr(exc, k) for k in fields):
        return exc
    import copy

    out = copy.copy(exc)
    for k, v in fields.items():
        setattr(out, k, v)
    out.args = (out.render(),)
    return out


def typed_flag(args, flag: str) -> str:
    """``flag`` as the command that parsed ``args`` spells it (``args._parser``, set by
    ``advisor.cli.main``); ``flag`` itself otherwise."""
    parser = getattr(args, "_parser", None)
    return parser_names(parser).get(flag, flag) if parser is not None else flag


def parser_names(parser) -> dict[str, str]:
    """The flags a command spells otherwise than the canonical ``--<dest>``: for each
    option whose canonical spelling is not one of that command's own flags, the flag the
    user types (``design``: ``{"--target-width": "--width", ...}``)."""
    own = {s for a in parser._actions for s in a.option_strings}
    out: dict[str, str] = {}
    for action in parser._actions:
        longs = [s for s in action.option_strings if s.startswith("--")]
        if not longs or action.dest in ("help", "version"):
            continue
        canonical = "--" + action.dest.replace("_", "-")
        if canonical not in own:
            out[canonical] = longs[-1]
    return out
