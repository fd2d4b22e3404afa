"""Calibration from a measurement of the real circuit.

A technician's scope reading is the best fact about the board: the factor
measured/predicted for that quantity (width, high, low or period) absorbs the
real part's constant, the capacitor's true value and stray effects. Every later
time in the result is multiplied by it (frequencies divided; duty unchanged).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from advisor.circuit import Measurement
from advisor.errors import InputError

_FOR_MODE = {"mono": ("width",), "astable": ("high", "low", "period")}


@dataclass(frozen=True)
class Calibration:
    factor: float  # measured / predicted
    quantity: str
    measured: float  # s
    predicted: float  # s, uncalibrated nominal

    def to_json(self) -> dict:
        return {"factor": self.factor, "quantity": self.quantity, "measured": self.measured, "predicted": self.predicted}


def calibrate(mode: str, nominal: dict, measurement: Measurement) -> Calibration:
    """Factor = measured / predicted for the measured quantity (nominal times uncalibrated)."""
    q = measurement.quantity
    if q not in _FOR_MODE[mode]:
        want = ", ".join(f"--measured-{k}" for k in _FOR_MODE[mode])
        raise InputError(f"a {'monostable' if mode == 'mono' else 'astable'} circuit has no measured {q}", got=q, expected=want)
    predicted = nominal[q]
    if not predicted > 0 or not math.isfinite(predicted):  # the domain guards refuse such a circuit first
        raise InputError(f"cannot calibrate against a predicted {q} of {predicted!r} s", got=predicted)
    return Calibration(measurement.value / predicted, q, measurement.value, predicted)


def scale(times: dict, factor: float) -> dict:
    """Times multiplied by ``factor``; frequency divided; duty unchanged."""
    out = {}
    for k, v in times.items():
        if k == "frequency":
            out[k] = v / factor
        elif k == "duty":
            out[k] = v
        else:
            out[k] = v * factor
    return out
