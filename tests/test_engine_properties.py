"""Engine invariants on generated members, and the classic superposition traps as regression tests."""

from __future__ import annotations

from fractions import Fraction as F

import numpy as np
from engine_helpers import analyse_text, member_text, result
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from strategies import members

from beamlang.engine.fem import MIN_ELEMENT, element_stiffness, fe_nodes
from beamlang.engine.roots import roots_in
from beamlang.engine.statics import _changes, intensity, resultant
from beamlang.model import LineLoad, MomentLoad, PointLoad
from beamlang.poly import Poly

SETTINGS = settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])


def _case_loads(a, name):
    return a.loaded.member.case(name).loads


@SETTINGS
@given(members())
def test_equilibrium_continuity_and_supports_are_exact(text):
    a = analyse_text(text)
    m = a.loaded.member
    for t in a.solution.targets:
        if t.kind != "case":
            continue
        c = t.curves
        force, moment = resultant(_case_loads(a, t.name))
        assert force + sum(f for f, _ in c.reactions) == 0
        assert moment + sum(f * sp.x + mo for sp, (f, mo) in zip(m.supports, c.reactions)) == 0
        hinges = {h.x for h in m.hinges}
        for k in range(1, len(a.solution.xs) - 1):
            x = a.solution.xs[k]
            assert c.v.pieces[k - 1](x) == c.v.pieces[k](x)
            if x in hinges:  # the slope may jump; the moment is zero from both sides
                assert c.M.pieces[k - 1](x) == 0 == c.M.pieces[k](x)
            else:
                assert c.theta.pieces[k - 1](x) == c.theta.pieces[k](x)
        for sp, (f, _) in zip(m.supports, c.reactions):
            if sp.kind == "spring":
                assert c.v.at(sp.x) == -f / sp.stiffness
            else:
                assert c.v.at(sp.x) == 0
            if sp.kind == "fixed":
                assert c.theta.at(sp.x) == 0


@SETTINGS
@given(members())
def test_finite_elements_agree(text):
    # the float solve agrees to 1e-9 of the largest value; an element shorter than 1/500 of the member (a
    # section change 1 mm from a support, say) costs it about a digit, even with its refinement
    a = analyse_text(text)
    member = a.loaded.member
    nodes = fe_nodes(member, ())
    short = min(right - left for left, right in zip(nodes, nodes[1:])) < member.length * MIN_ELEMENT
    assert all(r.cross_check < (1e-8 if short else 1e-9) for r in a.results)


@settings(max_examples=100, deadline=None)
@given(st.lists(st.tuples(st.floats(1e-3, 1e3), st.floats(0, 10), st.floats(1e-3, 50)), min_size=1, max_size=8))
def test_stacked_element_stiffnesses_are_each_element_own(elements):
    # the cross-check assembles every element's matrix at once: bit for bit the matrix of each element alone
    EI, phi, l = (np.array(v, dtype=np.longdouble) for v in zip(*elements))
    stacked = element_stiffness(EI, phi, l)
    for k in range(len(l)):
        assert np.array_equal(stacked[k], element_stiffness(EI[k], phi[k], l[k]))


def test_finite_elements_stay_accurate_beside_a_very_short_element():
    # a moment 1 mm from the tip of a 4 m cantilever: with a node there the float solve lost five
    # digits (6.5e-5, found by hypothesis); the load now goes to the element's nodes consistently
    text = member_text("4 m", ["fixed at 0 m"], {"a": ["moment 12 kN*m clockwise at span - 1 mm",
                                                        "point 10 kN up at span"]})
    assert analyse_text(text).results[0].cross_check < 1e-12


def test_combination_equals_sum_of_cases():
    text = member_text("6 m", ["pin at 0 m", "roller at 4 m"],
                       {"a": ["point 10 kN down at 2 m", "uniform 1 kN/m up from 1 m to 5 m"],
                        "b": ["moment 3 kN*m clockwise at 5 m", "linear 1 kN/m to 2 kN/m down from 0 m to span"],
                        "both": ["point 10 kN down at 2 m", "uniform 1 kN/m up from 1 m to 5 m",
                                 "moment 3 kN*m clockwise at 5 m", "linear 1 kN/m to 2 kN/m down from 0 m to span"]},
                       extra=["combine sum = a + b", "combine scaled = 1.2 a + 1.6 b"])
    s = analyse_text(text).solution
    assert s.target("sum").curves == s.target("both").curves
    expected = s.target("a").curves.scaled(F(6, 5)) + s.target("b").curves.scaled(F(8, 5))
    assert s.target("scaled").curves == expected


def test_mirror_symmetry():
    left = member_text("6 m", ["fixed at 0 m", "roller at 4 m"],
                       {"a": ["point 10 kN down at 1 m", "moment 2 kN*m clockwise at 5 m",
                              "linear 1 kN/m to 3 kN/m down from 2 m to 6 m"]})
    right = member_text("6 m", ["fixed at span", "roller at 2 m"],
                        {"a": ["point 10 kN down at 5 m", "moment 2 kN*m counterclockwise at 1 m",
                               "linear 3 kN/m to 1 kN/m down from 0 m to 4 m"]})
    cl, cr = analyse_text(left).solution.targets[0].curves, analyse_text(right).solution.targets[0].curves
    for x in [F(k, 4) for k in range(25)]:
        assert cl.v.at(x) == cr.v.at(6 - x)
        assert cl.theta.at(x) == -cr.theta.at(6 - x)


def test_deflection_scales_as_one_over_EI():
    base = member_text("6 m", ["pin at 0 m", "roller at 3 m", "roller at span"],
                       {"a": ["point 10 kN down at 4 m", "uniform 2 kN/m down"]})
    stiffer = base.replace("E 200 GPa", "E 400 GPa")
    a, b = (analyse_text(t).solution.targets[0].curves for t in (base, stiffer))
    assert a.v * F(1, 2) == b.v and a.M == b.M and a.reactions == b.reactions


def test_spring_support_settles_by_reaction_over_stiffness():
    # simple span, right end on a spring: mid-span deflection = P L^3 / (48 E I) + (P / 2) / k / 2 (statics)
    r, a = result(member_text("6 m", ["pin at 0 m", "spring 2 kN/mm at span"], {"a": ["point 10 kN down at span/2"]},
                              extra=["report deflection at span/2"]))
    EI = a.loaded.member.stretches[0].EI
    assert r.points[0][1] == -(F(10000) * 216 / (48 * EI) + F(5000) / (2 * 10**6) / 2)


def test_double_roots_are_found_once():
    # (x - 1)^2 (x - 3) and (x - 27/10)^2 (x^2 + 1): the double root is a single, exact root
    assert [r.x for r in roots_in(Poly.of(1, -2, 1) * Poly.of(-3, 1), F(0), F(5))] == [1, 3]
    p = Poly.of(F(-27, 10), 1) * Poly.of(F(-27, 10), 1) * Poly.of(1, 0, 1)
    assert [r.exact for r in roots_in(p, F(0), F(5))] == [F(27, 10)]
    close = Poly.of(F(-1), 1) * Poly.of(F(-1) - F(1, 10**15), 1)  # two roots 1e-15 apart
    assert len(roots_in(close, F(0), F(2))) == 2


def test_symmetric_beam_reports_both_places_of_the_maximum():
    # two equal loads placed symmetrically on a fixed-fixed beam: the largest moment sits at both ends
    r, _ = result(member_text("6 m", ["fixed at 0 m", "fixed at span"],
                              {"a": ["point 10 kN down at 2 m", "point 10 kN down at 4 m"]}))
    assert r.moment_negative.x_all == (0, 6) and r.max_down.x == 3


# --- the classic traps ---------------------------------------------------------------------------

def _dense_minimum(curves, L, n=200001):
    xs = [F(k) * L / (n - 1) for k in range(n)]
    values = [curves.v.at(x) for x in xs[:: 1]]
    k = int(np.argmin([float(v) for v in values]))
    return float(xs[k]), float(values[k])


def test_trap_true_maximum_is_neither_at_midspan_nor_under_the_load():
    text = member_text("6 m", ["pin at 0 m", "roller at span"],
                       {"a": ["uniform 5 kN/m down from 0 m to 2 m", "point 10 kN down at 4.5 m"],
                        "udl": ["uniform 5 kN/m down from 0 m to 2 m"], "pt": ["point 10 kN down at 4.5 m"]})
    a = analyse_text(text)
    r = {t.name: t for t in a.results}
    true = r["a"].max_down
    x_dense, v_dense = _dense_minimum(a.solution.target("a").curves, F(6), n=20001)
    assert abs(float(true.x) - x_dense) < 6 / 20000 and abs(float(true.value) - v_dense) <= 1e-9 * abs(v_dense)
    assert float(true.value) <= v_dense  # the exact extremum is never above a sampled one
    assert true.x not in (3, F(9, 2))
    naive = r["udl"].max_down.value + r["pt"].max_down.value  # adding each load's own maximum
    assert naive < true.value and float((true.value - naive) / true.value) < -0.01  # overstated by more than 1 %


def test_trap_reversed_moment_flips_the_deflection():
    cw, _ = result(member_text("6 m", ["pin at 0 m", "roller at span"], {"a": ["moment 5 kN*m clockwise at span/2"]}))
    ccw, _ = result(member_text("6 m", ["pin at 0 m", "roller at span"], {"a": ["moment 5 kN*m counterclockwise at span/2"]}))
    assert cw.max_down.value == -ccw.max_up.value and cw.max_up.value == -ccw.max_down.value
    assert cw.max_down.x == ccw.max_up.x


def test_trap_overhang_tip_goes_up_while_the_span_goes_down():
    r, _ = result(member_text("6 m", ["pin at 0 m", "roller at 4.5 m"], {"a": ["uniform 5 kN/m down from 0 m to 4.5 m"]},
                              extra=["limit deflection a span/360"]))
    assert r.max_down.x < F(9, 2) and r.max_down.value < 0
    assert r.max_up.x == 6 and r.max_up.value > 0
    overhang = r.regions[-1]
    assert overhang.kind == "overhang" and overhang.basis == 3  # twice the 1.5 m overhang


def test_model_loads_keep_their_kinds():
    a = analyse_text(member_text("6 m", ["pin at 0 m", "roller at span"],
                                 {"a": ["point 1 kN down at 1 m", "moment 1 kN*m clockwise at 2 m", "uniform 1 kN/m up"]}))
    kinds = [type(l) for l in a.loaded.member.cases[0].loads]
    assert kinds == [PointLoad, MomentLoad, LineLoad]


@settings(max_examples=200, deadline=None)
@given(st.integers(-60, 60), st.integers(-60, 60), st.integers(1, 40), st.integers(-20, 20), st.integers(1, 9),
       st.sampled_from([1, -1, F(-1, 48000), F(7, 3)]))
def test_quadratic_roots_in_closed_form_agree_with_the_general_search(b, c, scale, a, w, lead):
    # a quadratic's roots come from its discriminant; the same polynomial times a factor whose root lies far
    # outside the interval goes through the Sturm search: both must find the same roots, equally exact
    p = Poly.of(F(c, scale), F(b, scale), 1) * lead
    lo, hi = F(a, 4), F(a, 4) + F(w, 3)
    direct = roots_in(p, lo, hi)
    general = roots_in(p * Poly.of(-(hi + 10), 1), lo, hi)
    assert len(direct) == len(general)
    for r1, r2 in zip(direct, general):
        assert (r1.exact is None) == (r2.exact is None)
        assert abs(r1.x - r2.x) <= max(abs(r1.x), F(1, 10**6)) * F(1, 2**54)
        assert r1.lo <= r1.x <= r1.hi and p(r1.lo) * p(r1.hi) <= 0  # a true bracket of a root of p


@settings(max_examples=200, deadline=None)
@given(st.tuples(*[st.fractions(-10**4, 10**4, max_denominator=1000)] * 3), st.integers(1, 10**4), st.booleans())
def test_line_load_changes_are_the_integrals_of_its_intensity(values, width, uniform):
    # the written-out changes of V and M against the reference: W and T integrated as polynomials
    x1, w1, w2 = values
    load = LineLoad(x1, x1 + F(width, 7), w1, w1 if uniform else w2, "linear", None)
    x = Poly.of(0, 1)
    w = intensity(load)
    W, T = w.antiderivative(), (w * x).antiderivative()
    inside_v = W - Poly.of(W(load.x1))
    inside_m = x * inside_v - (T - Poly.of(T(load.x1)))
    total = W(load.x2) - W(load.x1)
    beyond_m = x * total - Poly.of(T(load.x2) - T(load.x1))
    expected = [(load.x1, inside_v, inside_m), (load.x2, Poly.of(total) - inside_v, beyond_m - inside_m)]
    assert _changes(load) == expected
    assert resultant([load]) == (total, T(load.x2) - T(load.x1))


@settings(max_examples=200, deadline=None)
@given(st.fractions(-10**4, 10**4, max_denominator=1000), st.fractions(-10**4, 10**4, max_denominator=1000))
def test_point_load_changes_are_its_force_and_moment(at, force):
    x = Poly.of(0, 1)
    assert _changes(PointLoad(at, force, None)) == [(at, Poly.of(force), (x - Poly.of(at)) * force)]


@SETTINGS
@given(members())
def test_real_member_curves_are_the_primary_beam_under_loads_and_redundants(text):
    # the curves are summed from the unit curves; the reference integrates the primary beam under the loads
    # and the redundants found, with their reactions added where they were released
    from beamlang.engine import primary as P
    from beamlang.engine import solve as S
    sol = analyse_text(text).solution
    primary = sol.primary
    if S._is_banded(sol.member, primary):
        return
    for t in sol.targets:
        if t.kind != "case" or not t.solved.redundants:
            continue
        found = t.solved
        acting = list(found.loads) + [P.unit(sol.member, r, x) for x, r in zip(found.redundants, primary.redundants)]
        ref = P.on_primary(sol.member, sol.xs, sol.EI, primary, acting)
        reactions = list(ref.reactions)
        for x, r in zip(found.redundants, primary.redundants):
            force, moment = reactions[r.support]
            reactions[r.support] = (force + x, moment) if r.kind == "force" else (force, moment + x)
        c = found.curves
        assert (c.V, c.M, c.theta, c.v, c.vs, c.reactions) == (ref.V, ref.M, ref.theta, ref.v, ref.vs, tuple(reactions))
