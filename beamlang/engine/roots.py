"""Real roots of an exact polynomial in an interval: Sturm isolation over Fraction, then bisection."""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction

from beamlang.exact import Q, fraction
from beamlang.poly import Poly, from_flint, from_flint_poly, to_flint, to_flint_poly

REFINE_BITS = 56  # isolating intervals are refined to a width below |x| * 2**-56 (beyond double precision)
ONE, ZERO = Q(1), Q(0)
FLOOR = Q(1, 10**6)  # |x| below this is refined as if it were this
GUESS_WIDTH = Q(1, 10**9)  # from this width on, a small-denominator rational root is looked for
COUNT_FROM = 4  # from this degree roots are counted by Descartes' rule (below, the Sturm sequence is as quick)


@dataclass(frozen=True, slots=True)
class Root:
    """A real root: exact when rational, else the square-free polynomial and an isolating interval."""

    lo: Fraction
    hi: Fraction
    exact: Fraction | None
    poly: Poly

    @property
    def x(self) -> Fraction:
        """The exact root, or the midpoint of its (tiny) isolating interval."""
        return self.exact if self.exact is not None else (self.lo + self.hi) / 2


def _monic(p: Poly) -> Poly:
    return p * (ONE / abs(p.coeffs[-1])) if p else p


def gcd(a: Poly, b: Poly) -> Poly:
    while b:
        a, b = b, a.divmod(b)[1]
    return _monic(a)


def square_free(p: Poly) -> Poly:
    g = gcd(p, p.derivative())
    return _monic(p.divmod(g)[0]) if g.degree > 0 else _monic(p)


def _sturm(p: Poly) -> list:
    """The Sturm sequence p, p', then minus each remainder, every term after p scaled to leading
    coefficient +-1, as python-flint polynomials (FLINT's exact rational polynomials, in C). The same
    polynomials as `_own_sturm` (a remainder is unique; tests/test_flint.py compares them); the divisions
    in Python were most of the isolation's time."""
    f = to_flint_poly(p)
    d = f.derivative()
    seq = [f, d / abs(d.leading_coefficient())]
    while seq[-1].degree() > 0:
        r = seq[-2] % seq[-1]
        if r.is_zero():
            break
        seq.append(-r / abs(r.leading_coefficient()))
    return seq


def _own_sturm(p: Poly) -> list[Poly]:
    """The reference Sturm sequence in Python (tests compare `_sturm` with it)."""
    seq = [p, _monic(p.derivative())]
    while seq[-1].degree > 0:
        r = seq[-2].divmod(seq[-1])[1]
        if not r:
            break
        seq.append(_monic(-r))
    return seq


def _quadratic(q: Poly, width: Fraction, at: Fraction, p: Poly) -> list[Root] | None:
    """Roots of a monic h^2 + B h + C inside (0, width) in closed form: exact when the discriminant is
    a rational square, else bracketed by integer square roots to below |x| * 2**-56. None when a bracket
    straddles an end of the interval (the general search decides those)."""
    C, B = q.coeffs[0], q.coeffs[1]
    D = B * B - 4 * C
    if D < 0:
        return []
    if D == 0:
        h = -B / 2
        return [Root(at + h, at + h, at + h, p)] if 0 < h < width else []
    nd, d = D.numerator * D.denominator, D.denominator
    s = math.isqrt(nd)
    if s * s == nd:  # rational roots
        r = Q(s, d)
        return [Root(at + h, at + h, at + h, p) for h in sorted(((-B - r) / 2, (-B + r) / 2)) if 0 < h < width]
    out = []
    for sign in (-1, 1):
        k = 64
        while True:
            S = math.isqrt(nd << (2 * k))  # sqrt(nd) * 2**k lies in [S, S + 1)
            lo_r, hi_r = Q(S, d << k), Q(S + 1, d << k)
            lo, hi = ((-B + lo_r) / 2, (-B + hi_r) / 2) if sign > 0 else ((-B - hi_r) / 2, (-B - lo_r) / 2)
            tol = max(abs(at + lo), abs(at + hi), FLOOR) / 2**REFINE_BITS
            if hi - lo <= tol:
                break
            k *= 2
        if hi <= 0 or lo >= width:
            continue
        if lo <= 0 or hi >= width:
            return None
        out.append(Root(at + lo, at + hi, None, p))
    return out


def _square_free_sturm(p: Poly) -> tuple[Poly, list[Poly]]:
    """The square-free part of p and its Sturm sequence. The sequence of p ends in gcd(p, p') (up to a
    constant), so when that is a constant p is already square-free and one pass serves both."""
    if p.degree <= 1:
        return p, [p]
    seq = _sturm(p)
    if seq[-1].degree() == 0:
        return p, seq
    q = _monic(p.divmod(_monic(from_flint_poly(seq[-1])))[0])
    return q, (_sturm(q) if q.degree > 1 else [q])


def _changes(seq: list, x: Fraction) -> int:
    """Sign changes of the (flint) Sturm sequence at x, evaluated exactly."""
    at = to_flint(x)
    signs = [v for v in (q(at) for q in seq) if v != 0]
    return sum(1 for u, v in zip(signs, signs[1:]) if (u < 0) != (v < 0))


def roots_in(p: Poly, a: Fraction, b: Fraction) -> list[Root]:
    """Every distinct real root of p strictly inside (a, b), in increasing order.

    The search runs on p shifted to the segment start (h = x - a): its coefficients are those of the
    Taylor form at a, small where the segment is short, so the float steps stay well conditioned."""
    if p.degree < 1 or a >= b:
        return []
    c = p.taylor(a)
    width = b - a
    if not _may_vanish(c, width):
        return []
    if c.degree == 2:
        found = _quadratic(c * (1 / c.coeffs[-1]), width, a, p)  # leading coefficient +1 (not _monic's |.|)
        if found is not None:
            return found
    q = _monic(c)
    if q.degree >= COUNT_FROM:
        q, count = _square_free_counter(q)
    else:
        q, seq = _square_free_sturm(q)
        count = lambda lo, hi: _changes(seq, lo) - _changes(seq, hi) - (1 if q(hi) == 0 else 0)  # noqa: E731
    if q.degree == 1:
        h = -q.coeffs[0] / q.coeffs[1]
        return [Root(a + h, a + h, a + h, p)] if 0 < h < width else []
    found: list[Root] = []
    rational: list[tuple] = []  # q's rational roots, found on the first refinement
    stack = [(ZERO, width)]
    while stack:
        lo, hi = stack.pop()
        n = count(lo, hi)  # the distinct roots in (lo, hi)
        if n == 0:
            continue
        if n == 1 and q(lo) != 0:
            if not rational:
                rational.append(rational_roots(q))
            found.append(_refine(q, lo, hi, a, p, rational[0]))
            continue
        mid = (lo + hi) / 2
        if q(mid) == 0:
            found.append(Root(a + mid, a + mid, a + mid, p))
        stack += [(lo, mid), (mid, hi)]
    return sorted(found, key=lambda r: r.x)


def _square_free_counter(q: Poly):
    """The square-free part of q (as `_square_free_sturm`'s, up to its sign, which no step of the search
    depends on) and a function giving its number of distinct roots in an open interval (lo, hi): the same
    numbers as Sturm's theorem, by Descartes' rule of signs instead (python-flint's exact polynomials), which
    needs no Sturm sequence. The sign changes in the coefficients of (1 + t)^n q(lo + (hi - lo) t / (1 + t))
    bound the roots in (lo, hi) and are their number when 0 or 1; above, the halves are counted (a root at the
    middle counts one), which for a square-free q ends."""
    import flint
    f = to_flint_poly(q)
    g = f.gcd(f.derivative())
    if g.degree() > 0:
        q = _monic(q.divmod(from_flint_poly(g))[0])
        f = to_flint_poly(q)
    one, known = flint.fmpq_poly([1, 1]), {}

    def count(lo, hi) -> int:
        if (lo, hi) not in known:
            a, b = to_flint(lo), to_flint(hi)
            g = f(flint.fmpq_poly([a, b - a]))
            signs = [c > 0 for c in flint.fmpq_poly(list(reversed(g.coeffs())))(one).coeffs() if c != 0]
            n = sum(1 for u, v in zip(signs, signs[1:]) if u != v)
            if n > 1:
                mid = (lo + hi) / 2
                n = count(lo, mid) + (1 if q(mid) == 0 else 0) + count(mid, hi)
            known[(lo, hi)] = n
        return known[(lo, hi)]
    return q, count


def _may_vanish(c: Poly, width: Fraction) -> bool:
    """False when the polynomial (in h, the Taylor form at the segment start) surely has no root for
    0 <= h <= width: |c0| exceeds the bound of the rest."""
    rest, power = ZERO, ONE
    for ck in c.coeffs[1:]:
        power *= width
        rest += abs(ck) * power
    return bool(c.coeffs) and abs(c.coeffs[0]) <= rest


def rational_roots(q: Poly) -> tuple[Fraction, ...]:
    """The rational roots of q, from its factors of degree 1 over the rationals (FLINT's exact factoring)."""
    return tuple(from_flint(-f.coeffs()[0] / f.coeffs()[1]) for f, _ in to_flint_poly(q).factor()[1]
                 if f.degree() == 1)


def _refine(q: Poly, lo: Fraction, hi: Fraction, at: Fraction, p: Poly, rational: tuple) -> Root:
    """Narrow a simple root of q (in h = x - at) to below |x| * 2**-56, exactly verified; a Root in x.
    `rational` holds q's rational roots: only they can be recognised."""
    tight = _float_bracket(q, lo, hi, at)
    if tight is not None:
        lo, hi = tight
    return _bisect(q, lo, hi, at, p, rational)


def _float_bracket(q: Poly, lo: Fraction, hi: Fraction, at: Fraction) -> tuple[Fraction, Fraction] | None:
    """Safeguarded Newton in floats, then a bracket of a few ulps of x = at + h whose sign change is
    checked exactly."""
    coeffs = [float(c) for c in q.coeffs]
    deriv = [i * c for i, c in enumerate(coeffs)][1:]
    a, b = float(lo), float(hi)
    fa = _horner(coeffs, a)
    if not math.isfinite(fa):
        return None
    x = (a + b) / 2
    for _ in range(200):
        f = _horner(coeffs, x)
        if f == 0 or b - a <= abs(x) * 2e-16:
            break
        if (f > 0) == (fa > 0):
            a, fa = x, f
        else:
            b = x
        d = _horner(deriv, x)
        newton = x - f / d if d else math.nan
        x = newton if a < newton < b else (a + b) / 2
    scale = max(abs(float(at) + x), abs(x), 1e-300)  # widths relative to x, not to h
    for bits in (REFINE_BITS + 1, 53, 48, 40, 30):  # floats lose digits to cancellation: widen until verified
        width = Q(scale) * Q(1, 2**bits)  # exact: a float converts to its own binary value
        lo2, hi2 = max(lo, Q(x) - width), min(hi, Q(x) + width)
        f_lo, f_hi = q(lo2), q(hi2)
        if f_lo != 0 and f_hi != 0 and (f_lo > 0) != (f_hi > 0):
            return lo2, hi2
    return None


def _horner(coeffs: list[float], x: float) -> float:
    acc = 0.0
    for c in reversed(coeffs):
        acc = acc * x + c
    return acc


def _bisect(q: Poly, lo: Fraction, hi: Fraction, at: Fraction, p: Poly, rational: tuple) -> Root:
    """Bisect a simple root of q (in h = x - at) to full double precision in x; recognise small-denominator
    rational roots."""
    s_lo = q(lo) > 0
    tol = max(abs(at + lo), abs(at + hi), FLOOR) / 2**REFINE_BITS
    guessed = False
    while hi - lo > tol:
        mid = (lo + hi) / 2
        value = q(mid)
        if value == 0:
            return Root(at + mid, at + mid, at + mid, p)
        if (value > 0) == s_lo:
            lo = mid
        else:
            hi = mid
        if not guessed and hi - lo < GUESS_WIDTH:
            guessed = True
            guess = _rational_guess(q, lo, hi, at, rational)
            if guess is not None:
                return Root(guess, guess, guess, p)
    guess = _rational_guess(q, lo, hi, at, rational)
    return Root(guess, guess, guess, p) if guess is not None else Root(at + lo, at + hi, None, p)


def _rational_guess(q: Poly, lo: Fraction, hi: Fraction, at: Fraction, rational: tuple) -> Fraction | None:
    """A rational x with a small denominator inside (at + lo, at + hi) that is exactly a root, if any. Only one
    of q's rational roots can be such a root: without one in [lo, hi] there is nothing to look for."""
    if hi - lo > GUESS_WIDTH or not any(lo <= r <= hi for r in rational):
        return None
    c = fraction(at + (lo + hi) / 2).limit_denominator(10**12)
    return c if lo <= c - at <= hi and q(c - at) == 0 else None
