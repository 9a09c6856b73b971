"""A solved member -> the working its calc package shows beside the results: each load alone, its general
formula, settlements, the moving extremes re-solved as static cases, the factor behind an irrational root."""

from __future__ import annotations

import math
from fractions import Fraction

from beamlang.analysis.results import factored_loads
from beamlang.engine.moving import standing_case, standing_loads
from beamlang.engine.primary import prescribed
from beamlang.engine.roots import square_free
from beamlang.engine.solve import Solution, curves_with, load_solution
from beamlang.engine.statics import formula_ends
from beamlang.engine.symbolic import load_formula, worth_deriving
from beamlang.model import Load, Member
from beamlang.poly import Piecewise, Poly, runs

FLOOR = 1e-12  # cross-check differences below this are float noise and are reported as this bound


def reported(difference: float) -> float:
    """A cross-check difference rounded up to a power of ten, at least FLOOR: stable across machines."""
    if difference <= FLOOR:
        return FLOOR
    return float(f"1e{math.ceil(math.log10(difference))}")


def load_deflection(sol: Solution, load: Load) -> Piecewise:
    """v(x) of one load alone on the member (the package lists every load's own curve)."""
    return load_solution(sol, load).curves.v


def formulas_shown(sol: Solution) -> bool:
    """Whether the package derives each load's general formula (short enough to read for this layout)."""
    return worth_deriving(sol.member, len(sol.primary.redundants))


def general_formula(member: Member, load: Load) -> tuple[list[tuple[Fraction, Fraction, object]], dict[str, Fraction]]:
    """One load's deflection as sympy expressions per segment, and the value of each symbol (SI)."""
    return load_formula(member, load)


def settlements(member: Member, loads) -> dict:
    """Support x -> prescribed movement (m) of a case's settlement loads."""
    return prescribed(member, loads)


def standing_value(sol: Solution, target, result, field: str, kind: str,
                   crit=None) -> tuple[Fraction, tuple[Fraction, ...]]:
    """A moving extreme re-solved as a static case: the response at its x, and where the group's forces stand
    (at `crit`, one of the extreme's tied places; by default the first)."""
    crit = crit if crit is not None else result.position(field)
    loads = standing_case(result.envelope, crit, factored_loads(sol, target))
    curves = curves_with(sol, loads)
    curve = curves.v if kind == "deflection" else curves.M
    value = curve.at(crit.x, "left") if crit.how == "under a force" else curve.at(crit.x)
    return value, tuple(ld.x for ld in standing_loads(result.envelope, crit))


def search_runs(member: Member, curve, derivative) -> list:
    """(first segment, start, end) of each run of one formula the extremum search examined (`extrema.candidates`)."""
    return runs((curve, derivative), formula_ends(member))


def root_factor(poly: Poly) -> Poly:
    """The square-free factor of a slope polynomial whose root locates an extreme."""
    return square_free(poly)
