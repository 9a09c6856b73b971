"""The HTML calc package in a real browser: headless Chromium screenshot, DOM and print to PDF."""

from __future__ import annotations

import shutil
import subprocess
import tempfile
from pathlib import Path

import pytest

from casefiles import EXAMPLES

CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")
FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
         "--disable-background-networking", "--disable-component-update", "--disable-sync"]
PAGES = sorted((EXAMPLES.parent / "out").glob("*/*.html"))

pytestmark = pytest.mark.skipif(CHROMIUM is None, reason="Chromium is not installed (.ci/run installs Debian's chromium)")


def _run(page: Path, *extra: str) -> subprocess.CompletedProcess:
    with tempfile.TemporaryDirectory() as profile:
        return subprocess.run([CHROMIUM, *FLAGS, f"--user-data-dir={profile}", *extra, page.resolve().as_uri()],
                              capture_output=True, timeout=120)


@pytest.mark.parametrize("page", PAGES, ids=lambda p: p.parent.name)
def test_screenshot_is_not_blank(page, tmp_path):
    import numpy as np
    from PIL import Image
    shot = tmp_path / "shot.png"
    _run(page, "--window-size=1000,1400", f"--screenshot={shot}")
    pixels = np.asarray(Image.open(shot).convert("RGB"), dtype=float) / 255
    assert pixels.shape[0] == 1400 and pixels.std() > 0.05  # text, tables and rules on white


@pytest.mark.parametrize("page", PAGES, ids=lambda p: p.parent.name)
def test_dom_holds_mathml_and_every_figure(page):
    dom = _run(page, "--dump-dom").stdout.decode("utf-8")
    figures = len(list((page.parent / "figures").glob("*.svg")))
    assert dom.count("<math") > 20
    assert dom.count('src="data:image/svg+xml;base64,') == figures
    assert "<script" not in dom


def test_prints_to_a_sane_number_of_pages(tmp_path):
    page = next(p for p in PAGES if p.parent.name == "B-3")
    pdf = tmp_path / "b3.pdf"
    _run(page, "--no-pdf-header-footer", f"--print-to-pdf={pdf}")
    data = pdf.read_bytes()
    pages = data.count(b"/Type /Page") - data.count(b"/Type /Pages")
    assert 5 <= pages <= 60, pages


@pytest.mark.skipif(shutil.which("pdftotext") is None, reason="poppler-utils is not installed")
@pytest.mark.parametrize("mark", ["P-9", "G-5", "J-12"])
def test_printed_page_keeps_formulas_and_tables_inside_the_margins(mark, tmp_path):
    """The print stylesheet: wide display formulas are set smaller, tables fit the page width, sections flow."""
    import re
    page = next(p for p in PAGES if p.parent.name == mark)
    pdf = tmp_path / "printed.pdf"
    _run(page, "--no-pdf-header-footer", f"--print-to-pdf={pdf}")
    boxes = subprocess.run(["pdftotext", "-bbox", str(pdf), "-"], capture_output=True, text=True, check=True).stdout
    margin = 14 * 72 / 25.4  # @page margin, left and right
    width = None
    for m in re.finditer(r'<page width="([\d.]+)"|<word xMin="([\d.]+)" yMin="[\d.]+" xMax="([\d.]+)"[^>]*>([^<]*)<',
                         boxes):
        if m.group(1):
            width = float(m.group(1))
            continue
        assert float(m.group(3)) <= width - margin + 1.0, f"{mark}: {m.group(4)!r} ends past the right margin"
        assert float(m.group(2)) >= margin - 1.0, f"{mark}: {m.group(4)!r} starts left of the left margin"
    text = subprocess.run(["pdftotext", str(pdf), "-"], capture_output=True, text=True, check=True).stdout
    blank = sum(len(p.split()) < 40 for p in text.split("\f")[:-1])
    assert blank <= 1, f"{mark}: {blank} nearly empty printed pages"  # no forced page per section
