"""The timing diagram of the HTML report as hand-built SVG, from the engine's pulse schedule.

Same facts and axis as the text picture (:mod:`advisor.picture`): the trigger drawn with
its real polarity (a falling-edge trigger idles high and dips), the fitted part's and
the new part's output, a time axis with numbered ticks from the first trigger, and the
band bar (worst-case band, nominal, trimmer ends, target, the next trigger). Every edge
of the schedule inside the window is drawn; a pulse still running at the window's end
runs on to the frame without a falling edge there. Fired and ignored triggers are
marked and named in a legend.

Each signal is one ``<path class="sig ...">`` of ``M``/``H``/``V`` steps, so a reader's
tools (and the tests) can read the edges back from the drawing.
"""

from __future__ import annotations

from html import escape

from advisor.picture import Axis, Facts, axis_for, facts_of, schedules
from advisor.values import format_eng

INK = "#1f2a33"
NAME = "#2b4c6f"
ACCENT = "#b5562a"
OLD = "#5b6670"
SKIP = "#8a8f94"
GRID = "#dde3e8"
FONT = "DejaVu Sans, Helvetica, Arial, sans-serif"

LEFT = 150  # label column, px
PLOT = 580  # plot width, px
ROW = 34  # height of one signal row
AMP = 18  # height of a pulse


class _Canvas:
    def __init__(self, ax: Axis) -> None:
        self.ax = ax
        self.parts: list[str] = []

    def x(self, t: float) -> float:
        return round(LEFT + t / self.ax.window * PLOT, 2)

    def add(self, s: str) -> None:
        self.parts.append(s)

    def text(self, x: float, y: float, s: str, *, size: int = 11, color: str = INK, anchor: str = "start",
             cls: str = "") -> None:
        c = f' class="{cls}"' if cls else ""
        self.add(f'<text x="{x}" y="{y}" font-size="{size}" fill="{color}" text-anchor="{anchor}"{c}>{escape(s)}</text>')


def _signal(c: _Canvas, y: float, high_runs, *, open_end: bool, idle_high_between: bool = False,
            color: str, cls: str, name: str) -> None:
    """One signal: low at ``y``, high at ``y - AMP``; ``high_runs`` are (start, end) in s."""
    lo, hi = y, y - AMP
    runs = list(high_runs)
    level_high = bool(runs) and runs[0][0] <= 0
    d = [f"M {LEFT} {hi if level_high else lo}"]
    for k, (a, b) in enumerate(runs):
        if a > 0:
            d.append(f"H {c.x(a)} V {hi}")
        last_open = open_end and k == len(runs) - 1
        if not last_open and b < c.ax.window:
            d.append(f"H {c.x(b)} V {lo}")
    d.append(f"H {LEFT + PLOT}")
    c.add(f'<path class="sig {cls}" data-name="{escape(name)}" d="{" ".join(d)}" fill="none" stroke="{color}" '
          f'stroke-width="1.8"/>')
    c.text(LEFT - 8, y - AMP / 2 + 4, name, color=NAME, anchor="end")


def timing_svg_of(result: dict, *, edge: str | None = None, names: tuple[str, str] = ("", "")) -> str:
    """The diagram as SVG text, or "" when the result has no timing to draw."""
    f = facts_of(result, edge=edge)
    if f is None:
        return ""
    ax = axis_for(f)
    new, old = schedules(f, ax)
    c = _Canvas(ax)
    y = 16
    # Grid on the ticks.
    k = 0
    ticks = []
    while ax.lead + k * ax.step < ax.window * (1 - 1e-9):
        ticks.append(ax.lead + k * ax.step)
        k += 1
    rows_top = y
    if f.kind == "triggered":
        y += ROW
        width = max(ax.window / PLOT * 5, min(0.12 * (new.period or ax.window), ax.window / PLOT * 8))
        active = [(t, t + width) for t in new.triggers]
        falling = new.edge == "falling"
        if falling:  # idles high: the runs are the gaps between the dips
            runs, start = [], 0.0
            for a, b in active:
                if a > start:
                    runs.append((start if start > 0 else -1.0, a))
                start = b
            runs.append((start, ax.window))
            _signal(c, y, runs, open_end=True, color=INK, cls="trigger falling", name="trigger, falling edge")
        else:
            _signal(c, y, active, open_end=False, color=INK, cls="trigger rising", name="trigger, rising edge")
        for t, fired, again in zip(new.triggers, new.fired, new.restarts):
            mark, color = ("↻", NAME) if again else (("▲", ACCENT) if fired else ("×", SKIP))
            c.text(c.x(t), y - AMP - 4, mark, size=11, color=color, anchor="middle",
                   cls="mark " + ("restarts" if again else "fires" if fired else "ignored"))
    part_names = names
    for sch, name, color, cls in ((old, part_names[0] or "fitted part", OLD, "output old"),
                                  (new, part_names[1] or "output", ACCENT, "output new")):
        if sch is None:
            continue
        y += ROW
        _signal(c, y, sch.outputs, open_end=sch.open_end, color=color, cls=cls, name=name)
    rows_bottom = y
    # Axis with numbered ticks, times from the first trigger.
    y += 16
    c.add(f'<line x1="{LEFT}" y1="{y}" x2="{LEFT + PLOT}" y2="{y}" stroke="{INK}" stroke-width="1"/>')
    for i, t in enumerate(ticks):
        x = c.x(t)
        c.add(f'<line x1="{x}" y1="{rows_top}" x2="{x}" y2="{rows_bottom + 4}" stroke="{GRID}" stroke-width="1"/>')
        c.add(f'<line x1="{x}" y1="{y}" x2="{x}" y2="{y + 5}" stroke="{INK}" stroke-width="1"/>')
        c.text(x, y + 17, "0" if i == 0 else format_eng(i * ax.step, "s", 3), size=10, anchor="middle",
               cls="tick")
    c.text(LEFT - 8, y + 4, "time", color=NAME, anchor="end")
    y += 24
    y = _band(c, f, y + 14)
    legend = []
    if f.kind == "triggered":
        legend.append("▲ starts a pulse")
        if not all(new.fired):
            legend.append("× ignored: arrives while the pulse still runs")
        if any(new.restarts):
            legend.append("↻ restarts the running pulse")
    if new.open_end:
        legend.append("a pulse still running at the right-hand edge runs on past the picture")
    for line in legend:
        y += 15
        c.text(LEFT, y, line, size=10, color=NAME, cls="legend")
    height = y + 10
    title = "Timing diagram: trigger and output" + (", fitted and new part" if old is not None else "")
    body = "".join(c.parts)
    return (f'<svg xmlns="http://www.w3.org/2000/svg" role="img" aria-label="{escape(title)}" class="pic timing" '
            f'viewBox="0 0 {LEFT + PLOT + 20} {height}" width="{LEFT + PLOT + 20}" height="{height}" '
            f'font-family="{FONT}" data-window="{ax.window!r}" data-left="{LEFT}" data-right="{LEFT + PLOT}">'
            f"<title>{escape(title)}</title>{body}</svg>")


def _band(c: _Canvas, f: Facts, y: float) -> float:
    """The band bar on the output's scale (where its falling edge can land), with words."""
    if f.kind != "triggered" or not (f.band or f.travel or f.target):
        return y

    def x(t: float) -> float:
        return c.x(c.ax.lead + t)

    c.text(LEFT - 8, y + 4, "band", color=NAME, anchor="end")
    words = []
    if f.band:
        c.add(f'<rect class="band" x="{x(f.band[0])}" y="{y - 4}" width="{max(1.0, x(f.band[1]) - x(f.band[0]))}" '
              f'height="8" fill="#f1d9cc" stroke="{ACCENT}" stroke-width="1"/>')
        words.append(f"band {format_eng(f.band[0], 's', 3)} … {format_eng(f.band[1], 's', 3)}")
    if f.travel:
        for t in f.travel:
            c.add(f'<line class="trimmer-end" x1="{x(t)}" y1="{y - 9}" x2="{x(t)}" y2="{y + 9}" stroke="{NAME}" stroke-width="2"/>')
        words.append(f"trimmer ends {format_eng(f.travel[0], 's', 3)} and {format_eng(f.travel[1], 's', 3)} (blue bars)")
    if f.width:
        c.add(f'<circle class="nominal" cx="{x(f.width)}" cy="{y}" r="4" fill="{ACCENT}"/>')
        words.insert(0, f"nominal {format_eng(f.width, 's', 3)} (dot)")
    if f.target:
        c.text(x(f.target), y - 8, "T", size=10, color=INK, anchor="middle", cls="target")
        words.append(f"target {format_eng(f.target, 's', 3)} (T)")
    period = f.trigger.get("period") if isinstance(f.trigger, dict) else None
    reach = max(v for v in (f.band[1] if f.band else None, f.travel[1] if f.travel else None, f.width) if v)
    if isinstance(period, (int, float)) and reach >= period and c.ax.lead + period < c.ax.window:
        c.text(x(period), y + 4, "!", size=13, color="#9e2a1f", anchor="middle", cls="danger-end")
        words.append(f"! next trigger at {format_eng(period, 's', 3)}: a pulse ending beyond it skips triggers")
    y += 18
    c.text(LEFT, y, "; ".join(words[:2]), size=10, color=NAME, cls="legend")
    if len(words) > 2:
        y += 14
        c.text(LEFT, y, "; ".join(words[2:]), size=10, color=NAME, cls="legend")
    return y
