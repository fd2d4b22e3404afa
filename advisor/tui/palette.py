"""The workbench's own colours, for text drawn by Rich renderables.

The same hues appear as variables in ``workbench.tcss``; keep them in step.
Chosen for contrast on the dark slate background; danger/warning/note are told
apart by word and symbol as well as colour.
"""

from __future__ import annotations

INK = "#d8dee4"
DIM = "#7d8b96"
AMBER = "#e8a33d"  # output signal, part ids
TEAL = "#4fb3a9"  # trigger signal, keys
DANGER = "#ef6351"
WARNING = "#e6c44d"
NOTE = "#8ab4d8"
GOOD = "#7cc27a"
VIOLET = "#b99ae0"  # measured signal (a scope capture)

STYLE: dict[str, str] = {
    "id": f"bold {AMBER}",
    "heading": f"bold {TEAL}",
    "key": INK,
    "dim": DIM,
    "source": NOTE,
    "memory": f"italic {WARNING}",
    "caution": f"bold {DANGER}",
    "danger": f"bold {DANGER}",
    "warning": f"bold {WARNING}",
    "note": NOTE,
    "good": f"bold {GOOD}",
    "trigger": TEAL,
    "output": AMBER,
    "skip": DANGER,
    "measured": VIOLET,
}

#: Word and mark per severity, so the meaning never rests on colour alone.
SEVERITY_MARK = {"danger": "✖ DANGER", "warning": "▲ warning", "note": "● note"}
