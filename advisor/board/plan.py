"""The board plan: every traced timer checked today and moved to the new supply, plus the BOM delta.

Per channel the plan calls the engine the commands use — ``check_circuit`` (what
``retime check`` runs) at today's supply, ``alternates`` (``retime alternates``)
at the new supply, whose best candidate is the ``swap`` result of the plan — and
evaluates the board rules (``rules/board.yaml``) on the board's facts. Nothing
is recomputed here. The other channels of a multi-channel package follow the
first channel's choice (``swap`` to the same part), so one package serves them.

Rails: with ``new_vcc`` every rail that feeds a traced timer moves to it; a
trigger source on such a rail moves with it, one on another rail keeps its level
(and the swap checks that level against the new part's inputs).
"""

from __future__ import annotations

from dataclasses import dataclass, field

from advisor.board.model import Board, Problem, Where
from advisor.circuit import Circuit, Trigger
from advisor.errors import RetimeError
from advisor.values import format_code, format_eng

ALTERNATES_LIMIT = 3


@dataclass
class TimerPlan:
    channel: object  # advisor.board.network.Channel
    circuit: Circuit | None = None
    check: object | None = None  # TimingResult at today's supply
    alternates: object | None = None  # AlternatesResult at the new supply
    choice: object | None = None  # SwapResult: the plan
    findings: list = field(default_factory=list)  # board-rule findings
    note: str | None = None

    def to_json(self) -> dict:
        ch = self.channel
        alt = self.alternates.to_json() if self.alternates is not None else None
        return {
            "ref": ch.ref, "channel": ch.channel, "label": ch.label, "old": ch.family.id,
            "circuit": self.circuit.to_json() if self.circuit is not None else None,
            "check": self.check.to_json() if self.check is not None else None,
            "new": self.choice.new.family if self.choice is not None else None,
            "class": self.choice.cls if self.choice is not None else None,
            "swap": self.choice.to_json() if self.choice is not None else None,
            "alternates": alt["candidates"] if alt else [],
            "rejected": alt["rejected"] if alt else [],
            "board_findings": [f.to_json() for f in self.findings],
            "note": self.note,
        }


@dataclass
class BoardPlan:
    board: Board
    new_vcc: float | None
    supplies: dict[str, float]
    channels: list
    plans: list[TimerPlan]
    bom_delta: dict
    unresolved: list[Problem]
    assumptions: list[str] = field(default_factory=list)  # what the whole plan assumed (advisor.overrides)

    def to_json(self) -> dict:
        return {
            "file": self.board.file,
            "source": self.board.source,
            "sheets": self.board.sheets,
            "new_vcc": self.new_vcc,
            "supplies": dict(self.supplies),
            "nets": self.board.nets_json(),
            "timers": [{"part": self.board.parts[c.ref].value, **c.to_json()} for c in self.channels],
            "plan": [p.to_json() for p in self.plans],
            "bom_delta": self.bom_delta,
            "unresolved": [p.to_json() for p in self.unresolved],
            "assumptions": list(self.assumptions),
        }


def _driver_levels(ch, moved_rails: set, new_vcc: float | None) -> tuple[float | None, float | None, float | None, str | None]:
    """(today's high, the high the swap checks (None: moves with the part), the high after the move, a note)."""
    trig = ch.trigger
    if not trig:
        return None, None, None, None
    if trig.get("external"):
        return None, None, None, f"trigger from {trig['source'] or 'a connector'}: its level is not on the board"
    today = trig.get("source_supply")
    rail = trig.get("source_rail")
    if new_vcc is None:
        return today, None, today, None
    if rail is not None and (rail in moved_rails or rail == ch.vcc_net):
        return today, None, new_vcc, None
    if today is None:
        return None, None, None, f"the supply of the trigger source {trig['source']} is not known"
    return today, today, today, f"the trigger source {trig['source']} stays on {rail} at {today:g} V"


def plan_board(catalog, board: Board, *, new_vcc: float | None = None, supplies: dict[str, float] | None = None,
               rules=None) -> BoardPlan:
    from advisor.board.facts import board_facts, evaluate_board_rules
    from advisor.board.network import Tracer, trace_timer
    from advisor.board.rails import Rails
    from advisor.board.recognise import recognise_board
    from advisor.checking import check_circuit
    from advisor.rules.context import part_values
    from advisor.substitute.alternates import alternates
    from advisor.substitute.swap import swap

    if rules is None:
        from advisor.rules.loader import load_rules_checked

        rules = load_rules_checked()
    rec = recognise_board(catalog, board)
    rails = Rails(supplies)
    tracer = Tracer(board, rec, rails)
    # A passive's unreadable value or untraceable wiring matters where it touches a timer's pin;
    # elsewhere on the board (a pot wired as a divider in an audio stage) it is not this plan's business.
    timer_nets = {n.name for t in rec.timers for n in board.nets if any(r == t.part.ref for r, _ in n.pins)
                  if not n.power}
    near = {r for n in board.nets if n.name in timer_nets for r, _ in n.pins}
    unresolved: list[Problem] = list(board.problems) + [
        p for p in list(rec.problems) + list(tracer.problems) if p.where.ref in near]
    channels = []
    for t in rec.timers:
        for ch in trace_timer(tracer, t):
            unresolved.extend(ch.problems)
            if not ch.unused:
                channels.append(ch)
    _unknown_ics(board, rec, unresolved)
    names = {n.name.lower().lstrip("/") for n in board.nets} | {n.name.lower().rsplit("/", 1)[-1] for n in board.nets}
    for net in supplies or {}:
        if net.lower().lstrip("/") not in names:
            unresolved.append(Problem(f"--supply {net}: no net of that name on the board", Where(board.file), "unresolved"))
    moved = {c.vcc_net for c in channels if c.vcc_net} if new_vcc is not None else set()
    plans: list[TimerPlan] = []
    cache: dict = {}
    chosen_for_ref: dict[str, str] = {}
    for ch in channels:
        tp = TimerPlan(ch)
        plans.append(tp)
        if not ch.traced:
            tp.note = "not planned: the network or the supply could not be traced (see unresolved)"
            continue
        today_high, swap_high, after_high, note = _driver_levels(ch, moved, new_vcc)
        tp.note = note
        edge = ch.trigger["edge"] if ch.trigger else None
        base = Circuit(part=ch.family.id, vcc=ch.vcc, mode=ch.mode if ch.family.function == "timer-555" else None,
                       r=ch.r, ra=ch.ra, rb=ch.rb, c=ch.c, pot=ch.pot,
                       # the board reader keeps a trimmer only in the RB leg (an RA trimmer is folded in)
                       pot_in="rb" if ch.pot and ch.mode == "astable" else None)
        where = Where(ch.where.file, ch.where.sheet, ch.ref)
        try:
            tp.circuit = base.with_(trigger=Trigger(None, edge, today_high))
            tp.check = _cached(cache, ("check", tp.circuit), lambda: check_circuit(ch.family, tp.circuit))
            moving = base.with_(trigger=Trigger(None, edge, swap_high))
            if ch.ref in chosen_for_ref:
                new_id = chosen_for_ref[ch.ref]
                tp.choice = _cached(cache, ("swap", moving, new_id, new_vcc),
                                    lambda: swap(catalog, ch.family.id, new_id, moving, new_vcc=new_vcc))
            else:
                tp.alternates = _cached(cache, ("alt", moving, new_vcc), lambda: alternates(
                    catalog, ch.family.id, moving, new_vcc=new_vcc, limit=ALTERNATES_LIMIT))
                if tp.alternates.candidates:
                    tp.choice = tp.alternates.candidates[0]
                    chosen_for_ref[ch.ref] = tp.choice.new.family
                else:
                    unresolved.append(Problem(f"{ch.label}: no catalog part runs this circuit at "
                                              f"{new_vcc if new_vcc is not None else ch.vcc:g} V", where, "network"))
        except RetimeError as exc:
            from advisor.inputnames import rename_flags

            unresolved.append(Problem(f"{ch.label}: {rename_flags(exc.message, channel_names(ch))}", where, "network"))
            continue
        roles = {"old": part_values(ch.family, tp.circuit, tp.check.to_json())}
        if tp.choice is not None:
            new_fam = catalog.get(tp.choice.new.family)
            roles["new"] = part_values(new_fam, moving.with_(part=new_fam.id, vcc=tp.choice.new.vcc),
                                       tp.choice.to_json())
        tp.findings = evaluate_board_rules(rules, board_facts(ch, ch.family, after_high), roles)
    return BoardPlan(board, new_vcc, dict(supplies or {}), channels, plans, bom_delta(board, plans), unresolved)


def channel_names(ch) -> dict[str, str]:
    """What the board has in place of each flag the engine's messages name (advisor.inputnames):
    the references of the parts on the channel's timing pins (``--r`` -> ``R3``, ``--c`` ->
    ``C2``), and its supply rail."""
    out = {f"--{role}": " + ".join(refs) for role, refs in (ch.parts or {}).items() if refs}
    if ch.vcc_net:
        out["--vcc"] = f"rail {ch.vcc_net}"
    return out


def _cached(cache: dict, key, make):
    """One engine call per distinct circuit: a repeated sheet instance costs nothing more."""
    try:
        hash(key)
    except TypeError:
        return make()
    if key not in cache:
        cache[key] = make()
    return cache[key]


def _unknown_ics(board: Board, rec, unresolved: list[Problem]) -> None:
    """Integrated parts named like timers but not in the catalog (a 555-like value, a one-shot number)."""
    import re

    known = {t.part.ref for t in rec.timers}
    for ref, part in board.parts.items():
        if ref in known or ref in rec.passives or not ref.upper().startswith(("U", "IC")):
            continue
        if re.search(r"555|556|7555|12[123]|22[1]|4[05]38|4528|4098|4047|9602", part.value + part.lib_id):
            unresolved.append(Problem(f"{ref} ({part.value or part.lib_id}) looks like a timer but is not in the "
                                      "catalog; it is not planned", part.where, "symbol"))


_ROLE_KIND = {"r": "resistance", "ra": "resistance", "rb": "resistance", "pot": "resistance", "c": "capacitance"}
_ROLE_NAME = {"r": "timing resistor", "ra": "RA", "rb": "RB", "pot": "trimmer", "c": "timing capacitor"}


def _code(v: float, role: str) -> str:
    unit = "F" if role == "c" else "Ω"
    return format_eng(v, unit)


def bom_delta(board: Board, plans: list[TimerPlan]) -> dict:
    """Parts to replace, values to change and parts to add, by reference, and what to buy."""
    replace, change, add, buy = [], [], [], {}
    done_refs: set[str] = set()
    for tp in plans:
        sw, ch = tp.choice, tp.channel
        if sw is None:
            continue
        if ch.ref not in done_refs:
            done_refs.add(ch.ref)
            if sw.new.family.upper() != ch.family.id.upper():
                replace.append({"ref": ch.ref, "old": board.parts[ch.ref].value, "old_family": ch.family.id,
                                "new": sw.new.family, "class": sw.cls})
                buy.setdefault(sw.new.family, []).append(ch.ref)
        old_v, new_v = sw.old.values, sw.new.values
        for role in ("r", "ra", "rb", "pot", "c"):
            o, n = old_v.get(role), new_v.get(role)
            refs = ch.parts.get(role, [])
            if n is None or (o is not None and abs(n - o) <= 1e-9 * max(abs(o), 1e-30)):
                continue
            item = f"{_ROLE_NAME[role]} {_code(n, role)}"
            if o is None or not refs:
                add.append({"for": ch.label, "role": role, "value": n, "text": f"add a {item} ({sw.new.family})"})
            else:
                change.append({"ref": "+".join(refs), "role": role, "for": ch.label, "old": o, "new": n,
                               "text": f"{'+'.join(refs)}: {_code(o, role)} → {_code(n, role)}"
                                       + (" (one part for the series chain)" if len(refs) > 1 else "")})
            buy.setdefault(f"{'R' if role != 'c' else 'C'} {format_code(n, _ROLE_KIND[role])}", []).append(
                "+".join(refs) if refs else f"new at {ch.ref}")
    return {
        "replace": replace,
        "change": change,
        "add": add,
        "buy": [{"part": k, "qty": len(v), "refs": v} for k, v in buy.items()],
    }
