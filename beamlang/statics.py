"""Statics: point forces, couples and line loads -> resultants, shear V(x) and moment M(x) as exact piecewise polynomials."""

from __future__ import annotations

from fractions import Fraction

from .model import LineLoad, Load, Member, MomentLoad, PointLoad
from .poly import Piecewise, Poly


def breakpoints(member: Member) -> tuple[Fraction, ...]:
    """Every x where a curve may change its formula: ends, supports, loads, report points."""
    xs = {Fraction(0), member.length}
    xs.update(sp.x for sp in member.supports)
    xs.update(p.x for p in member.report_points)
    for case in member.cases:
        for load in case.loads:
            xs.update((load.x1, load.x2) if isinstance(load, LineLoad) else (load.x,))
    return tuple(sorted(xs))


def intensity(load: LineLoad) -> Poly:
    """w(t) of a line load on [x1, x2], N/m, positive up."""
    return Poly.line_through(load.x1, load.w1, load.x2, load.w2)


def resultant(loads: tuple[Load, ...] | list[Load]) -> tuple[Fraction, Fraction]:
    """(total upward force, total counterclockwise moment about x = 0)."""
    force = moment = Fraction(0)
    for load in loads:
        if isinstance(load, PointLoad):
            force += load.force
            moment += load.force * load.x
        elif isinstance(load, MomentLoad):
            moment += load.moment
        else:
            w = intensity(load)
            W = w.antiderivative()
            T = (w * Poly.of(0, 1)).antiderivative()
            force += W(load.x2) - W(load.x1)
            moment += T(load.x2) - T(load.x1)
    return force, moment


def shear_and_moment(xs: tuple[Fraction, ...], loads) -> tuple[Piecewise, Piecewise]:
    """V(x) = sum of upward forces left of x; M(x) sagging positive, dM/dx = V, dV/dx = w."""
    V, M = [], []
    x = Poly.of(0, 1)
    for k in range(len(xs) - 1):
        left = xs[k]
        v, m = Poly(), Poly()
        for load in loads:
            dv, dm = _left_of(load, left, x)
            v, m = v + dv, m + dm
        V.append(v)
        M.append(m)
    return Piecewise(xs, tuple(V)), Piecewise(xs, tuple(M))


def _left_of(load: Load, left: Fraction, x: Poly) -> tuple[Poly, Poly]:
    """Contribution to V and M on a segment starting at `left` of a load acting left of it."""
    if isinstance(load, PointLoad):
        if load.x > left:
            return Poly(), Poly()
        return Poly.of(load.force), (x - Poly.of(load.x)) * load.force
    if isinstance(load, MomentLoad):
        return (Poly(), Poly.of(-load.moment)) if load.x <= left else (Poly(), Poly())
    if load.x1 > left:
        return Poly(), Poly()
    w = intensity(load)
    W = w.antiderivative()
    T = (w * x).antiderivative()
    if load.x2 <= left:  # wholly to the left: its resultant
        total = W(load.x2) - W(load.x1)
        first = T(load.x2) - T(load.x1)
        return Poly.of(total), x * total - Poly.of(first)
    shear = W - Poly.of(W(load.x1))  # the part from x1 to x
    return shear, x * shear - (T - Poly.of(T(load.x1)))
