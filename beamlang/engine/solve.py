"""Solve: member model -> exact elastic curves of every load, case and combination (force method)."""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

from beamlang.engine.banded import solve_banded
from beamlang.engine.curves import Curves
from beamlang.engine.primary import Primary, displacement, linsolve, make_primary, on_primary, prescribed, unit
from beamlang.engine.statics import breakpoints
from beamlang.exact import Q
from beamlang.model import LineLoad, Load, Member, MomentLoad, MovingLoad, PointLoad
from beamlang.poly import Piecewise

BANDED_FROM = 6  # redundants from which a load is solved in banded stiffness form (linear in the segments)


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
    EI: tuple[Fraction, ...]  # flexural stiffness of each segment [xs[k], xs[k + 1]]
    primary: Primary
    targets: tuple[Target, ...]

    def target(self, name: str) -> Target:
        return next(t for t in self.targets if t.name == name)


def solve(member: Member) -> Solution:
    """Superpose the exact curves of every load; cases and combinations follow by linearity."""
    xs = breakpoints(member)
    EI = stiffness(member, xs)
    primary = make_primary(member, xs, EI)
    targets = []
    for case in member.cases:
        static = tuple(ld for ld in case.loads if not isinstance(ld, MovingLoad))  # moving: see moving.py
        solved = _solve_loads(member, xs, EI, primary, static)
        targets.append(Target(case.name, "case", solved, (), solved.curves))
    by_name = {t.name: t for t in targets}
    for combo in member.combinations:
        total = _sum([by_name[name].curves if f == 1 else by_name[name].curves.scaled(f)
                      for f, name in combo.terms], member, xs)
        targets.append(Target(combo.name, "combination", None, combo.terms, total))
    return Solution(member, xs, EI, primary, tuple(targets))


def stiffness(member: Member, xs) -> tuple[Fraction, ...]:
    """EI of every segment (each segment lies inside one stretch: stretch ends are breakpoints)."""
    return tuple(member.stretch_at((a + b) / 2).EI for a, b in zip(xs, xs[1:]))


def load_solution(solution: Solution, load: Load) -> LoadSolution:
    """One load alone on the member: its own elastic curve, for showing the superposition.

    Solved on the breakpoints this load needs (ends, supports, hinges, stretch ends and its own positions)
    and carried over to the member's grid: every piece is a polynomial in global x, so the piece of a
    shared segment is that of the wider segment holding it, the same exact curve. A case of n loads then
    costs n solves on a few segments each instead of n solves on the whole grid."""
    member, xs = solution.member, solution.xs
    own = _own_breakpoints(member, load)
    if len(own) == len(xs):
        return _solve_loads(member, xs, solution.EI, solution.primary, (load,))
    alone = _solve_loads(member, own, stiffness(member, own), solution.primary, (load,))
    return LoadSolution(alone.loads, _on_grid(alone.primary, xs), alone.displacements, alone.redundants,
                        _on_grid(alone.curves, xs))


def _own_breakpoints(member: Member, load: Load) -> tuple[Fraction, ...]:
    """The breakpoints of the member without its loads, plus those of this load (all on the shared grid)."""
    xs = {Q(0), member.length}
    xs.update(sp.x for sp in member.supports)
    xs.update(h.x for h in member.hinges)
    xs.update(st.x1 for st in member.stretches)
    xs.update((load.x1, load.x2) if isinstance(load, LineLoad) else (load.x,))
    return tuple(sorted(xs))


def _on_grid(curves: Curves, xs) -> Curves:
    """Curves on wider segments -> the same curves on the finer grid xs (which holds every wider breakpoint)."""
    def finer(c: Piecewise) -> Piecewise:
        pieces, j = [], 0
        for a in xs[:-1]:
            while c.xs[j + 1] <= a:
                j += 1
            pieces.append(c.pieces[j])
        return Piecewise(tuple(xs), tuple(pieces))
    return Curves(finer(curves.V), finer(curves.M), finer(curves.theta), finer(curves.v), curves.reactions)


def curves_with(solution: Solution, loads: tuple[Load, ...]) -> Curves:
    """Point loads and moments anywhere (breakpoints added where needed) on the member: exact curves."""
    member = solution.member
    xs = tuple(sorted(set(solution.xs) | {ld.x for ld in loads if isinstance(ld, (PointLoad, MomentLoad))}))
    EI = solution.EI if xs == solution.xs else stiffness(member, xs)
    if _is_banded(member, solution.primary):  # the curves alone: no primary beam for the compatibility text
        (V, M, theta, v), reactions = solve_banded(member, xs, EI, loads, prescribed(member, loads))
        return Curves(V, M, theta, v, reactions)
    # the solution's primary beam serves any finer grid: its statics, kinematics and flexibility (support
    # displacements under unit redundants) do not depend on where the segments end
    return _solve_loads(member, xs, EI, solution.primary, loads).curves


def _is_banded(member: Member, primary: Primary) -> bool:
    """Many redundants and bending only: the banded stiffness form solves the member."""
    return len(primary.redundants) >= BANDED_FROM and not member.shear_deformation


def _sum(curves: list[Curves], member: Member, xs) -> Curves:
    if not curves:
        return _zero(member, xs)
    total = curves[0]
    for c in curves[1:]:
        total = total + c
    return total


def _zero(member: Member, xs) -> Curves:
    z = Piecewise.zero(xs)
    return Curves(z, z, z, z, tuple((Q(0), Q(0)) for _ in member.supports))


def _solve_loads(member: Member, xs, EI, primary: Primary, loads: tuple[Load, ...]) -> LoadSolution:
    if _is_banded(member, primary):  # the banded form is bending only
        return _banded(member, xs, EI, primary, loads)
    base = on_primary(member, xs, EI, primary, list(loads))
    D0 = tuple(displacement(member, r, base) for r in primary.redundants)
    moved = prescribed(member, loads)
    target = [moved.get(member.supports[r.support].x, Q(0)) if r.kind == "force" else Q(0)
              for r in primary.redundants]
    X = linsolve(primary.flexibility, [t - d for t, d in zip(target, D0)]) if D0 else ()
    if not X:
        return LoadSolution(tuple(loads), base, D0, (), base)
    total = _real_member(member, xs, EI, primary, loads, base, X)
    reactions = list(total.reactions)
    for x_j, r in zip(X, primary.redundants):
        force, moment = reactions[r.support]
        reactions[r.support] = (force + x_j, moment) if r.kind == "force" else (force, moment + x_j)
    total = Curves(total.V, total.M, total.theta, total.v, tuple(reactions), total.vs)
    return LoadSolution(tuple(loads), base, D0, tuple(X), total)


def _real_member(member: Member, xs, EI, primary: Primary, loads, base: Curves, X) -> Curves:
    """The primary beam under the loads and the redundants found: on the primary's own grid base + sum of X_j
    times the unit curves (made already for the flexibility; by linearity the same exact curves, and faster
    than integrating again), on a finer grid (`curves_with`) the primary beam integrated under them all."""
    if xs != primary.basis[1]:
        acting = list(loads) + [unit(member, r, x_j) for x_j, r in zip(X, primary.redundants)]
        return on_primary(member, xs, EI, primary, acting)
    total = base
    for x_j, u in zip(X, primary.units):
        total = total + u.scaled(x_j)
    return total


def _banded(member: Member, xs, EI, primary: Primary, loads: tuple[Load, ...]) -> LoadSolution:
    """The same exact solution from the banded stiffness form; the redundants are read off its reactions
    and D0 off the primary beam under the loads (one integration), for the package's compatibility text."""
    (V, M, theta, v), reactions = solve_banded(member, xs, EI, loads, prescribed(member, loads))
    base = on_primary(member, xs, EI, primary, list(loads))
    D0 = tuple(displacement(member, r, base) for r in primary.redundants)
    X = tuple(reactions[r.support][0 if r.kind == "force" else 1] for r in primary.redundants)
    return LoadSolution(tuple(loads), base, D0, X, Curves(V, M, theta, v, reactions))


