"""The HTML report renders in headless Chromium (issue 9, done-when).

Needs Debian's ``chromium``: skipped locally when it is absent, a failure with
REQUIRE_EXTERNAL=1 (CI must install it).
"""

from __future__ import annotations

import os
import shutil
import struct
import subprocess
import tempfile
import zlib
from pathlib import Path

import pytest
from support.external import require_external

from advisor.cli.main import main

pytestmark = pytest.mark.external

FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
         "--disable-background-networking", "--disable-component-update", "--disable-sync"]


def _chromium() -> str:
    path = shutil.which("chromium") or shutil.which("chromium-browser")
    require_external("chromium", path is not None, "chromium")
    return path  # type: ignore[return-value]


def _run(browser: str, *args: str) -> subprocess.CompletedProcess:
    with tempfile.TemporaryDirectory() as profile:
        return subprocess.run([browser, *FLAGS, f"--user-data-dir={profile}", *args],
                              capture_output=True, text=True, timeout=120, env={**os.environ, "HOME": profile})


def _png(path: Path) -> tuple[int, int, bytes]:
    """(width, height, decompressed image data) of a PNG, standard library only."""
    data = path.read_bytes()
    assert data[:8] == b"\x89PNG\r\n\x1a\n"
    pos, idat, size = 8, b"", (0, 0)
    while pos < len(data):
        length, kind = struct.unpack(">I4s", data[pos:pos + 8])
        body = data[pos + 8:pos + 8 + length]
        if kind == b"IHDR":
            size = struct.unpack(">II", body[:8])
        elif kind == b"IDAT":
            idat += body
        pos += 12 + length
    return size[0], size[1], zlib.decompress(idat)


def test_swap_report_renders_in_headless_chromium(tmp_path, capsys):
    browser = _chromium()
    report = tmp_path / "r.html"
    assert main(["swap", "74121", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "5",
                 "--trigger-period", "20us", "--report", str(report)]) == 0
    capsys.readouterr()
    dom = _run(browser, "--dump-dom", report.as_uri())
    assert dom.returncode == 0, dom.stderr[-500:]
    # The browser parsed both pictures and the findings into its document.
    assert dom.stdout.count("<svg") >= 2
    assert 'class="finding' in dom.stdout and 'id="bench"' in dom.stdout
    shot = tmp_path / "r.png"
    res = _run(browser, "--window-size=1000,1400", f"--screenshot={shot}", report.as_uri())
    assert res.returncode == 0 and shot.exists(), res.stderr[-500:]
    width, height, pixels = _png(shot)
    assert (width, height) == (1000, 1400)
    # Not a blank page: a good share of the bytes are not white.
    assert sum(1 for b in pixels[::97] if b != 0xFF) > len(pixels[::97]) * 0.02
