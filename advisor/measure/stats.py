"""Per-channel timing from edges: high time, low time, period, frequency, duty.

Definitions (s, Hz, fraction 0..1): high time = rising edge to the next falling
edge; low time = falling edge to the next rising edge; period = rising edge to
the next rising edge (falling to falling when there are fewer than two rising
edges); frequency = 1 / period, one value per period; duty = high time / period
for each full cycle that starts with a rising edge. Only complete intervals count:
the part of a pulse cut by the start or end of the capture is left out.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from advisor.measure.edges import Edges


@dataclass(frozen=True)
class Stats:
    """Median, minimum, maximum and count of a set of measurements (None when empty)."""

    median: float | None
    min: float | None
    max: float | None
    count: int

    @classmethod
    def of(cls, values: np.ndarray) -> "Stats":
        values = np.asarray(values, dtype=float)
        if values.size == 0:
            return cls(None, None, None, 0)
        return cls(float(np.median(values)), float(values.min()), float(values.max()), int(values.size))

    def to_json(self) -> dict:
        return {"median": self.median, "min": self.min, "max": self.max, "count": self.count}


@dataclass(frozen=True)
class ChannelStats:
    index: int  # 1-based channel number
    name: str
    high: Stats
    low: Stats
    period: Stats
    frequency: Stats
    duty: Stats
    edges: Edges

    def to_json(self) -> dict:
        lv, th = self.edges.levels, self.edges.thresholds
        return {
            "index": self.index,
            "name": self.name,
            "high": self.high.to_json(),
            "low": self.low.to_json(),
            "period": self.period.to_json(),
            "frequency": self.frequency.to_json(),
            "duty": self.duty.to_json(),
            "levels": {"low": lv.low, "high": lv.high},
            "threshold": {"center": th.center, "upper": th.upper, "lower": th.lower},
            "edges": {"rising": int(self.edges.rising.size), "falling": int(self.edges.falling.size)},
        }


def following(starts: np.ndarray, ends: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """For each start, the index of the first end after it; returns (start_index, end_index) pairs."""
    nxt = np.searchsorted(ends, starts, side="right")
    ok = nxt < ends.size
    return np.flatnonzero(ok), nxt[ok]


def channel_stats(index: int, name: str, edges: Edges) -> ChannelStats:
    r, f = edges.rising, edges.falling
    si, ei = following(r, f)
    high = f[ei] - r[si]
    si2, ei2 = following(f, r)
    low = r[ei2] - f[si2]
    period = np.diff(r) if r.size >= 2 else np.diff(f)
    # Duty per full cycle r[k] -> r[k+1] whose high part ends inside it.
    if r.size >= 2:
        cyc = np.diff(r)
        k = si[si < r.size - 1]
        h = high[: k.size]
        duty = h / cyc[k]
    else:
        duty = np.empty(0)
    freq = 1.0 / period if period.size else np.empty(0)
    return ChannelStats(index, name, Stats.of(high), Stats.of(low), Stats.of(period), Stats.of(freq),
                        Stats.of(duty), edges)
