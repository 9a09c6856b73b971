"""The builder's dispatch tables: every statement type has a family, every load type a handler, and a
statement type that none knows is an internal error, never skipped."""

from __future__ import annotations

import importlib
from dataclasses import dataclass

import pytest

from beamlang.language import syntax as s
from beamlang.language.build import loads
from beamlang.language.build.context import FAMILY, Context
from beamlang.source import Source, Span


@dataclass(frozen=True, slots=True)
class Unheard:
    span: Span


def _document(statement: object, indented: bool = False) -> s.Document:
    source = Source("case.beam", "unheard\n")
    return s.Document(source, (s.Line(1, indented, statement, None),))


def test_every_statement_type_has_a_family_module():
    assert set(FAMILY) == set(s.Statement.__args__)
    for family in set(FAMILY.values()):
        assert importlib.import_module(f"beamlang.language.build.{family}").__doc__


def test_every_load_type_has_a_handler_and_loads_belong_to_the_load_family():
    assert set(loads.LOADS) == set(s.LOADS)
    assert {kind for kind, family in FAMILY.items() if family == "loads"} == set(s.LOADS) | {s.Case}


def test_an_unknown_statement_type_raises():
    with pytest.raises(TypeError, match="no statement family reads Unheard"):
        Context(_document(Unheard(Span("case.beam", 1, 1, 8))))


def test_an_unknown_load_type_raises():
    ctx = Context(_document(s.Note("x", Span("case.beam", 1, 1, 8))))
    with pytest.raises(TypeError, match="no handler for load statements Unheard"):
        loads.load(ctx, Unheard(Span("case.beam", 1, 1, 8)))
