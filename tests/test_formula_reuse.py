"""A load whose general formula was written out before refers to it: the package names the earlier load and only
the symbols whose values differ, and that formula at this load's values is exactly the engine's curve for it."""

from __future__ import annotations

import sympy

from beamlang.analysis.working import general_formula, load_deflection
from beamlang.pipeline import analyse_loaded
from beamlang.language.frontend import from_source
from beamlang.report.figures import figure_names
from beamlang.report.markdown import member_markdown
from beamlang.source import Source

TEXT = """member T-1 "two point loads in one span, one in the other (invented)"
material E 200 GPa yield 250 MPa
section properties I 8e7 mm^4 depth 300 mm
span 10 m
support pin at 0 m
support roller at 6 m
support roller at span
case a
  point 3 kN down at 1.5 m
  point 5 kN down at 4 m
case b
  point 7 kN down at 2 m
  point 2 kN down at 8 m
"""


def _analysis():
    return analyse_loaded(from_source(Source("t.beam", TEXT), None))


def test_the_second_load_in_a_span_refers_to_the_first_and_names_its_own_values():
    a = _analysis()
    names = {key: f"figures/{file}" for key, file in figure_names(a).items()}
    text = member_markdown(a, names, [])
    lines = text.splitlines()
    def block(line: int) -> str:
        start = lines.index(f"Load of line {line}:")
        end = next(k for k in range(start + 1, len(lines)) if lines[k].startswith(("Load of line", "### ")))
        return "\n".join(lines[start:end])
    assert "$$v(x) =" in block(9) and "$$v(x) =" in block(13)  # the first in span 1 and the first in span 2
    for line, first, where in ((10, 9, "case a"), (12, 9, "case a")):
        b = block(line)
        assert "$$" not in b and f"that of the load of line {first} ({where})" in b
    assert "$a = 4\\ \\mathrm{m}$, $P = 5000\\ \\mathrm{N}$" in block(10)
    assert "$a = 2\\ \\mathrm{m}$, $P = 7000\\ \\mathrm{N}$" in block(12)


def test_the_shared_formula_at_each_loads_values_is_its_curve_exactly():
    a = _analysis()
    m = a.loaded.member
    for case in m.cases:
        for ld in case.loads:
            segments, values = general_formula(m, ld)
            curve = load_deflection(a.solution, ld)
            for start, end, expr in segments:
                mid = (start + end) / 2
                exact = curve.at(mid)
                subs = {s: (sympy.Rational(int(mid.numerator), int(mid.denominator)) if s.name == "x" else
                            sympy.Rational(int(values[s.name].numerator), int(values[s.name].denominator)))
                        for s in expr.free_symbols}
                assert expr.subs(subs) == sympy.Rational(int(exact.numerator), int(exact.denominator))
