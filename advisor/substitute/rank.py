"""The alternates ranking: the facts each candidate is ranked on, the sort key, and the
one-line reason for its place.

The order (README.md, "How alternates are ranked"), each criterion deciding only among
candidates equal on every one before it:

1. lifecycle first as a barrier: an obsolete part never ranks above one that is still
   made (obsolete candidates come after every other one, marked, or are left out);
2. suitability class (``drop-in`` … ``redesign``, :data:`CLASS_ORDER`);
3. lifecycle among the rest: active, then not recommended for new designs, then
   last-time-buy, then no statement;
4. behaviour kept: retriggering, clear-triggering, Schmitt inputs on the edge used,
   power-up state: fewer changes first;
5. fewest parts changed on the board: keep R and C, then one part, then two;
6. same mounting: a through-hole board gets through-hole parts first;
7. timing error, in steps of the circuit's tolerance (a smaller difference is the
   rounding of standard values, not the part);
8. in stock (``--stock``) first among equals; then the exact error, then the id.

The number of rework steps is no criterion of its own: the class and the parts
changed already say what the bench work is.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass

from advisor.lifecycle import status_rank
from advisor.parts import Family
from advisor.substitute.classify import CLASS_ORDER
from advisor.substitute.rework import VALUE_LABELS, changed_values

#: Package name prefixes of through-hole packages (common practice: JEDEC/EIAJ outline names).
THROUGH_HOLE = ("DIP", "PDIP", "CDIP", "SIP", "TO-", "ZIP")


def mounting(package: str | None) -> str:
    """``through-hole`` or ``surface`` from a package name (DIP-14 → through-hole, SOIC-8 → surface)."""
    name = (package or "").upper()
    return "through-hole" if name.startswith(THROUGH_HOLE) else "surface"


def _specified(text: str | None) -> bool:
    return bool(text) and not text.lower().startswith("not specified")


def behaviour_changes(old: Family, new: Family, edge: str | None = None) -> list[str]:
    """What the new part does differently from the old on the four ranked behaviours."""
    out: list[str] = []
    ob, nb = old.behaviour, new.behaviour
    if ob.retrigger != nb.retrigger and nb.retrigger != "selectable":
        word = {"yes": "retriggerable", "no": "not retriggerable", "selectable": "retrigger selectable"}
        out.append(f"{word[nb.retrigger]} ({old.id}: {word[ob.retrigger]})")
    if ob.clear is not None:
        if nb.clear is None:
            out.append(f"no clear input ({old.id} has {ob.clear.name})")
        elif ob.clear.triggers_on_release != nb.clear.triggers_on_release:
            out.append("clear release " + ("triggers a pulse" if nb.clear.triggers_on_release else "does not trigger")
                       + f" ({old.id}: {'does' if ob.clear.triggers_on_release else 'does not'})")
    used = [t for t in ob.triggers if edge is None or t.edge == edge]
    for t in used:
        if t.schmitt and not any(n.schmitt and n.function == t.function for n in nb.triggers):
            out.append(f"no Schmitt input for {t.name}'s edge ({old.id}'s {t.name} is one)")
            break
    if _specified(ob.power_up) and (ob.power_up or "").strip() != (nb.power_up or "").strip():
        out.append("power-up state differs (compare both sheets)")
    return out


@dataclass(frozen=True)
class RankFacts:
    """Everything a candidate is ranked on (see the module docstring)."""

    cls: str
    status: str
    behaviour: tuple[str, ...]
    changed: tuple[str, ...]  # labels of the network parts that change (Rext, RA, RB, C, …)
    mounting: str
    old_mounting: str
    package: str | None
    old_package: str | None
    error: float | None
    tolerance: float
    in_stock: str | None = None  # the stock-list entry that matched, when a list was given
    family: str = ""

    def key(self) -> tuple:
        err = abs(self.error) if self.error is not None else 1.0
        step = int(err / self.tolerance) if self.tolerance > 0 else err
        return (
            self.status == "obsolete",
            CLASS_ORDER.index(self.cls),
            status_rank(self.status),
            len(self.behaviour),
            min(len(self.changed), 2),
            self.mounting != self.old_mounting,
            step,
            self.in_stock is None,
            err,
            self.family,
        )

    def reason(self) -> str:
        """One line saying where the candidate stands on each criterion, in ranking order."""
        bits = []
        if self.status == "obsolete":
            bits.append("obsolete: listed after every part still made")
        bits.append(self.cls)
        if self.status != "obsolete":
            bits.append(self.status if self.status != "unknown" else "no lifecycle statement")
        bits.append("behaviour kept" if not self.behaviour else "behaviour: " + ", ".join(self.behaviour))
        if not self.changed:
            bits.append("keeps R and C")
        else:
            bits.append("changes " + " and ".join(self.changed))
        if self.mounting == self.old_mounting:
            bits.append(f"{self.mounting} like the old {self.old_package or 'part'}")
        else:
            bits.append(f"{self.mounting} ({self.package}) for a {self.old_mounting} board")
        if self.error is not None:
            bits.append(f"timing {self.error:+.1%}")
        if self.in_stock:
            bits.append(f"in stock ({self.in_stock})")
        return "; ".join(bits)

    def to_json(self) -> dict:
        d = asdict(self)
        d["class"] = d.pop("cls")
        d["behaviour"] = list(self.behaviour)
        d["changed"] = list(self.changed)
        return d


def rank_facts(result, old: Family, new: Family, *, tolerance: float, edge: str | None = None,
               old_values: dict | None = None, in_stock: str | None = None) -> RankFacts:
    """The ranking facts of one swap result (``advisor.substitute.swap.swap``)."""
    before = dict(old_values if old_values is not None else result.old.values)
    if before.get("r_internal"):
        before["r"] = None  # an on-chip resistor is no part on the board: an external one is added
    changed = changed_values(before, result.new.values)
    labels = tuple(VALUE_LABELS[k][1] for k in VALUE_LABELS if k in changed)
    return RankFacts(
        cls=result.cls, status=new.status, behaviour=tuple(behaviour_changes(old, new, edge)),
        changed=labels, mounting=mounting(result.pin_map.new_package), old_mounting=mounting(result.pin_map.old_package),
        package=result.pin_map.new_package, old_package=result.pin_map.old_package, error=result.error,
        tolerance=tolerance, in_stock=in_stock, family=new.id,
    )
