"""Float bounds on a cell's response -> which cells could still beat the extremes found (pruning only)."""

from __future__ import annotations

from bisect import bisect_right
from fractions import Fraction
from math import comb

from beamlang.engine.moving.bivariate import Bi
from beamlang.engine.moving.cells import _Cell, _x_range
from beamlang.engine.moving.found import Critical
from beamlang.poly import Poly


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
            if key in self.parts and x_mid is not None:  # a point on a bound belongs to both parts
                for part in _regions_of(self.parts[key], x_mid) or [-1]:
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


def _no_critical_point(f: Bi, xs, offsets, cell: _Cell, pa, pb) -> bool:
    """True when df/dx or df/dp keeps one sign over the cell's bounding box (by the same widened float
    bounds): then f has no interior critical point there, and its extremes over the cell lie on the edges,
    which are searched on their own. Beside a support most cells end here: the slope does not vanish."""
    (x1, x2), (x3, x4) = _x_range(xs, offsets, cell, pa), _x_range(xs, offsets, cell, pb)
    xa, xb = float(min(x1, x3)), float(max(x2, x4))
    fa, fb = float(pa), float(pb)
    for var in (0, 1):
        terms = [(i - 1, j, float(c) * i) if var == 0 else (i, j - 1, float(c) * j)
                 for (i, j), c in f.items() if (i, j)[var]]
        if not terms:
            continue
        hi, lo = _split_bound(terms, xa, xb, fa, fb, 1)
        if hi < 0 or lo > 0:
            return True
    return False


def _split_bound(terms, xa, xb, fa, fb, n: int) -> tuple[float, float]:
    if n > 1:
        return _split_bound_array(terms, xa, xb, fa, fb, n)
    return _box_bound(terms, (xa + xb) / 2, (xb - xa) / 2, (fa + fb) / 2, (fb - fa) / 2)


def _split_bound_array(terms, xa, xb, fa, fb, n: int) -> tuple[float, float]:
    """`_box_bound` over the n x n parts of the box at once (numpy arrays of the parts' centres)."""
    import numpy as np
    u = np.arange(n, dtype=float)
    cx0, cx1 = xa + (xb - xa) * u / n, xa + (xb - xa) * (u + 1) / n
    cp0, cp1 = fa + (fb - fa) * u / n, fa + (fb - fa) * (u + 1) / n
    x0 = np.repeat((cx0 + cx1) / 2, n)
    hx = np.repeat((cx1 - cx0) / 2, n)
    p0 = np.tile((cp0 + cp1) / 2, n)
    hp = np.tile((cp1 - cp0) / 2, n)
    ax, ap = np.abs(x0), np.abs(p0)
    size = np.zeros(n * n)
    taylor: dict = {}
    for i, j, c in terms:
        size += abs(c) * ax**i * ap**j
        for a in range(i + 1):
            for b in range(j + 1):
                k = c * comb(i, a) * comb(j, b) * x0 ** (i - a) * p0 ** (j - b)
                taylor[(a, b)] = taylor[(a, b)] + k if (a, b) in taylor else k
    centre = taylor.get((0, 0), np.zeros(n * n))
    spread = np.zeros(n * n)
    for (a, b), k in taylor.items():
        if a or b:
            spread += np.abs(k) * hx**a * hp**b
    slack = 1e-9 * (size + spread) + 1e-300
    return float(np.max(centre + spread + slack)), float(np.min(centre - spread - slack))


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
