"""Results: Solution -> per case and combination reactions, located extrema, points, stresses, cross-check."""

from __future__ import annotations

from bisect import bisect_left, bisect_right
from dataclasses import dataclass
from fractions import Fraction
from typing import TYPE_CHECKING

from beamlang.engine.extrema import Candidate, Located, candidates, derivative_of, largest, largest_abs
from beamlang.engine.solve import Solution, Target
from beamlang.engine.statics import formula_ends, region_bounds
from beamlang.poly import ZERO

if TYPE_CHECKING:  # moving.py imports this module's neighbours; it is loaded only for moving targets
    from beamlang.analysis.patterned import PatternResult
    from beamlang.engine.moving import Critical, Envelope
    from beamlang.poly import Piecewise

SIGN_CONVENTION = ("x from the left end; deflection, loads and reaction forces positive up; bending moment "
                   "positive sagging; slope dv/dx in radians, positive counterclockwise; reaction moments "
                   "positive counterclockwise (the moment the support exerts on the beam)")


@dataclass(frozen=True, slots=True)
class Region:
    """A stretch between supports (a span) or beyond the last one (an overhang or cantilever)."""

    lo: Fraction
    hi: Fraction
    kind: str  # span | overhang | cantilever
    basis: Fraction  # length that span/N refers to: the span, or twice the overhang (common practice)
    max_abs: Located | None
    name: str = ""  # "span 2", "left overhang", "right overhang", "cantilever": how the package names it


@dataclass(frozen=True, slots=True)
class Stress:
    """The governing stresses: on a stepped member, those of the stretch with the largest ratio to its yield."""

    bending: Fraction | None  # Pa, M c / I at the largest |M| (of the governing stretch)
    shear: Fraction | None  # Pa, V Q / (I t) at the largest |V| (of the governing stretch)
    yield_strength: Fraction | None  # the bending limit of the stretch where bending governs: fy, or see `allowable`
    bending_at: Located | None = None  # the moment that gives `bending`
    shear_at: Located | None = None
    shear_yield: Fraction | None = None  # of the stretch where shear governs
    shear_strength: Fraction | None = None  # that stretch's material's own shear strength, where given
    bending_stretch: int | None = None  # index of the stretch where bending governs (its section and material)
    shear_stretch: int | None = None  # index of the stretch where shear governs
    allowable: bool = False  # `yield_strength` is the allowable bending stress given with the material, not fy

    @property
    def elastic(self) -> bool | None:
        """Within fy (and the shear capacity); within allowable stresses it is elastic too, above them unknown."""
        if self.yield_strength is None or self.bending is None:
            return None
        within = self.bending <= self.yield_strength and self.shear_ok
        return None if self.allowable and not within else within

    @property
    def shear_ok(self) -> bool:
        """Against the material's shear strength where given, else fy/sqrt(3) (von Mises), exactly."""
        if self.shear is None:
            return True
        if self.shear_strength is not None:
            return self.shear <= self.shear_strength
        fy = self.shear_fy
        return fy is None or 3 * self.shear**2 <= fy**2

    @property
    def shear_fy(self) -> Fraction | None:
        """The yield strength the von Mises shear capacity fy/sqrt(3) is taken from."""
        return self.shear_yield if self.shear_yield is not None else self.yield_strength


@dataclass(frozen=True, slots=True)
class TargetResult:
    name: str
    kind: str
    reactions: tuple[tuple[Fraction, Fraction, Fraction], ...]  # (x, force, moment)
    max_down: Located | None
    max_up: Located | None
    slope_max: Located | None
    slope_at_supports: tuple[tuple[Fraction, Fraction], ...]
    moment_positive: Located | None
    moment_negative: Located | None
    shear_max: Located | None
    points: tuple[tuple[Fraction, Fraction, Fraction], ...]  # (x, deflection, slope)
    regions: tuple[Region, ...]
    stress: Stress
    cross_check: float
    deflection_candidates: tuple[Candidate, ...]  # the extremum search, kept for the calc package
    moment_candidates: tuple[Candidate, ...]
    envelope: "Envelope | None" = None  # targets with a moving load: every extreme over the group's positions
    positions: tuple[tuple[str, "Critical"], ...] = ()  # result field -> the group position that gives it
    places: tuple[tuple[str, tuple["Critical", ...]], ...] = ()  # result field -> every tied place and position
    reaches: tuple = ()  # moving targets: per support, its force's largest and smallest over the positions
    moment_reaches: tuple = ()  # the same for the support moments
    pattern: "PatternResult | None" = None  # targets with patterned cases: the envelopes and each extreme's arrangement
    shear_deflection: "Piecewise | None" = None  # the shear part of the deflection, with shear deformation

    def deflection_parts(self, at: Located | None) -> tuple[Fraction, Fraction] | None:
        """The bending and shear parts of a located deflection, when the member includes shear deformation."""
        if self.shear_deflection is None or at is None:
            return None
        shear = self.shear_deflection.at(at.x, at.side or "right")
        return at.value - shear, shear

    def position(self, field: str) -> "Critical | None":
        return dict(self.positions).get(field)

    def places_of(self, field: str) -> tuple["Critical", ...]:
        """Every tied governing place of a moving extreme, the first one first (its position)."""
        return dict(self.places).get(field, ())


def evaluate(solution: Solution) -> tuple[TargetResult, ...]:
    """Every case and combination of a solved member."""
    fe: dict = {}  # case name -> its finite-element solution, summed for the combinations
    parts: dict = {}  # patterned case -> its parts, solved once for the case and its combinations
    return tuple(_target(solution, t, fe, parts) for t in solution.targets)


def _target(sol: Solution, t: Target, fe: dict, parts: dict | None = None) -> TargetResult:
    if sol.member.moving(t.name):
        return _moving_target(sol, t)
    if sol.member.patterned(t.name):
        from beamlang.analysis.patterned import patterned_target
        return patterned_target(sol, t, parts)
    m, c = sol.member, t.curves
    L = m.length
    keep = formula_ends(m)
    defl = candidates(c.v, c.slope, ZERO, L, keep)
    moment = candidates(c.M, c.V, ZERO, L, keep)
    shear = candidates(c.V, derivative_of(c.V), ZERO, L, keep)
    slope = candidates(c.theta, derivative_of(c.theta), ZERO, L, keep)
    m_pos, m_neg, v_max = largest(moment, 1), largest(moment, -1), largest_abs(shear)
    return TargetResult(
        t.name, t.kind,
        tuple((sp.x, f, mo) for sp, (f, mo) in zip(m.supports, c.reactions)),
        largest(defl, -1), largest(defl, 1), largest_abs(slope),
        tuple((sp.x, support_slope(c.theta, sp.x)) for sp in m.supports),
        m_pos, m_neg, v_max,
        tuple((p.x, c.v.at(p.x), c.theta.at(p.x)) for p in m.report_points),
        regions(sol, defl), _stress(sol, moment, shear), _cross_check(sol, t, fe), tuple(defl), tuple(moment),
        shear_deflection=c.vs)


def support_slope(theta, x: Fraction) -> Fraction:
    """The slope at a support; where it jumps (a hinge over the support), the larger side."""
    left, right = theta.at(x, "left"), theta.at(x, "right")
    return left if abs(left) > abs(right) else right


def _moving_target(sol: Solution, t: Target) -> TargetResult:
    """The envelope over every position of the target's moving group, in the same shape as a static result."""
    from beamlang.analysis.governing import reaches, ties
    from beamlang.engine.moving import envelope
    m = sol.member
    env = envelope(sol, t)
    picked: list[tuple[str, object]] = []
    places: list[tuple[str, tuple]] = []

    def cands(q: str) -> list[Candidate]:  # segment -1: placed by x alone (a stretch end belongs to both)
        return [Candidate(c.x, c.value, c.how, None, "", -1) for c in env.of(q)]

    def locate(field: str, q: str, found: Located | None) -> Located | None:
        """Every place that ties (a mirrored layout, the other travel direction), each with its position; the
        largest |slope| and |shear| tie with mirrored places of the other sign too."""
        if found is not None:
            tied = ties(env.of(q), found.value, q in ("theta", "V"), m.length)
            first = next((c for c in tied if c.x == found.x), tied[0])
            picked.append((field, first))
            places.append((field, (first, *(c for c in tied if c is not first))))
            found = Located(found.x, found.value, None, "", tuple(sorted({c.x for c in tied})))
        return found

    defl, moment, shear, slope = cands("v"), cands("M"), cands("V"), cands("theta")
    max_down = locate("max_down", "v", largest(defl, -1))
    max_up = locate("max_up", "v", largest(defl, 1))
    m_pos = locate("moment_positive", "M", largest(moment, 1))
    m_neg = locate("moment_negative", "M", largest(moment, -1))
    v_max = locate("shear_max", "V", largest_abs(shear))
    slope_max = locate("slope_max", "theta", largest_abs(slope))
    reactions = tuple((sp.x, _bigger(*env.reactions[j]).value, _bigger(*env.reaction_moments[j]).value)
                      for j, sp in enumerate(m.supports))
    points = tuple((r.x, _bigger(*env.points[k]).value, Fraction(0)) for k, r in enumerate(m.report_points))
    governing = env.of("v")[0] if max_down is None else dict(picked)["max_down"]
    return TargetResult(
        t.name, t.kind, reactions, max_down, max_up, slope_max,
        tuple((sp.x, env.support_slopes[j].value) for j, sp in enumerate(m.supports)),
        m_pos, m_neg, v_max, points, regions(sol, defl), _stress(sol, moment, shear),
        _moving_cross_check(sol, t, env, governing), tuple(defl), tuple(moment), env, tuple(picked), tuple(places),
        reaches(env, "R", tuple(sp.x for sp in m.supports), m.length),
        reaches(env, "Rm", tuple(sp.x for sp in m.supports), m.length))


def _bigger(a, b):
    return a if abs(a.value) >= abs(b.value) else b


def _moving_cross_check(sol: Solution, t: Target, env, crit) -> float:
    """The finite-element cross-check with the group standing where it gives the governing deflection."""
    from beamlang.engine.fem import relative_difference
    from beamlang.engine.moving import standing_case
    from beamlang.engine.solve import curves_with
    loads = standing_case(env, crit, factored_loads(sol, t))
    curves = curves_with(sol, loads)
    return relative_difference(sol.member, curves.v.xs, [(Fraction(1), ld) for ld in loads], curves.v, curves.theta)


def regions(sol: Solution, defl: list[Candidate]) -> tuple[Region, ...]:
    """Spans between supports and overhangs, each with its largest deflection (from `defl`)."""
    m = sol.member
    xs = sorted({sp.x for sp in m.supports})
    bounds = region_bounds(m)
    out = []
    spans = 0
    order = sorted(range(len(defl)), key=lambda i: defl[i].x)  # candidates by x; each region keeps their order
    at = [defl[i].x for i in order]
    for lo, hi in zip(bounds, bounds[1:]):
        inside = bool(xs) and xs[0] <= lo and xs[-1] >= hi
        kind = "span" if inside else ("cantilever" if len(xs) == 1 and m.supports[0].kind == "fixed" else "overhang")
        basis = hi - lo if inside else 2 * (hi - lo)
        spans += inside
        name = (f"span {spans}" if inside else kind if kind == "cantilever" else
                f"{'left' if lo == 0 else 'right'} overhang")
        within = sorted(order[bisect_left(at, lo):bisect_right(at, hi)])
        out.append(Region(lo, hi, kind, basis, largest_abs([defl[i] for i in within]), name))
    return tuple(out)


def _stress(sol: Solution, moment: list[Candidate], shear: list[Candidate]) -> Stress:
    """M c / I and V Q / (I t) in every stretch with its own section; the largest ratio to the stretch's
    yield governs (on a stepped member it may sit at a step rather than at the largest |M|)."""
    m = sol.member
    bending = shearing = None  # (ratio key, stress, located, fy, stretch index[, shear strength])
    for k, st in enumerate(m.stretches):
        sec, fy, fv = st.section, st.material.bending_strength, st.material.shear_strength
        inside = lambda c: _in_stretch(sol, c, st)  # noqa: E731
        ms = [c for c in moment if inside(c)]
        at = max((l for l in (largest(ms, 1), largest(ms, -1)) if l is not None), key=lambda l: abs(l.value),
                 default=None)
        big_m = abs(at.value) if at else Fraction(0)
        sigma = big_m * sec.c / sec.I if sec.c is not None else (big_m / sec.S if sec.S is not None else None)
        if sigma is not None and (bending is None or _ratio(sigma, fy) > bending[0]):
            bending = (_ratio(sigma, fy), sigma, at, fy, k)
        if sec.Q is not None and sec.t is not None:
            v_at = largest_abs([c for c in shear if inside(c)])
            tau = (abs(v_at.value) if v_at else Fraction(0)) * sec.Q / (sec.I * sec.t)
            key = _shear_key(tau, fy, fv)
            if shearing is None or key > shearing[0]:
                shearing = (key, tau, v_at, fy, k, fv)
    fy0 = m.stretches[0].material.bending_strength
    governing = m.stretches[bending[4] if bending else 0].material
    return Stress(bending[1] if bending else None, shearing[1] if shearing else None,
                  bending[3] if bending else fy0, bending[2] if bending else None,
                  shearing[2] if shearing else None, shearing[3] if shearing else None,
                  shearing[5] if shearing else None, bending[4] if bending else None,
                  shearing[4] if shearing else None, governing.allowable_bending is not None)


def _ratio(stress: Fraction, fy: Fraction | None) -> Fraction:
    return stress / fy if fy else stress


def _shear_key(tau: Fraction, fy: Fraction | None, fv: Fraction | None) -> Fraction:
    """The square of tau over the shear capacity (fv where given, else fy/sqrt(3)): exact, comparable."""
    if fv:
        return (tau / fv) ** 2
    return 3 * (tau / fy) ** 2 if fy else tau**2


def _in_stretch(sol: Solution, c: Candidate, st) -> bool:
    if c.segment < 0:
        return st.x1 <= c.x <= st.x2
    return st.x1 <= sol.xs[c.segment] and sol.xs[c.segment + 1] <= st.x2


def factored_loads(sol: Solution, t: Target) -> list[tuple[Fraction, object]]:
    if t.kind == "case":
        return [(Fraction(1), load) for load in t.loads]
    out = []
    for factor, name in t.terms:
        out += [(factor * f, load) for f, load in factored_loads(sol, sol.target(name))]
    return out


def _cross_check(sol: Solution, t: Target, fe: dict) -> float:
    """The finite-element model of every case; a combination's is the factored sum of its cases' element
    solutions (the element model is linear too, so solving it again would check nothing new)."""
    from beamlang.engine.fem import fe_nodes, nodal_solution, relative_difference
    if t.kind == "combination" and all(name in fe for _, name in t.terms):
        v = sum(float(f) * fe[name][0] for f, name in t.terms)
        theta = sum(float(f) * fe[name][1] for f, name in t.terms)
        return relative_difference(sol.member, sol.xs, (), t.curves.v, t.curves.theta, (v, theta))
    nodes = fe_nodes(sol.member, sol.xs)
    nodal = nodal_solution(sol.member, nodes, factored_loads(sol, t))
    if t.kind == "case":
        fe[t.name] = nodal
    return relative_difference(sol.member, sol.xs, (), t.curves.v, t.curves.theta, nodal, nodes)
