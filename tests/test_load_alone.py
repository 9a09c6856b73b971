"""One load alone (solve.load_solution, solved on its own breakpoints and carried over to the member's
grid) equals that load solved on the whole shared grid, exactly."""

from __future__ import annotations

from hypothesis import HealthCheck, given, settings

from strategies import members

from beamlang.engine import solve as S
from beamlang.language.build import build
from beamlang.language.parse import parse
from beamlang.source import Source


def curves_equal(a, b) -> bool:
    return all(x.xs == y.xs and x.pieces == y.pieces for x, y in zip((a.V, a.M, a.theta, a.v), (b.V, b.M, b.theta, b.v))) \
        and a.reactions == b.reactions


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(members())
def test_a_load_alone_equals_it_solved_on_the_shared_grid(text):
    member = build(parse(Source("t.beam", text)))
    sol = S.solve(member)
    for t in sol.targets:
        for load in t.loads:
            alone = S.load_solution(sol, load)
            full = S._solve_loads(member, sol.xs, sol.EI, sol.primary, (load,))
            assert curves_equal(alone.curves, full.curves) and curves_equal(alone.primary, full.primary)
            assert alone.displacements == full.displacements and alone.redundants == full.redundants
            assert alone.curves.v.xs == sol.xs


def test_the_loads_of_a_case_add_up_to_the_case():
    """Superposition: the curves of the loads alone sum to the case's curve, piece by piece."""
    text = "\n".join(['member T-1 "t"', "span 9 m", "material E 200 GPa", "section properties I 8e7 mm^4 depth 300 mm",
                      "support pin at 0 m", "support roller at 4 m", "support roller at span", "case a"]
                     + [f"  point {k + 1} kN down at {0.5 + 0.7 * k:.1f} m" for k in range(11)]
                     + ["  uniform 2 kN/m down from 1 m to 7 m"]) + "\n"
    member = build(parse(Source("t.beam", text)))
    sol = S.solve(member)
    case = sol.target("a")
    total = None
    for load in case.loads:
        c = S.load_solution(sol, load).curves
        total = c if total is None else total + c
    assert total.v.pieces == case.curves.v.pieces and total.M.pieces == case.curves.M.pieces
    assert total.reactions == case.curves.reactions
