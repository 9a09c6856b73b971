"""Cases and loads: each `case` line and the load lines indented below it -> cases of exact SI loads."""

from __future__ import annotations

from collections.abc import Callable
from fractions import Fraction
from typing import Any

from beamlang import model as m
from beamlang.language import syntax as s
from beamlang.language.build import moving, sections
from beamlang.language.build.context import Context, sign
from beamlang.language.units import factor_of, to_si
from beamlang.source import Span

LoadHandler = Callable[[Context, Any], list[m.Load]]


def cases(ctx: Context, member_span: Span) -> tuple[m.Case, ...]:
    """Every case with its loads (the cases holding a moving load also kept on the context)."""
    stmts = ctx.doc.statements
    out: list[m.Case] = []
    current: tuple[s.Case, list[m.Load]] | None = None
    for line, st in stmts:
        if isinstance(st, s.Case):
            if current:
                out.append(_close_case(ctx, *current))
            current = (st, [])
        elif isinstance(st, s.LOADS) and line.indented:
            if current is None:
                ctx.whole(st.span, "this load belongs to no case", "put a `case` line above it")
                continue
            current[1].extend(load(ctx, st))
        elif current and not line.indented:
            out.append(_close_case(ctx, *current))
            current = None
    if current:
        out.append(_close_case(ctx, *current))
    if not out and not ctx.of(s.Case):
        ctx.whole(member_span, "this member has no load cases", "add e.g. `case dead` with its loads indented below it")
    ctx.moving_cases = {c.name for c in out if any(isinstance(ld, m.MovingLoad) for ld in c.loads)}
    return tuple(out)


def _close_case(ctx: Context, st: s.Case, loads: list[m.Load]) -> m.Case:
    for extra in [ld for ld in loads if isinstance(ld, m.MovingLoad)][1:]:
        ctx.whole(extra.span, "a case holds at most one moving load",
                  "put the forces that travel together in one `moving` line, or the second "
                  "group in a case of its own")
    return m.Case(st.name.text, st.title, tuple(loads), st.span)


def names(ctx: Context, cases: tuple[m.Case, ...]) -> set[str]:
    """The case names, each once, each case with loads."""
    seen: dict[str, m.Case] = {}
    for c in cases:
        if c.name in seen:
            ctx.error(c.span, f"a second case named '{c.name}'",
                      f"the first is on line {seen[c.name].span.line}; case names must differ")
        elif not c.loads and not _has_load_lines(ctx, c):
            ctx.whole(c.span, f"case '{c.name}' has no loads", "indent its loads under it, or remove it")
        seen.setdefault(c.name, c)
    return set(seen)


def _has_load_lines(ctx: Context, case: m.Case) -> bool:
    """True when load lines follow the case line (their own errors are reported instead)."""
    lines = [ln for ln in ctx.doc.lines if ln.number > case.span.line and ln.statement is not None]
    return bool(lines) and isinstance(lines[0].statement, s.LOADS)


def load(ctx: Context, st: s.Statement) -> list[m.Load]:
    """One load line -> its model loads (none when it has an error), by the handler of its type."""
    handler = LOADS.get(type(st))
    if handler is None:
        raise TypeError(f"no handler for load statements {type(st).__name__}")
    return handler(ctx, st)


def point(ctx: Context, st: s.Point) -> list[m.Load]:
    P = ctx.si(st.force, "force", "a point load",
               _hint_for(st.force, "force per length", "for a load per length, did you mean `uniform`?"))
    x = ctx.position(st.at, "load position")
    return [] if P is None or x is None else [m.PointLoad(x, sign(st.direction.text) * P, st.span)]


def moment(ctx: Context, st: s.Moment) -> list[m.Load]:
    M = ctx.si(st.moment, "moment", "a concentrated moment",
               _hint_for(st.moment, "force", "for a single force, did you mean `point`?"))
    x = ctx.position(st.at, "moment position")
    return [] if M is None or x is None else [m.MomentLoad(x, sign(st.direction.text) * M, st.span)]


def uniform(ctx: Context, st: s.Uniform) -> list[m.Load]:
    w = _intensity(ctx, st.intensity, st.width, _width(ctx, st.width), "a uniform load",
                   _hint_for(st.intensity, "force", "for a single force, did you mean `point`?"))
    x1 = Fraction(0) if st.start is None else ctx.position(st.start, "load start")
    x2 = ctx.length if st.end is None else ctx.position(st.end, "load end")
    return _line_load(ctx, st, x1, x2, w, w, "uniform")


def linear(ctx: Context, st: s.Linear) -> list[m.Load]:
    b = _width(ctx, st.width)
    w1 = _intensity(ctx, st.start_intensity, st.width, b, "a linear load")
    w2 = _intensity(ctx, st.end_intensity, st.width, b, "a linear load")
    x1, x2 = ctx.position(st.start, "load start"), ctx.position(st.end, "load end")
    return _line_load(ctx, st, x1, x2, w1, w2, "linear")


def _width(ctx: Context, width: s.Quantity | None) -> Fraction | None:
    return None if width is None else ctx.positive(width, "length", "a tributary width")


def _intensity(ctx: Context, q: s.Quantity, width: s.Quantity | None, b: Fraction | None, what: str,
               hint: str | None = None) -> Fraction | None:
    """A load per length: as written, or a pressure times the tributary width it is gathered from (`over`)."""
    if width is None:
        area = _hint_for(q, "stress", "for an area load, give the tributary width it is gathered from with "
                                      f"`over`, e.g. `uniform {q} over 16 in down`")
        return ctx.si(q, "force per length", what, hint or area)
    f = factor_of(q.unit)
    if f is not None and f.kind != "stress":
        got = f"which is a {f.kind}" if f.kind else "which is not a unit this language uses"
        ctx.error(q.span, f"with `over`, {what} is a pressure (e.g. \"40 psf\" or \"2 kPa\"); got \"{q}\", {got}",
                  _hint_for(q, "force per length", "a load per length needs no `over`; leave the width out"))
        return None
    p = ctx.si(q, "stress", f"{what} with `over`")
    return None if p is None or b is None else p * b


def _line_load(ctx: Context, st: s.Uniform | s.Linear, x1: Fraction | None, x2: Fraction | None,
               w1: Fraction | None, w2: Fraction | None, origin: str) -> list[m.Load]:
    if None in (x1, x2, w1, w2):
        return []
    if x1 >= x2:
        where = st.end.span if st.end is not None else st.span
        ctx.error(where, "a distributed load must end to the right of where it starts",
                  "write `from` the left position `to` the right one")
        return []
    k = sign(st.direction.text)
    width = None if st.width is None else to_si(st.width, "length", "a tributary width")  # sound: checked above
    return [m.LineLoad(x1, x2, k * w1, k * w2, origin, st.span, width)]


def settlement(ctx: Context, st: s.Settlement) -> list[m.Load]:
    d = ctx.si(st.movement, "length", "a settlement")
    x = ctx.position(st.at, "settlement position")
    if d is None or x is None:
        return []
    if x not in ctx.support_positions:
        ctx.whole(st.at.span, "a settlement must be at a support",
                  "write the position of the support that moves, e.g. `settlement 5 mm down at 4.5 m`")
        return []
    return [m.Settlement(x, sign(st.direction.text) * d, st.span)]


def _hint_for(q: s.Quantity, kind: str, hint: str) -> str | None:
    """The hint, when the quantity's unit is of the other kind it names."""
    f = factor_of(q.unit)
    return hint if f is not None and f.kind == kind else None


# load statement type -> the function that converts it; a new load type is one function and one entry here
LOADS: dict[type, LoadHandler] = {
    s.Point: point,
    s.Uniform: uniform,
    s.Linear: linear,
    s.Moment: moment,
    s.SelfWeight: sections.self_weight,
    s.Settlement: settlement,
    s.Moving: moving.moving_load,
}
