"""Natural frequency: member + masses -> the fundamental bending frequency (closed form, or a converged
finite-element eigenvalue in floats) and its mode shape.

The element model is that of the static cross-check (`fem.py`): Hermite cubic elements (shear-flexible ones when
the member includes shear deformation), a rotation either side of a hinge, springs on the diagonal; the mass
matrix is consistent (the integral of m(x) N_i N_j over each element, m linear in each element, by 4-point Gauss,
exact), point masses sit on their node's deflection; rotary inertia is not included. The generalized symmetric
problem K u = omega^2 M u is solved by scipy.linalg.eigh as M u = mu K u (K is positive definite for a stable
member, M need not be where part of the member carries no mass), the largest mu = 1 / omega1^2. Every element is
halved until the first frequency changes by less than TOLERANCE relative."""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction

import numpy as np

from beamlang.engine.fem import element_stiffness, shape
from beamlang.model import Member

TOLERANCE = 1e-6  # relative change of the first frequency between two successive meshes
MAX_ELEMENTS = 4096
_GAUSS = tuple(zip(*np.polynomial.legendre.leggauss(4)))  # on [-1, 1]: exact to degree 7


@dataclass(frozen=True, slots=True)
class Masses:
    """Masses on the member: line masses varying linearly (x1, x2, m1, m2 in m and kg/m) and point masses (x, kg)."""

    lines: tuple[tuple[Fraction, Fraction, Fraction, Fraction], ...]
    points: tuple[tuple[Fraction, Fraction], ...]


@dataclass(frozen=True, slots=True)
class Frequency:
    hz: float  # the fundamental frequency, from the closed form where one applies, else the converged elements
    method: str  # "closed form" | "finite elements"
    fe_hz: float  # the converged finite-element value (also where the closed form is used, as a check)
    elements: int  # elements of the last mesh
    change: float  # relative change of the frequency at the last refinement
    history: tuple[tuple[int, float], ...]  # (elements, Hz) of every mesh tried
    mode: tuple[tuple[float, float], ...]  # (x, v) of the mode shape, largest |v| = 1 and positive


def fundamental(member: Member, masses: Masses) -> Frequency:
    """The first bending frequency of the member carrying these masses."""
    base = _base_nodes(member, masses)
    history, sub, last = [], -(-4 // (len(base) - 1)), None  # at least 4 elements to begin with
    while True:
        nodes = _subdivide(base, sub)
        hz, x, v = _solve(member, masses, nodes)
        history.append((len(nodes) - 1, hz))
        if last is not None and abs(hz - last) <= TOLERANCE * hz:
            break
        if 2 * (len(nodes) - 1) > MAX_ELEMENTS:
            raise ArithmeticError(f"the first frequency did not converge to {TOLERANCE} in {MAX_ELEMENTS} elements")
        last, sub = hz, sub * 2
    change = abs(history[-1][1] - history[-2][1]) / history[-1][1]
    closed = closed_form(member, masses)
    mode = tuple(zip(x, v))
    if closed is not None:
        return Frequency(closed, "closed form", hz, history[-1][0], change, tuple(history), mode)
    return Frequency(hz, "finite elements", hz, history[-1][0], change, tuple(history), mode)


def closed_form(member: Member, masses: Masses) -> float | None:
    """f1 = pi / (2 L^2) sqrt(EI / m) for a uniform simple span (pin and roller at the ends, one EI, one mass per
    length over the whole member, no point mass, no hinge, no shear deformation); None for every other layout."""
    L = member.length
    sps = member.supports
    if (len(sps) != 2 or {sp.x for sp in sps} != {Fraction(0), L} or any(sp.kind not in ("pin", "roller") for sp in sps)
            or member.hinges or member.stepped or member.shear_deformation or masses.points):
        return None
    if any(x1 != 0 or x2 != L or m1 != m2 for x1, x2, m1, m2 in masses.lines) or not masses.lines:
        return None
    m = sum((m1 for _, _, m1, _ in masses.lines), Fraction(0))
    return math.pi / (2 * float(L) ** 2) * math.sqrt(float(member.stretches[0].EI / m))


def _base_nodes(member: Member, masses: Masses) -> list[Fraction]:
    points = {Fraction(0), member.length, *(sp.x for sp in member.supports), *(h.x for h in member.hinges),
              *(st.x1 for st in member.stretches), *(x for x, _ in masses.points)}
    points |= {x for x1, x2, _, _ in masses.lines for x in (x1, x2)}
    return sorted(points)


def _subdivide(base: list[Fraction], sub: int) -> list[Fraction]:
    out = [base[0]]
    for a, b in zip(base, base[1:]):
        out += [a + (b - a) * Fraction(k, sub) for k in range(1, sub + 1)]
    return out


def _line_mass(masses: Masses, x: float) -> float:
    total = 0.0
    for x1, x2, m1, m2 in masses.lines:
        a, b = float(x1), float(x2)
        if a <= x <= b and b > a:
            total += float(m1) + (float(m2) - float(m1)) * (x - a) / (b - a)
    return total


def _solve(member: Member, masses: Masses, nodes: list[Fraction]) -> tuple[float, list[float], list[float]]:
    """The first frequency on one mesh, and the mode shape sampled along the member."""
    from scipy.linalg import eigh
    from threadpoolctl import threadpool_limits

    hinge_at = {h.x for h in member.hinges}
    v_dof, left, right, count = [], [], [], 0
    for node in nodes:
        v_dof.append(count)
        left.append(count + 1)
        right.append(count + 2 if node in hinge_at else count + 1)
        count = right[-1] + 1
    K, M = np.zeros((count, count)), np.zeros((count, count))
    x = [float(n) for n in nodes]
    phis = []
    for e in range(len(nodes) - 1):
        l = x[e + 1] - x[e]
        st = member.stretch_at((nodes[e] + nodes[e + 1]) / 2)
        EI = float(st.EI)
        phi = 12 * EI / (float(st.GA) * l * l) if member.shear_deformation else 0.0
        phis.append(phi)
        dofs = [v_dof[e], right[e], v_dof[e + 1], left[e + 1]]
        K[np.ix_(dofs, dofs)] += element_stiffness(EI, phi, l)
        M[np.ix_(dofs, dofs)] += _element_mass(masses, x[e], l, phi)
    index = {n: i for i, n in enumerate(nodes)}
    for at, mass in masses.points:
        M[v_dof[index[at]], v_dof[index[at]]] += float(mass)
    fixed = set()
    for sp in member.supports:
        i = index[sp.x]
        if sp.kind == "spring":
            K[v_dof[i], v_dof[i]] += float(sp.stiffness)
        else:
            fixed.add(v_dof[i])
            if sp.kind == "fixed":
                fixed.add(left[i])
    free = [d for d in range(count) if d not in fixed]
    n = len(free)
    with threadpool_limits(limits=1, user_api="blas"):  # measured 10x faster on a shared 2-core machine
        mu, vec = eigh(M[np.ix_(free, free)], K[np.ix_(free, free)], subset_by_index=[n - 1, n - 1])
    hz = 1 / math.sqrt(mu[0]) / (2 * math.pi)
    u = np.zeros(count)
    u[free] = vec[:, 0]
    return hz, *_mode(x, u, v_dof, left, right, phis)


def _element_mass(masses: Masses, x0: float, l: float, phi: float) -> np.ndarray:
    out = np.zeros((4, 4))
    for g, wt in _GAUSS:
        xi = (g + 1) / 2
        m = _line_mass(masses, x0 + xi * l)
        if m:
            n, _ = shape(xi, l, phi)
            out += wt / 2 * l * m * np.outer(n, n)
    return out


def _mode(x, u, v_dof, left, right, phis) -> tuple[list[float], list[float]]:
    """The mode shape at a few points in every element (about 256 in all), scaled so that its largest magnitude
    is +1."""
    xs, vs = [], []
    per = max(2, 256 // (len(x) - 1))
    for e in range(len(x) - 1):
        l = x[e + 1] - x[e]
        d = [u[v_dof[e]], u[right[e]], u[v_dof[e + 1]], u[left[e + 1]]]
        for k in range(per if e < len(x) - 2 else per + 1):
            n, _ = shape(k / per, l, phis[e])
            xs.append(x[e] + k / per * l)
            vs.append(float(np.dot(n, d)))
    big = max(vs, key=abs)
    return xs, [round(v / big, 6) + 0.0 for v in vs]
