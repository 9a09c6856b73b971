"""Moving loads: the exact envelope against handbook results and against a search over many group positions."""

from __future__ import annotations

from fractions import Fraction

import pytest

from beamlang.engine.extrema import candidates
from beamlang.model import PointLoad
from beamlang.engine.moving import Critical, scaled, standing_case, standing_loads
from beamlang.analysis.results import factored_loads
from beamlang.engine.solve import curves_with
from engine_helpers import EI, analyse_text, member_text

SIMPLE = ["pin at 0 m", "roller at span"]


def _crane(span: str, moving: str, supports=SIMPLE, extra=(), static=()) -> str:
    return member_text(span, supports, {"crane": [moving, *static]}, list(extra))


def test_single_moving_load_on_a_simple_span():
    # Hibbeler, Structural Analysis (8th ed.), ch. 6, influence lines of a simply supported beam (from memory):
    # a single moving force P gives its largest moment P L / 4 at midspan, with the force there; the largest
    # deflection is then P L^3 / (48 E I) (Gere & Goodno, Mechanics of Materials, 8th ed., App. G, Table G-2,
    # case 4, from memory), and the largest reaction tends to P as the force reaches the support.
    a = analyse_text(_crane("6 m", "moving 10 kN down"))
    r = a.result("crane")
    P, L = Fraction(10000), Fraction(6)
    assert r.moment_positive.value == P * L / 4 and r.moment_positive.x == 3
    assert r.position("moment_positive").position == 3
    assert r.max_down.value == -P * L**3 / (48 * EI) and r.max_down.x == 3
    assert r.position("max_down").position == 3
    assert max(abs(f) for _, f, _ in r.reactions) == P
    assert r.shear_max.value in (P, -P)  # a force just beside a support


@pytest.mark.parametrize("s", ["1.5", "2", "0.6"])
def test_two_equal_moving_loads_absolute_maximum_moment(s):
    # Classic result (Hibbeler, Structural Analysis, 8th ed., sec. 6.x "absolute maximum moment", from memory):
    # for two equal loads P at spacing s on a simple span L, the largest moment occurs under a load when the
    # span's centre lies midway between the resultant and that load: x = L/2 - s/4 (or its mirror), with
    # M = P (L - s/2)^2 / (2 L), as long as s < (2 - sqrt 2) L, beyond which one load alone at midspan governs.
    a = analyse_text(_crane("6 m", f"moving 10 kN and 10 kN down spaced {s} m"))
    r = a.result("crane")
    P, L, d = Fraction(10000), Fraction(6), Fraction(s)
    assert r.moment_positive.value == P * (L - d / 2) ** 2 / (2 * L)
    assert r.moment_positive.x in (L / 2 - d / 4, L / 2 + d / 4)


def test_two_loads_far_apart_one_load_governs():
    # The same source: with s > (2 - sqrt 2) L = 0.586 L the single load at midspan gives P L / 4.
    a = analyse_text(_crane("6 m", "moving 10 kN and 10 kN down spaced 4 m"))
    r = a.result("crane")
    assert r.moment_positive.value == Fraction(10000) * 6 / 4 and r.moment_positive.x == 3


def _search(a, name: str, steps: int = 120):
    """Dense reference: the group standing at many positions (both directions), each solved and searched
    exactly like a static case; returns the extremes over all of them."""
    sol, r = a.solution, a.result(name)
    t = sol.target(name)
    env = r.envelope
    static = [scaled(ld, k) for k, ld in factored_loads(sol, t)]
    L = sol.member.length
    lo, hi = env.load.lo - env.load.length, env.load.hi + env.load.length
    worst = {"v+": None, "v-": None, "M+": None, "M-": None}
    for rev in (False, True):
        for k in range(steps + 1):
            p = lo + (hi - lo) * Fraction(k, steps)
            crit = Critical(Fraction(0), Fraction(0), p, rev, "", True)
            wheels = tuple(standing_loads(env, crit))
            curves = curves_with(sol, tuple(static) + wheels)
            for key, curve, d in (("v", curves.v, curves.theta), ("M", curves.M, curves.V)):
                for c in candidates(curve, d, Fraction(0), L):
                    for sign, tag in ((1, "+"), (-1, "-")):
                        if worst[key + tag] is None or sign * c.value > sign * worst[key + tag]:
                            worst[key + tag] = c.value
    return worst


TWO_SPAN = member_text(
    "11 m", ["pin at 0 m", "roller at 4.5 m", "roller at 9.5 m"],
    {"dead": ["uniform 3 kN/m down"],
     "truck": ["moving 30 kN and 50 kN and 20 kN down spaced 1.2 m and 2 m", "point 5 kN down at 7 m"]},
    ["combine service = dead + truck"])


@pytest.fixture(scope="module")
def two_span():
    return analyse_text(TWO_SPAN)


@pytest.mark.parametrize("name", ["truck", "service"])
def test_envelope_dominates_a_dense_search_and_is_attained(two_span, name):
    """Engine-independent of the plane search: every sampled position must stay within the envelope, the
    samples must come close to it, and the envelope's own critical positions must reproduce its values."""
    a, r = two_span, two_span.result(name)
    worst = _search(a, name)
    pairs = (("v-", r.max_down), ("v+", r.max_up), ("M+", r.moment_positive), ("M-", r.moment_negative))
    for key, located in pairs:
        sign = 1 if key.endswith("+") else -1
        assert sign * float(worst[key]) <= sign * float(located.value) * (1 + 1e-12)
        # coarse: a force leaving the member makes the response jump, and a grid lands beside such a jump
        assert abs(float(worst[key]) - float(located.value)) <= 0.15 * abs(float(located.value))
    sol, t = a.solution, a.solution.target(name)
    for field, q in (("max_down", "v"), ("moment_positive", "M"), ("moment_negative", "M")):
        crit = r.position(field)
        curves = curves_with(sol, standing_case(r.envelope, crit, factored_loads(sol, t)))
        curve = curves.v if q == "v" else curves.M
        value = curve.at(crit.x, "left") if crit.how == "under a force" else curve.at(crit.x)
        assert abs(float(value) - float(getattr(r, field).value)) <= 1e-12 * abs(float(value))


def test_envelope_is_linear_in_the_force(two_span):
    doubled = analyse_text(TWO_SPAN.replace("30 kN and 50 kN and 20 kN", "60 kN and 100 kN and 40 kN")
                           .replace("point 5 kN", "point 10 kN"))
    r1, r2 = two_span.result("truck"), doubled.result("truck")
    for field in ("max_down", "max_up", "moment_positive", "moment_negative", "shear_max"):
        assert getattr(r2, field).value == 2 * getattr(r1, field).value


def test_deflection_influence_line_by_maxwell_betti(two_span):
    # Maxwell-Betti reciprocity (any mechanics text): the deflection at a under a unit force at b equals the
    # deflection at b under a unit force at a; the kernels the envelope is built from must honour it.
    sol = two_span.solution
    a, b = Fraction(2), Fraction(7)
    va = curves_with(sol, (PointLoad(b, Fraction(1), sol.member.span),)).v.at(a)
    vb = curves_with(sol, (PointLoad(a, Fraction(1), sol.member.span),)).v.at(b)
    assert va == vb


def test_travel_limits_keep_the_group_on_them():
    # A single force that may only travel over the first metre of a 6 m simple span: the largest moment is
    # with the force at 1 m, M = P a b / L (statics).
    a = analyse_text(_crane("6 m", "moving 10 kN down from 0 m to 1 m"))
    r = a.result("crane")
    assert r.moment_positive.value == Fraction(10000) * 1 * 5 / 6 and r.moment_positive.x == 1


def test_drawn_influence_lines_are_the_handbook_ones():
    # The calc package's figure draws the kernels in floats (sampled by analysis/influence.py); on a simple span they must be the textbook
    # influence lines (Hibbeler, Structural Analysis, 8th ed., ch. 6, from memory): the moment at x0 under a
    # unit force at xi is xi (L - x0) / L left of x0 and x0 (L - xi) / L right of it, and the deflection at x0 is
    # the deflection at xi under a unit force at x0 (Maxwell-Betti), xi (L^2 - xi^2 - b^2) b / (6 L E I) left of x0.
    import numpy as np
    from beamlang.analysis.influence import _Lines
    a = analyse_text(_crane("6 m", "moving 10 kN down"))
    lines = _Lines(a.solution, a.result("crane"))
    L, x0 = 6.0, 2.0
    xi = np.linspace(0.0, 6.0, 61)
    moment = np.where(xi <= x0, xi * (L - x0) / L, x0 * (L - xi) / L)
    down = lambda q, at: -lines.line(q, x0, at)  # noqa: E731  the kernels are for a unit force up
    assert np.allclose(down("M", xi), moment, rtol=0, atol=1e-12)
    b = L - x0
    left = xi <= x0
    v = -xi[left] * (L**2 - xi[left] ** 2 - b**2) * b / (6 * L * float(EI))
    assert np.allclose(down("v", xi[left]), v, rtol=1e-12, atol=1e-18)
