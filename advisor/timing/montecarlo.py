"""Monte Carlo spread of a circuit's timing (numpy, vectorised).

Resistors, capacitors and the part-to-part spread are drawn from normal
distributions whose ±3σ span the tolerance, clipped at the tolerance (common
practice: a "5 %" part is a process centred on its value, screened at the limit);
a constant one sheet gives as a range is drawn uniformly inside it. Makers'
figures are alternatives, not a range: each sample first draws a maker's formula
(equally likely: nothing says which maker's part is on the board), then that
maker's part (``advisor.timing.alternatives``). The law is evaluated once per
maker on arrays; 100 000 samples take a few milliseconds.
"""

from __future__ import annotations

from dataclasses import dataclass

from advisor.timing.model import Model


@dataclass(frozen=True)
class Distribution:
    quantity: str  # "width" or "period" (or any key of the model's times)
    samples: int
    mean: float
    std: float
    p001: float  # 0.1 % quantile
    p50: float
    p999: float  # 99.9 % quantile
    window: tuple[float, float] | None = None
    share_in_window: float | None = None

    def to_json(self) -> dict:
        out = {
            "quantity": self.quantity, "samples": self.samples, "mean": self.mean, "std": self.std,
            "p001": self.p001, "median": self.p50, "p999": self.p999,
        }
        if self.window is not None:
            out["window"] = {"min": self.window[0], "max": self.window[1]}
            out["share_in_window"] = self.share_in_window
        return out


def sample_params(model: Model, n: int, rng) -> dict:
    """Arrays of ``n`` draws for each ranged input; fixed inputs stay scalars."""
    import numpy as np

    p: dict = dict(model.params)
    for name, (lo, hi) in model.ranges.items():
        if hi == lo:
            continue
        kind = model.tolerance_kind.get(name, "const")
        if kind == "const":
            p[name] = rng.uniform(lo, hi, n)
        else:
            mid = 0.5 * (lo + hi)
            half = 0.5 * (hi - lo)
            p[name] = np.clip(rng.normal(mid, half / 3.0, n), lo, hi)
    return p


def draw(model: Model, n: int, rng, quantity: str):
    """``n`` samples of ``quantity``: a maker's formula per sample, then that maker's part."""
    import numpy as np

    alts = model.alternatives
    if len(alts) <= 1:
        values = model.times(sample_params(model, n, rng))[quantity]
        return np.broadcast_to(np.asarray(values, dtype=float), (n,))
    counts = np.bincount(rng.integers(0, len(alts), n), minlength=len(alts))
    parts = []
    for alt, k in zip(alts, counts.tolist()):
        if k == 0:
            continue
        m = model.for_alternative(alt)
        v = m.times(sample_params(m, k, rng))[quantity]
        parts.append(np.broadcast_to(np.asarray(v, dtype=float), (k,)))
    return np.concatenate(parts)


def simulate(
    model: Model,
    samples: int = 100_000,
    *,
    window: tuple[float, float] | None = None,
    quantity: str | None = None,
    scale: float = 1.0,
    seed: int | None = 1,
) -> Distribution:
    """Distribution of ``quantity`` (default: width or period) over ``samples`` draws.

    ``window`` (same unit as the quantity) gives the share of samples inside it;
    ``scale`` multiplies times (a calibration factor); frequency is divided by it.
    """
    import numpy as np

    rng = np.random.default_rng(seed)
    q = quantity or model.main_quantity
    values = draw(model, samples, rng, q)
    if q == "frequency":
        values = values / scale
    elif q != "duty":
        values = values * scale
    lo_q, med, hi_q = np.quantile(values, [0.001, 0.5, 0.999])
    share = None
    if window is not None:
        share = float(np.count_nonzero((values >= window[0]) & (values <= window[1]))) / samples
    return Distribution(
        q, samples, float(values.mean()), float(values.std()), float(lo_q), float(med), float(hi_q),
        window, share,
    )
