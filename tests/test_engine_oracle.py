"""The engine against an independent general-purpose reference: sympy.physics.continuum_mechanics.beam.

sympy's Beam is solved exactly (Rational inputs), so reactions and deflections at points must
agree exactly. Sign mapping, checked on a simple span: sympy loads and deflections are positive
up like ours; a sympy moment load of +C is clockwise, i.e. our counterclockwise moment is -C.
Its max-deflection routine is not called (it is very slow). Support settlements are not compared here:
sympy 1.14's beam gave reactions scaled by 1/(EI) for a non-zero deflection condition, and then failed in
deflection() (seen here); settlements are checked against closed forms in test_engine_handbook.py."""

from __future__ import annotations

from fractions import Fraction as F

import sympy
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from sympy.physics.continuum_mechanics.beam import Beam

from beamlang.model import LineLoad, MomentLoad, PointLoad
from engine_helpers import analyse_text, member_text, to_sympy

LAYOUTS = {
    "simple": ["pin at 0 m", "roller at span"],
    "overhangs": ["pin at 1 m", "roller at 5 m"],
    "cantilever": ["fixed at 0 m"],
    "cantilever-right": ["fixed at span"],
    "fixed-fixed": ["fixed at 0 m", "fixed at span"],
    "propped": ["fixed at 0 m", "roller at 4.5 m"],
    "two-span": ["pin at 0 m", "roller at 2.5 m", "roller at span"],
    "three-span-overhang": ["pin at 0 m", "roller at 2 m", "roller at 3.5 m", "roller at 5.5 m"],
    "fixed-and-props": ["fixed at 0 m", "roller at 2 m", "roller at span"],
}


@st.composite
def beams(draw):
    layout = draw(st.sampled_from(sorted(LAYOUTS)))
    tenth = st.integers(0, 60)  # positions in tenths of a metre on a 6 m member
    loads = []
    for _ in range(draw(st.integers(1, 4))):
        kind = draw(st.sampled_from(["point", "uniform", "linear", "moment"]))
        d = draw(st.sampled_from(["down", "up"]))
        if kind == "point":
            loads.append(f"point {draw(st.integers(1, 20))} kN {d} at {draw(tenth) / 10} m")
        elif kind == "moment":
            turn = draw(st.sampled_from(["clockwise", "counterclockwise"]))
            loads.append(f"moment {draw(st.integers(1, 9))} kN*m {turn} at {draw(tenth) / 10} m")
        else:
            a, b = sorted(draw(st.lists(tenth, min_size=2, max_size=2, unique=True)))
            w1, w2 = draw(st.integers(0, 5)), draw(st.integers(1, 5))
            if kind == "uniform":
                loads.append(f"uniform {w2} kN/m {d} from {a / 10} m to {b / 10} m")
            else:
                loads.append(f"linear {w1} kN/m to {w2} kN/m {d} from {a / 10} m to {b / 10} m")
    return member_text("6 m", LAYOUTS[layout], {"a": loads}, extra=["report deflection at 1.3 m",
                                                                   "report deflection at 3.7 m"])


def sympy_solution(member):
    R = lambda v: to_sympy(v)  # noqa: E731
    b = Beam(R(member.length), R(member.material.E), R(member.section.I))
    unknowns = []
    for i, sp in enumerate(member.supports):
        f = sympy.Symbol(f"R{i}")
        b.apply_load(f, R(sp.x), -1)
        unknowns.append(f)
        b.bc_deflection.append((R(sp.x), 0))
        if sp.kind == "fixed":
            m = sympy.Symbol(f"M{i}")
            b.apply_load(m, R(sp.x), -2)
            unknowns.append(m)
            b.bc_slope.append((R(sp.x), 0))
    for load in member.cases[0].loads:
        if isinstance(load, PointLoad):
            b.apply_load(R(load.force), R(load.x), -1)
        elif isinstance(load, MomentLoad):
            b.apply_load(-R(load.moment), R(load.x), -2)
        elif isinstance(load, LineLoad):
            slope = (load.w2 - load.w1) / (load.x2 - load.x1)
            if load.w1:
                b.apply_load(R(load.w1), R(load.x1), 0, end=R(load.x2))
            if slope:
                b.apply_load(R(slope), R(load.x1), 1, end=R(load.x2))
    b.solve_for_reaction_loads(*unknowns)
    return b


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(beams())
def test_reactions_and_deflections_match_sympy_beam(text):
    a = analyse_text(text)
    m = a.loaded.member
    b = sympy_solution(m)
    r = a.results[0]
    x = sympy.Symbol("x")
    for i, (sp, (_, force, moment)) in enumerate(zip(m.supports, r.reactions)):
        assert b.reaction_loads[sympy.Symbol(f"R{i}")] == to_sympy(force)
        if sp.kind == "fixed":
            assert b.reaction_loads[sympy.Symbol(f"M{i}")] == -to_sympy(moment)
    deflection, slope = b.deflection(), b.slope()
    for p, v, theta in r.points:
        xp = to_sympy(p)
        assert deflection.subs(x, xp).doit() == to_sympy(v)
        assert slope.subs(x, xp).doit() == to_sympy(theta)


def test_sign_mapping_on_a_simple_span():
    # the mapping stated above, shown on one beam: 10 kN down at 2 m and 1 kN*m clockwise at 3 m
    text = member_text("6 m", LAYOUTS["simple"], {"a": ["point 10 kN down at 2 m", "moment 1 kN*m clockwise at 3 m"]},
                       extra=["report deflection at 3 m"])
    a = analyse_text(text)
    b = sympy_solution(a.loaded.member)
    assert b.reaction_loads[sympy.Symbol("R0")] == F(20000, 3) - F(1000, 6)
    v = a.results[0].points[0][1]
    assert b.deflection().subs(sympy.Symbol("x"), 3) == to_sympy(v)
