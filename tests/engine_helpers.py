"""Helpers for engine tests: a member from a few lines of beamlang text -> exact results."""

from __future__ import annotations

from fractions import Fraction

from beamlang.language.frontend import from_source
from beamlang.pipeline import Analysis, analyse_loaded
from beamlang.source import Source

E = Fraction(200 * 10**9)  # Pa, from "200 GPa"
I = Fraction(8, 10**5)  # m^4, from "8e7 mm^4"
EI = E * I


def member_text(span: str, supports: list[str], cases: dict[str, list[str]], extra: list[str] = (),
                material: str = "E 200 GPa yield 250 MPa", section: str = "properties I 8e7 mm^4 depth 300 mm") -> str:
    lines = ['member T-1 "Test beam"', f"span {span}", f"material {material}", f"section {section}"]
    lines += [f"support {s}" for s in supports]
    for name, loads in cases.items():
        lines.append(f"case {name}")
        lines += ["  " + load for load in loads]
    lines += list(extra)
    return "\n".join(lines) + "\n"


def analyse_text(text: str) -> Analysis:
    return analyse_loaded(from_source(Source("t.beam", text), None))


def result(text: str, target: str = "a"):
    a = analyse_text(text)
    return next(r for r in a.results if r.name == target), a


def rel(a, b) -> float:
    return abs(float(a) - float(b)) / max(abs(float(b)), 1e-300)


def to_sympy(value):
    """An exact engine number -> sympy.Rational (gmpy2 2.3's mpz is not read by sympy 1.14 directly)."""
    import sympy

    return sympy.Rational(int(value.numerator), int(value.denominator))
