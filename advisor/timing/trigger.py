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
        return out


def ordinal(n: int) -> str:
    if n == 1:
        return "1st"
    suffix = "th" if 10 <= n % 100 <= 20 else {1: "st", 2: "nd", 3: "rd"}.get(n % 10, "th")
    return f"{n}{suffix}"


def divide_ratio(width: float, period: float, recovery: float = 0.0) -> int:
    """n = floor((W + r)/T) + 1: the trigger that finds the part ready again (n >= 1)."""
    return math.floor((width + recovery) / period * (1 + 1e-12)) + 1


def analyse_trigger(
    family: Family, mode: str, period: float, width: float | None,
    width_min: float | None = None, width_max: float | None = None,
) -> TriggerResult:
    """Facts for a trigger of ``period`` (s) on a pulse of ``width`` (s, calibrated).

    Facts only (``divide_by`` and its range over the tolerance band, ``stays_high``):
    the rules in ``rules/behaviour.yaml`` judge them.
    """
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
