"""Access to the external oracles the published checks rely on.

Locally a test that needs ngspice or the open symbol library skips with a reason
when the package is missing; in CI (``REQUIRE_EXTERNAL=1``) it fails instead, so
a missing install step cannot pass silently.
"""

from __future__ import annotations

import os
import shutil
from pathlib import Path

import pytest

KICAD_SYMBOLS = Path("/usr/share/kicad/symbols")


def require_external(what: str, available: bool, install: str) -> None:
    if available:
        return
    msg = f"{what} not installed (Debian package {install})"
    if os.environ.get("REQUIRE_EXTERNAL") == "1":
        pytest.fail(msg + "; REQUIRE_EXTERNAL=1 makes this a failure")
    pytest.skip(msg)


def ngspice_path() -> str:
    """Path of the ngspice binary, or skip/fail per REQUIRE_EXTERNAL."""
    path = shutil.which("ngspice")
    require_external("ngspice", path is not None, "ngspice")
    return path  # type: ignore[return-value]


def kicad_symbols_dir() -> Path:
    """The installed KiCad symbol libraries, or skip/fail per REQUIRE_EXTERNAL."""
    require_external("kicad-symbols", (KICAD_SYMBOLS / "Timer.kicad_sym").exists(), "kicad-symbols")
    return KICAD_SYMBOLS


KICAD_DEMOS = Path("/usr/share/kicad/demos")


def kicad_demos_dir() -> Path:
    """KiCad's installed demo projects (schematics with the PCBs made from them), or skip/fail."""
    require_external("kicad-demos", any(KICAD_DEMOS.rglob("*.kicad_pcb")) if KICAD_DEMOS.is_dir() else False,
                     "kicad-demos")
    return KICAD_DEMOS
