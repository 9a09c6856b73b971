"""The primary beam: the released, statically determinate beam of the force method (which restraints are kept,
its statics and support conditions), the exact curves of loads on it, and the exact linear solve."""

from __future__ import annotations

from dataclasses import dataclass, field
from fractions import Fraction

from beamlang.engine.curves import Curves
from beamlang.engine.statics import moment_left, resultant, shear_and_moment
from beamlang.errors import BeamError, Diagnostic
from beamlang.exact import Q
from beamlang.model import Load, Member, MomentLoad, PointLoad, Settlement
from beamlang.poly import Piecewise, Poly
from beamlang.stability import Mechanism, Restraint, components, equilibrium_column, keep


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
            self._made["units"] = tuple(on_primary(member, xs, EI, self, [unit(member, r)]) for r in self.redundants)
        return self._made["units"]

    @property
    def flexibility(self) -> tuple[tuple[Fraction, ...], ...]:
        """A in A X = -D0: the displacement at restraint i under a unit redundant j, 1/k on a spring's diagonal."""
        if "A" not in self._made:
            member = self.basis[0]
            A = []
            for i, r in enumerate(self.redundants):
                row = [displacement(member, r, u) for u in self.units]
                k = member.supports[r.support].stiffness
                if r.kind == "force" and k:
                    row[i] += 1 / k
                A.append(tuple(row))
            self._made["A"] = tuple(A)
        return self._made["A"]


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


def make_primary(member: Member, xs, EI) -> Primary:
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


def unit(member: Member, r: Restraint, value=Q(1)) -> Load:
    """The redundant as a load on the primary beam: a force or a couple at its support."""
    sp = member.supports[r.support]
    return PointLoad(sp.x, value, sp.span) if r.kind == "force" else MomentLoad(sp.x, value, sp.span)


def displacement(member: Member, r: Restraint, c: Curves) -> Fraction:
    x = member.supports[r.support].x
    return c.v.at(x) if r.kind == "force" else c.theta.at(x)


def on_primary(member: Member, xs, EI, primary: Primary, loads: list[Load]) -> Curves:
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
