"""The timing picture as text: one renderer for the terminal, the workbench and Markdown.

Every edge comes from the engine's pulse schedule (:func:`advisor.timing.trigger.schedule`)
laid over a window chosen by :func:`axis_for`; this module only puts the edges on a
character grid. The axis is fixed by what does not move while a value is tuned (the
trimmer's travel, the target, the worst-case band, the trigger period), so turning the
trimmer moves the output's falling edge along a still axis instead of rescaling it.

Rows, top to bottom (each signal takes two text lines: ``┌──┐`` above, ``┘  └`` below):

- ``trigger``: drawn with its real polarity: a falling-edge trigger idles high and dips;
- marks under the trigger: ``▲`` starts a pulse, ``×`` ignored (the pulse still runs),
  ``↻`` restarts the running pulse;
- the output rows: the fitted part's (in a swap) and the new or checked part's, then a
  scope capture's measured output when the result carries one;
- the time axis: ticks and their times, from the first trigger;
- the band bar, on the same axis as the output's falling edge after the first trigger:
  ``├──┤`` the worst-case band, ``●`` nominal, ``[`` ``]`` the trimmer's two ends,
  ``T`` the target, ``!`` the next trigger (a pulse that ends beyond it skips triggers).

A pulse still running at the window's end is drawn running on, never falling there.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

from advisor.presentation import trigger_verdict
from advisor.timing.trigger import Schedule, schedule
from advisor.values import format_eng

LABEL_W = 10  # width of the row labels on the left
#: Most triggers a picture shows: more would squeeze each period below a few columns.
MAX_TRIGGERS = 24
_NICE = (1.0, 1.2, 1.5, 2.0, 2.5, 3.0, 4.0, 5.0, 6.0, 8.0, 10.0)


@dataclass(frozen=True)
class Axis:
    """The picture's time window: ``span`` s shown after ``lead`` s of quiet before the
    first trigger; ticks every ``step`` s from the first trigger."""

    lead: float
    span: float
    step: float

    @property
    def window(self) -> float:
        return self.lead + self.span


@dataclass(frozen=True)
class Row:
    """One text line of the picture; ``role`` lets the workbench colour it."""

    role: str  # trigger, marks, old, new, measured, axis, ticks, band, legend, caption
    label: str
    text: str


def _num(x: Any) -> float | None:
    return float(x) if isinstance(x, (int, float)) and not isinstance(x, bool) and math.isfinite(x) and x > 0 else None


def _get(d: Any, *keys: str) -> Any:
    for k in keys:
        if not isinstance(d, dict):
            return None
        d = d.get(k)
    return d


def nice_up(x: float) -> float:
    """The smallest of 1, 1.2, 1.5, 2, 2.5, 3, 4, 5, 6, 8 × 10^k at or above ``x``."""
    exp = math.floor(math.log10(x))
    for m in _NICE:
        if m * 10 ** exp >= x * (1 - 1e-9):
            return m * 10 ** exp
    return 10 ** (exp + 1)


def tick_step(span: float, most: int = 8) -> float:
    """A 1-2-5 step giving at most ``most`` intervals over ``span``."""
    exp = math.floor(math.log10(span / most))
    for m in (1, 2, 2.5, 5, 10):
        if span / (m * 10 ** exp) <= most + 1e-9:
            return m * 10 ** exp
    return 10 ** (exp + 1)


# --------------------------------------------------------------------------- what to draw


@dataclass(frozen=True)
class Facts:
    """What the picture reads from a result's JSON (a check, or the new side of a swap)."""

    kind: str  # "triggered" | "astable"
    width: float | None
    high: float | None
    low: float | None
    band: tuple[float, float] | None  # worst-case width (or period) band
    travel: tuple[float, float] | None  # width (or period) at the trimmer's two ends
    target: float | None
    trigger: dict | None
    edge: str
    old_width: float | None = None
    old_band_max: float | None = None
    old_trigger: dict | None = None


def facts_of(result: dict, *, edge: str | None = None) -> Facts | None:
    """The picture's facts from a check result, or a swap result (new side, old row)."""
    if not isinstance(result, dict):
        return None
    swap = isinstance(result.get("new"), dict) and isinstance(result.get("old"), dict)
    side = result["new"] if swap else result
    timing = side.get("timing") if isinstance(side.get("timing"), dict) else result.get("timing")
    nominal = _get(timing, "nominal") or {}
    trig = side.get("trigger") if isinstance(side.get("trigger"), dict) else result.get("trigger")
    trig = trig if isinstance(trig, dict) else None
    pol = _get(result, "pin_map", "polarity")
    wired = (_get(pol, "edge") if isinstance(pol, dict) else None) or _get(trig, "edge") or edge or "rising"
    adjust = result.get("adjust") if isinstance(result.get("adjust"), dict) else side.get("adjust")
    tgt = result.get("target")
    width = _num(nominal.get("width"))
    high, low = _num(nominal.get("high")), _num(nominal.get("low"))
    q = "width" if width is not None else "period"
    band = None
    lo, hi = _num(_get(timing, "min", q)), _num(_get(timing, "max", q))
    if lo and hi:
        band = (lo, hi)
    travel = None
    if isinstance(adjust, dict):
        a, b = _num(_get(adjust, "min", q)), _num(_get(adjust, "max", q))
        if a and b:
            travel = (min(a, b), max(a, b))
    target = _num(tgt.get("value")) if isinstance(tgt, dict) and tgt.get("quantity", q) == q else None
    old_w = old_max = None
    old_trig = None
    if swap:
        old = result["old"]
        old_w = _num(_get(old, "timing", "nominal", "width"))
        old_max = _num(_get(old, "timing", "max", "width"))
        old_trig = old.get("trigger") if isinstance(old.get("trigger"), dict) else None
    if width is not None:
        return Facts("triggered", width, None, None, band, travel, target, trig, wired, old_w, old_max, old_trig)
    if high is not None and low is not None:
        return Facts("astable", None, high, low, band, travel, target, None, "rising")
    return None


def axis_for(f: Facts) -> Axis:
    """The window: from what stays put while a value is tuned (trimmer travel, else the
    band; the target; the old part's band; the trigger period), never the current pulse
    alone, rounded up to a round number of seconds so the ticks fall on round times."""
    if f.kind == "astable":
        period = (f.high or 0) + (f.low or 0)
        longest = max(x for x in (f.travel[1] if f.travel else None, f.band[1] if f.band and not f.travel else None,
                                  f.target, period) if x)
        span = nice_up(2.2 * longest)
        return Axis(0.1 * span, span, tick_step(span))
    longest = max(x for x in (
        f.travel[1] if f.travel else None,
        f.band[1] if f.band and not f.travel else None,
        f.width if not f.band and not f.travel else None,
        f.target, f.old_band_max or f.old_width) if x)
    period = _num(_get(f.trigger, "period"))
    if period:
        # Two whole output periods at the longest pulse (every n-th trigger fires).
        n = math.floor(longest / period * (1 + 1e-12)) + 1
        want = min(MAX_TRIGGERS * period, max(period * (2 * n + 0.5), 1.3 * longest))
        span = nice_up(want)
        return Axis(min(0.25 * period, 0.05 * span), span, tick_step(span))
    span = nice_up(1.5 * longest)
    return Axis(0.08 * span, span, tick_step(span))


def _pattern(trig: dict | None) -> tuple[int | None, bool]:
    n = _get(trig, "divide_by")
    return (int(n) if isinstance(n, int) and not isinstance(n, bool) and n >= 1 else None,
            bool(_get(trig, "stays_high")))


def schedules(f: Facts, ax: Axis) -> tuple[Schedule, Schedule | None]:
    """The new (or checked) part's schedule and, in a swap, the fitted part's."""
    if f.kind == "astable":
        from advisor.timing.trigger import astable_schedule

        return astable_schedule(f.high or 0.0, f.low or 0.0, window=ax.window, first=ax.lead), None
    period = _num(_get(f.trigger, "period"))
    n, stays = _pattern(f.trigger)
    new = schedule(f.width, period, divide_by=n, stays_high=stays, window=ax.window, edge=f.edge, first=ax.lead)
    old = None
    if f.old_width:
        on, ostays = _pattern(f.old_trigger)
        if period and f.old_trigger is None:
            on, ostays = None, False
        old = schedule(f.old_width, period, divide_by=on, stays_high=ostays, window=ax.window, edge=f.edge,
                       first=ax.lead)
    return new, old


# --------------------------------------------------------------------------- the grid


def column(t: float, ax: Axis, cols: int) -> int:
    """Column of an edge at time ``t`` (s from the window's start): the first column
    whose centre is at or after it."""
    return max(0, min(cols, math.ceil(t / ax.window * cols - 0.5)))


def levels(intervals, ax: Axis, cols: int, *, open_end: bool = False, min_one: bool = False) -> list[bool]:
    """High or low per column. ``min_one`` keeps a pulse narrower than a column visible."""
    lv = [False] * cols
    for k, (a, b) in enumerate(intervals):
        i0 = column(a, ax, cols)
        i1 = cols if (open_end and k == len(intervals) - 1) or b >= ax.window else column(b, ax, cols)
        if min_one and i1 <= i0:
            i1 = min(cols, i0 + 1)
        for i in range(i0, min(i1, cols)):
            lv[i] = True
    return lv


def two_lines(lv: list[bool], idle_high: bool = False) -> tuple[str, str]:
    """A level per column as two lines of box-drawing characters (edges visible in any font)."""
    top, bottom = [], []
    prev = lv[0] if lv else idle_high
    for i, v in enumerate(lv):
        if i and v and not prev:
            top.append("┌"); bottom.append("┘")
        elif i and prev and not v:
            top.append("┐"); bottom.append("└")
        elif v:
            top.append("─"); bottom.append(" ")
        else:
            top.append(" "); bottom.append("─")
        prev = v
    return "".join(top), "".join(bottom)


def _trigger_levels(s: Schedule, ax: Axis, cols: int, pulses=None) -> list[bool]:
    """The trigger line as wired: a short pulse at its active level at each trigger."""
    if pulses is not None:  # a capture's runs at the active level
        active = levels(pulses, ax, cols, min_one=True)
    else:
        active = [False] * cols
        for t in s.triggers:
            i = column(t, ax, cols)
            if i < cols:
                active[i] = True
    return [not v for v in active] if s.edge == "falling" else active


def _place(row: list[str], col: int, text: str) -> bool:
    """Write ``text`` into ``row`` at ``col`` when it fits over blanks."""
    if col < 0 or col + len(text) > len(row) or any(c != " " for c in row[col:col + len(text)]):
        return False
    row[col:col + len(text)] = list(text)
    return True


def _axis_rows(ax: Axis, cols: int) -> tuple[str, str]:
    ticks = ["─"] * cols
    labels = [" "] * cols
    k = 0
    while True:
        t = ax.lead + k * ax.step
        i = column(t, ax, cols)
        if i >= cols:
            break
        ticks[i] = "┼" if 0 < i < cols - 1 else ("├" if i == 0 else "┤")
        text = "0" if k == 0 else format_eng(k * ax.step, "s", 3).replace(" ", "\u00a0")
        _place(labels, max(0, i - (0 if k == 0 else len(text) // 2)), text + " ")
        k += 1
    return "".join(ticks), "".join(labels).replace("\u00a0", " ").rstrip()


def _band_row(f: Facts, ax: Axis, cols: int) -> tuple[str, str] | None:
    """The band bar on the output's time scale (where its falling edge can land), and
    its legend in words."""
    if f.kind != "triggered" or not (f.band or f.travel or f.target):
        return None
    row = [" "] * cols

    def at(t: float) -> int:
        return min(cols - 1, column(ax.lead + t, ax, cols))

    words = []
    if f.band:
        a, b = at(f.band[0]), at(f.band[1])
        for i in range(a, b + 1):
            row[i] = "─"
        row[a], row[b] = "├", "┤"
        words.append(f"├┤ band {format_eng(f.band[0], 's', 3)} … {format_eng(f.band[1], 's', 3)}")
    if f.travel:
        row[at(f.travel[0])] = "["
        row[at(f.travel[1])] = "]"
        words.append(f"[ ] trimmer {format_eng(f.travel[0], 's', 3)} … {format_eng(f.travel[1], 's', 3)}")
    if f.width:
        row[at(f.width)] = "●"
        words.insert(0, f"● nominal {format_eng(f.width, 's', 3)}")
    if f.target:
        row[at(f.target)] = "T"
        words.append(f"T target {format_eng(f.target, 's', 3)}")
    period = _num(_get(f.trigger, "period"))
    reach = max(x for x in (f.band[1] if f.band else None, f.travel[1] if f.travel else None, f.width) if x)
    if period and reach >= period and ax.lead + period < ax.window:
        row[at(period)] = "!"
        words.append(f"! next trigger at {format_eng(period, 's', 3)}: a pulse ending beyond it skips triggers")
    return "".join(row).rstrip(), words


def picture_rows(result: dict, columns: int = 80, *, edge: str | None = None, names: tuple[str, str] | None = None,
                 measured=None) -> list[Row]:
    """The picture of a check or swap result as labelled rows, ``columns`` characters wide
    (labels included). ``measured`` adds a scope capture's output: (intervals, name).
    Empty when the result has no timing to draw."""
    f = facts_of(result, edge=edge)
    if f is None:
        return []
    cols = max(24, columns - LABEL_W)
    ax = axis_for(f)
    new, old = schedules(f, ax)
    rows: list[Row] = []
    if f.kind == "triggered":
        top, bot = two_lines(_trigger_levels(new, ax, cols), idle_high=new.edge == "falling")
        lab = "trigger ↓" if new.edge == "falling" else "trigger ↑"
        rows += [Row("trigger", lab, top), Row("trigger", "", bot)]
        marks = [" "] * cols
        for t, fired, again in zip(new.triggers, new.fired, new.restarts):
            i = column(t, ax, cols)
            if i < cols:
                marks[i] = "↻" if again else ("▲" if fired else "×")
        rows.append(Row("marks", "", "".join(marks).rstrip()))
    oname, nname = names or (("was", "now") if old is not None else ("", "output"))
    for role, sch, name in (("old", old, oname), ("new", new, nname)):
        if sch is None:
            continue
        top, bot = two_lines(levels(sch.outputs, ax, cols, open_end=sch.open_end))
        rows += [Row(role, name, top), Row(role, "", bot)]
    if measured is not None:
        intervals, mname = measured
        top, bot = two_lines(levels(intervals, ax, cols))
        rows += [Row("measured", mname, top), Row("measured", "", bot)]
    ticks, labels = _axis_rows(ax, cols)
    rows += [Row("axis", "time", ticks), Row("ticks", "", labels)]
    band = _band_row(f, ax, cols)
    if band is not None:
        rows.append(Row("band", "band", band[0]))
    legend = []
    if f.kind == "triggered" and new.triggers:
        signs = ["▲ starts a pulse"]
        if not all(new.fired):
            signs.append("× ignored: the pulse still runs")
        if any(new.restarts):
            signs.append("↻ restarts the running pulse")
        legend.append(signs)
    if band is not None:
        legend.append(band[1])
    for items in legend:
        rows += [Row("legend", "", line) for line in fit(items, cols)]
    rows += [Row("caption", "", line) for line in fit([_caption(f, new)], cols)]
    return rows


def fit(items: list[str], cols: int, gap: str = "   ") -> list[str]:
    """Items on lines of at most ``cols`` characters; an item is split only between
    words, and never between a number and its unit."""
    import re
    import textwrap

    lines: list[str] = []
    cur = ""
    for item in items:
        glued = re.sub(r"(\d) (?=\S)", "\\1\u00a0", item)  # "70 µs" stays whole
        for piece in textwrap.wrap(glued, cols, break_on_hyphens=False, break_long_words=False) or [""]:
            if cur and len(cur) + len(gap) + len(piece) <= cols:
                cur += gap + piece
            else:
                if cur:
                    lines.append(cur)
                cur = piece
    if cur:
        lines.append(cur)
    return [line.replace("\u00a0", " ") for line in lines]


def _caption(f: Facts, s: Schedule) -> str:
    if f.kind == "astable":
        return f"free-running: high {format_eng(f.high or 0, 's', 3)}, low {format_eng(f.low or 0, 's', 3)}"
    edge = "falling" if s.edge == "falling" else "rising"
    if not f.trigger:
        return f"one {edge}-edge trigger: pulse {format_eng(f.width or 0, 's', 3)}"
    return f"{edge}-edge trigger every {format_eng(s.period or 0, 's', 3)}: {trigger_verdict(f.trigger, short=True)}"


def render_lines(rows: list[Row]) -> list[str]:
    """Rows as plain text lines (label column, then the drawing)."""
    out = []
    for r in rows:
        if r.role in ("legend", "caption"):
            out.append(" " * LABEL_W + r.text)
        else:
            out.append(f"{r.label:<{LABEL_W}}{r.text}".rstrip())
    return out


def render_text(result: dict, columns: int = 80, *, indent: int = 0, **kw) -> str:
    """The picture as text ending in a newline, or "" when there is nothing to draw;
    ``indent`` spaces before each line (counted in ``columns``)."""
    rows = picture_rows(result, columns - indent, **kw)
    pad = " " * indent
    return "".join(pad + line + "\n" for line in render_lines(rows))


def family_edge(family: Any) -> str | None:
    """The active edge of a family's first trigger input (a level input: the edge entering it)."""
    triggers = getattr(getattr(family, "behaviour", None), "triggers", None)
    if not triggers:
        return None
    edge = triggers[0].edge
    return {"level-low": "falling", "level-high": "rising"}.get(edge, edge)


def terminal_columns() -> int:
    """Width for a picture in this terminal (80 when it cannot tell), at most 110."""
    import shutil

    return max(40, min(110, shutil.get_terminal_size((80, 24)).columns))


def under_numbers(text: str, picture: str, before: str) -> str:
    """``text`` with ``picture`` inserted before the first line starting with ``before``
    (the findings or the rework list), or appended when there is no such line."""
    if not picture:
        return text
    lines = text.splitlines(keepends=True)
    for i, line in enumerate(lines):
        if i and line.startswith(before):
            return "".join(lines[:i]) + picture + "".join(lines[i:])
    return text + picture
