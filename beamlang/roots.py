"""Real roots of an exact polynomial in an interval: Sturm isolation over Fraction, then bisection."""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

from .poly import Poly

REFINE_BITS = 64  # isolating intervals are refined to a width below |x| * 2**-64


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
    if p.degree < 1 or a >= b:
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


def _refine(q: Poly, lo: Fraction, hi: Fraction) -> Root:
    """Bisect a simple root to full double precision; recognise small-denominator rational roots."""
    s_lo = q(lo) > 0
    tol = max(abs(lo), abs(hi), Fraction(1, 10**6)) / 2**REFINE_BITS
    while hi - lo > tol:
        mid = (lo + hi) / 2
        value = q(mid)
        if value == 0:
            return Root(mid, mid, mid, q)
        if (value > 0) == s_lo:
            lo = mid
        else:
            hi = mid
        guess = _rational_guess(q, lo, hi)
        if guess is not None:
            return Root(guess, guess, guess, q)
    return Root(lo, hi, None, q)


def _rational_guess(q: Poly, lo: Fraction, hi: Fraction) -> Fraction | None:
    """A rational with a small denominator inside (lo, hi) that is exactly a root, if any."""
    if hi - lo > Fraction(1, 10**9):
        return None
    c = ((lo + hi) / 2).limit_denominator(10**12)
    return c if lo <= c <= hi and q(c) == 0 else None
