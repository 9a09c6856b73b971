"""An editor's text -> what `check` finds in it (its diagnostics) and the statements of every line that parses.

The diagnostics come from the front end `check` uses (`frontend.from_source`: parse, then build), so their
messages and spans are the same. The editor's features also need the statements of a file that does not
parse yet: the lines that fail are left out (`parse.parse_recovering`), every other statement keeps its place."""

from __future__ import annotations

import re
from dataclasses import dataclass
from pathlib import Path

from lsprotocol import types
from pygls.workspace import PositionCodec

from beamlang.errors import BeamError, Diagnostic
from beamlang.language import syntax as s
from beamlang.language.fmt import format_document
from beamlang.language.frontend import from_source
from beamlang.language.parse import parse_recovering
from beamlang.model import Member
from beamlang.source import Source, Span


@dataclass(frozen=True, slots=True)
class Analysed:
    """One version of one open file."""

    text: str
    diagnostics: tuple[Diagnostic, ...]  # as `check` reports them
    document: s.Document | None  # every line that parses (None: not even that, e.g. a file over the limits)
    member: Member | None  # the validated member when there is no error
    parsed: bool  # the whole file parses (it can be formatted)

    def line(self, number: int) -> s.Line | None:
        """The parsed line of that 1-based number, if it holds a statement or a comment."""
        if self.document is None:
            return None
        return next((ln for ln in self.document.lines if ln.number == number), None)

    def statements(self) -> tuple[tuple[s.Line, s.Statement], ...]:
        return self.document.statements if self.document is not None else ()


def analyse(name: str, text: str, path: Path | None = None) -> Analysed:
    """Check the text as `beamlang check` would check a file of that name."""
    text = text.removeprefix("\ufeff")
    source = Source(name, text)
    try:
        loaded = from_source(source, path)
    except BeamError as exc:
        document, parsed = _tolerant(source)
        return Analysed(text, exc.diagnostics, document, None, parsed)
    return Analysed(text, (), loaded.document, loaded.member, True)


def _tolerant(source: Source) -> tuple[s.Document | None, bool]:
    """(the statements of every line that parses, whether the whole file does)."""
    try:
        document, problems = parse_recovering(source)
    except BeamError:  # over the size limits: nothing is read
        return None, False
    return document, not problems


def _lines(text: str) -> list[str]:
    """The lines with their endings, split at LF only as the parser splits them (a vertical tab or U+2028 is a
    character of its line, which the parser refuses by name, not a line break)."""
    return re.findall(r"[^\n]*\n|[^\n]+$", text)


def _ending(line: str) -> str:
    """The line break of a line (what is left of a line that fails to parse)."""
    return "\r\n" if line.endswith("\r\n") else "\n" if line.endswith("\n") else ""


def _body(line: str) -> str:
    return line[: len(line) - len(_ending(line))]


class Ranges:
    """1-based code-point spans <-> LSP positions in the client's units (UTF-16 unless it chose another)."""

    def __init__(self, text: str, codec: PositionCodec):
        self.lines, self.codec = _lines(text), codec

    def of(self, span: Span) -> types.Range:
        return self.between(span.line, span.col, span.line, span.end_col)

    def between(self, line: int, col: int, end_line: int, end_col: int) -> types.Range:
        start, end = types.Position(line - 1, col - 1), types.Position(end_line - 1, end_col - 1)
        return self.codec.range_to_client_units(self.lines, types.Range(start, end))

    def whole(self) -> types.Range:
        """From the start of the text to its end."""
        if not self.lines:
            return types.Range(types.Position(0, 0), types.Position(0, 0))
        last = self.lines[-1]
        if _ending(last):  # ends with a line break: the end is the start of the next line
            return types.Range(types.Position(0, 0), types.Position(len(self.lines), 0))
        return self.between(1, 1, len(self.lines), len(last) + 1)

    def point(self, position: types.Position) -> tuple[int, int]:
        """(line, column) from 1, in code points, of a client's position."""
        server = self.codec.position_from_client_units(self.lines, types.Position(position.line, position.character))
        row = _body(self.lines[server.line]) if server.line < len(self.lines) else ""
        return server.line + 1, min(server.character, len(row)) + 1  # never past the line's end


def formatted(analysed: Analysed) -> str | None:
    """The canonical text of `beamlang fmt`, for a file that parses."""
    if not analysed.parsed or analysed.document is None:
        return None
    return format_document(analysed.document)


def statement_at(analysed: Analysed, line: int) -> s.Statement | None:
    found = analysed.line(line)
    return found.statement if found is not None else None


def case_loads(analysed: Analysed, name: str) -> tuple[s.Case | None, list[s.Statement]]:
    """A case's statement and the loads on the indented lines below it."""
    case, loads = None, []
    for _, st in analysed.statements():
        if isinstance(st, s.Case):
            if case is not None:
                break
            if st.name.text == name:
                case = st
        elif case is not None:
            if not isinstance(st, s.LOADS):
                break
            loads.append(st)
    return case, loads


def combination(analysed: Analysed, name: str) -> s.Combine | None:
    return next((st for _, st in analysed.statements() if isinstance(st, s.Combine) and st.name.text == name), None)


def names(analysed: Analysed) -> tuple[list[s.Case], list[s.Combine]]:
    """The cases and the combinations, in file order."""
    stmts = [st for _, st in analysed.statements()]
    return [st for st in stmts if isinstance(st, s.Case)], [st for st in stmts if isinstance(st, s.Combine)]


def target_names(st: s.Statement) -> list[s.Name]:
    """The case and combination names a statement refers to or defines."""
    if isinstance(st, (s.Case, s.Combine)):
        own = [st.name]
        return own + [t.case for t in st.terms] if isinstance(st, s.Combine) else own
    if isinstance(st, (s.Limit, s.StressCheck)):
        return [st.target]
    if isinstance(st, s.Pattern):
        return [st.case]
    if isinstance(st, s.SlopeLimit) and st.target is not None:
        return [st.target]
    if isinstance(st, s.FrequencyLimit):
        return [t.case for t in st.terms]
    return []
