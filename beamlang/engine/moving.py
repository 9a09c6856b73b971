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
p fixed: the group standing still, solved and searched like any static case), and every corner.
"""

from __future__ import annotations

from bisect import bisect_right
from dataclasses import dataclass
from fractions import Fraction
from functools import lru_cache
from math import comb

from beamlang.exact import Q
from beamlang.engine.extrema import candidates, derivative_of
from beamlang.model import LineLoad, Load, MomentLoad, MovingLoad, PointLoad, Settlement
from beamlang.poly import Poly
from beamlang.engine.roots import roots_in
from beamlang.engine.solve import Curves, Solution, Target, curves_with
from beamlang.engine.statics import region_bounds

QUANTITIES = ("v", "theta", "M", "V")
Bi = dict  # {(i, j): c}: sum of c x^i p^j


@dataclass(frozen=True, slots=True)
class Critical:
    """A value of a response with the group standing at `position` (the first-listed force there)."""

    value: Fraction
    x: Fraction
    position: Fraction
    reversed: bool  # the group travelling the other way: its forces in reverse order along x
    how: str  # "group standing" | "influence line" | "under a force" | "interior"
    exact: bool  # x and position exact rationals (else refined isolating roots)


@dataclass(frozen=True, slots=True)
class Envelope:
    """Every extreme of a moving target, each with the group position that produces it."""

    load: MovingLoad
    factor: Fraction
    extremes: tuple[tuple[str, tuple[Critical, ...]], ...]  # quantity -> its candidates (all examined)
    reactions: tuple[tuple[Critical | None, Critical | None], ...]  # per support: (largest force, smallest)
    reaction_moments: tuple[tuple[Critical | None, Critical | None], ...]
    support_slopes: tuple[Critical | None, ...]  # largest |theta| at each support
    points: tuple[tuple[Critical | None, Critical | None], ...]  # per report point: (v up, v down)
    cells: int  # how many (x, p) cells the plane was cut into, for the calc package
    interiors: int  # how many cell interiors needed the exact critical-point search (the others were bounded)

    def of(self, quantity: str) -> tuple[Critical, ...]:
        return dict(self.extremes)[quantity]


def envelope(sol: Solution, target: Target, static_loads: list[tuple[Fraction, Load]]) -> Envelope:
    """The envelope of `target`, whose moving load is found through the member; `static_loads` are its
    factored static loads (for the group-standing configurations)."""
    member = sol.member
    factor, load = member.moving(target.name)
    kernels = kernels_for(sol, load)
    found: dict[str, list[Critical]] = {q: [] for q in QUANTITIES}
    fixed_x = tuple(sorted({sp.x for sp in member.supports} | {r.x for r in member.report_points}))
    at_fixed: dict[tuple[str, Fraction], list[Critical]] = {}
    cells = 0
    inner: list = []  # every cell's interior, searched once the edges have set the values to beat
    stretches = [st.x1 for st in member.stretches] + [member.length] if member.stepped else None
    best = _Best(list(region_bounds(member)), stretches)
    static = tuple(scaled(ld, k) for k, ld in static_loads)
    for rev in directions(load):
        offsets = group_offsets(load, rev)
        events = _events(sol.xs, offsets, load)
        for p in events:  # the group standing at every event: a static case, searched exactly
            wheels = _wheels(load, offsets, p)
            curves = curves_with(sol, static + tuple(PointLoad(x, factor * F, load.span) for x, F in wheels))
            _standing(found, curves, member.length, p, rev, best)
            standing = [((q, x0), Critical(_curve(curves, q).at(x0), x0, p, rev, "group standing", True))
                        for x0 in fixed_x for q in ("v", "theta", "M")]
            standing += [((kind, j), Critical(value, member.supports[j].x, p, rev, "group standing", True))
                         for j, reaction in enumerate(curves.reactions) for kind, value in zip(("R", "Rm"), reaction)]
            for key, c in standing:
                at_fixed.setdefault(key, []).append(c)
                best.note(key, c)
        for pa, pb in zip(events, events[1:]):
            on = _on_segments(sol.xs, load, offsets, (pa + pb) / 2)
            for cell in _cells(sol.xs, offsets, on):
                cells += 1
                for q in QUANTITIES:
                    f = _cell_poly(kernels, target, q, cell, offsets, factor)
                    found[q] += _cell_edges(f, q, sol.xs, offsets, cell, pa, pb, rev, best)
                    inner.append((q, f, offsets, cell, pa, pb, rev))
            for x0 in fixed_x:  # influence lines of the fixed points: one polynomial in p per interval
                cell = _cell_at(sol.xs, offsets, on, x0)
                for q in ("v", "theta", "M"):
                    f = _cell_poly(kernels, target, q, cell, offsets, factor)
                    at_fixed[(q, x0)] += _on_line(_at_x(f, x0), lambda p, x0=x0: x0, pa, pb, rev, "influence line",
                                                  best, ((q, x0), q))
            for j, sp in enumerate(member.supports):
                for kind in ("R", "Rm"):
                    g = _reaction_line(kernels, kind, j, target, on, offsets, factor)
                    at_fixed[(kind, j)] += _on_line(g, lambda p, x=sp.x: x, pa, pb, rev, "influence line", best,
                                                    ((kind, j),))
    reactions = tuple(_pair(at_fixed[("R", j)]) for j in range(len(member.supports)))
    moments = tuple(_pair(at_fixed[("Rm", j)]) for j in range(len(member.supports)))
    slopes = tuple(_largest_abs(at_fixed[("theta", sp.x)]) for sp in member.supports)
    points = tuple(_pair(at_fixed[("v", r.x)]) for r in member.report_points)
    for (q, x0), items in at_fixed.items():  # fixed points belong to the plane search too
        if q in found:
            found[q] += items
    searched = _interiors(found, inner, sol.xs, best)
    return Envelope(load, factor, tuple((q, tuple(found[q])) for q in QUANTITIES), reactions, moments, slopes,
                    points, cells, searched)


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


# -- configuration ---------------------------------------------------------------------------------------------
def group_offsets(load: MovingLoad, reversed_: bool) -> tuple[Fraction, ...]:
    """Offsets of the forces from the first one along x; travelling the other way, they point back."""
    return tuple(-d for d in load.offsets) if reversed_ else load.offsets


def directions(load: MovingLoad) -> tuple[bool, ...]:
    """The travel directions to search (reversed: True): both unless the group is symmetric."""
    return (False, True) if _asymmetric(load) else (False,)


def _asymmetric(load: MovingLoad) -> bool:
    d, F = load.offsets, load.forces
    return any(F[i] != F[-1 - i] or d[i] - d[0] != d[-1] - d[-1 - i] for i in range(len(F)))


def _wheels(load: MovingLoad, offsets, p: Fraction) -> list[tuple[Fraction, Fraction]]:
    return [(p + d, F) for d, F in zip(offsets, load.forces) if load.lo <= p + d <= load.hi]


def _events(xs, offsets, load: MovingLoad) -> list[Fraction]:
    """Group positions where some force reaches a breakpoint (inside the travel): the p intervals' ends."""
    start, stop = load.lo - max(offsets), load.hi - min(offsets)
    out = {start, stop}
    for x in xs:
        if load.lo <= x <= load.hi:
            out.update(x - d for d in offsets if start <= x - d <= stop)
    return sorted(out)


def _on_segments(xs, load: MovingLoad, offsets, p: Fraction) -> tuple[int | None, ...]:
    """For each force: the fixed segment it stands in at group position p, or None when off the travel."""
    out = []
    for d in offsets:
        x = p + d
        out.append(bisect_right(xs, x) - 1 if load.lo < x < load.hi else None)
    return tuple(out)


@dataclass(frozen=True, slots=True)
class _Cell:
    """x in fixed segment s, between the lines of force `left` and force `right` (None: the segment end)."""

    s: int
    left: int | None
    right: int | None
    on: tuple[int | None, ...]


def _cells(xs, offsets, on) -> list[_Cell]:
    out = []
    for s in range(len(xs) - 1):
        inside = sorted((i for i, t in enumerate(on) if t == s), key=lambda i: offsets[i])
        bounds = [None] + inside + [None]
        out += [_Cell(s, a, b, on) for a, b in zip(bounds, bounds[1:])]
    return out


def _cell_at(xs, offsets, on, x0: Fraction) -> _Cell:
    """The cell that holds the breakpoint x0 (inside a p interval no force stands on a breakpoint)."""
    k = xs.index(x0)
    s = min(k, len(xs) - 2)
    inside = sorted((i for i, t in enumerate(on) if t == s), key=lambda i: offsets[i])
    if k < len(xs) - 1:  # x0 starts segment k: left of every force in it
        return _Cell(s, None, inside[0] if inside else None, on)
    return _Cell(s, inside[-1] if inside else None, None, on)


def _x_range(xs, offsets, cell: _Cell, p: Fraction) -> tuple[Fraction, Fraction]:
    lo = xs[cell.s] if cell.left is None else p + offsets[cell.left]
    hi = xs[cell.s + 1] if cell.right is None else p + offsets[cell.right]
    return lo, hi


# -- kernels ---------------------------------------------------------------------------------------------------
_KERNELS: dict[int, tuple[Solution, MovingLoad, "_Kernels"]] = {}


def kernels_for(sol: Solution, load: MovingLoad) -> "_Kernels":
    """One set of kernels per solved member and moving load, shared by its case and combinations."""
    hit = _KERNELS.get(id(sol))
    if hit is None or hit[0] is not sol or hit[1] is not load:
        _KERNELS.clear()  # one member at a time: keep memory flat over a batch
        hit = _KERNELS[id(sol)] = (sol, load, _Kernels(sol, load))
    return hit[2]


class _Kernels:
    """K_q(x, xi) per (x segment, xi segment, side) for q in v, theta, M, V, and reaction lines R_j(xi)."""

    def __init__(self, sol: Solution, load: MovingLoad):
        self.sol = sol
        self.load = load
        self._cache: dict = {}

    def samples(self, t: int) -> list[tuple[Fraction, Curves]]:
        if ("s", t) not in self._cache:
            a, b = self.sol.xs[t], self.sol.xs[t + 1]
            xis = [a + (b - a) * k / 6 for k in range(1, 6)]
            self._cache[("s", t)] = [(xi, curves_with(self.sol, (PointLoad(xi, Q(1), self.load.span),)))
                                     for xi in xis]
        return self._cache[("s", t)]

    def field(self, q: str, s: int, t: int, side: str) -> Bi:
        """K_q on x segment s for a unit force in segment t; side 'L' (x < xi) or 'R' when s == t."""
        key = (q, s, t, side)
        if key not in self._cache:
            pieces = []
            for xi, curves in self.samples(t):
                k = s if s < t else s + 1  # the unit force adds one breakpoint inside segment t
                if s == t:
                    k = t if side == "L" else t + 1
                pieces.append((xi, _curve(curves, q).pieces[k]))
            self._cache[key] = _interpolate_xi(pieces)
        return self._cache[key]

    def group(self, q: str, cell: _Cell, offsets) -> Bi:
        key = ("g", q, cell, offsets)
        if key not in self._cache:
            self._cache[key] = _group_part(self, q, cell, offsets)
        return self._cache[key]

    def reaction(self, kind: str, j: int, t: int) -> Poly:
        key = (kind, j, t)
        if key not in self._cache:
            pairs = [(xi, c.reactions[j][0 if kind == "R" else 1]) for xi, c in self.samples(t)]
            self._cache[key] = _lagrange_checked(pairs)
        return self._cache[key]


def _curve(curves: Curves, q: str):
    return {"v": curves.v, "theta": curves.theta, "M": curves.M, "V": curves.V}[q]


def _interpolate_xi(pieces: list[tuple[Fraction, Poly]]) -> Bi:
    """Coefficient by coefficient in x, a cubic in xi through four samples, confirmed at the fifth."""
    width = max(len(p.coeffs) for _, p in pieces)
    out: Bi = {}
    for i in range(width):
        column = [(xi, p.coeffs[i] if i < len(p.coeffs) else Q(0)) for xi, p in pieces]
        for j, c in enumerate(_lagrange_checked(column).coeffs):
            if c:
                out[(i, j)] = c
    return out


def _lagrange_checked(points: list[tuple[Fraction, Fraction]]) -> Poly:
    check = points[4]
    total = _lagrange(points[:4])
    if total(check[0]) != check[1]:  # the kernel is not a cubic in xi here: a defect of the engine
        raise ArithmeticError("influence kernel is not cubic in the load position")
    return total


# -- the response on a cell --------------------------------------------------------------------------------------
def _cell_poly(kernels: _Kernels, target: Target, q: str, cell: _Cell, offsets, factor: Fraction) -> Bi:
    static = _curve(target.curves, q).pieces[cell.s]
    f: Bi = {(i, 0): c for i, c in enumerate(static.coeffs) if c}
    _add_into(f, kernels.group(q, cell, offsets), factor)
    return f


def _group_part(kernels: "_Kernels", q: str, cell: _Cell, offsets) -> Bi:
    """sum_i F_i K_q(x, p + d_i) on a cell, unfactored."""
    load, on = kernels.load, cell.on
    f: Bi = {}
    for i, t in enumerate(on):
        if t is None:
            continue
        if t != cell.s:
            side = "-"
        else:
            rank = sorted((k for k, u in enumerate(on) if u == cell.s), key=lambda k: offsets[k])
            # x lies right of force i when force i is at or left of the cell's left bound
            left_bound_rank = rank.index(cell.left) if cell.left is not None else -1
            side = "R" if rank.index(i) <= left_bound_rank else "L"
        K = kernels.field(q, cell.s, t, side)
        _add_into(f, _shift_p(K, offsets[i]), load.forces[i])
    return f


def _reaction_line(kernels: _Kernels, kind: str, j: int, target: Target, on, offsets, factor) -> Poly:
    load = kernels.load
    static = target.curves.reactions[j][0 if kind == "R" else 1]
    g = Poly.of(static)
    for i, t in enumerate(on):
        if t is not None:
            g = g + kernels.reaction(kind, j, t).taylor(offsets[i]) * (factor * load.forces[i])
    return g


@lru_cache(maxsize=4096)
def _binomials(n: int) -> tuple[int, ...]:
    return tuple(comb(n, k) for k in range(n + 1))


def _shift_p(K: Bi, d: Fraction) -> Bi:
    """K(x, xi) with xi = p + d, as a polynomial in (x, p)."""
    out: Bi = {}
    for (i, j), c in K.items():
        for k in range(j, -1, -1):  # (p + d)^j = sum_k C(j, k) p^k d^(j-k)
            term = c * _binomials(j)[k] * (d ** (j - k) if j - k else 1)
            if term:
                out[(i, k)] = out.get((i, k), Q(0)) + term
    return out


def _add_into(f: Bi, g: Bi, k: Fraction) -> None:
    for key, c in g.items():
        f[key] = f.get(key, Q(0)) + k * c


def _d(f: Bi, var: int) -> Bi:
    out: Bi = {}
    for (i, j), c in f.items():
        n = (i, j)[var]
        if n:
            out[(i - 1, j) if var == 0 else (i, j - 1)] = c * n
    return {k: c for k, c in out.items() if c}


def _value(f: Bi, x: Fraction, p: Fraction) -> Fraction:
    return sum((c * x**i * p**j for (i, j), c in f.items()), Q(0))


def _at_x(f: Bi, x: Fraction) -> Poly:
    """f(x0, p) as a polynomial in p."""
    coeffs: dict[int, Fraction] = {}
    for (i, j), c in f.items():
        coeffs[j] = coeffs.get(j, Q(0)) + c * x**i
    return Poly.of(*[coeffs.get(j, 0) for j in range(max(coeffs, default=-1) + 1)])


def _at_p(f: Bi, p: Fraction) -> Poly:
    """f(x, p0) as a polynomial in x."""
    coeffs: dict[int, Fraction] = {}
    for (i, j), c in f.items():
        coeffs[i] = coeffs.get(i, Q(0)) + c * p**j
    return Poly.of(*[coeffs.get(i, 0) for i in range(max(coeffs, default=-1) + 1)])


def _on_diagonal(f: Bi, d: Fraction) -> Poly:
    """f(p + d, p) as a polynomial in p."""
    total = Poly()
    for (i, j), c in f.items():
        term = Poly.of(*([0] * j + [c]))
        for _ in range(i):
            term = term * Poly.of(d, 1)
        total = total + term
    return total


def _in_x(f: Bi) -> list[Poly]:
    """f as a polynomial in x whose coefficients are polynomials in p."""
    deg = max((i for i, _ in f), default=-1)
    cols: list[dict[int, Fraction]] = [dict() for _ in range(deg + 1)]
    for (i, j), c in f.items():
        cols[i][j] = c
    return [Poly.of(*[col.get(j, 0) for j in range(max(col, default=-1) + 1)]) for col in cols]


# -- the search ----------------------------------------------------------------------------------------------------
def _standing(found, curves: Curves, L: Fraction, p: Fraction, rev: bool, best: "_Best") -> None:
    for q in QUANTITIES:
        c = _curve(curves, q)
        d = curves.theta if q == "v" else (curves.V if q == "M" else derivative_of(c))
        for cand in candidates(c, d, Q(0), L):
            crit = Critical(cand.value, cand.x, p, rev, "group standing", cand.root is None)
            found[q].append(crit)
            best.note(q, crit)


def _on_line(g: Poly, x_of, pa, pb, rev, how: str, best: "_Best", keys, x_mid=None) -> list[Critical]:
    """The ends (limits from inside: a force just beside a breakpoint) and interior critical points in p of a
    response along a line of the plane; the interior only where its bound could beat what `best` holds."""
    out = [Critical(g(p), x_of(p), p, rev, how, True) for p in (pa, pb)]
    if g.degree >= 2 and best.wanted(keys, *_line_bound(g, pa, pb), x_mid):
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


class _Best:
    """The largest and smallest value found so far per key, and the largest magnitude per part of the member
    where each part is checked on its own: |v| per span (span/N limits) and, on a stepped member, |M| and |V|
    per stretch (the stress uses each stretch's section). What a line or a cell must be able to beat (by its
    float bound) to be searched exactly."""

    ABS = ("theta", "V")  # only the largest magnitude of these is reported

    def __init__(self, spans: list[Fraction], stretches: list[Fraction] | None = None):
        self.parts = {"v": spans} | ({"M": stretches, "V": stretches} if stretches else {})
        self.values: dict = {}
        self.region: dict[tuple[str, int], float] = {}

    def note(self, key, c: Critical) -> None:
        value = float(c.value)
        b = self.values.setdefault(key, [value, value])
        b[0], b[1] = max(b[0], value), min(b[1], value)
        if key in self.parts:
            for k in _regions_of(self.parts[key], c.x):
                self.region[(key, k)] = max(self.region.get((key, k), 0.0), abs(value))

    def wanted(self, keys, hi_b: float, lo_b: float, x_mid: Fraction | None = None) -> bool:
        """Could a value between lo_b and hi_b (of a cell or line around x_mid) beat what was found?"""
        for key in keys:
            b = self.values.get(key)
            if b is None:
                return True
            kind = key if isinstance(key, str) else key[0]
            if kind in self.ABS:
                if max(abs(hi_b), abs(lo_b)) > max(abs(b[0]), abs(b[1])):
                    return True
            elif hi_b > b[0] or lo_b < b[1]:
                return True
            if key in self.parts and x_mid is not None:
                part = bisect_right(self.parts[key], x_mid) - 1
                if max(abs(hi_b), abs(lo_b)) > self.region.get((key, part), 0.0):
                    return True
        return False


def _line_bound(g: Poly, pa: Fraction, pb: Fraction) -> tuple[float, float]:
    """Bounds of g over [pa, pb] from its Taylor form at the midpoint (floats, widened for rounding)."""
    mid, half = (pa + pb) / 2, float(pb - pa) / 2
    c = [float(k) for k in g.taylor(mid).coeffs] or [0.0]
    spread = sum(abs(k) * half**i for i, k in enumerate(c) if i)
    size = sum(abs(float(k)) * abs(float(mid)) ** i for i, k in enumerate(g.coeffs))
    slack = 1e-9 * (size + spread) + 1e-300
    return c[0] + spread + slack, c[0] - spread - slack


def _interiors(found: dict[str, list[Critical]], inner: list, xs, best: _Best) -> int:
    """Search the interior of every cell whose float bound (with a safety margin) could beat the values
    already found: the largest and smallest of v and M, the largest |theta| and |V|, |v| in each span."""
    searched = 0
    for q, f, offsets, cell, pa, pb, rev in inner:
        mid = (xs[cell.s] + xs[cell.s + 1]) / 2
        if not all(best.wanted((q,), *_bound(f, xs, offsets, cell, pa, pb, n), mid) for n in (1, 4)):
            continue
        searched += 1
        for c in _cell_interior(f, xs, offsets, cell, pa, pb, rev):
            found[q].append(c)
            best.note(q, c)
    return searched


def _regions_of(bounds: list[Fraction], x: Fraction) -> list[int]:
    """The spans or overhangs (between consecutive bounds) that x belongs to (two at a support)."""
    return [k for k in range(len(bounds) - 1) if bounds[k] <= x <= bounds[k + 1]]


def _bound(f: Bi, xs, offsets, cell: _Cell, pa, pb, n: int) -> tuple[float, float]:
    """An upper and a lower bound of f over the cell's bounding box (split n times per side), from the Taylor
    form at each part's centre, widened for float rounding."""
    (x1, x2), (x3, x4) = _x_range(xs, offsets, cell, pa), _x_range(xs, offsets, cell, pb)
    xa, xb = float(min(x1, x3)), float(max(x2, x4))
    fa, fb = float(pa), float(pb)
    terms = [(i, j, float(c)) for (i, j), c in f.items()]
    return _split_bound(terms, xa, xb, fa, fb, n)


def _split_bound(terms, xa, xb, fa, fb, n: int) -> tuple[float, float]:
    hi = lo = None
    for u in range(n):
        for w in range(n):
            cx0, cx1 = xa + (xb - xa) * u / n, xa + (xb - xa) * (u + 1) / n
            cp0, cp1 = fa + (fb - fa) * w / n, fa + (fb - fa) * (w + 1) / n
            top, bottom = _box_bound(terms, (cx0 + cx1) / 2, (cx1 - cx0) / 2, (cp0 + cp1) / 2, (cp1 - cp0) / 2)
            hi = top if hi is None else max(hi, top)
            lo = bottom if lo is None else min(lo, bottom)
    return hi, lo


def _box_bound(terms, x0: float, hx: float, p0: float, hp: float) -> tuple[float, float]:
    centre = spread = size = 0.0
    taylor: dict[tuple[int, int], float] = {}
    for i, j, c in terms:
        size += abs(c) * abs(x0) ** i * abs(p0) ** j
        for a in range(i + 1):  # c (x0 + u)^i (p0 + w)^j
            for b in range(j + 1):
                k = c * comb(i, a) * comb(j, b) * x0 ** (i - a) * p0 ** (j - b)
                taylor[(a, b)] = taylor.get((a, b), 0.0) + k
    for (a, b), k in taylor.items():
        if a == 0 and b == 0:
            centre = k
        else:
            spread += abs(k) * hx**a * hp**b
    slack = 1e-9 * (size + spread) + 1e-300
    return centre + spread + slack, centre - spread - slack


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


def _resultant(A: list[Poly], B: list[Poly]) -> Poly:
    """A polynomial in p that vanishes wherever A(x, p) and B(x, p) share a root x: the resultant in x of A
    and the pseudo-remainder of B by A (extra roots where A's leading coefficient vanishes only add
    candidates, each evaluated exactly)."""
    m = len(A) - 1
    if m < 1 or not B:
        return Poly()
    r = _prem(B, A)
    if not r:
        return Poly()  # B is a multiple of A: a common factor in x for every p
    if len(r) == 1:
        return r[0]
    if m == 2:
        return _res_quadratic(A, r)
    return _sylvester_resultant(A, r)


def _sylvester_resultant(A: list[Poly], B: list[Poly]) -> Poly:
    """Res_x(A, B) by evaluation at enough integers and exact interpolation (A of degree three or more)."""
    m, n = len(A) - 1, len(B) - 1
    degree = n * max(a.degree for a in A) + m * max(b.degree for b in B)
    pts = []
    for k in range(degree + 1):
        t = Q(k)
        pts.append((t, _det(_sylvester([a(t) for a in A], [b(t) for b in B]))))
    return _lagrange(pts)


def _prem(B: list[Poly], A: list[Poly]) -> list[Poly]:
    """Pseudo-remainder of B by A in x (coefficients are polynomials in p): degree below A's."""
    B = list(B)
    m = len(A) - 1
    while len(B) - 1 >= m and B:
        lead, k = B[-1], len(B) - 1 - m
        B = [b * A[-1] for b in B]
        for i, a in enumerate(A):
            B[i + k] = B[i + k] - a * lead
        while B and not B[-1]:
            B.pop()
    return B


def _sylvester(a: list[Fraction], b: list[Fraction]) -> list[list[Fraction]]:
    m, n = len(a) - 1, len(b) - 1
    size = m + n
    rows = []
    for k in range(n):
        rows.append([Q(0)] * k + list(reversed(a)) + [Q(0)] * (size - m - 1 - k))
    for k in range(m):
        rows.append([Q(0)] * k + list(reversed(b)) + [Q(0)] * (size - n - 1 - k))
    return rows


def _det(rows: list[list[Fraction]]) -> Fraction:
    n = len(rows)
    a = [list(r) for r in rows]
    det = Q(1)
    for col in range(n):
        pivot = next((r for r in range(col, n) if a[r][col] != 0), None)
        if pivot is None:
            return Q(0)
        if pivot != col:
            a[col], a[pivot] = a[pivot], a[col]
            det = -det
        det *= a[col][col]
        for r in range(col + 1, n):
            if a[r][col]:
                k = a[r][col] / a[col][col]
                a[r] = [u - k * v for u, v in zip(a[r], a[col])]
    return det


def _res_quadratic(A: list[Poly], r: list[Poly]) -> Poly:
    """A = a2 x^2 + a1 x + a0 and r = r1 x + r0: Res = a2 r0^2 - a1 r0 r1 + a0 r1^2."""
    a0, a1, a2 = A
    r0, r1 = r[0], r[1]
    return a2 * r0 * r0 - a1 * r0 * r1 + a0 * r1 * r1


def _lagrange(points: list[tuple[Fraction, Fraction]]) -> Poly:
    total = Poly()
    for k, (xk, yk) in enumerate(points):
        if not yk:
            continue
        term, denom = Poly.of(1), Q(1)
        for m, (xm, _) in enumerate(points):
            if m != k:
                term = term * Poly.of(-xm, 1)
                denom *= xk - xm
        total = total + term * (yk / denom)
    return total


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

