"""The rule grammar: records for one entry of ``rules/*.yaml``, validated by pydantic.

Frozen and strict about unknown keys, like the catalog grammar
(:mod:`advisor.parts`), so a misspelt key is a located error, not a silently
ignored setting. The grammar is summarised for contributors in
``rules/README.md``.
"""

from __future__ import annotations

from typing import Literal, Union

from advisor.record import Field, Record

from advisor.parts import Function, Technology

Severity = Literal["danger", "warning", "note"]
Scope = Literal["part", "swap", "board"]  # board: advisor/board/facts.py
Role = Literal["new", "old"]
#: A case value. Validated strictly (no "1" for 1, no 1 for true: :func:`_strict_names`);
#: this plain form is what the start-up cache checks rebuilt values against.
Scalar = Union[bool, int, float, str, None]


def _strict_names() -> dict:
    """``Scalar`` as pydantic validates it (pydantic's strict kinds exist only with pydantic)."""
    from pydantic import StrictBool, StrictFloat, StrictInt, StrictStr

    return {"Scalar": Union[StrictBool, StrictInt, StrictFloat, StrictStr, None]}
#: What a firing means for a swap, mildest first (advisor.substitute.classify.CLASS_ORDER).
SwapClass = Literal["drop-in-new-values", "rewire", "redesign", "unsuitable"]
#: What a firing rules out: ``kept-values`` = the network it fires on is not kept
#: (a swap designs new values; design ranks such candidates last).
Block = Literal["kept-values"]
#: Bench action words of a rework step (advisor.substitute.rework.ACTIONS).
ReworkAction = Literal["remove", "adapter", "lift", "jumper", "tie", "isolate", "add", "fit", "keep", "set",
                       "fit-part", "protect"]

RULE_ID = r"^[a-z0-9][a-z0-9-]{1,62}$"


class _Frozen(Record):
    """Frozen, unknown keys refused (advisor.record)."""


class AppliesTo(_Frozen):
    """Where a rule applies.

    ``scope: part`` rules read ``part.*`` and run once for every part named in
    ``parts`` that the context has (``new`` in a check; ``new`` and/or ``old``
    in a swap). ``scope: swap`` rules read ``old.*`` and ``new.*`` and run only
    in a swap. ``function``/``technology``/``family`` narrow the rule to parts
    (the subject part, or the new part of a swap) that match any listed value;
    an empty list matches all.
    """

    scope: Scope = "part"
    parts: list[Role] = Field(default_factory=lambda: ["new"], min_length=1)
    function: list[Function] = Field(default_factory=list)
    technology: list[Technology] = Field(default_factory=list)
    family: list[str] = Field(default_factory=list)


class Cases(_Frozen):
    """Example inputs as plain data: each case maps context names to values.

    Names not given are missing (None). Every rule has at least one case that
    must fire and one that must not; one parametrised test runs them all.
    """

    _record_validation_names = staticmethod(_strict_names)

    fire: list[dict[str, Scalar]] = Field(min_length=1)
    no_fire: list[dict[str, Scalar]] = Field(min_length=1)
    #: Command lines (as typed after ``retime``) whose real circuit must fire the rule: they
    #: go through the engine and build_context, not a hand-written context
    #: (tests/test_rules_cases.py runs them).
    run: list[str] = Field(default_factory=list)


class Rework(_Frozen):
    """A bench step the rule's firing adds to a swap's rework plan, before power-up.

    ``step`` is a template like ``message``; ``fixes`` says whether the hazard is
    gone once the step is done (a danger whose rule has no fixing step ends the
    plan with "do not power up").
    """

    action: ReworkAction
    step: str = Field(min_length=3)
    fixes: bool = True


class Rule(_Frozen):
    id: str = Field(pattern=RULE_ID)
    title: str = Field(min_length=3, max_length=120)
    applies_to: AppliesTo = Field(default_factory=AppliesTo)
    condition: str = Field(min_length=1)
    severity: Severity
    message: str = Field(min_length=3)
    fix: str = Field(min_length=3)
    source: str = Field(min_length=3)
    cases: Cases
    note: str | None = None
    swap_class: SwapClass | None = None
    blocks: list[Block] = Field(default_factory=list)
    rework: Rework | None = None


class RuleFile(_Frozen):
    """One ``rules/<topic>.yaml``: a topic line and its rules (validated one by one)."""

    topic: str
    rules: list[dict] = Field(min_length=1)
