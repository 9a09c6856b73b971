"""The member solved in stiffness form: one banded exact system over the segments, for many supports.

Unknowns: the state (v, θ, M, V) just right of every segment start and every reaction component. Within
segment k (h = x - xs[k], one EI) the state carries over as

    V = V0 + W1(h),  M = M0 + V0 h + W2(h),  θ = θ0 + (M0 h + V0 h²/2 + W3(h)) / EI,
    v = v0 + θ0 h + (M0 h²/2 + V0 h³/6 + W4(h)) / EI,

with W1 the load's shear inside the segment and W2..W4 its integrals from h = 0. At every breakpoint V
jumps by the point forces and the reaction there, M by the couples (a counterclockwise couple C lowers
the moment to its right by C) and the moment reaction, v is continuous, θ too unless a hinge sits there
(then M = 0 from the left); a support holds v at its prescribed movement (minus R/k on a spring), a fixed
support θ at zero; at both ends V and M vanish outside the member. Each equation couples one breakpoint
with its neighbouring segments, so the system is banded and its exact elimination costs about the number
of segments, where the force method's dense flexibility system grows with the cube of the redundants.

The solution is the member's one exact solution, so every curve and reaction equals the force method's
(tests/test_banded.py compares them on many members)."""

from __future__ import annotations

from beamlang.exact import Q
from beamlang.model import Member, MomentLoad, PointLoad
from beamlang.poly import Piecewise, Poly
from beamlang.stability import components
from beamlang.engine.statics import shear_and_moment

V_, M_, T_, D_ = 3, 2, 1, 0  # offsets of V, M, θ, v in a segment's unknowns


def solve_banded(member: Member, xs, EI, loads, moved: dict) -> tuple[tuple[Piecewise, ...], tuple]:
    """(V, M, θ, v) and the reactions ((force, moment) per support) of the loads on the member, with the
    prescribed support movements `moved` ({x: movement})."""
    n = len(xs) - 1
    at = {x: k for k, x in enumerate(xs)}
    comps: dict[int, list] = {}
    col = 0
    index: dict = {}  # ("s", k) -> first column of segment k; (support, kind) -> its reaction's column
    sps = member.supports
    for r in components(sps):
        comps.setdefault(at[sps[r.support].x], []).append(r)
    for k in range(n + 1):
        for r in comps.get(k, ()):
            index[(r.support, r.kind)] = col
            col += 1
        if k < n:
            index[("s", k)] = col
            col += 4
    jump_v, jump_m = _jumps(loads)
    V_p, _ = shear_and_moment(tuple(xs), [ld for ld in loads if not isinstance(ld, (PointLoad, MomentLoad))])
    ws = [_integrals(V_p.pieces[k].taylor(xs[k])) for k in range(n)]
    hinges = {h.x for h in member.hinges}
    rows = []
    for k in range(n + 1):
        x = xs[k]
        end = _end_state(index[("s", k - 1)], xs[k] - xs[k - 1], EI[k - 1], ws[k - 1]) if k else None
        start = {q: ({index[("s", k)] + q: Q(1)}, Q(0)) for q in range(4)} if k < n else None
        force = {index[(r.support, r.kind)]: Q(1) for r in comps.get(k, ()) if r.kind == "force"}
        couple = {index[(r.support, r.kind)]: Q(1) for r in comps.get(k, ()) if r.kind == "moment"}
        # V: right = left + point forces + reaction force; M: right = left - couples - moment reaction
        rows.append(_difference(start, end, V_, {c: -v for c, v in force.items()}, jump_v.get(x, Q(0))))
        rows.append(_difference(start, end, M_, couple, jump_m.get(x, Q(0))))
        if start and end:
            rows.append(_difference(start, end, D_, {}, Q(0)))
            rows.append(_single(end, M_) if x in hinges else _difference(start, end, T_, {}, Q(0)))
        side = start or end
        for r in comps.get(k, ()):
            c = index[(r.support, r.kind)]
            coeffs, const = side[D_ if r.kind == "force" else T_]
            row = dict(coeffs)
            target = (moved.get(x, Q(0)) if r.kind == "force" else Q(0)) - const
            if r.kind == "force" and sps[r.support].kind == "spring":
                row[c] = row.get(c, Q(0)) + 1 / sps[r.support].stiffness  # v = movement - R/k
            rows.append((row, target))
    values = eliminate(rows, col)
    curves = _curves(xs, EI, ws, [[values[index[("s", k)] + q] for q in range(4)] for k in range(n)])
    reactions = []
    for i, sp in enumerate(sps):
        f = values[index[(i, "force")]] if (i, "force") in index else Q(0)
        m = values[index[(i, "moment")]] if (i, "moment") in index else Q(0)
        reactions.append((f, m))
    return curves, tuple(reactions)


def _jumps(loads) -> tuple[dict, dict]:
    """The jumps of V (point forces) and of M (minus the couples) at each position."""
    jv: dict = {}
    jm: dict = {}
    for ld in loads:
        if isinstance(ld, PointLoad):
            jv[ld.x] = jv.get(ld.x, Q(0)) + ld.force
        elif isinstance(ld, MomentLoad):
            jm[ld.x] = jm.get(ld.x, Q(0)) - ld.moment
    return jv, jm


def _integrals(V_local: Poly) -> tuple[Poly, Poly, Poly, Poly]:
    """W1 (the load's shear gained from the segment start) and its integrals W2, W3, W4 from h = 0."""
    W1 = V_local - Poly.of(V_local.coeffs[0]) if V_local.coeffs else Poly()
    W2 = W1.antiderivative()
    W3 = W2.antiderivative()
    return W1, W2, W3, W3.antiderivative()


def _end_state(first: int, L, EI, ws) -> dict:
    """The state at the segment's end as linear forms ({column: coefficient}, constant) of its start."""
    W1, W2, W3, W4 = (w(L) for w in ws)
    v, t, m, V = first + D_, first + T_, first + M_, first + V_
    return {V_: ({V: Q(1)}, W1),
            M_: ({m: Q(1), V: L}, W2),
            T_: ({t: Q(1), m: L / EI, V: L * L / (2 * EI)}, W3 / EI),
            D_: ({v: Q(1), t: L, m: L * L / (2 * EI), V: L * L * L / (6 * EI)}, W4 / EI)}


def _difference(start, end, q: int, extra: dict, jump) -> tuple[dict, object]:
    """start[q] - end[q] + extra = jump (a missing side is zero: outside the member)."""
    row: dict = dict(extra)
    const = Q(0)
    for sign, side in ((1, start), (-1, end)):
        if side is None:
            continue
        coeffs, c = side[q]
        for j, a in coeffs.items():
            row[j] = row.get(j, Q(0)) + sign * a
        const += sign * c
    return row, jump - const


def _single(side, q: int) -> tuple[dict, object]:
    coeffs, c = side[q]
    return dict(coeffs), -c


def eliminate(rows: list[tuple[dict, object]], size: int) -> list:
    """Solve sparse exact equations (row: {column: coefficient}, right-hand side) whose columns stay near
    each other: Gaussian elimination column by column over the rows that have reached that column."""
    order = sorted(range(len(rows)), key=lambda i: min(rows[i][0], default=size))
    if len(rows) != size:
        raise ArithmeticError("the stiffness system is not square")
    active: list[int] = []
    pivots: list[tuple[int, dict, object]] = []
    data = [(dict(r), b) for r, b in rows]
    nxt = 0
    for j in range(size):
        while nxt < len(order) and min(data[order[nxt]][0], default=size) <= j:
            active.append(order[nxt])
            nxt += 1
        holding = [i for i in active if data[i][0].get(j, 0) != 0]
        if not holding:
            raise ArithmeticError("singular stiffness system")
        p = min(holding, key=lambda i: len(data[i][0]))
        prow, pb = data[p]
        pv = prow[j]
        for i in holding:
            if i == p:
                continue
            row, b = data[i]
            f = row[j] / pv
            for c, a in prow.items():
                value = row.get(c, Q(0)) - f * a
                if value:
                    row[c] = value
                else:
                    row.pop(c, None)
            data[i] = (row, b - f * pb)
        active.remove(p)
        pivots.append((j, prow, pb))
    x = [Q(0)] * size
    for j, prow, pb in reversed(pivots):
        x[j] = (pb - sum((a * x[c] for c, a in prow.items() if c != j), Q(0))) / prow[j]
    return x


def _curves(xs, EI, ws, states) -> tuple[Piecewise, ...]:
    """The four curves from each segment's start state, as pieces in global x."""
    out: list[list[Poly]] = [[], [], [], []]
    for k, ((v, t, m, V), (W1, W2, W3, W4)) in enumerate(zip(states, ws)):
        inv = 1 / EI[k]
        local = (Poly.of(V) + W1,
                 Poly.of(m, V) + W2,
                 Poly.of(t, m * inv, V * inv / 2) + W3 * inv,
                 Poly.of(v, t, m * inv / 2, V * inv / 6) + W4 * inv)
        for q, p in enumerate(local):
            out[q].append(p.taylor(-xs[k]))
    return tuple(Piecewise(tuple(xs), tuple(pieces)) for pieces in out)
