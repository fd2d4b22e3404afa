"""The result of measuring a capture, in the JSON shape of the command line contract.

``to_json()`` gives ``{"channels": [{"index", "high", "low", "period", "frequency",
"duty", ...}], "pair": {"delay", "width", "triggers", "pulses", ...}, "capture": {...}}``
where each timing entry is ``{"median", "min", "max", "count"}`` in s, Hz or a 0..1
fraction; ``pair`` is present only when a trigger and an output channel were given.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from advisor.measure.pair import PairStats
from advisor.measure.stats import ChannelStats


@dataclass(frozen=True)
class MeasureResult:
    source: str
    samples: int
    duration: float  # s
    sample_interval: float  # s
    names: tuple[str, ...]
    channels: list[ChannelStats]
    pair: PairStats | None = None
    skipped: list[dict] = field(default_factory=list)  # channels that could not be timed, with the reason

    def channel(self, index: int) -> ChannelStats | None:
        return next((c for c in self.channels if c.index == index), None)

    def to_json(self) -> dict:
        out: dict = {
            "capture": {
                "file": self.source,
                "samples": self.samples,
                "duration": self.duration,
                "sample_interval": self.sample_interval,
                "columns": list(self.names),
            },
            "channels": [c.to_json() for c in self.channels],
        }
        if self.pair is not None:
            out["pair"] = self.pair.to_json()
        if self.skipped:
            out["skipped"] = list(self.skipped)
        return out
