"""Independent cross-check: member + case loads -> nodal deflections by Hermite-cubic finite elements (numpy, floats)."""

from __future__ import annotations

import numpy as np

from .model import LineLoad, Member, MomentLoad, PointLoad
from .statics import intensity


def nodal_solution(member: Member, xs, loads) -> tuple[np.ndarray, np.ndarray]:
    """Deflection and slope at every breakpoint under (factor, load) pairs; one element per segment."""
    n = len(xs)
    x = np.array([float(v) for v in xs])
    EI = float(member.material.E * member.section.I)
    K = np.zeros((2 * n, 2 * n))
    F = np.zeros(2 * n)
    for e in range(n - 1):
        l = x[e + 1] - x[e]
        k = EI / l**3 * np.array([[12, 6 * l, -12, 6 * l], [6 * l, 4 * l * l, -6 * l, 2 * l * l],
                                  [-12, -6 * l, 12, -6 * l], [6 * l, 2 * l * l, -6 * l, 4 * l * l]])
        dofs = [2 * e, 2 * e + 1, 2 * e + 2, 2 * e + 3]
        K[np.ix_(dofs, dofs)] += k
    index = {v: i for i, v in enumerate(xs)}
    for factor, load in loads:
        _add_load(F, float(factor), load, xs, x, index)
    fixed: list[int] = []
    for sp in member.supports:
        i = index[sp.x]
        if sp.kind == "spring":
            K[2 * i, 2 * i] += float(sp.stiffness)
        else:
            fixed.append(2 * i)
            if sp.kind == "fixed":
                fixed.append(2 * i + 1)
    free = [d for d in range(2 * n) if d not in fixed]
    u = np.zeros(2 * n)
    u[free] = np.linalg.solve(K[np.ix_(free, free)], F[free])
    return u[0::2], u[1::2]


def _add_load(F: np.ndarray, factor: float, load, xs, x: np.ndarray, index: dict) -> None:
    if isinstance(load, PointLoad):
        F[2 * index[load.x]] += factor * float(load.force)
    elif isinstance(load, MomentLoad):
        F[2 * index[load.x] + 1] += factor * float(load.moment)
    elif isinstance(load, LineLoad):
        w = intensity(load)
        for e in range(index[load.x1], index[load.x2]):
            l = x[e + 1] - x[e]
            wa, wb = factor * float(w(xs[e])), factor * float(w(xs[e + 1]))
            F[2 * e] += l * (7 * wa + 3 * wb) / 20
            F[2 * e + 1] += l * l * (3 * wa + 2 * wb) / 60
            F[2 * e + 2] += l * (3 * wa + 7 * wb) / 20
            F[2 * e + 3] -= l * l * (2 * wa + 3 * wb) / 60


def relative_difference(member: Member, xs, loads, v_exact, theta_exact) -> float:
    """Largest nodal difference between the element solution and the exact curves, relative to the largest value."""
    v, theta = nodal_solution(member, xs, loads)
    ve = np.array([float(v_exact.at(p)) for p in xs])
    te = np.array([float(theta_exact.at(p)) for p in xs])
    scale_v, scale_t = max(np.abs(ve).max(), 1e-300), max(np.abs(te).max(), 1e-300)
    return float(max(np.abs(v - ve).max() / scale_v, np.abs(theta - te).max() / scale_t))
