"""`beamlang size`: the lightest catalogue section that passes, against a case worked by hand."""

from __future__ import annotations

from pathlib import Path

import pytest

from beamlang.cli import main
from beamlang.errors import BeamError
from beamlang.tools.size import read_catalogue

CATALOGUES = Path(__file__).resolve().parent.parent / "beamlang" / "catalogues"

JOIST = '''member J-1 "Floor joist"
span 12 ft
material timber E 1600 ksi yield 1.0 ksi
section rectangle width 1.5 in depth 5.5 in  # to be sized
support pin at 0 ft
support roller at span
case live
  uniform 40 lbf/ft down
limit deflection live span/360
check stress live
'''


def test_lightest_lumber_size_worked_by_hand(tmp_path, monkeypatch, capsys):
    # by hand: L = 144 in, w = 40/12 lbf/in, E = 1.6e6 psi, d_allow = L/360 = 0.4 in
    # I_req = 5 w L^4 / (384 E d_allow) = 29.16 in^4; 2x6 has 1.5 * 5.5^3 / 12 = 20.80 in^4 (fails),
    # 3x4 has 8.93 in^4 (fails); the next by area, 2x8, has 47.63 in^4 and
    # sigma = (w L^2 / 8) / (1.5 * 7.25^2 / 6) = 8640 / 13.14 = 657.5 psi < 1000 psi: the answer is 2x8
    monkeypatch.chdir(tmp_path)
    (tmp_path / "j.beam").write_text(JOIST, encoding="utf-8")
    code = main(["size", "j.beam", "--catalogue", str(CATALOGUES / "sawn-lumber-ps20.csv"), "--write"])
    out = capsys.readouterr().out
    assert code == 0
    assert "  -> 2x8 " in out and "lightest passing: 2x8; next: 3x6 (0.841)" in out
    assert "(weight in in^2 (area: no density given))" in out  # no density: ranked by area, 1.5 in x 5.5 in
    assert "2x6                    8.25  FAIL  governing ratio 1.402 (deflection live)" in out
    text = (tmp_path / "j.beam").read_text(encoding="utf-8")
    assert text == JOIST.replace('section rectangle width 1.5 in depth 5.5 in  # to be sized',
                                 'section "2x8" rectangle width 1.5 in depth 7.25 in  # to be sized')  # a one-line diff
    assert out.endswith('wrote `section "2x8" rectangle width 1.5 in depth 7.25 in  # to be sized` into j.beam\n')


def test_steel_demo_catalogue_uses_self_weight(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    text = (Path(__file__).resolve().parent.parent / "examples" / "mezzanine-edge-beam.beam").read_text(encoding="utf-8")
    (tmp_path / "b.beam").write_text(text, encoding="utf-8")
    assert main(["size", "b.beam", "--catalogue", str(CATALOGUES / "demo-steel-i-shapes.csv")]) == 0
    out = capsys.readouterr().out
    assert "(weight in N/m)" in out and "lightest passing: DEMO-I " in out


def test_catalogues_are_read(tmp_path):
    assert len(read_catalogue(CATALOGUES / "sawn-lumber-ps20.csv")) == 17
    bad = tmp_path / "bad.csv"
    bad.write_text("size,props\n", encoding="utf-8")
    with pytest.raises(BeamError) as info:
        read_catalogue(bad)
    assert info.value.diagnostics[0].message == "a catalogue starts with the header `name,section`"


def test_a_stepped_member_is_not_sized_from_a_catalogue(tmp_path, monkeypatch, capsys):
    stepped = JOIST.replace("section rectangle width 1.5 in depth 5.5 in  # to be sized",
                            "section rectangle width 1.5 in depth 5.5 in from 0 ft to 4 ft\n"
                            "section rectangle width 3 in depth 5.5 in from 4 ft to span")
    (tmp_path / "j.beam").write_text(stepped, encoding="utf-8")
    monkeypatch.chdir(tmp_path)
    assert main(["size", "j.beam", "--catalogue", str(CATALOGUES / "sawn-lumber-ps20.csv")]) == 2
    err = capsys.readouterr().err
    assert err.startswith("j.beam:4:1: error: a catalogue sizes a prismatic member; this one is stepped\n")
    assert (tmp_path / "j.beam").read_text(encoding="utf-8") == stepped  # nothing written


def test_the_member_names_its_catalogue(tmp_path, monkeypatch, capsys):
    # The example was sized with its own `catalogue` line: sizing it again picks the section it holds,
    # so --write changes nothing.
    example = Path(__file__).resolve().parent.parent / "examples" / "floor-joist-sized-us.beam"
    text = example.read_text(encoding="utf-8")
    (tmp_path / "j.beam").write_text(text, encoding="utf-8")
    monkeypatch.chdir(tmp_path)
    assert main(["size", "j.beam", "--write"]) == 0
    out = capsys.readouterr().out
    assert "sections tried from beamlang/catalogues/sawn-lumber-ps20.csv" in out
    assert "lightest passing: 2x10;" in out
    assert "(weight in lbf/ft)" in out
    assert "     2x4                   1.276  FAIL" in out  # 35 lb/ft^3 x 1.5 in x 3.5 in = 1.276 lbf/ft
    assert (tmp_path / "j.beam").read_text(encoding="utf-8") == text


def test_a_catalogue_that_is_not_there(tmp_path, monkeypatch, capsys):
    (tmp_path / "j.beam").write_text(JOIST + 'catalogue "our-stock.csv"\n', encoding="utf-8")
    monkeypatch.chdir(tmp_path)
    assert main(["size", "j.beam"]) == 2
    err = capsys.readouterr().err
    assert err.startswith("j.beam:11:1: error: catalogue 'our-stock.csv' not found beside the member or among "
                          "the shipped ones\n")
    (tmp_path / "k.beam").write_text(JOIST, encoding="utf-8")
    assert main(["size", "k.beam"]) == 2
    assert "error: no catalogue to size from" in capsys.readouterr().err


def test_catalogue_option_takes_a_shipped_name(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)  # no such file here: the name of a shipped catalogue, as on a `catalogue` line
    (tmp_path / "j.beam").write_text(JOIST, encoding="utf-8")
    assert main(["size", "j.beam", "--catalogue", "sawn-lumber-ps20.csv"]) == 0
    out = capsys.readouterr().out
    assert "17 sections tried from beamlang/catalogues/sawn-lumber-ps20.csv" in out and "lightest passing: 2x8;" in out


def test_catalogue_option_with_an_unknown_name_lists_the_shipped_ones(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "j.beam").write_text(JOIST, encoding="utf-8")
    assert main(["size", "j.beam", "--catalogue", "sawn-lumber.csv"]) == 2
    err = capsys.readouterr().err
    assert err == ("sawn-lumber.csv:1:1: error: catalogue 'sawn-lumber.csv' not found here or among the shipped ones\n"
                   "    hint: the shipped catalogues are: demo-steel-i-shapes.csv, sawn-lumber-ps20.csv\n")
    (tmp_path / "stock").mkdir()  # a folder is no catalogue either
    assert main(["size", "j.beam", "--catalogue", "stock"]) == 2
    assert capsys.readouterr().err == "stock:1:1: error: catalogue 'stock' not found here or among the shipped ones\n" \
        "    hint: the shipped catalogues are: demo-steel-i-shapes.csv, sawn-lumber-ps20.csv\n"


def test_write_records_the_designation_and_renames_it_in_the_comment(tmp_path, monkeypatch, capsys):
    # The case: a line commented as a 2x6 trial becomes the 2x8 (the answer worked by hand above); the
    # comment no longer names a section the line does not hold, and a second run finds nothing to change.
    monkeypatch.chdir(tmp_path)
    before = JOIST.replace("  # to be sized", "  # 2x6 trial, check bearing at the wall")
    (tmp_path / "j.beam").write_text(before, encoding="utf-8")
    assert main(["size", "j.beam", "--catalogue", "sawn-lumber-ps20.csv", "--write"]) == 0
    after = (tmp_path / "j.beam").read_text(encoding="utf-8")
    assert after == before.replace('section rectangle width 1.5 in depth 5.5 in  # 2x6 trial',
                                   'section "2x8" rectangle width 1.5 in depth 7.25 in  # 2x8 trial')
    capsys.readouterr()
    assert main(["size", "j.beam", "--catalogue", "sawn-lumber-ps20.csv", "--write"]) == 0
    assert (tmp_path / "j.beam").read_text(encoding="utf-8") == after
    assert main(["check", "j.beam"]) == 0
    assert "  section: 2x8 (line 4)\n" in capsys.readouterr().out  # the summary table names it


def test_the_designation_is_kept_and_shown(tmp_path, monkeypatch):
    from beamlang.language.fmt import format_document
    from beamlang.language.frontend import from_source
    from beamlang.report.jsonout import member_json
    from beamlang.source import Source
    from engine_helpers import analyse_text
    text = JOIST.replace("section rectangle", 'section "2x6 \\"No. 2\\"" rectangle')
    item = from_source(Source("j.beam", text), None)
    assert item.member.section.designation == '2x6 "No. 2"'
    assert ('section "2x6 \\"No. 2\\"" rectangle width 1.5 in depth 5.5 in  # to be sized'
            in format_document(item.document).splitlines())
    a = analyse_text(text)
    assert member_json(a)["stretches"][0]["section_designation"] == '2x6 "No. 2"'
    monkeypatch.chdir(tmp_path)
    (tmp_path / "j.beam").write_text(text, encoding="utf-8")
    assert main(["build", "j.beam", "-o", "out"]) == 1
    package = (tmp_path / "out" / "J-1" / "J-1.md").read_text(encoding="utf-8")
    summary = package.split("## Summary", 1)[1].split("\n## ", 1)[0]
    assert 'Section 2x6 "No\\. 2" \\(line 4\\).' in summary  # Markdown-escaped user text
    assert 'Section 2x6 "No\\. 2": rectangle (width = 1.5 in, depth = 5.5 in), input line 4.' in package
