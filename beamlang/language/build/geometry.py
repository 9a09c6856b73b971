"""Geometry and member facts: the single lines (member, span, units, title fields) -> checked head and span."""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

from beamlang.language import syntax as s
from beamlang.language.build.context import Context
from beamlang.language.units import is_us
from beamlang.source import Span

MIN_SPAN = Fraction(1, 1000)  # m
FIELD_ORDER = ("project", "job", "by", "checked", "date", "revision")
SINGLE = {s.Member: "member", s.Units: "units", s.SpanLength: "span", s.Catalogue: "catalogue"}
_EXAMPLES = {"member": 'start the file with e.g. `member B-1 "Floor beam"`', "span": "for example `span 5.4 m`",
             "material": "for example `material steel E 200 GPa yield 350 MPa`",
             "section": "for example `section rectangle width 89 mm depth 235 mm`"}


@dataclass(frozen=True, slots=True)
class Head:
    """The lines a member has at most one of, by key (`member`, `span`, `units`, a title field ...)."""

    single: dict[str, s.Statement]
    span: Span  # where member-wide problems point: the member line, else the first statement


def empty(ctx: Context) -> None:
    ctx.whole(Span(ctx.doc.source.name, 1, 1, 2), "empty file: there is no member to check",
              "a member needs `member`, `span`, `material`, `section`, `support` and `case` lines")


def head(ctx: Context) -> Head:
    """Every line's indentation and the single lines checked; the member's required lines present;
    the span length set on the context."""
    stmts = ctx.doc.statements
    single = _singletons(ctx, stmts)
    member_span = single["member"].span if "member" in single else stmts[0][1].span
    for key, found in (("member", "member" in single), ("span", "span" in single),
                       ("material", ctx.of(s.Material)), ("section", ctx.of(s.Section))):
        if not found:
            ctx.whole(member_span, f"this member has no `{key}` line", _EXAMPLES[key])
    if "span" in single:
        ctx.length = _span_length(ctx, single["span"])
    return Head(single, member_span)


def _span_length(ctx: Context, st: s.SpanLength) -> Fraction | None:
    length = ctx.positive(st.length, "length", "the span")
    if length is not None and length < MIN_SPAN:
        ctx.error(st.length.span, "a span under 1 mm is surely a typo",
                  "write the span with its unit, e.g. `span 5.4 m`")
        return None
    return length


def _singletons(ctx: Context, stmts: tuple[tuple[s.Line, s.Statement], ...]) -> dict[str, s.Statement]:
    seen: dict[str, s.Statement] = {}
    for line, st in stmts:
        key = SINGLE.get(type(st)) or (st.name if isinstance(st, s.Field) else None)
        _check_block(ctx, line, st)
        if key is None:
            continue
        if key in seen:
            ctx.error(st.span, f"a second `{key}` line; a member has only one",
                      f"the first is on line {seen[key].span.line}")
        else:
            seen[key] = st
    return seen


def _check_block(ctx: Context, line: s.Line, st: s.Statement) -> None:
    is_load = isinstance(st, s.LOADS)
    if is_load and not line.indented:
        ctx.error(st.span, "a load must be indented under a `case` line",
                  "write the case first, e.g. `case dead`, then each load on its own indented line")
    elif line.indented and not is_load:
        ctx.error(st.span, "only loads are indented; this statement starts at the left margin")


def fields(ctx: Context) -> tuple[tuple[str, str], ...]:
    """The title block in canonical order."""
    return tuple((f, st.text) for f in FIELD_ORDER for st in ctx.of(s.Field) if st.name == f)


def units(head: Head) -> str:
    """The report's unit system: as written, else US when the span is written in feet or inches."""
    if "units" in head.single:
        return head.single["units"].system.text
    return "us" if is_us(head.single["span"].length.unit) else "si"


def notes(ctx: Context) -> tuple[str, ...]:
    return tuple(st.text for st in ctx.of(s.Note))
