"""The project's one exception family.

Every error a user can provoke is a :class:`RetimeError` (or a subclass) carrying
structured fields, so front ends can render it in one line (CLI), inline (TUI) or
as a row reason (BOM) and no Python traceback reaches the user.
"""

from __future__ import annotations


class RetimeError(Exception):
    """Base error: ``message`` plus optional location, offending text and expectation.

    ``exit_code`` follows the CLI convention: 2 for bad user input, 1 for data
    (catalog or rules) problems.
    """

    exit_code = 2

    def __init__(
        self,
        message: str,
        *,
        location: str | None = None,
        got: object | None = None,
        expected: str | None = None,
        hint: str | None = None,
    ) -> None:
        self.message = message
        self.location = location
        self.got = got
        self.expected = expected
        self.hint = hint
        super().__init__(self.render())

    def render(self) -> str:
        """One line: ``location: message (got 'x'; expected ...) hint``."""
        text = self.message
        if self.location:
            text = f"{self.location}: {text}"
        if self.expected:
            text = f"{text}; expected {self.expected}"
        if self.hint:
            text = f"{text}; {self.hint}"
        return text


class ValueParseError(RetimeError):
    """A quantity that could not be read (the input is quoted back)."""


class InputError(RetimeError):
    """A request that is well formed value by value but inconsistent or incomplete."""


class UnknownPartError(RetimeError):
    """A part number or family id not found in the catalog (with suggestions)."""


class DataError(RetimeError):
    """A catalog or rules file that breaks the grammar; located by file and key."""

    exit_code = 1


class CaptureError(RetimeError):
    """A scope capture that cannot be measured (no time column, no edges, ...)."""


def raise_first_problem(problems: list, command: str) -> None:
    """Raise DataError naming the first located problem; ``command`` lists them all."""
    if problems:
        more = f" (and {len(problems) - 1} more; run '{command}')" if len(problems) > 1 else ""
        raise DataError(str(problems[0]) + more)


def key_path(loc: tuple) -> str:
    """A validation location as a key path: ``timing.constants.k[0].value``."""
    out = ""
    for part in loc:
        if isinstance(part, int):
            out += f"[{part}]"
        else:
            out += f".{part}" if out else str(part)
    return out


def short_repr(value: object) -> str:
    """The offending value quoted back, cut to 60 characters (bounded work: a huge or
    deeply nested value is never turned into text in full)."""
    import reprlib

    r = reprlib.Repr()
    r.maxstring = r.maxother = 60
    r.maxlist = r.maxtuple = r.maxdict = r.maxset = 4
    r.maxlevel = 2
    text = r.repr(value)
    return text if len(text) <= 60 else text[:57] + "..."
