"""Polynomials in (x, p) as {(i, j): c} dicts -> shifts, derivatives, restrictions, resultants (exact)."""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from math import comb

from beamlang.exact import Q
from beamlang.poly import Poly, from_flint, to_flint

_XP = []  # python-flint's context of rational polynomials in (x, p), made on first use

Bi = dict  # {(i, j): c}: sum of c x^i p^j


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


def _powers(x, n: int) -> list:
    out = [Q(1)]
    for _ in range(n):
        out.append(out[-1] * x)
    return out


def _value(f: Bi, x: Fraction, p: Fraction) -> Fraction:
    xp = _powers(x, max((i for i, _ in f), default=0))
    pp = _powers(p, max((j for _, j in f), default=0))
    return sum((c * xp[i] * pp[j] for (i, j), c in f.items()), Q(0))


def _at_x(f: Bi, x: Fraction) -> Poly:
    """f(x0, p) as a polynomial in p."""
    xp = _powers(x, max((i for i, _ in f), default=0))
    coeffs: dict[int, Fraction] = {}
    for (i, j), c in f.items():
        coeffs[j] = coeffs.get(j, Q(0)) + c * xp[i]
    return Poly(_trim_q([coeffs.get(j, Q(0)) for j in range(max(coeffs, default=-1) + 1)]))


def _at_p(f: Bi, p: Fraction) -> Poly:
    """f(x, p0) as a polynomial in x."""
    pp = _powers(p, max((j for _, j in f), default=0))
    coeffs: dict[int, Fraction] = {}
    for (i, j), c in f.items():
        coeffs[i] = coeffs.get(i, Q(0)) + c * pp[j]
    return Poly(_trim_q([coeffs.get(i, Q(0)) for i in range(max(coeffs, default=-1) + 1)]))


def _on_diagonal(f: Bi, d: Fraction) -> Poly:
    """f(p + d, p) as a polynomial in p: (p + d)^i = sum_k C(i, k) p^k d^(i-k)."""
    dp = _powers(d, max((i for i, _ in f), default=0))
    coeffs: dict[int, Fraction] = {}
    for (i, j), c in f.items():
        for k, b in enumerate(_binomials(i)):
            coeffs[k + j] = coeffs.get(k + j, Q(0)) + c * b * dp[i - k]
    return Poly(_trim_q([coeffs.get(k, Q(0)) for k in range(max(coeffs, default=-1) + 1)]))


def _trim_q(coeffs: list) -> tuple:
    while coeffs and not coeffs[-1]:
        coeffs.pop()
    return tuple(coeffs)


def _taylor2(f: Bi, xc: Fraction, pc: Fraction) -> Bi:
    """f(xc + u, pc + w) as a polynomial in (u, w) (exact): its coefficients are small where the cell is, so
    float bounds of it are tight."""
    out: Bi = {}
    for i, col in enumerate(_in_x(f)):  # f = sum_i x^i P_i(p): each P_i at pc + w
        for j, c in enumerate(_shift1(col.coeffs, pc)):
            if c:
                out[(i, j)] = c
    rows: dict[int, list] = {}
    for (i, j), c in out.items():
        rows.setdefault(j, [Q(0)] * (max(i for i, _ in out) + 1))[i] = c
    return {(i, j): c for j, row in rows.items() for i, c in enumerate(_shift1(row, xc)) if c}


def _shift1(coeffs, a) -> list:
    out = list(coeffs)
    n = len(out)
    for i in range(n - 1):
        for j in range(n - 2, i - 1, -1):
            out[j] += a * out[j + 1]
    return out


def _in_x(f: Bi) -> list[Poly]:
    """f as a polynomial in x whose coefficients are polynomials in p."""
    deg = max((i for i, _ in f), default=-1)
    cols: list[dict[int, Fraction]] = [dict() for _ in range(deg + 1)]
    for (i, j), c in f.items():
        cols[i][j] = c
    return [Poly.of(*[col.get(j, 0) for j in range(max(col, default=-1) + 1)]) for col in cols]


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
    if not A[-1] or not r[-1]:
        return _sylvester_resultant(A, r)  # a formal leading coefficient that is zero: the own definition
    return _flint_resultant(A, r)


def _flint_resultant(A: list[Poly], B: list[Poly]) -> Poly:
    """Res_x(A, B) by python-flint (FLINT's multivariate resultant, in C): the same polynomial as
    `_sylvester_resultant` (a resultant is unique; tests/test_flint.py compares them), about 90 times
    faster on the moving-load cells' cubics."""
    import flint
    if not _XP:
        _XP.append(flint.fmpq_mpoly_ctx.get(("x", "p"), "lex"))
    ctx = _XP[0]

    def bivariate(P: list[Poly]):
        return ctx.from_dict({(i, j): to_flint(c) for i, a in enumerate(P) for j, c in enumerate(a.coeffs) if c})
    res = bivariate(A).resultant(bivariate(B), "x").to_dict()
    coeffs = [Q(0)] * (max((j for _, j in res), default=-1) + 1)
    for (_, j), c in res.items():
        coeffs[j] = from_flint(c)
    return Poly.of(*coeffs)


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
