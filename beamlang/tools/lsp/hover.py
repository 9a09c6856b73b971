"""Hover: a place in the text -> what is there: a quantity's exact SI value and its conversion, a keyword's
statement form, a case's loads or a combination's factors, a position's distance from the left end."""

from __future__ import annotations

import dataclasses

from lsprotocol import types

from beamlang.source import split_lines
from beamlang.exact import fraction
from beamlang.language import syntax as s
from beamlang.language.fmt import statement_text
from beamlang.language.sections import SHAPE_DIMENSIONS
from beamlang.language.units import SHORTHANDS, UnitProblem, exact_number, factor_of, to_si
from beamlang.language.vocabulary import FORMS, SHAPES, SUPPORT_KINDS
from beamlang.source import Span
from beamlang.tools.lsp.document import Analysed, Ranges, case_loads, combination, statement_at, target_names

SUPPORTS = {"fixed": "stops movement and rotation", "pin": "stops vertical movement; free to rotate",
            "roller": "stops vertical movement; free to rotate (and to slide)",
            "spring": "an elastic vertical support: its reaction is stiffness x movement"}


def hover(analysed: Analysed, line: int, col: int, ranges: Ranges) -> types.Hover | None:
    """The hover at a 1-based line and code-point column, or None where there is nothing to say."""
    found = _explain(analysed, line, col)
    if found is None:
        return None
    text, span = found
    return types.Hover(contents=types.MarkupContent(kind=types.MarkupKind.Markdown, value=text), range=ranges.of(span))


def _explain(analysed: Analysed, line: int, col: int) -> tuple[str, Span] | None:
    st = statement_at(analysed, line)
    if st is not None:
        for part in _parts(st):
            if part.span.col <= col < part.span.end_col:
                text = _describe(analysed, part)
                if text:
                    return text, part.span
    return _word(analysed.text, line, col)


def _parts(obj: object) -> list:
    """The quantities, names and positions inside a statement, innermost first (a position's quantity first)."""
    found: list = []
    if isinstance(obj, tuple):
        for item in obj:
            found += _parts(item)
    elif dataclasses.is_dataclass(obj):
        for f in dataclasses.fields(obj):
            found += _parts(getattr(obj, f.name))
        if isinstance(obj, (s.Quantity, s.Position)):
            found.append(obj)
    if isinstance(obj, (s.Case, s.Combine, s.Pattern, s.Limit, s.StressCheck, s.SlopeLimit, s.FrequencyLimit)):
        found += target_names(obj)
    return found


def _describe(analysed: Analysed, part) -> str | None:
    if isinstance(part, s.Quantity):
        return quantity_text(part)
    if isinstance(part, s.Position):
        return _position_text(analysed, part)
    return _target_text(analysed, part.text)


def quantity_text(q: s.Quantity) -> str:
    """`12 kN` = 12000 N exactly (a force), and the factor of its unit; a length in parts, its exact sum."""
    if q.parts:
        try:
            return f"`{q}` = {exact_text(to_si(q, 'length', 'a length'), 'm')} (a length, the sum of its parts)"
        except UnitProblem as exc:
            return exc.diagnostic.message
    f = factor_of(q.unit)
    if f is None:
        return f"`{q.unit}` is not a unit beamlang knows"
    try:
        value = exact_number(q.number, q.span) * f.factor
    except UnitProblem as exc:
        return exc.diagnostic.message
    kind = f" ({'an' if (f.kind or 'x')[0] in 'aeiou' else 'a'} {f.kind})" if f.kind else ""
    spelled = f" ({q.unit} is {SHORTHANDS[q.unit].replace('**', '^')})" if q.unit in SHORTHANDS else ""
    return (f"`{q}` = {exact_text(value, f.si_unit)}{kind}\n\n"
            f"1 {q.unit} = {exact_text(f.factor, f.si_unit)}{spelled}")


def exact_text(value, unit: str) -> str:
    """An exact rational and its unit: in decimals when they end, else the fraction and 12 digits after it."""
    v = fraction(value)
    decimal = _decimal(v)
    if decimal is None:
        return f"{v.numerator}/{v.denominator} {unit} ≈ {float(v):.12g} {unit}"
    return f"{decimal} {unit}"


def _decimal(v) -> str | None:
    """All the digits of a rational whose decimal expansion ends; None for one that does not."""
    den, twos, fives = v.denominator, 0, 0
    while den % 2 == 0:
        den, twos = den // 2, twos + 1
    while den % 5 == 0:
        den, fives = den // 5, fives + 1
    if den != 1:
        return None
    places = max(twos, fives)
    digits = str(abs(v.numerator) * 10**places // v.denominator).rjust(places + 1, "0")
    whole, decimals = digits[:len(digits) - places], digits[len(digits) - places:].rstrip("0")
    return ("-" if v < 0 else "") + whole + (f".{decimals}" if decimals else "")


def _position_text(analysed: Analysed, p: s.Position) -> str | None:
    if p.form == "length":
        return None  # its quantity says it
    length = _span_length(analysed)
    if length is None:
        return f"`{p}`: a position measured from the left end (the member has no valid `span` yet)"
    try:
        value = _position_value(p, length)
    except UnitProblem:
        return None
    if value is None:
        return None
    return f"`{p}` = {exact_text(value, 'm')} from the left end (the span is {exact_text(length, 'm')})"


def _position_value(p: s.Position, length):
    if p.form == "end":
        return length
    if p.form == "fraction":
        divisor = exact_number(p.divisor, p.span)
        return length / divisor if divisor else None
    try:
        return length - to_si(p.quantity, "length", "a position")
    except UnitProblem:
        return None


def _span_length(analysed: Analysed):
    st = next((st for _, st in analysed.statements() if isinstance(st, s.SpanLength)), None)
    if st is None:
        return None
    try:
        return to_si(st.length, "length", "the span")
    except UnitProblem:
        return None


def _target_text(analysed: Analysed, name: str) -> str:
    case, loads = case_loads(analysed, name)
    if case is not None:
        title = f' "{case.title}"' if case.title else ""
        body = "\n".join(statement_text(ld) for ld in loads) or "(no loads yet)"
        return f"case `{name}`{title}, line {case.span.line}: its loads\n\n```\n{body}\n```"
    combo = combination(analysed, name)
    if combo is not None:
        factors = "\n".join(f"- {t.factor or '1'} x `{t.case.text}`" for t in combo.terms)
        return f"combination `{name}`, line {combo.span.line}: `{statement_text(combo)}`\n\n{factors}"
    return f"no case or combination is named `{name}` in this file"


def code_end(row: str) -> int:
    """Where a line's comment starts (its length when there is none): the first `#` outside quoted text."""
    quoted, escaped = False, False
    for i, ch in enumerate(row):
        if quoted:
            quoted, escaped = (ch != '"' or escaped), (ch == "\\" and not escaped)
        elif ch == '"':
            quoted = True
        elif ch == "#":
            return i
    return len(row)


def _word(text: str, line: int, col: int) -> tuple[str, Span] | None:
    """A statement keyword, section shape or support kind under the cursor, even on a line that does not parse."""
    lines = split_lines(text)
    if not 1 <= line <= len(lines):
        return None
    row = lines[line - 1]
    start = col - 1
    while start > 0 and (row[start - 1].isalnum() or row[start - 1] in "-_"):
        start -= 1
    end = col - 1
    while end < len(row) and (row[end].isalnum() or row[end] in "-_"):
        end += 1
    word, span = row[start:end], Span("", line, start + 1, end + 1)
    if code_end(row) <= start:
        return None  # inside a comment
    first = not row[:start].strip()
    if first and word in FORMS:
        form, meaning = FORMS[word]
        return f"```\n{form}\n```\n\n{meaning}", span
    if word in SHAPES:
        required, optional = SHAPE_DIMENSIONS[word]
        extra = f" [{' ..] ['.join(optional)} ..]" if optional else ""
        return f"```\nsection {word} {' .. '.join(required)} ..{extra}\n```\n\na section shape", span
    if word in SUPPORT_KINDS:
        return f"```\nsupport {word}{' STIFFNESS' if word == 'spring' else ''} at POS\n```\n\n{SUPPORTS[word]}", span
    return None
