"""Trigger-rate analysis: does every trigger fire a pulse?

For a trigger of period T and a pulse of width W:

- a non-retriggerable part (74121, 74x221, 555 monostable) ignores triggers while
  its pulse runs and until it has recovered (time r after the pulse, where the
  catalog publishes one); the first trigger after W + r fires the next pulse, so
  only every n-th trigger fires, n = floor((W + r)/T) + 1 (n = 1: every trigger);
- a retriggerable part (74x123, 4538, 4528) restarts its pulse on each trigger;
  when T < W the output never falls (``stays_high``).

Sources: the behaviour sections of the families' datasheets (e.g. Philips
74HC/HCT221: not retriggerable; NXP 74HC123: retriggerable); the arithmetic is
exact for ideal edges. The published minimum retrigger spacing and recovery time
come from the catalog when present.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from advisor.parts import Family
from advisor.values import format_eng


@dataclass(frozen=True)
class TriggerResult:
    period: float
    divide_by: int | None
    stays_high: bool
    retriggerable: bool | None
    width: float | None
    output_period: float | None
    duty: float | None
    divide_by_range: tuple[int, int] | None = None
    note: str | None = None
    #: The trigger's active edge as wired (the circuit's, else the part's first trigger input's).
    edge: str | None = None
    edge_assumed: bool = False

    def to_json(self) -> dict:
        out = {
            "period": self.period, "divide_by": self.divide_by, "stays_high": self.stays_high,
            "retriggerable": self.retriggerable, "width": self.width,
            "output_period": self.output_period, "duty": self.duty,
        }
        if self.divide_by_range is not None:
            out["divide_by_range"] = list(self.divide_by_range)
        if self.note:
            out["note"] = self.note
        if self.edge is not None:
            out["edge"] = self.edge
            out["edge_assumed"] = self.edge_assumed
        return out


def ordinal(n: int) -> str:
    from advisor.presentation import ordinal as words

    return words(n)


def divide_ratio(width: float, period: float, recovery: float = 0.0) -> int:
    """n = floor((W + r)/T) + 1: the trigger that finds the part ready again (n >= 1)."""
    return math.floor((width + recovery) / period * (1 + 1e-12)) + 1


def analyse_trigger(
    family: Family, mode: str, period: float, width: float | None,
    width_min: float | None = None, width_max: float | None = None, edge: str | None = None,
) -> TriggerResult:
    """Facts for a trigger of ``period`` (s) on a pulse of ``width`` (s, calibrated).

    Facts only (``divide_by`` and its range over the tolerance band, ``stays_high``):
    the rules in ``rules/behaviour.yaml`` judge them. ``edge`` is the active edge as
    wired; without it the part's first trigger input's edge is assumed (a level input
    counts as the edge that enters its level).
    """
    res = _facts(family, mode, period, width, width_min, width_max)
    assumed = edge is None
    if edge is None and family.behaviour.triggers:
        first = family.behaviour.triggers[0].edge
        edge = {"level-low": "falling", "level-high": "rising"}.get(first, first)
    if edge is not None:
        from dataclasses import replace

        res = replace(res, edge=edge, edge_assumed=assumed)
    return res


def _facts(
    family: Family, mode: str, period: float, width: float | None,
    width_min: float | None, width_max: float | None,
) -> TriggerResult:
    if mode == "astable" or width is None:
        return TriggerResult(period, None, False, None, None, None, None,
                             note="free-running astable: a trigger signal does not set its timing")
    beh = family.behaviour
    retrig = beh.retrigger in ("yes", "selectable")
    note = None
    if beh.retrigger == "selectable":
        note = "retriggering is selectable by wiring; judged as wired retriggerable"
    recovery = beh.recovery.value if beh.recovery is not None else 0.0
    if retrig:
        if period < width:
            return TriggerResult(period, None, True, True, width, None, 1.0, note=note)
        return TriggerResult(period, 1, False, True, width, period, width / period, note=note)
    n = divide_ratio(width, period, recovery)
    rng = None
    if width_min is not None and width_max is not None:
        lo, hi = divide_ratio(width_min, period, recovery), divide_ratio(width_max, period, recovery)
        if lo != hi:
            rng = (lo, hi)
    if recovery and n == 1 and width < period < width + recovery:
        note = f"the part needs {format_eng(recovery, 's')} after a pulse before the next trigger"
    return TriggerResult(period, n, False, False, width, n * period, width / (n * period), rng, note)


# --------------------------------------------------------------------------- schedule


@dataclass(frozen=True)
class Schedule:
    """Trigger edges and output pulses over a window ``[0, window)`` (times in s).

    ``triggers`` are the active edges inside the window; ``fired`` says, per trigger,
    whether it starts (or restarts) a pulse; ``outputs`` are the output's high
    intervals, clipped to the window. ``open_end`` says the last pulse is still running
    at the window's end: no falling edge belongs there, and every face must draw the
    output running on. ``edge`` is the trigger's active edge as wired.
    """

    window: float
    period: float | None
    edge: str  # "rising" | "falling"
    width: float | None
    triggers: tuple[float, ...]
    fired: tuple[bool, ...]
    restarts: tuple[bool, ...]  # a trigger that arrives while the pulse runs and restarts it
    outputs: tuple[tuple[float, float], ...]
    open_end: bool
    divide_by: int | None
    stays_high: bool

    def edges(self) -> list[tuple[float, str]]:
        """Output edges strictly inside the window, as (time, "rise" | "fall")."""
        out = []
        for k, (a, b) in enumerate(self.outputs):
            if 0 < a < self.window:
                out.append((a, "rise"))
            if b < self.window and not (self.open_end and k == len(self.outputs) - 1):
                out.append((b, "fall"))
        return out


def schedule(
    width: float | None,
    period: float | None,
    *,
    divide_by: int | None = None,
    stays_high: bool = False,
    window: float,
    edge: str = "rising",
    first: float = 0.0,
    trigger_times: tuple[float, ...] | None = None,
) -> Schedule:
    """Lay out what the trigger verdict says over ``window`` seconds.

    Triggers come every ``period`` s from ``first`` (or at ``trigger_times``, e.g. a
    capture's edges; one trigger at ``first`` without a period). The verdict is the
    engine's (:func:`analyse_trigger`): with ``stays_high`` every trigger restarts a
    pulse that never ends; otherwise triggers 0, n, 2n, … fire (n = ``divide_by``,
    1 when absent) and each starts a pulse of ``width``. A pulse still running at the
    window's end is cut there with ``open_end`` set: the picture shows no edge at the
    window's end. Exact for ideal edges, like the verdict itself.
    """
    if trigger_times is None:
        if period and period > 0:
            count = max(1, math.ceil((window - first) / period - 1e-9))
            trigger_times = tuple(first + k * period for k in range(count))
        else:
            trigger_times = (first,)
    times = tuple(t for t in trigger_times if 0 <= t < window)
    n = divide_by if isinstance(divide_by, int) and divide_by >= 1 else 1
    outputs: list[tuple[float, float]] = []
    open_end = False
    if not width or width <= 0:
        return Schedule(window, period, edge, width, times, tuple(False for _ in times),
                        tuple(False for _ in times), (), False, divide_by, stays_high)
    if stays_high:
        fired = tuple(True for _ in times)
        restarts = tuple(k > 0 for k in range(len(times)))
        if times:
            end = times[-1] + width
            open_end = end >= window
            outputs.append((times[0], min(end, window)))
    else:
        fired = tuple(k % n == 0 for k in range(len(times)))
        restarts = tuple(False for _ in times)
        for t, f in zip(times, fired):
            if f:
                end = t + width
                if end >= window:
                    open_end = True
                outputs.append((t, min(end, window)))
    return Schedule(window, period, edge, width, times, fired, restarts, tuple(outputs), open_end,
                    divide_by, stays_high)


def astable_schedule(high: float, low: float, *, window: float, first: float = 0.0) -> Schedule:
    """A free-running output over ``window`` s: high for ``high`` s from ``first``, then
    low for ``low`` s, repeating (no trigger). A high time still running at the window's
    end is cut there with ``open_end`` set."""
    period = high + low
    outputs = []
    open_end = False
    t = first
    while period > 0 and t < window:
        end = t + high
        if end >= window:
            open_end = True
        outputs.append((t, min(end, window)))
        t += period
    return Schedule(window, period, "rising", high, (), (), (), tuple(outputs), open_end, None, False)
