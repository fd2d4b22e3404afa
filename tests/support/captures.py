"""Scope captures made from ngspice runs of behavioural circuits, for the measure tests.

The simulator is the independent source: the circuits below are built from standard
ngspice elements (R, C, voltage-controlled switches with hysteresis, B-sources),
simulated with ``support.ngspice.run_transient``, then "captured" the way a scope
does: sampled on a uniform grid, optionally with seeded Gaussian noise and damped
ringing after each edge, and written as CSV in several dialects.

Each channel passes through a first-order low-pass (the probe/scope bandwidth, time
constant ``TAU_BW``) inside the netlist, so edges take a few samples as on a real
scope; a symmetric low-pass delays rising and falling edges alike, leaving widths
and periods unchanged.

Exact laws of the ideal circuits (thresholds at 1/3 and 2/3 of the supply, as in the
555 datasheets, e.g. TI NE555 SLFS022):
- astable: high = ln2·(RA+RB)·C, low = ln2·RB·C;
- one-shot charging from 0 V to 2/3 of the supply: width = ln3·R·C.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from support.ngspice import crossings, run_transient

VCC = 5.0
TAU_BW = 0.2e-6  # s, scope/probe bandwidth time constant (about 0.8 MHz)
# Switch models: Ron tiny against the timing resistors, Roff huge (so they add nothing measurable to the RC law; common practice);
# the one-shot's discharge switch gets 1 Ω so C empties in ~10 ns without stalling the step control
# (it leaves VCC*1/R on C, 0.5 mV with 10 kΩ: 0.01 % of the width).
_SWITCHES = """
.model swcap sw vt={vt} vh={vh} ron=1e-4 roff=1e12
"""


@dataclass
class Simulated:
    """Clean simulated waveforms (non-uniform time steps) and the channels' names."""

    time: np.ndarray
    channels: list[np.ndarray]  # as seen through the scope bandwidth, V
    names: list[str]


def astable(ra: float, rb: float, c: float, periods: float = 8.0) -> Simulated:
    """555-style astable: C charges through RA+RB, discharges through RB; switch hysteresis
    at VCC/3..2VCC/3 plays the two comparators and the flip-flop."""
    t_high = math.log(2) * (ra + rb) * c
    t_low = math.log(2) * rb * c
    tstop = periods * (t_high + t_low)
    body = f"""
Vcc vcc 0 {VCC}
Ra vcc dis {ra}
Rb dis cap {rb}
Ct cap 0 {c} ic=0
* the discharge switch closes above 2/3 VCC and opens below 1/3 VCC
Sdis dis 0 cap 0 swcap OFF
* output: high while the discharge switch is open (same model, same state)
Rup vcc q 1k
Sq q 0 cap 0 swcap OFF
* scope channel: first-order bandwidth limit
Bbuf qb 0 V = v(q)
Rbw qb ch1 1k
Cbw ch1 0 {TAU_BW / 1e3} ic=0
{_SWITCHES.format(vt=VCC / 2, vh=VCC / 6)}
"""
    res = run_transient(body, tstop, min(t_high, t_low) / 2000, ["v(ch1)"])
    return Simulated(res["time"], [res["v(ch1)"]], ["output"])


def one_shot(r: float, c: float, trigger_period: float, *, triggers: int = 12, retriggerable: bool = False,
             trigger_width: float = 2e-6) -> Simulated:
    """One-shot, 555-monostable style. One switch with hysteresis is the memory: it discharges
    C and holds the output low while ON. Its control is v(C) - 2*v(trigger): a trigger pulse
    drives it below the lower switching point (OFF: output high, C charges through R from
    0 V); C reaching 2/3 VCC drives it above the upper point (ON: output low, C emptied).
    Between the two it holds. Non-retriggerable: a trigger during the pulse keeps it OFF, no
    effect. Retriggerable: a second switch also empties C while the trigger is high.
    The trigger passes a 250 ns RC first: a propagation delay (about 27 ns) as a real part has."""
    width = math.log(3) * r * c
    tstop = triggers * trigger_period
    retrig = "Sre cap 0 trigd 0 swtrig\n" if retriggerable else ""
    body = f"""
Vcc vcc 0 {VCC}
Vtrig trig 0 PULSE(0 {VCC} {trigger_period / 10} 20n 20n {trigger_width} {trigger_period})
Rin trig trigd 1k
Cin trigd 0 250p ic=0
Bctl ctl 0 V = v(cap) - 2*v(trigd)
Rt vcc cap {r}
Ct cap 0 {c} ic=0
Sdis cap 0 ctl 0 swmono ON
{retrig}Rup vcc q 1k
Sq q 0 ctl 0 swmono ON
Bbuf qb 0 V = v(q)
Rbw1 trig ch1 1k
Cbw1 ch1 0 {TAU_BW / 1e3} ic=0
Rbw2 qb ch2 1k
Cbw2 ch2 0 {TAU_BW / 1e3} ic=0
* ON above 2/3 VCC, OFF below -1 V
.model swmono sw vt={(2 * VCC / 3 - 1) / 2} vh={(2 * VCC / 3 + 1) / 2} ron=1 roff=1e12
.model swtrig sw vt={VCC / 2} vh=0.1 ron=1 roff=1e12
"""
    tmax = min(width, trigger_width * 20, trigger_period) / 2000
    res = run_transient(body, tstop, tmax, ["v(ch1)", "v(ch2)"])
    return Simulated(res["time"], [res["v(ch1)"], res["v(ch2)"]], ["trigger", "output"])


def clean_edges(sim: Simulated, channel: int, level: float = VCC / 2) -> tuple[np.ndarray, np.ndarray]:
    """Rising and falling crossing times of channel (1-based) on the clean simulated waveform."""
    v = sim.channels[channel - 1]
    return crossings(sim.time, v, level, "rising"), crossings(sim.time, v, level, "falling")


def sample(sim: Simulated, n: int, *, noise: float = 0.0, ringing: float = 0.0, seed: int = 1,
           ring_cycles: float = 12.0) -> tuple[np.ndarray, list[np.ndarray]]:
    """The scope's view: ``n`` uniform samples, Gaussian noise of ``noise`` × swing (rms),
    and after each edge a damped oscillation of peak ``ringing`` × swing."""
    t = np.linspace(sim.time[0], sim.time[-1], n)
    dt = t[1] - t[0]
    rng = np.random.default_rng(seed)
    out = []
    for k, v in enumerate(sim.channels, start=1):
        s = np.interp(t, sim.time, v)
        if ringing:
            rise, fall = clean_edges(sim, k)
            f_ring = 1.0 / (8 * dt)  # rings at 8 samples a cycle
            decay = ring_cycles / f_ring / 4
            for edges, sign in ((rise, 1.0), (fall, -1.0)):
                for te in edges:
                    t0 = te + 3 * TAU_BW  # once the edge has settled
                    i0 = np.searchsorted(t, t0)
                    i1 = np.searchsorted(t, t0 + 6 * decay)
                    x = t[i0:i1] - t0
                    s[i0:i1] += sign * ringing * VCC * np.exp(-x / decay) * np.cos(2 * np.pi * f_ring * x)
        if noise:
            s = s + rng.normal(0.0, noise * VCC, s.size)
        out.append(s)
    return t, out


# CSV dialects a scope or a spreadsheet writes. Each entry: description, writer.
def write_csv(path: Path, t: np.ndarray, channels: list[np.ndarray], dialect: str) -> Path:
    """Write a capture in one of DIALECTS; returns the path."""
    cols = len(channels)
    if dialect == "comma-seconds":
        head = "Time (s)," + ",".join(f"CH{i} (V)" for i in range(1, cols + 1)) + "\n"
        _write(path, head, t, channels, ",", "%.9e", "%.5f", "utf-8")
    elif dialect == "semicolon-decimal-comma-us-cp1252":
        head = ("Oszilloskop;Demo\nAufnahme;2024-01-01\n\n"
                "Zeit (µs);" + ";".join(f"Kanal {i} (V)" for i in range(1, cols + 1)) + "\n")
        _write(path, head, t * 1e6, channels, ";", "%.6f", "%.4f", "cp1252", decimal_comma=True)
    elif dialect == "tab-no-header":
        _write(path, "", t, channels, "\t", "%.10g", "%.5g", "utf-8")
    elif dialect == "bom-ms-crlf":
        head = "TIME[ms]," + ",".join(f"CH{i}[V]" for i in range(1, cols + 1)) + "\r\n"
        _write(path, head, t * 1e3, channels, ",", "%.9f", "%.4f", "utf-8-sig", newline="\r\n")
    elif dialect == "units-line-mv":
        head = ("Model,demo scope\nRecord Length,%d\n" % t.size + "X," + ",".join(f"CH{i}" for i in range(1, cols + 1))
                + "\ns," + ",".join("mV" for _ in range(cols)) + "\n")
        _write(path, head, t, [c * 1e3 for c in channels], ",", "%.8e", "%.2f", "utf-8", trailing=",")
    elif dialect == "spaces":
        _write(path, "# time volts\n", t, channels, " ", "%.9e", "%.5f", "utf-8")
    else:
        raise ValueError(f"unknown dialect {dialect!r}")
    return path


DIALECTS = ("comma-seconds", "semicolon-decimal-comma-us-cp1252", "tab-no-header", "bom-ms-crlf", "units-line-mv",
            "spaces")


def _write(path: Path, head: str, t, channels, sep: str, tfmt: str, vfmt: str, encoding: str, *,
           decimal_comma: bool = False, newline: str = "\n", trailing: str = "") -> None:
    data = np.column_stack([t, *channels])
    buf = [head]
    fmt = sep.join([tfmt] + [vfmt] * len(channels)) + trailing
    text = "\n".join(fmt % tuple(row) for row in data.tolist()) + "\n"
    if decimal_comma:
        text = text.replace(".", ",")
    buf.append(text)
    out = "".join(buf)
    if newline != "\n":
        out = out.replace("\r\n", "\n").replace("\n", newline)
    path.write_bytes(out.encode(encoding))


def synthetic_square(n: int, period_samples: float, *, duty: float = 0.5, channels: int = 2, seed: int = 3,
                     noise: float = 0.02) -> tuple[np.ndarray, list[np.ndarray]]:
    """A large capture for the benchmark (not a reference value): square waves with
    one-sample linear edges and noise; ``channels`` copies shifted by a quarter period."""
    t = np.arange(n) * 1e-8
    rng = np.random.default_rng(seed)
    out = []
    for k in range(channels):
        phase = (np.arange(n) / period_samples + k * 0.25) % 1.0
        out.append(np.where(phase < duty, VCC, 0.0) + rng.normal(0, noise * VCC, n))
    return t, out
