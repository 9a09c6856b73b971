"""Independent cross-check: member + case loads -> nodal deflections by Hermite-cubic finite elements (numpy, floats)."""

from __future__ import annotations

import math
from fractions import Fraction

import numpy as np

from .model import LineLoad, Member, MomentLoad, PointLoad, Settlement
from .statics import intensity


def nodal_solution(member: Member, xs, loads) -> tuple[np.ndarray, np.ndarray]:
    """Deflection and slope at every breakpoint under (factor, load) pairs; one element per segment.

    Precision: the stiffness matrix is ill-conditioned when a very short element sits in a long
    member (condition number about (longest / shortest element)^3); it is assembled in extended
    precision and solved with iterative refinement, which keeps the nodal error near 1e-12 for
    ordinary meshes and about 1e-9 when the element lengths differ a thousandfold."""
    n = len(xs)
    x = np.array([_ld(v) for v in xs], dtype=np.longdouble)
    EI = _ld(member.material.E * member.section.I)
    K = np.zeros((2 * n, 2 * n), dtype=np.longdouble)
    F = np.zeros(2 * n, dtype=np.longdouble)
    for e in range(n - 1):
        l = x[e + 1] - x[e]
        k = EI / l**3 * np.array([[12, 6 * l, -12, 6 * l], [6 * l, 4 * l * l, -6 * l, 2 * l * l],
                                  [-12, -6 * l, 12, -6 * l], [6 * l, 2 * l * l, -6 * l, 4 * l * l]])
        dofs = [2 * e, 2 * e + 1, 2 * e + 2, 2 * e + 3]
        K[np.ix_(dofs, dofs)] += k
    index = {v: i for i, v in enumerate(xs)}
    for factor, load in loads:
        _add_load(F, _ld(factor), load, xs, x, index)
    fixed: list[int] = []
    moved = np.zeros(2 * n, dtype=np.longdouble)  # prescribed support movements
    for factor, load in loads:
        if isinstance(load, Settlement):
            moved[2 * index[load.x]] += _ld(factor) * _ld(load.movement)
    for sp in member.supports:
        i = index[sp.x]
        if sp.kind == "spring":
            K[2 * i, 2 * i] += _ld(sp.stiffness)
            F[2 * i] += _ld(sp.stiffness) * moved[2 * i]  # the spring's base moves
        else:
            fixed.append(2 * i)
            if sp.kind == "fixed":
                fixed.append(2 * i + 1)
    free = [d for d in range(2 * n) if d not in fixed]
    u = np.zeros(2 * n)
    u[fixed] = moved[fixed].astype(np.float64)
    rhs = F[free] - K[np.ix_(free, fixed)] @ moved[fixed]
    u[free] = _solve_refined(K[np.ix_(free, free)], rhs)
    return u[0::2], u[1::2]


def _ld(value) -> np.longdouble:
    """A Fraction in extended precision (numerator and denominator converted separately)."""
    value = Fraction(value)
    return np.longdouble(value.numerator) / np.longdouble(value.denominator)


def _solve_refined(K: np.ndarray, F: np.ndarray) -> np.ndarray:
    """Solve K u = F: float64 LU on the diagonally scaled system, then iterative refinement with
    K and the residual kept in extended precision, so a short element beside long ones stays accurate."""
    d = 1 / np.sqrt(np.abs(np.diag(K)))
    Ks = K * d[:, None] * d[None, :]
    Fs = F * d
    lu = Ks.astype(np.float64)
    y = np.linalg.solve(lu, Fs.astype(np.float64)).astype(np.longdouble)
    for _ in range(3):
        residual = (Fs - Ks @ y).astype(np.float64)
        y = y + np.linalg.solve(lu, residual)
    return (y * d).astype(np.float64)


def _add_load(F: np.ndarray, factor: float, load, xs, x: np.ndarray, index: dict) -> None:
    if isinstance(load, PointLoad):
        F[2 * index[load.x]] += factor * _ld(load.force)
    elif isinstance(load, MomentLoad):
        F[2 * index[load.x] + 1] += factor * _ld(load.moment)
    elif isinstance(load, LineLoad):
        w = intensity(load)
        for e in range(index[load.x1], index[load.x2]):
            l = x[e + 1] - x[e]
            wa, wb = factor * _ld(w(xs[e])), factor * _ld(w(xs[e + 1]))
            F[2 * e] += l * (7 * wa + 3 * wb) / 20
            F[2 * e + 1] += l * l * (3 * wa + 2 * wb) / 60
            F[2 * e + 2] += l * (3 * wa + 7 * wb) / 20
            F[2 * e + 3] -= l * l * (2 * wa + 3 * wb) / 60


FLOOR = 1e-12  # differences below this are float noise and are reported as this bound


def reported(difference: float) -> float:
    """The difference rounded up to a power of ten, at least FLOOR: stable across machines."""
    if difference <= FLOOR:
        return FLOOR
    return float(f"1e{math.ceil(math.log10(difference))}")


def relative_difference(member: Member, xs, loads, v_exact, theta_exact) -> float:
    """Largest nodal difference between the element solution and the exact curves, relative to the largest value."""
    v, theta = nodal_solution(member, xs, loads)
    ve = np.array([float(v_exact.at(p)) for p in xs])
    te = np.array([float(theta_exact.at(p)) for p in xs])
    scale_v, scale_t = np.abs(ve).max() or 1.0, np.abs(te).max() or 1.0  # a curve that is zero: absolute
    return float(max(np.abs(v - ve).max() / scale_v, np.abs(theta - te).max() / scale_t))
