"""Shareable reports (HTML with inline SVG pictures, or Markdown) from a result's JSON.

:func:`render_report` is the one entry point: the format follows the file's extension
(``.html``/``.htm`` or ``.md``/``.markdown``); the file is written atomically (a
temporary file in the same folder, then renamed), so a failed run never leaves half
a report behind.
"""

from __future__ import annotations

import os
from pathlib import Path
from typing import Any

from advisor.errors import InputError

HTML_SUFFIXES = (".html", ".htm")
MARKDOWN_SUFFIXES = (".md", ".markdown")


def report_format(path: str | os.PathLike) -> str:
    """``"html"`` or ``"markdown"`` by extension; InputError for anything else."""
    suffix = Path(path).suffix.lower()
    if suffix in HTML_SUFFIXES:
        return "html"
    if suffix in MARKDOWN_SUFFIXES:
        return "markdown"
    raise InputError(
        f"--report {str(path)!r}: cannot tell the report format from {suffix or 'a name without an extension'!r}",
        expected="a file name ending in .html, .htm or .md",
    )


def render_text(result_json: dict, kind: str, fmt: str, catalog: Any = None) -> str:
    """The report as text, ``fmt`` ``"html"`` or ``"markdown"``."""
    from advisor.report.model import build_report

    rep = build_report(result_json, kind, catalog)
    if fmt == "html":
        from advisor.report.html import render_html

        return render_html(rep)
    from advisor.report.markdown import render_markdown

    return render_markdown(rep)


def render_report(result_json: dict, path: str | os.PathLike, kind: str, catalog: Any = None) -> Path:
    """Write the report for ``result_json`` (a ``to_json()`` dict) of command ``kind``
    (check, swap, alternates or bom) to ``path``; returns the path written.

    ``catalog`` (optional) supplies pin numbers and the families' source lists.
    """
    fmt = report_format(path)
    if not isinstance(result_json, dict) and hasattr(result_json, "to_json"):
        result_json = result_json.to_json()
    text = render_text(result_json, kind, fmt, catalog)
    from advisor.files import atomic_write

    return atomic_write(path, text.encode("utf-8"), what="--report")
