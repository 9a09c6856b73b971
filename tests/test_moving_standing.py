"""The group standing still, by superposition of the unit-force kernels, against the engine's own exact solve of
the same static case (`solve.curves_with`, the static loads plus the group's forces as point loads): every
piece of v, theta, M and V, every value at a breakpoint and every support reaction is the same exact number."""

from __future__ import annotations

from fractions import Fraction

import pytest

from beamlang.analysis.results import factored_loads
from beamlang.engine.moving import group_offsets, kernels_for, scaled
from beamlang.engine.moving.cells import _events, _wheels
from beamlang.engine.moving.floats import FloatCells
from beamlang.engine.moving.kernels import _curve
from beamlang.engine.moving.standing import _piece, _pieces, reaction_at, standing, value_at
from beamlang.engine.solve import curves_with
from beamlang.model import PointLoad
from engine_helpers import analyse_text, member_text

MEMBERS = [
    # two spans on a spring, a settlement, a combination of all (the benchmark's member)
    member_text("10 m", ["pin at 0 m", "spring 5 kN/mm at 5 m", "roller at span"],
                {"d": ["uniform 2 kN/m down"], "s": ["settlement 4 mm down at 5 m"],
                 "m": ["moving 12 kN and 8 kN down spaced 1.2 m"]}, ["combine c = d + s + m"]),
    # a propped cantilever with a hinge, a moment and a report point, three forces
    member_text("6 m", ["fixed at 0 m", "roller at 4 m", "roller at span"],
                {"d": ["uniform 3 kN/m down", "moment 4 kN*m counterclockwise at 2.5 m"],
                 "m": ["moving 10 kN and 6 kN and 4 kN down spaced 0.9 m and 1.3 m"]},
                ["hinge at 5 m", "report deflection at 1.5 m", "combine c = 1.2 d + 1.5 m"]),
    # many supports (the banded solve), travel limits
    member_text("8 m", ["pin at 0 m", "roller at 2 m", "roller at 4 m", "roller at 6 m", "roller at span"],
                {"m": ["moving 9 kN and 7 kN down spaced 0.45 m from 1 m to 7 m"]}),
]


def _positions(env_load, offsets, sol):
    """Every event (a force on a breakpoint, the travel's ends) and a point inside each p interval."""
    events = _events(sol.xs, offsets, env_load)
    return events + [(a + b) / 2 for a, b in zip(events, events[1:])] + [events[0] + Fraction(1, 7)]


@pytest.mark.parametrize("k", range(len(MEMBERS)))
def test_standing_group_equals_the_solved_static_case(k):
    a = analyse_text(MEMBERS[k])
    sol = a.solution
    checked = 0
    for t in sol.targets:
        moving = sol.member.moving(t.name)
        if moving is None:
            continue
        factor, load = moving
        floats = FloatCells(kernels_for(sol, load), t, factor)
        static = tuple(scaled(ld, f) for f, ld in factored_loads(sol, t))
        for rev in (False, True):
            offsets = group_offsets(load, rev)
            for p in _positions(load, offsets, sol):
                wheels = _wheels(load, offsets, p)
                curves = curves_with(sol, static + tuple(PointLoad(x, factor * F, load.span) for x, F in wheels))
                group = standing(floats, factor, wheels)
                for q in ("v", "theta", "M"):
                    for x0 in sol.xs:
                        assert value_at(group, q, x0) == _curve(curves, q).at(x0)
                for j, (force, moment) in enumerate(curves.reactions):
                    assert (reaction_at(group, "R", j), reaction_at(group, "Rm", j)) == (force, moment)
                pieces, parts = _pieces(group)
                assert [a for a, _, _ in pieces] == list(curves.v.xs[:-1])
                for q in ("v", "theta", "M", "V"):
                    assert [_piece(group, q, s, part) for (_, _, s), part in zip(pieces, parts)] == \
                        list(_curve(curves, q).pieces)
                checked += 1
    assert checked > 20
