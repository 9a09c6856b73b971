"""Statics: point forces, couples and line loads -> resultants, shear V(x) and moment M(x) as exact piecewise polynomials."""

from __future__ import annotations

from fractions import Fraction

from beamlang.exact import Q
from beamlang.model import LineLoad, Load, Member, MomentLoad, MovingLoad, PointLoad, Settlement
from beamlang.poly import Piecewise, Poly


def breakpoints(member: Member) -> tuple[Fraction, ...]:
    """Every x where a curve may change its formula: ends, supports, hinges, changes of section or
    material, load positions and ends.

    Report points are not breakpoints (a curve is simply evaluated there) unless a load moves: then the
    envelope search follows each force past them."""
    xs = {Q(0), member.length}
    xs.update(sp.x for sp in member.supports)
    xs.update(h.x for h in member.hinges)
    xs.update(st.x1 for st in member.stretches)
    for case in member.cases:
        for load in case.loads:
            if isinstance(load, MovingLoad):
                xs.update((load.lo, load.hi))  # where the travel starts and ends
            else:
                xs.update((load.x1, load.x2) if isinstance(load, LineLoad) else (load.x,))
    if any(isinstance(load, MovingLoad) for case in member.cases for load in case.loads):
        xs.update(r.x for r in member.report_points)
    return tuple(sorted(xs))


def formula_ends(member: Member) -> frozenset[Fraction]:
    """The breakpoints every curve of the member keeps as ends of its search runs (`extrema.runs`): the ends,
    supports, hinges and changes of section or material; the loads' breakpoints end a curve's formula only
    where the curve's own loads act."""
    return frozenset({Q(0), member.length} | {sp.x for sp in member.supports} | {h.x for h in member.hinges}
                     | {st.x1 for st in member.stretches})


def region_bounds(member: Member) -> tuple[Fraction, ...]:
    """The ends and the supports: the bounds of every span and overhang."""
    return tuple(sorted({Q(0), member.length} | {sp.x for sp in member.supports}))


def intensity(load: LineLoad) -> Poly:
    """w(t) of a line load on [x1, x2], N/m, positive up."""
    return Poly.line_through(load.x1, load.w1, load.x2, load.w2)


def resultant(loads: tuple[Load, ...] | list[Load]) -> tuple[Fraction, Fraction]:
    """(total upward force, total counterclockwise moment about x = 0)."""
    force = moment = Q(0)
    for load in loads:
        if isinstance(load, PointLoad):
            force += load.force
            moment += load.force * load.x
        elif isinstance(load, MomentLoad):
            moment += load.moment
        elif isinstance(load, LineLoad):
            w = intensity(load)
            W = w.antiderivative()
            T = (w * Poly.of(0, 1)).antiderivative()
            force += W(load.x2) - W(load.x1)
            moment += T(load.x2) - T(load.x1)
    return force, moment


def moment_left(loads, x) -> Fraction:
    """The bending moment at x from the loads left of x alone (sagging positive)."""
    at = Poly.of(0, 1)
    total = Q(0)
    for load in loads:
        for where, _, dm in _changes(load, at):
            if where < x:
                total += dm(x)
    return total


def shear_and_moment(xs: tuple[Fraction, ...], loads) -> tuple[Piecewise, Piecewise]:
    """V(x) = sum of upward forces left of x; M(x) sagging positive, dM/dx = V, dV/dx = w.

    One sweep from the left: each load changes the running V and M where it starts (and a line
    load again where it ends), so the cost grows with segments plus loads, not their product."""
    x = Poly.of(0, 1)
    events: dict[Fraction, list[tuple[Poly, Poly]]] = {}
    for load in loads:
        for at, dv, dm in _changes(load, x):
            events.setdefault(at, []).append((dv, dm))
    V, M, out_v, out_m = Poly(), Poly(), [], []
    for left in xs[:-1]:
        for dv, dm in events.get(left, ()):
            V, M = V + dv, M + dm
        out_v.append(V)
        out_m.append(M)
    return Piecewise(xs, tuple(out_v)), Piecewise(xs, tuple(out_m))


def _changes(load: Load, x: Poly) -> list[tuple[Fraction, Poly, Poly]]:
    """(position, change of V, change of M) for everything right of that position."""
    if isinstance(load, PointLoad):
        return [(load.x, Poly.of(load.force), (x - Poly.of(load.x)) * load.force)]
    if isinstance(load, MomentLoad):
        return [(load.x, Poly(), Poly.of(-load.moment))]
    if isinstance(load, Settlement):
        return []  # a prescribed movement carries no force; it enters through the support conditions
    w = intensity(load)
    W = w.antiderivative()
    T = (w * x).antiderivative()
    inside_v = W - Poly.of(W(load.x1))  # the part of the load from x1 to x
    inside_m = x * inside_v - (T - Poly.of(T(load.x1)))
    total = W(load.x2) - W(load.x1)  # beyond x2: the resultant
    beyond_m = x * total - Poly.of(T(load.x2) - T(load.x1))
    return [(load.x1, inside_v, inside_m), (load.x2, Poly.of(total) - inside_v, beyond_m - inside_m)]
