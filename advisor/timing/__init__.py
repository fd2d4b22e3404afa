"""The timing engine: laws, worst-case band, Monte Carlo, adjustment, calibration,
trigger-rate analysis and inverse design for 555-class timers and one-shots.

Public API (the JSON keys follow the command-line contract in README.md and DEVELOPERS.md):

- ``analyse(family, circuit) -> TimingResult``: timing of an existing circuit;
- ``design(family, circuit, series="E24", keep_c=True, limit=5) -> DesignResult``;
- ``predict_nominal(family, circuit) -> dict``: nominal times only (fast).

All quantities SI (s, Hz, Ω, F, V). Laws live in ``advisor.timing.laws``; numpy is
imported only by the Monte Carlo module, so ``retime check`` starts fast.
"""

from advisor.timing.analyse import analyse, predict_nominal
from advisor.timing.design import design
from advisor.timing.result import Candidate, DesignResult, TimingResult

__all__ = ["analyse", "design", "predict_nominal", "TimingResult", "DesignResult", "Candidate"]
