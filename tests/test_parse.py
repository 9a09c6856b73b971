"""The grammar and model over the bundled examples: every statement, shape, support and layout is used."""

from __future__ import annotations


import pytest

from beamlang.language import syntax as s
from beamlang.language.frontend import load
from beamlang.language.grammar import grammar_path
from beamlang.language.parse import parse
from beamlang.source import Source
from casefiles import EXAMPLES

FILES = sorted(EXAMPLES.glob("*.beam"))


@pytest.mark.parametrize("path", FILES, ids=lambda p: p.stem)
def test_example_parses_and_builds(path):
    item = load(path)
    assert item.member.mark and item.member.supports and item.member.cases
    assert "invented" in item.source.text.splitlines()[0].lower()  # examples say they are invented


def test_at_least_five_examples():
    assert len(FILES) >= 5


def test_examples_use_every_statement_shape_and_support():
    docs = [load(p) for p in FILES]
    kinds = {type(st) for d in docs for _, st in d.document.statements}
    assert kinds == set(s.Statement.__args__)
    fields = {st.name for d in docs for _, st in d.document.statements if isinstance(st, s.Field)}
    assert fields == {"project", "job", "by", "checked", "date", "revision"}
    shapes = {st.section.shape for d in docs for st in d.member.stretches}
    assert shapes == {"properties", "rectangle", "round", "tube", "box", "I-shape"}
    supports = {sp.kind for d in docs for sp in d.member.supports}
    assert supports == {"fixed", "pin", "roller", "spring"}
    assert {d.member.units for d in docs} == {"si", "us"}
    uniform_forms = {st.start is None for d in docs for _, st in d.document.statements if isinstance(st, s.Uniform)}
    assert uniform_forms == {True, False}
    limits = {st.divisor is None for d in docs for _, st in d.document.statements if isinstance(st, s.Limit)}
    assert limits == {True, False}
    assert any(d.member.stepped for d in docs) and any(d.member.hinges for d in docs)
    slopes = {st.target is None for d in docs for _, st in d.document.statements if isinstance(st, s.SlopeLimit)}
    assert slopes == {False}  # the target-less form is covered by tests/test_stepped_hinged.py
    positions = {st.at.form for d in docs for _, st in d.document.statements if isinstance(st, (s.Point, s.Report))}
    assert positions == {"length", "end", "fraction", "from_end"}


def layout(member) -> str:
    kinds = [sp.kind for sp in member.supports]
    ends = member.supports[0].x == 0 and member.supports[-1].x == member.length
    if kinds == ["fixed"]:
        return "cantilever"
    if kinds == ["fixed", "fixed"] and ends:
        return "fixed-fixed"
    if len(kinds) > 2:
        return "continuous"
    if kinds == ["fixed", "roller"]:
        return "propped"
    return "simple" if ends else "overhang"


def test_examples_cover_the_layouts():
    assert {layout(load(p).member) for p in FILES} >= {"cantilever", "overhang", "continuous", "fixed-fixed", "simple"}


def test_grammar_is_a_file_in_grammar_folder():
    assert grammar_path().name == "beam.lark"


def test_comments_and_strings_with_hashes():
    doc = parse(Source("t.beam", 'project "Job #4"  # real comment\n'))
    line = doc.lines[0]
    assert line.statement.text == "Job #4" and line.comment == "# real comment"


def test_spans_point_at_the_text():
    doc = parse(Source("t.beam", "case dead\n  point 12 kN down at span - 1.2 m\n"))
    point = doc.lines[1].statement
    assert (point.force.span.col, point.force.span.end_col) == (9, 14)
    assert (point.at.span.col, point.at.span.end_col) == (23, 35)
    assert str(point.at) == "span - 1.2 m"
