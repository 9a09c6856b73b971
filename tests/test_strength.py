"""Strength by material: allowable stresses given with a timber member -> the package's wording and numbers,
against handbook values; a steel member keeps fy and the von Mises shear yield."""

from __future__ import annotations

import json
from fractions import Fraction as F

from beamlang.language.frontend import load
from beamlang.pipeline import analyse_loaded
from beamlang.report import package
from casefiles import CASES

# Pa per ksi, exact: 1 kip = 4448.2216152605 N and 1 in = 0.0254 m (NIST SP 811, 2008, appendix B.8 and B.9)
KSI = F("4448.2216152605") / F("0.0254") ** 2


def _package(name: str) -> tuple[object, str, dict]:
    a = analyse_loaded(load(CASES / "checker" / name))
    files = package.package_files(a)
    return a, files[f"{a.loaded.member.mark}.md"].decode("utf-8"), json.loads(files["results.json"])


def test_allowable_stresses_are_used_as_given_and_said_so():
    a, md, results = _package("timber-allowable-us.beam")
    # simple span, uniform load: M = w L^2 / 8, V = w L / 2 (AISC Steel Construction Manual, 15th ed.,
    # Table 3-23 case 1, from memory); rectangle: S = b d^2 / 6, tau = 3 V / (2 A) (Gere and Goodno,
    # Mechanics of Materials, 8th ed., section 5.8, from memory). w = 80 lbf/ft, L = 12 ft, b x d = 1.5 x 9.25 in.
    w, L, b, d = F(80, 12), F(144), F(3, 2), F(37, 4)  # lbf/in, in, in, in
    sigma, tau = (w * L**2 / 8) / (b * d**2 / 6) / 1000, 3 * (w * L / 2) / (2 * b * d) / 1000  # ksi
    bending, shear = (next(c for c in a.checks if c.kind == k) for k in ("bending stress", "shear stress"))
    assert bending.actual == sigma * KSI and bending.allowed == 1 * KSI and bending.strength == "allowable"
    assert shear.actual == tau * KSI and shear.allowed == F(18, 100) * KSI  # the given value, never fy/sqrt(3)
    assert "The allowable bending stress Fb is the value given with timber (material line 4)" in md
    assert "$$\\sigma_{allow} = F_b = 1\\ \\mathrm{ksi}$$" in md
    assert "$$\\tau_{allow} = F_v = 0.18\\ \\mathrm{ksi}$$" in md
    assert "against the allowable shear stress Fv given with the material (material line 4)" in md
    assert "fy/√3" not in md and "\\sqrt{3}" not in md and "yield strength fy" not in md
    assert "allowable bending stress Fb = 1 ksi, allowable shear stress Fv = 0.18 ksi" in md
    assert ("The adjustment factors of the governing timber or aluminium code (load duration, moisture and "
            "temperature service, size, repetitive member, lateral stability, welding and the like) are not "
            "applied here: they are the engineer's to apply to the values given.") in md
    # the required section, with its units: S_req = M / Fb = 17.28 kip*in / 1 ksi = 17.28 in^3
    assert ("$$S_{req} = \\frac{|M|_{max}}{F_b} = \\frac{17.28\\ \\mathrm{kip}\\,\\mathrm{in}}{1\\ \\mathrm{ksi}} = "
            "17.28\\ \\mathrm{in}^{3}$$") in md
    stress = results["results"]["live"]["stress"]
    assert stress["yield_Pa"] is None and stress["allowable_bending_Pa"] == float(KSI)


def test_steel_keeps_its_yield_strength_and_the_von_mises_shear_yield():
    a, md, _ = _package("steel-yield-si.beam")
    # M = w L^2 / 8 = 20 kN*m, S = 50 x 200^2 / 6 mm^3: sigma = 60 MPa (the same handbook cases as above)
    bending = next(c for c in a.checks if c.kind == "bending stress")
    assert bending.actual == 60 * 10**6 and bending.allowed == 250 * 10**6 and bending.strength == "yield"
    assert "The allowed bending stress is the yield strength fy of steel (material line 4)" in md
    assert "the allowed shear stress is the von Mises shear yield fy/√3" in md
    assert "Fb" not in md and "adjustment factors of the governing timber" not in md
    assert "$$S_{req} = \\frac{|M|_{max}}{f_y} = \\frac{2 \\times 10^{7}\\ \\mathrm{N}\\,\\mathrm{mm}}" in md


def test_the_allowable_form_formats_back_to_itself():
    from beamlang.language.fmt import format_document
    from beamlang.language.parse import parse, read_source

    path = CASES / "checker" / "timber-allowable-us.beam"
    text = format_document(parse(read_source(path)))
    assert "material timber E 1600 ksi allowable bending 1 ksi shear 0.18 ksi density 35 lb/ft^3" in text


def test_the_self_weight_line_of_a_us_member_gives_g_with_its_value_and_unit():
    a, md, _ = _package("timber-allowable-us.beam")
    # w = rho A g: 35 lb/ft^3 x (1.5 x 9.25 / 144) ft^2 = 3.37239 lb of mass per ft, which weighs 3.37239 lbf/ft
    # (1 lbf = 1 lb x g_n, g_n = 9.80665 m/s^2 exactly: NIST SP 811, 2008, appendix B.8)
    dead = next(c for c in a.loaded.member.cases if c.name == "dead")
    plf = F("4.4482216152605") / F("0.3048")  # N/m per lbf/ft (NIST SP 811, 2008, appendix B.8 and B.9)
    assert abs(dead.loads[0].w1) / plf == F(35) * F(3, 2) * F(37, 4) / 144  # exactly 3.37239583... lbf/ft
    assert ("w = \\rho A g = 35\\ \\mathrm{lb}/\\mathrm{ft}^{3} \\times 0.0963542\\ \\mathrm{ft}^{2} \\times "
            "32.174049\\ \\mathrm{ft}/\\mathrm{s}^{2} = 108.504\\ \\mathrm{lb}/\\mathrm{s}^{2} = "
            "3.3724\\ \\mathrm{lbf}/\\mathrm{ft}$$") in md
    assert "\\times g =" not in md
    assert "g = 9.80665 m/s² (exact by definition) = 32.174049 ft/s²" in md
