"""Revision marks: a member whose second revision changes one load gets ▲ marks on every value that changed (the
load's rows, the reactions, the governing deflection, the requested point, the check's ratio) and on none that did
not (the other case's results, the material); read back from the PDF with pdftotext."""

from __future__ import annotations

import json
import shutil
import subprocess
from fractions import Fraction as F
from math import sqrt
from pathlib import Path

import pytest

from beamlang.cli import main
from beamlang.report.pdf.changes import changed_lines

poppler = pytest.mark.skipif(not shutil.which("pdftotext"), reason="poppler-utils is not installed")

MEMBER = """member T-1 "Two-case test beam"
project "Demo"
revision "A"
date "2026-11-01"

span 4 m
material steel E 200 GPa yield 250 MPa density 7850 kg/m^3
section rectangle width 100 mm depth 200 mm

support pin at 0 m
support roller at span

case dead "deck"
  uniform 2 kN/m down

case live "people"
  point 3 kN down at 1 m

limit deflection live span/360
check stress live
report deflection at 2 m
"""


def _text(pdf: Path) -> str:
    return subprocess.run(["pdftotext", "-layout", str(pdf), "-"], check=True, capture_output=True, text=True).stdout


def _two_revisions(tmp_path: Path, first: str, second: str) -> Path:
    """A repository whose member file is committed as `first` and then edited to `second` (not committed)."""
    def git(*args):
        subprocess.run(["git", "-c", "user.email=a@example.org", "-c", "user.name=A", *args], cwd=tmp_path,
                       check=True, capture_output=True)
    member = tmp_path / "m" / "t.beam"
    member.parent.mkdir()
    member.write_text(first, encoding="utf-8")
    git("init", "-q")
    git("add", ".")
    git("commit", "-qm", "first issue")
    member.write_text(second, encoding="utf-8")
    return member


@poppler
def test_a_changed_load_marks_its_rows_and_every_result_it_changed_and_nothing_else(tmp_path, monkeypatch):
    second = MEMBER.replace('revision "A"', 'revision "B"').replace("2026-11-01", "2026-11-20") \
        .replace("point 3 kN", "point 6 kN")
    _two_revisions(tmp_path, MEMBER, second)
    monkeypatch.chdir(tmp_path)
    assert main(["build", "m", "-o", "out"]) == 0
    text = _text(tmp_path / "out" / "T-1" / "T-1.pdf")
    lines = [" ".join(line.split()) for line in text.splitlines()]
    marked = [line.removeprefix("▲B ") for line in lines if line.startswith("▲B ")]
    plain = [line for line in lines if not line.startswith("▲")]

    # the simple beam of L = 4 m, a point load P = 6 kN at a = 1 m (b = 3 m), E I of a 100 x 200 mm rectangle
    L, P, a, b = F(4), F(6000), F(1), F(3)
    EI = F(200 * 10**9) * F(1, 10) * F(2, 10) ** 3 / 12
    # reactions by statics: P b / L and P a / L; the uniform 2 kN/m of case dead gives w L / 2 at each support
    assert "pin 0 m 4.5 kN - 10" in marked and "roller 4 m 1.5 kN - 11" in marked
    assert "pin 0 m 4 kN - 10" in plain and "roller 4 m 4 kN - 11" in plain  # case dead: unchanged, unmarked
    # the largest deflection (AISC Steel Construction Manual, 15th ed., Table 3-23 case 8, with a and b swapped
    # as b > a): P a b (b + 2a) sqrt(3 b (b + 2a)) / (27 E I L), at sqrt(b (b + 2a) / 3) from the right support
    delta = float(P * a * b * (b + 2 * a) / (27 * EI * L)) * sqrt(float(3 * b * (b + 2 * a))) * 1000  # mm
    assert any(f"largest downward deflection -{delta:.6f} mm" in m for m in marked)
    # the check's ratio, in the summary and the checks table: delta against span/360
    ratio = delta / (4000 / 360)
    assert any(m.startswith("deflection, span 1, 0 m to 4 m live") and f"{ratio:.3f} (governs)" in m for m in marked)
    assert any(m.startswith("19 deflection live, span 1") and f"{ratio:.4f}" in m for m in marked)
    # the requested point x = 2 m, beyond the load (same table): deflection P a (L - x) (2 L x - x^2 - a^2) / (6 E I L)
    # downward, and the slope its derivative
    x = F(2)
    v = P * a * (L - x) * (2 * L * x - x**2 - a**2) / (6 * EI * L) * 1000
    theta = P * a * ((2 * L * x - x**2 - a**2) + (L - x) * (2 * x - 2 * L)) / (6 * EI * L)
    assert f"2 m -{float(v):.4g} mm {float(theta):.4g} rad".replace("e-05", "e-5") in marked
    # case dead's requested point, at midspan: 5 w L^4 / (384 E I) down and no slope, did not change
    assert f"2 m -{float(5 * 2000 * L**4 / (384 * EI) * 1000):.4g} mm 0 rad" in plain
    # the load itself: its input row and its ditto row, its row in the case's loads table
    assert any(m.startswith("17 point 6 kN down at 1 m 6 kN 6000 N") for m in marked)
    assert any(m.startswith("17 point 6 kN down at 1 m P = -6000 N at x = 1 m") for m in marked)
    # unchanged inputs: the material (summary and inputs table), the span, the supports
    assert not any("material steel" in m or "span 4 m" in m or "support pin" in m for m in marked)
    assert any(line.startswith("7 material steel E 200 GPa") for line in plain)
    # the title table's revision and date changed, but are not values of the calculation
    assert not any(m.startswith("Demo - T-1") for m in marked)
    # one mark per marked item of the Markdown, and the same marks in the calc set
    record = json.loads((tmp_path / "out" / "T-1" / "build.json").read_text(encoding="utf-8"))
    assert text.count("▲") - 1 == len(record["marked"])
    assert _text(tmp_path / "out" / "calc-set.pdf").count("▲") - 1 == len(record["marked"])
    # deterministic: the same bytes when built again
    assert main(["build", "m", "-o", "again", "--force"]) == 0
    assert (tmp_path / "again" / "T-1" / "T-1.pdf").read_bytes() == (tmp_path / "out" / "T-1" / "T-1.pdf").read_bytes()


def test_a_case_removed_since_the_previous_revision_leaves_the_rest_compared(tmp_path, monkeypatch):
    second = MEMBER.replace('revision "A"', 'revision "B"').replace('case dead "deck"\n  uniform 2 kN/m down\n', "")
    _two_revisions(tmp_path, MEMBER, second)
    monkeypatch.chdir(tmp_path)
    assert main(["build", "m", "-o", "out"]) == 0
    markdown = (tmp_path / "out" / "T-1" / "T-1.md").read_text(encoding="utf-8").splitlines()
    marked = {markdown[n - 1] for n in json.loads((tmp_path / "out" / "T-1" / "build.json").read_text())["marked"]}
    # case live, its results and checks did not change: only the sentence counting the load cases did
    assert len(marked) == 1 and "under 1 load case and 0 combinations" in marked.pop()


def _line(markdown: str, start: str) -> int:
    return next(n for n, line in enumerate(markdown.splitlines(), 1) if line.startswith(start))


def test_marks_follow_values_not_line_numbers_nor_title_fields():
    old = ("# T-1: beam\n\n| Project | Revision | Date |\n|---|---|---|\n| Demo | A | 2026-11-01 |\n\n"
           "## Inputs\n\n| line | statement | SI value |\n|---|---|---|\n| 7 | `span 4 m` | 4 m |\n"
           "| 8 | `point 3 kN down at 1 m` | 3000 N |\n|  | ″ | 1 m |\n\n"
           "## Case live\n\nLoad of line 8:\n\n$$P = 3000\\ \\mathrm{N}$$\n\n- largest moment: 2.25 kN*m\n"
           "- largest shear: 2.25 kN\n\n## Traceability\n\nInput file a:t.beam, SHA-256 `00`.\n")
    new = (old.replace("| A | 2026-11-01 |", "| B | 2026-11-20 |").replace("| 8 |", "| 10 |").replace("| 7 |", "| 9 |")
           .replace("point 3 kN", "point 6 kN").replace("3000", "6000").replace("line 8", "line 10")
           .replace("moment: 2.25", "moment: 4.5").replace("a:t.beam, SHA-256 `00`", "t.beam, SHA-256 `01`"))
    assert changed_lines(old, new) == {_line(new, "| 10 |"), _line(new, "|  | ″"), _line(new, "$$P"),
                                       _line(new, "- largest moment")}
    assert changed_lines(new, new) == frozenset()
