"""Results: Solution -> per case and combination reactions, located extrema, points, stresses, cross-check."""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

from .extrema import Candidate, Located, candidates, derivative_of, largest, largest_abs
from .solve import Solution, Target

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


def evaluate(solution: Solution) -> tuple[TargetResult, ...]:
    """Every case and combination of a solved member."""
    return tuple(_target(solution, t) for t in solution.targets)


def _target(sol: Solution, t: Target) -> TargetResult:
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


def regions(sol: Solution, defl: list[Candidate]) -> tuple[Region, ...]:
    """Spans between supports and overhangs, each with its largest deflection (from `defl`)."""
    m = sol.member
    xs = sorted({sp.x for sp in m.supports})
    bounds = [Fraction(0)] + [x for x in xs if 0 < x < m.length] + [m.length]
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
