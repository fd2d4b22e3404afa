"""One validated description of a timer or one-shot circuit, shared by every front end.

The CLI flags, the TUI form and BOM rows all build a :class:`Circuit`; the engine
reads only this. Quantities are SI base units (Ω, F, s, Hz, V); tolerances are
fractions (0.05 = 5 %).
"""

from __future__ import annotations

from dataclasses import asdict, dataclass, field, replace
from typing import Literal

from advisor.errors import InputError
from advisor.values import check_plausible

Mode = Literal["mono", "astable"]
Measured = Literal["width", "high", "low", "period"]
TargetKind = Literal["width", "period", "freq"]

#: Tolerances assumed when the user gives none, shown in every result that uses them.
#: 5 % resistors and 10 % capacitors: common practice for E24 parts and film/C0G capacitors.
DEFAULT_R_TOL = 0.05
DEFAULT_C_TOL = 0.10


def _series_tol(series: str) -> float:
    from advisor.eseries import tolerance

    return tolerance(series)


@dataclass(frozen=True)
class Trigger:
    period: float | None = None  # s
    edge: Literal["rising", "falling"] | None = None
    high: float | None = None  # V, the driving signal's high level


@dataclass(frozen=True)
class Measurement:
    """A measured time of the real circuit (s), typed or read from a scope capture.

    ``capture`` is the compact summary of the capture it came from (file, channels,
    thresholds, the first edges; built by ``advisor.measure.summary``), carried into
    the results' ``capture`` key so the front ends can draw the measured trace.
    It is a record of where the value came from, not part of the value: it takes no
    part in comparisons.
    """

    quantity: Measured
    value: float  # s
    capture: dict | None = field(default=None, compare=False)


@dataclass(frozen=True)
class Target:
    kind: TargetKind
    value: float  # s for width/period, Hz for freq
    duty: float | None = None  # astable high fraction, 0..1
    range: tuple[float, float] | None = None  # adjustment range (s), from --range


@dataclass(frozen=True)
class Circuit:
    """A timing circuit: part, mode, supply, network, tolerances, trigger, measurement, target.

    ``r`` is the main timing resistor (Rext, or RA for a 555 monostable); ``ra``/``rb``
    are the 555 astable pair. ``pot`` is a variable resistor in series with the main
    timing resistor (RB in an astable), ``pot_setting`` the fraction of its travel in
    circuit (0 = shorted).
    """

    part: str
    vcc: float | None = None
    mode: Mode | None = None
    r: float | None = None
    ra: float | None = None
    rb: float | None = None
    c: float | None = None
    pot: float | None = None
    pot_setting: float | None = None
    r_tol: float | None = None
    c_tol: float | None = None
    trigger: Trigger = field(default_factory=Trigger)
    measured: Measurement | None = None
    target: Target | None = None
    cont: float | None = None  # V, a 555's control pin driven to this voltage (None: open)
    pot_in: Literal["ra", "rb"] | None = None  # 555 astable: the resistor the trimmer sits with (default ra)
    pot_tol: float | None = None  # the trimmer's own tolerance on its full value (default 20 %)
    pot_end: float | None = None  # Ω left in circuit at each stop of the trimmer (default: its class)
    r_series: str | None = None  # E-series the user chose for resistors: its tolerance when --r-tol is absent
    c_series: str | None = None  # E-series the user chose for capacitors: likewise for --c-tol
    #: Counter-based timers (law ``counter``): the divide ratio N on the output used, one of the
    #: family's ``timing.counter.divide_by`` (checked against it in advisor.timing.model.build).
    divide: int | None = None
    #: Makers the part number (or ``--maker``) names, as ids of catalog/makers.yaml; empty
    #: when it names none. ``maker_basis`` says how: "part-number prefix" or "--maker".
    makers: tuple[str, ...] = ()
    maker_basis: str | None = None
    #: The part number as the user gave it (SN74LS221N, MM74HC123AN), when it is not the bare
    #: family id: every answer repeats it beside the family it was read as.
    part_number: str | None = field(default=None, compare=False)
    #: How unusual input forms were read (an old MFD marking, a capacitor code) and the
    #: marks kept after values (tolerance letter, rating): shown in every answer's assumptions.
    notes: tuple[str, ...] = field(default=(), compare=False)

    def __post_init__(self) -> None:
        _check_quantities(self)
        if self.pot_setting is not None and not 0.0 <= self.pot_setting <= 1.0:
            raise InputError(
                f"pot setting {self.pot_setting!r} is outside 0..1", got=self.pot_setting,
                expected="a fraction of the travel from 0 (shorted) to 1 (full value)",
            )
        if self.pot_setting is not None and self.pot is None:
            raise InputError("--pot-setting needs --pot (the variable resistor's value)")
        if self.pot_in is not None and self.pot_in not in ("ra", "rb"):
            raise InputError(f"pot position {self.pot_in!r} is not ra or rb", got=self.pot_in, expected="ra or rb")
        if self.pot_end is not None and self.pot is not None and not 0 <= self.pot_end < self.pot / 2:
            raise InputError(f"trimmer end resistance {self.pot_end:g} Ω must lie between 0 and half the trimmer's "
                             f"{self.pot:g} Ω", got=self.pot_end)
        if self.divide is not None and (isinstance(self.divide, bool) or not isinstance(self.divide, int)
                                        or self.divide < 1):
            raise InputError(f"divide ratio {self.divide!r} is not a whole count of 1 or more", got=self.divide,
                             expected="a divide ratio the part can select, such as 1024")
        for name in ("r_tol", "c_tol", "pot_tol"):
            v = getattr(self, name)
            if v is not None and not 0.0 <= v < 1.0:
                raise InputError(f"{name.replace('_', ' ')} {v!r} is outside 0..1", got=v, expected="a fraction such as 0.05 or 5%")
        if self.mode == "astable" and self.r is not None and self.ra is None:
            object.__setattr__(self, "ra", self.r)
            object.__setattr__(self, "r", None)

    @property
    def r_tolerance(self) -> float:
        """--r-tol, else the chosen series' tolerance (E96: 1 %, IEC 60063), else 5 %."""
        if self.r_tol is not None:
            return self.r_tol
        return _series_tol(self.r_series) if self.r_series else DEFAULT_R_TOL

    @property
    def c_tolerance(self) -> float:
        if self.c_tol is not None:
            return self.c_tol
        return _series_tol(self.c_series) if self.c_series else DEFAULT_C_TOL

    @property
    def tolerances_defaulted(self) -> dict[str, bool]:
        return {"r_tol": self.r_tol is None, "c_tol": self.c_tol is None}

    def with_(self, **changes: object) -> "Circuit":
        """A copy with some fields changed (validated again)."""
        return replace(self, **changes)

    def to_json(self) -> dict:
        d = asdict(self)
        d["r_tol"] = self.r_tolerance
        d["c_tol"] = self.c_tolerance
        d["tolerances_defaulted"] = self.tolerances_defaulted
        return d


#: The quantities of a circuit and their kinds (advisor.values.KINDS), for the plausibility check.
_QUANTITIES = (
    ("vcc", "voltage", "supply (vcc)"), ("r", "resistance", "timing resistor (r)"), ("ra", "resistance", "RA"),
    ("rb", "resistance", "RB"), ("pot", "resistance", "variable resistor (pot)"),
    ("c", "capacitance", "timing capacitor (c)"), ("cont", "voltage", "control voltage (cont)"),
)


def _check_quantities(circuit: Circuit) -> None:
    """Every value finite, of the right sign and plausible (advisor.values.Limits), whoever built it."""
    for name, kind, label in _QUANTITIES:
        value = getattr(circuit, name)
        if value is not None:
            check_plausible(value, kind, label)
    trig = circuit.trigger
    if trig.period is not None:
        check_plausible(trig.period, "time", "trigger period")
    if trig.high is not None:
        check_plausible(trig.high, "voltage", "trigger high level")
    if circuit.measured is not None:
        check_plausible(circuit.measured.value, "time", f"measured {circuit.measured.quantity}")
    if circuit.target is not None:
        tgt = circuit.target
        check_plausible(tgt.value, "frequency" if tgt.kind == "freq" else "time", f"target {tgt.kind}")
        if tgt.range is not None:
            for end in tgt.range:
                check_plausible(end, "time", "target range")
