"""Pin map: which old pin's net goes to which new pin, channel by channel.

Pins are compared by their normalised function (:data:`advisor.parts.PinFunction`),
never by the makers' labels, because labels differ between makers for the same
pin (NXP vs TI/onsemi 74HC4538 sheets label the same pins differently). The map answers, for one old part → new part:

- links: old pin → new pin carrying the same net (power, trigger, clear, outputs,
  timing network), with the channel each belongs to;
- trigger polarity: the active edge's net must reach the new part's input for that
  edge, and the new part's other inputs are tied to the level that enables it
  (``TriggerInput.enable``); the old board's enable ties are not carried over,
  because parts enable the same edge with different levels (a 4538 enables its
  falling input with A low, a 74HC221 with nB high);
- ties: new inputs with no old net (unused channels, enable levels, a clear the
  old part lacked), each with the level and why;
- unmatched: old pins with no counterpart, each with what to do and whether the
  lack blocks a like-for-like swap (no equivalent input → redesign);
- additions: parts to add, e.g. an external timing resistor where the old board
  used the old part's internal one (74121 Rint → a part without one).

The map is pure data; :mod:`advisor.substitute.rework` turns it into bench steps
and :mod:`advisor.substitute.classify` judges it.
"""

from __future__ import annotations

import re
from dataclasses import asdict, dataclass, field

from advisor.parts import SHARED_PIN_FUNCTIONS, Family, Package, TriggerInput

#: Function groups. "network" pins carry the timing R/C (or the 555's divider taps).
POWER = ("VCC", "GND")
TRIGGERS = ("TRIG_FALL", "TRIG_RISE", "TRIG")
CLEARS = ("CLEAR", "RESET", "MASTER_RESET", "AUTO_RESET")
OUTPUTS = ("Q", "QN", "OUT", "OSC_OUT", "OUT_C", "OUT_E", "Q_TAP")
#: VREF: the LM3905 timing resistor runs from its reference output, not from VCC.
NETWORK = ("CEXT", "RCEXT", "RINT", "REXT", "THRES", "DIS", "CONT", "RC_COMMON", "RS", "RTC", "CTC", "VREF")
#: Control inputs that set a part's mode or ratio (the catalog ties them by use: Pin.tie).
CONTROL_INPUTS = ("ASTABLE", "ASTABLE_N", "RETRIGGER", "PROG_A", "PROG_B", "MODE", "QSEL", "LOGIC")
#: Controls a multi-section part may bring out once for all its sections (channel left out).
SHARED_CONTROLS = SHARED_PIN_FUNCTIONS

#: Functions that do the same job under another name on another kind of part.
#: Used only when the exact function is absent; each such link carries a note.
RELATED: dict[str, tuple[str, ...]] = {
    "TRIG": ("TRIG_FALL",),
    "TRIG_FALL": ("TRIG",),
    # OUT_C: a bare output transistor (LM3905): its collector with a pull-up gives Q while
    # the LOGIC input is open or high (National, February 1995, pin function description)
    "OUT": ("Q", "OUT_C"),
    "Q": ("OUT", "Q_TAP", "OUT_C"),
    # a counter timer's stage outputs (74HC4060): the note on each pin names its divide ratio
    "Q_TAP": ("Q",),
    "RESET": ("CLEAR", "MASTER_RESET"),
    "CLEAR": ("RESET", "MASTER_RESET"),
    "MASTER_RESET": ("CLEAR", "RESET"),
    "REXT": ("RCEXT",),
    "RCEXT": ("REXT",),
}

#: What a bare output transistor's pin needs to stand in for a logic output.
_BARE_TRANSISTOR = {
    "OUT_C": "output transistor's collector, which needs a pull-up to the supply (rule "
             "bare-transistor-output-needs-a-resistor)",
}

#: Edges that reach each other's inputs: a 555 TRIG (level-low) answers a falling edge.
_EDGE_GROUP = {"falling": "low", "level-low": "low", "rising": "high", "level-high": "high"}

#: Levels for the inputs of an unused section (common practice: never leave a CMOS
#: input open; hold the section cleared and its triggers at their idle level).
_UNUSED_LEVEL = {
    "TRIG_FALL": ("VCC", "idle high: no falling edge"),
    "TRIG_RISE": ("GND", "idle low: no rising edge"),
    "TRIG": ("VCC", "idle high: no trigger"),
    "THRES": ("GND", "held below the threshold"),
}


def kind_of(function: str) -> str:
    """The group a normalised pin function belongs to."""
    if function in POWER:
        return "power"
    if function in TRIGGERS:
        return "trigger"
    if function in CLEARS:
        return "clear"
    if function in OUTPUTS:
        return "output"
    if function in NETWORK:
        return "network"
    if function == "NC":
        return "nc"
    return "other"


def is_555(fam: Family) -> bool:
    return fam.function == "timer-555"


def network_kind(fam: Family) -> str:
    """How the timing network connects: ``555`` (divider taps THRES/DIS), ``4047``
    (R and C from a common RC pin), ``4541`` (oscillator pins), or ``rc-pins``
    (one-shots: C across Cext–Rext/Cext, R from Rext/Cext to the supply)."""
    if is_555(fam):
        return "555"
    return {"cd4047": "4047", "cd4541": "4541", "counter": "4541"}.get(fam.timing.law, "rc-pins")


@dataclass(frozen=True)
class PinLink:
    """One net moved from an old pin to a new pin."""

    function: str
    kind: str
    old_pin: int
    old_name: str
    new_pin: int
    new_name: str
    old_channel: int | None
    new_channel: int | None
    note: str | None = None

    @property
    def moved(self) -> bool:
        return self.old_pin != self.new_pin

    def to_json(self) -> dict:
        d = asdict(self)
        d["moved"] = self.moved
        return d


@dataclass(frozen=True)
class PinTie:
    """A new input tied to a fixed level (``VCC`` or ``GND``)."""

    new_pin: int
    new_name: str
    function: str
    channel: int | None
    level: str  # "VCC" or "GND"
    why: str
    #: The old clear whose net this tie replaces when the two parts' clears have opposite
    #: active levels ("RESET (pin 4), active low"); None for an ordinary tie.
    replaces: str | None = None

    def to_json(self) -> dict:
        return asdict(self)


@dataclass(frozen=True)
class Unmatched:
    """An old pin with no counterpart on the new part."""

    old_pin: int
    old_name: str
    function: str
    channel: int | None
    what: str  # what to do with its net
    blocking: bool  # True: no equivalent input exists, the circuit must change
    old_level: str | None = None  # "high"/"low" when the old board held it at an enable level

    def to_json(self) -> dict:
        return asdict(self)


@dataclass(frozen=True)
class Addition:
    """A component to add because the new part lacks something the old board used."""

    what: str  # "resistor", "capacitor"
    role: str  # e.g. "Rext"
    between: tuple[str, str]  # e.g. ("pin 15 (1Rext/Cext)", "VCC")
    channel: int | None
    why: str

    def to_json(self) -> dict:
        d = asdict(self)
        d["between"] = list(self.between)
        return d


@dataclass(frozen=True)
class Polarity:
    """How the active trigger edge travels: old input → new input, and the enables."""

    edge: str | None  # "rising" / "falling", None when unknown
    assumed: bool  # True when the edge was not given and was taken from the old part
    old_input: str | None  # e.g. "A1 (pin 3)"
    new_input: str | None
    new_enable: dict[str, str] = field(default_factory=dict)  # function -> level
    note: str | None = None

    def to_json(self) -> dict:
        return asdict(self)


@dataclass(frozen=True)
class PinMap:
    old_family: str
    new_family: str
    old_package: str
    new_package: str
    links: tuple[PinLink, ...]
    ties: tuple[PinTie, ...]
    unmatched: tuple[Unmatched, ...]
    additions: tuple[Addition, ...]
    polarity: Polarity
    notes: tuple[str, ...] = ()

    @property
    def old_pin_count(self) -> int:
        return _pin_count_of(self.old_package)

    @property
    def new_pin_count(self) -> int:
        return _pin_count_of(self.new_package)

    @property
    def same_footprint(self) -> bool:
        """Same pin count and package style (the new part fits the old holes/pads)."""
        return self.old_pin_count == self.new_pin_count and _style(self.old_package) == _style(self.new_package)

    @property
    def moved_links(self) -> tuple[PinLink, ...]:
        return tuple(link for link in self.links if link.moved)

    @property
    def same_pins(self) -> bool:
        """Every used function sits at the same pin number, nothing to add, nothing blocking."""
        return (
            self.same_footprint
            and not self.moved_links
            and not self.additions
            and not any(u.blocking for u in self.unmatched)
            and not self.ties_differ_from_old
        )

    @property
    def changed_ties(self) -> tuple[PinTie, ...]:
        """Ties that land on a pin whose old net was something else (the board must change).

        A tie is unchanged when the old board held the same pin number at the same level
        (an enable input kept at its enabling level, e.g. B high under both a 74LS221
        and a 74HC221).
        """
        held = {u.old_pin: u.old_level for u in self.unmatched if u.old_level is not None}
        out = []
        for t in self.ties:
            level = "high" if t.level == "VCC" else "low"
            if held.get(t.new_pin) == level:
                continue
            out.append(t)
        return tuple(out)

    @property
    def ties_differ_from_old(self) -> bool:
        return bool(self.changed_ties)

    @property
    def blocking(self) -> tuple[Unmatched, ...]:
        return tuple(u for u in self.unmatched if u.blocking)

    def pairs(self) -> dict[int, int]:
        """Old pin number → new pin number for every linked net."""
        return {link.old_pin: link.new_pin for link in self.links}

    def to_json(self) -> dict:
        return {
            "old_family": self.old_family,
            "new_family": self.new_family,
            "old_package": self.old_package,
            "new_package": self.new_package,
            "same_footprint": self.same_footprint,
            "same_pins": self.same_pins,
            "pairs": {str(k): v for k, v in sorted(self.pairs().items())},
            "links": [link.to_json() for link in self.links],
            "ties": [t.to_json() for t in self.ties],
            "unmatched": [u.to_json() for u in self.unmatched],
            "additions": [a.to_json() for a in self.additions],
            "polarity": self.polarity.to_json(),
            "notes": list(self.notes),
        }


def _pin_count_of(package_name: str) -> int:
    m = re.search(r"(\d+)\s*$", package_name)
    return int(m.group(1)) if m else 0


def _style(package_name: str) -> str:
    return re.sub(r"[-\s]*\d+\s*$", "", package_name).upper()


def package_pin_count(pkg: Package) -> int:
    return _pin_count_of(pkg.name) or len(pkg.pins)


def choose_packages(old: Family, new: Family, old_package: str | None = None,
                    new_package: str | None = None) -> tuple[Package, Package]:
    """The old part's package (named or its first) and the new package that best fits it.

    Preference for the new part: same style and pin count, then same style, then
    the family's first package (the catalog lists the through-hole one first).
    """
    op = _find_package(old, old_package)
    if new_package is not None:
        return op, _find_package(new, new_package)

    def score(p: Package) -> tuple[int, int]:
        same_style = _style(p.name) == _style(op.name)
        same_count = package_pin_count(p) == package_pin_count(op)
        return (0 if same_style and same_count else 1 if same_style else 2, new.packages.index(p))

    return op, min(new.packages, key=score)


def _find_package(fam: Family, name: str | None) -> Package:
    if name is None:
        return fam.default_package()
    for p in fam.packages:
        if p.name.upper() == name.upper() or (p.same_as and p.same_as.upper() == name.upper()):
            return p
    from advisor.errors import InputError

    raise InputError(
        f"{fam.id} has no package {name!r}", got=name,
        expected="one of " + ", ".join(p.name for p in fam.packages),
    )


def _label(pin) -> str:
    return f"{pin.name} (pin {pin.pin})"


def _pick_trigger(fam: Family, edge: str, prefer_schmitt: bool | None) -> tuple[TriggerInput | None, bool]:
    """The input of ``fam`` that answers ``edge``: exact edge first, then level of the same sense.

    Returns (input, exact) where exact is False for an edge→level match (555 TRIG).
    """
    exact = [t for t in fam.behaviour.triggers if t.edge == edge]
    if exact:
        if prefer_schmitt is not None:
            exact.sort(key=lambda t: t.schmitt != prefer_schmitt)
        return exact[0], True
    group = [t for t in fam.behaviour.triggers if _EDGE_GROUP.get(t.edge) == _EDGE_GROUP.get(edge)]
    if group:
        return group[0], False
    return None, False


def _edge_name(edge: str) -> str:
    return {"level-low": "falling", "level-high": "rising"}.get(edge, edge)


@dataclass(frozen=True)
class _Pin:
    pin: int
    name: str
    function: str
    channel: int | None
    note: str | None = None
    source: object = None  # the catalog pin: its tie levels by use

    @property
    def tie(self) -> dict:
        return self.source.tie if self.source is not None else {}

    @property
    def tie_why(self) -> str | None:
        return self.source.tie_why if self.source is not None else None

    def tie_level(self, mode: str | None, divide: int | None) -> str | None:
        return self.source.tie_level(mode, divide) if self.source is not None else None


@dataclass(frozen=True)
class _Pkg:
    name: str
    pins: tuple[_Pin, ...]


def _normalised(fam: Family, pkg: Package) -> _Pkg:
    """Pins with their effective channel: a single-section part's signal pins are section 1
    even when the catalog leaves their channel out; supplies and NC stay shared."""
    pins = []
    for p in pkg.pins:
        ch = p.channel
        if ch is None and fam.channels == 1 and p.function not in (*POWER, "NC"):
            ch = 1
        pins.append(_Pin(p.pin, p.name, p.function, ch, p.note, p))
    return _Pkg(pkg.name, tuple(pins))


def map_pins(
    old: Family,
    new: Family,
    *,
    edge: str | None = None,
    uses_internal_r: bool = False,
    old_package: str | None = None,
    new_package: str | None = None,
    assume_edge: bool = True,
    divide: int | None = None,
    mode: str | None = None,
    old_divide: int | None = None,
) -> PinMap:
    """Map every old pin to the new part, channel by channel.

    ``edge`` is the active trigger edge of the circuit (``rising``/``falling``);
    when None the old part's first listed trigger is assumed and the map says so
    (``assume_edge=False``, for astables, maps trigger pins by function instead).
    ``uses_internal_r`` tells that the old board times with the old part's internal
    resistor (no external Rext), so a new part without one needs an added resistor.
    ``divide``: a counter timer's divide ratio; the output then goes to the new part's
    counter output (``Q_TAP``) whose note names that ratio ("/1024"), and control pins
    tied by ratio (a 4541's A and B) take that ratio's levels. ``old_divide``: the ratio
    the old board uses; only the old tap with that ratio carries the output over.
    ``mode`` (``mono``/``astable``): the use, for control pins tied by mode (a 4047's
    ASTABLE). A control input with no old counterpart and no tie data is named in the
    notes: a CMOS input is never left open.
    """
    op, np_ = choose_packages(old, new, old_package, new_package)
    op, np_ = _normalised(old, op), _normalised(new, np_)
    notes: list[str] = []
    links: list[PinLink] = []
    ties: list[PinTie] = []
    unmatched: list[Unmatched] = []
    additions: list[Addition] = []
    cross_kind = network_kind(old) != network_kind(new)

    # --- trigger polarity -------------------------------------------------------
    assumed = False
    if edge is None and assume_edge and old.behaviour.triggers:
        edge = _edge_name(old.behaviour.triggers[0].edge)
        assumed = True
    old_active = new_active = None
    exact = True
    if edge is not None:
        old_active, _ = _pick_trigger(old, edge, None)
        new_active, exact = _pick_trigger(new, edge, old_active.schmitt if old_active else None)
    polarity_note = None
    if edge is not None and new_active is None:
        polarity_note = (f"{new.id} has no input for a {edge} edge: an inverter (or a different part) "
                         "is needed in front of it")
    elif new_active is not None and not exact:
        polarity_note = (f"{new.id} {new_active.name} responds to a {new_active.edge} input, not an edge: "
                         "the trigger pulse must end before the output pulse (couple it through a small "
                         "capacitor if the source stays low)")
    if old_active is not None and new_active is not None and old_active.schmitt and not new_active.schmitt:
        extra = (f"{old.id} {old_active.name} is a Schmitt input and {new.id} {new_active.name} is not: "
                 "slow or noisy trigger edges need conditioning (a Schmitt buffer)")
        polarity_note = f"{polarity_note}; {extra}" if polarity_note else extra
    if assumed:
        extra = (f"trigger edge not given: assumed the {edge} edge on {old.id} "
                 f"{old_active.name if old_active else '?'} (pass --trigger-edge to be sure)")
        polarity_note = f"{polarity_note}; {extra}" if polarity_note else extra

    # --- channel by channel -----------------------------------------------------
    n_common = min(old.channels, new.channels)
    old_pins_by_ch: dict[int | None, list] = {}
    for p in op.pins:
        old_pins_by_ch.setdefault(p.channel, []).append(p)
    new_used: set[int] = set()

    def new_pins(function: str, channel: int | None) -> list:
        found = [p for p in np_.pins if p.function == function and p.channel == channel and p.pin not in new_used]
        if not found and channel is not None and function in SHARED_CONTROLS:
            # one control pin common to every section (the NE558's RESET and CONTROL VOLTAGE)
            found = [p for p in np_.pins if p.function == function and p.channel is None and p.pin not in new_used]
        if function == "Q_TAP" and divide is not None:  # the tap for the ratio in use first
            found.sort(key=lambda p: (p.note or "").strip() != f"/{divide}")
        return found

    def link(old_pin, new_pin, note=None) -> None:
        new_used.add(new_pin.pin)
        links.append(PinLink(old_pin.function, kind_of(old_pin.function), old_pin.pin, old_pin.name,
                             new_pin.pin, new_pin.name, old_pin.channel, new_pin.channel, note))

    # Shared pins (power, shared NC, shared network on some duals) first.
    for p in old_pins_by_ch.get(None, []):
        if p.function == "NC":
            continue
        cand = new_pins(p.function, None)
        if cand:
            link(p, cand[0])
        else:
            unmatched.append(Unmatched(p.pin, p.name, p.function, None,
                                       f"no shared {p.function} pin on {new.id}", blocking=p.function in POWER))

    for ch in range(1, old.channels + 1):
        new_ch = ch if ch <= n_common else None
        pins = old_pins_by_ch.get(ch, [])
        if new_ch is None:
            for p in pins:
                if p.function != "NC":
                    unmatched.append(Unmatched(p.pin, p.name, p.function, ch,
                                               f"{new.id} has {new.channels} section(s): channel {ch} needs a "
                                               "second part if the board uses it", blocking=False))
            continue
        _map_channel(old, new, pins, ch, new_ch, edge, old_active, new_active, uses_internal_r, cross_kind,
                     new_pins, link, ties, unmatched, additions, np_, divide=divide, old_divide=old_divide,
                     mode=mode)

    # --- new pins left over: enable levels, clears, unused sections --------------
    linked_new = {lk.new_pin for lk in links} | {t.new_pin for t in ties}
    for p in np_.pins:
        if p.pin in linked_new or p.function in ("NC",):
            continue
        k = kind_of(p.function)
        used_channel = p.channel is not None and p.channel <= n_common
        if p.channel is not None and not used_channel:
            if k in ("trigger", "clear") or p.function in _UNUSED_LEVEL:
                level, why = _unused_level(new, p.function)
                ties.append(PinTie(p.pin, p.name, p.function, p.channel, level, f"unused section: {why}"))
            continue
        if p.tie:
            level = p.tie_level(mode, divide)
            if level is not None:
                ties.append(PinTie(p.pin, p.name, p.function, p.channel, level,
                                   p.tie_why or f"as {new.id}'s function table sets it for this use"))
            else:
                uses = ", ".join(f"{k}: {v}" for k, v in p.tie.items())
                notes.append(f"{new.id} {p.name} (pin {p.pin}) has no old counterpart and its level depends on the "
                             f"use ({uses}): tie it as the datasheet says; never leave a CMOS input open")
        elif k == "trigger" and new_active is not None:
            level = new_active.enable.get(p.function)
            if level is not None:
                ties.append(PinTie(p.pin, p.name, p.function, p.channel, "VCC" if level == "high" else "GND",
                                   f"enables {new_active.name} ({new_active.edge} edge)"))
            else:
                level_, why = _unused_level(new, p.function)
                ties.append(PinTie(p.pin, p.name, p.function, p.channel, level_, f"not used: {why}"))
        elif k == "trigger" and mode == "astable":
            level_, why = _unused_level(new, p.function)
            ties.append(PinTie(p.pin, p.name, p.function, p.channel, level_, f"free-running, no trigger: {why}"))
        elif k == "clear":
            level = _inactive_clear(new, p.function, new_active)
            ties.append(PinTie(p.pin, p.name, p.function, p.channel, level,
                               f"{old.id} has no {p.function.lower()}: held inactive"))
        elif p.function in CONTROL_INPUTS:
            notes.append(f"{new.id} {p.name} (pin {p.pin}) is a control input with no old counterpart: set it as "
                         "the datasheet's function table says for this use"
                         + (f" ({p.note})" if p.note else "")
                         + ("" if new.technology in ("bipolar", "ttl", "ls") else "; never leave a CMOS input open"))
        elif p.function == "CONT":
            notes.append(f"{new.id} {p.name} (pin {p.pin}) has no old counterpart: see the findings for "
                         "its bypass capacitor")
        elif k == "power":
            unmatched_power = [u for u in unmatched if u.function == p.function]
            if not unmatched_power:
                notes.append(f"{new.id} {p.name} (pin {p.pin}) is a second {p.function} pin: connect it too")

    if cross_kind:
        notes.append(f"{old.id} and {new.id} time with different networks ({network_kind(old)} vs {network_kind(new)}): "
                     "the timing network is rebuilt around the new part")
    if old.behaviour.triggers and len([t for t in old.behaviour.triggers if t.function == "TRIG_FALL"]) > 1:
        notes.append(f"{old.id} gates several falling-edge inputs; if the board drives more than one of them, "
                     "an external gate is needed in front of the new part")

    polarity = Polarity(
        edge=edge,
        assumed=assumed,
        old_input=_input_label(op, old_active, 1),
        new_input=_input_label(np_, new_active, 1),
        new_enable=dict(new_active.enable) if new_active else {},
        note=polarity_note,
    )
    return PinMap(old.id, new.id, op.name, np_.name, tuple(links), tuple(ties), tuple(unmatched),
                  tuple(additions), polarity, tuple(notes))


def _input_label(pkg: _Pkg, trig: TriggerInput | None, channel: int) -> str | None:
    if trig is None:
        return None
    for p in pkg.pins:
        if p.function == trig.function and p.channel in (None, channel):
            return f"{p.name} (pin {p.pin})"
    return trig.name


def _unused_level(fam: Family, function: str) -> tuple[str, str]:
    if function in _UNUSED_LEVEL:
        return _UNUSED_LEVEL[function]
    if kind_of(function) == "clear":
        level = _active_clear_level(fam, function)
        return ("GND" if level == "low" else "VCC"), "held in reset"
    return "GND", "tied, not left open"


def _active_clear_level(fam: Family, function: str) -> str:
    if function in ("RESET",):
        return "low"  # the 555 reset is active low (every 555-class datasheet)
    if fam.behaviour.clear is not None:
        return fam.behaviour.clear.active
    return "low"


def _inactive_clear(fam: Family, function: str, active: TriggerInput | None) -> str:
    if active is not None and function in active.enable:
        return "VCC" if active.enable[function] == "high" else "GND"
    return "VCC" if _active_clear_level(fam, function) == "low" else "GND"


def _map_channel(old, new, pins, ch, new_ch, edge, old_active, new_active, uses_internal_r, cross_kind,
                 new_pins, link, ties, unmatched, additions, np_, divide=None, old_divide=None,
                 mode=None) -> None:
    """Map one section's pins (helper of :func:`map_pins`)."""
    for p in pins:
        k = kind_of(p.function)
        if p.function == "NC":
            continue
        if k == "trigger" and mode == "astable" and cross_kind and is_555(old):
            # a 555 astable joins TRIG to THRES on the capacitor (TI SLFS022 figure 12): network, not trigger
            unmatched.append(Unmatched(p.pin, p.name, p.function, ch,
                                       f"joined to THRES on the timing capacitor in the astable: timing network "
                                       f"pin, rebuild the network for {new.id}", blocking=True))
            continue
        if (p.function == "Q_TAP" and old_divide is not None and (p.note or "").strip() != f"/{old_divide}"
                and not new_pins("Q_TAP", new_ch)):
            # one output on the new part: only the tap the board uses carries over
            unmatched.append(Unmatched(p.pin, p.name, p.function, ch,
                                       f"{new.id} brings out one ratio; the board's /{old_divide} tap carries "
                                       "over, this one does not (if the board uses it too, it needs a second "
                                       "part or a counter)", blocking=False))
            continue
        if k == "trigger":
            _map_trigger(old, new, p, ch, new_ch, old_active, new_active, new_pins, link, unmatched)
            continue
        if p.function == "RINT":
            rc = new_pins("RCEXT", new_ch) or new_pins("REXT", new_ch)
            if uses_internal_r and not new_pins("RINT", new_ch):
                target = f"pin {rc[0].pin} ({rc[0].name})" if rc else "the new part's timing pin"
                additions.append(Addition("resistor", "Rext", (target, "VCC"), new_ch,
                                          f"the board times with {old.id}'s internal resistor ({p.name}, pin "
                                          f"{p.pin}); {new.id} has none"))
                unmatched.append(Unmatched(p.pin, p.name, p.function, ch,
                                           "replaced by an external resistor (see additions)", blocking=False))
                continue
            cand = new_pins("RINT", new_ch)
            if cand:
                link(p, cand[0])
            else:
                unmatched.append(Unmatched(p.pin, p.name, p.function, ch,
                                           "internal resistor not used on this board: leave its net out",
                                           blocking=False))
            continue
        if cross_kind and k == "network":
            unmatched.append(Unmatched(p.pin, p.name, p.function, ch,
                                       f"timing network pin: rebuild the network for {new.id}", blocking=True))
            continue
        cand = new_pins(p.function, new_ch)
        note = None
        if not cand:
            for rel in RELATED.get(p.function, ()):
                cand = new_pins(rel, new_ch)
                if cand:
                    note = f"{p.function} on {old.id} becomes {rel} on {new.id}: same job, check the datasheet"
                    if rel in _BARE_TRANSISTOR:
                        what = _BARE_TRANSISTOR[rel]
                        note = (f"{p.function} on {old.id} becomes the {new.id} {what}; its LOGIC input (open "
                                "or high here) sets which level the pulse is: check the datasheet")
                    if rel == "Q_TAP":  # one pin per divide ratio
                        note = (f"{p.function} on {old.id} goes to the {new.id} counter output "
                                + (f"for /{divide}" if divide is not None and (cand[0].note or "").strip() == f"/{divide}"
                                   else "for the divide ratio used (give --divide; each output pin's note names its ratio)")
                                + "; check the datasheet")
                    break
        if cand and k == "clear" and _active_clear_level(old, p.function) != _active_clear_level(new, cand[0].function):
            _inverted_clear(old, new, p, cand[0], ch, ties, unmatched)
            continue
        if cand:
            if cand[0].channel is None and new.channels > 1:
                shared = f"{new.id} {cand[0].name} is common to all {new.channels} sections"
                note = f"{note}; {shared}" if note else shared
            link(p, cand[0], note)
            continue
        blocking = k == "clear"
        what = {
            "clear": f"{new.id} has no clear/reset: if the board drives {p.name} to end pulses early, "
                     "the circuit must change",
            "output": (f"{new.id} has one output transistor: if the board uses {p.name}, feed it through an "
                       "inverter from the collector output, or take the emitter output with a pull-down to ground "
                       "instead of the collector's pull-up (not both: one transistor drives both pins)")
                      if new_pins("OUT_C", new_ch) else
                      f"{new.id} has no {p.function} output: take the other output (through an inverter) "
                      "if the board uses it",
            "network": f"{new.id} has no {p.function} pin: leave its net out",
        }.get(k, f"no {p.function} pin on {new.id}")
        unmatched.append(Unmatched(p.pin, p.name, p.function, ch, what, blocking=blocking))


def _inverted_clear(old, new, p, target, ch, ties, unmatched) -> None:
    """An old clear whose counterpart is active at the other level (a 555's active-low RESET onto
    a 4047's active-high EXTERNAL RESET): carrying the net over would hold the new part in reset
    where the board held the old one inactive. The new clear is tied inactive, and a driven
    clear needs an inverter (the function tables of both parts; rule clear-polarity-inverted)."""
    old_act, new_act = _active_clear_level(old, p.function), _active_clear_level(new, target.function)
    if not any(t.new_pin == target.pin for t in ties):  # a clear shared by every section: one tie
        ties.append(PinTie(target.pin, target.name, target.function, target.channel,
                           "VCC" if new_act == "low" else "GND",
                           f"held inactive ({target.name} is active {new_act}, {old.id} {p.name} was active "
                           f"{old_act}); if the board drives {p.name}, wire that net through an inverter instead",
                           replaces=f"{p.name} (pin {p.pin}), active {old_act}"))
    unmatched.append(Unmatched(p.pin, p.name, p.function, ch,
                               f"active {old_act}, while {new.id} {target.name} (pin {target.pin}) is active "
                               f"{new_act}: the tie listed replaces a net that held it inactive; a driven "
                               f"{p.name} reaches {target.name} through an inverter", blocking=False))


def _map_trigger(old, new, p, ch, new_ch, old_active, new_active, new_pins, link, unmatched) -> None:
    """The active trigger's net goes to the new active input; other old trigger pins were enable ties.

    With no active edge (an astable's TRIG tied to THRES) pins map by function.
    """
    if old_active is None:
        cand = new_pins(p.function, new_ch)
        for rel in RELATED.get(p.function, ()) if not cand else ():
            cand = new_pins(rel, new_ch)
            if cand:
                break
        if cand:
            link(p, cand[0])
        else:
            unmatched.append(Unmatched(p.pin, p.name, p.function, ch, f"no {p.function} input on {new.id}",
                                       blocking=True))
        return
    if old_active is not None and p.function == old_active.function:
        if new_active is None:
            unmatched.append(Unmatched(p.pin, p.name, p.function, ch,
                                       f"carries the {old_active.edge} trigger; {new.id} has no input for it",
                                       blocking=True))
            return
        cand = new_pins(new_active.function, new_ch)
        if cand:
            note = None
            if new_active.function != p.function:
                note = (f"{old.id} {p.function} → {new.id} {new_active.function}: "
                        f"{new_active.name} is {new_active.edge}")
            link(p, cand[0], note)
            return
        # a second gated input of the same edge (74121 A1/A2): was tied to its enable level
        unmatched.append(Unmatched(p.pin, p.name, p.function, ch,
                                   f"second {p.function.lower().replace('_', '-')} input of {old.id}: usually tied "
                                   "high on the board; leave it out (gate externally if it is driven)",
                                   blocking=False))
        return
    level = old_active.enable.get(p.function) if old_active else None
    if level is not None:
        what = (f"held {level} on the old board to enable {old_active.name}; not carried over "
                f"(the new part's enable ties are listed)")
    else:
        what = "not the active trigger input; its tie is not carried over"
    unmatched.append(Unmatched(p.pin, p.name, p.function, ch, what, blocking=False, old_level=level))
