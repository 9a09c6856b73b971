"""Parse: source text -> syntax Document (lark, one statement per line), errors with carets."""

from __future__ import annotations

import os
from functools import lru_cache
from pathlib import Path

from lark import Token, Transformer, v_args
from lark.exceptions import UnexpectedInput, VisitError

from beamlang.errors import BeamError, Collector, Diagnostic
from beamlang.language import syntax as s
from beamlang.language.characters import first_problem
from beamlang.language.explain import explain
from beamlang.language.grammar import parser
from beamlang.source import Source, Span, split_lines

MAX_BYTES = 1_000_000  # a member file is a few kilobytes; anything this large is not a member
MAX_LINES = 20_000
MAX_LINE_LENGTH = 2_000


def parse(source: Source) -> s.Document:
    """Parse a whole file; every bad line is reported, not only the first."""
    doc, problems = parse_recovering(source)
    if problems:
        raise BeamError(problems, source)
    return doc


def parse_recovering(source: Source) -> tuple[s.Document, tuple[Diagnostic, ...]]:
    """(the lines that parse, the problems of those that do not): one statement a line, so a bad line is left
    out and parsing goes on at the next. A file over the size limits raises at once."""
    errors = Collector(source)
    size, count = len(source.text.encode("utf-8")), source.text.count("\n") + 1
    if size > MAX_BYTES or count > MAX_LINES:
        errors.error(Span(source.name, 1, 1, 2), f"file too large for a member ({size} bytes, {count} lines)",
                     f"the limits are {MAX_BYTES} bytes and {MAX_LINES} lines")
        errors.raise_if_any()
    lines = []
    for number, text in enumerate(split_lines(source.text), start=1):
        bad = first_problem(text)
        if bad is not None:
            errors.error(Span(source.name, number, bad.col, bad.col + bad.width), bad.message, bad.hint)
            continue
        if len(text) > MAX_LINE_LENGTH:
            errors.error(Span(source.name, number, MAX_LINE_LENGTH + 1, len(text) + 1),
                         f"line too long ({len(text)} characters)", f"one fact per line, at most {MAX_LINE_LENGTH} characters")
            continue
        line = _parse_line(source, number, text, errors)
        if line is not None:
            lines.append(line)
    return s.Document(source, tuple(lines)), tuple(errors.items)


def _parse_line(source: Source, number: int, text: str, errors: Collector) -> s.Line | None:
    indented = text[:1] in (" ", "\t")
    try:
        tree = _tree(text)
    except UnexpectedInput as exc:
        errors.error(*explain(source, number, text, exc))
        return None
    try:
        comments = [t.column for t in tree.children if isinstance(t, Token) and t.type == "COMMENT"]
        statement, comment = _Build(source, number, comments[0] if comments else None).transform(tree)
    except VisitError as exc:  # a bug of ours inside the transformer, never the user's
        raise exc.orig_exc from exc
    return s.Line(number, indented, statement, comment)


@lru_cache(maxsize=4096)
def _tree(text: str):
    """One line's parse tree, kept: the members of a project repeat many lines word for word (materials,
    sections, supports), and the tree depends on the text alone (the transformer builds new statements)."""
    return parser().parse(text)


def _unquote(text: str) -> str:
    """Quoted text -> its characters: `\\"` is a quote, `\\\\` a backslash (`characters` refuses other escapes)."""
    body, out, i = text[1:-1], [], 0
    while i < len(body):
        if body[i] == "\\" and i + 1 < len(body) and body[i + 1] in ('"', "\\"):
            i += 1
        out.append(body[i])
        i += 1
    return "".join(out)


@v_args(inline=True, meta=False)
class _Build(Transformer):
    """Tree -> (statement or None, comment or None); one method per grammar rule."""

    def __init__(self, source: Source, line: int, comment_col: int | None):
        super().__init__()
        self.source, self.line, self.comment_col = source, line, comment_col

    def _span(self, first: Token | Span, last: Token | Span | None = None) -> Span:
        last = last if last is not None else first
        col = first.col if isinstance(first, Span) else first.column
        end = last.end_col if isinstance(last, Span) else last.end_column
        return Span(self.source.name, self.line, col, end)

    def _name(self, token: Token) -> s.Name:
        return s.Name(str(token), self._span(token))

    def _stmt_span(self) -> Span:
        """The statement's span: from its keyword to the end of the line, a trailing comment left out."""
        text = self.source.line_text(self.line)
        first = len(text) - len(text.lstrip()) + 1
        code = (text[: self.comment_col - 1] if self.comment_col else text).rstrip()
        return Span(self.source.name, self.line, first, max(first + 1, len(code) + 1))

    def start(self, *items):
        statement = next((i for i in items if not isinstance(i, Token)), None)
        comment = next((str(i) for i in items if isinstance(i, Token) and i.type == "COMMENT"), None)
        return statement, comment

    def quantity(self, number: Token, unit: Token, *more: Token) -> s.Quantity:
        parts = tuple(s.Quantity(str(n), str(u), self._span(n, u), self._span(u)) for n, u in zip(more[::2], more[1::2]))
        return s.Quantity(str(number), str(unit), self._span(number, more[-1] if more else unit), self._span(unit), parts)

    def at_length(self, q: s.Quantity) -> s.Position:
        return s.Position("length", q, None, q.span)

    def at_end(self) -> s.Position:
        return s.Position("end", None, None, self._find("span"))

    def at_fraction(self, divisor: Token) -> s.Position:
        start = self._find("span", before=divisor.column)
        return s.Position("fraction", None, str(divisor), self._span(start, divisor))

    def at_from_end(self, q: s.Quantity) -> s.Position:
        start = self._find("span", before=q.span.col)
        return s.Position("from_end", q, None, self._span(start, q.span))

    def _find(self, word: str, before: int | None = None) -> Span:
        """Span of the last `word` on the line that starts before column `before`."""
        text = self.source.line_text(self.line)
        limit = (before - 1) if before else len(text)
        col = text.rfind(word, 0, limit) + 1
        return Span(self.source.name, self.line, col, col + len(word))

    def property(self, name: Token, value: s.Quantity, second: s.Quantity | None = None) -> s.Property:
        end = second.span if second else value.span
        return s.Property(self._name(name), value, second, self._span(name, end))

    def allowable_property(self, name: Token, value: s.Quantity) -> s.Property:
        """`allowable bending 1.2 ksi`: one property named by both words."""
        start = self._find("allowable", before=name.column)
        return s.Property(s.Name(f"allowable {name}", self._span(start, name)), value, None,
                          self._span(start, value.span))

    def member(self, mark: Token, title: Token) -> s.Member:
        return s.Member(self._name(mark), _unquote(str(title)), self._stmt_span())

    def field(self, name: Token, text: Token) -> s.Field:
        return s.Field(str(name), _unquote(str(text)), self._stmt_span())

    def units(self, system: Token) -> s.Units:
        return s.Units(self._name(system), self._stmt_span())

    def span(self, q: s.Quantity) -> s.SpanLength:
        return s.SpanLength(q, self._stmt_span())

    def material(self, *items) -> s.Material:
        name = self._name(items[0]) if isinstance(items[0], Token) else None
        props = tuple(i for i in items if isinstance(i, s.Property))
        stretch = next((i for i in items if isinstance(i, s.Stretch)), None)
        return s.Material(name, props, self._stmt_span(), stretch)

    def section(self, *items) -> s.Section:
        designation = _unquote(str(items[0])) if items[0].type == "STRING" else None
        shape = next(i for i in items if isinstance(i, Token) and i.type == "SHAPE")
        props = tuple(i for i in items if isinstance(i, s.Property))
        stretch = next((i for i in items if isinstance(i, s.Stretch)), None)
        return s.Section(self._name(shape), props, self._stmt_span(), stretch, designation)

    def stretch(self, start: s.Position, end: s.Position) -> s.Stretch:
        return s.Stretch(start, end, self._span(self._find("from", before=start.span.col), end.span))

    def hinge(self, at: s.Position) -> s.Hinge:
        return s.Hinge(at, self._stmt_span())

    def support(self, kind: Token, *rest) -> s.Support:
        stiffness = rest[0] if len(rest) == 2 else None
        return s.Support(self._name(kind), stiffness, rest[-1], self._stmt_span())

    def case(self, name: Token, title: Token | None = None) -> s.Case:
        return s.Case(self._name(name), _unquote(str(title)) if title else None, self._stmt_span())

    def point(self, q: s.Quantity, direction: Token, at: s.Position) -> s.Point:
        return s.Point(q, self._name(direction), at, self._stmt_span())

    def uniform(self, q: s.Quantity, *rest) -> s.Uniform:
        width = rest[0][1] if rest and isinstance(rest[0], tuple) else None
        direction, *where = rest[1:] if width is not None else rest
        start, end = where if where else (None, None)
        return s.Uniform(q, self._name(direction), start, end, self._stmt_span(), width)

    def linear(self, q1: s.Quantity, q2: s.Quantity, *rest) -> s.Linear:
        width = rest[0][1] if isinstance(rest[0], tuple) else None
        direction, start, end = rest[1:] if width is not None else rest
        return s.Linear(q1, q2, self._name(direction), start, end, self._stmt_span(), width)

    def tributary(self, width: s.Quantity) -> tuple[str, s.Quantity]:
        return "over", width

    def pattern(self, case: Token) -> s.Pattern:
        return s.Pattern(self._name(case), self._stmt_span())

    def moment(self, q: s.Quantity, direction: Token, at: s.Position) -> s.Moment:
        return s.Moment(q, self._name(direction), at, self._stmt_span())

    def settlement(self, q: s.Quantity, direction: Token, at: s.Position) -> s.Settlement:
        return s.Settlement(q, self._name(direction), at, self._stmt_span())

    def moving(self, *items) -> s.Moving:
        forces = tuple(i for i in items if isinstance(i, s.Quantity))
        direction = next(i for i in items if isinstance(i, Token))
        spacings = next((i[1] for i in items if isinstance(i, tuple) and i[0] == "spacing"), ())
        travel = next((i[1] for i in items if isinstance(i, tuple) and i[0] == "travel"), (None, None))
        return s.Moving(forces, self._name(direction), spacings, travel[0], travel[1], self._stmt_span())

    def spacing(self, *qs: s.Quantity) -> tuple[str, tuple[s.Quantity, ...]]:
        return "spacing", qs

    def travel(self, start: s.Position, end: s.Position) -> tuple[str, tuple[s.Position, s.Position]]:
        return "travel", (start, end)

    def selfweight(self) -> s.SelfWeight:
        return s.SelfWeight(self._stmt_span())

    def term(self, *items: Token) -> s.Term:
        factor = str(items[0]) if len(items) == 2 else None
        return s.Term(factor, self._name(items[-1]), self._span(items[0]) if factor is not None else None)

    def combine(self, name: Token, *terms: s.Term) -> s.Combine:
        return s.Combine(self._name(name), terms, self._stmt_span())

    def span_ratio(self, divisor: Token) -> tuple[str, None]:
        return str(divisor), None

    def absolute(self, q: s.Quantity) -> tuple[None, s.Quantity]:
        return None, q

    def limit(self, target: Token, allowance: tuple) -> s.Limit:
        return s.Limit(self._name(target), allowance[0], allowance[1], self._stmt_span())

    def slope_limit(self, *items) -> s.SlopeLimit:
        target = self._name(items[0]) if isinstance(items[0], Token) else None
        return s.SlopeLimit(target, items[-1], self._stmt_span())

    def frequency_limit(self, value: s.Quantity, *terms: s.Term) -> s.FrequencyLimit:
        return s.FrequencyLimit(value, terms, self._stmt_span())

    def stress(self, target: Token) -> s.StressCheck:
        return s.StressCheck(self._name(target), self._stmt_span())

    def include(self) -> s.Include:
        return s.Include(self._stmt_span())

    def report(self, at: s.Position) -> s.Report:
        return s.Report(at, self._stmt_span())

    def note(self, text: Token) -> s.Note:
        return s.Note(_unquote(str(text)), self._stmt_span())

    def catalogue(self, path: Token) -> s.Catalogue:
        return s.Catalogue(_unquote(str(path)), self._stmt_span())


def read_source(path: str | Path, shown_as: str | None = None) -> Source:
    """Read a file as UTF-8 text; a missing or undecodable file is a user error."""
    name = shown_as or str(path)
    try:
        data = _read_limited(Path(path))
    except FileNotFoundError:
        raise BeamError([_file_diag(name, "no such file")]) from None
    except IsADirectoryError:
        raise BeamError([_file_diag(name, "is a folder, not a .beam file")]) from None
    except _NotRegular as exc:
        raise BeamError([_file_diag(name, f"is not a regular file ({exc}); a member is a .beam file")]) from None
    except OSError as exc:
        raise BeamError([_file_diag(name, f"cannot read file ({exc.strerror})")]) from None
    if len(data) > MAX_BYTES:
        raise BeamError([_diag(Span(name, 1, 1, 2), f"file too large for a member (more than {MAX_BYTES} bytes)",
                               f"the limits are {MAX_BYTES} bytes and {MAX_LINES} lines")]) from None
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = data[:exc.start].count(b"\n") + 1
        col = exc.start - (data.rfind(b"\n", 0, exc.start) + 1) + 1
        raise BeamError([_diag(Span(name, line, col, col + 1), "file is not UTF-8 text",
                               "save the file as UTF-8")]) from None
    return Source(name, text.removeprefix("\ufeff"))


class _NotRegular(OSError):
    pass


def _read_limited(path: Path) -> bytes:
    """At most MAX_BYTES + 1 bytes of a regular file; a device, pipe or socket is refused before it is opened
    (a pipe with no writer would wait for ever, /dev/zero never ends)."""
    import stat
    kind = path.stat().st_mode
    if stat.S_ISDIR(kind):
        raise IsADirectoryError(str(path))
    if not stat.S_ISREG(kind):
        raise _NotRegular("a pipe" if stat.S_ISFIFO(kind) else "a socket" if stat.S_ISSOCK(kind) else "a device")
    fd = os.open(path, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0) | getattr(os, "O_BINARY", 0))
    with os.fdopen(fd, "rb") as handle:
        if not stat.S_ISREG(os.fstat(handle.fileno()).st_mode):  # replaced between the two looks
            raise _NotRegular("not a file")
        return handle.read(MAX_BYTES + 1)


def _file_diag(name: str, message: str):
    return _diag(Span(name, 1, 1, 2), message, None)


def _diag(span: Span, message: str, hint: str | None):
    from beamlang.errors import Diagnostic
    return Diagnostic(span, message, hint)
