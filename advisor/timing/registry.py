"""One registry of the timing laws: what each law needs and how it is evaluated.

For each catalog ``timing.law`` (:data:`advisor.parts.Law`) a :class:`LawSpec` gives the
constants the catalog must publish, the law's main constant in each mode (the one the
rules context calls ``k`` and the makers' spread is judged on), the modes it has, its
evaluators (in terms of the equations of :mod:`advisor.timing.laws`, with their units and
sources there) and the equation text ``retime show`` prints. The catalog loader, the
timing model, the rules context and ``show`` all read it, so a new law is one entry here.

Evaluators take the model's parameters ``p`` (SI units) and the timing resistance ``r``
(Ω, the fixed resistor plus the variable one's share); ``mono`` returns the width (s),
``astable`` the high and low times (s).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable

from advisor.timing import laws


@dataclass(frozen=True)
class LawSpec:
    name: str
    constants: tuple[str, ...]  # the catalog must publish these (timing.constants)
    main: dict[str, str]  # mode -> the law's main constant
    equation: str  # as `retime show` prints it
    mono: Callable | None = None  # (p, r) -> width, s
    astable: Callable | None = None  # (p, r) -> (high, low), s

    @property
    def modes(self) -> tuple[str, ...]:
        return tuple(m for m, f in (("mono", self.mono), ("astable", self.astable)) if f is not None)


def _555_astable(p, r):
    return laws.timer555_astable(p["ra"], p["rb"] + p.get("rp", 0.0), p["c"], p["upper"], p["lower"], p.get("r_dis", 0.0))


def _square(period_of):
    def astable(p, r):
        period = period_of(p, r)
        return period / 2, period / 2
    return astable


LAWS: dict[str, LawSpec] = {
    "krc": LawSpec(
        "krc", ("k",), {"mono": "k"}, "t = K x (R + r_offset) x C",
        mono=lambda p, r: laws.k_rc(p["k"], r, p["c"], p.get("r_offset", 0.0))),
    "timer-555": LawSpec(
        "timer-555", ("upper_threshold", "lower_threshold"), {"mono": "mono_k", "astable": "astable_k"},
        "mono t = ln(1/(1 - upper)) R C (about 1.1 R C); astable f = 1/(ln 2 (RA + 2 RB) C) (about 1.44/((RA+2RB) C))",
        mono=lambda p, r: laws.timer555_mono(r, p["c"], p["upper"]), astable=_555_astable),
    "ln-supply": LawSpec(
        "ln-supply", ("a",), {"mono": "a"}, "t = a x R x C x ln(VDD - VSS)",
        mono=lambda p, r: laws.ln_supply(p["a"], r, p["c"], p["vcc"])),
    "cd4047": LawSpec(
        "cd4047", ("k_mono", "k_astable"), {"mono": "k_mono", "astable": "k_astable"},
        "mono t = k_mono R C; astable period at Q = k_astable R C",
        mono=lambda p, r: laws.cd4047_mono(p["k_mono"], r, p["c"]),
        astable=_square(lambda p, r: laws.cd4047_astable(p["k_astable"], r, p["c"]))),
    "cd4541": LawSpec(
        "cd4541", ("k_osc",), {"astable": "k_osc", "mono": "k_osc"},
        "oscillator period = k_osc Rt Ct, divided by the programmed count",
        astable=_square(lambda p, r: laws.cd4541_oscillator(p["k_osc"], r, p["c"]))),
    # The counter law: N (``divide``, 1 = the oscillator itself) and the delay fraction are
    # the model's params ``n`` and ``delay_fraction`` (advisor.timing.model.build).
    "counter": LawSpec(
        "counter", ("k_osc",), {"astable": "k_osc", "mono": "k_osc"},
        "oscillator period T = k_osc Rt Ct; output period N T at divide ratio N (square); "
        "single interval after reset = fraction x N x T (0.5 for a binary stage)",
        mono=lambda p, r: laws.counter_delay(p["k_osc"], r, p["c"], p.get("n", 1.0), p.get("delay_fraction", 0.5)),
        astable=_square(lambda p, r: laws.counter_period(p["k_osc"], r, p["c"], p.get("n", 1.0)))),
}


def law(name: str) -> LawSpec:
    return LAWS[name]


def main_constant(name: str, mode: str) -> str | None:
    """The law's main constant in ``mode`` (None for an unknown law)."""
    spec = LAWS.get(name)
    if spec is None:
        return None
    return spec.main.get(mode) or next(iter(spec.main.values()), None)
