"""Measure a capture: edges per channel, their statistics, and the trigger/output pair.

Channels are the voltage columns numbered from 1 (time column left out). Every
channel is timed; a channel that cannot be timed (flat, one edge) stops the
measurement when it was asked for by number or is the only one, and is listed
under ``skipped`` otherwise.
"""

from __future__ import annotations

from pathlib import Path
from typing import Literal

from advisor.errors import CaptureError
from advisor.measure.edges import DEFAULT_HYSTERESIS, channel_edges
from advisor.measure.pair import pair_stats
from advisor.measure.reading import Capture, read_capture
from advisor.measure.result import MeasureResult
from advisor.measure.stats import channel_stats

Quantity = Literal["width", "high", "low", "period"]


def measure_capture(
    capture: Capture,
    *,
    trigger_channel: int | None = None,
    output_channel: int | None = None,
    threshold: float | None = None,
    fraction: float | None = None,
    hysteresis: float = DEFAULT_HYSTERESIS,
    trigger_edge: Literal["rising", "falling", "auto"] = "auto",
    output_active: Literal["high", "low"] = "high",
) -> MeasureResult:
    """Time every channel of ``capture`` and, given both channels, the pair."""
    if (trigger_channel is None) != (output_channel is None):
        raise CaptureError("give both --trigger-channel and --output-channel to time a trigger/output pair")
    asked = {n for n in (trigger_channel, output_channel) if n is not None}
    for n in asked:
        capture.channel(n)  # validates the number
    if trigger_channel is not None and trigger_channel == output_channel:
        raise CaptureError("the trigger and output channels must differ", got=trigger_channel)
    channels, skipped, edges = [], [], {}
    for n in range(1, capture.n_channels + 1):
        # The output of a pair may switch only once (a pulse that never ends): still a result.
        need = 1 if n == output_channel else 2
        try:
            e = channel_edges(capture.time, capture.channel(n), n, threshold=threshold, fraction=fraction,
                              hysteresis=hysteresis, min_edges=need)
        except CaptureError as exc:
            if n in asked or capture.n_channels == 1:
                raise CaptureError(exc.message, location=capture.source, expected=exc.expected, hint=exc.hint) from None
            skipped.append({"index": n, "reason": exc.message})
            continue
        edges[n] = e
        channels.append(channel_stats(n, capture.names[n - 1], e))
    if not channels:
        raise CaptureError(f"no channel could be timed ({skipped[0]['reason']})", location=capture.source)
    pair = None
    if trigger_channel is not None:
        pair = pair_stats(edges[trigger_channel], edges[output_channel], trigger_channel=trigger_channel,
                          output_channel=output_channel, t_end=float(capture.time[-1]), trigger_edge=trigger_edge,
                          output_active=output_active, tolerance=capture.sample_interval)
    return MeasureResult(capture.source, capture.n_samples, capture.duration, capture.sample_interval, capture.names,
                         channels, pair, skipped)


def measure_file(path: str | Path, **options) -> MeasureResult:
    """Read ``path`` and measure it (options as :func:`measure_capture`)."""
    return measure_capture(read_capture(path), **options)


def measured_value(
    path: str | Path, quantity: Quantity = "width", *, trigger_channel: int | None = None,
    output_channel: int | None = None,
) -> float:
    """The capture's median ``quantity`` (s) on the output channel, for calibration.

    Defaults: the output is channel 2 when the capture has two or more channels,
    else channel 1; for ``width`` with two or more channels the trigger is channel 1
    (or the one given) and the width is the pair's output width; otherwise the
    output channel's high time (``width``/``high``), low time or period.
    """
    value, _res, _trig, _out = measure_for_calibration(read_capture(path), quantity, trigger_channel, output_channel)
    return value


def measure_for_calibration(
    capture: Capture, quantity: Quantity, trigger_channel: int | None, output_channel: int | None,
) -> tuple[float, MeasureResult, int | None, int]:
    """(median ``quantity`` in s, the measurement, trigger channel or None, output channel),
    with the channel defaults :func:`measured_value` documents."""
    if output_channel is None:
        output_channel = 2 if capture.n_channels >= 2 and trigger_channel != 2 else 1
    if trigger_channel is None and quantity == "width" and capture.n_channels >= 2 and output_channel != 1:
        trigger_channel = 1
    if quantity != "width":
        trigger_channel = None
    if trigger_channel is not None:
        res = measure_capture(capture, trigger_channel=trigger_channel, output_channel=output_channel)
        stats = res.pair.width  # type: ignore[union-attr]
        what = f"output width (channel {output_channel}, triggered by channel {trigger_channel})"
    else:
        res = measure_capture(capture)
        ch = res.channel(output_channel)
        if ch is None:
            reason = next((s["reason"] for s in res.skipped if s["index"] == output_channel), "not timed")
            raise CaptureError(reason, location=capture.source)
        stats = {"width": ch.high, "high": ch.high, "low": ch.low, "period": ch.period}[quantity]
        what = f"{quantity} of channel {output_channel}"
    if stats.median is None:
        raise CaptureError(f"the capture has no complete {what}", location=capture.source,
                           hint="capture a longer stretch, or choose --output-channel / --measured-quantity")
    return stats.median, res, trigger_channel, output_channel
