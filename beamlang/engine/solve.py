"""Solve: member model -> exact elastic curves of every load, case and combination (force method)."""

from __future__ import annotations

from dataclasses import dataclass, field
from fractions import Fraction

from beamlang.errors import BeamError, Diagnostic
from beamlang.exact import Q
from beamlang.model import Load, LineLoad, Member, MomentLoad, MovingLoad, PointLoad, Settlement
from beamlang.poly import Piecewise, Poly
from beamlang.stability import Mechanism, Restraint, components, equilibrium_column, keep
from beamlang.engine.banded import solve_banded
from beamlang.engine.statics import breakpoints, moment_left, resultant, shear_and_moment

BANDED_FROM = 6  # redundants from which a load is solved in banded stiffness form (linear in the segments)


@dataclass(frozen=True, slots=True)
class Curves:
    """Shear, moment, slope and deflection (SI), with the reaction (force, moment) at every support.

    With shear deformation, `v` holds both parts and `vs` the shear part alone (v - vs is the bending part);
    `theta` is then the rotation of the cross-section, and the slope of `v` is theta - V / (kappa G A)."""

    V: Piecewise
    M: Piecewise
    theta: Piecewise
    v: Piecewise
    reactions: tuple[tuple[Fraction, Fraction], ...]
    vs: Piecewise | None = None  # the shear part of v, when the member includes shear deformation

    def __add__(self, other: "Curves") -> "Curves":
        vs = self.vs if other.vs is None else (other.vs if self.vs is None else self.vs + other.vs)
        return Curves(self.V + other.V, self.M + other.M, self.theta + other.theta, self.v + other.v,
                      tuple((a + c, b + d) for (a, b), (c, d) in zip(self.reactions, other.reactions)), vs)

    def scaled(self, k) -> "Curves":
        return Curves(self.V * k, self.M * k, self.theta * k, self.v * k,
                      tuple((a * k, b * k) for a, b in self.reactions), None if self.vs is None else self.vs * k)

    @property
    def slope(self) -> Piecewise:
        """dv/dx: the section rotation, plus the shear strain where shear deformation is included."""
        return self.theta if self.vs is None else self.v.map(lambda p: p.derivative())


@dataclass(frozen=True, slots=True)
class Primary:
    """The released, statically determinate beam and the compatibility system of the redundants.

    The unit curves and the flexibility matrix are made on first use: with many redundants the loads are
    solved in banded form (`banded.py`) and only the calc package's method section asks for them."""

    kind: str  # "cantilever" (fixed at one support), "simple" (two point supports) or "hinged"
    kept: tuple[Restraint, ...]  # reaction components of the primary beam
    redundants: tuple[Restraint, ...]
    statics: tuple[tuple[Fraction, ...], ...]  # inverse of the kept components' equilibrium matrix
    kinematics: tuple[tuple[Fraction, ...], ...]  # inverse of their support conditions in (c1, c2, jumps)
    basis: tuple = field(default=(), compare=False, repr=False)  # (member, xs, EI) for the lazy parts
    _made: dict = field(default_factory=dict, compare=False, repr=False)

    @property
    def supports(self) -> tuple[int, ...]:
        """The supports of the primary beam, each once."""
        return tuple(dict.fromkeys(r.support for r in self.kept))

    @property
    def units(self) -> tuple["Curves", ...]:
        """The primary response to a unit value of each redundant."""
        if "units" not in self._made:
            member, xs, EI = self.basis
            self._made["units"] = tuple(_on_primary(member, xs, EI, self, [_unit(member, r)]) for r in self.redundants)
        return self._made["units"]

    @property
    def flexibility(self) -> tuple[tuple[Fraction, ...], ...]:
        """A in A X = -D0: the displacement at restraint i under a unit redundant j, 1/k on a spring's diagonal."""
        if "A" not in self._made:
            member = self.basis[0]
            A = []
            for i, r in enumerate(self.redundants):
                row = [_displacement(member, r, u) for u in self.units]
                k = member.supports[r.support].stiffness
                if r.kind == "force" and k:
                    row[i] += 1 / k
                A.append(tuple(row))
            self._made["A"] = tuple(A)
        return self._made["A"]


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
    primary = _primary(member, xs, EI)
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


def choose_primary(member: Member) -> tuple[str, tuple[Restraint, ...], tuple[Restraint, ...]]:
    """Keep one fixed support (a cantilever) or two point supports, plus one more component per hinge
    (stability.keep); release every other restraint."""
    sps = member.supports
    every = components(sps)  # a spring of zero stiffness restrains nothing and has none
    idx = list(dict.fromkeys(r.support for r in every))
    fixed = [i for i in idx if sps[i].kind == "fixed"]
    if fixed:
        kind, first = "cantilever", [Restraint(fixed[0], "force"), Restraint(fixed[0], "moment")]
    else:
        rigid = [i for i in idx if sps[i].kind != "spring"]
        pool = rigid if len(rigid) >= 2 else idx
        kind, first = "simple", [Restraint(i, "force") for i in dict.fromkeys((pool[0], pool[-1]))] if pool else []
    rigid_forces = [r for r in every if r.kind == "force" and sps[r.support].kind != "spring"]
    preferred = list(dict.fromkeys(first + rigid_forces + [r for r in every if r.kind == "moment"] + every))
    try:
        kept = keep(sps, [h.x for h in member.hinges], preferred)
    except Mechanism as exc:
        raise BeamError([_mechanism(member, exc)]) from None
    if member.hinges:
        kind = "hinged"
    return kind, kept, tuple(r for r in every if r not in kept)


def _mechanism(member: Member, exc: Mechanism) -> Diagnostic:
    """The builder reports mechanisms with their hinge; this covers members built some other way."""
    span = member.hinges[exc.hinges[0]].span if exc.hinges else member.span
    return Diagnostic(span, "these supports and hinges cannot carry load: the member is a mechanism")


def _primary(member: Member, xs, EI) -> Primary:
    kind, kept, redundants = choose_primary(member)
    sps, hinges = member.supports, [h.x for h in member.hinges]
    columns = [equilibrium_column(sps, hinges, r) for r in kept]
    statics = _inverse([[col[i] for col in columns] for i in range(len(kept))])
    kinematics = _inverse([_condition(sps[r.support].x, r.kind, hinges) for r in kept])
    return Primary(kind, kept, redundants, statics, kinematics, (member, xs, EI))


def _condition(x, kind: str, hinges) -> list:
    """The support condition of a kept component in the unknowns (c1, c2, slope jump at each hinge):
    v = c1 + c2 x + sum of jump (x - h) right of each hinge h; theta = c2 + sum of the jumps left of x."""
    if kind == "force":
        return [Q(1), x] + [(x - h) if x > h else Q(0) for h in hinges]
    return [Q(0), Q(1)] + [Q(1) if x > h else Q(0) for h in hinges]


def _inverse(A) -> tuple[tuple, ...]:
    n = len(A)
    cols = [linsolve(A, [Q(int(i == j)) for i in range(n)]) for j in range(n)]
    return tuple(tuple(cols[j][i] for j in range(n)) for i in range(n))


def _apply(A, b) -> list:
    return [sum((a * v for a, v in zip(row, b)), Q(0)) for row in A]


def _unit(member: Member, r: Restraint, value=Q(1)) -> Load:
    """The redundant as a load on the primary beam: a force or a couple at its support."""
    sp = member.supports[r.support]
    return PointLoad(sp.x, value, sp.span) if r.kind == "force" else MomentLoad(sp.x, value, sp.span)


def _displacement(member: Member, r: Restraint, c: Curves) -> Fraction:
    x = member.supports[r.support].x
    return c.v.at(x) if r.kind == "force" else c.theta.at(x)


def _solve_loads(member: Member, xs, EI, primary: Primary, loads: tuple[Load, ...]) -> LoadSolution:
    if _is_banded(member, primary):  # the banded form is bending only
        return _banded(member, xs, EI, primary, loads)
    base = _on_primary(member, xs, EI, primary, list(loads))
    D0 = tuple(_displacement(member, r, base) for r in primary.redundants)
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
        acting = list(loads) + [_unit(member, r, x_j) for x_j, r in zip(X, primary.redundants)]
        return _on_primary(member, xs, EI, primary, acting)
    total = base
    for x_j, unit in zip(X, primary.units):
        total = total + unit.scaled(x_j)
    return total


def _banded(member: Member, xs, EI, primary: Primary, loads: tuple[Load, ...]) -> LoadSolution:
    """The same exact solution from the banded stiffness form; the redundants are read off its reactions
    and D0 off the primary beam under the loads (one integration), for the package's compatibility text."""
    (V, M, theta, v), reactions = solve_banded(member, xs, EI, loads, prescribed(member, loads))
    base = _on_primary(member, xs, EI, primary, list(loads))
    D0 = tuple(_displacement(member, r, base) for r in primary.redundants)
    X = tuple(reactions[r.support][0 if r.kind == "force" else 1] for r in primary.redundants)
    return LoadSolution(tuple(loads), base, D0, X, Curves(V, M, theta, v, reactions))


def _on_primary(member: Member, xs, EI, primary: Primary, loads: list[Load]) -> Curves:
    """Loads on the determinate primary beam: reactions by statics (equilibrium and zero moment at
    every hinge), then M/EI integrated twice per segment, with the support conditions fixing the
    two constants and the slope jump at every hinge."""
    F, Mo = resultant(loads)
    sps, hinges = member.supports, [h.x for h in member.hinges]
    R = _apply(primary.statics, [-F, -Mo] + [-moment_left(loads, h) for h in hinges])
    reactions = [(Q(0), Q(0)) for _ in sps]
    actions = list(loads)
    for r, value in zip(primary.kept, R):
        force, moment = reactions[r.support]
        sp = sps[r.support]
        if r.kind == "force":
            reactions[r.support] = (force + value, moment)
            actions.append(PointLoad(sp.x, value, sp.span))
        else:
            reactions[r.support] = (force, moment + value)
            actions.append(MomentLoad(sp.x, value, sp.span))
    V, M = shear_and_moment(xs, actions)
    theta0 = Piecewise(xs, tuple(p * (1 / ei) for p, ei in zip(M.pieces, EI))).integral()
    v0 = theta0.integral()
    vs0 = shear_part(member, xs, V)
    if vs0 is not None:
        v0 = v0 + vs0
    moved = prescribed(member, loads)
    wanted = []
    for r in primary.kept:
        x = sps[r.support].x
        if r.kind == "force":
            wanted.append(_settlement(sps[r.support], reactions[r.support][0]) + moved.get(x, Q(0)) - v0.at(x))
        else:
            wanted.append(-theta0.at(x))
    theta_add, v_add = _rigid(xs, hinges, _apply(primary.kinematics, wanted))
    theta = Piecewise(xs, tuple(p + q for p, q in zip(theta0.pieces, theta_add)))
    v = Piecewise(xs, tuple(p + q for p, q in zip(v0.pieces, v_add)))
    vs = None
    if vs0 is not None:  # the shear part alone: its own integral, fixed at the kept supports in the same way
        shear_wanted = [-vs0.at(sps[r.support].x) if r.kind == "force" else Q(0) for r in primary.kept]
        vs = Piecewise(xs, tuple(p + q for p, q in zip(vs0.pieces, _rigid(xs, hinges, _apply(
            primary.kinematics, shear_wanted))[1])))
    return Curves(V, M, theta, v, tuple(reactions), vs)


def shear_part(member: Member, xs, V: Piecewise) -> Piecewise | None:
    """The shear deflection, minus the integral of V / (kappa G A) from the left end, segment by segment (None
    without shear deformation). Minus: V is the sum of the upward forces left of x, which slide the part left of
    x upward against the part right of it, so v falls to the right where V > 0."""
    if not member.shear_deformation:
        return None
    GA = tuple(member.stretch_at((a + b) / 2).GA for a, b in zip(xs, xs[1:]))
    return Piecewise(xs, tuple(p * (-1 / ga) for p, ga in zip(V.pieces, GA))).integral()


def _rigid(xs, hinges, constants) -> tuple[list[Poly], list[Poly]]:
    """The rigid-body part per segment: c1 + c2 x, plus each hinge's slope jump right of it."""
    c1, c2, *jumps = constants
    theta_add, v_add = [], []
    for a in xs[:-1]:
        left = [(h, j) for h, j in zip(hinges, jumps) if h <= a]
        slope = c2 + sum((j for _, j in left), Q(0))
        theta_add.append(Poly.of(slope))
        v_add.append(Poly.of(c1 - sum((j * h for h, j in left), Q(0)), slope))
    return theta_add, v_add


def prescribed(member: Member, loads) -> dict[Fraction, Fraction]:
    """Prescribed support movements in these loads: {x: movement, positive up}."""
    out: dict[Fraction, Fraction] = {}
    for load in loads:
        if isinstance(load, Settlement):
            out[load.x] = out.get(load.x, Q(0)) + load.movement
    return out


def _settlement(support, force: Fraction) -> Fraction:
    """A spring support moves by -R/k under its reaction R (reaction up, so the beam moves down)."""
    return -force / support.stiffness if support.kind == "spring" else Q(0)


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
