"""Exact kernels and static pieces -> float coefficient arrays of each cell's response, and float bounds of
its lines (pruning only: a cell or line whose bound cannot beat the values found is not built exactly).

Each array comes with A >= |C|, the sum of the magnitudes of the float terms added into it, so that the
bounds' margin (`boxes.MARGIN` times the terms' size) covers the rounding of the sums too."""

from __future__ import annotations

from fractions import Fraction
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


def interpolated(units, columns) -> tuple | None:
    """The cubic in xi through four samples, coefficient by coefficient in x, in floats: `kernels.field`'s
    interpolation from the same Lagrange basis (units[m][j]) and sample pieces, with the magnitudes of the
    summed terms' rounding folded in (A >= |K|, and MARGIN * A above the rounding); None when too large."""
    import numpy as np
    width = max(len(c) for c in columns)
    if width > SHAPE[0]:
        return None
    Y = np.array([[float(v) for v in c] + [0.0] * (width - len(c)) for c in columns])  # (samples, x degree)
    U = np.array([[float(u) for u in row] for row in units])  # (samples, xi degree)
    K, A = np.zeros(SHAPE), np.zeros(SHAPE)
    K[:width] = Y.T @ U
    # the sums' rounding is below 1e-15 times the summed magnitudes: 1e-6 of them, times MARGIN, covers it
    A[:width] = np.abs(K[:width]) + 1e-6 * (np.abs(Y).T @ np.abs(U))
    return K, A


def shift_matrix(d: float):
    """B with K(x, p + d) = K(x, xi) @ B in floats, and |B| with the rounding of the product folded in: the
    magnitudes of the terms summed are (|K| @ |B|)."""
    import numpy as np
    J = SHAPE[1]
    B = np.array([[comb(j, k) * d ** (j - k) if j >= k else 0.0 for k in range(J)] for j in range(J)])
    return B, np.abs(B) * (1 + 1e-15)


QS = {"v": 0, "theta": 1, "M": 2, "V": 3}  # the order of kernels.QUANTITIES


class FloatCells:
    """The float arrays (C, A) of f_q on the cells of one target, from the kernels' float arrays."""

    def __init__(self, kernels: _Kernels, target: Target, factor):
        self.kernels, self.target, self.factor = kernels, target, float(factor)
        self._static: dict = {}
        self._cells: dict = {}

    def cell(self, q: str, cell: _Cell, offsets):
        both = self.cells(cell, offsets)
        return None if both is None else (both[0][QS[q]], both[1][QS[q]])

    def cells(self, cell: _Cell, offsets):
        """(C, A) of every quantity on the cell, arrays (quantity, x degree, p degree), or None."""
        key = (cell, offsets)
        if key not in self._cells:
            self._cells[key] = self._make(cell, offsets)
        return self._cells[key]

    def _make(self, cell: _Cell, offsets):
        import numpy as np
        s = self._static_of(cell.s)
        if s is None:
            return None
        C, A = s.copy(), np.abs(s)
        for i, t, side in forces_on(cell, offsets):
            K = self.kernels.shifted_floats(cell.s, t, side, offsets[i])
            if K is None:
                return None
            w = self.factor * float(self.kernels.load.forces[i])
            C += w * K[0]
            A += abs(w) * K[1]
        return C, A

    def static_at(self, q: str, x: Fraction) -> Fraction:
        """The target's static q at x, exact (`Piecewise.at`: right of a breakpoint)."""
        if (q, x) not in self._static:
            self._static[(q, x)] = _curve(self.target.curves, q).at(x)
        return self._static[(q, x)]

    def static(self, s: int):
        """The target's static pieces on segment s in floats, (quantity, x degree), or None when too large."""
        a = self._static_of(s)
        return None if a is None else a[:, :, 0]

    def _static_of(self, s: int):
        import numpy as np
        if s not in self._static:
            rows = [array({(i, 0): c for i, c in enumerate(_curve(self.target.curves, q).pieces[s].coeffs) if c})
                    for q in QS]
            self._static[s] = None if any(r is None for r in rows) else np.array(rows)
        return self._static[s]


def lines_at(arrays: list, x0s: list, pa, pb) -> list[tuple[float, float]]:
    """(hi, lo) over p in [pa, pb] of each cell's float arrays on its line x = x0 (all lines at once): the
    Taylor form at the middle, widened by MARGIN times the terms' size."""
    import numpy as np
    if not arrays:
        return []
    x = np.array([float(x0) for x0 in x0s])
    C, A = np.array([a[0] for a in arrays]), np.array([a[1] for a in arrays])
    g = np.einsum("ni,nij->nj", x[:, None] ** np.arange(SHAPE[0]), C)
    m = np.einsum("ni,nij->nj", np.abs(x)[:, None] ** np.arange(SHAPE[0]), A) * (1 + 1e-12)
    a, b = float(pa), float(pb)
    mid, half = (a + b) / 2, (b - a) / 2
    half += 4e-16 * (abs(mid) + half)
    J = SHAPE[1]
    B = np.array([[comb(j, k) * mid ** (j - k) if j >= k else 0.0 for j in range(J)] for k in range(J)])
    T = g @ B.T
    spread = (np.abs(T[:, 1:]) * half ** np.arange(1, J)).sum(axis=1)
    size = (m * (abs(mid) + half) ** np.arange(J)).sum(axis=1)
    slack = MARGIN * (size + spread) + 1e-300
    return list(zip((T[:, 0] + spread + slack).tolist(), (T[:, 0] - spread - slack).tolist()))


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


def critical_bounds(g, pa, pb, n: int = 8) -> tuple[float, float] | None:
    """(hi, lo) of g over the parts of [pa, pb] (n of them) where g' can vanish, None when it cannot in any:
    from g's exact Taylor form at pa, in floats, each bound widened by MARGIN times its terms' size."""
    a = [float(k) for k in g.taylor(pa).coeffs]
    m = len(a)
    if m < 2:
        return None
    width = float(pb - pa)
    sizes = [abs(ak) for ak in a]
    d_sizes = [abs(k * ak) for k, ak in enumerate(a)]
    hi = lo = None
    for part in range(n):
        h0, half = (part + 0.5) * width / n, width / (2 * n)
        half += 4e-16 * (h0 + half)  # the part's float ends rounded outward
        t = _taylor(a, h0)
        reach = h0 + half
        d_spread = d_size = 0.0  # the sums in plain loops (the same terms in the same order, quicker)
        for k in range(2, m):
            d_spread += abs(k * t[k]) * half ** (k - 1)
        for k in range(1, m):
            d_size += d_sizes[k] * reach ** (k - 1)
        d_slack = MARGIN * (d_size + d_spread) + 1e-300
        if abs(t[1]) > d_spread + d_slack:
            continue  # g' keeps one sign on this part
        spread = size = 0.0
        for k in range(1, m):
            spread += abs(t[k]) * half**k
        for k in range(m):
            size += sizes[k] * reach**k
        slack = MARGIN * (size + spread) + 1e-300
        top, bottom = t[0] + spread + slack, t[0] - spread - slack
        hi, lo = (top, bottom) if hi is None else (max(hi, top), min(lo, bottom))
    return None if hi is None else (hi, lo)


def _taylor(a: list[float], h: float) -> list[float]:
    """The coefficients of a polynomial (ascending) about h, in floats."""
    out = list(a)
    for i in range(len(out) - 1):
        for j in range(len(out) - 2, i - 1, -1):
            out[j] += h * out[j + 1]
    return out


def coefficient_bounds(P, M, a, b) -> list[tuple[float, float]]:
    """(hi, lo) of each float polynomial (rows of P, ascending in x) over [a_k, b_k], with M >= |P| the
    magnitudes of the terms summed into its coefficients: the Taylor form at the middle, widened by MARGIN
    times the terms' size, all rows at once."""
    import numpy as np
    m = P.shape[1]
    if m == 0:
        return [(1e-300, -1e-300)] * len(P)
    mid, half = (a + b) / 2, (b - a) / 2
    half = half + 4e-16 * (np.abs(mid) + half)  # the interval's float ends rounded outward
    e = np.arange(m)[None, :] - np.arange(m)[:, None]
    binom = np.array([[comb(i, k) for i in range(m)] for k in range(m)], dtype=float)
    powers = mid[:, None] ** np.arange(m)
    B = np.where(e >= 0, powers[:, np.maximum(e, 0)], 0.0) * binom  # (rows, k, i)
    T = np.einsum("nki,ni->nk", B, P)
    spread = (np.abs(T[:, 1:]) * half[:, None] ** np.arange(1, m)).sum(axis=1)
    size = (M * (np.abs(mid) + half)[:, None] ** np.arange(m)).sum(axis=1)
    slack = MARGIN * (size + spread) + 1e-300
    return list(zip((T[:, 0] + spread + slack).tolist(), (T[:, 0] - spread - slack).tolist()))
