"""Every cell's response (floats) -> bounds of f, df/dx and df/dp over parts of the cell's box, all cells at once.

The interior search of a cell is needed only where an interior critical point could beat the values found:
such a point lies in some part of the cell's bounding box that meets the cell, and there df/dx and df/dp
both vanish, so both of their bounds straddle zero. `interior_bounds` keeps, per cell, the bounds of f over
those parts only (None when there is none). Every bound is the Taylor form at a part's centre (numpy, in
floats) widened by MARGIN times the sum of the terms' magnitudes over the part, which is far above the
rounding of the few float operations, so each is a true bound of the exact polynomial."""

from __future__ import annotations

from math import comb
from typing import Callable

from beamlang.engine.moving.bivariate import Bi

MARGIN = 1e-9  # relative widening of every float bound
CHUNK = 256  # cells per numpy batch (keeps the arrays a few MB)


def interior_bounds(items: list[tuple[Bi, float, float, float, float, float | None, float | None]],
                    splits: tuple[int, ...], wanted: Callable[[int, float, float], bool]
                    ) -> list[tuple[float, float, float, float] | None]:
    """Per cell (f, x range of its box, p range, offsets of its left and right force lines or None): None when
    no part of the box can hold an interior critical point, or when `wanted(k, hi, lo)` says that cell k's
    bounds cannot beat what is found; else (hi, lo) over the whole box and (hi, lo) over the smallest parts
    that could hold a critical point (each part split n x n in turn, for n in `splits`)."""
    live = {k: (parts, parts[0][4:]) for k, parts in enumerate(_relevant(items, 1)) if parts}
    live = {k: v for k, v in live.items() if wanted(k, *v[1])}
    for n in splits:
        flat = [(k, box) for k, (parts, _) in live.items() for box in parts]
        found = _relevant([(items[k][0], *box[:4], *items[k][5:]) for k, box in flat], n)
        grown: dict = {}
        for (k, _), parts in zip(flat, found):
            grown.setdefault(k, []).extend(parts)
        live = {k: (parts, live[k][1]) for k, parts in grown.items() if parts}
        live = {k: v for k, v in live.items() if wanted(k, *_hull(v[0]))}
    return [live[k][1] + _hull(live[k][0]) if k in live else None for k in range(len(items))]


def _hull(parts) -> tuple[float, float]:
    return max(p[4] for p in parts), min(p[5] for p in parts)


def _relevant(items, n: int) -> list[list[tuple[float, float, float, float, float, float]]]:
    """Per box: its n x n parts (x range, p range, hi and lo of f) that can hold a critical point of its cell."""
    out: list = []
    for k in range(0, len(items), CHUNK):
        out += _chunk(items[k:k + CHUNK], n)
    return out


def _chunk(items, n: int) -> list:
    import numpy as np
    I = max((i for f, *_ in items for i, _ in f), default=0) + 1
    J = max((j for f, *_ in items for _, j in f), default=0) + 1
    C = np.zeros((len(items), I, J))
    for k, (f, *_) in enumerate(items):
        for (i, j), c in f.items():
            C[k, i, j] = float(c)
    geo = np.array([g[1:5] for g in items], dtype=float).reshape(-1, 4)  # xa, xb, pa, pb
    (fb, dx, dp), meets = _parts(C, np.abs(C), geo, n, True), _meets(items, geo, n)
    keep = meets & (dx[..., 1] <= 0) & (dx[..., 0] >= 0) & (dp[..., 1] <= 0) & (dp[..., 0] >= 0)
    xa, xb, pa, pb = geo.T
    out = []
    for c, k in zip(*np.nonzero(keep)) if len(items) else ():
        while len(out) <= c:
            out.append([])
        ix, ip = divmod(int(k), n)
        out[c].append((xa[c] + (xb[c] - xa[c]) * ix / n, xa[c] + (xb[c] - xa[c]) * (ix + 1) / n,
                       pa[c] + (pb[c] - pa[c]) * ip / n, pa[c] + (pb[c] - pa[c]) * (ip + 1) / n,
                       float(fb[c, k, 0]), float(fb[c, k, 1])))
    return out + [[] for _ in range(len(items) - len(out))]


def cell_bounds(C, A, items, n: int) -> list[tuple[float, float]]:
    """(hi, lo) of each cell's f over the n x n parts of its box that meet the cell, from float coefficient
    arrays C (cells, I, J) and bounds A >= |C| of the magnitudes of the terms summed into them (the margin's
    scale); `items` as in `interior_bounds` (its f unused)."""
    import numpy as np
    if not items:
        return []
    geo = np.array([g[1:5] for g in items], dtype=float).reshape(-1, 4)
    fb = _parts(C, A, geo, n, False)[0]
    meets = _meets(items, geo, n)
    hi = np.where(meets, fb[..., 0], -np.inf).max(axis=1)
    lo = np.where(meets, fb[..., 1], np.inf).min(axis=1)
    return list(zip(hi.tolist(), lo.tolist()))


def _parts(C, A, geo, n: int, derivatives: bool):
    """(hi, lo) of f (and of df/dx and df/dp) on each of the n x n parts of every cell's box: arrays
    (cells, n*n, 2); A >= |C| sets the margin."""
    import numpy as np
    u = (np.arange(n) + 0.5) / n
    xa, xb, pa, pb = geo.T
    x0 = np.repeat(xa[:, None] + (xb - xa)[:, None] * u, n, axis=1)  # (cells, n*n), x slowest
    p0 = np.tile(pa[:, None] + (pb - pa)[:, None] * u, (1, n))
    hx = np.repeat(((xb - xa) / (2 * n))[:, None], n * n, axis=1)
    hp = np.repeat(((pb - pa) / (2 * n))[:, None], n * n, axis=1)
    hx = hx + 4e-16 * (np.abs(x0) + hx)  # the part's float ends rounded outward
    hp = hp + 4e-16 * (np.abs(p0) + hp)
    I, J = C.shape[1:]
    T = _shift(x0, I) @ C[:, None] @ np.swapaxes(_shift(p0, J), -1, -2)  # (cells, parts, I, J)
    ri, rj = np.arange(I), np.arange(J)
    if not derivatives:
        return (_bound(A, T, x0, p0, hx, hp),)
    Ax, Tx = A[:, 1:, :] * ri[1:, None], T[:, :, 1:, :] * ri[1:, None]
    Ap, Tp = A[:, :, 1:] * rj[1:], T[:, :, :, 1:] * rj[1:]
    return (_bound(A, T, x0, p0, hx, hp), _bound(Ax, Tx, x0, p0, hx, hp), _bound(Ap, Tp, x0, p0, hx, hp))


def _powers(c, m: int):
    """c^0 .. c^(m-1) along a new last axis (products, not pow)."""
    import numpy as np
    out = np.empty(c.shape + (max(m, 1),))
    out[..., 0] = 1.0
    for k in range(1, m):
        out[..., k] = out[..., k - 1] * c
    return out


def _shift(c, m: int):
    """comb(i, a) c^(i - a) for a, i < m (zero where i < a): the Taylor shift to the centre c."""
    import numpy as np
    e = np.arange(m)[None, :] - np.arange(m)[:, None]
    binom = np.array([[comb(i, a) for i in range(m)] for a in range(m)], dtype=float)
    return _powers(c, m)[..., np.maximum(e, 0)] * binom


def _bound(A, T, x0, p0, hx, hp):
    import numpy as np
    I, J = A.shape[1:]
    if I == 0 or J == 0:
        zero = np.zeros(x0.shape + (2,))
        zero[..., 0], zero[..., 1] = 1e-300, -1e-300
        return zero
    size = ((_powers(np.abs(x0) + hx, I) @ A) * _powers(np.abs(p0) + hp, J)).sum(axis=-1)
    w = _powers(hx, I)[..., None] * _powers(hp, J)[..., None, :]
    centre = T[:, :, 0, 0]
    spread = (np.abs(T) * w).sum(axis=(2, 3)) - np.abs(centre)
    slack = MARGIN * (size + spread) + 1e-300
    return np.stack((centre + spread + slack, centre - spread - slack), axis=-1)


def _meets(items, geo, n: int):
    """Which parts of each box can meet the cell: right of its left force line x = p + d, left of its right."""
    import numpy as np
    xa, xb, pa, pb = geo.T
    k = np.arange(n + 1) / n
    xl, pl = xa[:, None] + (xb - xa)[:, None] * k, pa[:, None] + (pb - pa)[:, None] * k
    x_lo, x_hi = np.repeat(xl[:, :-1], n, axis=1), np.repeat(xl[:, 1:], n, axis=1)
    p_lo, p_hi = np.tile(pl[:, :-1], (1, n)), np.tile(pl[:, 1:], (1, n))
    tol = 1e-12 * (np.abs(x_lo) + np.abs(x_hi) + np.abs(p_lo) + np.abs(p_hi) + 1.0)
    ok = np.ones(x_lo.shape, dtype=bool)
    for c, (*_, left, right) in enumerate(items):
        if left is not None:
            ok[c] &= x_hi[c] - p_lo[c] >= left - tol[c]
        if right is not None:
            ok[c] &= x_lo[c] - p_hi[c] <= right + tol[c]
    return ok
