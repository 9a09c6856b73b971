"""Area loads over a tributary width and lengths written in parts: exact values (unit factors from NIST SP 811,
Appendix B: 1 ft = 0.3048 m, 1 in = 0.0254 m, 1 lbf = 4.4482216152605 N, all exact) and what the package shows."""

from __future__ import annotations

from fractions import Fraction as F

from engine_helpers import analyse_text

from beamlang.language.frontend import from_source
from beamlang.source import Source

FT, IN, LBF = F("0.3048"), F("0.0254"), F("4.4482216152605")  # NIST SP 811, exact
PSF = LBF / FT**2


def _member(loads: list[str], span: str = "22 ft 6 in", extra: list[str] = ()) -> str:
    lines = ['member J-1 "Test joist"', f"span {span}", "material timber E 1400 ksi yield 1.1 ksi",
             "section rectangle width 1.5 in depth 9.25 in", "support pin at 0 ft", "support roller at span",
             "case live"] + ["  " + ld for ld in loads] + list(extra)
    return "\n".join(lines) + "\n"


def _model(text: str):
    return from_source(Source("t.beam", text), None).member


def test_a_length_in_parts_is_the_exact_sum_of_its_parts():
    m = _model(_member(["point 1 kip down at 10 ft 3.5 in"]))
    assert m.length == 22 * FT + 6 * IN == F("6.858")
    assert m.cases[0].loads[0].x == 10 * FT + F("3.5") * IN


def test_parts_are_taken_wherever_a_length_is_written():
    m = _model(_member(["uniform 1 plf down from 1 ft 6 in to span - 2 ft 1 in"],
                       extra=["limit deflection live 0 ft 0.5 in"]))
    ld = m.cases[0].loads[0]
    assert ld.x1 == 18 * IN and ld.x2 == m.length - 25 * IN
    assert m.limits[0].value == F("0.5") * IN


def test_uniform_pressure_over_a_tributary_width_is_the_exact_product():
    # 40 psf gathered over 16 in: w = 40 x 16/12 = 160/3 lbf/ft (common practice: pressure times spacing)
    ld = _model(_member(["uniform 40 psf over 16 in down"])).cases[0].loads[0]
    assert ld.w1 == ld.w2 == -40 * PSF * 16 * IN == -F(160, 3) * LBF / FT
    assert ld.width == 16 * IN


def test_linear_and_partial_area_loads():
    m = _model(_member(["uniform 2 kPa over 1.2 m up from 1 ft to 5 ft",
                        "linear 10 psf to 20 psf over 2 ft down from 1 ft 3 in to 5 ft"]))
    part, tri = m.cases[0].loads
    assert part.w1 == 2400 and (part.x1, part.x2) == (FT, 5 * FT)
    assert (tri.w1, tri.w2) == (-10 * PSF * 2 * FT, -20 * PSF * 2 * FT) and tri.x1 == 15 * IN


def test_the_package_shows_the_tributary_product():
    from beamlang.report.superposition_md import loads_table
    a = analyse_text(_member(["uniform 40 psf over 16 in down", "linear 10 psf to 20 psf over 2 ft down from 1 ft to 5 ft"]))
    text = "\n".join(loads_table(a, a.solution.target("live")))
    assert "`40 psf x 16 in = 53.33 plf`" in text
    assert "`10 psf x 2 ft = 20 plf`; `20 psf x 2 ft = 40 plf`" in text


def test_format_keeps_over_and_parts():
    from beamlang.language.fmt import format_document
    from beamlang.language.parse import parse
    text = _member(["uniform 40 psf over 16 in down from 1 ft 6 in to span"], extra=["pattern live"])
    out = format_document(parse(Source("t.beam", text)))
    assert "  uniform 40 psf over 16 in down from 1 ft 6 in to span\n" in out
    assert "span 22 ft 6 in\n" in out and "pattern live\n" in out
    assert format_document(parse(Source("t.beam", out))) == out


def test_a_spacing_in_parts_is_one_spacing_and_two_spacings_need_and():
    m = _model(_member(["moving 2 kip and 2 kip down spaced 3 ft 6 in"]))
    assert m.cases[0].loads[0].offsets == (0, 42 * IN)
    from beamlang.errors import BeamError
    try:
        _model(_member(["moving 2 kip and 2 kip and 1 kip down spaced 3 ft 2 ft"]))
    except BeamError as exc:
        assert [d.message for d in exc.diagnostics] == ["the spacings of a moving group are joined by `and`"]
    else:
        raise AssertionError("`spaced 3 ft 2 ft` must not be read as one length")
