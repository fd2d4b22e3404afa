"""A family's lifecycle statement in the shapes the faces show it.

The statement itself is catalog data (``lifecycle`` in each catalog file, grammar in
:class:`advisor.parts.Lifecycle`): a status (``active``, ``nrnd`` = not recommended
for new designs, ``last-time-buy``, ``obsolete``), the date it was read, its source,
and per-maker statements where makers differ. A statement from memory says so.
"""

from __future__ import annotations

from advisor.parts import STATUS_ORDER, Family


def status_rank(status: str | None) -> int:
    """0 for active … 4 for obsolete (:data:`advisor.parts.STATUS_ORDER`); unknown sits before obsolete."""
    return STATUS_ORDER.index(status) if status in STATUS_ORDER else STATUS_ORDER.index("unknown")


def lifecycle_json(fam: Family) -> dict:
    """``{status, as_of, source, note, makers: [{maker, status, as_of, source}]}`` (nulls when not recorded)."""
    life = fam.lifecycle
    if life is None:
        return {"status": fam.status, "as_of": None, "source": None, "note": None, "makers": []}
    return {
        "status": life.status, "as_of": life.as_of, "source": life.source, "note": life.note,
        "makers": [{"maker": m.maker, "status": m.status, "as_of": m.as_of, "source": m.source, "note": m.note}
                   for m in life.makers],
    }


def _said(source: str | None, as_of: str | None) -> str:
    where = "from memory" if source == "memory" else (source or "no source")
    return f"{where}, {as_of}" if as_of else where


def status_text(fam: Family) -> str:
    """One line: ``obsolete (from memory, 2026-12); TI active, onsemi obsolete``."""
    life = fam.lifecycle
    if life is None:
        return fam.status  # a local family file without a lifecycle block
    text = f"{life.status} ({_said(life.source, life.as_of)})"
    if life.makers:
        text += "; " + ", ".join(f"{m.maker} {m.status}" for m in life.makers)
    return text
