"""Each load's general formula, derived by the engine, against the handbook tables.

[Gere] J. M. Gere and B. J. Goodno, Mechanics of Materials, 8th ed., Appendix G (from memory)."""

from __future__ import annotations

import sympy

from beamlang.engine.symbolic import load_formula
from engine_helpers import analyse_text, member_text

L, E, I, P, a, w, C = sympy.symbols("L E I P a w C", positive=True)  # as the engine makes them
x = sympy.Symbol("x")


def _formulas(text):
    m = analyse_text(text).loaded.member
    return load_formula(m, m.cases[0].loads[0])


def test_simple_beam_point_load_is_the_table_formula():
    # [Gere] G-2 case 5: v = -P b x (L^2 - b^2 - x^2) / (6 L E I) for 0 <= x <= a, b = L - a
    (first, second), names = _formulas(member_text("6 m", ["pin at 0 m", "roller at span"], {"a": ["point 10 kN down at 4 m"]}))
    b = L - a
    assert sympy.simplify(first[2] - (-P * b * x * (L**2 - b**2 - x**2) / (6 * L * E * I))) == 0
    assert (float(first[0]), float(first[1]), float(second[1])) == (0.0, 4.0, 6.0)
    assert set(names) == {"L", "E", "I", "a", "P"}


def test_cantilever_uniform_and_end_moment_are_the_table_formulas():
    # [Gere] G-1 case 1: v = -w x^2 (6 L^2 - 4 L x + x^2) / (24 E I); case 7: v = M0 x^2 / (2 E I) (counterclockwise)
    ((_, _, uniform),), _ = _formulas(member_text("6 m", ["fixed at 0 m"], {"a": ["uniform 5 kN/m down"]}))
    assert sympy.simplify(uniform - (-w * x**2 * (6 * L**2 - 4 * L * x + x**2) / (24 * E * I))) == 0
    ((_, _, moment),), _ = _formulas(member_text("6 m", ["fixed at 0 m"], {"a": ["moment 2 kN*m counterclockwise at span"]}))
    assert sympy.simplify(moment - C * x**2 / (2 * E * I)) == 0


def test_propped_cantilever_uniform_is_the_table_formula():
    # [AISC] Manual 15th ed. Table 3-23 case 12 (from memory), fixed at x = 0, prop at L:
    # v = -w x^2 (3 L^2 - 5 L x + 2 x^2) / (48 E I)
    ((_, _, v),), _ = _formulas(member_text("6 m", ["fixed at 0 m", "roller at span"], {"a": ["uniform 5 kN/m down"]}))
    assert sympy.simplify(v - (-w * x**2 * (3 * L**2 - 5 * L * x + 2 * x**2) / (48 * E * I))) == 0
