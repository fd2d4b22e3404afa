"""A trigger channel and an output channel: delay, width, and which triggers fired.

Each output pulse (start = the output's active edge) is credited to the last
trigger edge at or before its start; a trigger that no pulse is credited to did
not fire (a non-retriggerable one-shot whose pulse outlasts the trigger period
skips triggers). ``delay`` = pulse start - its trigger edge; ``width`` = pulse
start to the next end edge (s). ``divide_by`` is the median number of trigger
edges from one fired trigger to the next (1: every trigger fires; 2: every second);
``stays_active`` is true when the last pulse has not ended by the end of the
capture and has lasted more than two trigger periods (a retriggerable part kept
active, or a stuck output).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

import numpy as np

from advisor.errors import CaptureError
from advisor.measure.edges import Edges
from advisor.measure.stats import Stats, following


@dataclass(frozen=True)
class PairStats:
    trigger_channel: int
    output_channel: int
    trigger_edge: str
    output_active: str
    delay: Stats
    width: Stats
    triggers: int
    pulses: int
    divide_by: int | None
    stays_active: bool

    def to_json(self) -> dict:
        return {
            "trigger_channel": self.trigger_channel,
            "output_channel": self.output_channel,
            "trigger_edge": self.trigger_edge,
            "output_active": self.output_active,
            "delay": self.delay.to_json(),
            "width": self.width.to_json(),
            "triggers": self.triggers,
            "pulses": self.pulses,
            "divide_by": self.divide_by,
            "stays_active": self.stays_active,
        }


def active_edge(trigger: Edges, output: Edges, output_active: Literal["high", "low"] = "high",
                tolerance: float = 0.0) -> str:
    """The trigger edge that leads the output's pulses: the one with the shorter median
    delay to the next pulse start. A one-shot fires within nanoseconds to microseconds
    of its active edge, while the other edge of a trigger pulse sits a pulse width away
    (or after the output has started), so the shorter delay names the active edge."""
    starts = output.rising if output_active == "high" else output.falling
    best, best_delay = "rising", np.inf
    for edge, times in (("rising", trigger.rising), ("falling", trigger.falling)):
        if times.size == 0 or starts.size == 0:
            continue
        who = np.searchsorted(times, starts + tolerance, side="right") - 1
        ok = who >= 0
        if not ok.any():
            continue
        delay = float(np.median(np.abs(starts[ok] - times[who[ok]])))
        if delay < best_delay:
            best, best_delay = edge, delay
    return best


def pair_stats(
    trigger: Edges, output: Edges, *, trigger_channel: int, output_channel: int, t_end: float,
    trigger_edge: Literal["rising", "falling", "auto"] = "auto", output_active: Literal["high", "low"] = "high",
    tolerance: float = 0.0,
) -> PairStats:
    """Trigger-to-output timing. ``tolerance`` (s, one sample interval) credits an output
    start that interpolation placed just before its trigger edge to that trigger: with a
    propagation delay shorter than a sample, the two edges share one sample interval."""
    if trigger_edge == "auto":
        trigger_edge = active_edge(trigger, output, output_active, tolerance)  # type: ignore[assignment]
    trig = trigger.rising if trigger_edge == "rising" else trigger.falling
    if trig.size == 0:
        raise CaptureError(f"trigger channel {trigger_channel} has no {trigger_edge} edge", hint="check --trigger-edge")
    starts = output.rising if output_active == "high" else output.falling
    ends = output.falling if output_active == "high" else output.rising
    who = np.searchsorted(trig, starts + tolerance, side="right") - 1
    credited = who >= 0
    starts, who = starts[credited], who[credited]
    # One pulse per trigger: a second start credited to the same trigger is not a new firing.
    if who.size:
        keep = np.concatenate(([True], who[1:] != who[:-1]))
        starts, who = starts[keep], who[keep]
    delay = starts - trig[who]
    si, ei = following(starts, ends)
    width = ends[ei] - starts[si]
    divide_by = int(round(float(np.median(np.diff(who))))) if who.size >= 2 else None
    stays = False
    if starts.size and (ends.size == 0 or ends[-1] < starts[-1]):
        period = float(np.median(np.diff(trig))) if trig.size >= 2 else 0.0
        longest = float(width.max()) if width.size else 0.0
        stays = (t_end - starts[-1]) > max(2.0 * period, 2.0 * longest)
    return PairStats(trigger_channel, output_channel, trigger_edge, output_active, Stats.of(delay), Stats.of(width),
                     int(trig.size), int(starts.size), divide_by, stays)
