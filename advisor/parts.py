"""The catalog grammar: records for one part family (one YAML file), validated by pydantic.

Models are frozen and refuse unknown keys, so a typo in a catalog file is an
error with its location instead of a silently ignored value. Summarised for
contributors at the top of ``catalog/README.md``.

Every number a family records is a :class:`Sourced` value (or a list of them when
makers publish different figures): ``{value: 0.7, source: nxp-74hc4538}``. The
``source`` names an entry of the file's ``sources`` list, or one of the reserved
ids ``memory`` (recalled, unverified) and ``common-practice`` (a fact of the
trade with no published source).
"""

from __future__ import annotations

from typing import Literal

from advisor.record import Field, Record, field_validator, model_validator

Function = Literal["timer-555", "monostable", "monostable-astable", "programmable-timer"]
Technology = Literal[
    "bipolar", "cmos-555", "ttl", "ls", "als", "hc", "hct", "ac", "ahc", "ahct", "vhc", "lv", "lvc",
    "cmos-4000",
]
SourceKind = Literal[
    "datasheet", "standard", "textbook", "app-note", "product-page", "distributor-page", "measurement", "forum",
    "memory",
]
Retrigger = Literal["yes", "no", "selectable"]
Edge = Literal["rising", "falling", "level-low", "level-high"]
Level = Literal["low", "high"]
Law = Literal["timer-555", "krc", "ln-supply", "cd4047", "cd4541", "counter"]
#: Product lifecycle, as makers state it: in production; not recommended for new
#: designs; last-time-buy announced; no longer made. ``unknown`` when no statement is recorded.
Status = Literal["active", "nrnd", "last-time-buy", "obsolete", "unknown"]
#: Best first: the order the alternates ranking uses (advisor/substitute/rank.py).
STATUS_ORDER = ("active", "nrnd", "last-time-buy", "unknown", "obsolete")

#: Normalised pin functions. Pin maps compare these, never the makers' labels,
#: because labels differ between makers for the same pin (NXP vs TI 74HC4538).
PinFunction = Literal[
    # supplies
    "VCC", "GND", "NC",
    # 555-class
    "TRIG", "THRES", "DIS", "OUT", "RESET", "CONT",
    # one-shots: edge-trigger inputs (falling = A / -TR style, rising = B / +TR style)
    "TRIG_FALL", "TRIG_RISE", "CLEAR", "Q", "QN",
    # timing network pins
    "CEXT", "RCEXT", "RINT", "REXT",
    # 4047 extras
    "ASTABLE", "ASTABLE_N", "RETRIGGER", "OSC_OUT", "RC_COMMON",
    # 4541 extras
    "RS", "RTC", "CTC", "AUTO_RESET", "MASTER_RESET", "PROG_A", "PROG_B", "MODE", "QSEL",
    # precision timers with a floating output transistor (National LM3905, February 1995 sheet):
    # the transistor's collector and emitter, the output-polarity (logic) input, the reference output
    "OUT_C", "OUT_E", "LOGIC", "VREF",
    # counter timers (law ``counter``): an output of one counter stage, its divide ratio in the pin's note
    "Q_TAP",
]

#: Controls a multi-section part may bring out once for all its sections: such a pin
#: leaves its ``channel`` out (the NE558's common RESET and CONTROL VOLTAGE, Philips NE558
#: product data 2003, Figure 1). ``advisor.catalog`` allows one shared pin per function.
SHARED_PIN_FUNCTIONS = ("RESET", "CLEAR", "CONT")

RESERVED_SOURCES = ("memory", "common-practice")


class _Frozen(Record):
    # Frozen, unknown keys refused (advisor.record); pydantic validates only when YAML is read.
    model_config = {"allow_inf_nan": False}  # NaN/inf refused


class Source(_Frozen):
    """A document the family's numbers come from."""

    id: str
    title: str
    document: str | None = None  # maker's document id and revision, e.g. "SCLS145F"
    kind: SourceKind
    maker: str | None = None  # the maker whose document it is (an id of catalog/makers.yaml)
    note: str | None = None


class Sourced(_Frozen):
    """One published number with its source and the conditions it holds under.

    Conditions are optional ranges: supply (``vcc_min``/``vcc_max``, V) and timing
    capacitance (``c_min``/``c_max``, F). ``maker`` tells which maker's sheet
    published it when makers disagree.
    """

    value: float
    source: str
    vcc_min: float | None = None
    vcc_max: float | None = None
    c_min: float | None = None
    c_max: float | None = None
    maker: str | None = None
    note: str | None = None

    def applies(self, vcc: float | None = None, c: float | None = None) -> bool:
        """True when the value's conditions admit this supply and capacitance."""
        if vcc is not None:
            if self.vcc_min is not None and vcc < self.vcc_min - 1e-9:
                return False
            if self.vcc_max is not None and vcc > self.vcc_max + 1e-9:
                return False
        if c is not None:
            if self.c_min is not None and c < self.c_min * (1 - 1e-9):
                return False
            if self.c_max is not None and c > self.c_max * (1 + 1e-9):
                return False
        return True

    @property
    def unverified(self) -> bool:
        return self.source == "memory"


SourcedList = list[Sourced]

#: How a spread figure was published: ``guaranteed`` limits (min/max columns) or a
#: ``typical`` figure only, which the engine widens by one documented rule
#: (``advisor.timing.spread.TYPICAL_WIDENING``).
SpreadBasis = Literal["guaranteed", "typical"]


class Spread(Sourced):
    """Part-to-part spread of the timing, as fractions of the nominal width or period.

    ``value`` is a symmetric ± fraction; ``minus``/``plus`` give an asymmetric one
    (a sheet's min and max relative to its typical). ``basis`` says whether the
    figure is a guaranteed limit or a typical one. Conditions (supply, C, maker)
    work as on every sourced number: a spread published per supply or per maker
    is a list of entries.
    """

    value: float | None = None
    minus: float | None = None
    plus: float | None = None
    basis: SpreadBasis = "typical"

    @model_validator(mode="after")
    def _given(self) -> "Spread":
        if self.value is None and (self.minus is None or self.plus is None):
            raise ValueError("give value (symmetric fraction) or both minus and plus")
        for name in ("value", "minus", "plus"):
            v = getattr(self, name)
            if v is not None and not 0.0 <= v < 1.0:
                raise ValueError(f"{name} {v!r} is outside 0..1 (a fraction of the nominal, 0.05 = 5 %)")
        return self

    def bounds(self) -> tuple[float, float]:
        """(minus, plus) as published, before any widening."""
        lo = self.minus if self.minus is not None else self.value
        hi = self.plus if self.plus is not None else self.value
        return float(lo), float(hi)

    def text(self) -> str:
        """Short display form: ``±3 % guaranteed`` or ``-5 %/+5.2 % typical``."""
        lo, hi = self.bounds()
        span = f"±{lo * 100:.3g} %" if lo == hi else f"-{lo * 100:.3g} %/+{hi * 100:.3g} %"
        return f"{span} {self.basis}"


class WidthRow(_Frozen):
    """One row of a published table of output widths (s) at a stated R (Ω), C (F) and supply (V).

    ``typ`` is the sheet's typical width; ``min``/``max`` its guaranteed limits when
    the sheet prints them. ``table`` names the table in the source (``"Table 8"``).
    The engine fits the maker's law to the row (``advisor.timing.tables``).
    """

    r: float
    c: float
    vcc: float
    typ: float
    min: float | None = None
    max: float | None = None
    source: str
    table: str
    maker: str | None = None
    note: str | None = None

    @model_validator(mode="after")
    def _ordered(self) -> "WidthRow":
        if self.r <= 0 or self.c <= 0 or self.vcc <= 0 or self.typ <= 0:
            raise ValueError("r, c, vcc and typ must be above zero")
        if self.min is not None and self.min > self.typ:
            raise ValueError(f"min {self.min} is above typ {self.typ}")
        if self.max is not None and self.max < self.typ:
            raise ValueError(f"max {self.max} is below typ {self.typ}")
        return self


class Range(_Frozen):
    min: float
    max: float
    source: str
    note: str | None = None

    @model_validator(mode="after")
    def _ordered(self) -> "Range":
        if self.min > self.max:
            raise ValueError(f"min {self.min} is above max {self.max}")
        return self


class Supply(_Frozen):
    """Supply voltage (V): the recommended operating range and the absolute maximum."""

    recommended: Range
    absolute_max: Sourced


class Counter(_Frozen):
    """The counter of a counter-based timer (law ``counter``), as its datasheet publishes it.

    ``divide_by``: every divide ratio N the part can put on an output (a binary tap 2^n, or
    a programmed count), ascending. ``delay_fraction``: the single timed interval (mono
    mode: from the reset's release to the output's first change) lasts ``delay_fraction``
    × N oscillator periods: 0.5 for a binary stage (stage n's output first rises after
    2^(n-1) counts: Philips HEF4541B, January 1995, function table note 2), 1 for a programmed
    count. ``source`` names the sheet's table (an entry of the file's ``sources``).
    """

    divide_by: list[int] = Field(min_length=1)
    delay_fraction: float = Field(default=0.5, gt=0.0, le=1.0)
    source: str
    note: str | None = None

    @field_validator("divide_by")
    @classmethod
    def _ascending(cls, v: list[int]) -> list[int]:
        if any(n < 1 for n in v):
            raise ValueError(f"divide ratios are whole counts of 1 or more, got {v}")
        if any(b <= a for a, b in zip(v, v[1:])):
            raise ValueError(f"list each divide ratio once, ascending, got {v}")
        return v


class Timing(_Frozen):
    """The timing law and its published constants.

    ``law`` selects the equation (see ``advisor.timing.laws``); ``constants`` maps
    each constant's name to the published values. Required names per law:

    - ``krc``: ``k`` (t = K·(R + r_offset)·C); optional ``r_offset`` (Ω).
    - ``timer-555``: ``upper_threshold`` and ``lower_threshold`` (fractions of the
      supply), optional ``mono_k`` (t = k·R·C, nominally ln 3 ≈ 1.1), ``astable_k``
      (f = k/((RA+2RB)·C), nominally 1.44), ``r_discharge`` (Ω, discharge on-resistance).
    - ``ln-supply``: ``a`` (t = a·R·C·ln(VDD − VSS), the 4528 law).
    - ``cd4047``: ``k_mono`` (t = k·R·C), ``k_astable`` (period at Q = k·R·C).
    - ``cd4541``: ``k_osc`` (oscillator period = k·Rt·Ct; the oscillator alone, kept for
      local catalogs written before the counter law).
    - ``counter``: ``k_osc`` (oscillator period T = k·Rt·Ct) and a ``counter`` block: the
      output is the oscillator divided by a ratio N chosen from the family's published
      ``counter.divide_by`` (``advisor.timing.laws.counter_period``).
    """

    law: Law
    constants: dict[str, SourcedList]
    r_internal: Sourced | None = None  # on-chip timing resistor (74121, 74122)
    c_linear_min: Sourced | None = None  # C below which the law stops holding
    f_max: Sourced | None = None  # frequency above which the formula stops holding (Hz)
    width_min: Sourced | None = None
    width_max: Sourced | None = None
    #: Part-to-part spread of the timing; one entry, or a list per supply / maker.
    spread: list[Spread] = Field(default_factory=list)
    #: Published min/typ/max width tables (rows), honoured by the law.
    widths: list[WidthRow] = Field(default_factory=list)
    #: Counter-based timers (law ``counter``): the divide ratios the part can select.
    counter: Counter | None = None
    note: str | None = None

    @field_validator("spread", mode="before")
    @classmethod
    def _one_or_many(cls, v):
        return [v] if isinstance(v, dict) else v


class Components(_Frozen):
    """Limits on the external timing network (Ω, F). Lists hold per-supply values."""

    r_min: SourcedList = Field(default_factory=list)
    r_max: SourcedList = Field(default_factory=list)
    c_min: SourcedList = Field(default_factory=list)
    c_max: SourcedList = Field(default_factory=list)
    electrolytic: str | None = None  # how to fit a polarised Cext on this part
    note: str | None = None


class TriggerInput(_Frozen):
    """One trigger input: its name, active edge or level, Schmitt or not, and
    the level the *other* inputs must sit at to enable it."""

    name: str
    function: PinFunction
    edge: Edge
    schmitt: bool
    enable: dict[str, Level] = Field(default_factory=dict)  # other input function -> level
    note: str | None = None


class Clear(_Frozen):
    name: str
    active: Level
    ends_pulse: bool
    triggers_on_release: bool
    source: str
    note: str | None = None


class Behaviour(_Frozen):
    retrigger: Retrigger
    retrigger_source: str
    triggers: list[TriggerInput] = Field(default_factory=list)
    clear: Clear | None = None
    power_up: str | None = None
    retrigger_min: Sourced | None = None  # shortest retrigger spacing, s
    recovery: Sourced | None = None  # time after a pulse before the next trigger, s
    note: str | None = None


class Interface(_Frozen):
    """Input levels and output drive.

    ``inputs``: ``ttl`` (VIH 2.0 V, VIL 0.8 V) or ``cmos`` (fractions of VCC).
    ``vih``/``vil`` are either absolute (V) with ``at_vcc`` or ``fraction`` of VCC.
    ``outputs``: ``push-pull`` (drives both levels: TTL totem pole, CMOS), ``open-collector``
    (sinks only: each used output needs a pull-up to VCC, NE558) or ``transistor`` (a
    floating output transistor whose collector and emitter are both pins, LM3905).
    """

    inputs: Literal["ttl", "cmos"]
    outputs: Literal["push-pull", "open-collector", "transistor"] = "push-pull"
    vih: Sourced | None = None
    vih_fraction: Sourced | None = None
    vil: Sourced | None = None
    vil_fraction: Sourced | None = None
    input_clamp_to_vcc: bool = True
    output_source_ma: Sourced | None = None
    output_sink_ma: Sourced | None = None
    note: str | None = None


class MakerStatus(_Frozen):
    """One maker's lifecycle statement for its version of the family."""

    maker: str
    status: Status
    as_of: str  # when the statement was read: YYYY, YYYY-MM or YYYY-MM-DD
    source: str
    note: str | None = None

    @field_validator("as_of")
    @classmethod
    def _date(cls, v: str) -> str:
        return _check_date(v)


def _check_date(v: str) -> str:
    import re

    if not re.fullmatch(r"(19|20)\d\d(-(0[1-9]|1[0-2])(-(0[1-9]|[12]\d|3[01]))?)?", str(v)):
        raise ValueError("expected a date YYYY, YYYY-MM or YYYY-MM-DD")
    return str(v)


class Lifecycle(_Frozen):
    """The family's lifecycle status, when and where it was stated, and per-maker
    statements where makers differ (one maker may still make a part another dropped).

    ``status`` is the family's status for a buyer: the best status any maker states
    (a part one maker still makes can be bought), unless given otherwise.
    """

    status: Status
    as_of: str
    source: str  # an entry of the file's sources, or memory / common-practice
    note: str | None = None
    makers: list[MakerStatus] = Field(default_factory=list)

    @field_validator("as_of")
    @classmethod
    def _date(cls, v: str) -> str:
        return _check_date(v)


#: Keys of a pin's ``tie``: every use, the circuit's mode, or a counter's divide ratio ("/1024").
TIE_USES = ("any", "mono", "astable")


class Pin(_Frozen):
    pin: int
    name: str  # the maker's label, kept for display
    function: PinFunction
    channel: int | None = None  # 1-based section number; None for shared pins
    note: str | None = None
    #: A control input the old part may lack (a 4047's ASTABLE, a 4541's A/B/MODE): the
    #: level it is tied to, by use (:data:`TIE_USES` or "/N"), read from the maker's
    #: function or selection table named by ``tie_source``; ``tie_why`` says what it sets.
    tie: dict[str, Literal["VCC", "GND"]] = Field(default_factory=dict)
    tie_why: str | None = None
    tie_source: str | None = None

    def tie_level(self, mode: str | None, divide: int | None) -> str | None:
        """The level for this use: the divide ratio's entry first, then the mode's, then ``any``."""
        for key in (f"/{divide}" if divide is not None else None, mode, "any"):
            if key is not None and key in self.tie:
                return self.tie[key]
        return None


class Package(_Frozen):
    name: str  # e.g. DIP-16
    pins: list[Pin]
    source: str
    same_as: str | None = None  # another package name with the same pinout (kept short)
    note: str | None = None  # e.g. which pins the source confirms and which are from memory

    @field_validator("pins")
    @classmethod
    def _unique_pins(cls, pins: list[Pin]) -> list[Pin]:
        seen: set[int] = set()
        for p in pins:
            if p.pin in seen:
                raise ValueError(f"pin {p.pin} listed twice")
            seen.add(p.pin)
        return pins

    def by_function(self, channel: int | None = None) -> dict[str, list[int]]:
        """Pin numbers by normalised function for one channel (shared pins included)."""
        out: dict[str, list[int]] = {}
        for p in self.pins:
            if channel is None or p.channel in (None, channel):
                out.setdefault(p.function, []).append(p.pin)
        return out


class Family(_Frozen):
    """One part family: the trade's generic number and everything the tool needs."""

    id: str
    title: str
    function: Function
    technology: Technology
    channels: int = 1
    status: Status = "unknown"  # filled from ``lifecycle`` when that block is given
    lifecycle: Lifecycle | None = None
    part_numbers: list[str]  # recognised base forms; maker prefixes/suffixes are generic
    supply: Supply
    timing: Timing
    components: Components
    behaviour: Behaviour
    interface: Interface
    packages: list[Package]
    sources: list[Source]
    see_also: list[str] = Field(default_factory=list)
    cautions: list[str] = Field(default_factory=list)
    note: str | None = None

    @model_validator(mode="before")
    @classmethod
    def _status_from_lifecycle(cls, data):
        """``status`` comes from the ``lifecycle`` block; both given must agree."""
        if isinstance(data, dict) and isinstance(data.get("lifecycle"), dict):
            life = data["lifecycle"].get("status")
            if "status" in data and life is not None and data["status"] != life:
                raise ValueError(f"status {data['status']!r} disagrees with lifecycle.status {life!r}; give it once, in lifecycle")
            if life is not None:
                data = {**data, "status": life}
        return data

    def source(self, source_id: str) -> Source | None:
        for s in self.sources:
            if s.id == source_id:
                return s
        return None

    def constant(self, name: str, vcc: float | None = None, c: float | None = None) -> list[Sourced]:
        """Published values of a timing constant that apply at this supply and C."""
        return [v for v in self.timing.constants.get(name, []) if v.applies(vcc, c)]

    def default_package(self) -> Package:
        return self.packages[0]

    def has_discharge(self) -> bool | None:
        """Whether the default pinout has a 555 DISCHARGE pin: False for a 555 pinout without
        one (the 5-pin MIC1555 feeds its timing resistor from OUT: Micrel M9999-052610-D,
        May 2010, Figures 1 and 3), None when there is no 555 pinout (no THRES pin) at all."""
        functions = {p.function for p in self.packages[0].pins} if self.packages else set()
        if "DIS" in functions:
            return True
        return False if "THRES" in functions else None
