"""`beamlang check`: tables and JSON for the examples (golden files), exit codes, and no plotting import."""

from __future__ import annotations

import json
import subprocess
import sys
from fractions import Fraction

import pytest

from beamlang.cli import main
from casefiles import CASES, EXAMPLES, UPDATE
from engine_helpers import member_text

GOLDEN = CASES / "check"


def _golden(name: str, text: str) -> None:
    path = GOLDEN / name
    if UPDATE:
        path.write_text(text, encoding="utf-8")
    assert text == path.read_text(encoding="utf-8")


def test_examples_table_is_as_recorded(capsys, monkeypatch):
    monkeypatch.chdir(EXAMPLES.parent)
    assert main(["check", "examples"]) == 0
    out = capsys.readouterr()
    assert out.err == ""
    _golden("examples.txt", out.out)


def _without_float_noise(obj):
    """The finite-element difference is float noise: keep only that it is tiny."""
    for member in obj:
        for result in member["results"].values():
            assert result["cross_check"]["max_rel_diff"] < 1e-9
            result["cross_check"]["max_rel_diff"] = "< 1e-9"
    return obj


def test_examples_json_is_as_recorded(capsys, monkeypatch):
    monkeypatch.chdir(EXAMPLES.parent)
    assert main(["check", "--json", "examples"]) == 0
    data = json.loads(capsys.readouterr().out)
    _golden("examples.json", json.dumps(_without_float_noise(data), indent=2) + "\n")


def test_json_has_the_documented_shape(capsys, monkeypatch):
    monkeypatch.chdir(EXAMPLES.parent)
    main(["check", "--json", "examples/mezzanine-edge-beam.beam"])
    (member,) = json.loads(capsys.readouterr().out)
    assert member["schema"] == "beamlang.results/1"
    assert set(member) >= {"schema", "member", "title", "input_sha256", "sign_convention", "results", "checks"}
    live = member["results"]["live"]
    assert set(live) >= {"reactions", "deflection", "slope", "moment", "shear", "points", "stress", "cross_check"}
    assert set(live["reactions"][0]) == {"x_m", "force_N", "moment_Nm"}
    assert set(live["deflection"]["max_down"]) >= {"x_m", "value_m"}
    assert live["deflection"]["max_up"] is None  # no upward deflection: null, not zero
    assert set(live["stress"]) == {"bending_Pa", "shear_Pa", "yield_Pa", "allowable_bending_Pa", "shear_strength_Pa", "elastic"}
    assert set(member["checks"][0]) >= {"kind", "target", "actual", "allowed", "unit", "ratio", "pass"}


def test_symmetric_maximum_lists_every_place(capsys, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "s.beam").write_text(member_text("6 m", ["fixed at 0 m", "fixed at span"],
                                                 {"a": ["uniform 5 kN/m down"]}), encoding="utf-8")
    main(["check", "--json", "s.beam"])
    neg = json.loads(capsys.readouterr().out)[0]["results"]["a"]["moment"]["max_negative"]
    assert neg["x_m"] == 0.0 and neg["x_all_m"] == [0.0, 6.0]


def test_exit_code_is_one_when_a_check_fails(capsys, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    text = member_text("6 m", ["pin at 0 m", "roller at span"], {"a": ["uniform 5 kN/m down"]},
                       extra=["limit deflection a span/360", "limit deflection a 1 mm"])
    (tmp_path / "f.beam").write_text(text, encoding="utf-8")
    assert main(["check", "f.beam"]) == 1
    out = capsys.readouterr().out
    # 5 w L^4 / (384 E I) = 5 * 5000 * 6^4 / (384 * 16e6) m = 5.273 mm: passes span/360, fails 1 mm
    assert "deflection a, span 1, 0 m to 6 m  5.273 mm  16.67 mm  0.316    PASS" in out
    assert "deflection a                      5.273 mm  1 mm      5.273 <  FAIL" in out
    assert "1 of 2 checks pass, 1 FAIL" in out


def test_input_errors_win_over_failures(capsys, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "bad.beam").write_text("span 4\n", encoding="utf-8")
    (tmp_path / "ok.beam").write_text(member_text("6 m", ["fixed at 0 m"], {"a": ["point 1 kN down at span"]}),
                                      encoding="utf-8")
    assert main(["check", "."]) == 2
    out = capsys.readouterr()
    assert out.err.startswith("bad.beam:1:6: error: this number needs its unit")
    assert "T-1" in out.out  # the good member is still checked


@pytest.mark.parametrize("command", ["check", "fmt"])
def test_check_and_fmt_do_not_import_plotting_or_markdown(command):
    probe = (f"import sys; from beamlang.cli import main; main(['{command}', '--check' if '{command}' == 'fmt' else "
             "'--json', 'examples']); print('beamlang.report.svgplot' in sys.modules, 'markdown_it' in sys.modules, "
             "'pygments' in sys.modules, file=sys.stderr)")
    done = subprocess.run([sys.executable, "-c", probe], cwd=EXAMPLES.parent, capture_output=True, text=True)
    assert done.stderr.strip().splitlines()[-1] == "False False False"  # nor the listing's lexer


SHEAR_MEMBER = '''member T-1 "Shear strength"
span 4 m
material timber E 11 GPa yield 40 MPa{shear} density 500 kg/m^3
section rectangle width 100 mm depth 200 mm
support pin at 0 m
support roller at span
case live
  uniform 10 kN/m down
check stress live
'''


@pytest.mark.parametrize("shear, allowed, passed", [
    (" shear 1.2 MPa", Fraction(12, 10) * 10**6, False),
    (" shear 2 MPa", Fraction(2 * 10**6), True),
])
def test_shear_is_checked_against_the_materials_own_shear_strength(shear, allowed, passed):
    # The largest shear stress of a rectangle is 1.5 V / A at the neutral axis (Gere and Goodno, Mechanics of
    # Materials, 8th ed., sec. 5.8, from memory): V = w L / 2 = 20 kN, A = 0.02 m^2, tau = 1.5 MPa.
    from engine_helpers import analyse_text
    a = analyse_text(SHEAR_MEMBER.format(shear=shear))
    check = next(c for c in a.checks if c.kind == "shear stress")
    assert (check.actual, check.allowed, check.passed) == (Fraction(15 * 10**5), allowed, passed)
    assert "shear strength given with the material" in check.basis
    assert a.result("live").stress.elastic is passed


def test_without_a_shear_strength_the_shear_check_is_von_mises():
    from beamlang.analysis.checks import SQRT3
    from engine_helpers import analyse_text
    a = analyse_text(SHEAR_MEMBER.format(shear=""))
    check = next(c for c in a.checks if c.kind == "shear stress")
    assert check.allowed == 40 * 10**6 / SQRT3 and check.passed and "von Mises" in check.basis


def test_a_section_given_by_its_properties_with_q_and_t_is_checked_in_shear_like_the_shape():
    # A rectangle 120 mm x 200 mm by its properties: I = b h^3 / 12 = 8e7 mm^4, Q = b h^2 / 8 = 6e5 mm^3 and
    # t = b (Gere and Goodno, Mechanics of Materials, 8th ed., sec. 5.8, from memory): the shear check must be
    # the shape's own, exactly.
    from engine_helpers import analyse_text
    base = SHEAR_MEMBER.format(shear="")
    shape = analyse_text(base.replace("width 100 mm", "width 120 mm"))
    given = analyse_text(base.replace("section rectangle width 100 mm depth 200 mm",
                                      "section properties I 8e7 mm^4 depth 200 mm Q 6e5 mm^3 t 120 mm"))
    one, two = (next(c for c in x.checks if c.kind == "shear stress") for x in (shape, given))
    assert (one.actual, one.allowed, one.x) == (two.actual, two.allowed, two.x)
    assert one.actual == Fraction(3, 2) * 20000 / Fraction(24, 1000)  # 1.5 V / A
