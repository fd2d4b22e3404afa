"""Bind a family's law and constants to one circuit: the timing model.

A :class:`Model` holds the nominal inputs (``params``), the interval each input may
take (``ranges``: component tolerances, published-constant spread, part-to-part
spread) and ``times(params)``, which evaluates the law for scalars or numpy arrays.
The band, the Monte Carlo run, the adjustment range and inverse design all work
through this one object, so every law gets all of them.

Parameter names: ``r`` fixed main resistor (Rext, RA of a 555 monostable), ``rp``
the wiper position of the variable resistor (0 … its value; :meth:`Model.pot_r` turns
it into the resistance in circuit, end resistance and tolerance ``kp`` included),
``ra``/``rb`` the 555 astable pair (the variable resistor adds to RA by default,
``pot_in="rb"`` puts it with RB), ``c`` , ``vcc``, the law's constants by name,
``kf`` (555: ratio of a published rounded constant to the exact law),
``fit`` (a maker's published width table against its law, ``advisor.timing.tables``)
and ``spread`` (part-to-part multiplier, nominal 1).

Makers' figures are alternatives (``advisor.timing.alternatives``): the model's
``params``/``ranges`` are those of the first alternative in use (the nominal), and
``alternatives`` holds each one's own constants, fit and spread; the band and the
Monte Carlo run over all of them (:meth:`Model.for_alternative`).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace

from advisor.circuit import Circuit
from advisor.errors import InputError
from advisor.parts import Family
from advisor.timing import laws, registry
from advisor.timing.alternatives import Alternative, MakerChoice, alternatives, choose
from advisor.timing.constants import Constant
from advisor.timing.spread import NO_SPREAD, PartSpread, part_spread
from advisor.timing.tables import TableFit, fit_table

#: Times of each mode's result, in the order reports show them.
MONO_KEYS = ("width",)
ASTABLE_KEYS = ("high", "low", "period", "frequency", "duty")
TIME_KEYS = ("width", "high", "low", "period")

#: Supply assumed when none is given (common practice: the usual logic supply).
DEFAULT_VCC = 5.0
#: Setting assumed for a variable resistor whose setting is not given.
DEFAULT_POT_SETTING = 0.5
#: A trimmer's tolerance on its full value when none is given (common practice:
#: cermet and carbon trimmers are sold at ±20 %, some at ±10 %).
DEFAULT_POT_TOL = 0.20


def pot_end_class(pot: float) -> float:
    """Resistance left at each stop of a trimmer when none is given (Ω): 1 % of its value
    or 2 Ω, whichever is greater (from memory: the end-resistance class makers state for
    cermet trimmers; give --pot-end for the part fitted). A trimmer at "zero" is never 0 Ω."""
    return max(0.01 * pot, 2.0)


@dataclass
class Model:
    family: Family
    law: str
    mode: str  # "mono" | "astable"
    params: dict[str, float]
    ranges: dict[str, tuple[float, float]]
    constants: dict[str, Constant]
    pot: float | None = None
    pot_setting: float | None = None
    assumptions: list[str] = field(default_factory=list)
    r_internal: bool = False
    tolerance_kind: dict[str, str] = field(default_factory=dict)  # param -> "r" | "c" | "const" | "spread" | "pot"
    cont: float | None = None  # V, driven 555 control pin
    pot_in: str | None = None  # 555 astable: "ra" or "rb", the resistor the trimmer adds to
    pot_end: float = 0.0  # Ω in circuit at each stop of the trimmer
    divide: int | None = None  # counter law: the divide ratio N given (None: the oscillator itself)

    def pot_r(self, p: dict) -> float:
        """The trimmer's resistance in circuit (Ω) for the wiper position ``rp`` (0 … pot):
        the end resistance at the zero stop, the full value (× its tolerance factor ``kp``)
        less the end resistance at the other stop, linear in between."""
        rp = p.get("rp", 0.0)
        if not self.pot:
            return rp
        s = rp / self.pot
        return self.pot_end + s * (self.pot * p.get("kp", 1.0) - 2.0 * self.pot_end)
    alternatives: list["AltParams"] = field(default_factory=list)  # makers' formulas in use, nominal first
    maker: str | None = None  # the maker whose constant the nominal uses (None: unknown)
    maker_basis: str = "unknown: band spans makers"

    def for_alternative(self, alt: "AltParams") -> "Model":
        """This model with one maker's constants, fit and spread in place of the nominal's."""
        keys = {k for a in self.alternatives for k in a.params}
        p = {k: v for k, v in self.params.items() if k not in keys}
        p.update(alt.params)
        rng = {k: v for k, v in self.ranges.items() if k not in keys}
        rng.update(alt.ranges)
        kinds = {k: v for k, v in self.tolerance_kind.items() if k not in keys}
        kinds.update({k: ("spread" if k == "spread" else "const") for k in alt.ranges})
        return replace(self, params=p, ranges=rng, tolerance_kind=kinds, constants=dict(alt.constants),
                       alternatives=[alt])

    @property
    def keys(self) -> tuple[str, ...]:
        return MONO_KEYS if self.mode == "mono" else ASTABLE_KEYS

    @property
    def main_quantity(self) -> str:
        return "width" if self.mode == "mono" else "period"

    def times(self, p: dict | None = None) -> dict:
        """Evaluate the law: {"width"} or {"high","low","period","frequency","duty"} (s, Hz)."""
        p = self.params if p is None else p
        s = p.get("spread", 1.0) * p.get("kf", 1.0) * p.get("fit", 1.0)
        spec = registry.law(self.law)  # the one registry of laws (advisor.timing.registry)
        rpot = self.pot_r(p)  # the trimmer's resistance in circuit (end resistance, tolerance)
        if self.mode == "mono":
            if spec.mono is None:  # pragma: no cover - guarded in build()
                raise InputError(f"law {self.law!r} has no monostable form")
            r = p["r"] + rpot
            return {"width": spec.mono(p, r) * s}
        if "ra" in p and "rb" in p:  # 555 astable: the trimmer sits with RA or RB
            in_ra = self.pot_in == "ra"
            p = {**p, "rp": 0.0, "ra": p["ra"] + (rpot if in_ra else 0.0), "rb": p["rb"] + (0.0 if in_ra else rpot)}
        th, tl = spec.astable(p, p.get("r", 0.0) + rpot)
        th, tl = th * s, tl * s
        period = th + tl
        if isinstance(period, float) and not period > 0:  # no resistance: advisor.timing.domain refuses it
            return {"high": th, "low": tl, "period": period, "frequency": float("inf"), "duty": float("nan")}
        return {"high": th, "low": tl, "period": period, "frequency": 1.0 / period, "duty": th / period}

    def at(self, **changes: float) -> dict:
        """A copy of the nominal params with some changed (e.g. ``rp=0``)."""
        p = dict(self.params)
        p.update(changes)
        return p

    def with_params(self, **changes: float) -> "Model":
        """A model with some nominal inputs changed; ranges follow the tolerances."""
        p = self.at(**changes)
        rng = dict(self.ranges)
        for k, v in changes.items():
            if k in rng and k in self.tolerance_kind and self.tolerance_kind[k] in ("r", "c"):
                lo, hi = self.ranges[k]
                nom = self.params[k]
                rng[k] = (v * lo / nom, v * hi / nom) if nom else (v, v)
        return replace(self, params=p, ranges=rng)


def resolve_mode(family: Family, circuit: Circuit) -> str:
    fn = family.function
    if fn == "programmable-timer":
        # A counter timer's single interval (reset released -> output's first change) is its
        # "mono" mode; the divided square wave (the default) its astable mode.
        if family.timing.law == "counter" and circuit.mode == "mono":
            return "mono"
        return "astable"
    if fn == "monostable":
        if circuit.mode == "astable":
            raise InputError(f"{family.id} is a one-shot; it has no astable mode", got="astable", expected="--mode mono")
        return "mono"
    return circuit.mode or "mono"


def default_vcc(family: Family) -> float:
    rec = family.supply.recommended
    return min(max(DEFAULT_VCC, rec.min), rec.max)


def build(family: Family, circuit: Circuit, *, need_network: bool = True) -> Model:
    """The model for ``circuit`` on ``family``; raises InputError when values are missing.

    With ``need_network=False`` missing resistors are allowed (set to 1 Ω) so inverse
    design can reuse the constants and ranges.
    """
    mode = resolve_mode(family, circuit)
    law = family.timing.law
    assumptions: list[str] = []
    vcc = circuit.vcc
    if vcc is None:
        vcc = default_vcc(family)
        assumptions.append(f"supply {vcc:g} V (not given)")
    c = circuit.c
    if c is None:
        if need_network:
            raise InputError(f"{family.id}: give the timing capacitor (--c)", expected="a capacitance such as 10n")
        c = 1e-9
    rt, ct = circuit.r_tolerance, circuit.c_tolerance
    params: dict[str, float] = {"vcc": vcc, "c": c, "rp": 0.0}
    ranges: dict[str, tuple[float, float]] = {"c": (c * (1 - ct), c * (1 + ct))}
    kinds: dict[str, str] = {"c": "c"}
    pot, setting = circuit.pot, circuit.pot_setting
    if pot is not None:
        if setting is None:
            setting = DEFAULT_POT_SETTING
            assumptions.append(f"variable resistor at {setting:.0%} of its travel (setting not given)")
        params["rp"] = pot * setting
        pot_tol = DEFAULT_POT_TOL if circuit.pot_tol is None else circuit.pot_tol
        if circuit.pot_tol is None:
            assumptions.append(f"trimmer tolerance ±{pot_tol:.0%} (assumed; --pot-tol)")
        if pot_tol > 0:
            params["kp"] = 1.0
            ranges["kp"] = (1.0 - pot_tol, 1.0 + pot_tol)
            kinds["kp"] = "pot"
        pot_end = circuit.pot_end if circuit.pot_end is not None else pot_end_class(pot)
        if circuit.pot_end is None:
            assumptions.append(f"trimmer end resistance {pot_end:g} Ω at each stop (assumed from the cermet "
                               "class, from memory; --pot-end)")
    else:
        pot_end = 0.0
    pot_in = None
    if pot is not None and mode == "astable" and law == "timer-555":
        pot_in = circuit.pot_in or "ra"

    r_internal = False
    if mode == "astable" and law == "timer-555":
        ra, rb = circuit.ra, circuit.rb
        if ra is None and circuit.r is not None:
            ra = circuit.r
        if ra is None or rb is None:
            if need_network:
                raise InputError(f"{family.id} astable: give --ra and --rb (and --c)", expected="resistances such as 4k7")
            ra, rb = ra or 1.0, rb or 1.0
        for name, v in (("ra", ra), ("rb", rb)):
            params[name] = v
            ranges[name] = (v * (1 - rt), v * (1 + rt))
            kinds[name] = "r"
    else:
        r = circuit.r if circuit.r is not None else circuit.ra
        if r is None and family.timing.r_internal is not None and circuit.pot is None:
            r = family.timing.r_internal.value
            r_internal = True
            assumptions.append(f"internal timing resistor {r:g} Ω (no external R given)")
        if r is None:
            if need_network:
                raise InputError(f"{family.id}: give the timing resistor (--r) and capacitor (--c)", expected="e.g. --r 10k --c 10n")
            r = 1.0
        params["r"] = r
        # An on-chip resistor has its own spread, usually wider than a 5 % part; without a
        # published figure the resistor tolerance stands in for it.
        ranges["r"] = (r * (1 - rt), r * (1 + rt))
        kinds["r"] = "r"
        if mode == "astable" and law not in ("cd4047", "cd4541", "counter"):
            raise InputError(f"{family.id}: law {law!r} has no astable form", got="astable", expected="--mode mono")

    needed = {
        "krc": ("k", "r_offset"),
        "ln-supply": ("a",),
        "cd4047": ("k_mono",) if mode == "mono" else ("k_astable",),
        "cd4541": ("k_osc",),
        "counter": ("k_osc",),
        "timer-555": ("upper_threshold", "lower_threshold", "r_discharge"),
    }[law]
    if mode == "mono":
        needed = tuple(n for n in needed if n != "r_discharge")  # it only holds C at zero between pulses
    if law == "timer-555":
        needed += ("mono_k",) if mode == "mono" else ("astable_k",)
    _bind_divide(family, circuit, mode, params, assumptions)
    cont = getattr(circuit, "cont", None)
    if law == "timer-555" and cont is not None and not 0 < cont < vcc:
        raise InputError(f"control voltage {cont:g} V must lie between 0 and the supply {vcc:g} V", got=cont)
    choice = choose(family, alternatives(family, needed, vcc, c), circuit.makers, circuit.maker_basis)
    assumptions.extend(choice.notes)
    base = Model(family=family, law=law, mode=mode, params=params, ranges=ranges, constants={},
                 tolerance_kind=kinds, cont=getattr(circuit, "cont", None) if law == "timer-555" else None)
    alts = [_alt_params(base, a, circuit, vcc, c) for a in choice.alternatives]
    nominal = alts[0]
    params.update(nominal.params)
    ranges.update(nominal.ranges)
    kinds.update({k: ("spread" if k == "spread" else "const") for k in nominal.ranges})
    constants = dict(nominal.constants)
    return Model(
        family=family, law=law, mode=mode, params=params, ranges=ranges, constants=constants,
        pot=pot, pot_setting=setting if pot is not None else None, assumptions=assumptions,
        r_internal=r_internal, tolerance_kind=kinds, cont=getattr(circuit, "cont", None) if law == "timer-555" else None,
        alternatives=alts, maker=choice.maker, maker_basis=choice.basis, pot_in=pot_in, pot_end=pot_end,
        divide=circuit.divide if law == "counter" else None,
    )


def divide_choices(family: Family) -> tuple[int, ...]:
    """The divide ratios a counter timer publishes (``timing.counter.divide_by``); () otherwise."""
    counter = family.timing.counter
    return tuple(counter.divide_by) if family.timing.law == "counter" and counter is not None else ()


def _listed(counts: tuple[int, ...]) -> str:
    return ", ".join(str(n) for n in counts)


def check_divide(family: Family, divide: int | None, flag: str = "--divide") -> None:
    """Refuse a divide ratio the family cannot select, or one given to a part without a counter."""
    if divide is None:
        return
    choices = divide_choices(family)
    if not choices:
        raise InputError(f"{flag} {divide}: the {family.id} has no counter to divide by (law "
                         f"{family.timing.law!r}); leave {flag} out", got=divide,
                         expected="a counter-based timer (programmable timer) for a divide ratio")
    if divide not in choices:
        nearest = min(choices, key=lambda n: abs(math.log(n / divide)))
        raise InputError(f"{flag} {divide} is not a divide ratio the {family.id} can select (nearest: {nearest})",
                         got=divide, expected=f"one of {_listed(choices)} (catalog timing.counter.divide_by)")


def _bind_divide(family: Family, circuit: Circuit, mode: str, params: dict, assumptions: list[str]) -> None:
    """Counter law: the divide ratio N and the delay fraction as the model's params ``n``,
    ``delay_fraction`` (advisor.timing.registry, law ``counter``)."""
    check_divide(family, circuit.divide)
    if family.timing.law != "counter":
        return
    counter = family.timing.counter
    params["delay_fraction"] = counter.delay_fraction if counter is not None else 0.5
    if circuit.divide is not None:
        params["n"] = float(circuit.divide)
        return
    if mode == "mono":
        raise InputError(f"{family.id}: give the divide ratio (--divide N) for the single interval",
                         expected=f"one of {_listed(divide_choices(family))}")
    params["n"] = 1.0
    assumptions.append(f"no divide ratio given (--divide): times are the {family.id}'s oscillator itself; the "
                       f"counter outputs divide it by {_listed(divide_choices(family))}")


@dataclass(frozen=True)
class AltParams:
    """One maker's formula bound to the circuit: its params and ranges, spread and fit."""

    label: str
    maker: str | None
    source: str
    params: dict
    ranges: dict
    constants: dict
    spread: PartSpread = NO_SPREAD
    table: TableFit | None = None

    def to_json(self) -> dict:
        return {"maker": self.maker, "source": self.source, "label": self.label,
                "constants": {k: v.to_json() for k, v in self.constants.items()},
                "spread": self.spread.to_json(), "table": self.table.to_json() if self.table else None}


_PARAM = {"upper_threshold": "upper", "lower_threshold": "lower", "r_discharge": "r_dis"}


def _alt_params(base: Model, alt: Alternative, circuit: Circuit, vcc: float, c: float) -> AltParams:
    """Params, ranges, spread and table fit of one alternative on ``base``'s circuit."""
    fam, mode = base.family, base.mode
    params: dict[str, float] = {}
    ranges: dict[str, tuple[float, float]] = {}
    consts = dict(alt.constants)
    for name, const in consts.items():
        if name in ("mono_k", "astable_k"):
            continue
        key = _PARAM.get(name, name)
        params[key] = const.nominal
        ranges[key] = (const.min, const.max)
    if base.law == "timer-555":
        params.setdefault("upper", 2.0 / 3.0)
        params.setdefault("lower", 1.0 / 3.0)
        u, l = params["upper"], params["lower"]
        cont = getattr(circuit, "cont", None)
        if cont is not None:
            # Driving CONT moves both comparator references: THRES trips at Vc, TRIG at Vc/2
            # (TI NE555 SLFS022 functional description).
            params["upper"], params["lower"] = cont / vcc, cont / (2 * vcc)
            ranges.pop("upper", None)
            ranges.pop("lower", None)
        name = "mono_k" if mode == "mono" else "astable_k"
        if name in consts:
            kf = _published_factor(consts[name], mode, {**base.params, **params}, u, l)
            params["kf"] = 1.0
            ranges["kf"] = kf
    spread = part_spread(fam, alt.maker, alt.source, vcc, c)
    table = None
    if mode == "mono" and alt.rows:
        probe = replace(base, params={**base.params, **params}, ranges={})

        def law(r: float, cc: float, v: float) -> float:
            return probe.times({**probe.params, "r": r, "rp": 0.0, "c": cc, "vcc": v})["width"]

        table = fit_table(list(alt.rows), law, vcc, c)
        if table is not None:
            params["fit"] = table.fit
            if table.minus is not None and table.plus is not None:
                spread = PartSpread(table.minus, table.plus, "table",
                                    tuple(dict.fromkeys(r.source for r in table.rows)))
    if spread.minus > 0 or spread.plus > 0:
        params["spread"] = 1.0
        ranges["spread"] = (1 - spread.minus, 1 + spread.plus)
    return AltParams(alt.label, alt.maker, alt.source, params, ranges, consts, spread, table)


def _published_factor(const: Constant, mode: str, p: dict, u: float, l: float) -> tuple[float, float]:
    """555: the rounded published constants (1.1, 1.44, one maker's 1.38) against the exact law.

    The exact law is the nominal; each published constant's ratio to it widens the
    band, so the spread between makers shows in min/max (design guide, catalog).
    """
    if mode == "mono":
        exact = laws.timer555_mono(1.0, 1.0, u)
        ratios = [k / exact for k in (const.min, const.max)]
    else:
        ra, rb = p["ra"], p["rb"] + p.get("rp", 0.0)
        th, tl = laws.timer555_astable(ra, rb, 1.0, u, l)
        if not 0 < th + tl < float("inf"):
            return (1.0, 1.0)  # no period to compare with (RA + RB = 0): advisor.timing.domain refuses the circuit
        ratios = [((ra + 2 * rb) / k) / (th + tl) for k in (const.min, const.max)]
    return (min(ratios + [1.0]), max(ratios + [1.0]))
