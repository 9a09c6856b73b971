"""Build context: a Document -> its statements by type, the error collector and the shared helpers."""

from __future__ import annotations

import difflib
from collections.abc import Iterable
from fractions import Fraction
from typing import TypeVar

from beamlang import model as m
from beamlang.errors import Collector
from beamlang.language import syntax as s
from beamlang.language.units import UnitProblem, exact_number, to_si
from beamlang.source import Span

T = TypeVar("T")

# statement type -> the family module that reads it; a statement no family reads is our bug, not the user's
FAMILY: dict[type, str] = {
    s.Member: "geometry", s.Field: "geometry", s.Units: "geometry", s.SpanLength: "geometry",
    s.Catalogue: "geometry", s.Note: "geometry",
    s.Material: "sections", s.Section: "sections", s.Include: "sections",
    s.Support: "supports", s.Hinge: "supports",
    s.Case: "loads", s.Point: "loads", s.Uniform: "loads", s.Linear: "loads", s.Moment: "loads",
    s.SelfWeight: "loads", s.Settlement: "loads", s.Moving: "loads",
    s.Combine: "combinations", s.Pattern: "combinations",
    s.Limit: "checks", s.SlopeLimit: "checks", s.StressCheck: "checks", s.Report: "checks",
    s.FrequencyLimit: "checks",
}


class Context:
    """What every statement family shares: the document, the collector, the member's facts found so far
    (span length, stretches, support positions, cases with a moving load) and the conversions that report."""

    def __init__(self, doc: s.Document, partial: bool = False):
        self.doc = doc
        self.partial = partial  # some lines of the file failed to parse and are missing from `doc`
        self.held = False  # a problem of the whole member was held back (`whole`)
        self.errors = Collector(doc.source)
        self.length: Fraction | None = None  # set by geometry
        self.stretches: tuple[m.Stretch, ...] = ()  # set by sections
        self.support_positions: set[Fraction] = set()  # set by supports
        self.moving_cases: set[str] = set()  # set by loads
        self._by_type: dict[type, list[s.Statement]] = {kind: [] for kind in FAMILY}
        for _, st in doc.statements:
            if type(st) not in self._by_type:
                raise TypeError(f"no statement family reads {type(st).__name__} statements")
            self._by_type[type(st)].append(st)

    def of(self, kind: type[T]) -> list[T]:
        """The statements of one type, in file order."""
        return self._by_type[kind]  # type: ignore[return-value]

    def error(self, span: Span, message: str, hint: str | None = None) -> None:
        self.errors.error(span, message, hint)

    def whole(self, span: Span, message: str, hint: str | None = None) -> None:
        """A problem of the member as a whole (a missing line, an unknown name, an unstable member) that a line
        which failed to parse may cause: held back while one does, where it would only mislead."""
        if not self.partial:
            self.error(span, message, hint)
        self.held = True

    @property
    def failed(self) -> bool:
        """A problem was found (reported or held back): the member cannot be built."""
        return bool(self.errors.items) or self.held

    def si(self, q: s.Quantity, kind: str, what: str, hint: str | None = None) -> Fraction | None:
        """A written quantity in exact SI, or None with its problem reported."""
        try:
            return to_si(q, kind, what, hint)
        except UnitProblem as exc:
            d = exc.diagnostic
            self.error(d.span, d.message, d.hint)
            return None

    def number(self, text: str, span: Span) -> Fraction | None:
        """A written plain number, exact, or None with its problem reported."""
        try:
            return exact_number(text, span)
        except UnitProblem as exc:
            self.error(exc.diagnostic.span, exc.diagnostic.message, exc.diagnostic.hint)
            return None

    def positive(self, q: s.Quantity, kind: str, what: str, hint: str | None = None) -> Fraction | None:
        """Like `si`, and the value must be greater than zero."""
        value = self.si(q, kind, what, hint)
        if value is not None and value <= 0:
            self.error(q.span, f"{what} must be greater than zero")
            return None
        return value

    def position(self, p: s.Position, what: str = "position") -> Fraction | None:
        """A position on the member (m from the left end), or None when it cannot be placed."""
        L = self.length
        if p.form == "length":
            x = self.si(p.quantity, "length", what)
        elif L is None:
            return None
        elif p.form == "end":
            x = L
        elif p.form == "fraction":
            x = self._fraction_of(L, p)
        else:
            d = self.si(p.quantity, "length", what)
            x = None if d is None else L - d
        if x is None or L is None:
            return x
        if x < 0 or x > L:
            self.error(p.span, f"{what} {p} is outside the span (0 to {show_span(self.doc)})",
                       "positions are measured from the left end, from 0 to the span")
            return None
        return x

    def _fraction_of(self, L: Fraction, p: s.Position) -> Fraction | None:
        divisor = self.number(p.divisor, p.span)
        if divisor is None:
            return None
        if divisor == 0:
            self.error(p.span, "cannot divide the span by zero")
            return None
        return L / divisor

    def suggest(self, word: str, choices: Iterable[str], what: str) -> str | None:
        """A hint for a misspelt word: the closest choice, else the list of choices."""
        close = difflib.get_close_matches(word, list(choices), n=1, cutoff=0.5)
        if close:
            return f"did you mean '{close[0]}'?"
        return f"the {what} are: {', '.join(choices)}" if choices else None


def sign(direction: str) -> int:
    """+1 for the directions that are positive inside the engine (up, counterclockwise), else -1."""
    return 1 if direction in ("up", "counterclockwise") else -1


def show_span(doc: s.Document) -> str:
    """The span as the author wrote it, for messages."""
    for _, st in doc.statements:
        if isinstance(st, s.SpanLength):
            return str(st.length)
    return "?"
