"""The package a checker signs: each check's arithmetic substituted, symbols named, a US member's working
in US units, a summary read first. Values against published closed forms."""

import re
from pathlib import Path

from beamlang.pipeline import analyse
from beamlang.report.figures import figure_names
from beamlang.report.markdown import member_markdown
from engine_helpers import analyse_text, member_text

ROOT = Path(__file__).resolve().parent.parent


def _markdown(a) -> str:
    return member_markdown(a, figure_names(a))


def _simple_span() -> str:
    # 6 m simple span, 5 kN/m, rectangle 100 x 200 mm, E 200 GPa (member_text's material)
    text = member_text("6 m", ["pin at 0 m", "roller at span"], {"a": ["uniform 5 kN/m down"]},
                       extra=["limit deflection a span/360", "check stress a"],
                       section="rectangle width 100 mm depth 200 mm")
    return _markdown(analyse_text(text))


def test_each_check_shows_its_numbers_substituted():
    # [AISC] Steel Construction Manual, 15th ed., Table 3-23, case 1 (simple span, uniform load; from memory):
    # M = w L^2 / 8 = 22.5 kN*m, V = w L / 2 = 15 kN, deflection 5 w L^4 / (384 E I).
    # Rectangle (Gere & Goodno, Mechanics of Materials, 8th ed., ch. 5; from memory): I = b h^3 / 12
    # = 6.66667e7 mm^4, c = h / 2 = 100 mm, Q = b h^2 / 8 = 500000 mm^3, t = b = 100 mm.
    # sigma = 22.5e6 N*mm x 100 mm / 6.66667e7 mm^4 = 33.75 MPa; tau = 15000 N x 5e5 / (6.66667e7 x 100) = 1.125 MPa;
    # deflection = 5 x 5 N/mm x 6000^4 / (384 x 200000 x 6.66667e7) mm = 6.32812 mm.
    md = _simple_span()
    assert ("\\sigma = \\frac{M c}{I} = \\frac{2.25 \\times 10^{7}\\ \\mathrm{N}\\,\\mathrm{mm} \\times 100\\ \\mathrm{mm}}"
            "{6.66667 \\times 10^{7}\\ \\mathrm{mm}^{4}} = 33.75\\ \\mathrm{MPa}") in md
    assert ("\\tau = \\frac{V Q}{I t} = \\frac{15000\\ \\mathrm{N} \\times 500000\\ \\mathrm{mm}^{3}}"
            "{6.66667 \\times 10^{7}\\ \\mathrm{mm}^{4} \\times 100\\ \\mathrm{mm}} = 1.125\\ \\mathrm{MPa}") in md
    assert "\\delta_{allow} = \\frac{L}{N} = \\frac{6000\\ \\mathrm{mm}}{360} = 16.6667\\ \\mathrm{mm}" in md
    assert "\\delta = |v| = 6.32812\\ \\mathrm{mm}" in md
    # the allowed values and where they come from: fy as given, the von Mises shear yield fy / sqrt(3)
    assert "\\sigma_{allow} = f_y = 250\\ \\mathrm{MPa}" in md
    assert "\\tau_{allow} = \\frac{f_y}{\\sqrt{3}} = \\frac{250\\ \\mathrm{MPa}}{\\sqrt{3}} = 144.338\\ \\mathrm{MPa}" in md


def test_the_summary_comes_first_with_the_governing_check_marked():
    md = _simple_span()
    summary = md[md.index("## Summary"):md.index("## Inputs")]
    assert "- Section: `section rectangle width 100 mm depth 200 mm` (input line 4)" in summary
    assert "| deflection, span 1, 0 m to 6 m | a | 6.328 mm | 16.67 mm | **0.380** (governs) | **PASS** |" in summary
    assert summary.count("**PASS**") == 3
    assert "Governing check: deflection a, span 1, 0 m to 6 m (input line 9), ratio 0.380, PASS." in summary


def test_a_us_members_working_stays_in_us_units():
    a = analyse(ROOT / "examples" / "deck-joist-overhang-us.beam")
    md = _markdown(a)
    working = md[md.index("## Sign convention"):md.index("## Traceability")] if "## Traceability" in md else \
        md[md.index("## Sign convention"):]
    si = re.compile(r"\\mathrm\{(m|mm|N|kN|Pa|MPa|kPa)\}|\b\d[\d.]* (m|mm|N|kN|Pa|MPa|kN\*m|N\*m)\b")
    offending = [line for line in working.splitlines() if si.search(line) and "9.80665 m/s" not in line]
    assert not offending, offending[:3]
    assert "ft" in working and "kip" in working  # the working is there, in the member's units


def test_symbols_are_named_where_they_are_introduced():
    md = _markdown(analyse(ROOT / "examples" / "deck-joist-overhang-us.beam"))
    assert "- $x_{B} = 144\\ \\mathrm{in}$ (12 ft): the position of the roller at 12 ft (line 16)" in md
    assert "- $L = 180\\ \\mathrm{in}$ (15 ft): the member's length" in md
    assert "- $I = 98.9316\\ \\mathrm{in}^{4}$: the second moment of area (section line 13)" in md
