"""The formatter: canonical, idempotent, comment-keeping, and parse(format(x)) == parse(x)."""

from __future__ import annotations

from hypothesis import HealthCheck, given, settings

from beamlang.language.build import build
from beamlang.cli import main
from beamlang.language.fmt import format_document
from beamlang.model import essence
from beamlang.language.parse import parse
from beamlang.source import Source
from casefiles import EXAMPLES
from strategies import members


def model_of(text: str):
    return essence(build(parse(Source("m.beam", text))))


def formatted(text: str) -> str:
    return format_document(parse(Source("m.beam", text)))


def test_examples_are_canonical(capsys):
    assert main(["fmt", "--check", str(EXAMPLES)]) == 0
    assert capsys.readouterr().err == ""


def test_examples_round_trip():
    for path in sorted(EXAMPLES.glob("*.beam")):
        text = path.read_text(encoding="utf-8")
        assert formatted(text) == text
        assert model_of(formatted(text)) == model_of(text)


MESSY = '''# header comment
section   rectangle depth 200 mm   width 100 mm
  # not a load: a comment about the case below
case live "people"   # trailing
	point 2 kN   down at span/2
member T-1 "Test \\"beam\\""
material E 200 GPa   yield 250 MPa
span 4 m
support roller at span
support pin at 0 m
limit deflection live span/360
# closing comment
'''

CANONICAL = '''# header comment

member T-1 "Test \\"beam\\""

span 4 m
material E 200 GPa yield 250 MPa
section rectangle width 100 mm depth 200 mm

support roller at span
support pin at 0 m

# not a load: a comment about the case below
case live "people"  # trailing
  point 2 kN down at span/2

limit deflection live span/360

# closing comment
'''


def test_messy_file_is_formatted_canonically():
    assert formatted(MESSY) == CANONICAL
    assert model_of(formatted(MESSY)) == model_of(MESSY)


def test_check_lists_files_and_write_rewrites(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "m.beam").write_text(MESSY, encoding="utf-8")
    assert main(["fmt", "--check", "m.beam"]) == 1
    assert capsys.readouterr().err == "would reformat m.beam\n"
    assert (tmp_path / "m.beam").read_text(encoding="utf-8") == MESSY
    assert main(["fmt", "m.beam"]) == 0
    assert main(["fmt", "--check", "m.beam"]) == 0
    assert (tmp_path / "m.beam").read_text(encoding="utf-8") == formatted(MESSY)


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(members())
def test_generated_members_round_trip(text):
    once = formatted(text)
    assert formatted(once) == once
    assert model_of(once) == model_of(text)
