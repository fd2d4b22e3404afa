"""A progress bar on stderr, drawn only when stderr is a terminal."""

from __future__ import annotations

import sys
import time


class Progress:
    """``Progress(label)(done, total)`` redraws one line; ``close()`` ends it."""

    def __init__(self, label: str, stream=None, min_total: int = 500) -> None:
        self.stream = stream or sys.stderr
        self.label = label
        self.enabled = bool(getattr(self.stream, "isatty", lambda: False)())
        self.min_total = min_total
        self.started = time.perf_counter()
        self.drawn = False

    def __call__(self, done: int, total: int) -> None:
        if not self.enabled or total < self.min_total:
            return
        width = 30
        filled = int(width * done / max(total, 1))
        bar = "█" * filled + "·" * (width - filled)
        self.stream.write(f"\r{self.label} {bar} {done}/{total}")
        self.stream.flush()
        self.drawn = True

    def close(self) -> None:
        if self.drawn:
            self.stream.write(f"  ({time.perf_counter() - self.started:.1f} s)\n")
            self.stream.flush()
