"""The least I and S that pass, against a case worked by hand."""

from __future__ import annotations

from fractions import Fraction as F

from engine_helpers import E, analyse_text, member_text


def test_required_I_and_S_of_a_simple_span_worked_by_hand():
    # by hand: simple span L = 6 m, w = 5 kN/m; d = 5 w L^4 / (384 E I) must not exceed L/360, so
    # I_req = 5 w L^4 * 360 / (384 E L); M = w L^2 / 8 must not exceed fy S, so S_req = w L^2 / (8 fy)
    text = member_text("6 m", ["pin at 0 m", "roller at span"], {"a": ["uniform 5 kN/m down"]},
                       extra=["limit deflection a span/360", "check stress a"])
    req = analyse_text(text).required
    w, L, fy = F(5000), F(6), F(250 * 10**6)
    assert req.I == 5 * w * L**4 * 360 / (384 * E * L)
    assert req.S == w * L**2 / (8 * fy)
    assert (req.I_check.kind, req.S_check.kind) == ("deflection", "bending stress")


def test_the_strictest_limit_governs():
    text = member_text("6 m", ["fixed at 0 m", "fixed at span"], {"a": ["point 10 kN down at span/2"]},
                       extra=["limit deflection a span/360", "limit deflection a 2 mm"])
    req = analyse_text(text).required
    # P L^3 / (192 E I) <= 2 mm  ->  I_req = P L^3 / (192 E * 0.002)
    assert req.I == F(10000) * 216 / (192 * E * F(2, 1000)) and req.I_check.basis == "absolute limit"
    assert req.S is None


def test_not_computed_with_a_spring():
    text = member_text("6 m", ["pin at 0 m", "spring 5 kN/mm at span"], {"a": ["uniform 5 kN/m down"]},
                       extra=["limit deflection a span/360"])
    req = analyse_text(text).required
    assert req.I is None and req.note.startswith("not computed: with springs or settlements")
