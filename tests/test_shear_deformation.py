"""Shear deformation (`include shear deformation`): closed forms, and an indeterminate member against an
independent Timoshenko finite-element model written here.

Sources (from memory, edition as remembered):
- [Gere] J. M. Gere and S. P. Timoshenko, Mechanics of Materials, the section on shear deformation of beams:
  the shear deflection of a cantilever with a tip load is P L / (kappa G A) (their f_s P L / (G A), f_s = 1/kappa),
  of a simple span under a uniform load w L^2 / (8 kappa G A) at midspan; f_s = 6/5 for a rectangle.
- [Roark] W. C. Young and R. G. Budynas, Roark's Formulas for Stress and Strain, 7th ed., section 8.10
  (shear deflection added to the bending deflection of short, deep beams).
"""

from __future__ import annotations

from fractions import Fraction as F

import numpy as np
import pytest

from beamlang.errors import BeamError
from engine_helpers import analyse_text, member_text, result

E, G = F(200 * 10**9), F(80 * 10**9)
B, H = F(1, 10), F(2, 5)  # rectangle 100 mm x 400 mm
A = B * H
I = B * H**3 / 12
KGA = F(5, 6) * G * A  # kappa = 5/6 for a rectangle [Gere]
MATERIAL = "steel E 200 GPa G 80 GPa yield 355 MPa"
SECTION = "rectangle width 100 mm depth 400 mm"
SHEAR = ["include shear deformation"]


def _member(span, supports, loads, extra=SHEAR, material=MATERIAL):
    return member_text(span, supports, {"a": loads}, extra, material=material, section=SECTION)


def test_cantilever_tip_load_adds_PL_over_kappa_GA():
    # [Gere]: tip deflection P L^3 / (3 E I) + P L / (kappa G A), exactly
    P, L = F(10000), F(2)
    r, a = result(_member("2 m", ["fixed at 0 m"], ["point 10 kN down at span"]))
    assert r.max_down.value == -(P * L**3 / (3 * E * I) + P * L / KGA)
    check_free = r.max_down.x == L
    assert check_free
    assert r.deflection_parts(r.max_down) == (-P * L**3 / (3 * E * I), -P * L / KGA)
    assert r.cross_check <= 1e-9  # the shear-flexible elements of the cross-check agree


def test_simple_span_uniform_load_adds_wL2_over_8_kappa_GA():
    # [Gere], [Roark]: midspan deflection 5 w L^4 / (384 E I) + w L^2 / (8 kappa G A), exactly
    w, L = F(20000), F(3)
    r, _ = result(_member("3 m", ["pin at 0 m", "roller at span"], ["uniform 20 kN/m down"]))
    assert r.max_down.x == L / 2
    assert r.max_down.value == -(5 * w * L**4 / (384 * E * I) + w * L**2 / (8 * KGA))
    # the reactions of a determinate member do not depend on the stiffness
    assert [f for _, f, _ in r.reactions] == [w * L / 2, w * L / 2]


def test_without_the_statement_G_changes_nothing():
    with_g, _ = result(_member("3 m", ["pin at 0 m", "roller at span"], ["uniform 20 kN/m down"], extra=[]))
    plain, _ = result(_member("3 m", ["pin at 0 m", "roller at span"], ["uniform 20 kN/m down"], extra=[],
                              material="steel E 200 GPa yield 355 MPa"))
    assert with_g.max_down == plain.max_down
    assert with_g.deflection_parts(with_g.max_down) is None


def test_material_properties_in_any_order():
    one, _ = result(_member("2 m", ["fixed at 0 m"], ["point 10 kN down at span"],
                            material="steel G 80 GPa yield 355 MPa E 200 GPa"))
    two, _ = result(_member("2 m", ["fixed at 0 m"], ["point 10 kN down at span"]))
    assert one.max_down == two.max_down


def test_shear_deformation_without_G_is_an_error_at_the_statement():
    text = _member("2 m", ["fixed at 0 m"], ["point 10 kN down at span"], material="steel E 200 GPa")
    with pytest.raises(BeamError) as exc:
        analyse_text(text)
    (d,) = exc.value.diagnostics
    assert d.message == "shear deformation needs the material's shear modulus G"
    line = text.splitlines()[d.span.line - 1]
    assert line[d.span.col - 1:].startswith("include shear deformation")


def _propped_reaction_closed_form(w, L, EI, kGA):
    # unit-load method on the cantilever fixed at 0 with the prop's force released at L:
    # tip deflection under w: w L^4 / (8 EI) + w L^2 / (2 kGA); under a unit upward force: L^3 / (3 EI) + L / kGA
    return (w * L**4 / (8 * EI) + w * L**2 / (2 * kGA)) / (L**3 / (3 * EI) + L / kGA)


def _timoshenko_fem_reaction(w, L, EI, kGA, n=4000):
    """An independent Timoshenko model: two-node elements, w and theta interpolated linearly, the shear term
    integrated at one point (reduced integration, which avoids locking); fixed at 0, roller at L; the reaction
    at the roller is read from K u - F there. Converges as h^2."""
    l = L / n
    kb = EI / l * np.array([[0, 0, 0, 0], [0, 1, 0, -1], [0, 0, 0, 0], [0, -1, 0, 1]])
    g = np.array([-1 / l, -0.5, 1 / l, -0.5])  # shear strain w' - theta at the element's middle
    k = kb + kGA * l * np.outer(g, g)
    K = np.zeros((2 * n + 2, 2 * n + 2))
    F_ = np.zeros(2 * n + 2)
    for e in range(n):
        d = slice(2 * e, 2 * e + 4)
        K[d, d] += k
        F_[2 * e] -= w * l / 2
        F_[2 * e + 2] -= w * l / 2
    fixed = [0, 1, 2 * n]
    free = [i for i in range(2 * n + 2) if i not in fixed]
    u = np.zeros(2 * n + 2)
    u[free] = np.linalg.solve(K[np.ix_(free, free)], F_[free])
    return (K @ u - F_)[2 * n]


def test_propped_cantilever_reaction_changes_with_shear_flexibility():
    w, L = F(20000), F(3)
    text = _member("3 m", ["fixed at 0 m", "roller at span"], ["uniform 20 kN/m down"])
    r, _ = result(text)
    prop = r.reactions[1][1]
    assert prop == _propped_reaction_closed_form(w, L, E * I, KGA)  # exact
    fem = _timoshenko_fem_reaction(float(w), float(L), float(E * I), float(KGA))
    assert abs(float(prop) - fem) / fem < 1e-6
    bending_only, _ = result(_member("3 m", ["fixed at 0 m", "roller at span"], ["uniform 20 kN/m down"], extra=[]))
    assert bending_only.reactions[1][1] == 3 * w * L / 8  # [Gere] propped cantilever, uniform load
    # shear flexibility softens the cantilever's tip more, relative to its bending, under the prop's own force
    # (L / kGA against L^3 / 3EI) than under the load: the prop takes more, towards w L / 2 for a shear-only beam
    assert 3 * w * L / 8 < prop < w * L / 2
    assert (prop - 3 * w * L / 8) / prop > F(1, 300)  # 0.44 % for this deep member: well above rounding
    assert r.cross_check <= 1e-9


def test_hinged_stepped_spring_member_agrees_with_the_shear_flexible_elements():
    text = "\n".join([
        'member T-2 "Test"', "span 6 m",
        "material steel E 200 GPa G 77 GPa",
        "section I-shape depth 400 mm flange 150 mm x 12 mm web 8 mm from 0 m to 2.5 m",
        "section box width 200 mm depth 300 mm wall 10 mm from 2.5 m to span",
        "include shear deformation",
        "support fixed at 0 m", "hinge at 1.5 m", "support spring 8 kN/mm at 3 m", "support pin at 4.5 m",
        "support roller at span",
        "case a", "  point 10 kN down at 1 m", "  uniform 3 kN/m down from 2 m to 5 m",
        "  linear 0 kN/m to 6 kN/m down from 4 m to span", "  moment 4 kN*m clockwise at 5.5 m", ""])
    r, a = result(text)
    assert r.cross_check <= 1e-9
    c = a.solution.target("a").curves
    # the section's rotation is zero at the fixed end; the deflection's slope there is the shear strain
    assert c.theta.at(F(0)) == 0 and c.v.at(F(0)) == 0
    V0 = c.V.at(F(0))
    assert c.slope.at(F(0)) == -V0 / (F(77 * 10**9) * F(4, 10) * F(8, 1000))  # I-shape: kappa A = h t_w


def test_the_package_shows_both_parts():
    from beamlang.report.checks_md import checks_detail
    from beamlang.report.sections import section_properties
    text = _member("2 m", ["fixed at 0 m"], ["point 10 kN down at span"], extra=SHEAR + ["limit deflection a span/180"])
    a = analyse_text(text)
    md = "\n".join(checks_detail(a) + section_properties(a))
    assert "| bending, $v_b$ | -0.25 | 97.1 % |" in md
    assert "| shear, $v_s$ | -0.0075 | 2.9 % |" in md
    assert "kappa = 5/6 of A" in md


def test_a_moving_group_with_shear_deformation_is_never_beaten_by_a_standing_one():
    head = ["include shear deformation", "limit deflection a span/400"]
    sups = ["fixed at 0 m", "roller at 4 m"]
    moving, _ = result(_member("6 m", sups, ["moving 20 kN and 15 kN down spaced 1.2 m"], extra=head))
    worst = 0
    for k in range(0, 61):  # the group standing every 0.1 m, either way round, a force off the member left out
        p = F(k, 10)
        for first, second in (("20", "15"), ("15", "20")):
            loads = [f"point {first} kN down at {float(p)} m"] + ([f"point {second} kN down at {float(p + F(6, 5))} m"]
                                                                 if p + F(6, 5) <= 6 else [])
            r, _ = result(_member("6 m", sups, loads, extra=head))
            worst = min(worst, r.max_down.value)
    assert moving.max_down.value <= worst  # the envelope is at least as far down as every standing position
    assert (worst - moving.max_down.value) / -worst < F(1, 100)  # and close to the best of them
