"""Real roots of an exact polynomial in an interval: Sturm isolation over Fraction, then bisection."""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction

from .poly import Poly

REFINE_BITS = 56  # isolating intervals are refined to a width below |x| * 2**-56 (beyond double precision)


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
    return p * (Fraction(1) / abs(p.coeffs[-1])) if p else p


def gcd(a: Poly, b: Poly) -> Poly:
    while b:
        a, b = b, a.divmod(b)[1]
    return _monic(a)


def square_free(p: Poly) -> Poly:
    g = gcd(p, p.derivative())
    return _monic(p.divmod(g)[0]) if g.degree > 0 else _monic(p)


def _sturm(p: Poly) -> list[Poly]:
    seq = [p, _monic(p.derivative())]
    while seq[-1].degree > 0:
        r = seq[-2].divmod(seq[-1])[1]
        if not r:
            break
        seq.append(_monic(-r))
    return seq


def _changes(seq: list[Poly], x: Fraction) -> int:
    signs = [v for v in (q(x) for q in seq) if v != 0]
    return sum(1 for u, v in zip(signs, signs[1:]) if (u < 0) != (v < 0))


def roots_in(p: Poly, a: Fraction, b: Fraction) -> list[Root]:
    """Every distinct real root of p strictly inside (a, b), in increasing order."""
    if p.degree < 1 or a >= b or not _may_vanish(p, a, b):
        return []
    q = square_free(p)
    if q.degree == 1:
        x = -q.coeffs[0] / q.coeffs[1]
        return [Root(x, x, x, q)] if a < x < b else []
    seq = _sturm(q)
    found: list[Root] = []
    stack = [(a, b)]
    while stack:
        lo, hi = stack.pop()
        n = _changes(seq, lo) - _changes(seq, hi) - (1 if q(hi) == 0 else 0)
        if n == 0:
            continue
        if n == 1 and q(lo) != 0:
            found.append(_refine(q, lo, hi))
            continue
        mid = (lo + hi) / 2
        if q(mid) == 0:
            found.append(Root(mid, mid, mid, q))
        stack += [(lo, mid), (mid, hi)]
    return sorted(found, key=lambda r: r.x)


def _may_vanish(p: Poly, a: Fraction, b: Fraction) -> bool:
    """False when p surely has no root in [a, b]: |p(a)| exceeds the Taylor bound of the rest."""
    c = p.taylor(a).coeffs
    width = b - a
    rest, power = Fraction(0), Fraction(1)
    for ck in c[1:]:
        power *= width
        rest += abs(ck) * power
    return abs(c[0]) <= rest


def _refine(q: Poly, lo: Fraction, hi: Fraction) -> Root:
    """Narrow a simple root's isolating interval to below |x| * 2**-64, exactly verified."""
    tight = _float_bracket(q, lo, hi)
    if tight is not None:
        lo, hi = tight
    return _bisect(q, lo, hi)


def _float_bracket(q: Poly, lo: Fraction, hi: Fraction) -> tuple[Fraction, Fraction] | None:
    """Safeguarded Newton in floats, then a bracket of a few ulps whose sign change is checked exactly."""
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
    for bits in (48, 40, 30):  # float evaluation loses digits to cancellation: widen until verified
        width = Fraction(max(abs(x), 1e-300)) * Fraction(1, 2**bits)
        lo2, hi2 = max(lo, Fraction(x) - width), min(hi, Fraction(x) + width)
        f_lo, f_hi = q(lo2), q(hi2)
        if f_lo != 0 and f_hi != 0 and (f_lo > 0) != (f_hi > 0):
            return lo2, hi2
    return None


def _horner(coeffs: list[float], x: float) -> float:
    acc = 0.0
    for c in reversed(coeffs):
        acc = acc * x + c
    return acc


def _bisect(q: Poly, lo: Fraction, hi: Fraction) -> Root:
    """Bisect a simple root to full double precision; recognise small-denominator rational roots."""
    s_lo = q(lo) > 0
    tol = max(abs(lo), abs(hi), Fraction(1, 10**6)) / 2**REFINE_BITS
    guessed = False
    while hi - lo > tol:
        mid = (lo + hi) / 2
        value = q(mid)
        if value == 0:
            return Root(mid, mid, mid, q)
        if (value > 0) == s_lo:
            lo = mid
        else:
            hi = mid
        if not guessed and hi - lo < Fraction(1, 10**9):
            guessed = True
            guess = _rational_guess(q, lo, hi)
            if guess is not None:
                return Root(guess, guess, guess, q)
    guess = _rational_guess(q, lo, hi)
    return Root(guess, guess, guess, q) if guess is not None else Root(lo, hi, None, q)


def _rational_guess(q: Poly, lo: Fraction, hi: Fraction) -> Fraction | None:
    """A rational with a small denominator inside (lo, hi) that is exactly a root, if any."""
    if hi - lo > Fraction(1, 10**9):
        return None
    c = ((lo + hi) / 2).limit_denominator(10**12)
    return c if lo <= c <= hi and q(c) == 0 else None
