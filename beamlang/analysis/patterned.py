"""Patterned targets: Solution + the pattern of a target -> its results from the envelope, each extreme with
the arrangement (which spans of which patterned case are loaded) that gives it."""

from __future__ import annotations

from dataclasses import dataclass, replace
from fractions import Fraction

from beamlang.analysis.results import Region, TargetResult, _stress, factored_loads, regions
from beamlang.engine.extrema import Candidate, Located, largest, largest_abs
from beamlang.engine.pattern import QUANTITIES, Arranged, Pattern, pattern_of
from beamlang.engine.solve import Solution, Target
from beamlang.poly import Piecewise


KIND = {"v": "deflection", "theta": "slope", "M": "moment", "V": "force"}


@dataclass(frozen=True, slots=True)
class PatternResult:
    """What the package shows of a patterned target: the cases patterned, the arrangements considered, both
    envelopes of every curve (for the figure) and the arrangement of each extreme."""

    cases: tuple[str, ...]  # the patterned cases, in the target's order
    parts: tuple[tuple[str, str], ...]  # (case, region name) of every part that can be loaded or not
    upper: tuple[tuple[str, Piecewise], ...]  # quantity -> upper envelope
    lower: tuple[tuple[str, Piecewise], ...]
    arrangements: tuple[tuple[str, str, Fraction | None, Fraction, str], ...]  # (extreme, arrangement, x, value,
    # quantity: deflection | slope | moment | force)

    def curve(self, quantity: str, sign: int) -> Piecewise:
        return dict(self.upper if sign > 0 else self.lower)[quantity]

    def arrangement(self, extreme: str) -> str | None:
        return next((a for e, a, *_ in self.arrangements if e == extreme), None)


def patterned_target(sol: Solution, t: Target, cache: dict | None = None) -> TargetResult:
    """A target holding patterned cases, in the shape of any result: every extreme from the envelopes (`cache`:
    the patterned cases' parts, shared by the targets of one member)."""
    pattern = pattern_of(sol, t, cache)
    assert pattern is not None
    m = sol.member
    region_list = regions(sol, [])
    env = {(q, s): pattern.envelope(q, s) for q in QUANTITIES for s in (1, -1)}
    named: list[tuple[str, str, Fraction | None, Fraction, str]] = []
    describe = _describer(pattern, region_list)

    def sided(q: str, found: Located | None) -> Located | None:
        """The side of a jump, judged on the one envelope that holds the value (not against the other one)."""
        if found is None:
            return None
        s = 1 if (found.x, found.value) in env[(q, 1)][2] else -1
        values = {c.value for c in env[(q, s)][1] if c.x == found.x}
        return replace(found, side=found.side if len(values) > 1 else "")

    def pick(extreme: str, q: str, found: Located | None) -> Located | None:
        if found is not None:
            loaded = env[(q, 1)][2].get((found.x, found.value), env[(q, -1)][2].get((found.x, found.value)))
            named.append((extreme, describe(loaded), found.x, found.value, KIND[q]))
        return sided(q, found)

    def both(q: str) -> list[Candidate]:
        return env[(q, 1)][1] + env[(q, -1)][1]

    defl, moment, shear, slope = both("v"), both("M"), both("V"), both("theta")
    max_down = pick("largest deflection down", "v", largest(env[("v", -1)][1], -1))
    max_up = pick("largest deflection up", "v", largest(env[("v", 1)][1], 1))
    m_pos = pick("largest sagging moment", "M", largest(env[("M", 1)][1], 1))
    m_neg = pick("largest hogging moment", "M", largest(env[("M", -1)][1], -1))
    v_max = pick("largest shear", "V", largest_abs(shear))
    slope_max = pick("largest slope", "theta", largest_abs(slope))
    own_regions = tuple(replace(region, max_abs=pick(f"largest deflection in {region.name}", "v", region.max_abs))
                        for region in regions(sol, defl))
    reactions, supports, points = _at_supports_and_points(m, pattern, describe, named)
    result = PatternResult(
        m.patterned(t.name), tuple((p.case, region_list[p.region].name) for p in pattern.parts),
        tuple((q, env[(q, 1)][0]) for q in QUANTITIES), tuple((q, env[(q, -1)][0]) for q in QUANTITIES),
        tuple(named))
    stress = _stress(sol, moment, shear)
    stress = replace(stress, bending_at=sided("M", stress.bending_at), shear_at=sided("V", stress.shear_at))
    governing = max((l for l in (max_down, max_up) if l is not None), key=lambda l: abs(l.value), default=None)
    return TargetResult(
        t.name, t.kind, reactions, max_down, max_up, slope_max, supports,
        m_pos, m_neg, v_max, points, own_regions, stress,
        _cross_check(sol, t, pattern, governing, env), tuple(defl), tuple(moment), pattern=result)


def _at_supports_and_points(m, pattern: Pattern, describe, named: list) -> tuple[tuple, tuple, tuple]:
    """Each reaction (the larger magnitude of its two extremes; both named with their arrangements), the slope at
    each support and the report points' deflection and slope, the larger magnitude of either envelope."""
    reactions = []
    for j, sp in enumerate(m.supports):
        for which, what in ((0, "force"), (1, "moment")):
            if what == "moment" and sp.kind != "fixed":
                continue
            up, down = pattern.reaction(j, which, 1), pattern.reaction(j, which, -1)
            sense = ("up", "down") if what == "force" else ("counterclockwise", "clockwise")
            for worst, word in ((up, sense[0]), (down, sense[1])):
                if (worst is up and up.value > 0) or (worst is down and down.value < 0):
                    named.append((f"reaction {what}, largest {word}", describe(worst.loaded), sp.x, worst.value, what))
        force = _bigger(pattern.reaction(j, 0, 1), pattern.reaction(j, 0, -1))
        couple = _bigger(pattern.reaction(j, 1, 1), pattern.reaction(j, 1, -1))
        reactions.append((sp.x, force.value, couple.value))
    supports = tuple((sp.x, _bigger(*(pattern.at("theta", sp.x, s, side) for s in (1, -1)
                                      for side in ("left", "right"))).value) for sp in m.supports)
    points = tuple((p.x, _bigger(pattern.at("v", p.x, 1), pattern.at("v", p.x, -1)).value,
                    _bigger(pattern.at("theta", p.x, 1), pattern.at("theta", p.x, -1)).value) for p in m.report_points)
    return tuple(reactions), supports, points


def _bigger(*items: Arranged) -> Arranged:
    return max(items, key=lambda a: abs(a.value))


def _describer(pattern: Pattern, region_list: tuple[Region, ...]):
    """loaded parts -> `live on spans 1 and 3`, `live on span 2 and the right overhang; roof on no span`."""
    by_case: dict[str, list[int]] = {}
    for i, p in enumerate(pattern.parts):
        by_case.setdefault(p.case, []).append(i)

    def describe(loaded: frozenset[int] | None) -> str:
        loaded = loaded or frozenset()
        out = []
        for case, mine in by_case.items():
            on = [region_list[pattern.parts[i].region] for i in mine if i in loaded]
            out.append(f"{case} {_places(on, len(on) == len(mine) and len(mine) > 1)}")
        return "; ".join(out)
    return describe


def _places(on: list[Region], every: bool) -> str:
    if not on:
        return "on no span"
    spans = [r.name.split()[1] for r in on if r.kind == "span"]
    others = [f"the {r.name}" for r in on if r.kind != "span"]
    words = ([("span " if len(spans) == 1 else "spans ") + _and(spans)] if spans else []) + others
    return ("on all its spans: " if every else "on ") + _and(words)


def _and(words: list[str]) -> str:
    return words[0] if len(words) == 1 else ", ".join(words[:-1]) + " and " + words[-1]


def _cross_check(sol: Solution, t: Target, pattern: Pattern, governing: Located | None, env) -> float:
    """The finite-element cross-check of the arrangement that gives the governing deflection."""
    from beamlang.engine.fem import relative_difference
    loaded: frozenset[int] = frozenset()
    if governing is not None:
        sign = 1 if governing.value > 0 else -1
        loaded = env[("v", sign)][2].get((governing.x, governing.value), frozenset())
    patterned = set(sol.member.patterned(t.name))
    terms = ((Fraction(1), t.name),) if t.kind == "case" else t.terms
    fixed = [(f * g, ld) for f, name in terms if name not in patterned
             for g, ld in factored_loads(sol, sol.target(name))]
    curves = pattern.fixed
    for i in sorted(loaded):
        curves = curves + pattern.parts[i].curves
    return relative_difference(sol.member, curves.v.xs, pattern.loads(loaded, fixed), curves.v, curves.theta)
