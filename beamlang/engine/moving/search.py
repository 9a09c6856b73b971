"""Moving loads: a solved member and a case or combination with a travelling force group -> the exact envelope.

A unit upward force at xi gives, at x, the deflection G(x, xi); by Maxwell-Betti G(x, xi) = G(xi, x), so the
deflection influence line of a point x is the member's own deflection under a unit force at x. On every cell
(x in one segment, xi in one segment, x on one side of xi) the kernels of v, theta, M and V are polynomials of
degree three or less in each variable: they are interpolated exactly from the engine's solutions for unit
forces at four places and confirmed at a fifth.

With the group's first force at p (the others at p + d_i), a response is
    f(x, p) = static(x) + factor * sum_i F_i K(x, p + d_i),
a polynomial in (x, p) on each cell of the (x, p) plane that the fixed breakpoints, the travel limits and
the lines x = p + d_i cut out. Its largest and smallest values over the whole plane are found without
sampling: every cell's interior critical points (the resultant in x of df/dx and df/dp, whose real roots
are isolated exactly), every edge's critical points (x fixed: influence lines; x = p + d_i: under a force;
p fixed: the group standing still, built from the kernels and searched like a static case), and every corner.
"""

from __future__ import annotations

from fractions import Fraction

from beamlang.engine.moving.bivariate import Bi, _at_p, _at_x, _d, _in_x, _on_diagonal, _resultant, _taylor2, _value
from beamlang.engine.moving.bounds import _Best
from beamlang.engine.moving.boxes import cell_bounds, interior_bounds
from beamlang.engine.moving.floats import FloatCells, critical_bounds, line_bound, lines_at
from beamlang.engine.moving.cells import (
    _Cell,
    _cell_at,
    _cells,
    _events,
    _on_segments,
    _wheels,
    _x_range,
    directions,
    group_offsets,
)
from beamlang.engine.moving.found import Critical, Envelope
from beamlang.engine.moving.kernels import QUANTITIES, _cell_poly, _reaction_line, kernels_for, reaction_terms
from beamlang.engine.moving.standing import reaction_at, standing, value_at
from beamlang.engine.moving.standing import search as search_standing
from beamlang.engine.roots import roots_in
from beamlang.engine.solve import Solution, Target
from beamlang.engine.statics import region_bounds
from beamlang.exact import Q
from beamlang.model import LineLoad, Load, MomentLoad, PointLoad, Settlement
from beamlang.poly import Poly
from beamlang.stability import components


def envelope(sol: Solution, target: Target) -> Envelope:
    """The envelope of `target`, whose moving load is found through the member (its static curves, the
    target's own, with the group's forces added by superposition of the unit-force kernels)."""
    member = sol.member
    factor, load = member.moving(target.name)
    rate = Q(factor)  # in the engine's rational type, so products with the kernels stay in it (fast)
    kernels = kernels_for(sol, load)
    found: dict[str, list[Critical]] = {q: [] for q in QUANTITIES}
    fixed_x = tuple(sorted({sp.x for sp in member.supports} | {r.x for r in member.report_points}))
    at_fixed: dict[tuple[str, Fraction], list[Critical]] = {}
    cells = 0
    inner: list = []  # every cell's interior, searched once the edges have set the values to beat
    stretches = [st.x1 for st in member.stretches] + [member.length] if member.stepped else None
    best = _Best(list(region_bounds(member)), stretches)
    floats = FloatCells(kernels, target, factor)
    own, still, moments = _fixed_keys(member)
    for rev in directions(load):
        offsets = group_offsets(load, rev)
        events = _events(sol.xs, offsets, load)
        for p in events:  # the group standing at every event: a static case, by superposition of the kernels
            group = standing(floats, rate, _wheels(load, offsets, p))
            search_standing(group, found, p, rev, best)
            fixed = [((q, x0), Critical(value_at(group, q, x0), x0, p, rev, "group standing", True))
                     for x0 in fixed_x for q in ("v", "theta", "M")]
            fixed += [((kind, j), Critical(reaction_at(group, kind, j), sp.x, p, rev, "group standing", True))
                      for j, sp in enumerate(member.supports) for kind in ("R", "Rm")]
            for key, c in fixed:
                at_fixed.setdefault(key, []).append(c)
                best.note(key, c)
        for pa, pb in zip(events, events[1:]):
            on = _on_segments(sol.xs, load, offsets, (pa + pb) / 2)
            here = _cells(sol.xs, offsets, on)
            bounds = _cell_bounds(floats, here, offsets, pa, pb, sol.xs)
            made: dict = {}  # (quantity, cell) -> its polynomial, for the lines through the cell
            fresh = _fresh_ends(load, offsets, on, pa, pb)
            for k, cell in enumerate(here):
                cells += 1
                mid = (sol.xs[cell.s] + sol.xs[cell.s + 1]) / 2
                for q in QUANTITIES:
                    b = bounds.get((k, q))
                    if b is not None and not best.wanted((q,), *b, mid):
                        continue  # nothing in the cell, edges included, can beat the values found
                    f = made[(q, cell)] = _cell_poly(kernels, target, q, cell, offsets, rate)
                    found[q] += _cell_edges(f, q, sol.xs, offsets, cell, pa, pb, rev, best)
                    inner.append((q, f, offsets, cell, pa, pb, rev))
            lines = [(x0, q, cell) for x0, cell in ((x0, _cell_at(sol.xs, offsets, on, x0)) for x0 in fixed_x)
                     for q in ("v", "theta", "M")]
            arrays = [floats.cell(q, cell, offsets) for _, q, cell in lines]
            known = [k for k, a in enumerate(arrays) if a is not None]
            line_bounds = dict(zip(known, lines_at([arrays[k] for k in known], [lines[k][0] for k in known], pa, pb)))
            for k, (x0, q, cell) in enumerate(lines):  # influence lines of the fixed points: polynomials in p
                keys = own.get((q, x0), (q,))
                if (q, x0) in still or k in line_bounds and not best.wanted(keys, *line_bounds[k], x0):
                    continue
                f = made.get((q, cell)) or _cell_poly(kernels, target, q, cell, offsets, rate)
                at_fixed[(q, x0)] += _on_line(_at_x(f, x0), lambda p, x0=x0: x0, pa, pb, rev, "influence line",
                                              best, keys, ends=fresh)
            for j, sp in enumerate(member.supports):
                for kind in ("R", "Rm") if (j, "moment") in moments else ("R",):
                    terms = reaction_terms(kernels, kind, j, target, on, offsets, rate)
                    if not best.wanted(((kind, j),), *line_bound(terms, pa, pb)):
                        continue
                    g = _reaction_line(kernels, kind, j, target, on, offsets, rate)
                    at_fixed[(kind, j)] += _on_line(g, lambda p, x=sp.x: x, pa, pb, rev, "influence line", best,
                                                    ((kind, j),), ends=fresh)
    reactions = tuple(_pair(at_fixed[("R", j)]) for j in range(len(member.supports)))
    moments = tuple(_pair(at_fixed[("Rm", j)]) for j in range(len(member.supports)))
    slopes = tuple(_largest_abs(at_fixed[("theta", sp.x)]) for sp in member.supports)
    points = tuple(_pair(at_fixed[("v", r.x)]) for r in member.report_points)
    for (q, x0), items in at_fixed.items():  # fixed points belong to the plane search too
        if q in found:
            found[q] += items
    searched = _interiors(found, inner, sol.xs, best)
    return Envelope(load, factor, tuple((q, tuple(found[q])) for q in QUANTITIES), reactions, moments, slopes,
                    points, cells, searched, tuple((key, tuple(items)) for key, items in at_fixed.items()))


def standing_loads(env: Envelope, crit: Critical) -> list[PointLoad]:
    """The group's forces (factored) as point loads with the group standing where `crit` was found."""
    offsets = group_offsets(env.load, crit.reversed)
    return [PointLoad(x, env.factor * F, env.load.span) for x, F in _wheels(env.load, offsets, crit.position)]


def standing_case(env: Envelope, crit: Critical, static_loads: list[tuple[Fraction, Load]]) -> tuple[Load, ...]:
    """Every load, factored, of the target with the group standing where `crit` was found: a static case."""
    return tuple(scaled(ld, k) for k, ld in static_loads) + tuple(standing_loads(env, crit))


def _largest_abs(items) -> Critical | None:
    return max(items, key=lambda c: abs(c.value), default=None)


def _pair(items) -> tuple[Critical | None, Critical | None]:
    return max(items, key=lambda c: c.value, default=None), min(items, key=lambda c: c.value, default=None)


def _fixed_keys(member) -> tuple[dict, set, set]:
    """What the lines through the fixed points must beat: their own extremes where the envelope reports them
    (deflection at a report point, slope at a support; else those of the whole response only); the lines that
    are constant (deflection at a rigid support: its prescribed movement, for every position); and the support
    components with a moment (other supports' moment is zero for every position)."""
    points, supports = {r.x for r in member.report_points}, {sp.x for sp in member.supports}
    own = {("v", x): (("v", x), "v") for x in points} | {("theta", x): (("theta", x), "theta") for x in supports}
    still = {("v", sp.x) for sp in member.supports if sp.kind != "spring"} - set(own)
    return own, still, {(r.support, r.kind) for r in components(member.supports)}


def _fresh_ends(load, offsets, on, pa, pb) -> tuple[Fraction, ...]:
    """The ends of a p interval where a line through a fixed point takes a value the group standing there does
    not: where a force of that standing is off the travel inside the interval (it steps on or off there). At the
    other ends the responses at a fixed point and the reactions are continuous in p, so the line's limit is the
    standing's value, found and noted already."""
    return tuple(p for p in (pa, pb) if any(t is None and load.lo <= p + d <= load.hi for d, t in zip(offsets, on)))


def _on_line(g: Poly, x_of, pa, pb, rev, how: str, best: "_Best", keys, x_mid=None, ends=None) -> list[Critical]:
    """The ends (limits from inside: a force just beside a breakpoint) and interior critical points in p of a
    response along a line of the plane; the interior only where its bound could beat what `best` holds. `ends`:
    the ends to take (default both)."""
    out = [Critical(g(p), x_of(p), p, rev, how, True) for p in ((pa, pb) if ends is None else ends)]
    bound = critical_bounds(g, pa, pb) if g.degree >= 2 else None  # where g' can vanish
    if bound is not None and best.wanted(keys, *bound, x_mid):
        for r in roots_in(g.derivative(), pa, pb):
            out.append(Critical(g(r.x), x_of(r.x), r.x, rev, how, r.exact is not None))
    for c in out:
        for key in keys:
            best.note(key, c)
    return out


def _cell_edges(f: Bi, q: str, xs, offsets, cell: _Cell, pa, pb, rev, best: "_Best") -> list[Critical]:
    """The edges of one cell: under a force (x = p + d) and at a fixed x."""
    out: list[Critical] = []
    mid = (xs[cell.s] + xs[cell.s + 1]) / 2
    for i in (cell.left, cell.right):
        if i is not None:
            out += _on_line(_on_diagonal(f, offsets[i]), lambda p, d=offsets[i]: p + d, pa, pb, rev,
                            "under a force", best, (q,), mid)
    for i, x0 in ((cell.left, xs[cell.s]), (cell.right, xs[cell.s + 1])):
        if i is None:
            out += _on_line(_at_x(f, x0), lambda p, x0=x0: x0, pa, pb, rev, "influence line", best, (q,), mid)
    return out


SPLITS = (8, 4)  # each box that can hold a critical point split 8 x 8, then each such part 4 x 4


def _interiors(found: dict[str, list[Critical]], inner: list, xs, best: _Best) -> int:
    """Search the interior of every cell where a part of its box could hold a critical point (df/dx and df/dp
    both able to vanish there) whose value could beat those already found: the largest and smallest of v and
    M, the largest |theta| and |V|, |v| in each span (float bounds with a safety margin, `boxes`). The values
    found only grow, so a cell that cannot beat those found before the first search never can."""
    mids = [(xs[cell.s] + xs[cell.s + 1]) / 2 for _, _, _, cell, *_ in inner]
    bounds = interior_bounds([_box(*i[1:6], xs, True) for i in inner], SPLITS,
                             lambda k, hi, lo: best.wanted((inner[k][0],), hi, lo, mids[k]))
    searched = 0
    for (q, f, offsets, cell, pa, pb, rev), bound, mid in zip(inner, bounds, mids):
        if bound is None or not (best.wanted((q,), *bound[:2], mid) and best.wanted((q,), *bound[2:], mid)):
            continue
        searched += 1
        for c in _cell_interior(f, xs, offsets, cell, pa, pb, rev):
            found[q].append(c)
            best.note(q, c)
    return searched


def _cell_bounds(floats: FloatCells, here: list[_Cell], offsets, pa, pb, xs) -> dict:
    """(cell index, quantity) -> (hi, lo) of f over the parts of the cell's box (2 x 2) that meet the cell."""
    import numpy as np
    keys, arrays, items = [], [], []
    for k, cell in enumerate(here):
        a = floats.cells(cell, offsets)
        if a is not None:
            box = _box(None, offsets, cell, pa, pb, xs)
            keys += [(k, q) for q in QUANTITIES]
            arrays.append(a)
            items += [box] * len(QUANTITIES)
    if not keys:
        return {}
    C, A = np.concatenate([a[0] for a in arrays]), np.concatenate([a[1] for a in arrays])
    return dict(zip(keys, cell_bounds(C, A, items, 2)))


def _box(f: Bi | None, offsets, cell: _Cell, pa, pb, xs, local: bool = False) -> tuple:
    """A cell's polynomial, its bounding box in floats and the offsets of its force lines (None: a segment end);
    `local`: all of them about the box's centre (f shifted exactly), where float bounds are tight."""
    (x1, x2), (x3, x4) = _x_range(xs, offsets, cell, pa), _x_range(xs, offsets, cell, pb)
    xa, xb = min(x1, x3), max(x2, x4)
    xc, pc = ((xa + xb) / 2, (pa + pb) / 2) if local else (Q(0), Q(0))
    side = [None if i is None else float(offsets[i] + pc - xc) for i in (cell.left, cell.right)]
    g = _taylor2(f, xc, pc) if local else f
    return (g, float(xa - xc), float(xb - xc), float(pa - pc), float(pb - pc), *side)


def _cell_interior(f: Bi, xs, offsets, cell: _Cell, pa, pb, rev) -> list[Critical]:
    """Interior critical points of one cell: df/dx = df/dp = 0 through the resultant in x."""
    out: list[Critical] = []
    fx, fp = _d(f, 0), _d(f, 1)
    if not fx or not fp or max(i for i, _ in fx) == 0:
        return out  # no interior critical point: f is free of x or of p, or flat in x along whole lines
    res = _resultant(_in_x(fx), _in_x(fp))
    if res:
        for r in roots_in(res, pa, pb):
            p = r.x if r.exact is not None else Q(float(r.x))
            lo, hi = _x_range(xs, offsets, cell, p)
            for rx in roots_in(_at_p(fx, p), lo, hi):
                x = rx.x if rx.exact is not None else Q(float(rx.x))
                out.append(Critical(_value(f, x, p), x, p, rev, "interior", r.exact is not None and rx.exact is not None))
        return out
    swapped = {(j, i): c for (i, j), c in f.items()}  # df/dx and df/dp share a factor in x: eliminate p instead
    sx, sp = _d(swapped, 1), _d(swapped, 0)
    res = _resultant(_in_x(sp), _in_x(sx)) if sp and max(i for i, _ in sp) else Poly()
    for r in roots_in(res, xs[cell.s], xs[cell.s + 1]) if res else ():
        x = r.x if r.exact is not None else Q(float(r.x))
        for rp in roots_in(_at_x(fp, x), pa, pb):
            p = rp.x if rp.exact is not None else Q(float(rp.x))
            lo, hi = _x_range(xs, offsets, cell, p)
            if lo <= x <= hi:
                out.append(Critical(_value(f, x, p), x, p, rev, "interior", False))
    return out  # both resultants vanish: a curve of critical points, along which f is constant (edges reach it)


def scaled(load: Load, k: Fraction) -> Load:
    """A static load times a factor."""
    if isinstance(load, PointLoad):
        return PointLoad(load.x, k * load.force, load.span)
    if isinstance(load, MomentLoad):
        return MomentLoad(load.x, k * load.moment, load.span)
    if isinstance(load, LineLoad):
        return LineLoad(load.x1, load.x2, k * load.w1, k * load.w2, load.origin, load.span)
    if isinstance(load, Settlement):
        return Settlement(load.x, k * load.movement, load.span)
    raise TypeError(load)
