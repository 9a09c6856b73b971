"""python-flint against the own exact code it replaces: the same Sturm sequences, the same roots and
extrema, the same resultants, on many random polynomials (the own code is the reference); Descartes' count
before the Sturm sequence changes no root."""

from __future__ import annotations

from fractions import Fraction

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from beamlang.engine import roots
from beamlang.engine.extrema import candidates, largest, largest_abs
from beamlang.engine.moving import bivariate
from beamlang.exact import Q, fraction
from beamlang.poly import Piecewise, Poly, to_flint_poly

rationals = st.builds(lambda n, d: Q(n, d), st.integers(-10**6, 10**6), st.integers(1, 10**4))
small = st.builds(lambda n, d: Q(n, d), st.integers(-40, 40), st.integers(1, 12))


@st.composite
def polynomials(draw) -> Poly:
    """Products of planted factors (rational roots, some repeated, and irreducible quadratics) and a
    random factor: square-free and not, rational and irrational roots."""
    p = Poly.of(draw(rationals.filter(bool)))
    for r in draw(st.lists(small, max_size=4)):
        p = p * Poly.of(-r, 1) * (Poly.of(-r, 1) if draw(st.booleans()) else Poly.of(1))
    for c in draw(st.lists(small, max_size=2)):  # x^2 - c: roots +-sqrt(c) when c > 0
        p = p * Poly.of(-c, 0, 1)
    p = p * Poly.of(*draw(st.lists(rationals, min_size=1, max_size=5)))
    return p


def own(fn):
    """Run fn with the own Python Sturm sequence in place of python-flint's."""
    with pytest.MonkeyPatch.context() as patch:
        patch.setattr(roots, "_sturm", lambda p: [to_flint_poly(q) for q in roots._own_sturm(p)])
        return fn()


def shape(found):
    return [(r.lo, r.hi, r.exact, r.poly.coeffs) for r in found]


@settings(max_examples=300, deadline=None)
@given(polynomials())
def test_sturm_sequences_are_the_same_polynomials(p):
    if p.degree < 2:
        return
    assert roots._sturm(p) == [to_flint_poly(q) for q in roots._own_sturm(p)]


@settings(max_examples=300, deadline=None)
@given(polynomials(), small, st.integers(1, 200))
def test_roots_are_identical_with_either_sturm_sequence(p, a, width):
    b = a + Q(width, 7)
    found = roots.roots_in(p, a, b)
    assert shape(found) == shape(own(lambda: roots.roots_in(p, a, b)))
    for r in found:  # and they are roots: a sign change or an exact zero
        assert (r.exact is not None and p(r.exact) == 0) or (p(r.lo) > 0) != (p(r.hi) > 0)


def sturm_only(fn):
    """Run fn with Descartes' count left out: every interval counted by the Sturm sequence."""
    with pytest.MonkeyPatch.context() as patch:
        patch.setattr(roots, "COUNT_FROM", 10**9)
        return fn()


@settings(max_examples=300, deadline=None)
@given(polynomials(), small, st.integers(1, 200))
def test_descartes_counts_leave_the_roots_unchanged(p, a, width):
    b = a + Q(width, 7)
    assert shape(roots.roots_in(p, a, b)) == shape(own(lambda: sturm_only(lambda: roots.roots_in(p, a, b))))


@settings(max_examples=300, deadline=None)
@given(polynomials(), small, st.integers(1, 200))
def test_descartes_counts_are_the_sturm_counts(p, lo, width):
    hi = lo + Q(width, 7)
    if p.degree < 2:
        return
    q, count = roots._square_free_counter(roots._monic(p))  # as the search calls it
    own_q = roots.square_free(p)
    assert q.coeffs in (own_q.coeffs, (-own_q).coeffs)
    seq = [to_flint_poly(c) for c in roots._own_sturm(own_q)]
    for a, b in ((lo, hi), (lo, (lo + hi) / 2), ((lo + hi) / 2, hi)):
        assert count(a, b) == roots._changes(seq, a) - roots._changes(seq, b) - (1 if q(b) == 0 else 0)


@settings(max_examples=150, deadline=None)
@given(st.lists(polynomials(), min_size=1, max_size=4))
def test_extrema_are_identical_with_either_sturm_sequence(pieces):
    xs = tuple(Q(k) for k in range(len(pieces) + 1))
    curve = Piecewise(xs, tuple(pieces))
    slope = curve.map(Poly.derivative)

    def extremes():
        c = candidates(curve, slope, xs[0], xs[-1])
        return [(k.x, k.value) for k in c], [(e.x, e.value) for e in filter(None, (largest(c, 1), largest(c, -1),
                                                                                    largest_abs(c)))]
    assert extremes() == own(extremes)


@st.composite
def in_x(draw, degree: int) -> list[Poly]:
    """A polynomial in x of this degree whose coefficients are polynomials in p (degree up to 3)."""
    out = [Poly.of(*draw(st.lists(small, min_size=1, max_size=4))) for _ in range(degree + 1)]
    if not out[-1]:
        out[-1] = Poly.of(1)
    return out


@settings(max_examples=150, deadline=None)
@given(st.integers(3, 4).flatmap(lambda m: st.tuples(in_x(m), st.integers(1, m - 1).flatmap(in_x))))
def test_resultants_are_the_same_polynomial(pair):
    A, B = pair
    if not B[-1]:
        return
    assert bivariate._flint_resultant(A, B) == bivariate._sylvester_resultant(A, B)


def test_a_resultant_vanishes_where_the_two_share_a_root():
    """A = (x - p)(x^2 + 1) and B = x - 2 share the root x = 2 only at p = 2 (Res_x = (2 - p) * 5)."""
    A = [Poly.of(0, -1), Poly.of(1), Poly.of(0, -1), Poly.of(1)]  # x^3 - p x^2 + x - p
    B = [Poly.of(-2), Poly.of(1)]
    res = bivariate._flint_resultant(A, B)
    assert res(Q(2)) == 0 and res(Q(3)) != 0
    assert res == bivariate._sylvester_resultant(A, B)
    assert abs(res.coeffs[-1]) == 5 and res.degree == 1


def test_conversions_keep_every_digit():
    c = Q(3**90, 7**40)
    p = Poly.of(c, -c, Fraction(1, 3))
    assert roots.from_flint_poly(to_flint_poly(p)) == p


def _every_guess(q, lo, hi, at, rational):
    """The reference recognition of rational roots: a small-denominator guess tried on every narrow bracket,
    whatever q's rational roots are (what `_rational_guess` did before it was told them)."""
    if hi - lo > roots.GUESS_WIDTH:
        return None
    c = fraction(at + (lo + hi) / 2).limit_denominator(10**12)
    return c if lo <= c - at <= hi and q(c - at) == 0 else None


@settings(max_examples=300, deadline=None)
@given(polynomials())
def test_rational_roots_are_those_sympy_finds(p):
    import sympy
    if p.degree < 1:
        return
    x = sympy.Symbol("x")
    q = roots.square_free(p)
    expected = sympy.Poly([sympy.Rational(int(c.numerator), int(c.denominator)) for c in reversed(q.coeffs)], x)
    found = roots.rational_roots(q)
    assert sorted(found) == sorted(Fraction(int(r.p), int(r.q)) for r in expected.ground_roots())
    assert all(q(r) == 0 for r in found)


@settings(max_examples=300, deadline=None)
@given(polynomials(), small, st.integers(1, 200))
def test_roots_are_identical_when_every_bracket_is_guessed(p, a, width):
    b = a + Q(width, 7)
    with pytest.MonkeyPatch.context() as patch:
        patch.setattr(roots, "_rational_guess", _every_guess)
        reference = shape(roots.roots_in(p, a, b))
    assert shape(roots.roots_in(p, a, b)) == reference


def _factored_both(member, load) -> list[tuple[str, str]]:
    """Each segment's general formula of one load, factored by FLINT (symbolic.factored) and by sympy's
    factor(together()) that it replaces, as sympy's srepr."""
    import sympy

    from beamlang.engine import symbolic
    from beamlang.engine.solve import solve
    m, _, _ = symbolic.symbolic_member(member, load)
    x = sympy.Symbol("x")
    pairs = []
    for p in solve(m).targets[0].curves.v.pieces:
        by_sympy = sympy.factor(sympy.together(sum((symbolic._expr(c) * x**i for i, c in enumerate(p.coeffs)),
                                                   sympy.Integer(0))))
        pairs.append((sympy.srepr(symbolic.factored(p.coeffs, x)), sympy.srepr(by_sympy)))
    return pairs


def test_general_formulas_factored_by_flint_are_sympys_on_the_examples():
    from pathlib import Path

    from beamlang.language.frontend import load
    seen = 0
    for name in ("canopy-cantilever", "deck-joist-overhang-us", "floor-joist-patterned-us", "footbridge-deck-beam",
                 "lintel-propped", "press-frame-fixed-us", "mezzanine-edge-beam"):
        member = load(Path(__file__).resolve().parents[1] / "examples" / f"{name}.beam").member
        for case in member.cases:
            for ld in case.loads:
                for mine, theirs in _factored_both(member, ld):
                    assert mine == theirs, (name, ld)
                    seen += 1
    assert seen > 40


@settings(max_examples=12, deadline=None)
@given(st.sampled_from(["pin at 0 m", "fixed at 0 m"]), st.sampled_from(["roller at span", "roller at 4 m"]),
       st.integers(1, 59), st.integers(1, 59), st.sampled_from(["point 3 kN down at {a} m",
                                                                  "uniform 2 kN/m down from {a} m to {b} m",
                                                                  "linear 1 kN/m to 3 kN/m up from {a} m to {b} m",
                                                                  "moment 4 kN*m clockwise at {a} m"]))
def test_general_formulas_factored_by_flint_are_sympys_on_random_layouts(left, right, i, j, load_line):
    from beamlang.language.build import build
    from beamlang.language.parse import parse
    from beamlang.source import Source
    a, b = sorted((i / 10, j / 10))
    if a == b:
        b = a + 0.05
    text = "\n".join(['member T-1 "random layout (invented)"', "material E 200 GPa yield 250 MPa",
                      "section properties I 8e7 mm^4 depth 300 mm", "span 6 m", f"support {left}",
                      f"support {right}", "case a", "  " + load_line.format(a=f"{a:g}", b=f"{b:g}")]) + "\n"
    member = build(parse(Source("t.beam", text)))
    for mine, theirs in _factored_both(member, member.cases[0].loads[0]):
        assert mine == theirs
