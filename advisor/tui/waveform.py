"""The timing picture: trigger and output drawn in the terminal from a computed result.

The engine decides what happens (pulse width, ``trigger.divide_by``,
``trigger.stays_high``); this module only lays the edges out on a character grid.
A one-shot fires on trigger 0, n, 2n, … when the result says it divides by n;
when it says the output stays high, the output rises at the first trigger and
never falls inside the picture. An astable is drawn from its high and low times.

Each signal takes two text rows: ``┌──┐`` on top and ``┘  └`` below mark the
edges, so the picture reads in any terminal font without colour.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from rich.text import Text
from textual.reactive import reactive
from textual.widget import Widget

from advisor.tui.palette import STYLE
from advisor.values import format_eng

LABEL_W = 9  # width of the row labels on the left


@dataclass(frozen=True)
class Layout:
    """What to draw: time span, intervals where each signal is high, trigger marks."""

    span: float  # s shown across the picture
    trigger_high: list[tuple[float, float]]
    output_high: list[tuple[float, float]]
    marks: list[tuple[float, str]]  # (time, "fire" | "skip" | "restart")
    caption: str
    has_trigger: bool
    measured_high: list[tuple[float, float]] | None = None  # the scope capture's output, when given
    trigger_active_low: bool = False  # trigger_high holds low pulses (a captured falling-edge trigger)


def _num(d: dict | None, *keys: str) -> float | None:
    cur: object = d
    for k in keys:
        if not isinstance(cur, dict):
            return None
        cur = cur.get(k)
    if isinstance(cur, (int, float)) and not isinstance(cur, bool) and cur > 0:
        return float(cur)
    return None


def lay_out(result: dict | None, max_triggers: int = 12) -> Layout | None:
    """Edges to draw for a result's ``timing``/``trigger`` JSON, or None when it has none.

    With a scope capture in the result (``capture``) the picture spans the capture's
    window and adds the measured output (see :func:`_with_capture`).
    """
    if not isinstance(result, dict):
        return None
    nominal = (result.get("timing") or {}).get("nominal") if isinstance(result.get("timing"), dict) else None
    width = _num(nominal, "width")
    high, low = _num(nominal, "high"), _num(nominal, "low")
    from advisor.report.capture import usable

    if usable(result.get("capture")):
        return _with_capture(result, result["capture"], width, high, low)
    if width is None and high is not None and low is not None:
        period = high + low
        n = 4
        lead = 0.5 * low  # start low so the first rising edge shows
        span = lead + n * period
        out = [(lead + k * period, lead + k * period + high) for k in range(n)]
        duty = high / period
        return Layout(span, [], out, [], f"free-running: high {format_eng(high, 's')}, low {format_eng(low, 's')}, duty {duty:.0%}", False)
    if width is None:
        return None
    trig = result.get("trigger") if isinstance(result.get("trigger"), dict) else None
    t_period = _num(trig, "period")
    if t_period is None:
        # One trigger, the pulse, and some quiet time after it.
        start = 0.15 * 2.5 * width
        span = 2.5 * width
        return Layout(span, [(start, start + 1e-6 * span)], [(start, start + width)],
                      [(start, "fire")], f"one trigger: pulse {format_eng(width, 's')}", True)
    stays = bool(trig.get("stays_high")) if trig else False
    divide = trig.get("divide_by") if trig else None
    divide = int(divide) if isinstance(divide, (int, float)) and not isinstance(divide, bool) and divide >= 1 else 1
    n = max(4, min(max_triggers, 2 * divide + 2))
    lead = 0.3 * t_period
    span = lead + n * t_period
    blip = 1e-6 * span  # drawn one column wide whatever its real width
    trig_high = [(lead + k * t_period, lead + k * t_period + blip) for k in range(n)]
    marks: list[tuple[float, str]] = []
    out: list[tuple[float, float]] = []
    if stays:
        out = [(lead, span * 1.01)]
        marks = [(lead + k * t_period, "fire" if k == 0 else "restart") for k in range(n)]
        caption = f"output stays high: each trigger restarts the {format_eng(width, 's')} pulse before it ends"
    else:
        for k in range(n):
            t0 = lead + k * t_period
            if k % divide == 0:
                out.append((t0, t0 + width))
                marks.append((t0, "fire"))
            else:
                marks.append((t0, "skip"))
        if divide == 1:
            caption = f"every trigger fires: pulse {format_eng(width, 's')} in a {format_eng(t_period, 's')} period"
        else:
            caption = f"1 trigger in {divide} fires: the {format_eng(width, 's')} pulse outlasts the {format_eng(t_period, 's')} period"
            if 2 * divide + 2 > max_triggers:
                caption += f" (the next pulse starts off the picture, at trigger {divide})"
    return Layout(span, trig_high, out, marks, caption, True)


def _with_capture(result: dict, cap: dict, width: float | None, high: float | None, low: float | None) -> Layout | None:
    """The capture's window: captured trigger, the prediction laid on the captured trigger
    edges (every n-th when the result divides by n; the first only without a trigger
    analysis), and the measured output. Times in the capture are from its first trigger
    edge (or its output's first rising edge); the picture starts a little before it."""
    from advisor.report.capture import level_intervals

    window = float(cap["window"])
    period = _num(cap, "period")
    lead = 0.3 * period if period and period < window else 0.05 * window
    span = lead + window

    def shifted(side: dict, high: bool = True) -> list[tuple[float, float]]:
        """Runs at the level, moved right by the lead; one already running at the start
        of the window is drawn from the picture's left edge."""
        runs = level_intervals(side, window, high)
        already = bool(side.get("starts_high")) == high
        return [(0.0 if k == 0 and already else a + lead, b + lead) for k, (a, b) in enumerate(runs)]

    measured = shifted(cap["output"])
    name = str(cap.get("name") or "capture")
    if width is None and high is not None and low is not None:
        p = high + low
        out = [(lead + k * p, lead + k * p + high) for k in range(int(window / p) + 1)]
        mh = _num(cap, "width")
        caption = (f"predicted high {format_eng(high, 's')}, low {format_eng(low, 's')}; measured ({name}) high "
                   + (format_eng(mh, "s") if mh else "—") + (f", period {format_eng(period, 's')}" if period else ""))
        return Layout(span, [], out, [], caption, False, measured)
    if width is None:
        return None
    ctrig = cap.get("trigger")
    mw = _num(cap, "width")
    said = f"measured ({name}) {format_eng(mw, 's') if mw else '—'}"
    if not isinstance(ctrig, dict):
        return Layout(span, [(lead, lead + 1e-6 * span)], [(lead, lead + width)], [(lead, "fire")],
                      f"pulse {format_eng(width, 's')} predicted, {said}; no trigger channel captured", True, measured)
    edge = "falling" if ctrig.get("edge") == "falling" else "rising"
    times = [lead + float(t) for t in ctrig.get(edge) or [] if isinstance(t, (int, float)) and t < window]
    if not times:
        return None
    from advisor.report.capture import prediction_pattern

    pattern, why = prediction_pattern(result.get("trigger"), cap)
    known = pattern is not None
    stays, divide = pattern if pattern is not None else (False, 1)
    divide = divide or 1
    marks: list[tuple[float, str]] = []
    out: list[tuple[float, float]] = []
    if stays:
        out = [(times[0], span * 1.01)]
        marks = [(t, "fire" if k == 0 else "restart") for k, t in enumerate(times)]
    elif not known:
        out = [(times[0], times[0] + width)]
        marks = [(times[0], "fire")]
    else:
        for k, t in enumerate(times):
            marks.append((t, "fire" if k % divide == 0 else "skip"))
            if k % divide == 0:
                out.append((t, t + width))
    caption = f"pulse {format_eng(width, 's')} predicted, {said}"
    if not known:
        caption += f"; first predicted pulse only: {why}"
    elif stays:
        caption += "; predicted: each trigger restarts the pulse"
    elif divide > 1:
        caption += f"; predicted: 1 trigger in {divide} fires"
    return Layout(span, shifted(ctrig, edge == "rising"), out, marks, caption, True, measured, edge == "falling")


def _col(t: float, dt: float, cols: int) -> int:
    """Column whose centre is the first at or after time ``t``."""
    return max(0, min(cols - 1, math.ceil(t / dt - 0.5)))


def _levels(intervals: list[tuple[float, float]], span: float, cols: int) -> list[bool]:
    """High/low per column, sampled at column centres; a pulse narrower than a
    column still shows as one column so a short trigger never vanishes."""
    dt = span / cols
    lv = [False] * cols
    for a, b in intervals:
        if b <= 0 or a >= span:
            continue
        i0 = _col(a, dt, cols)
        i1 = cols - 1 if b >= span else max(i0, min(cols - 1, math.ceil(b / dt - 0.5) - 1))
        for i in range(i0, i1 + 1):
            lv[i] = True
    return lv


def _rows(levels: list[bool]) -> tuple[str, str]:
    """The capture row drawn with the one text-picture stroke (advisor.picture)."""
    from advisor.picture import two_lines

    return two_lines(levels)


#: Colour of each row of :func:`advisor.picture.picture_rows`.
_ROLE_STYLE = {"trigger": "trigger", "old": "dim", "new": "output", "measured": "measured", "axis": "dim",
               "ticks": "dim", "band": "key", "legend": "dim", "caption": "key"}
_MARK_STYLE = {"▲": "good", "×": "skip", "↻": "warning"}


def draw(result: dict | None, width: int = 80, edge: str | None = None) -> Text:
    """The picture as Rich text, ``width`` characters wide (labels included).

    Drawn by the one text renderer (:mod:`advisor.picture`) from the engine's pulse
    schedule; a result with a scope capture is laid over the capture's own window
    (:func:`lay_out`), with the measured output beside the prediction.
    """
    from advisor.report.capture import usable

    if isinstance(result, dict) and not usable(result.get("capture")):
        from advisor.picture import LABEL_W as PIC_LABEL, picture_rows

        rows = picture_rows(result, width, edge=edge)
        if not rows:
            return Text("No timing to draw yet: fill in the part, R and C.", style=STYLE["dim"])
        text = Text()
        for i, row in enumerate(rows):
            if i:
                text.append("\n")
            text.append(f"{row.label:<{PIC_LABEL}}", style=STYLE["dim"])
            if row.role == "marks":
                for ch in row.text:
                    text.append(ch, style=STYLE[_MARK_STYLE[ch]] if ch in _MARK_STYLE else None)
            else:
                text.append(row.text, style=STYLE[_ROLE_STYLE.get(row.role, "key")])
        return text
    lay = lay_out(result)
    if lay is None:
        return Text("No timing to draw yet: fill in the part, R and C.", style=STYLE["dim"])
    cols = max(20, width - LABEL_W - 1)
    text = Text()
    if lay.has_trigger:
        levels = _levels(lay.trigger_high, lay.span, cols)
        if lay.trigger_active_low:  # low pulses on a high line, each at least one column
            levels = [not v for v in levels]
        top, bot = _rows(levels)
        text.append(f"{'trigger':<{LABEL_W}}", style=STYLE["dim"]); text.append(top + "\n", style=STYLE["trigger"])
        text.append(" " * LABEL_W); text.append(bot + "\n", style=STYLE["trigger"])
        row = [" "] * cols
        styles = [""] * cols
        for t, kind in lay.marks:
            i = _col(t, lay.span / cols, cols)
            row[i] = {"fire": "▲", "skip": "×", "restart": "↻"}[kind]
            styles[i] = {"fire": STYLE["good"], "skip": STYLE["skip"], "restart": STYLE["warning"]}[kind]
        text.append(" " * LABEL_W)
        for ch, st in zip(row, styles):
            text.append(ch, style=st or None)
        text.append("\n")
    top, bot = _rows(_levels(lay.output_high, lay.span, cols))
    text.append(f"{'output':<{LABEL_W}}", style=STYLE["dim"]); text.append(top + "\n", style=STYLE["output"])
    text.append(" " * LABEL_W); text.append(bot + "\n", style=STYLE["output"])
    if lay.measured_high is not None:
        top, bot = _rows(_levels(lay.measured_high, lay.span, cols))
        text.append(f"{'measured':<{LABEL_W}}", style=STYLE["dim"]); text.append(top + "\n", style=STYLE["measured"])
        text.append(" " * LABEL_W); text.append(bot + "\n", style=STYLE["measured"])
    end = format_eng(lay.span, "s", 3)
    axis = "0" + " " * max(1, cols - 1 - len(end)) + end
    text.append(" " * LABEL_W); text.append(axis + "\n", style=STYLE["dim"])
    text.append(lay.caption, style=STYLE["key"])
    if lay.has_trigger and any(k != "fire" for _, k in lay.marks):
        text.append("\n▲ fires  × ignored (pulse still running)  ↻ restarts the pulse", style=STYLE["dim"])
    return text


class TimingPicture(Widget):
    """Draws :func:`draw` for the result it is given; redraws on resize."""

    DEFAULT_CSS = "TimingPicture { height: auto; }"
    result: reactive[dict | None] = reactive(None, layout=True)
    #: The trigger's active edge when the result does not say (the part's first input).
    edge: reactive[str | None] = reactive(None, layout=True)

    def render(self) -> Text:
        return draw(self.result, max(30, self.content_size.width or 80), self.edge)
