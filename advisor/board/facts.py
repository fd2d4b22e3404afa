"""Board facts for the board rules (``rules/board.yaml``, ``applies_to.scope: board``).

A board rule reads the ``part.*`` names of :mod:`advisor.rules.context` for the
part it looks at (``new``: the plan's replacement at the new supply; ``old``: the
part on the board today) plus the ``board.*`` names below, which only a traced
schematic knows. Plain values only, SI units; a fact the board does not show is
None and a condition that needs it stays silent.
"""

from __future__ import annotations

#: (name, kind, unit, meaning); advisor.rules.loader adds them to the board scope's vocabulary.
#: Plain tuples here: this module is imported by the rules loader and must not import the rules package.
BOARD_VOCABULARY: tuple[tuple[str, str, str, str], ...] = (
    ("board.ref", "text", "", "reference designator of the timer (and channel)"),
    ("board.old_bipolar", "bool", "", "the part on the board today has bipolar (TTL) inputs"),
    ("board.open_inputs", "number", "", "inputs of this channel left open on the board (no net, or a no-connect flag)"),
    ("board.open_list", "text", "", "those inputs, e.g. 'pin 3 (1CLR)'"),
    ("board.reset_open", "bool", "", "the reset / clear input of this channel is left open"),
    ("board.cont_c", "number", "F", "capacitance from CONT to ground (None when none)"),
    ("board.driver", "text", "", "the part pin driving the trigger input, e.g. 'U1.2 (74HC14)'"),
    ("board.driver_high", "number", "V", "the trigger source's high level once the board has moved (its supply)"),
    ("board.rail", "text", "", "name of the supply net of the timer"),
    ("board.rail_loads", "number", "", "other integrated parts on the same supply net"),
    ("board.decoupled", "bool", "", "a capacitor joins the timer's supply and ground nets on its sheet"),
)

def board_vocabulary(part_vocabulary: dict) -> dict:
    """Every name a board rule may read: the part rules' names plus ``board.*`` (as rules Var objects)."""
    from advisor.rules.context import Var

    out = dict(part_vocabulary)
    out.update({name: Var(name, kind, unit, doc) for name, kind, unit, doc in BOARD_VOCABULARY})  # type: ignore[arg-type]
    return out


_CLEARS = ("RESET", "CLEAR", "MASTER_RESET")


def board_facts(channel, old_family, driver_high: float | None) -> dict[str, object]:
    """The ``board.*`` values of one traced channel."""
    opened = [label for label, st in channel.inputs.items() if st["state"] == "open"]
    reset_open = any(st["state"] == "open" for st in channel.inputs.values() if st["function"] in _CLEARS)
    trig = channel.trigger or {}
    src = trig.get("source")
    return {
        "board.ref": channel.label,
        "board.old_bipolar": old_family.technology in ("bipolar", "ttl", "ls", "als"),
        "board.open_inputs": float(len(opened)),
        "board.open_list": ", ".join(opened) if opened else None,
        "board.reset_open": reset_open,
        "board.cont_c": (channel.cont or {}).get("capacitance"),
        "board.driver": f"{src} ({trig.get('source_part')})" if src else None,
        "board.driver_high": driver_high,
        "board.rail": channel.vcc_net,
        "board.rail_loads": float(channel.rail_loads),
        "board.decoupled": bool(channel.decoupling),
    }


def evaluate_board_rules(rules, facts: dict, parts: dict[str, dict]) -> list:
    """Findings of the board rules: ``parts`` maps a role (new, old) to that part's ``part.*``-free values."""
    from advisor.findings import sort_findings

    out = []
    for rule in rules.rules:
        scope = rule.rule.applies_to
        if scope.scope != "board":
            continue
        for role in scope.parts:
            values = parts.get(role)
            if values is None:
                continue
            view = {**{f"part.{k}": v for k, v in values.items()}, **facts}
            if rule.fires(view):
                out.append(rule.finding(view, part=values.get("id")))  # type: ignore[arg-type]
    return sort_findings(out)
