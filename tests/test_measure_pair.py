"""Trigger/output pairing in a capture: the active edge found by itself, and a propagation
delay shorter than one sample still credited to its own trigger.

The captures are built here on a uniform grid (properties that must hold, not measured
values): a one-shot fires on each falling trigger edge after a delay far below the sample
interval, as a 74121 (tens of ns) does on a scope sampling every 0.5 µs.
"""

from __future__ import annotations

import numpy as np

from advisor.measure.analyse import measure_capture
from advisor.measure.reading import read_capture


def _capture(tmp_path, *, delay=40e-9, dt=0.5e-6, width=72e-6, period=1e-3, n_pulses=4, seed=1):
    rng = np.random.default_rng(seed)
    t = np.arange(int((n_pulses * period + 0.3e-3) / dt)) * dt
    trig = np.full(t.size, 5.0)
    out = np.full(t.size, 0.2)
    for k in range(n_pulses):
        t0 = 0.2e-3 + k * period + 0.13 * dt  # off the sample grid on purpose
        trig[(t >= t0) & (t < t0 + 2e-6)] = 0.0
        out[(t >= t0 + delay) & (t < t0 + delay + width)] = 3.4
    trig += rng.normal(0, 0.03, t.size)
    out += rng.normal(0, 0.03, t.size)
    path = tmp_path / "cap.csv"
    np.savetxt(path, np.column_stack([t, trig, out]), delimiter=",", header="time (s),CH1,CH2", comments="")
    return read_capture(path)


def test_sub_sample_delay_credits_every_pulse_to_its_trigger(tmp_path):
    res = measure_capture(_capture(tmp_path), trigger_channel=1, output_channel=2, trigger_edge="falling")
    assert res.pair.triggers == 4
    assert res.pair.pulses == 4
    assert res.pair.divide_by == 1
    assert abs(res.pair.width.median - 72e-6) < 0.5e-6  # within one sample


def test_active_edge_is_found_from_the_output(tmp_path):
    res = measure_capture(_capture(tmp_path), trigger_channel=1, output_channel=2)  # trigger_edge auto
    assert res.pair.trigger_edge == "falling"
    assert res.pair.pulses == 4
