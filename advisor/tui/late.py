"""Answers from worker threads that land after their screen has closed.

A ranking or a BOM review runs in a worker thread and hands its answer back with
``call_from_thread``. By then the user may have left the screen (Esc, another desk) or the
app may be shutting down, and the screen's widgets are gone: the query raises ``NoMatches``.
Such an answer has nobody to show it to, so it is dropped, never a failed worker.
"""

from __future__ import annotations

import functools
from typing import Callable, TypeVar

from textual.css.query import NoMatches

F = TypeVar("F", bound=Callable)


def dropped_when_closed(method: F) -> F:
    """Run ``method``; if the screen's widgets are gone (``NoMatches``), do nothing."""

    @functools.wraps(method)
    def wrapper(*args, **kwargs):
        try:
            return method(*args, **kwargs)
        except NoMatches:
            return None  # the screen left the stack, or the app shut down, while the worker ran

    return wrapper  # type: ignore[return-value]
