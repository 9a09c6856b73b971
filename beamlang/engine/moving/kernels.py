"""A solved member and a moving group -> the exact influence kernels K(x, xi) of v, theta, M, V per cell."""

from __future__ import annotations

from fractions import Fraction

from beamlang.engine.moving.bivariate import Bi, _add_into, _lagrange, _shift_p, _trim_q
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

    def basis(self, t: int) -> tuple[list[list[Fraction]], list[Fraction]]:
        """The Lagrange basis of segment t's first four sample positions (coefficients in xi), and each
        basis polynomial's value at the fifth: every kernel of a force in t is a combination of them."""
        if ("b", t) not in self._cache:
            xis = [xi for xi, _ in self.samples(t)]
            basis = []
            for k in range(4):
                unit = _lagrange([(xi, Q(1) if m == k else Q(0)) for m, xi in enumerate(xis[:4])])
                basis.append(list(unit.coeffs) + [Q(0)] * (4 - len(unit.coeffs)))
            self._cache[("b", t)] = basis, [Poly(tuple(b))(xis[4]) for b in basis]
        return self._cache[("b", t)]

    def field(self, q: str, s: int, t: int, side: str) -> Bi:
        """K_q on x segment s for a unit force in segment t; side 'L' (x < xi) or 'R' when s == t."""
        key = (q, s, t, side)
        if key not in self._cache:
            self._cache[key] = _interpolate_xi(self.basis(t), self._pieces(q, s, t, side))
        return self._cache[key]

    def shifted(self, q: str, s: int, t: int, side: str, d: Fraction) -> Bi:
        """K_q(x, p + d): a force at offset d from the first, the same on every p interval it stands in t."""
        key = ("d", q, s, t, side, d)
        if key not in self._cache:
            self._cache[key] = _shift_p(self.field(q, s, t, side), d)
        return self._cache[key]

    def shifted_floats(self, s: int, t: int, side: str, d: Fraction):
        """`shifted` in floats for v, theta, M and V, stacked (quantity, x degree, p degree), with a bound of
        its terms' magnitudes (`floats.shift_matrix`), or None when too large."""
        key = ("df", s, t, side, d)
        if key not in self._cache:
            import numpy as np
            from beamlang.engine.moving.floats import shift_matrix
            K = [self.field_float(q, s, t, side) for q in QUANTITIES]
            B = self._cache.setdefault(("B", d), shift_matrix(float(d)))
            self._cache[key] = None if any(k is None for k in K) else (np.array([k[0] @ B[0] for k in K]),
                                                                         np.array([k[1] @ B[1] for k in K]))
        return self._cache[key]

    def field_float(self, q: str, s: int, t: int, side: str):
        """`field` interpolated in floats from the same samples (no exact kernel is made for a cell that is
        only bounded), with the magnitudes of the terms summed into each coefficient; None when too large."""
        key = ("ff", q, s, t, side)
        if key not in self._cache:
            from beamlang.engine.moving.floats import interpolated
            units = self.basis(t)[0]
            self._cache[key] = interpolated(units, [p.coeffs for p in self._pieces(q, s, t, side)[:4]])
        return self._cache[key]

    def _pieces(self, q: str, s: int, t: int, side: str) -> list[Poly]:
        k = s if s < t else s + 1  # the unit force adds one breakpoint inside segment t
        if s == t:
            k = t if side == "L" else t + 1
        return [_curve(curves, q).pieces[k] for _, curves in self.samples(t)]

    def fields_float(self, s: int, t: int, side: str):
        """`field_float` of v, theta, M and V stacked, arrays (quantity, x degree, xi degree), with E: MARGIN * E
        bounds the error of the float kernel and of a few dozen float operations on it (A - |K| keeps the scale
        of the interpolation's rounding, `floats.interpolated`; 1e-5 |K| covers the rest); None when too large."""
        key = ("ff4", s, t, side)
        if key not in self._cache:
            import numpy as np
            K = [self.field_float(q, s, t, side) for q in QUANTITIES]
            if any(k is None for k in K):
                self._cache[key] = None
            else:
                C, A = np.array([k[0] for k in K]), np.array([k[1] for k in K])
                self._cache[key] = C, A - (1 - 1e-5) * np.abs(C)
        return self._cache[key]

    def line(self, q: str, x0: Fraction, t: int) -> Poly:
        """K_q(x0, xi) for xi in segment t (x0 a breakpoint, the curve's value right of it: `Piecewise.at`)."""
        key = ("l", q, x0, t)
        if key not in self._cache:
            values = [_curve(c, q).at(x0) for _, c in self.samples(t)]
            self._cache[key] = Poly(_trim_q(_lagrange_checked(self.basis(t), values)))
        return self._cache[key]

    def reaction_float(self, kind: str, j: int, t: int) -> list[float]:
        key = ("rf", kind, j, t)
        if key not in self._cache:
            self._cache[key] = [float(c) for c in self.reaction(kind, j, t).coeffs]
        return self._cache[key]

    def group(self, q: str, cell: _Cell, offsets) -> Bi:
        key = ("g", q, cell, offsets)
        if key not in self._cache:
            self._cache[key] = _group_part(self, q, cell, offsets)
        return self._cache[key]

    def reaction(self, kind: str, j: int, t: int) -> Poly:
        key = (kind, j, t)
        if key not in self._cache:
            values = [c.reactions[j][0 if kind == "R" else 1] for _, c in self.samples(t)]
            self._cache[key] = Poly(_trim_q(_lagrange_checked(self.basis(t), values)))
        return self._cache[key]


def _curve(curves: Curves, q: str):
    return {"v": curves.v, "theta": curves.theta, "M": curves.M, "V": curves.V}[q]


def _interpolate_xi(basis, pieces: list[Poly]) -> Bi:
    """Coefficient by coefficient in x, a cubic in xi through four samples, confirmed at the fifth."""
    width = max(len(p.coeffs) for p in pieces)
    out: Bi = {}
    for i in range(width):
        column = [p.coeffs[i] if i < len(p.coeffs) else Q(0) for p in pieces]
        for j, c in enumerate(_lagrange_checked(basis, column)):
            if c:
                out[(i, j)] = c
    return out


def _lagrange_checked(basis, values: list[Fraction]) -> list[Fraction]:
    """The coefficients of the cubic through the first four samples; an ArithmeticError unless it meets the
    fifth."""
    units, at_fifth = basis
    coeffs = [sum((y * u[j] for y, u in zip(values, units)), Q(0)) for j in range(4)]
    if sum((y * a for y, a in zip(values, at_fifth)), Q(0)) != values[4]:  # not a cubic in xi: an engine defect
        raise ArithmeticError("influence kernel is not cubic in the load position")
    return coeffs


def _cell_poly(kernels: _Kernels, target: Target, q: str, cell: _Cell, offsets, factor: Fraction) -> Bi:
    static = _curve(target.curves, q).pieces[cell.s]
    f: Bi = {(i, 0): c for i, c in enumerate(static.coeffs) if c}
    _add_into(f, kernels.group(q, cell, offsets), factor)
    return f


def _group_part(kernels: "_Kernels", q: str, cell: _Cell, offsets) -> Bi:
    """sum_i F_i K_q(x, p + d_i) on a cell, unfactored."""
    f: Bi = {}
    for i, t, side in forces_on(cell, offsets):
        _add_into(f, kernels.shifted(q, cell.s, t, side, offsets[i]), kernels.load.forces[i])
    return f


def forces_on(cell: _Cell, offsets) -> list[tuple[int, int, str]]:
    """(force, the segment it stands in, the kernel's side) for every force on the travel: side '-' when
    it stands in another segment than x, else 'R' when x lies right of it in the cell and 'L' when left."""
    on, out = cell.on, []
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
        out.append((i, t, side))
    return out


def reaction_terms(kernels: _Kernels, kind: str, j: int, target: Target, on, offsets, factor) -> list:
    """`_reaction_line` as terms for `floats.line_bound`."""
    static = float(target.curves.reactions[j][0 if kind == "R" else 1])
    out = [(1.0, [static], 0.0, [abs(static)])]
    for i, t in enumerate(on):
        if t is not None:
            r = kernels.reaction_float(kind, j, t)
            out.append((float(factor * kernels.load.forces[i]), r, offsets[i], [abs(c) for c in r]))
    return out


def _reaction_line(kernels: _Kernels, kind: str, j: int, target: Target, on, offsets, factor) -> Poly:
    load = kernels.load
    static = target.curves.reactions[j][0 if kind == "R" else 1]
    g = Poly.of(static)
    for i, t in enumerate(on):
        if t is not None:
            g = g + kernels.reaction(kind, j, t).taylor(offsets[i]) * (factor * load.forces[i])
    return g
