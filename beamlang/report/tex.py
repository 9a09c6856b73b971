"""TeX and Markdown text helpers: exact values -> deterministic LaTeX numbers, polynomials, escaped text."""

from __future__ import annotations

import re
from fractions import Fraction
from functools import lru_cache

from beamlang.analysis.display import number
from beamlang.poly import Poly

DIGITS = 6  # significant digits shown for computed values (all arithmetic is exact)
_MD_SPECIAL = set("\\`*_{}[]()#+-.!|<>$~&")
_UNIT_OPERATORS = re.compile(r"([*/])")


def plain(value: Fraction | float, digits: int = DIGITS) -> str:
    """A number for running text and table cells outside math (no TeX): `display.number`."""
    return number(value, digits)


def num(value: Fraction | float, digits: int = DIGITS) -> str:
    """A number for LaTeX: the same digits as `plain`, powers of ten as \\times 10^{k}."""
    mantissa, _, exp = plain(value, digits).partition("e")
    return f"{mantissa} \\times 10^{{{exp}}}" if exp else mantissa


def poly(p: Poly, var: str = "x", digits: int = DIGITS) -> str:
    """c_n x^n + ... + c_0 with signs placed as a reader writes them; zero is 0."""
    terms = [(k, c) for k, c in enumerate(p.coeffs) if c != 0]
    if not terms:
        return "0"
    out = []
    for i, (k, c) in enumerate(reversed(terms)):
        sign = "-" if c < 0 else "+"
        mag = num(abs(c), digits)
        power = "" if k == 0 else (var if k == 1 else f"{var}^{{{k}}}")
        body = mag if k == 0 else (power if mag == "1" else f"{mag}\\,{power}")
        out.append((("-" if sign == "-" else "") if i == 0 else f" {sign} ") + body)
    return "".join(out)


def exact(value: Fraction) -> str:
    """An exact rational for LaTeX: an integer, or \\frac{p}{q} when the denominator is small."""
    if value.denominator == 1:
        return str(value.numerator)
    if value.denominator < 10**6 and abs(value.numerator) < 10**9:
        sign = "-" if value < 0 else ""
        return f"{sign}\\frac{{{abs(value.numerator)}}}{{{value.denominator}}}"
    return num(value)


def md(text: str) -> str:
    """User text made inert in Markdown: every character that could start markup is escaped."""
    return "".join("\\" + ch if ch in _MD_SPECIAL else ch for ch in text).replace("\n", " ")


def cell(text: str) -> str:
    """Text for a pipe-table cell (no raw pipes, no line breaks)."""
    return text.replace("|", "\\|").replace("\n", " ")


@lru_cache(maxsize=1024)
def sympy_tex(expr) -> str:
    """sympy's LaTeX with plain parentheses (stretchy \\left( \\right) leave gaps in browsers' MathML). Kept per
    expression: loads of one kind and placement share their general formula, printed once."""
    import sympy
    return sympy.latex(expr).replace("\\left(", "(").replace("\\right)", ")")


def unit(spelling: str) -> str:
    """A unit for LaTeX, upright: 'kN*m' -> \\mathrm{kN}\\,\\mathrm{m}, 'mm^4' -> \\mathrm{mm}^{4}, 'kg/m^3' ->
    \\mathrm{kg}/\\mathrm{m}^{3}."""
    out = []
    for token in _UNIT_OPERATORS.split(spelling.replace("**", "^").replace("·", "*")):
        if token in ("*", "/"):
            out.append("\\," if token == "*" else "/")
            continue
        name, _, power = token.partition("^")
        out.append(f"\\mathrm{{{name}}}" + (f"^{{{power}}}" if power else ""))
    return "".join(out)


def quantity(value: Fraction | float, spelling: str, digits: int = DIGITS) -> str:
    """A number with its unit for LaTeX: 45 \\ \\mathrm{kN}\\,\\mathrm{m}."""
    return f"{num(value, digits)}\\ {unit(spelling)}"
