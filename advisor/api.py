"""The Python API for notebooks: the commands as functions returning typed answers.

    import advisor
    res = advisor.check("74HC123", r="47k", c="100n", vcc=5)
    res.timing.nominal.width          # s
    advisor.alternates("74121", r="10k", c="10n", vcc=5).to_frame()

Each function takes the same inputs as its command: the positional arguments, then
the command's options as keywords (``--trigger-period`` is ``trigger_period=``),
values as numbers or value codes ("4k7", "10n", "64us"). A flag is ``True``. The
arguments go through the command's own parser and engine call
(``advisor/cli/cmd_<name>.py`` ``compute``), so the answer is the one the command
prints with ``--json``, as a typed, frozen model of :mod:`advisor.answers`. Bad
input raises the command's own :class:`advisor.errors.RetimeError` (exit code 2 on the
command line; an unknown keyword is an :class:`~advisor.errors.InputError`).
"""

from __future__ import annotations

import argparse
import difflib
import importlib

from advisor.errors import InputError


def _parser(command: str) -> argparse.ArgumentParser:
    from advisor.cli.main import build_parser

    sub = next(a for a in build_parser()._actions if isinstance(a, argparse._SubParsersAction))
    return sub.choices[command]


def _args(command: str, positional: list[str], options: dict) -> argparse.Namespace:
    parser = _parser(command)
    known = {a.dest: a for a in parser._actions if a.option_strings}
    flags = {a.option_strings[-1].lstrip("-").replace("-", "_"): a for a in parser._actions if a.option_strings}
    argv = [str(p) for p in positional]
    for key, value in options.items():
        action = flags.get(key) or known.get(key)
        if action is None or key in ("help", "json"):
            close = difflib.get_close_matches(key, sorted(flags), n=3)
            hint = ("did you mean " + ", ".join(close) + "?") if close else f"'retime {command} --help' lists them"
            raise InputError(f"{command}() has no option {key!r}", got=key, hint=hint)
        if value is None or value is False:
            continue
        flag = action.option_strings[-1]
        if value is True:
            argv.append(flag)
        elif isinstance(value, (list, tuple)) and action.nargs is None and isinstance(action, argparse._AppendAction):
            for v in value:
                argv += [flag, str(v)]
        else:
            argv += [flag, str(value)]
    try:
        ns, extra = parser.parse_known_args(argv)
    except SystemExit:  # argparse has already said why on stderr
        raise InputError(f"{command}(): the arguments were refused", got=" ".join(argv)) from None
    if extra:
        raise InputError(f"{command}(): unexpected arguments", got=" ".join(extra))
    return ns


def _answer(command: str, model: str, positional: list, options: dict):
    from advisor import answers

    from advisor.cli.main import as_typed
    from advisor.errors import RetimeError

    args = _args(command, positional, options)
    try:
        result = importlib.import_module(f"advisor.cli.cmd_{command}").compute(args)
    except RetimeError as exc:  # named as this command spells its options (design: --width)
        raise as_typed(exc, args) from None
    return getattr(answers, model).model_validate(result.to_json())


def check(part: str, **options):
    """``retime check PART``: timing of one circuit with its findings -> :class:`~advisor.answers.CheckAnswer`."""
    return _answer("check", "CheckAnswer", [part], options)


def design(part: str, **options):
    """``retime design PART``: standard-value candidates -> :class:`~advisor.answers.DesignAnswer` (``to_frame()``)."""
    return _answer("design", "DesignAnswer", [part], options)


def swap(old: str, new: str, **options):
    """``retime swap OLD NEW``: class, pin map, rework -> :class:`~advisor.answers.SwapAnswer` (``to_frame()``)."""
    return _answer("swap", "SwapAnswer", [old, new], options)


def alternates(old: str, **options):
    """``retime alternates OLD``: ranked candidates -> :class:`~advisor.answers.AlternatesAnswer` (``to_frame()``)."""
    return _answer("alternates", "AlternatesAnswer", [old], options)


def review_bom(file, **options):
    """``retime bom FILE`` (nothing written): every row reviewed -> :class:`~advisor.answers.BomAnswer` (``to_frame()``)."""
    if options.get("output"):
        raise InputError("review_bom() writes nothing; call .to_frame() and save the table yourself", got="output")
    return _answer("bom", "BomAnswer", [str(file)], options)
