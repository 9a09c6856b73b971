"""Symbols: a file's statements -> its outline (member, cases, combinations, checks) and where a case or
combination name is defined."""

from __future__ import annotations

from lsprotocol import types

from beamlang.language import syntax as s
from beamlang.language.fmt import statement_text
from beamlang.tools.lsp.document import Analysed, Ranges, case_loads, names, statement_at, target_names

CHECKS = (s.Limit, s.SlopeLimit, s.StressCheck, s.FrequencyLimit)


def document_symbols(analysed: Analysed, ranges: Ranges) -> list[types.DocumentSymbol]:
    """The member with its cases, combinations and checks inside it (or those alone, before a `member` line)."""
    cases, combos = names(analysed)
    inner = [_case(analysed, c, ranges) for c in cases]
    inner += [_symbol(c.name.text, types.SymbolKind.Operator, statement_text(c), c.span, c.name.span, ranges)
              for c in combos]
    inner += [_symbol(statement_text(st), types.SymbolKind.Property, None, st.span, st.span, ranges)
              for _, st in analysed.statements() if isinstance(st, CHECKS)]
    member = next((st for _, st in analysed.statements() if isinstance(st, s.Member)), None)
    if member is None:
        return inner
    whole = ranges.whole()
    return [types.DocumentSymbol(name=member.mark.text, kind=types.SymbolKind.Class, detail=member.title,
                                 range=whole, selection_range=ranges.of(member.mark.span), children=inner)]


def _case(analysed: Analysed, case: s.Case, ranges: Ranges) -> types.DocumentSymbol:
    """A case from its line to its last load's."""
    _, loads = case_loads(analysed, case.name.text)
    last = loads[-1].span if loads else case.span
    extent = ranges.between(case.span.line, case.span.col, last.line, last.end_col)
    children = [types.DocumentSymbol(name=statement_text(ld), kind=types.SymbolKind.Field, range=ranges.of(ld.span),
                                     selection_range=ranges.of(ld.span)) for ld in loads]
    return types.DocumentSymbol(name=case.name.text, kind=types.SymbolKind.Event, detail=case.title, range=extent,
                                selection_range=ranges.of(case.name.span), children=children)


def _symbol(name: str, kind: types.SymbolKind, detail: str | None, span, selection, ranges: Ranges
            ) -> types.DocumentSymbol:
    return types.DocumentSymbol(name=name, kind=kind, detail=detail, range=ranges.of(span),
                                selection_range=ranges.of(selection))


def definition(analysed: Analysed, line: int, col: int, uri: str, ranges: Ranges) -> types.Location | None:
    """Where the case or combination named under the cursor is defined."""
    st = statement_at(analysed, line)
    name = next((n for n in (target_names(st) if st is not None else []) if n.span.col <= col < n.span.end_col), None)
    if name is None:
        return None
    cases, combos = names(analysed)
    defined = next((c.name for c in [*cases, *combos] if c.name.text == name.text), None)
    return types.Location(uri=uri, range=ranges.of(defined.span)) if defined is not None else None
