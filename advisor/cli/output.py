"""Shared output helpers for commands: JSON emission and catalog access."""

from __future__ import annotations

import json
import math
import sys
from dataclasses import asdict, is_dataclass


def to_plain(obj: object) -> object:
    """Dataclasses, pydantic models, tuples and numpy scalars to JSON-ready values.

    NaN and infinities become null (JSON has no spelling for them).
    """
    if hasattr(obj, "to_json"):
        return to_plain(obj.to_json())
    if is_dataclass(obj) and not isinstance(obj, type):
        return to_plain(asdict(obj))
    if hasattr(obj, "model_dump"):
        return to_plain(obj.model_dump(mode="json"))
    if isinstance(obj, dict):
        return {str(k): to_plain(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [to_plain(v) for v in obj]
    if isinstance(obj, float):
        return obj if math.isfinite(obj) else None
    if hasattr(obj, "item") and callable(obj.item):  # numpy scalar
        return to_plain(obj.item())
    return obj


def emit_json(obj: object) -> None:
    from advisor.cli.terminal import ascii_only

    json.dump(to_plain(obj), sys.stdout, ensure_ascii=ascii_only(), indent=2)
    sys.stdout.write("\n")


def catalog_for(args) -> "object":
    """The catalog with the command's ``--catalog`` folders; raises on load problems."""
    from advisor.catalog import load_catalog, require_clean

    return require_clean(load_catalog(tuple(getattr(args, "catalog", []) or [])))
