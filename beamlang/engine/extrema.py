"""Extrema: exact piecewise curves -> located maxima (roots of the derivative, exact or isolated), never sampled."""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

from beamlang.exact import Q
from beamlang.poly import Piecewise, Poly, runs
from beamlang.engine.roots import Root, roots_in

SAME = Q(1, 10**12)  # two maxima within this relative difference are the same (symmetry)


@dataclass(frozen=True, slots=True)
class Located:
    """A value of a curve at a place: x exact when rational, else a refined isolating root."""

    x: Fraction
    value: Fraction
    root: Root | None  # set when x is an irrational root of the derivative
    side: str  # "left", "right" or "" (continuous there)
    x_all: tuple[Fraction, ...]  # every place where the same extreme value is reached

    @property
    def exact(self) -> bool:
        return self.root is None or self.root.exact is not None


@dataclass(frozen=True, slots=True)
class Candidate:
    """A place examined in an extremum search, with the reason it was examined."""

    x: Fraction
    value: Fraction
    reason: str  # "segment end" | "derivative zero"
    root: Root | None
    side: str
    segment: int


def candidates(curve: Piecewise, derivative: Piecewise, lo: Fraction, hi: Fraction,
               keep: frozenset | None = None) -> list[Candidate]:
    """Both one-sided values at every end of a formula's run in [lo, hi], and every interior zero of the
    derivative. A run (`poly.runs`) joins neighbouring segments where the curve and its derivative have the same
    formula, never across an x in `keep` (ends, supports, hinges, section changes: where a region or stretch is
    bounded): a breakpoint of another case's load is not an end of this curve's formula, so it is not examined
    as one. `keep=None` examines every segment."""
    out: list[Candidate] = []
    segments = ([(k, curve.xs[k], curve.xs[k + 1]) for k in range(len(curve.pieces))] if keep is None else
                runs((curve, derivative), keep))
    for k, a, b in segments:
        if a < lo or b > hi:
            continue
        p = curve.pieces[k]
        out.append(Candidate(a, p(a), "segment end", None, "right", k))
        for r in roots_in(derivative.pieces[k], a, b):
            out.append(Candidate(r.x, p(r.x), "derivative zero", None if r.exact is not None else r, "", k))
        out.append(Candidate(b, p(b), "segment end", None, "left", k))
    return out


def largest(cands: list[Candidate], sign: int) -> Located | None:
    """The candidate with the largest sign*value, if that is above zero; ties collect every place."""
    if not cands:
        return None
    values = [c.value for c in cands]
    target = max(values) if sign > 0 else min(values)
    if sign * target <= 0:
        return None
    floor = sign * float(target) * (1 - 1e-9)  # a float pre-filter, then the exact test
    tolerance = SAME * abs(target)
    tied = [c for c, v in zip(cands, values) if sign * float(v) >= floor and abs(v - target) <= tolerance]
    first = min(tied, key=lambda c: c.x)
    side = first.side if _jumps(cands, first.x) else ""
    return Located(first.x, first.value, first.root, side, tuple(sorted({c.x for c in tied})))


def largest_abs(cands: list[Candidate]) -> Located | None:
    """The largest magnitude of either sign; equal magnitudes (antisymmetry) give the leftmost."""
    up, down = largest(cands, 1), largest(cands, -1)
    if up is None or down is None:
        return up or down
    if abs(up.value + down.value) <= SAME * up.value:
        return up if up.x <= down.x else down
    return down if -down.value > up.value else up


def _jumps(cands: list[Candidate], x: Fraction) -> bool:
    values = {c.value for c in cands if c.x == x}
    return len(values) > 1


def derivative_of(curve: Piecewise) -> Piecewise:
    return curve.map(Poly.derivative)
