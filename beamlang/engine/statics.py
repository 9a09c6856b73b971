"""Statics: point forces, couples and line loads -> resultants, shear V(x) and moment M(x) as exact piecewise polynomials."""

from __future__ import annotations

from fractions import Fraction

from beamlang.exact import Q
from beamlang.model import LineLoad, Load, Member, MomentLoad, MovingLoad, PointLoad, Settlement
from beamlang.poly import ZERO, Piecewise, Poly


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
            _, _, W1, W2, T1, T2 = _line_terms(load)
            force += W2 - W1
            moment += T2 - T1
    return force, moment


def _line_terms(load: LineLoad) -> tuple:
    """(w0, w1, W(x1), W(x2), T(x1), T(x2)) of a line load w(t) = w0 + w1 t on [x1, x2], with W = w0 t + w1 t^2 / 2
    and T = w0 t^2 / 2 + w1 t^3 / 3 the integrals of w and of t w from 0 (written out: the same exact values as
    integrating the polynomials)."""
    w0, w1 = (intensity(load).coeffs + (ZERO, ZERO))[:2]
    W1, W2 = ((w1 / 2 * x + w0) * x for x in (load.x1, load.x2))
    T1, T2 = ((w1 / 3 * x + w0 / 2) * x * x for x in (load.x1, load.x2))
    return w0, w1, W1, W2, T1, T2


def moment_left(loads, x) -> Fraction:
    """The bending moment at x from the loads left of x alone (sagging positive)."""
    total = Q(0)
    for load in loads:
        for where, _, dm in _changes(load):
            if where < x:
                total += dm(x)
    return total


def shear_and_moment(xs: tuple[Fraction, ...], loads) -> tuple[Piecewise, Piecewise]:
    """V(x) = sum of upward forces left of x; M(x) sagging positive, dM/dx = V, dV/dx = w.

    One sweep from the left: each load changes the running V and M where it starts (and a line
    load again where it ends), so the cost grows with segments plus loads, not their product."""
    events: dict[Fraction, list[tuple[Poly, Poly]]] = {}
    for load in loads:
        for at, dv, dm in _changes(load):
            events.setdefault(at, []).append((dv, dm))
    V, M, out_v, out_m = Poly(), Poly(), [], []
    for left in xs[:-1]:
        for dv, dm in events.get(left, ()):
            V, M = V + dv, M + dm
        out_v.append(V)
        out_m.append(M)
    return Piecewise(xs, tuple(out_v)), Piecewise(xs, tuple(out_m))


def _changes(load: Load) -> list[tuple[Fraction, Poly, Poly]]:
    """(position, change of V, change of M) for everything right of that position."""
    if isinstance(load, PointLoad):
        return [(load.x, Poly.of(load.force), Poly.of(-load.x * load.force, load.force))]  # F (x - x_F)
    if isinstance(load, MomentLoad):
        return [(load.x, Poly(), Poly.of(-load.moment))]
    if isinstance(load, Settlement):
        return []  # a prescribed movement carries no force; it enters through the support conditions
    # from x1 on, the part of the load from x1 to x: V gains W(x) - W(x1) and M gains x (W(x) - W(x1)) - (T(x) -
    # T(x1)); from x2 on, these are replaced by the whole load's W(x2) - W(x1) and x (W(x2) - W(x1)) - (T(x2) - T(x1))
    w0, w1, W1, W2, T1, T2 = _line_terms(load)
    return [(load.x1, Poly.of(-W1, w0, w1 / 2), Poly.of(T1, -W1, w0 / 2, w1 / 6)),
            (load.x2, Poly.of(W2, -w0, -w1 / 2), Poly.of(-T2, W2, -w0 / 2, -w1 / 6))]
