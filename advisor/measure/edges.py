"""Edges of a two-level signal, with hysteresis and sub-sample timing.

Levels: the robust low and high levels are the medians of the samples below and
above the midpoint of the 0.1st and 99.9th percentiles, so overshoot, ringing and
noise spikes move them little.

Thresholds: a centre threshold (absolute, or a fraction of the way from low to
high, 0.5 by default) and a hysteresis band around it (20 % of the swing by
default). A rising edge is counted only when the signal goes from below the band's
lower side to above its upper side (and the reverse for a falling edge), so noise
and ringing that do not span the band are not edges (common practice: the Schmitt
trigger principle, as in a scope's noise-reject trigger).

Timing: each edge is timed where the signal crosses the centre threshold,
interpolated linearly between the two samples around the crossing. When noise
makes it cross the centre several times within one edge, the edge time is the
mean of the first and last crossing.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from advisor.errors import CaptureError

DEFAULT_FRACTION = 0.5
DEFAULT_HYSTERESIS = 0.2  # fraction of the swing
#: Swing / noise below which a channel is taken as flat (no two distinct levels).
MIN_SWING_TO_NOISE = 6.0


@dataclass(frozen=True)
class Levels:
    low: float  # V
    high: float  # V
    noise: float  # V, robust standard deviation on the quieter level

    @property
    def swing(self) -> float:
        return self.high - self.low


@dataclass(frozen=True)
class Thresholds:
    center: float  # V, where edges are timed
    upper: float  # V, a rising edge must reach above this
    lower: float  # V, a falling edge must reach below this


@dataclass(frozen=True)
class Edges:
    """Edge times (s) of one channel; rising and falling alternate."""

    rising: np.ndarray
    falling: np.ndarray
    levels: Levels
    thresholds: Thresholds
    starts_high: bool
    samples_per_edge_gap: float  # median samples between edges (a sanity measure)

    @property
    def count(self) -> int:
        return int(self.rising.size + self.falling.size)


def robust_levels(v: np.ndarray) -> Levels:
    """Low and high levels (V) of a two-level signal, and the noise on them."""
    sub = v[:: max(1, v.size // 400_000)]  # the levels need no more samples than this
    lo0, hi0 = np.percentile(sub, [0.1, 99.9])
    mid = 0.5 * (lo0 + hi0)
    below = sub[sub < mid]
    above = sub[sub >= mid]
    if below.size == 0 or above.size == 0:
        return Levels(float(lo0), float(hi0), float("inf"))
    low = float(np.median(below))
    high = float(np.median(above))
    # The quieter level sets the noise figure: ringing on a short pulse may fill its whole level.
    mad = min(float(np.median(np.abs(below - low))), float(np.median(np.abs(above - high))))
    return Levels(low, high, 1.4826 * mad)


def thresholds_for(
    levels: Levels, *, threshold: float | None = None, fraction: float | None = None,
    hysteresis: float = DEFAULT_HYSTERESIS,
) -> Thresholds:
    """Centre threshold and hysteresis band (V) from the levels and the user's choice."""
    if threshold is not None and fraction is not None:
        raise CaptureError("give --threshold or --threshold-fraction, not both")
    if not 0.0 <= hysteresis < 1.0:
        raise CaptureError(f"hysteresis {hysteresis!r} is outside 0..1", expected="a fraction of the swing such as 0.2")
    half = 0.5 * hysteresis * levels.swing
    if threshold is not None:
        center = float(threshold)
    else:
        f = DEFAULT_FRACTION if fraction is None else float(fraction)
        if not 0.0 < f < 1.0:
            raise CaptureError(f"threshold fraction {f!r} is outside 0..1", expected="a fraction such as 0.5")
        center = levels.low + f * levels.swing
        # Keep the band inside the swing so a low fraction still sees edges.
        half = min(half, 0.95 * (center - levels.low), 0.95 * (levels.high - center))
    return Thresholds(center, center + half, center - half)


def find_edges(t: np.ndarray, v: np.ndarray, th: Thresholds) -> tuple[np.ndarray, np.ndarray, bool | None, float]:
    """Rising and falling edge times (s), the state at the start, median samples between edges.

    The state at the start is None when the signal never leaves the band.
    """
    state = np.zeros(v.size, dtype=np.int8)
    state[v > th.upper] = 1
    state[v < th.lower] = -1
    idx = np.flatnonzero(state)
    if idx.size == 0:
        return np.empty(0), np.empty(0), None, 0.0
    s = state[idx]
    ch = np.flatnonzero(s[1:] != s[:-1]) + 1
    first_high = bool(s[0] == 1)
    j = idx[ch]  # first sample in the new state
    i = idx[ch - 1]  # last sample in the old state
    up = s[ch] == 1
    above = v >= th.center
    cross = above[1:] != above[:-1]
    k_up = np.flatnonzero(cross & above[1:])
    k_dn = np.flatnonzero(cross & above[:-1])
    rising = _edge_times(t, v, th.center, k_up, i[up], j[up])
    falling = _edge_times(t, v, th.center, k_dn, i[~up], j[~up])
    gap = float(np.median(np.diff(j))) if j.size > 1 else float(v.size)
    return rising, falling, first_high, gap


def _edge_times(t, v, level, k, i, j) -> np.ndarray:
    """Mean of the first and last centre crossing in [i, j) for each edge."""
    if i.size == 0:
        return np.empty(0)
    first = k[np.searchsorted(k, i, side="left")]
    last = k[np.searchsorted(k, j, side="left") - 1]
    return 0.5 * (_interp(t, v, level, first) + _interp(t, v, level, last))


def _interp(t, v, level, k) -> np.ndarray:
    v0, v1 = v[k], v[k + 1]
    return t[k] + (level - v0) / (v1 - v0) * (t[k + 1] - t[k])


def channel_edges(
    t: np.ndarray, v: np.ndarray, number: int, *, threshold: float | None = None,
    fraction: float | None = None, hysteresis: float = DEFAULT_HYSTERESIS, min_edges: int = 2,
) -> Edges:
    """Edges of channel ``number`` (1-based, for messages); raises when it cannot be timed."""
    levels = robust_levels(v)
    flat = not levels.swing > MIN_SWING_TO_NOISE * levels.noise
    lo, hi = float(v.min()), float(v.max())
    if flat and threshold is None:
        raise CaptureError(
            f"channel {number} never crosses a threshold: it shows no two distinct levels "
            f"(it stays between {lo:.4g} V and {hi:.4g} V)",
            hint="a stuck output, a probe not connected, or the wrong channel number",
        )
    if flat:  # an absolute threshold on a flat trace: a small fixed band
        levels = Levels(lo, hi, levels.noise)
    th = thresholds_for(levels, threshold=threshold, fraction=fraction, hysteresis=hysteresis)
    rising, falling, starts_high, gap = find_edges(t, v, th)
    n = rising.size + falling.size
    if n == 0:
        raise CaptureError(
            f"channel {number} never crosses the threshold {th.center:.4g} V "
            f"(it stays between {lo:.4g} V and {hi:.4g} V)",
            hint="a stuck output, or set --threshold / --threshold-fraction",
        )
    if n >= 3 and gap < 2.0:
        raise CaptureError(
            f"channel {number} switches every sample or two around {th.center:.4g} V: that is noise, not edges",
            hint="set --threshold between the real levels, or capture with a finer time base",
        )
    if n < min_edges:
        when = (rising if rising.size else falling)[0]
        raise CaptureError(
            f"too few edges on channel {number}: only one, at {when:.6g} s",
            expected="at least two edges (one pulse or one full cycle) to time anything",
        )
    return Edges(rising, falling, levels, th, bool(starts_high), gap)
