"""A measurement for calibration together with a compact summary of the capture it came from.

:func:`capture_measurement` is what ``--measured-from`` (and the workbench's capture
field) uses: it reads the capture once, takes the median of the asked quantity on
the output channel with the same channel defaults as
:func:`advisor.measure.analyse.measured_value`, and returns an
:class:`advisor.circuit.Measurement` whose ``capture`` holds:

- ``file``, ``name``: the capture as given and its file name;
- ``quantity``, ``value``: what calibrates the timing (s), the median;
- ``trigger_channel``, ``output_channel`` (1-based; trigger None when no pair was
  timed), ``columns`` (their headings) and ``threshold`` (V, the centre threshold
  each channel's edges were timed at);
- ``t0``: the capture time (s) of the first active trigger edge (the first rising
  output edge without a trigger); every edge time below is relative to it;
- ``window``: the span (s) the edges cover, from 0: whole trigger periods (at most
  :data:`MAX_PERIODS`), cut so no channel carries more than :data:`MAX_EDGES` edges;
- ``trigger`` / ``output``: ``{"rising": [...], "falling": [...], "starts_high"}``
  with the edge times (s) inside the window and the level just before it; the window
  is taken one sample early at both ends, so an output edge interpolated a hair
  before its trigger edge stays with it (such a time is slightly negative);
- ``width``, ``period``, ``delay``: medians over the whole capture (s): the output
  pulse width (the pair's, else the high time), the trigger period (else the output
  period), the trigger-to-output delay (pair only); ``triggers``, ``pulses``,
  ``divide_by``, ``stays_active`` as the pair reports them (None without a pair).

Everything is plain Python (floats, ints, bools, lists) so it goes into JSON as is.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

from advisor.circuit import Measurement
from advisor.measure.analyse import Quantity, measure_for_calibration
from advisor.measure.edges import Edges
from advisor.measure.reading import Capture, read_capture
from advisor.measure.result import MeasureResult

#: At most this many edges per channel in the summary (enough for a few periods).
MAX_EDGES = 20
#: At most this many trigger (or output) periods in the summary's window.
MAX_PERIODS = 10


def capture_measurement(
    path: str | Path, quantity: Quantity | None = None, *, mode: str | None = None,
    trigger_channel: int | None = None, output_channel: int | None = None,
) -> Measurement:
    """The capture's median ``quantity`` (default: width; period for an astable ``mode``)
    as a :class:`Measurement` carrying the capture's summary."""
    quantity = quantity or ("period" if mode == "astable" else "width")
    capture = read_capture(path)
    value, res, trig, out = measure_for_calibration(capture, quantity, trigger_channel, output_channel)
    return Measurement(quantity, value, capture=summarise(res, capture, str(path), quantity, value, trig, out))


def _level_before(edges: Edges, t0: float) -> bool:
    """True when the channel is high just before ``t0`` (its last earlier edge, else its start)."""
    r = edges.rising[edges.rising < t0]
    f = edges.falling[edges.falling < t0]
    if r.size == 0 and f.size == 0:
        return bool(edges.starts_high)
    if f.size == 0:
        return True
    if r.size == 0:
        return False
    return bool(r[-1] > f[-1])


def _inside(times: np.ndarray, t0: float, end: float) -> np.ndarray:
    return times[(times >= t0) & (times < end)]


def _count(edges: Edges, t0: float, end: float) -> int:
    return int(_inside(edges.rising, t0, end).size + _inside(edges.falling, t0, end).size)


def _window_end(anchor: np.ndarray, channels: list[Edges], t0: float, t_end: float, tol: float) -> float:
    """End (capture time, s) of the summary's window: whole periods of ``anchor``, at most
    MAX_PERIODS, with no channel over MAX_EDGES edges; else cut at the first edge too many.
    Edges are taken from ``t0 - tol`` to ``end - tol`` (see :func:`_edges_json`)."""
    for k in range(min(MAX_PERIODS, anchor.size - 1), 0, -1):
        end = float(anchor[k])
        if all(_count(e, t0 - tol, end - tol) <= MAX_EDGES for e in channels):
            return end
    end = float(np.nextafter(t_end, np.inf)) + tol if anchor.size < 2 else float(anchor[1])
    for e in channels:
        inside = (_inside(e.rising, t0 - tol, end - tol), _inside(e.falling, t0 - tol, end - tol))
        times = np.sort(np.concatenate(inside))
        if times.size > MAX_EDGES:
            end = float(times[MAX_EDGES]) + tol
    return end


def _edges_json(edges: Edges, t0: float, end: float, tol: float) -> dict:
    """Edge times relative to ``t0``. The span starts and ends one sample (``tol``) early:
    an output that follows its trigger within a sample can be timed a hair before it
    (interpolation), and belongs with that trigger, as in the pair's crediting."""
    return {
        "starts_high": _level_before(edges, t0 - tol),
        "rising": [float(t - t0) for t in _inside(edges.rising, t0 - tol, end - tol)],
        "falling": [float(t - t0) for t in _inside(edges.falling, t0 - tol, end - tol)],
    }


def summarise(res: MeasureResult, capture: Capture, file: str, quantity: str, value: float,
              trigger_channel: int | None, output_channel: int) -> dict:
    """The compact summary described in the module docstring."""
    out_ch = res.channel(output_channel)
    assert out_ch is not None  # measure_for_calibration raised otherwise
    trig_ch = res.channel(trigger_channel) if trigger_channel is not None else None
    pair = res.pair if trig_ch is not None else None
    if trig_ch is not None:
        active = pair.trigger_edge if pair is not None else "rising"
        anchor = trig_ch.edges.rising if active == "rising" else trig_ch.edges.falling
        period = trig_ch.period.median
    else:
        active = None
        anchor = out_ch.edges.rising if out_ch.edges.rising.size else out_ch.edges.falling
        period = out_ch.period.median
    t0 = float(anchor[0])
    channels = [out_ch.edges] + ([trig_ch.edges] if trig_ch is not None else [])
    tol = float(capture.sample_interval)
    end = _window_end(anchor, channels, t0, float(capture.time[-1]), tol)
    window = min(end, float(capture.time[-1])) - t0
    trig_json = None
    if trig_ch is not None:
        trig_json = {"edge": active, **_edges_json(trig_ch.edges, t0, end, tol)}
    width = pair.width.median if pair is not None else out_ch.high.median
    return {
        "file": file,
        "name": Path(file).name,
        "quantity": quantity,
        "value": float(value),
        "trigger_channel": trigger_channel,
        "output_channel": output_channel,
        "columns": {"trigger": trig_ch.name if trig_ch is not None else None, "output": out_ch.name},
        "threshold": {"trigger": float(trig_ch.edges.thresholds.center) if trig_ch is not None else None,
                      "output": float(out_ch.edges.thresholds.center)},
        "samples": int(capture.n_samples),
        "sample_interval": float(capture.sample_interval),
        "t0": t0,
        "window": float(window),
        "trigger": trig_json,
        "output": _edges_json(out_ch.edges, t0, end, tol),
        "width": None if width is None else float(width),
        "period": None if period is None else float(period),
        "delay": float(pair.delay.median) if pair is not None and pair.delay.median is not None else None,
        "triggers": pair.triggers if pair is not None else None,
        "pulses": pair.pulses if pair is not None else None,
        "divide_by": pair.divide_by if pair is not None else None,
        "stays_active": bool(pair.stays_active) if pair is not None else None,
    }
