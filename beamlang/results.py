"""Results: Solution -> per case and combination reactions, located extrema, points, stresses, cross-check."""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from typing import TYPE_CHECKING

from .extrema import Candidate, Located, candidates, derivative_of, largest, largest_abs
from .solve import Solution, Target
from .statics import region_bounds

if TYPE_CHECKING:  # moving.py imports this module's neighbours; it is loaded only for moving targets
    from .moving import Critical, Envelope

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


@dataclass(frozen=True, slots=True)
class Stress:
    bending: Fraction | None  # Pa, M c / I at the largest |M|
    shear: Fraction | None  # Pa, V Q / (I t) at the largest |V|
    yield_strength: Fraction | None

    @property
    def elastic(self) -> bool | None:
        if self.yield_strength is None or self.bending is None:
            return None
        shear_ok = self.shear is None or 3 * self.shear**2 <= self.yield_strength**2
        return self.bending <= self.yield_strength and shear_ok


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

    def position(self, field: str) -> "Critical | None":
        return dict(self.positions).get(field)


def evaluate(solution: Solution) -> tuple[TargetResult, ...]:
    """Every case and combination of a solved member."""
    return tuple(_target(solution, t) for t in solution.targets)


def _target(sol: Solution, t: Target) -> TargetResult:
    if sol.member.moving(t.name):
        return _moving_target(sol, t)
    m, c = sol.member, t.curves
    L = m.length
    defl = candidates(c.v, c.theta, Fraction(0), L)
    moment = candidates(c.M, c.V, Fraction(0), L)
    shear = candidates(c.V, derivative_of(c.V), Fraction(0), L)
    slope = candidates(c.theta, derivative_of(c.theta), Fraction(0), L)
    m_pos, m_neg, v_max = largest(moment, 1), largest(moment, -1), largest_abs(shear)
    return TargetResult(
        t.name, t.kind,
        tuple((sp.x, f, mo) for sp, (f, mo) in zip(m.supports, c.reactions)),
        largest(defl, -1), largest(defl, 1), largest_abs(slope),
        tuple((sp.x, c.theta.at(sp.x)) for sp in m.supports),
        m_pos, m_neg, v_max,
        tuple((p.x, c.v.at(p.x), c.theta.at(p.x)) for p in m.report_points),
        regions(sol, defl), _stress(sol, m_pos, m_neg, v_max), _cross_check(sol, t), tuple(defl), tuple(moment))


def _moving_target(sol: Solution, t: Target) -> TargetResult:
    """The envelope over every position of the target's moving group, in the same shape as a static result."""
    from .moving import envelope
    m = sol.member
    env = envelope(sol, t, factored_loads(sol, t))
    picked: list[tuple[str, object]] = []

    def cands(q: str) -> list[Candidate]:
        return [Candidate(c.x, c.value, c.how, None, "", i) for i, c in enumerate(env.of(q))]

    def locate(field: str, q: str, found: Located | None) -> Located | None:
        if found is not None:
            crit = next(c for c in env.of(q) if c.x == found.x and c.value == found.value)
            picked.append((field, crit))
            found = Located(found.x, found.value, None, "", (found.x,))
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
        m_pos, m_neg, v_max, points, regions(sol, defl), _stress(sol, m_pos, m_neg, v_max),
        _moving_cross_check(sol, t, env, governing), tuple(defl), tuple(moment), env, tuple(picked))


def _bigger(a, b):
    return a if abs(a.value) >= abs(b.value) else b


def _moving_cross_check(sol: Solution, t: Target, env, crit) -> float:
    """The finite-element cross-check with the group standing where it gives the governing deflection."""
    from .fem import relative_difference
    from .moving import standing_case
    from .solve import curves_with
    loads = standing_case(env, crit, factored_loads(sol, t))
    curves = curves_with(sol, loads)
    return relative_difference(sol.member, curves.v.xs, [(Fraction(1), ld) for ld in loads], curves.v, curves.theta)


def regions(sol: Solution, defl: list[Candidate]) -> tuple[Region, ...]:
    """Spans between supports and overhangs, each with its largest deflection (from `defl`)."""
    m = sol.member
    xs = sorted({sp.x for sp in m.supports})
    bounds = region_bounds(m)
    out = []
    for lo, hi in zip(bounds, bounds[1:]):
        inside = any(x <= lo for x in xs) and any(x >= hi for x in xs)
        kind = "span" if inside else ("cantilever" if len(xs) == 1 and m.supports[0].kind == "fixed" else "overhang")
        basis = hi - lo if inside else 2 * (hi - lo)
        out.append(Region(lo, hi, kind, basis, largest_abs([d for d in defl if lo <= d.x <= hi])))
    return tuple(out)


def _stress(sol: Solution, m_pos: Located | None, m_neg: Located | None, v_max: Located | None) -> Stress:
    sec, mat = sol.member.section, sol.member.material
    big_m = max((abs(l.value) for l in (m_pos, m_neg) if l is not None), default=Fraction(0))
    bending = None
    if sec.c is not None:
        bending = big_m * sec.c / sec.I
    elif sec.S is not None:
        bending = big_m / sec.S
    shear = None
    if sec.Q is not None and sec.t is not None:
        shear = (abs(v_max.value) if v_max else Fraction(0)) * sec.Q / (sec.I * sec.t)
    return Stress(bending, shear, mat.yield_strength)


def factored_loads(sol: Solution, t: Target) -> list[tuple[Fraction, object]]:
    if t.kind == "case":
        return [(Fraction(1), load) for load in t.loads]
    out = []
    for factor, name in t.terms:
        out += [(factor * f, load) for f, load in factored_loads(sol, sol.target(name))]
    return out


def _cross_check(sol: Solution, t: Target) -> float:
    from .fem import relative_difference
    return relative_difference(sol.member, sol.xs, factored_loads(sol, t), t.curves.v, t.curves.theta)
