"""Run ``retime`` in this process with stdout and stderr captured (fast; no subprocess)."""

from __future__ import annotations

import contextlib
import io
from dataclasses import dataclass


@dataclass
class Run:
    code: int
    out: str
    err: str


def retime(*argv: str) -> Run:
    """``advisor.cli.main.main(argv)`` with captured streams; argparse's exits count as codes."""
    from advisor.cli.main import main

    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        try:
            code = main(list(argv))
        except SystemExit as exc:  # argparse: --help (0) or a usage error (2)
            code = exc.code if isinstance(exc.code, int) else 2
    return Run(code, out.getvalue(), err.getvalue())
