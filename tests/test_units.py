"""Units at the edge: exact SI factors against NIST SP 811, and the wrong-kind error for every keyword."""

from __future__ import annotations

from fractions import Fraction

import pytest

from beamlang.language.build import build
from beamlang.errors import BeamError
from beamlang.language.parse import parse
from beamlang.source import Source
from beamlang.language.units import factor_of

# NIST Special Publication 811 (2008 edition), Appendix B: exact factors.
# 1 ft = 0.3048 m; 1 in = 0.0254 m; 1 lbf = 4.4482216152605 N; 1 lb = 0.45359237 kg;
# 1 kip = 1000 lbf; 1 psi = 1 lbf/in^2.
LBF = Fraction("4.4482216152605")
INCH = Fraction("0.0254")
FOOT = Fraction("0.3048")
NIST = {
    "ft": FOOT, "in": INCH, "lbf": LBF, "kip": 1000 * LBF, "psi": LBF / INCH**2,
    "ksi": 1000 * LBF / INCH**2, "kip/ft": 1000 * LBF / FOOT, "lbf/ft": LBF / FOOT,
    "kip*ft": 1000 * LBF * FOOT, "kip*in": 1000 * LBF * INCH, "lbf*ft": LBF * FOOT,
    "in^4": INCH**4, "in^2": INCH**2, "in^3": INCH**3, "lb/ft^3": Fraction("0.45359237") / FOOT**3,
    "lb/in^3": Fraction("0.45359237") / INCH**3, "kip/in": 1000 * LBF / INCH,
    # SI prefixes are exact by definition (SI Brochure, 9th edition).
    "mm": Fraction(1, 1000), "kN": 1000, "kN*m": 1000, "kN\u00b7m": 1000, "kN/m": 1000, "N/mm": 1000,
    "kN/mm": 10**6, "MPa": 10**6, "GPa": 10**9, "mm^4": Fraction(1, 10**12), "cm^4": Fraction(1, 10**8),
    "mm^2": Fraction(1, 10**6), "kg/m^3": 1,
    # US trade shorthands (common practice, no source) built from the NIST factors above.
    "plf": LBF / FOOT, "klf": 1000 * LBF / FOOT, "psf": LBF / FOOT**2, "ksf": 1000 * LBF / FOOT**2,
    "pcf": Fraction("0.45359237") / FOOT**3,
}


@pytest.mark.parametrize("unit", sorted(NIST))
def test_exact_factor_matches_nist_sp811(unit):
    assert factor_of(unit).factor == NIST[unit]


def test_decimal_text_is_converted_exactly():
    doc = parse(Source("t.beam", BASE.replace("span 4 m", "span 13.2 ft")))
    member = build(doc)
    assert member.length == Fraction(132, 10) * FOOT  # never through a float
    assert member.material.E == 200 * 10**9 and member.cases[0].loads[0].w1 == -1000


BASE = '''member T-1 "Test beam"
span 4 m
material steel E 200 GPa yield 250 MPa density 7850 kg/m^3
section rectangle width 100 mm depth 200 mm
support pin at 0 m
support roller at span
support spring 5 kN/mm at 2 m
case dead
  uniform 1 kN/m down
  point 2 kN down at 1 m
  linear 0 kN/m to 2 kN/m down from 1 m to 3 m
  moment 3 kN*m clockwise at 1 m
limit deflection dead 20 mm
'''

WRONG_KIND = [
    ("span 4 m", "span 4 kN", "2:6", 'the span must be a length (e.g. "10 m"); got "4 kN", which is a force'),
    ("E 200 GPa", "E 200 kN", "3:18", 'the elastic modulus E must be a stress (e.g. "10 MPa"); got "200 kN", which is a force'),
    ("yield 250 MPa", "yield 250 kN/m", "3:32",
     'the yield strength must be a stress (e.g. "10 MPa"); got "250 kN/m", which is a force per length'),
    ("density 7850 kg/m^3", "density 77 kN/m^3", "3:48",
     'the density must be a density (e.g. "10 kg/m^3"); got "77 kN/m^3", which is not a unit this language uses'),
    ("width 100 mm", "width 100 mm^2", "4:25", 'the width must be a length (e.g. "10 m"); got "100 mm^2", which is an area'),
    ("support spring 5 kN/mm", "support spring 5 kN", "7:16",
     'a spring stiffness must be a force per length (e.g. "10 kN/m"); got "5 kN", which is a force'),
    ("uniform 1 kN/m", "uniform 1 kN*m", "9:11",
     'a uniform load must be a force per length (e.g. "10 kN/m"); got "1 kN*m", which is a moment'),
    ("point 2 kN", "point 2 kN/m", "10:9",
     'a point load must be a force (e.g. "10 kN"); got "2 kN/m", which is a force per length'),
    ("linear 0 kN/m", "linear 0 kN", "11:10",
     'a linear load must be a force per length (e.g. "10 kN/m"); got "0 kN", which is a force'),
    ("moment 3 kN*m", "moment 3 kN/m", "12:10",
     'a concentrated moment must be a force times a length (e.g. "10 kN*m"); got "3 kN/m", which is a force per length'),
    ("at 1 m\n  linear", "at 1 kg\n  linear", "10:22",
     'load position must be a length (e.g. "10 m"); got "1 kg", which is not a unit this language uses'),
    ("dead 20 mm", "dead 20 kN", "13:23",
     'a deflection limit must be a length (e.g. "10 m"); got "20 kN", which is a force'),
]


@pytest.mark.parametrize("old,new,where,message", WRONG_KIND, ids=[w[1] for w in WRONG_KIND])
def test_wrong_kind_is_named(old, new, where, message):
    assert old in BASE
    with pytest.raises(BeamError) as info:
        build(parse(Source("t.beam", BASE.replace(old, new, 1))))
    first = info.value.diagnostics[0]
    assert f"{first.span.line}:{first.span.col}" == where
    assert first.message == message


def test_section_properties_wrong_kind():
    text = BASE.replace("section rectangle width 100 mm depth 200 mm", "section properties I 8e7 mm^3 depth 200 mm")
    with pytest.raises(BeamError) as info:
        build(parse(Source("t.beam", text)))
    d = info.value.diagnostics[0]
    assert (d.span.line, d.span.col) == (4, 22)
    assert d.message == ('the second moment of area I must be a second moment of area (e.g. "10 mm^4"); '
                         'got "8e7 mm^3", which is a section modulus')


def test_an_angle_in_degrees_is_a_fraction_of_pi_and_the_package_says_so(tmp_path):
    # the SI brochure (BIPM, 9th ed., table 8, from memory): 1 degree = (pi/180) rad; pint carries pi to 50 digits
    from beamlang.report.sections import inputs
    from engine_helpers import analyse_text, member_text
    f = factor_of("deg")
    assert abs(f.factor * 180 - Fraction("3.14159265358979323846264338327950288419716939937510")) < Fraction(1, 10**49)
    a = analyse_text(member_text("6 m", ["pin at 0 m", "roller at span"], {"a": ["uniform 1 kN/m down"]},
                                 extra=["limit slope at supports 0.1 deg"]))
    row = next(line for line in inputs(a) if line.startswith("| deg |"))
    assert "fraction of π rad" in row and "exact by definition" not in row


def test_a_us_shorthand_is_named_with_its_nist_source_in_the_package():
    from beamlang.report.sections import inputs
    from engine_helpers import analyse_text
    a = analyse_text(BASE.replace("uniform 1 kN/m down", "uniform 150 plf down"))
    row = next(line for line in inputs(a) if line.startswith("| plf |"))
    assert "plf = lbf/ft (US shorthand); NIST SP 811" in row
    assert a.loaded.member.cases[0].loads[0].w1 == -150 * LBF / FOOT


@pytest.mark.parametrize("factor,accepted", [("1e12", True), ("1e-12", True), ("1.000001e12", False),
                                             ("0.999999e-12", False)])
def test_load_factors_have_the_bounds_of_values(factor, accepted):
    text = BASE + f"combine c = {factor} dead\n"
    if accepted:
        assert build(parse(Source("t.beam", text))).combinations[0].terms == ((Fraction(factor), "dead"),)
        return
    with pytest.raises(BeamError) as info:
        build(parse(Source("t.beam", text)))
    assert [d.message for d in info.value.diagnostics] == [f"a load factor of {factor} is surely a typo"]
