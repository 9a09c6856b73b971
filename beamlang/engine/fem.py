"""Independent cross-check: member + case loads -> nodal deflections by Hermite-cubic finite elements (numpy, floats).

With shear deformation the elements are the shear-flexible cubic elements (phi = 12 EI / (kappa G A l^2);
J. S. Przemieniecki, Theory of Matrix Structural Analysis, 1968, from memory), whose shape functions solve the
unloaded Timoshenko beam exactly, so that work-equivalent loads still give exact nodal values."""

from __future__ import annotations

from bisect import bisect_left
from fractions import Fraction

import numpy as np
from threadpoolctl import ThreadpoolController

from beamlang.engine.statics import intensity
from beamlang.exact import Q
from beamlang.model import LineLoad, Member, MomentLoad, PointLoad, Settlement

MIN_ELEMENT = Q(1, 500)  # of the member length; shorter elements would ruin the float solve
_BLAS: list[ThreadpoolController] = []  # made on first use: it scans the loaded libraries once


def _one_thread():
    """BLAS limited to one thread for the small solves: waking its worker threads costs far more than the
    solve itself on a busy machine (measured 27-150 ms a solve against well under 1 ms)."""
    if not _BLAS:
        _BLAS.append(ThreadpoolController())
    return _BLAS[0].limit(limits=1, user_api="blas")


def fe_nodes(member: Member, xs) -> tuple[Fraction, ...]:
    """The element nodes: both ends, every support, hinge and change of section, then every other
    breakpoint that is not closer than MIN_ELEMENT x L to a node already taken (loads between nodes
    become consistent nodal loads, for which Hermite elements stay exact at the nodes)."""
    tol = member.length * MIN_ELEMENT
    nodes = sorted({Q(0), member.length, *(sp.x for sp in member.supports), *(h.x for h in member.hinges),
                    *(st.x1 for st in member.stretches)})
    for x in xs:  # nodes stay sorted: only the neighbours of x can be too close
        k = bisect_left(nodes, x)
        if all(abs(x - nodes[j]) >= tol for j in (k - 1, k) if 0 <= j < len(nodes)):
            nodes.insert(k, x)
    return tuple(nodes)


def nodal_solution(member: Member, xs, loads) -> tuple[np.ndarray, np.ndarray]:
    """Deflection and slope (right of each node) at the nodes `xs` under (factor, load) pairs; one
    element between nodes, each with the EI of its stretch; at a hinge the elements either side have
    rotations of their own (the released degree of freedom).

    Precision: the stiffness matrix is ill-conditioned when a very short element sits in a long
    member (condition number about (longest / shortest element)^3), so `fe_nodes` avoids such
    elements; the matrix is assembled in extended precision and solved with iterative refinement."""
    x = np.array([_ld(v) for v in xs], dtype=np.longdouble)
    hinge_at = {h.x for h in member.hinges}
    v_dof, left, right, count = [], [], [], 0
    for node in xs:  # degrees of freedom: v, then the rotation (two at a hinge: left and right of it)
        v_dof.append(count)
        left.append(count + 1)
        right.append(count + 2 if node in hinge_at else count + 1)
        count = right[-1] + 1
    K = np.zeros((count, count), dtype=np.longdouble)
    F = np.zeros(count, dtype=np.longdouble)
    l = x[1:] - x[:-1]
    stretches = [member.stretch_at((a + b) / 2) for a, b in zip(xs, xs[1:])]
    EI = np.array([_ld(st.EI) for st in stretches], dtype=np.longdouble)
    phis = (12 * EI / (np.array([_ld(st.GA) for st in stretches], dtype=np.longdouble) * l * l)
            if member.shear_deformation else np.zeros(len(l), dtype=np.longdouble))
    dofs = np.array([[v_dof[e], right[e], v_dof[e + 1], left[e + 1]] for e in range(len(l))], dtype=np.intp)
    # every element's 4 x 4 block added in element order (np.add.at adds repeated entries one by one)
    np.add.at(K, (dofs[:, :, None], dofs[:, None, :]), element_stiffness(EI, phis, l))
    index = {v: i for i, v in enumerate(xs)}
    for factor, load in loads:
        _add_load(F, _ld(factor), load, x, (v_dof, left, right), phis)
    fixed: list[int] = []
    moved = np.zeros(count, dtype=np.longdouble)  # prescribed support movements
    for factor, load in loads:
        if isinstance(load, Settlement):
            moved[v_dof[index[load.x]]] += _ld(factor) * _ld(load.movement)
    for sp in member.supports:
        i = index[sp.x]
        if sp.kind == "spring":
            K[v_dof[i], v_dof[i]] += _ld(sp.stiffness)
            F[v_dof[i]] += _ld(sp.stiffness) * moved[v_dof[i]]  # the spring's base moves
        else:
            fixed.append(v_dof[i])
            if sp.kind == "fixed":
                fixed.append(left[i])  # no hinge at a fixed support: one rotation
    free = [d for d in range(count) if d not in fixed]
    u = np.zeros(count)
    u[fixed] = moved[fixed].astype(np.float64)
    rhs = F[free] - K[np.ix_(free, fixed)] @ moved[fixed]
    with _one_thread():
        u[free] = _solve_refined(K[np.ix_(free, free)], rhs)
    return u[v_dof], u[right]


def element_stiffness(EI, phi, l) -> np.ndarray:
    """The 4 x 4 stiffness of one element (v1, theta1, v2, theta2): Hermite when phi = 0, else shear-flexible.
    Given arrays of the elements' EI, phi and l, one 4 x 4 matrix per element (stacked along the first axis)."""
    one = np.ones_like(l)
    k = np.array([[12 * one, 6 * l, -12 * one, 6 * l], [6 * l, (4 + phi) * l * l, -6 * l, (2 - phi) * l * l],
                  [-12 * one, -6 * l, 12 * one, -6 * l], [6 * l, (2 - phi) * l * l, -6 * l, (4 + phi) * l * l]])
    scale = EI / (l**3 * (1 + phi))
    if k.ndim == 2:
        return scale * k
    return scale[:, None, None] * np.moveaxis(k, -1, 0)


def _ld(value) -> np.longdouble:
    """A Fraction in extended precision (numerator and denominator converted separately)."""
    return np.longdouble(int(value.numerator)) / np.longdouble(int(value.denominator))


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


_GAUSS = [(np.longdouble(0.5) - np.sqrt(np.longdouble(0.15)), np.longdouble(5) / 18),
          (np.longdouble(0.5), np.longdouble(8) / 18),
          (np.longdouble(0.5) + np.sqrt(np.longdouble(0.15)), np.longdouble(5) / 18)]  # exact to degree 5


def shape(xi, l, phi=0):
    """Shape functions N1..N4 of the deflection and of the section rotation at xi = (x - x_e) / l: Hermite cubics
    and their x-derivatives when phi = 0, else those of the shear-flexible element (phi = 12 EI / (kappa G A l^2))."""
    p = 1 + phi
    n = [(1 - xi) * (phi + 1 + xi - 2 * xi**2) / p, l * xi * (1 - xi) * (phi + 2 - 2 * xi) / (2 * p),
         xi * (phi + 3 * xi - 2 * xi**2) / p, -l * xi * (1 - xi) * (phi + 2 * xi) / (2 * p)]
    d = [-6 * xi * (1 - xi) / (l * p), (1 - xi) * (phi + 1 - 3 * xi) / p, 6 * xi * (1 - xi) / (l * p),
         xi * (phi + 3 * xi - 2) / p]
    return n, d


def _element(x: np.ndarray, at) -> int:
    return min(max(int(np.searchsorted(x, _ld(at), side="right")) - 1, 0), len(x) - 2)


def _add_load(F: np.ndarray, factor, load, x: np.ndarray, dofs, phis) -> None:
    """Consistent (work-equivalent) nodal loads: sum of N_k times the load over the element."""
    v_dof, left, right = dofs

    def element(e: int) -> list[int]:
        return [v_dof[e], right[e], v_dof[e + 1], left[e + 1]]

    if isinstance(load, (PointLoad, MomentLoad)):
        e = _element(x, load.x)
        l = x[e + 1] - x[e]
        n, d = shape((_ld(load.x) - x[e]) / l, l, phis[e])
        weights = n if isinstance(load, PointLoad) else d
        value = factor * _ld(load.force if isinstance(load, PointLoad) else load.moment)
        for k, d in enumerate(element(e)):
            F[d] += value * weights[k]
    elif isinstance(load, LineLoad):
        w = intensity(load)
        w0, w1 = _ld(w.coeffs[0]) if w.coeffs else 0, _ld(w.coeffs[1]) if len(w.coeffs) > 1 else 0
        for e in range(_element(x, load.x1), len(x) - 1):
            a, b = max(x[e], _ld(load.x1)), min(x[e + 1], _ld(load.x2))
            if b <= a:
                if x[e] >= _ld(load.x2):
                    break
                continue
            l = x[e + 1] - x[e]
            for g, wt in _GAUSS:
                at = a + (b - a) * g
                n, _ = shape((at - x[e]) / l, l, phis[e])
                q = factor * (w0 + w1 * at) * wt * (b - a)
                for k, d in enumerate(element(e)):
                    F[d] += q * n[k]


def relative_difference(member: Member, xs, loads, v_exact, theta_exact, nodal=None, nodes=None) -> float:
    """Largest nodal difference between the element solution and the exact curves, relative to the largest
    value; `nodal` is the element solution at fe_nodes(member, xs) when the caller has it already (and
    `nodes` those nodes)."""
    nodes = fe_nodes(member, xs) if nodes is None else nodes
    v, theta = nodal if nodal is not None else nodal_solution(member, nodes, loads)
    ve = np.array([float(v_exact.at(p)) for p in nodes])
    te = np.array([float(theta_exact.at(p)) for p in nodes])
    scale_v, scale_t = np.abs(ve).max() or 1.0, np.abs(te).max() or 1.0  # a curve that is zero: absolute
    return float(max(np.abs(v - ve).max() / scale_v, np.abs(theta - te).max() / scale_t))
