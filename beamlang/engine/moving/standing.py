"""The group standing at one position -> its exact responses, by superposition of the unit-force kernels.

The kernels are the exact curves of a unit force anywhere, so the static curves plus each force times its
kernel are the very curves `solve.curves_with` gives for the static case with the group's forces added, without
a solve: the values at the fixed points and supports, and each piece between breakpoints and forces, which is
built exactly (and its critical points searched) only where a float bound could beat the values found."""

from __future__ import annotations

from bisect import bisect_right
from dataclasses import dataclass
from fractions import Fraction

from beamlang.engine.moving.bivariate import _at_p
from beamlang.engine.moving.bounds import _Best
from beamlang.engine.moving.floats import SHAPE, FloatCells, coefficient_bounds, critical_bounds
from beamlang.engine.moving.found import Critical
from beamlang.engine.moving.kernels import QUANTITIES, _curve
from beamlang.engine.roots import roots_in
from beamlang.poly import Poly


@dataclass(frozen=True, slots=True)
class Standing:
    """The group standing still: per force its position, the segment whose kernels serve it and its factored
    force; `floats` holds the target (its static curves) and the kernels."""

    floats: FloatCells
    forces: tuple[tuple[Fraction, int, Fraction], ...]


def standing(floats: FloatCells, factor: Fraction, wheels: list[tuple[Fraction, Fraction]]) -> Standing:
    """The group with its forces (position, force) standing: `search.envelope`'s group-standing configuration."""
    xs = floats.kernels.sol.xs
    return Standing(floats, tuple((x, _segment(xs, x), factor * F) for x, F in wheels))


def _segment(xs, x: Fraction) -> int:
    """The segment whose kernels serve a force at x: the one holding it, at a breakpoint the one to its right
    (the kernels are continuous in the force's position there, so either side gives the same curves), at the
    member's end the last."""
    return min(bisect_right(xs, x) - 1, len(xs) - 2)


def value_at(st: Standing, q: str, x0: Fraction) -> Fraction:
    """v, theta or M at the breakpoint x0 (the value right of it, as `Piecewise.at`)."""
    out = st.floats.static_at(q, x0)
    for xi, t, w in st.forces:
        out += w * st.floats.kernels.line(q, x0, t)(xi)
    return out


def reaction_at(st: Standing, kind: str, j: int) -> Fraction:
    """Support j's force ("R") or moment ("Rm")."""
    out = st.floats.target.curves.reactions[j][0 if kind == "R" else 1]
    for xi, t, w in st.forces:
        out += w * st.floats.kernels.reaction(kind, j, t)(xi)
    return out


def search(st: Standing, found: dict, p: Fraction, rev: bool, best: _Best) -> None:
    """Every segment end and, in a piece whose float bound could beat the values found (over the parts where its
    derivative can vanish, `floats.critical_bounds`), every zero of the derivative of each response with the
    group standing at p; a piece whose bound beats neither the values found nor a span's largest |v| at its ends
    is skipped whole (none of its values could change them)."""
    pieces, parts = _pieces(st)
    bounds = _bounds(st, pieces, parts)
    for qi, q in enumerate(QUANTITIES):
        for k, ((a, b, s), part) in enumerate(zip(pieces, parts)):
            bound = bounds.get((k, qi))
            inside = bound is None or best.wanted((q,), *bound, (a + b) / 2)
            if not inside and (q not in best.parts or not (best.wanted((q,), *bound, a)
                                                         or best.wanted((q,), *bound, b))):
                continue  # (the ends differ from the middle only where q is checked per span or stretch)
            piece = _piece(st, q, s, part)
            here = [Critical(piece(a), a, p, rev, "group standing", True)]
            critical = critical_bounds(piece, a, b) if inside and piece.degree >= 2 else None
            if critical is not None and best.wanted((q,), *critical, (a + b) / 2):  # where the slope can vanish
                here += [Critical(piece(r.x), r.x, p, rev, "group standing", r.exact is not None)
                         for r in roots_in(piece.derivative(), a, b)]
            here.append(Critical(piece(b), b, p, rev, "group standing", True))
            for crit in here:
                found[q].append(crit)
                best.note(q, crit)


def _pieces(st: Standing) -> tuple[list, list]:
    """The curves' segments with the group standing, (start, end, the member's segment holding it), and per
    segment each force's (segment t, kernel side, position, factored force): side '-' when the force stands in
    another segment, 'L' when the piece lies left of it, 'R' when right."""
    xs = st.floats.kernels.sol.xs
    grid = sorted(set(xs) | {xi for xi, _, _ in st.forces})
    pieces = [(a, b, bisect_right(xs, a) - 1) for a, b in zip(grid, grid[1:])]
    parts = [[(t, "-" if t != s else ("L" if b <= xi else "R"), xi, w) for xi, t, w in st.forces]
             for a, b, s in pieces]
    return pieces, parts


def _piece(st: Standing, q: str, s: int, part) -> Poly:
    """The exact piece of q on a part of segment s: the static piece plus each force times its kernel."""
    out = _curve(st.floats.target.curves, q).pieces[s]
    for t, side, xi, w in part:
        out = out + _at_p(st.floats.kernels.field(q, s, t, side), xi) * w
    return out


def _bounds(st: Standing, pieces, parts) -> dict:
    """(piece, quantity index) -> (hi, lo) of the piece in floats: the float kernels at each force's position,
    the margin's scale the piece's own coefficients plus the kernels' error scale at that position
    (`kernels.fields_float`); pieces whose kernels are too large have none."""
    import numpy as np
    kernels = st.floats.kernels
    rows, statics, fields = [], [], []
    for k, ((a, b, s), part) in enumerate(zip(pieces, parts)):
        static = st.floats.static(s)
        row = [kernels.fields_float(s, t, side) for t, side, _, _ in part]
        if static is not None and all(f is not None for f in row):
            rows.append(k)
            statics.append(static)
            fields.append(row)
    if not rows:
        return {}
    n, J = len(QUANTITIES), SHAPE[1]
    xi = np.array([float(xi) for xi, _, _ in st.forces])
    w = np.array([float(w) for _, _, _, w in parts[0]])
    powers = xi[:, None] ** np.arange(J)  # (forces, xi degree)
    K = np.array([[f[0] for f in row] for row in fields]).reshape(len(rows), len(w), n, SHAPE[0], J)
    E = np.array([[f[1] for f in row] for row in fields]).reshape(K.shape)
    S = np.array(statics)  # (pieces, quantity, x degree)
    P = S + np.einsum("pfqij,fj,f->pqi", K, powers, w)
    M = np.abs(P) + 1e-5 * np.abs(S) + np.einsum("pfqij,fj,f->pqi", E, np.abs(powers), np.abs(w))
    lo = np.array([float(pieces[k][0]) for k in rows])
    hi = np.array([float(pieces[k][1]) for k in rows])
    found = coefficient_bounds(P.reshape(-1, SHAPE[0]), M.reshape(-1, SHAPE[0]), np.repeat(lo, n), np.repeat(hi, n))
    return {(k, qi): found[r * n + qi] for r, k in enumerate(rows) for qi in range(n)}
