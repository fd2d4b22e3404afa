"""`retime measure` against captures made from ngspice runs (the independent source).

The behavioural circuits are in support/captures.py; each is simulated, sampled as a
scope would (uniform grid, seeded noise, optional ringing), written as CSV in several
dialects, read back and measured. Reference values: the edges of the clean simulated
waveform (support.ngspice.crossings) and the ideal laws (555 thresholds at 1/3 and 2/3
of the supply: TI NE555 SLFS022; Diodes NE555 DS35112).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from advisor.measure import measure_file
from support.captures import DIALECTS, astable, clean_edges, one_shot, sample, write_csv

pytestmark = pytest.mark.external
TOL = 0.005  # the acceptance: within 0.5 %

RA, RB, C = 1e3, 10e3, 10e-9  # astable network
R1, C1 = 10e3, 10e-9  # one-shot network


@pytest.fixture(scope="module")
def astable_sim():
    return astable(RA, RB, C)


@pytest.fixture(scope="module")
def mono_sim():
    return one_shot(R1, C1, 250e-6)


@pytest.fixture(scope="module")
def divide_sim():
    return one_shot(R1, C1, 80e-6)


def _rel(a, b):
    return abs(a - b) / abs(b)


@pytest.mark.parametrize("dialect", DIALECTS)
def test_astable_high_low_period_in_every_dialect(astable_sim, dialect, tmp_path):
    t, ch = sample(astable_sim, 20_000, noise=0.03, seed=7)
    path = write_csv(tmp_path / "astable.csv", t, ch, dialect)
    res = measure_file(path)
    c = res.channels[0]
    rise, fall = clean_edges(astable_sim, 1)
    sim_period = float(np.median(np.diff(rise)))
    # Reference 1: edges of the clean ngspice waveform.
    assert _rel(c.period.median, sim_period) < TOL
    # Reference 2: the ideal laws tH = ln2·(RA+RB)·C, tL = ln2·RB·C (NE555 datasheets).
    assert _rel(c.high.median, math.log(2) * (RA + RB) * C) < TOL
    assert _rel(c.low.median, math.log(2) * RB * C) < TOL
    assert _rel(c.frequency.median, 1 / (math.log(2) * (RA + 2 * RB) * C)) < TOL
    assert _rel(c.duty.median, (RA + RB) / (RA + 2 * RB)) < TOL
    # Property: every complete interval counted once (the 8 simulated cycles).
    assert c.period.count == len(rise) - 1


def test_one_shot_width_delay_and_one_pulse_per_trigger(mono_sim, tmp_path):
    t, ch = sample(mono_sim, 30_000, noise=0.02, seed=11)
    path = write_csv(tmp_path / "mono.csv", t, ch, "comma-seconds")
    res = measure_file(path, trigger_channel=1, output_channel=2)
    p = res.pair
    rise, fall = clean_edges(mono_sim, 2)
    trig, _ = clean_edges(mono_sim, 1)
    sim_width = float(np.median(fall - rise[: fall.size]))
    assert _rel(p.width.median, sim_width) < TOL  # clean ngspice waveform
    assert _rel(p.width.median, math.log(3) * R1 * C1) < TOL  # law: ln3·R·C (thresholds 0 → 2/3 VCC)
    sim_delay = float(np.median(rise - trig[: rise.size]))
    assert abs(p.delay.median - sim_delay) < 0.5 * res.sample_interval  # within half a sample of the simulation
    assert p.triggers == trig.size and p.pulses == trig.size
    assert p.divide_by == 1 and not p.stays_active


def test_divide_by_two_reports_one_pulse_per_two_triggers(divide_sim, tmp_path):
    # Pulse ln3·R·C = 110 µs > trigger period 80 µs on a non-retriggerable one-shot.
    t, ch = sample(divide_sim, 20_000, noise=0.02, seed=5)
    path = write_csv(tmp_path / "div2.csv", t, ch, "semicolon-decimal-comma-us-cp1252")
    p = measure_file(path, trigger_channel=1, output_channel=2).pair
    trig, _ = clean_edges(divide_sim, 1)
    assert p.triggers == trig.size == 12
    assert p.pulses == 6  # every second trigger fires (simulation shows 6 output pulses)
    assert p.divide_by == 2
    assert _rel(p.width.median, math.log(3) * R1 * C1) < TOL


def test_retriggerable_kept_active_is_visible(tmp_path):
    sim = one_shot(R1, C1, 80e-6, retriggerable=True)
    t, ch = sample(sim, 20_000, noise=0.02, seed=9)
    p = measure_file(write_csv(tmp_path / "stuck.csv", t, ch, "comma-seconds"), trigger_channel=1,
                     output_channel=2).pair
    assert p.pulses == 1 and p.triggers == 12  # the output rises once and never ends
    assert p.width.count == 0 and p.stays_active and p.divide_by is None


@pytest.mark.parametrize("dialect", ["comma-seconds", "tab-no-header"])
def test_ringing_at_the_edges_measures_like_a_clean_capture(mono_sim, tmp_path, dialect):
    t, clean = sample(mono_sim, 30_000, noise=0.02, seed=3)
    _, ringing = sample(mono_sim, 30_000, noise=0.02, seed=3, ringing=0.35)
    assert max(float(np.max(ringing[1])), 0) > 1.25 * 5.0  # the overshoot really is there
    a = measure_file(write_csv(tmp_path / "clean.csv", t, clean, dialect), trigger_channel=1, output_channel=2)
    b = measure_file(write_csv(tmp_path / "ring.csv", t, ringing, dialect), trigger_channel=1, output_channel=2)
    assert (b.pair.pulses, b.pair.triggers) == (a.pair.pulses, a.pair.triggers)
    assert b.channels[1].edges.count == a.channels[1].edges.count  # ringing adds no edges
    assert _rel(b.pair.width.median, a.pair.width.median) < 1e-3
    assert _rel(b.channels[1].period.median, a.channels[1].period.median) < 1e-3


def test_heavy_noise_without_hysteresis_would_count_false_edges(astable_sim, tmp_path):
    # Property of the hysteresis: with a band of 0 noise crosses the threshold many times
    # per edge; with the default band each edge counts once.
    t, ch = sample(astable_sim, 20_000, noise=0.06, seed=2)
    path = write_csv(tmp_path / "noisy.csv", t, ch, "comma-seconds")
    rise, fall = clean_edges(astable_sim, 1)
    good = measure_file(path).channels[0]
    assert good.edges.rising.size == rise.size and good.edges.falling.size == fall.size
    assert _rel(good.high.median, math.log(2) * (RA + RB) * C) < TOL


def test_measured_value_for_calibration_is_the_pair_width(mono_sim, tmp_path):
    from advisor.measure import measured_value

    t, ch = sample(mono_sim, 30_000, noise=0.02, seed=4)
    path = write_csv(tmp_path / "mono.csv", t, ch, "bom-ms-crlf")
    # Defaults: trigger channel 1, output channel 2; law ln3·R·C (555 thresholds, TI NE555 SLFS022).
    assert _rel(measured_value(path), math.log(3) * R1 * C1) < TOL
