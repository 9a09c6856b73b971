"""Solve: member model -> exact elastic curves of every load, case and combination (force method)."""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

from .errors import BeamError, Diagnostic
from .model import Load, Member, MomentLoad, MovingLoad, PointLoad, Settlement
from .poly import Piecewise, Poly
from .statics import breakpoints, resultant, shear_and_moment


@dataclass(frozen=True, slots=True)
class Curves:
    """Shear, moment, slope and deflection (SI), with the reaction (force, moment) at every support."""

    V: Piecewise
    M: Piecewise
    theta: Piecewise
    v: Piecewise
    reactions: tuple[tuple[Fraction, Fraction], ...]

    def __add__(self, other: "Curves") -> "Curves":
        return Curves(self.V + other.V, self.M + other.M, self.theta + other.theta, self.v + other.v,
                      tuple((a + c, b + d) for (a, b), (c, d) in zip(self.reactions, other.reactions)))

    def scaled(self, k) -> "Curves":
        return Curves(self.V * k, self.M * k, self.theta * k, self.v * k,
                      tuple((a * k, b * k) for a, b in self.reactions))


@dataclass(frozen=True, slots=True)
class Restraint:
    """A support reaction component: `force` (vertical) or `moment`, at member.supports[support]."""

    support: int
    kind: str


@dataclass(frozen=True, slots=True)
class Primary:
    """The released, statically determinate beam and the compatibility system of the redundants."""

    kind: str  # "cantilever" (fixed at one support) or "simple" (two point supports)
    kept: tuple[int, ...]  # supports of the primary beam
    redundants: tuple[Restraint, ...]
    flexibility: tuple[tuple[Fraction, ...], ...]  # A in A X = -D0, spring terms 1/k on the diagonal
    units: tuple[Curves, ...]  # primary response to a unit value of each redundant


@dataclass(frozen=True, slots=True)
class LoadSolution:
    """Loads (one, or a whole case) on the primary beam and on the real member."""

    loads: tuple[Load, ...]
    primary: Curves  # the loads on the primary beam
    displacements: tuple[Fraction, ...]  # D0: released displacement (or slope) at each redundant
    redundants: tuple[Fraction, ...]  # X, from A X = -D0
    curves: Curves  # the loads on the real member


@dataclass(frozen=True, slots=True)
class Target:
    """A case (its loads solved together) or a combination (its factored cases)."""

    name: str
    kind: str  # "case" | "combination"
    solved: LoadSolution | None  # cases only
    terms: tuple[tuple[Fraction, str], ...]  # combinations only
    curves: Curves

    @property
    def loads(self) -> tuple[Load, ...]:
        return self.solved.loads if self.solved else ()


@dataclass(frozen=True, slots=True)
class Solution:
    member: Member
    xs: tuple[Fraction, ...]
    EI: Fraction
    primary: Primary
    targets: tuple[Target, ...]

    def target(self, name: str) -> Target:
        return next(t for t in self.targets if t.name == name)


def solve(member: Member) -> Solution:
    """Superpose the exact curves of every load; cases and combinations follow by linearity."""
    xs = breakpoints(member)
    EI = member.material.E * member.section.I
    primary = _primary(member, xs, EI)
    targets = []
    for case in member.cases:
        static = tuple(ld for ld in case.loads if not isinstance(ld, MovingLoad))  # moving: see moving.py
        solved = _solve_loads(member, xs, EI, primary, static)
        targets.append(Target(case.name, "case", solved, (), solved.curves))
    by_name = {t.name: t for t in targets}
    for combo in member.combinations:
        total = _sum([by_name[name].curves.scaled(f) for f, name in combo.terms], member, xs)
        targets.append(Target(combo.name, "combination", None, combo.terms, total))
    return Solution(member, xs, EI, primary, tuple(targets))


def load_solution(solution: Solution, load: Load) -> LoadSolution:
    """One load alone on the member: its own elastic curve, for showing the superposition."""
    return _solve_loads(solution.member, solution.xs, solution.EI, solution.primary, (load,))


def curves_with(solution: Solution, loads: tuple[Load, ...]) -> Curves:
    """Point loads and moments anywhere (breakpoints added where needed) on the member: exact curves."""
    member = solution.member
    xs = tuple(sorted(set(solution.xs) | {ld.x for ld in loads if isinstance(ld, (PointLoad, MomentLoad))}))
    if xs == solution.xs:
        return _solve_loads(member, xs, solution.EI, solution.primary, loads).curves
    primary = _primary(member, xs, solution.EI)
    return _solve_loads(member, xs, solution.EI, primary, loads).curves


def _sum(curves: list[Curves], member: Member, xs) -> Curves:
    total = _zero(member, xs)
    for c in curves:
        total = total + c
    return total


def _zero(member: Member, xs) -> Curves:
    z = Piecewise.zero(xs)
    return Curves(z, z, z, z, tuple((Fraction(0), Fraction(0)) for _ in member.supports))


def active(member: Member) -> list[int]:
    """Supports that restrain something (a spring of zero stiffness does not)."""
    return [i for i, sp in enumerate(member.supports) if sp.kind != "spring" or sp.stiffness]


def choose_primary(member: Member) -> tuple[str, tuple[int, ...], tuple[Restraint, ...]]:
    """Keep one fixed support (a cantilever) or two point supports; release every other restraint."""
    idx = active(member)
    sps = member.supports
    fixed = [i for i in idx if sps[i].kind == "fixed"]
    if fixed:
        kind, kept = "cantilever", (fixed[0],)
    else:
        rigid = [i for i in idx if sps[i].kind != "spring"]
        pool = rigid if len(rigid) >= 2 else idx
        if len(pool) < 2:
            raise BeamError([Diagnostic(member.span, "these supports cannot carry load: the beam is a mechanism")])
        kind, kept = "simple", (pool[0], pool[-1])
    released = []
    for i in idx:
        if i not in kept:
            released.append(Restraint(i, "force"))
            if sps[i].kind == "fixed":
                released.append(Restraint(i, "moment"))
    return kind, kept, tuple(released)


def _primary(member: Member, xs, EI) -> Primary:
    kind, kept, redundants = choose_primary(member)
    units = tuple(_on_primary(member, xs, EI, kind, kept, [_unit(member, r)]) for r in redundants)
    A = []
    for i, r in enumerate(redundants):
        row = [_displacement(member, r, u) for u in units]
        k = member.supports[r.support].stiffness
        if r.kind == "force" and k:
            row[i] += 1 / k
        A.append(tuple(row))
    return Primary(kind, kept, redundants, tuple(A), units)


def _unit(member: Member, r: Restraint) -> Load:
    sp = member.supports[r.support]
    return PointLoad(sp.x, Fraction(1), sp.span) if r.kind == "force" else MomentLoad(sp.x, Fraction(1), sp.span)


def _displacement(member: Member, r: Restraint, c: Curves) -> Fraction:
    x = member.supports[r.support].x
    return c.v.at(x) if r.kind == "force" else c.theta.at(x)


def _solve_loads(member: Member, xs, EI, primary: Primary, loads: tuple[Load, ...]) -> LoadSolution:
    base = _on_primary(member, xs, EI, primary.kind, primary.kept, list(loads))
    D0 = tuple(_displacement(member, r, base) for r in primary.redundants)
    moved = prescribed(member, loads)
    target = [moved.get(member.supports[r.support].x, Fraction(0)) if r.kind == "force" else Fraction(0)
              for r in primary.redundants]
    X = linsolve(primary.flexibility, [t - d for t, d in zip(target, D0)]) if D0 else ()
    total = base
    for x_j, unit, r in zip(X, primary.units, primary.redundants):
        part = unit.scaled(x_j)
        reactions = list(part.reactions)
        force, moment = reactions[r.support]
        reactions[r.support] = (force + x_j, moment) if r.kind == "force" else (force, moment + x_j)
        total = total + Curves(part.V, part.M, part.theta, part.v, tuple(reactions))
    return LoadSolution(tuple(loads), base, D0, tuple(X), total)


def _on_primary(member: Member, xs, EI, kind: str, kept: tuple[int, ...], loads: list[Load]) -> Curves:
    """Loads on the determinate primary beam: reactions by statics, then M/EI integrated twice."""
    F, Mo = resultant(loads)
    sps = member.supports
    reactions = [(Fraction(0), Fraction(0)) for _ in sps]
    if kind == "cantilever":
        f = kept[0]
        R = -F
        reactions[f] = (R, -Mo - R * sps[f].x)
    else:
        a, b = kept
        xa, xb = sps[a].x, sps[b].x
        Rb = (-Mo + F * xa) / (xb - xa)
        reactions[a], reactions[b] = (-F - Rb, Fraction(0)), (Rb, Fraction(0))
    actions = list(loads)
    for i in kept:
        force, moment = reactions[i]
        actions += [PointLoad(sps[i].x, force, sps[i].span), MomentLoad(sps[i].x, moment, sps[i].span)]
    V, M = shear_and_moment(xs, actions)
    theta0 = M.map(lambda p: p * (1 / EI)).integral()
    v0 = theta0.integral()
    moved = prescribed(member, loads)
    if kind == "cantilever":
        xf = sps[kept[0]].x
        c2 = -theta0.at(xf)
        c1 = moved.get(xf, Fraction(0)) - v0.at(xf) - c2 * xf
    else:
        sa, sb = (_settlement(sps[i], reactions[i][0]) + moved.get(sps[i].x, Fraction(0)) for i in kept)
        c2 = ((sb - v0.at(xb)) - (sa - v0.at(xa))) / (xb - xa)
        c1 = sa - v0.at(xa) - c2 * xa
    theta = theta0.map(lambda p: p + Poly.of(c2))
    v = v0.map(lambda p: p + Poly.of(c1, c2))
    return Curves(V, M, theta, v, tuple(reactions))


def prescribed(member: Member, loads) -> dict[Fraction, Fraction]:
    """Prescribed support movements in these loads: {x: movement, positive up}."""
    out: dict[Fraction, Fraction] = {}
    for load in loads:
        if isinstance(load, Settlement):
            out[load.x] = out.get(load.x, Fraction(0)) + load.movement
    return out


def _settlement(support, force: Fraction) -> Fraction:
    """A spring support moves by -R/k under its reaction R (reaction up, so the beam moves down)."""
    return -force / support.stiffness if support.kind == "spring" else Fraction(0)


def linsolve(A, b) -> list[Fraction]:
    """Solve A x = b exactly (Gauss-Jordan with pivot search over Fractions)."""
    n = len(A)
    rows = [list(A[i]) + [b[i]] for i in range(n)]
    for col in range(n):
        pivot = next((r for r in range(col, n) if rows[r][col] != 0), None)
        if pivot is None:
            raise ArithmeticError("singular compatibility matrix")
        rows[col], rows[pivot] = rows[pivot], rows[col]
        p = rows[col][col]
        rows[col] = [v / p for v in rows[col]]
        for r in range(n):
            if r != col and rows[r][col] != 0:
                f = rows[r][col]
                rows[r] = [a - f * c for a, c in zip(rows[r], rows[col])]
    return [rows[i][n] for i in range(n)]
