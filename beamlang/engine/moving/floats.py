"""Exact kernels and static pieces -> float coefficient arrays of each cell's response, and float bounds of
its lines (pruning only: a cell or line whose bound cannot beat the values found is not built exactly).

Each array comes with A >= |C|, the sum of the magnitudes of the float terms added into it, so that the
bounds' margin (`boxes.MARGIN` times the terms' size) covers the rounding of the sums too."""

from __future__ import annotations

from math import comb

from beamlang.engine.moving.bivariate import Bi
from beamlang.engine.moving.boxes import MARGIN
from beamlang.engine.moving.cells import _Cell
from beamlang.engine.moving.kernels import _Kernels, _curve, forces_on
from beamlang.engine.solve import Target

SHAPE = (8, 4)  # degrees below 8 in x and 4 in p; a larger polynomial is not bounded (always built exactly)


def array(f: Bi):
    """A polynomial in (x, p) as a float array of SHAPE, or None when it does not fit."""
    import numpy as np
    out = np.zeros(SHAPE)
    for (i, j), c in f.items():
        if i >= SHAPE[0] or j >= SHAPE[1]:
            return None
        out[i, j] = float(c)
    return out


def shifted(K, d: float):
    """K(x, p + d) from K(x, xi) in floats, and the magnitudes of the terms summed into each coefficient."""
    import numpy as np
    J = SHAPE[1]
    B = np.array([[comb(j, k) * d ** (j - k) if j >= k else 0.0 for k in range(J)] for j in range(J)])
    return K @ B, np.abs(K) @ np.abs(B) * (1 + 1e-15)


class FloatCells:
    """The float arrays (C, A) of f_q on the cells of one target, from the kernels' float arrays."""

    def __init__(self, kernels: _Kernels, target: Target, factor):
        self.kernels, self.target, self.factor = kernels, target, float(factor)
        self._static: dict = {}
        self._cells: dict = {}

    def cell(self, q: str, cell: _Cell, offsets):
        key = (q, cell, offsets)
        if key not in self._cells:
            self._cells[key] = self._make(q, cell, offsets)
        return self._cells[key]

    def _make(self, q: str, cell: _Cell, offsets):
        import numpy as np
        s = self._static_of(q, cell.s)
        if s is None:
            return None
        C, A = s[0].copy(), np.abs(s[0])
        for i, t, side in forces_on(cell, offsets):
            K = self.kernels.shifted_float(q, cell.s, t, side, offsets[i])
            if K is None:
                return None
            w = self.factor * float(self.kernels.load.forces[i])
            C += w * K[0]
            A += abs(w) * K[1]
        return C, A

    def _static_of(self, q: str, s: int):
        if (q, s) not in self._static:
            piece = _curve(self.target.curves, q).pieces[s]
            a = array({(i, 0): c for i, c in enumerate(piece.coeffs) if c})
            self._static[(q, s)] = None if a is None else (a,)
        return self._static[(q, s)]


def at_x(arrays, x0) -> tuple[list[float], list[float]]:
    """The line x = x0 of a cell's float arrays: coefficients in p and their magnitudes."""
    x, ax = float(x0), abs(float(x0))
    C, A = arrays
    g = [sum(C[i, j] * x**i for i in range(SHAPE[0])) for j in range(SHAPE[1])]
    m = [sum(A[i, j] * ax**i for i in range(SHAPE[0])) for j in range(SHAPE[1])] 
    return g, [v * (1 + 1e-12) for v in m]


def line_bound(terms, pa, pb) -> tuple[float, float]:
    """Bounds over p in [pa, pb] of sum_k w_k r_k(p + d_k), terms (w, coefficients of r, d, magnitudes of
    the coefficients), from the Taylor form at the midpoint, widened by MARGIN times the terms' size."""
    a, b = float(pa), float(pb)
    mid, half = (a + b) / 2, (b - a) / 2
    half += 4e-16 * (abs(mid) + half)  # the interval's float ends rounded outward
    t = [0.0] * (1 + max(len(r) for _, r, _, _ in terms))
    size = 0.0
    for w, r, d, mags in terms:
        c = mid + float(d)
        for j, rj in enumerate(r):
            for k in range(j + 1):
                t[k] += w * rj * comb(j, k) * c ** (j - k)
        size += abs(w) * sum(m * (abs(c) + half) ** j for j, m in enumerate(mags))
    spread = sum(abs(tk) * half**k for k, tk in enumerate(t) if k)
    slack = MARGIN * (size + spread) + 1e-300
    return t[0] + spread + slack, t[0] - spread - slack
