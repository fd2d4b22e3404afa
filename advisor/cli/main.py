"""Entry point of the ``retime`` command.

Each command lives in its own module ``advisor/cli/cmd_<name>.py`` exposing
``NAME``, ``HELP``, ``register(parser)`` and ``run(args) -> int``; they are found
by name, so adding a command touches no shared file. Command modules keep heavy
imports (pandas, textual, schemdraw) inside ``run`` so start-up stays fast.

Every :class:`advisor.errors.RetimeError` becomes one line on stderr and its
exit status (2 for bad input, 1 for data problems); no traceback reaches a user
unless ``RETIME_DEBUG=1``.
"""

from __future__ import annotations

import argparse
import importlib
import os
import pkgutil
import sys

from advisor import __version__
from advisor.errors import RetimeError

#: Order in ``retime --help``; commands not listed here follow alphabetically.
ORDER = ["demo", "find", "show", "catalog", "check", "design", "swap", "alternates", "bom", "measure", "rules", "ui"]


def command_names() -> list[str]:
    """Every command's name, in ``retime --help`` order (from the module names: nothing imported)."""
    import advisor.cli as pkg

    names = [m.name[4:] for m in pkgutil.iter_modules(pkg.__path__) if m.name.startswith("cmd_")]
    names.sort(key=lambda n: (ORDER.index(n) if n in ORDER else len(ORDER), n))
    return names


def _command_modules(only: str | None = None) -> list:
    names = command_names()
    if only is not None and only in names:
        names = [only]
    return [importlib.import_module(f"advisor.cli.cmd_{n}") for n in names]


class _Parser(argparse.ArgumentParser):
    def error(self, message: str) -> None:  # one line, exit 2, no usage dump
        sys.stderr.write(f"{self.prog}: error: {message} (see '{self.prog} --help')\n")
        raise SystemExit(2)


def build_parser(only: str | None = None) -> argparse.ArgumentParser:
    """The command line's parser; with ``only`` (a command name) just that command's
    sub-parser is built, so a run imports and registers only the command it runs (the
    sub-parser, its usage and its errors are the same as in the full parser)."""
    common = argparse.ArgumentParser(add_help=False)
    common.add_argument("--json", action="store_true", help="print one JSON object (SI units) on stdout")
    common.add_argument("--catalog", action="append", default=[], metavar="DIR",
                        help="extra catalog folder that adds or overrides families (repeatable)")
    parser = _Parser(
        prog="retime",
        description="Replace a 555-class timer or a one-shot: look parts up, recompute R/C, "
        "check datasheet rules, list the rework.",
    )
    parser.add_argument("--version", action="version", version=f"retime {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    for mod in _command_modules(only):
        p = sub.add_parser(mod.NAME, help=mod.HELP, description=getattr(mod, "DESCRIPTION", mod.HELP), parents=[common])
        mod.register(p)
        p.set_defaults(_run=mod.run, _parser=p)  # _parser: how this command spells its flags (as_typed)
    return parser


def main(argv: list[str] | None = None) -> int:
    from advisor.cli.terminal import guard_streams

    guard_streams()
    words = sys.argv[1:] if argv is None else argv
    # The first word names the command (retime has no options before it but --help and
    # --version, which need the full parser).
    parser = build_parser(words[0] if words and words[0] in command_names() else None)
    args = parser.parse_args(argv)
    if not getattr(args, "command", None):
        parser.print_help()
        return 0
    try:
        code = int(args._run(args) or 0)
        sys.stdout.flush()  # a full disk or a closed pipe shows here, not at exit
        return code
    except RetimeError as exc:
        sys.stderr.write(f"retime: error: {as_typed(exc, args).render()}\n")
        return exc.exit_code
    except KeyboardInterrupt:
        sys.stderr.write("retime: interrupted\n")
        return 130
    except BrokenPipeError:
        _silence_stdout()
        return 0
    except OSError as exc:  # read-only folder, full disk, missing folder: bad input (exit 2) with the path
        sys.stderr.write(f"retime: error: {os_error_message(exc)}\n")
        if exc.filename is None:
            _silence_stdout()
        return 2
    except Exception as exc:  # a bug: one line for users, the traceback on request
        if os.environ.get("RETIME_DEBUG"):
            raise
        sys.stderr.write(
            f"retime: internal error: {type(exc).__name__}: {exc} "
            "(please report it; set RETIME_DEBUG=1 for details)\n"
        )
        return 3


def as_typed(exc: RetimeError, args: argparse.Namespace) -> RetimeError:
    """The error naming the flags as this command spells them (``design --width``, where
    the engine says ``--target-width``; advisor.inputnames)."""
    from advisor.inputnames import parser_names, renamed

    command = getattr(args, "_parser", None)
    return renamed(exc, parser_names(command)) if command is not None else exc


def os_error_message(exc: OSError) -> str:
    """One line for an operating-system error: what failed, on which path, and why."""
    why = exc.strerror or type(exc).__name__
    if exc.filename is None:
        return f"cannot write the output: {why}"
    path = exc.filename if exc.filename2 is None else f"{exc.filename} -> {exc.filename2}"
    return f"{path}: {why}"


def _silence_stdout() -> None:
    """Point stdout at the null device so the exit-time flush of unwritable output stays quiet
    (the Python documentation's advice for SIGPIPE, used for a full disk too)."""
    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
    except (OSError, ValueError, AttributeError):
        pass  # not a real file (tests capture stdout): nothing to silence


if __name__ == "__main__":  # pragma: no cover
    raise SystemExit(main())
