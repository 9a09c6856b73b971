"""The engine against published closed forms.

Sources (all from memory, edition as remembered):
- [Gere] J. M. Gere and B. J. Goodno, Mechanics of Materials, 8th ed., Appendix G: Table G-1
  (deflections and slopes of cantilever beams) and Table G-2 (simple beams).
- [AISC] AISC Steel Construction Manual, 15th ed., Part 3, Table 3-23 "Shears, Moments and
  Deflections" (case numbers as remembered).
- [Roark] W. C. Young and R. G. Budynas, Roark's Formulas for Stress and Strain, 7th ed.,
  Table 8.1 (shear, moment, slope and deflection formulas for elastic straight beams).
Exact closed forms are compared exactly (as Fractions) where the location is rational, and to
1e-12 relative otherwise; a coefficient printed rounded in a handbook is compared only at its
printed precision.
"""

from __future__ import annotations

import math
from fractions import Fraction as F

from engine_helpers import EI, member_text, rel, result

L = F(6)
P = F(10000)
W = F(5000)
SS = ["pin at 0 m", "roller at span"]


def test_simple_centre_point_load():
    # [Gere] G-2 case 4; [AISC] 3-23 case 7: d = P L^3 / (48 E I) at L/2, M = P L / 4
    r, _ = result(member_text("6 m", SS, {"a": ["point 10 kN down at span/2"]}))
    assert r.max_down.value == -P * L**3 / (48 * EI) and r.max_down.x == L / 2
    assert r.moment_positive.value == P * L / 4
    assert r.slope_at_supports[0][1] == -P * L**2 / (16 * EI)  # theta_A = P L^2 / (16 E I)


def test_simple_off_centre_point_load():
    # [Gere] G-2 case 5; [AISC] 3-23 case 8: load at a from the left, b = L - a, a > b:
    # d_max = P b (L^2 - b^2)^(3/2) / (9 sqrt(3) L E I) at x = sqrt((L^2 - b^2) / 3)
    r, _ = result(member_text("6 m", SS, {"a": ["point 10 kN down at 4 m"]}))
    b = 2.0
    x = math.sqrt((36 - b * b) / 3)
    d = 10000 * b * (36 - b * b) ** 1.5 / (9 * math.sqrt(3) * 6 * float(EI))
    assert rel(r.max_down.x, x) < 1e-12 and rel(-r.max_down.value, d) < 1e-12
    assert not r.max_down.exact  # sqrt(32/3) is irrational: kept as an isolated root


def test_simple_uniform():
    # [Gere] G-2 case 1; [AISC] 3-23 case 1: 5 w L^4 / (384 E I), M = w L^2 / 8
    r, _ = result(member_text("6 m", SS, {"a": ["uniform 5 kN/m down"]}))
    assert r.max_down.value == -5 * W * L**4 / (384 * EI) and r.max_down.x == 3
    assert r.moment_positive.value == W * L**2 / 8
    assert r.shear_max.value in (W * L / 2, -W * L / 2)


def test_simple_partial_uniform_over_left_part():
    # [Gere] G-2 case 2 (uniform q over 0..a): for x <= a,
    # v = -q x (a^2 (2L - a)^2 - 2 a (2L - a) x^2 + L x^3) / (24 L E I)
    a = F(2)
    r, _ = result(member_text("6 m", SS, {"a": ["uniform 5 kN/m down from 0 m to 2 m"]},
                              extra=["report deflection at 1 m", "report deflection at 2 m"]))
    for x, v, _ in r.points:
        assert v == -W * x * (a**2 * (2 * L - a) ** 2 - 2 * a * (2 * L - a) * x**2 + L * x**3) / (24 * L * EI)


def test_simple_triangular_load():
    # [Gere] G-2 case 11 / [AISC] 3-23 case 2 (load rising from 0 at the left to w0 at the right):
    # v = -w0 x (7 L^4 - 10 L^2 x^2 + 3 x^4) / (360 L E I); the maximum is at x = L sqrt(1 - sqrt(8/15))
    r, _ = result(member_text("6 m", SS, {"a": ["linear 0 kN/m to 5 kN/m down from 0 m to span"]}))
    x = 6 * math.sqrt(1 - math.sqrt(8 / 15))
    v = -5000 * x * (7 * 6**4 - 10 * 36 * x * x + 3 * x**4) / (360 * 6 * float(EI))
    assert rel(r.max_down.x, x) < 1e-12 and rel(r.max_down.value, v) < 1e-12
    # the handbooks print 0.00652 w0 L^4 / (E I) at 0.5193 L: compare at that printed precision only
    assert round(float(-r.max_down.value * EI / (W * L**4)), 5) == 0.00652
    assert round(float(r.max_down.x / L), 4) == 0.5193


def test_simple_end_moment():
    # [Gere] G-2 case 7 (moment M0 at one end): d_max = M0 L^2 / (9 sqrt(3) E I) at L / sqrt(3) from the other end
    r, _ = result(member_text("6 m", SS, {"a": ["moment 4 kN*m clockwise at 0 m"]}))
    M0 = 4000.0
    assert rel(-r.max_down.value, M0 * 36 / (9 * math.sqrt(3) * float(EI))) < 1e-12
    assert rel(r.max_down.x, 6 - 6 / math.sqrt(3)) < 1e-12
    flipped, _ = result(member_text("6 m", SS, {"a": ["moment 4 kN*m counterclockwise at 0 m"]}))
    assert flipped.max_up.value == -r.max_down.value and flipped.max_down is None  # direction word decides


def test_cantilever_end_load_and_slope():
    # [Gere] G-1 case 4; [AISC] 3-23 case 22: d = P L^3 / (3 E I), theta = P L^2 / (2 E I)
    r, _ = result(member_text("6 m", ["fixed at 0 m"], {"a": ["point 10 kN down at span"]}))
    assert r.max_down.value == -P * L**3 / (3 * EI) and r.max_down.x == L
    assert r.slope_max.value == -P * L**2 / (2 * EI)
    assert r.reactions[0][1:] == (P, P * L)  # up force and counterclockwise moment on the beam


def test_cantilever_load_part_way():
    # [Gere] G-1 case 5: load at a: tip deflection P a^2 (3L - a) / (6 E I)
    a = F(4)
    r, _ = result(member_text("6 m", ["fixed at 0 m"], {"a": ["point 10 kN down at 4 m"]}))
    assert r.max_down.value == -P * a**2 * (3 * L - a) / (6 * EI)


def test_cantilever_uniform_and_end_moment():
    # [Gere] G-1 cases 1 and 7: w L^4 / (8 E I); M0 L^2 / (2 E I)
    r, _ = result(member_text("6 m", ["fixed at 0 m"], {"a": ["uniform 5 kN/m down"]}))
    assert r.max_down.value == -W * L**4 / (8 * EI)
    r, _ = result(member_text("6 m", ["fixed at 0 m"], {"a": ["moment 4 kN*m counterclockwise at span"]}))
    assert r.max_up.value == 4000 * L**2 / (2 * EI)


def test_cantilever_fixed_at_the_right_end():
    r, _ = result(member_text("6 m", ["fixed at span"], {"a": ["point 10 kN down at 0 m"]}))
    assert r.max_down.value == -P * L**3 / (3 * EI) and r.max_down.x == 0
    assert r.reactions[0][1:] == (P, -P * L)  # clockwise on the beam at a right-hand fixed end


def test_fixed_fixed_uniform_and_centre_load():
    # [AISC] 3-23 cases 15 and 16; [Roark] Table 8.1 case 2e/1e: w L^4/(384 E I), ends -w L^2/12, middle w L^2/24;
    # P L^3 / (192 E I), ends -P L / 8
    both = ["fixed at 0 m", "fixed at span"]
    r, _ = result(member_text("6 m", both, {"a": ["uniform 5 kN/m down"]}))
    assert r.max_down.value == -W * L**4 / (384 * EI) and r.max_down.x == 3
    assert r.moment_negative.value == -W * L**2 / 12 and r.moment_negative.x_all == (0, L)
    assert r.moment_positive.value == W * L**2 / 24
    r, _ = result(member_text("6 m", both, {"a": ["point 10 kN down at span/2"]}))
    assert r.max_down.value == -P * L**3 / (192 * EI)
    assert r.reactions[0][2] == P * L / 8 and r.reactions[1][2] == -P * L / 8


def test_propped_cantilever_uniform():
    # [AISC] 3-23 case 12: prop reaction 3 w L / 8; max w L^4 / (185 E I) at 0.4215 L from the prop.
    # Exact: v = -w x (L^3 - 3 L x^2 + 2 x^3) / (48 E I) with x from the prop; max at x = L (1 + sqrt 33) / 16.
    r, _ = result(member_text("6 m", ["roller at 0 m", "fixed at span"], {"a": ["uniform 5 kN/m down"]}))
    assert r.reactions[0][1] == 3 * W * L / 8
    x = 6 * (1 + math.sqrt(33)) / 16
    v = -5000 * x * (216 - 18 * x * x + 2 * x**3) / (48 * float(EI))
    assert rel(r.max_down.x, x) < 1e-12 and rel(r.max_down.value, v) < 1e-12
    coefficient = float(W * L**4 / (-r.max_down.value * EI))
    assert round(coefficient, 1) == 184.6 and round(coefficient) == 185
    assert round(float(r.max_down.x / L), 4) == 0.4215


def test_two_span_continuous_uniform():
    # [AISC] 3-23 case 29 (two equal spans, uniform): end reactions 3wl/8, middle 10wl/8, M at middle -wl^2/8
    l = F(3)
    r, _ = result(member_text("6 m", ["pin at 0 m", "roller at 3 m", "roller at span"], {"a": ["uniform 5 kN/m down"]}))
    assert [f for _, f, _ in r.reactions] == [3 * W * l / 8, 10 * W * l / 8, 3 * W * l / 8]
    assert r.moment_negative.value == -W * l**2 / 8 and r.moment_negative.x == 3
    # max deflection w l^4 / (185 E I) at 0.4215 l from each end (like a propped cantilever)
    assert round(float(W * l**4 / (-r.max_down.value * EI))) == 185
    assert len(r.max_down.x_all) == 2  # reached in both spans (symmetry)


def test_three_span_continuous_uniform():
    # [AISC] 3-23 case 35 (three equal spans, uniform): reactions 0.4, 1.1, 1.1, 0.4 wl; support moments -0.1 wl^2
    l = F(2)
    r, _ = result(member_text("6 m", ["pin at 0 m", "roller at 2 m", "roller at 4 m", "roller at span"],
                              {"a": ["uniform 5 kN/m down"]}))
    assert [f for _, f, _ in r.reactions] == [F(4, 10) * W * l, F(11, 10) * W * l, F(11, 10) * W * l, F(4, 10) * W * l]
    assert r.moment_negative.value == -W * l**2 / 10 and r.moment_negative.x_all == (2, 4)


def test_us_customary_centre_load_in_inches():
    # [AISC] 3-23 case 7 in kip, in, ksi, in^4: 10 kip at mid-span of 20 ft, E 29000 ksi, I 340 in^4:
    # d = P L^3 / (48 E I) = 10 * 240^3 / (48 * 29000 * 340) in = 0.2920892... in
    text = member_text("20 ft", ["pin at 0 ft", "roller at span"], {"a": ["point 10 kip down at span/2"]},
                       material="E 29000 ksi", section="properties I 340 in^4 depth 12 in")
    r, _ = result(text)
    inches = -r.max_down.value / F("0.0254")
    assert inches == F(10 * 240**3, 48 * 29000 * 340)


def test_settlement_moves_a_determinate_beam_rigidly():
    # a statically determinate beam follows a support movement as a rigid body: no reactions, no moment
    # (statics; common practice, no source)
    r, _ = result(member_text("6 m", SS, {"a": ["settlement 5 mm down at span"]}, extra=["report deflection at 2 m"]))
    assert all(f == 0 and m == 0 for _, f, m in r.reactions)
    assert r.moment_positive is None and r.moment_negative is None
    assert r.points[0][1:] == (-F(5, 1000) * 2 / 6, -F(5, 1000) / 6)


def test_propped_cantilever_with_settled_prop():
    # [Gere] G-1 case 4 read backwards (tip load P gives P L^3 / (3 E I)): a prop settling by D needs
    # R = 3 E I D / L^3, pulling down; the fixed end then carries R L
    D = F(5, 1000)
    r, _ = result(member_text("6 m", ["fixed at 0 m", "roller at span"], {"a": ["settlement 5 mm down at span"]}))
    assert r.reactions[1][1] == -3 * EI * D / L**3 and r.reactions[0][2] == 3 * EI * D / L**2


def test_two_span_beam_with_settled_middle_support():
    # [Gere] G-2 case 4 read backwards (centre load P on span 2l gives P (2l)^3 / (48 E I)): the middle support
    # settling by D changes its reaction by -48 E I D / (2l)^3 and each end reaction by half that, up
    D = F(5, 1000)
    r, _ = result(member_text("6 m", ["pin at 0 m", "roller at 3 m", "roller at span"], {"a": ["settlement 5 mm down at 3 m"]}))
    middle = -48 * EI * D / L**3
    assert [f for _, f, _ in r.reactions] == [-middle / 2, middle, -middle / 2]
