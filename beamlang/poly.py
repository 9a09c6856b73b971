"""Exact polynomials and piecewise polynomials over Fraction (coefficients ascending, global x)."""

from __future__ import annotations

from bisect import bisect_left, bisect_right
from dataclasses import dataclass
from fractions import Fraction

from beamlang.exact import Q
from typing import Iterable, Sequence

Number = Fraction | int
MPQ = type(Q(0))
RATIONAL = (MPQ, int, Fraction)  # exact numbers (the others are symbolic.Sym or floats)
ZERO = Q(0)


def to_flint(c):
    """An exact rational as python-flint's fmpq (numerator and denominator as Python ints)."""
    import flint
    return flint.fmpq(int(c.numerator), int(c.denominator))


def from_flint(c):
    """python-flint's fmpq (or fmpz) -> the engine's exact rational."""
    return Q(int(c.numerator), int(c.denominator))


def to_flint_poly(p: "Poly"):
    """An exact polynomial as python-flint's fmpq_poly."""
    import flint
    return flint.fmpq_poly([to_flint(c) for c in p.coeffs])


def from_flint_poly(f) -> "Poly":
    return Poly(_trim(from_flint(c) for c in f.coeffs()))


def _trim(coeffs: Iterable) -> tuple:
    out = coeffs if isinstance(coeffs, list) else list(coeffs)
    while out and out[-1] == 0:
        out.pop()
    return tuple(out)


@dataclass(frozen=True, slots=True)
class Poly:
    """c0 + c1 x + c2 x^2 + ...; the zero polynomial has no coefficients.

    Coefficients are Fractions in the engine; the calc package also runs the same code with
    `symbolic.Sym` numbers to derive each load's formula in symbols."""

    coeffs: tuple = ()

    @staticmethod
    def of(*coeffs) -> "Poly":
        return Poly(_trim(c if not isinstance(c, (int, str)) else Fraction(c) for c in coeffs))

    @staticmethod
    def line_through(x1, y1, x2, y2) -> "Poly":
        slope = (y2 - y1) / (x2 - x1)
        return Poly.of(y1 - slope * x1, slope)

    @property
    def degree(self) -> int:
        return len(self.coeffs) - 1

    def __bool__(self) -> bool:
        return bool(self.coeffs)

    def __add__(self, other: "Poly") -> "Poly":
        a, b = self.coeffs, other.coeffs
        out = [x + y for x, y in zip(a, b)]  # then the longer one's own terms, each plus zero as if padded
        out += [x + ZERO for x in a[len(b):]] if len(a) > len(b) else [ZERO + y for y in b[len(a):]]
        return Poly(_trim(out))

    def __neg__(self) -> "Poly":
        return Poly(tuple(-c for c in self.coeffs))

    def __sub__(self, other: "Poly") -> "Poly":
        return self + (-other)

    def __mul__(self, other: "Poly | Number") -> "Poly":
        if not isinstance(other, Poly):
            return Poly(_trim(c * other for c in self.coeffs)) if other else Poly()
        if not self.coeffs or not other.coeffs:
            return Poly()
        out = [ZERO] * (len(self.coeffs) + len(other.coeffs) - 1)
        for i, a in enumerate(self.coeffs):
            for j, b in enumerate(other.coeffs):
                out[i + j] += a * b
        return Poly(_trim(out))

    __rmul__ = __mul__

    def __call__(self, x):
        """Horner's rule; an exact number at an exact x is the engine's rational (gmpy2's, whose own
        arithmetic was measured faster here than Horner on integer numerators over a common denominator)."""
        coeffs = self.coeffs
        if not coeffs:
            return 0
        exact = isinstance(x, RATIONAL) and isinstance(coeffs[-1], RATIONAL)
        if exact and type(x) is not MPQ:  # a Fraction (its parts may be gmpy2 integers, which mpq refuses) or int
            x = Q(int(x.numerator), int(x.denominator))
        acc = ZERO if exact else 0
        for c in reversed(coeffs):
            acc = acc * x + c
        return acc

    def derivative(self) -> "Poly":
        return Poly(tuple(i * c for i, c in enumerate(self.coeffs) if i))

    def antiderivative(self, at=0, value=0) -> "Poly":
        """The antiderivative that equals `value` at x = `at`."""
        raw = Poly(_trim([ZERO] + [c / (i + 1) for i, c in enumerate(self.coeffs)]))
        return raw + Poly.of(value - raw(at))

    def taylor(self, a) -> "Poly":
        """The same polynomial in h = x - a (coefficients of p(a + h))."""
        out = list(self.coeffs)
        n = len(out)
        for i in range(n - 1):
            for j in range(n - 2, i - 1, -1):
                out[j] += a * out[j + 1]
        return Poly(_trim(out))

    def divmod(self, other: "Poly") -> tuple["Poly", "Poly"]:
        rem = list(self.coeffs)
        quo = [ZERO] * max(0, len(rem) - len(other.coeffs) + 1)
        lead = other.coeffs[-1]
        while len(rem) >= len(other.coeffs) and rem:
            shift = len(rem) - len(other.coeffs)
            factor = rem[-1] / lead
            quo[shift] = factor
            for i, c in enumerate(other.coeffs):
                rem[shift + i] -= factor * c
            rem = list(_trim(rem))
        return Poly(_trim(quo)), Poly(_trim(rem))


@dataclass(frozen=True, slots=True)
class Piecewise:
    """One polynomial per segment [xs[k], xs[k+1]]; all curves of a member share the breakpoints."""

    xs: tuple  # breakpoints, strictly increasing, xs[0] = 0, xs[-1] = L
    pieces: tuple  # len(xs) - 1 polynomials in global x

    @staticmethod
    def zero(xs: Sequence) -> "Piecewise":
        return Piecewise(tuple(xs), tuple(Poly() for _ in range(len(xs) - 1)))

    def __add__(self, other: "Piecewise") -> "Piecewise":
        assert self.xs == other.xs
        return Piecewise(self.xs, tuple(a + b for a, b in zip(self.pieces, other.pieces)))

    def __mul__(self, k) -> "Piecewise":
        return Piecewise(self.xs, tuple(p * k for p in self.pieces))

    __rmul__ = __mul__

    def segment(self, x, side: str = "right") -> int:
        """Index of the segment holding x; at a breakpoint, the one to its `side`."""
        xs = self.xs
        k = bisect_right(xs, x) - 1 if side == "right" else bisect_left(xs, x) - 1
        return min(max(k, 0), len(xs) - 2)

    def at(self, x, side: str = "right"):
        return self.pieces[self.segment(x, side)](x)

    def map(self, fn) -> "Piecewise":
        return Piecewise(self.xs, tuple(fn(p) for p in self.pieces))

    def integral(self, start_value=0) -> "Piecewise":
        """Continuous antiderivative equal to `start_value` at xs[0]."""
        pieces, value = [], start_value
        for k, p in enumerate(self.pieces):
            q = p.antiderivative(self.xs[k], value)
            pieces.append(q)
            value = q(self.xs[k + 1])
        return Piecewise(self.xs, tuple(pieces))


def runs(curves: Sequence["Piecewise"], keep: frozenset = frozenset()) -> list[tuple[int, Fraction, Fraction]]:
    """(first segment, start, end) of each run of neighbouring segments where every curve (all on one grid) has
    the same piece, never joined across an x in `keep`."""
    xs = curves[0].xs
    out: list[tuple[int, Fraction, Fraction]] = []
    previous = None
    for k in range(len(xs) - 1):
        pieces = tuple(c.pieces[k] for c in curves)
        if pieces == previous and xs[k] not in keep:
            out[-1] = (out[-1][0], out[-1][1], xs[k + 1])
        else:
            out.append((k, xs[k], xs[k + 1]))
        previous = pieces
    return out
