"""Run ngspice transient simulations from tests and read the waveforms with numpy.

The circuit simulator ngspice (Debian package ``ngspice``) is the independent
oracle for timing laws: a behavioural circuit built from standard ngspice elements
(R, C, voltage-controlled switches, B-sources, XSPICE digital models) is simulated
and its edges are measured in Python.

API (import as ``from support.ngspice import ...``)::

    run_transient(netlist_body, tstop, tmax, vectors, *, tstart=0.0) -> dict[str, np.ndarray]
        Simulate; returns {"time": t, "<vector>": values, ...}. ``vectors`` are
        ngspice expressions such as "v(out)" or "v(cap)"; the dict keys are the
        same strings. Raises SimulationError (with the log tail) on any failure.

    crossings(t, v, level, direction="rising"|"falling"|"both") -> np.ndarray
        Times where ``v`` crosses ``level``, linearly interpolated between samples.

    pulse_widths(t, v, level) -> np.ndarray     high times (rising to next falling)
    low_times(t, v, level) -> np.ndarray        low times (falling to next rising)
    periods(t, v, level) -> np.ndarray          rising edge to next rising edge

How it runs (ngspice manual, batch mode and the .control section; the settings below were
measured here): the netlist goes to a temporary folder with a ``.control`` block doing
``tran <tmax> <tstop> <tstart> <tmax> uic`` and ``wrdata`` (``set wr_singlescale``,
``set wr_vecnames``, ``option numdgt=12``); ``ngspice -n -b`` runs it. ngspice can exit 0
after a failed run in ``.control`` mode, so the log is scanned for "timestep too
small", "aborted", "failed" and "error" lines and the data file must exist.

Accuracy: the maximum step sets it. tmax <= shortest phase / 2000 gives about
0.01 % timing error for an RC charge; give every timing capacitor an ``ic=`` value
because ``uic`` skips the operating point.
"""

from __future__ import annotations

import re
import subprocess
import tempfile
from pathlib import Path

import numpy as np

from support.external import ngspice_path

__all__ = ["SimulationError", "run_transient", "crossings", "pulse_widths", "low_times", "periods"]

_FAIL = re.compile(r"timestep too small|aborted|simulation\(s\) aborted|failed|^\s*error", re.IGNORECASE | re.MULTILINE)
# ngspice prints harmless lines containing these words on some builds; ignore them.
_BENIGN = re.compile(r"no compatibility mode selected|warning: can't find init file|note: .* failed to load", re.IGNORECASE)


class SimulationError(RuntimeError):
    """ngspice did not produce a usable result; the message ends with the log tail."""


def _netlist(body: str, tstop: float, tmax: float, tstart: float, vectors: list[str], data: Path) -> str:
    vec = " ".join(vectors)
    return (
        "* retime test netlist\n"
        f"{body.strip()}\n"
        ".control\n"
        "set wr_singlescale\n"
        "set wr_vecnames\n"
        "option numdgt=12\n"
        f"tran {tmax:.6e} {tstop:.6e} {tstart:.6e} {tmax:.6e} uic\n"
        f"wrdata {data.name} {vec}\n"
        "quit\n"
        ".endc\n"
        ".end\n"
    )


def run_transient(
    netlist_body: str,
    tstop: float,
    tmax: float,
    vectors: list[str] | tuple[str, ...],
    *,
    tstart: float = 0.0,
    timeout: float = 120.0,
) -> dict[str, np.ndarray]:
    """Simulate ``netlist_body`` (elements and models, no .tran/.control/.end) in ngspice.

    Parameters: ``tstop`` end time (s); ``tmax`` maximum internal step (s), which
    sets the accuracy; ``vectors`` ngspice expressions to record (e.g. ``"v(out)"``);
    ``tstart`` first time written (s). Returns arrays keyed ``"time"`` and each
    requested vector string. Skips (or fails under REQUIRE_EXTERNAL=1) when ngspice
    is not installed; raises :class:`SimulationError` when the run fails.
    """
    exe = ngspice_path()
    vectors = list(vectors)
    if not vectors:
        raise ValueError("give at least one vector to record")
    with tempfile.TemporaryDirectory(prefix="retime-spice-") as tmp:
        folder = Path(tmp)
        data = folder / "out.data"
        cir = folder / "circuit.cir"
        cir.write_text(_netlist(netlist_body, tstop, tmax, tstart, vectors, data), encoding="ascii")
        try:
            proc = subprocess.run(
                [exe, "-n", "-b", cir.name], cwd=folder, capture_output=True, text=True, timeout=timeout
            )
        except subprocess.TimeoutExpired as exc:
            raise SimulationError(f"ngspice ran longer than {timeout} s") from exc
        log = proc.stdout + "\n" + proc.stderr
        bad = [m.group(0) for m in _FAIL.finditer(log) if not _BENIGN.search(_line_of(log, m.start()))]
        if proc.returncode != 0 or bad or not data.exists():
            tail = "\n".join(log.strip().splitlines()[-25:])
            why = f"exit {proc.returncode}" if proc.returncode else (f"log says {bad[0]!r}" if bad else "no data file")
            raise SimulationError(f"ngspice failed ({why}):\n{tail}")
        return _read(data, vectors)


def _line_of(text: str, pos: int) -> str:
    start = text.rfind("\n", 0, pos) + 1
    end = text.find("\n", pos)
    return text[start : end if end >= 0 else len(text)]


def _read(data: Path, vectors: list[str]) -> dict[str, np.ndarray]:
    with data.open(encoding="ascii") as fh:
        header = fh.readline().split()
        table = np.loadtxt(fh, ndmin=2)
    if table.shape[1] != len(vectors) + 1:
        raise SimulationError(f"expected {len(vectors) + 1} columns, got {table.shape[1]} ({header})")
    out = {"time": table[:, 0]}
    for i, name in enumerate(vectors, start=1):
        out[name] = table[:, i]
    return out


def crossings(t: np.ndarray, v: np.ndarray, level: float, direction: str = "both") -> np.ndarray:
    """Times where ``v`` crosses ``level`` (linear interpolation between samples).

    ``direction``: "rising" (below to at-or-above), "falling" (at-or-above to below)
    or "both".
    """
    above = v >= level
    idx = np.nonzero(above[1:] != above[:-1])[0]
    if direction == "rising":
        idx = idx[~above[idx]]
    elif direction == "falling":
        idx = idx[above[idx]]
    elif direction != "both":
        raise ValueError(f"direction {direction!r}: expected rising, falling or both")
    v0, v1 = v[idx], v[idx + 1]
    t0, t1 = t[idx], t[idx + 1]
    frac = (level - v0) / (v1 - v0)
    return t0 + frac * (t1 - t0)


def pulse_widths(t: np.ndarray, v: np.ndarray, level: float) -> np.ndarray:
    """High times: each rising crossing to the next falling crossing (s)."""
    return _spans(crossings(t, v, level, "rising"), crossings(t, v, level, "falling"))


def low_times(t: np.ndarray, v: np.ndarray, level: float) -> np.ndarray:
    """Low times: each falling crossing to the next rising crossing (s)."""
    return _spans(crossings(t, v, level, "falling"), crossings(t, v, level, "rising"))


def periods(t: np.ndarray, v: np.ndarray, level: float) -> np.ndarray:
    """Rising edge to next rising edge (s)."""
    return np.diff(crossings(t, v, level, "rising"))


def _spans(starts: np.ndarray, ends: np.ndarray) -> np.ndarray:
    out = []
    j = 0
    for s in starts:
        while j < len(ends) and ends[j] <= s:
            j += 1
        if j == len(ends):
            break
        out.append(ends[j] - s)
    return np.asarray(out, dtype=float)
