"""A solved member and a moving group -> the exact influence kernels K(x, xi) of v, theta, M, V per cell."""

from __future__ import annotations

from fractions import Fraction

from beamlang.engine.moving.bivariate import Bi, _add_into, _lagrange, _shift_p
from beamlang.engine.moving.cells import _Cell
from beamlang.engine.solve import Curves, Solution, Target, curves_with
from beamlang.exact import Q
from beamlang.model import MovingLoad, PointLoad
from beamlang.poly import Poly

QUANTITIES = ("v", "theta", "M", "V")


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
