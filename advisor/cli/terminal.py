"""Output that survives a terminal or pipe that cannot print Ω or µ.

When stdout or stderr cannot encode the symbols retime prints (``PYTHONIOENCODING=ascii``,
an old code page), the stream is wrapped so those symbols are written in ASCII
(``Ω`` → ``ohm``, ``µ`` → ``u``, ``±`` → ``+/-``, …) and anything else unprintable becomes
``?``; JSON is written with ``\\u`` escapes instead (:func:`ascii_only`), so it stays
exact. Nothing changes on a terminal that can print them.
"""

from __future__ import annotations

import sys

#: ASCII spellings of the symbols retime prints (common practice: ohm and u as in
#: ASCII-only datasheets and SPICE netlists).
ASCII_FALLBACKS = str.maketrans({
    "Ω": "ohm", "\u2126": "ohm", "µ": "u", "μ": "u", "±": "+/-", "—": "-", "–": "-", "−": "-",
    "→": "->", "←": "<-", "…": "...", "≥": ">=", "≤": "<=", "×": "x", "·": "*", "‖": "||",
    "°": " deg", "≈": "~", "‘": "'", "’": "'", "“": '"', "”": '"', "\u2009": " ", "\u00a0": " ",
})
_PROBE = "Ωµ±—→…≥≤×·‖"


class AsciiStream:
    """A text stream that writes :data:`ASCII_FALLBACKS` spellings into ``stream``."""

    ascii_only = True

    def __init__(self, stream) -> None:
        self._stream = stream
        reconfigure = getattr(stream, "reconfigure", None)
        if reconfigure is not None:
            reconfigure(errors="replace")

    def write(self, text: str) -> int:
        self._stream.write(text.translate(ASCII_FALLBACKS))
        return len(text)

    def __getattr__(self, name: str):  # flush, fileno, isatty, buffer, encoding, ...
        return getattr(self._stream, name)


def _cannot_print(stream) -> bool:
    encoding = getattr(stream, "encoding", None)
    if not encoding or isinstance(stream, AsciiStream):
        return False
    try:
        _PROBE.encode(encoding)
    except UnicodeEncodeError:
        return True
    except LookupError:
        return False
    return False


def guard_streams() -> None:
    """Wrap stdout and stderr in :class:`AsciiStream` when they cannot encode retime's symbols."""
    if _cannot_print(sys.stdout):
        sys.stdout = AsciiStream(sys.stdout)
    if _cannot_print(sys.stderr):
        sys.stderr = AsciiStream(sys.stderr)


def ascii_only() -> bool:
    """True when stdout takes ASCII only (JSON is then written with escapes)."""
    return bool(getattr(sys.stdout, "ascii_only", False))
