"""Trace each timer channel's network through the nets: R, C, trimmer, supply, trigger, inputs.

Which pins carry what is the catalog's (normalised pin functions of the family's
package, :mod:`advisor.parts`); the circuits are the datasheets' standard ones:

- one-shots (laws ``krc`` and ``ln-supply``): the timing capacitor between CEXT and
  RCEXT, the timing resistor from RCEXT to the supply (TI SDLS043 figure 1 for the
  '123; onsemi MC14538B "Rx and Cx" figure; Fairchild DS006538 for the 74121, whose
  internal resistor is used when RINT is tied to VCC and no resistor reaches RCEXT);
- one-shots with one timing pin per section (no CEXT pin): C from it to ground, R from
  the supply to it (Philips NE558, 2003 Feb 14: each section charges its capacitor
  through R from VCC) or from VREF where the part has one (National LM3905, February
  1995: the timing resistor returns to the reference);
- 555 monostable: THRES and DIS joined, R from the supply to them, C from them to
  ground, TRIG driven; 555 astable: THRES and TRIG joined with C to ground, RB from
  DIS to them, RA from the supply to DIS (TI SLFS022 figures 9 and 12).

Series chains of resistors (each inner net joining exactly two resistor pins) are
summed; capacitors directly in parallel are summed. A trimmer (3-pin
potentiometer) counts as a variable resistor of its full value when its wiper is
tied to one end or one end is left open; wired as a divider it cannot be traced.
Anything not traced is a :class:`Problem` with its place.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from advisor.board.model import Board, Net, Problem, Where
from advisor.board.rails import Rails, looks_like_rail
from advisor.board.recognise import Recognised, Timer

#: KiCad pin electrical types that can drive a net.
DRIVER_KINDS = {"output", "bidirectional", "tri_state", "open_collector", "open_emitter", "power_out"}
#: Inputs whose state the plan reports (normalised functions).
INPUTS = ("TRIG", "TRIG_FALL", "TRIG_RISE", "CLEAR", "RESET", "MASTER_RESET", "AUTO_RESET", "RETRIGGER",
          "ASTABLE", "ASTABLE_N")
_SUPPLY_PIN_NAMES = ("VCC", "VDD", "V+", "VCC1", "VDD1", "+VS", "VS")


@dataclass
class Element:
    """A two-terminal view of a passive: nets at its ends, fixed and variable ohms, or farads."""

    ref: str
    a: str
    b: str
    kind: str  # R | POT | C
    value: float


@dataclass
class Chain:
    refs: list[str]
    fixed: float = 0.0
    pot: float = 0.0
    pot_refs: list[str] = field(default_factory=list)


@dataclass
class Channel:
    ref: str
    channel: int
    family: object
    where: Where
    mode: str | None = None  # mono | astable
    vcc: float | None = None
    vcc_net: str | None = None
    gnd_net: str | None = None
    r: float | None = None
    ra: float | None = None
    rb: float | None = None
    c: float | None = None
    pot: float | None = None
    internal_r: bool = False
    parts: dict[str, list[str]] = field(default_factory=dict)  # role -> references (r, ra, rb, c, pot)
    trigger: dict | None = None
    inputs: dict[str, dict] = field(default_factory=dict)  # "pin N (NAME)" -> {function, state, detail}
    cont: dict | None = None
    decoupling: list[str] = field(default_factory=list)
    rail_loads: int = 0
    unused: bool = False
    problems: list[Problem] = field(default_factory=list)

    @property
    def label(self) -> str:
        return self.ref if self.family.channels == 1 else f"{self.ref} channel {self.channel}"

    @property
    def traced(self) -> bool:
        return not self.unused and self.c is not None and self.vcc is not None and (
            self.internal_r or self.r is not None or (self.ra is not None and self.rb is not None))

    def to_json(self) -> dict:
        return {
            "ref": self.ref, "channel": self.channel, "family": self.family.id, "where": self.where.to_json(),
            "mode": self.mode, "vcc": self.vcc, "vcc_net": self.vcc_net, "gnd_net": self.gnd_net,
            "r": self.r, "ra": self.ra, "rb": self.rb, "c": self.c, "pot": self.pot, "internal_r": self.internal_r,
            "parts": {k: list(v) for k, v in self.parts.items()}, "trigger": self.trigger,
            "inputs": self.inputs, "cont": self.cont, "decoupling": list(self.decoupling), "unused": self.unused,
            "traced": self.traced,
        }


class Tracer:
    def __init__(self, board: Board, rec: Recognised, rails: Rails) -> None:
        self.board, self.rec, self.rails = board, rec, rails
        self.by_name: dict[str, Net] = {n.name: n for n in board.nets}
        self.elements: list[Element] = []
        self.on_net: dict[str, list[Element]] = {}
        self.problems: list[Problem] = []
        for ref, p in rec.passives.items():
            for e in self._two_terminal(p):
                self.elements.append(e)
                self.on_net.setdefault(e.a, []).append(e)
                self.on_net.setdefault(e.b, []).append(e)

    # -- nets -----------------------------------------------------------------
    def net(self, ref: str, pin: str) -> str | None:
        n = self.board.net_of(ref, pin)
        return n.name if n is not None else None

    def pins(self, net: str) -> list[tuple[str, str]]:
        n = self.by_name.get(net)
        return list(n.pins) if n is not None else []

    def is_open(self, net: str | None, own: tuple[str, str] | None = None) -> bool:
        if net is None:
            return True
        n = self.by_name.get(net)
        if n is None:
            return True
        others = [p for p in n.pins if p != own]
        return not others and self.rails.voltage(net) is None and not n.power

    def voltage(self, net: str | None) -> float | None:
        return None if net is None else self.rails.voltage(net)

    # -- passives as two-terminal elements ---------------------------------------
    def _two_terminal(self, p) -> list[Element]:
        part = p.part
        if p.value is None:
            return []
        nets = {num: self.net(part.ref, num) for num in part.pins}
        if p.kind in ("R", "RV", "C"):
            ends = [n for n in nets.values() if n is not None]
            if len(ends) != 2:
                return []
            kind = {"R": "R", "RV": "POT", "C": "C"}[p.kind]
            return [Element(part.ref, ends[0], ends[1], kind, p.value)]
        # a 3-pin potentiometer
        w = p.wiper
        ends = [num for num in part.pins if num != w]
        if w is None or len(ends) != 2:
            return []
        wn, e1, e2 = nets.get(w), nets.get(ends[0]), nets.get(ends[1])
        open1 = self.is_open(e1, (part.ref, ends[0]))
        open2 = self.is_open(e2, (part.ref, ends[1]))
        openw = self.is_open(wn, (part.ref, w))
        if wn == e1 and not open2:
            return [Element(part.ref, e1, e2, "POT", p.value)]
        if wn == e2 and not open1:
            return [Element(part.ref, e2, e1, "POT", p.value)]
        if open2 and not open1 and not openw:
            return [Element(part.ref, e1, wn, "POT", p.value)]
        if open1 and not open2 and not openw:
            return [Element(part.ref, e2, wn, "POT", p.value)]
        if openw and not open1 and not open2:
            return [Element(part.ref, e1, e2, "R", p.value)]  # wiper unused: a fixed resistor
        self.problems.append(Problem(f"trimmer {part.ref} is wired as a divider (both ends and the wiper on "
                                     "separate nets); its share of the timing cannot be traced", part.where, "network"))
        return []

    # -- tracing ---------------------------------------------------------------
    def resistance(self, a: str | None, b: str | None) -> list[Chain]:
        """Every series chain of resistors and trimmers from net a to net b."""
        if a is None or b is None:
            return []
        chains = []
        for first in self.on_net.get(a, []):
            if first.kind == "C":
                continue
            path, cur, seen = [first], (first.b if first.a == a else first.a), {first.ref}
            while True:
                if cur == b:
                    chains.append(path)
                    break
                if cur == a or self.voltage(cur) is not None or len(self.pins(cur)) != 2:
                    break
                nxt = [e for e in self.on_net.get(cur, []) if e.ref not in seen and e.kind != "C"]
                if len(nxt) != 1:
                    break
                e = nxt[0]
                seen.add(e.ref)
                path.append(e)
                cur = e.b if e.a == cur else e.a
        out = []
        for path in chains:
            ch = Chain([e.ref for e in path])
            for e in path:
                if e.kind == "POT":
                    ch.pot += e.value
                    ch.pot_refs.append(e.ref)
                else:
                    ch.fixed += e.value
            out.append(ch)
        return out

    def capacitance(self, a: str | None, b: str | None) -> tuple[float, list[str]]:
        """Sum of capacitors directly between nets a and b (parallel), with their references."""
        if a is None or b is None:
            return 0.0, []
        total, refs = 0.0, []
        for e in self.on_net.get(a, []):
            if e.kind == "C" and {e.a, e.b} == {a, b}:
                total += e.value
                refs.append(e.ref)
        return total, refs

    def capacitance_to_ground(self, a: str | None) -> tuple[float, list[str], str | None]:
        total, refs, gnd = 0.0, [], None
        for e in self.on_net.get(a, []) if a else []:
            other = e.b if e.a == a else e.a
            if e.kind == "C" and self.voltage(other) == 0.0:
                total += e.value
                refs.append(e.ref)
                gnd = other
        return total, refs, gnd

    # -- who drives a net ---------------------------------------------------------
    def part_supply(self, ref: str) -> tuple[float | None, str | None]:
        """A part's supply rail: its catalog VCC pin for a timer, else its power-input pin named like a rail."""
        for t in self.rec.timers:
            if t.part.ref == ref:
                for pin in t.package.pins:
                    if pin.function == "VCC":
                        n = self.net(ref, str(pin.pin))
                        return self.voltage(n), n
        part = self.board.parts.get(ref)
        if part is None:
            return None, None
        for num, info in part.pins.items():
            if info.kind == "power_in" and (info.name.upper() in _SUPPLY_PIN_NAMES or looks_like_rail(info.name)):
                n = self.net(ref, num)
                v = self.voltage(n)
                if v != 0.0:
                    return v, n
        return None, None

    def drivers(self, net: str, own: tuple[str, str]) -> list[tuple[str, str]]:
        out = []
        for r, p in self.pins(net):
            if (r, p) == own or r in self.rec.passives:
                continue
            part = self.board.parts.get(r)
            kind = part.pins[p].kind if part and p in part.pins else "unspecified"
            if kind in DRIVER_KINDS or (kind == "unspecified" and r not in self.rec.connectors):
                out.append((r, p))
        return out

    def state(self, net: str | None, own: tuple[str, str], vcc_net: str | None) -> dict:
        """Tied high / tied low / pulled / driven / external / open, with the detail."""
        if net is None or self.is_open(net, own):
            n = self.by_name.get(net) if net else None
            return {"state": "open", "detail": "no-connect flag" if n is not None and n.no_connect else "nothing else on the net",
                    "net": net}
        v = self.voltage(net)
        if v is not None:
            return {"state": "tied-low" if v == 0.0 else "tied-high", "detail": net, "net": net, "volts": v}
        if net == vcc_net:
            return {"state": "tied-high", "detail": net, "net": net}
        drv = self.drivers(net, own)
        if drv:
            return {"state": "driven", "detail": ", ".join(f"{r}.{p}" for r, p in drv), "net": net, "by": drv}
        ext = [(r, p) for r, p in self.pins(net) if r in self.rec.connectors]
        if ext:
            return {"state": "external", "detail": ", ".join(f"{r}.{p}" for r, p in ext), "net": net, "by": ext}
        for e in self.on_net.get(net, []):
            other = e.b if e.a == net else e.a
            ov = self.voltage(other)
            if e.kind in ("R", "POT") and ov is not None:
                return {"state": "pulled-low" if ov == 0.0 else "pulled-high", "detail": f"via {e.ref} to {other}",
                        "net": net}
            far = self.drivers(other, own) if ov is None else []
            if far:
                return {"state": "driven", "detail": f"{', '.join(f'{r}.{p}' for r, p in far)} via {e.ref}",
                        "net": net, "by": far, "via": e.ref}
        return {"state": "passive", "detail": "only passive parts on the net", "net": net}


def _pin_label(pin) -> str:
    return f"pin {pin.pin} ({pin.name})"


def trace_timer(tr: Tracer, t: Timer) -> list[Channel]:
    fam, pkg, ref = t.family, t.package, t.part.ref
    out = []
    vcc_pins = [p for p in pkg.pins if p.function == "VCC"]
    gnd_pins = [p for p in pkg.pins if p.function == "GND"]
    vcc_net = tr.net(ref, str(vcc_pins[0].pin)) if vcc_pins else None
    gnd_net = tr.net(ref, str(gnd_pins[0].pin)) if gnd_pins else None
    missing = [str(p.pin) for p in pkg.pins if p.function != "NC" and str(p.pin) not in t.part.pins]
    for ch in range(1, fam.channels + 1):
        c = Channel(ref, ch, fam, t.part.where, vcc_net=vcc_net, gnd_net=gnd_net)
        if missing and ch == 1:
            c.problems.append(Problem(
                f"{ref} ({t.matched}): the symbol has no pin(s) {', '.join(missing)} of the catalog's {pkg.name} "
                f"pinout; those pins are taken as unconnected", t.part.where, "symbol"))
        c.vcc = tr.voltage(vcc_net)
        if c.vcc is None:
            c.problems.append(Problem(
                f"{c.label}: the supply net {vcc_net or '(none)'} has no voltage in its name; give --supply "
                f"{vcc_net or 'NET'}=V", t.part.where, "unresolved"))
        if gnd_net is not None and tr.voltage(gnd_net) not in (0.0, None):
            c.problems.append(Problem(f"{c.label}: the ground pin sits on {gnd_net}, not on ground", t.part.where))
        pins = {p.function: p for p in pkg.pins if p.channel == ch or (p.channel is None and fam.channels == 1)}
        by_fn = pkg.by_function(ch)
        _rail_facts(tr, c)
        if fam.function == "timer-555":
            _trace_555(tr, t, c, pins)
        elif fam.timing.law in ("krc", "ln-supply"):
            _trace_one_shot(tr, t, c, pins, by_fn)
        else:
            c.problems.append(Problem(f"{c.label}: tracing the {fam.timing.law} network of {fam.id} is not supported; "
                                      "check it with 'retime check'", t.part.where))
        if not c.unused:
            _inputs(tr, t, c, by_fn)
        out.append(c)
    return out


def _rail_facts(tr: Tracer, c: Channel) -> None:
    """Decoupling capacitors between this part's supply and ground on its sheet, and the rail's other loads."""
    if c.vcc_net is None or c.gnd_net is None:
        return
    sheet = c.where.sheet
    _, refs = tr.capacitance(c.vcc_net, c.gnd_net)
    c.decoupling = [r for r in refs if tr.board.parts[r].where.sheet == sheet]
    c.rail_loads = len({r for r, _ in tr.pins(c.vcc_net) if r not in tr.rec.passives and r != c.ref})


def _one_chain(tr: Tracer, c: Channel, chains: list[Chain], what: str) -> Chain | None:
    if not chains:
        return None
    if len(chains) > 1:
        c.problems.append(Problem(f"{c.label}: {what} has {len(chains)} resistor paths in parallel "
                                  f"({'; '.join('+'.join(ch.refs) for ch in chains)}); not traced", c.where, "network"))
        return None
    return chains[0]


def _trace_one_shot(tr: Tracer, t: Timer, c: Channel, pins: dict, by_fn: dict) -> None:
    ref = t.part.ref
    rc = pins.get("RCEXT") or pins.get("REXT")
    cx = pins.get("CEXT")
    if rc is None:
        c.problems.append(Problem(f"{c.label}: the catalog pinout has no timing pin (RCEXT or REXT)", c.where))
        return
    if cx is None:
        _trace_single_pin(tr, t, c, pins, rc)
        return
    rc_net, cx_net = tr.net(ref, str(rc.pin)), tr.net(ref, str(cx.pin))
    cval, crefs = tr.capacitance(rc_net, cx_net)
    if cval == 0.0 and cx_net == c.gnd_net:
        cval, crefs, _ = tr.capacitance_to_ground(rc_net)
    q_open = _outputs_open(tr, ref, pins)
    if cval == 0.0 and tr.is_open(rc_net, (ref, str(rc.pin))) and q_open:
        c.unused = True
        return
    where = Where(c.where.file, c.where.sheet, ref)
    if cval == 0.0:
        c.problems.append(Problem(f"{c.label}: no capacitor found between {_pin_label(cx)} and {_pin_label(rc)} "
                                  f"(nets {cx_net} and {rc_net}){_why_open(tr, rc_net, (ref, str(rc.pin)))}",
                                  where, "unresolved"))
    else:
        c.c, c.parts["c"] = cval, crefs
    chain = _one_chain(tr, c, tr.resistance(rc_net, c.vcc_net), f"{_pin_label(rc)} to the supply")
    rint = pins.get("RINT")
    rint_on_vcc = rint is not None and c.vcc_net is not None and tr.net(ref, str(rint.pin)) == c.vcc_net
    if chain is not None:
        _set_r(c, chain, "r")
        if rint_on_vcc and fam_has_rint(t):
            c.problems.append(Problem(f"{c.label}: RINT is tied to the supply and an external resistor is fitted too "
                                      "(both in parallel); the external one is traced", where, "network"))
    elif rint_on_vcc and fam_has_rint(t):
        c.internal_r = True
        c.parts["r"] = []
    else:
        c.problems.append(Problem(f"{c.label}: no timing resistor from {_pin_label(rc)} to the supply "
                                  f"({c.vcc_net}){_why_open(tr, rc_net, (ref, str(rc.pin)))}", where, "unresolved"))
    c.mode = "mono"


def _outputs_open(tr: Tracer, ref: str, pins: dict) -> bool:
    """Whether every output pin of the channel (Q, Q̄, or a bare transistor's collector and emitter) is open."""
    outs = [pins[f] for f in ("Q", "QN", "OUT_C", "OUT_E") if f in pins]
    return all(tr.is_open(tr.net(ref, str(p.pin)), (ref, str(p.pin))) for p in outs)


def _trace_single_pin(tr: Tracer, t: Timer, c: Channel, pins: dict, rc) -> None:
    """One timing pin per section: C from it to ground, R from the supply (or VREF) to it.

    The NE558's TIMING pins (Philips NE558 product data, 2003 Feb 14) and the
    LM3905's R/C pin, whose resistor returns to the reference output VREF, not to V+
    (National LM122/LM322/LM3905, February 1995, pin function description): a
    resistor to V+ on such a part charges towards another voltage, so the law does
    not hold and the channel is not traced.
    """
    ref = t.part.ref
    own = (ref, str(rc.pin))
    rc_net = tr.net(ref, str(rc.pin))
    cval, crefs, _ = tr.capacitance_to_ground(rc_net)
    q_open = _outputs_open(tr, ref, pins)
    if cval == 0.0 and tr.is_open(rc_net, own) and q_open:
        c.unused = True
        return
    where = Where(c.where.file, c.where.sheet, ref)
    if cval == 0.0:
        c.problems.append(Problem(f"{c.label}: no capacitor found from {_pin_label(rc)} to ground (net {rc_net})"
                                  f"{_why_open(tr, rc_net, own)}", where, "unresolved"))
    else:
        c.c, c.parts["c"] = cval, crefs
    vref = pins.get("VREF")
    top_net = tr.net(ref, str(vref.pin)) if vref is not None else c.vcc_net
    top = _pin_label(vref) if vref is not None else f"the supply ({c.vcc_net})"
    chain = _one_chain(tr, c, tr.resistance(rc_net, top_net), f"{_pin_label(rc)} to {top}")
    if chain is not None:
        _set_r(c, chain, "r")
    elif vref is not None and tr.resistance(rc_net, c.vcc_net):
        c.problems.append(Problem(f"{c.label}: the timing resistor returns to the supply ({c.vcc_net}), not to "
                                  f"{_pin_label(vref)}: {t.family.id} times from its reference, so the law does not "
                                  "hold for this network", where, "network"))
    else:
        c.problems.append(Problem(f"{c.label}: no timing resistor from {_pin_label(rc)} to {top}"
                                  f"{_why_open(tr, rc_net, own)}", where, "unresolved"))
    c.mode = "mono"


def fam_has_rint(t: Timer) -> bool:
    return t.family.timing.r_internal is not None


def _why_open(tr: Tracer, net: str | None, own) -> str:
    if net is None or tr.is_open(net, own):
        return "; the timing pin is left open"
    ext = [f"{r}.{p}" for r, p in tr.pins(net) if r in tr.rec.connectors]
    if ext:
        return f"; the timing pin goes to connector pin {', '.join(ext)} (off the board)"
    return ""


def _set_r(c: Channel, chain: Chain, role: str) -> None:
    fixed_refs = [r for r in chain.refs if r not in chain.pot_refs]
    if role == "rb" or role == "r":
        setattr(c, role, chain.fixed if chain.fixed > 0 else None)
        if chain.pot:
            c.pot = chain.pot
            c.parts["pot"] = chain.pot_refs
    else:  # RA: a trimmer here is taken at its mid travel
        setattr(c, role, chain.fixed + chain.pot / 2)
        if chain.pot:
            c.problems.append(Problem(f"{c.label}: trimmer {', '.join(chain.pot_refs)} sits in the RA leg; taken at "
                                      "half its travel", c.where, "network"))
    c.parts[role] = fixed_refs


def _trace_555(tr: Tracer, t: Timer, c: Channel, pins: dict) -> None:
    ref = t.part.ref
    get = {f: (tr.net(ref, str(p.pin)) if p else None) for f, p in
           ((f, pins.get(f)) for f in ("TRIG", "THRES", "DIS", "CONT", "RESET", "OUT"))}
    where = Where(c.where.file, c.where.sheet, ref)
    thr, trig, dis = get["THRES"], get["TRIG"], get["DIS"]
    if thr is not None and tr.is_open(thr, (ref, str(pins["THRES"].pin))) and tr.is_open(trig, (ref, str(pins["TRIG"].pin))):
        c.unused = True
        return
    if thr is not None and thr == trig:
        c.mode = "astable"
        cval, crefs, _ = tr.capacitance_to_ground(thr)
        rb = _one_chain(tr, c, tr.resistance(dis, thr), "DIS to THRES/TRIG (RB)")
        ra = _one_chain(tr, c, tr.resistance(c.vcc_net, dis), "the supply to DIS (RA)")
        if rb is not None and rb.fixed == 0 and rb.pot == 0:
            rb = None
        if rb is None:
            c.problems.append(Problem(f"{c.label}: no resistor from DIS to THRES/TRIG (RB){_why_open(tr, dis, (ref, str(pins['DIS'].pin)))}",
                                      where, "unresolved"))
        else:
            _set_r(c, rb, "rb")
        if ra is None:
            c.problems.append(Problem(f"{c.label}: no resistor from the supply to DIS (RA)", where, "unresolved"))
        else:
            _set_r(c, ra, "ra")
    elif thr is not None and thr == dis:
        c.mode = "mono"
        cval, crefs, _ = tr.capacitance_to_ground(thr)
        chain = _one_chain(tr, c, tr.resistance(c.vcc_net, thr), "the supply to THRES/DIS")
        if chain is None:
            c.problems.append(Problem(f"{c.label}: no timing resistor from the supply to THRES/DIS", where, "unresolved"))
        else:
            _set_r(c, chain, "r")
    else:
        c.problems.append(Problem(f"{c.label}: THRES joins neither TRIG (astable) nor DIS (monostable); "
                                  f"the network cannot be traced{_why_open(tr, thr, (ref, str(pins['THRES'].pin)))}",
                                  where, "unresolved"))
        return
    if cval == 0.0:
        c.problems.append(Problem(f"{c.label}: no timing capacitor from THRES to ground", where, "unresolved"))
    else:
        c.c, c.parts["c"] = cval, crefs
    cont = pins.get("CONT")
    if cont is not None:
        own = (ref, str(cont.pin))
        ccap, crefs2, _ = tr.capacitance_to_ground(get["CONT"])
        st = tr.state(get["CONT"], own, c.vcc_net)
        c.cont = {"state": "capacitor" if ccap else st["state"], "capacitance": ccap or None, "parts": crefs2,
                  "detail": ", ".join(crefs2) if ccap else st["detail"], "net": get["CONT"]}


def _inputs(tr: Tracer, t: Timer, c: Channel, by_fn: dict) -> None:
    ref = t.part.ref
    fam, pkg = t.family, t.package
    for p in pkg.pins:
        if p.function not in INPUTS or p.channel not in (None, c.channel):
            continue
        own = (ref, str(p.pin))
        st = tr.state(tr.net(ref, str(p.pin)), own, c.vcc_net)
        if p.function == "TRIG" and c.mode == "astable" and st["net"] == tr.net(ref, str(next(
                q.pin for q in pkg.pins if q.function == "THRES" and q.channel == c.channel))):
            st = {"state": "network", "detail": "joined to THRES (astable)", "net": st["net"]}
        c.inputs[_pin_label(p)] = {"function": p.function, **{k: v for k, v in st.items() if k != "by"}}
        st_by = st.get("by")
        if p.function in ("TRIG", "TRIG_FALL", "TRIG_RISE") and st["state"] in ("driven", "external") and c.trigger is None:
            edge = "falling" if p.function in ("TRIG", "TRIG_FALL") else "rising"
            src = st_by[0] if st_by else None
            supply, rail = tr.part_supply(src[0]) if src and st["state"] == "driven" else (None, None)
            c.trigger = {"input": _pin_label(p), "edge": edge, "source": f"{src[0]}.{src[1]}" if src else None,
                         "source_part": tr.board.parts[src[0]].value if src and src[0] in tr.board.parts else None,
                         "source_supply": supply, "source_rail": rail, "via": st.get("via"),
                         "external": st["state"] == "external"}
    if c.mode == "mono" and c.trigger is None:
        c.problems.append(Problem(f"{c.label}: no trigger input is driven (the one-shot never fires)", c.where,
                                  "unresolved"))
