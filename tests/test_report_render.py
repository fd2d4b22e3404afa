"""The HTML report renders in headless Chromium (issue 9, done-when).

Needs Debian's ``chromium``: skipped locally when it is absent, a failure with
REQUIRE_EXTERNAL=1 (CI must install it).
"""

from __future__ import annotations

import os
import re
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
    """(width, height, RGB(A) pixel bytes) of an 8-bit PNG, filters undone; standard library only.

    PNG filtering (ISO/IEC 15948, section 9: None, Sub, Up, Average, Paeth) is reversed so the
    bytes are pixel values: a blank page is then all 0xFF, whatever filter the encoder chose.
    """
    data = path.read_bytes()
    assert data[:8] == b"\x89PNG\r\n\x1a\n"
    pos, idat, size, bpp = 8, b"", (0, 0), 3
    while pos < len(data):
        length, kind = struct.unpack(">I4s", data[pos:pos + 8])
        body = data[pos + 8:pos + 8 + length]
        if kind == b"IHDR":
            size = struct.unpack(">II", body[:8])
            depth, colour = body[8], body[9]
            assert depth == 8 and colour in (2, 6), (depth, colour)
            bpp = 3 if colour == 2 else 4
        elif kind == b"IDAT":
            idat += body
        pos += 12 + length
    raw, stride = zlib.decompress(idat), size[0] * bpp
    out, prev = bytearray(), bytearray(stride)
    for y in range(size[1]):
        ftype, line = raw[y * (stride + 1)], bytearray(raw[y * (stride + 1) + 1:(y + 1) * (stride + 1)])
        for i in range(stride):
            a = line[i - bpp] if i >= bpp else 0
            b, c = prev[i], (prev[i - bpp] if i >= bpp else 0)
            if ftype == 1:
                line[i] = (line[i] + a) & 0xFF
            elif ftype == 2:
                line[i] = (line[i] + b) & 0xFF
            elif ftype == 3:
                line[i] = (line[i] + (a + b) // 2) & 0xFF
            elif ftype == 4:
                p_ = a + b - c
                pa, pb, pc = abs(p_ - a), abs(p_ - b), abs(p_ - c)
                line[i] = (line[i] + (a if pa <= pb and pa <= pc else b if pb <= pc else c)) & 0xFF
        out += line
        prev = line
    return size[0], size[1], bytes(out)


def _drawn_share(pixels: bytes, bpp: int = 3) -> float:
    """Share of sampled pixels that are not white (every 13th pixel)."""
    n = len(pixels) // bpp
    sample = range(0, n, 13)
    return sum(1 for i in sample if pixels[i * bpp:i * bpp + 3] != b"\xff\xff\xff") / len(sample)


def test_a_blank_page_reads_as_blank(tmp_path):
    # The check below must tell a blank page from a drawn one: a white page reads 0 % drawn.
    browser = _chromium()
    page = tmp_path / "blank.html"
    page.write_text("<!doctype html><html><body style='background:#fff'></body></html>", encoding="utf-8")
    shot = tmp_path / "blank.png"
    res = _run(browser, "--window-size=400,300", f"--screenshot={shot}", page.as_uri())
    assert res.returncode == 0 and shot.exists(), res.stderr[-500:]
    width, height, pixels = _png(shot)
    assert _drawn_share(pixels, len(pixels) // (width * height)) == 0.0


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
    # Not a blank page: a share of the pixels (filters undone) are not white.
    assert _drawn_share(pixels, len(pixels) // (width * height)) > 0.02


def _pdfinfo() -> str:
    path = shutil.which("pdfinfo")
    require_external("pdfinfo", path is not None, "poppler-utils")
    return path  # type: ignore[return-value]


def test_swap_report_prints_on_two_a4_pages_bench_sheet_first(tmp_path, capsys):
    """The issue's example prints to PDF in headless Chromium on at most two A4 pages,
    the bench sheet (verdict, values, pin moves, steps, ties) on the first."""
    browser, pdfinfo = _chromium(), _pdfinfo()
    report = tmp_path / "x.html"
    assert main(["swap", "74121", "74HC221", "--r", "10k", "--c", "10n", "--vcc", "5",
                 "--trigger-period", "20us", "--report", str(report)]) == 0
    capsys.readouterr()
    pdf = tmp_path / "x.pdf"
    res = _run(browser, f"--print-to-pdf={pdf}", "--no-pdf-header-footer", report.as_uri())
    assert pdf.exists(), res.stderr[-500:]
    info = subprocess.run([pdfinfo, str(pdf)], capture_output=True, text=True, check=True).stdout
    pages = int(next(line.split()[-1] for line in info.splitlines() if line.startswith("Pages:")))
    assert 1 <= pages <= 2
    # A4 is 210 x 297 mm, 595.3 x 841.9 points (ISO 216).
    size = next(line for line in info.splitlines() if line.startswith("Page size:"))
    w, h = (float(v) for v in re.findall(r"([\d.]+) x ([\d.]+)", size)[0])
    assert w == pytest.approx(595.3, abs=1) and h == pytest.approx(841.9, abs=1)
    text = report.read_text(encoding="utf-8")
    order = [text.index(f'id="{sid}"') for sid in ("bench-sheet", "pins", "bench", "findings")]
    assert order == sorted(order)
