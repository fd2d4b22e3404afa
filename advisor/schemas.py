"""JSON Schemas of the commands' ``--json`` answers, generated from :mod:`advisor.answers`.

``python -m advisor.schemas`` writes ``schemas/<command>.schema.json`` (checked in);
``python -m advisor.schemas --check`` exits 1 when a checked-in file differs from the
models. ``tests/test_schemas.py`` runs both sides: the files match the models, and
every command example in the README validates against its schema.
"""

from __future__ import annotations

import json
import sys
from pathlib import Path

#: Where the schemas live in a source checkout.
SCHEMA_DIR = Path(__file__).resolve().parents[1] / "schemas"


def schema_of(name: str) -> dict:
    """The JSON Schema (draft 2020-12) of command ``name``'s answer."""
    from advisor.answers import ANSWERS

    model = ANSWERS[name]
    schema = model.model_json_schema(by_alias=True)
    return {"$schema": "https://json-schema.org/draft/2020-12/schema",
            "$id": f"retime/{name}.schema.json", **schema}


def rendered() -> dict[str, str]:
    """File name -> file text for every command."""
    from advisor.answers import ANSWERS

    return {f"{name}.schema.json": json.dumps(schema_of(name), indent=2, ensure_ascii=False, sort_keys=True) + "\n"
            for name in ANSWERS}


def main(argv: list[str] | None = None) -> int:
    argv = sys.argv[1:] if argv is None else argv
    files = rendered()
    if "--check" in argv:
        stale = [n for n, text in files.items()
                 if not (SCHEMA_DIR / n).is_file() or (SCHEMA_DIR / n).read_text(encoding="utf-8") != text]
        for n in stale:
            sys.stderr.write(f"schemas/{n} differs from advisor/answers.py: run python -m advisor.schemas\n")
        return 1 if stale else 0
    SCHEMA_DIR.mkdir(exist_ok=True)
    for n, text in files.items():
        (SCHEMA_DIR / n).write_text(text, encoding="utf-8")
    sys.stdout.write(f"wrote {len(files)} schemas to {SCHEMA_DIR}\n")
    return 0


if __name__ == "__main__":  # pragma: no cover
    raise SystemExit(main())
