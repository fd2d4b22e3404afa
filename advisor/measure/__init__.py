"""Measure a real circuit from an oscilloscope capture (CSV): edges, widths, periods.

reading (file → :class:`Capture`), edges (levels, hysteresis thresholds, edge
times), stats (per-channel high/low/period/frequency/duty), pair (trigger →
output delay, width, divide-by), result (:class:`MeasureResult`), analyse (the
entry points). Channels are the voltage columns numbered from 1.
"""

from advisor.measure.analyse import measure_capture, measure_file, measured_value
from advisor.measure.reading import Capture, parse_capture, read_capture
from advisor.measure.result import MeasureResult

__all__ = ["Capture", "MeasureResult", "measure_capture", "measure_file", "measured_value", "parse_capture",
           "read_capture"]
