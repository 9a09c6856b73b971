"""The banded stiffness-form solve (engine/banded.py) against the force method, a handbook value for many
equal spans, and the stated limit on supports."""

from __future__ import annotations

from fractions import Fraction

import pytest
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

from engine_helpers import member_text
from strategies import SYSTEMS, loads, members, positions

from beamlang.errors import BeamError
from beamlang.engine import solve as solve_module
from beamlang.engine.banded import solve_banded
from beamlang.language.build import build
from beamlang.language.build.supports import MAX_SUPPORTS
from beamlang.language.parse import parse
from beamlang.source import Source


def member_of(text: str):
    return build(parse(Source("t.beam", text)))


def force_method(member):
    """Every case solved by the force method alone (the banded path switched off)."""
    with pytest.MonkeyPatch.context() as patch:
        patch.setattr(solve_module, "BANDED_FROM", 10**9)
        return solve_module.solve(member)


def assert_same(member, sol) -> None:
    """The banded solution of every case equals the force method's exactly, piece by piece."""
    for t in sol.targets:
        if t.kind != "case":
            continue
        (V, M, theta, v), reactions = solve_banded(member, sol.xs, sol.EI, t.loads,
                                                   solve_module.prescribed(member, t.loads))
        c = t.curves
        assert V.pieces == c.V.pieces and M.pieces == c.M.pieces
        assert theta.pieces == c.theta.pieces and v.pieces == c.v.pieces
        assert reactions == c.reactions


@st.composite
def continuous(draw) -> str:
    """Three to nine supports of every kind (a fixed one only at an end), maybe a hinge, random loads and
    settlements at supports."""
    u = SYSTEMS["si"]
    span = draw(st.integers(6, 20))
    inner = sorted(draw(st.lists(st.integers(1, span * 10 - 1), min_size=1, max_size=7, unique=True)))
    kinds = [draw(st.sampled_from(["pin", "fixed"]))]
    kinds += [draw(st.sampled_from(["roller", "roller", "spring"])) for _ in inner]
    kinds += [draw(st.sampled_from(["roller", "fixed", "spring"]))]
    at = ["0 m"] + [f"{k * 100} mm" for k in inner] + ["span"]
    where = [0] + [k * 100 for k in inner] + [span * 1000]
    sup = [f"{kind} {u['spring']} at {a}" if kind == "spring" else f"{kind} at {a}" for kind, a in zip(kinds, at)]
    extra = []
    taken = set(where)
    if draw(st.booleans()):
        h = draw(st.integers(1, span * 10 - 1).filter(lambda k: k * 100 not in taken))
        extra.append(f"hinge at {h * 100} mm")
        taken.add(h * 100)
    pos = lambda: draw(positions(span, 1000, "m", "mm"))  # noqa: E731
    free = lambda: draw(positions(span, 1000, "m", "mm").filter(lambda p: p[1] not in taken))  # noqa: E731
    body = ["  " + draw(loads(pos, u, free)) for _ in range(draw(st.integers(1, 5)))]
    for a, kind in zip(at, kinds):
        if kind != "fixed" and draw(st.integers(0, 3)) == 0:
            body.append(f"  settlement {draw(st.sampled_from(['2', '5.5']))} mm down at {a}")
    return member_text(f"{span} m", sup, {"a": body}, extra=extra)


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow, HealthCheck.filter_too_much])
@given(continuous())
def test_banded_equals_force_method_on_continuous_members(text):
    try:
        member = member_of(text)
    except BeamError:
        assume(False)  # a hinge that makes a mechanism: reported by the builder, nothing to solve
    assert_same(member, force_method(member))


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(members())
def test_banded_equals_force_method_on_generated_members(text):
    member = member_of(text)
    assert_same(member, force_method(member))


def test_many_supports_take_the_banded_path_and_match_the_force_method():
    """Twelve supports: past BANDED_FROM, so solve() goes banded; the force method gives the same."""
    sup = ["pin at 0 m"] + [f"roller at {3 * k} m" for k in range(1, 11)] + ["spring 4 kN/mm at span"]
    text = member_text("35 m", sup, {"a": ["uniform 2 kN/m down", "point 7 kN down at 4.5 m",
                                           "settlement 3 mm down at 9 m"]})
    member = member_of(text)
    banded = solve_module.solve(member)
    assert len(banded.primary.redundants) >= solve_module.BANDED_FROM
    reference = force_method(member)
    for b, f in zip(banded.targets, reference.targets):
        assert b.curves.v.pieces == f.curves.v.pieces and b.curves.M.pieces == f.curves.M.pieces
        assert b.curves.reactions == f.curves.reactions
        assert b.solved.redundants == f.solved.redundants and b.solved.displacements == f.solved.displacements


def test_many_equal_spans_approach_the_fixed_end_moment():
    """Many equal spans under a uniform load: far from the ends every span acts as fixed-ended, so the
    moment over an interior support tends to -wL^2/12 and its reaction to wL (the infinitely continuous
    beam; from memory, any handbook's continuous-beam table). 300 supports, middle support."""
    n, L, w = 300, Fraction(2), Fraction(3000)
    sup = ["pin at 0 m"] + [f"roller at {2 * k} m" for k in range(1, n)]
    member = member_of(member_text(f"{2 * (n - 1)} m", sup, {"a": ["uniform 3 kN/m down"]}))
    sol = solve_module.solve(member)
    mid = member.supports[n // 2]
    c = sol.target("a").curves
    assert float(c.M.at(mid.x)) == pytest.approx(float(-w * L * L / 12), rel=1e-12)
    assert float(c.reactions[n // 2][0]) == pytest.approx(float(w * L), rel=1e-12)


def supports_text(n: int) -> str:
    sup = ["pin at 0 m"] + [f"roller at {k} m" for k in range(1, n)]
    return member_text(f"{n - 1} m", sup, {"a": ["uniform 1 kN/m down"]})


def test_the_stated_limit_on_supports_is_accepted():
    assert len(member_of(supports_text(MAX_SUPPORTS)).supports) == MAX_SUPPORTS


def test_one_support_past_the_limit_is_reported_at_that_support():
    with pytest.raises(BeamError) as exc:
        member_of(supports_text(MAX_SUPPORTS + 1))
    (d,) = exc.value.diagnostics
    assert d.message == f"a member has at most {MAX_SUPPORTS} supports; this is support {MAX_SUPPORTS + 1} of {MAX_SUPPORTS + 1}"
    assert d.span.line == 4 + MAX_SUPPORTS + 1  # member, span, material, section, then the supports
    assert d.span.col == 1
    assert "split the member" in d.hint
